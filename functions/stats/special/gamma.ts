/**
 * The gamma family: log Γ, Loader's Stirling error and binomial deviance, log B, and the polygammas
 * ψ (digamma), ψ′ (trigamma), ψ″ (tetragamma) and ψ‴ (pentagamma).
 *
 * These are the building blocks of the saddle-point densities used by the incomplete beta and gamma
 * functions (C. Loader, "Fast and Accurate Computation of Binomial Probabilities", 2000). Pure and
 * stateless; every function is O(1) apart from a short recurrence for small arguments.
 */
import { ensure, StatsError } from '../errors';
import { log1pmx } from '../numeric';

/** ½·log(2π). */
const HALF_LOG_2PI = 0.9189385332046727417803;
/** Euler's constant γ. */
const EULER_GAMMA = 0.5772156649015328606065;

/**
 * ζ(k) − 1 for k = 2, 3, …, 41 (computed with mpmath 1.2 at 40 digits; see
 * test/reference/special/special_reference.py, which checks the same numbers). Used in the series
 * log Γ(2 + z) = (1 − γ) z + Σ_{k≥2} (−1)^k (ζ(k) − 1) z^k / k (Abramowitz & Stegun 6.1.33).
 */
const ZETA_MINUS_ONE: readonly number[] = [
  6.4493406684822643647e-1, 2.020569031595942854e-1, 8.2323233711138191516e-2, 3.6927755143369926331e-2,
  1.7343061984449139715e-2, 8.3492773819228268398e-3, 4.0773561979443393787e-3, 2.0083928260822144179e-3,
  9.9457512781808533715e-4, 4.941886041194645587e-4, 2.4608655330804829864e-4, 1.2271334757848914675e-4,
  6.1248135058704829259e-5, 3.0588236307020493552e-5, 1.5282259408651871733e-5, 7.6371976378997622736e-6,
  3.8172932649998398565e-6, 1.9082127165539389257e-6, 9.5396203387279611315e-7, 4.7693298678780646312e-7,
  2.3845050272773299e-7, 1.1921992596531107307e-7, 5.9608189051259479612e-8, 2.9803503514652280186e-8,
  1.4901554828365041235e-8, 7.450711789835429492e-9, 3.7253340247884570548e-9, 1.8626597235130490064e-9,
  9.3132743241966818287e-10, 4.656629065033784073e-10, 2.328311833676505492e-10, 1.1641550172700519776e-10,
  5.8207720879027008892e-11, 2.9103850444970996869e-11, 1.4551921891041984236e-11, 7.2759598350574810145e-12,
  3.6379795473786511902e-12, 1.8189896503070659476e-12, 9.0949478402638892825e-13, 4.5474737830421540268e-13,
];

/**
 * stirlingError(n/2) for n = 0, 1, …, 30, i.e. the exact values at the half-integers 0, 0.5, …, 15
 * (mpmath 1.2, 40 digits, rounded to 20; the same table Loader 2000 and R's stirlerr keep).
 */
const STIRLING_ERROR_HALVES: readonly number[] = [
  0, 0.15342640972002734529, 0.08106146679532725822, 0.054814121051917653896, 0.041340695955409294094,
  0.033162873519936287485, 0.027677925684998339149, 0.023746163656297495971, 0.020790672103765093112,
  0.018488450532673185231, 0.016644691189821192163, 0.015134973221917378874, 0.013876128823070747999,
  0.012810465242920226924, 0.011896709945891770095, 0.011104559758206917327, 0.010411265261972096497,
  0.0097994161261588032984, 0.0092554621827127329177, 0.008768700134139385463, 0.0083305634333628712565,
  0.0079341145643140205472, 0.007573675487951840795, 0.0072445543013203831795, 0.0069428401072095298657,
  0.0066652470327076824424, 0.0064089941880042070684, 0.0061717122630394576475, 0.0059513701127588477356,
  0.005746216513010115682, 0.005554733551962801371,
];

/** Bernoulli numbers B_2, B_4, …, B_28 (exact rationals, e.g. Abramowitz & Stegun table 23.2). */
const BERNOULLI_EVEN: readonly number[] = [
  1 / 6,
  -1 / 30,
  1 / 42,
  -1 / 30,
  5 / 66,
  -691 / 2730,
  7 / 6,
  -3617 / 510,
  43867 / 798,
  -174611 / 330,
  854513 / 138,
  -236364091 / 2730,
  8553103 / 6,
  -23749461029 / 870,
];

/** S(z) = Σ_{k≥2} (−1)^k (ζ(k) − 1) z^k / k for |z| ≤ 0.5 (A&S 6.1.33), summed to full precision. */
function zetaSeries(z: number): number {
  let sum = 0;
  let power = z;
  for (let k = 2; k < ZETA_MINUS_ONE.length + 2; k++) {
    power *= -z; // (−1)^(k−1) z^k
    const term = ((ZETA_MINUS_ONE[k - 2] as number) * power) / k;
    sum -= term;
    if (Math.abs(term) <= 1e-17 * Math.abs(sum)) break;
  }
  return sum;
}

/** log Γ(2 + z) = (1 − γ) z + S(z) for |z| ≤ 0.5; full relative precision, also near z = 0. */
function logGammaTwoPlus(z: number): number {
  return (1 - EULER_GAMMA) * z + zetaSeries(z);
}

/** log Γ(1 + z) = log Γ(2 + z) − log(1 + z) = S(z) − γ z − (log(1 + z) − z) for −0.5 ≤ z < 0.5. */
function logGammaOnePlus(z: number): number {
  return zetaSeries(z) - EULER_GAMMA * z - log1pmx(z);
}

/** Stirling series Σ B_2k / (2k(2k−1) x^(2k−1)), accurate to ~1e-17 relative for x ≥ 7. */
function stirlingSeries(x: number): number {
  const inverseSquare = 1 / (x * x);
  let power = 1 / x;
  let sum = 0;
  for (let k = 1; k <= BERNOULLI_EVEN.length; k++) {
    const term = ((BERNOULLI_EVEN[k - 1] as number) / (2 * k * (2 * k - 1))) * power;
    sum += term;
    if (Math.abs(term) <= 1e-17 * Math.abs(sum)) break;
    power *= inverseSquare;
  }
  return sum;
}

/**
 * The natural logarithm of the gamma function, log Γ(x), for x > 0.
 *
 * Method: for 1.5 ≤ x ≤ 2.5 and 0.5 ≤ x < 1.5 the zeta-function series of log Γ(2 + z) and
 * log Γ(1 + z) = log Γ(2 + z) − log(1 + z) (Abramowitz & Stegun 6.1.33), which keeps full relative
 * precision at the zeros x = 1 and x = 2; below 0.5 the recurrence Γ(x) = Γ(x + 1)/x; from 2.5 to 15 the
 * recurrence downwards into [1.5, 2.5]; from 15 on Stirling's formula with {@link stirlingError}.
 * Relative error about 1e-15 (absolute about 1e-16 near the zeros). Cost: O(1), at most 13 multiplications
 * plus one series of ≤ 40 terms.
 * Throws StatsError('invalid_argument') unless x > 0 (NaN included). Returns Infinity only for x = Infinity.
 * @example logGamma(0.5) //=> 0.5723649429247001 (log √π)
 * @example logGamma(1e9) //=> 19723265827.503716
 */
export function logGamma(x: number): number {
  ensure(x > 0, `logGamma needs x > 0, got ${x}`);
  if (x === Infinity) return Infinity;
  if (x < 0.5) return logGammaOnePlus(x) - Math.log(x);
  if (x < 1.5) return logGammaOnePlus(x - 1);
  if (x <= 2.5) return logGammaTwoPlus(x - 2);
  if (x < 15) {
    let product = 1;
    let y = x;
    while (y > 2.5) {
      y -= 1;
      product *= y;
    }
    return Math.log(product) + logGammaTwoPlus(y - 2);
  }
  return stirlingError(x) + (x - 0.5) * Math.log(x) - x + HALF_LOG_2PI;
}

/**
 * Loader's Stirling error: δ(x) = log Γ(x + 1) − (x + ½) log x + x − ½ log 2π, for x > 0.
 *
 * Method (C. Loader 2000, as in R's stirlerr): exact tabulated values at the half-integers 0.5 … 15;
 * for x ≥ 7 otherwise the Stirling series Σ B_2k / (2k(2k−1) x^(2k−1)) with up to 14 terms (error below
 * 1e-17 relative); for 0 < x < 7 the definition with {@link logGamma} (absolute error ≈ 5e-15).
 * Cost: O(1). Throws StatsError('invalid_argument') unless x > 0; returns 0 at x = Infinity.
 * @example stirlingError(1) //=> 0.08106146679532726
 * @example stirlingError(1e9) //=> 8.333333333333333e-11 (≈ 1/(12·1e9))
 */
export function stirlingError(x: number): number {
  ensure(x > 0, `stirlingError needs x > 0, got ${x}`);
  if (x === Infinity) return 0;
  if (x <= 15) {
    const twice = 2 * x;
    if (twice === Math.floor(twice)) return STIRLING_ERROR_HALVES[twice] as number;
  }
  if (x >= 7) return stirlingSeries(x);
  return logGamma(x + 1) - (x + 0.5) * Math.log(x) + x - HALF_LOG_2PI;
}

/**
 * The series branch of Loader's bd0 for |x − M| < 0.1·(x + M): with v = (x − M)/(x + M),
 * bd0 = (x − M)·v + 2x·Σ_{j≥1} v^{2j+1}/(2j + 1), summed until a term no longer changes the sum.
 * `difference` is x − M, passed separately so callers holding M in higher precision keep its digits.
 * Cost: ≤ ~20 terms near the centre. Throws nothing.
 * @example binomialDevianceSeries(1e4, 1e9 + 1e4, 2e9 + 1e4) //=> 0.04999983333416666
 */
export function binomialDevianceSeries(difference: number, x: number, total: number): number {
  const v = difference / total;
  let sum = difference * v;
  let term = 2 * x * v;
  const vv = v * v;
  for (let j = 1; j < 1000; j++) {
    term *= vv;
    const next = sum + term / (2 * j + 1);
    if (next === sum) return next;
    sum = next;
  }
  return sum;
}

/**
 * Loader's binomial deviance bd0(x, M) = x log(x / M) + M − x, for x ≥ 0 and M > 0, without
 * cancellation when x is close to M.
 *
 * Method (C. Loader 2000): for |x − M| < 0.1 (x + M) the series 2x Σ v^(2j+1)/(2j+1) − (x − M)·v with
 * v = (x − M)/(x + M), summed until it stops changing; otherwise the direct formula. Relative error about
 * 1e-15. Cost: O(1) (≤ ~20 terms). Throws StatsError('invalid_argument') for x < 0, M ≤ 0 or NaN.
 * @example binomialDeviance(1e9 + 1e4, 1e9) //=> 0.04999983333416666 (≈ (x − M)²/(2M))
 */
export function binomialDeviance(x: number, M: number): number {
  ensure(
    x >= 0 && M > 0 && Number.isFinite(x) && Number.isFinite(M),
    `binomialDeviance needs x ≥ 0 and M > 0, got ${x}, ${M}`,
  );
  if (x === 0) return M;
  const difference = x - M;
  if (Math.abs(difference) < 0.1 * (x + M)) return binomialDevianceSeries(difference, x, x + M);
  return x * Math.log(x / M) + M - x;
}

/**
 * log B(a, b) = log Γ(a) + log Γ(b) − log Γ(a + b), for a, b > 0.
 *
 * Method (as R's lbeta, after Loader's Stirling error): with p = min(a, b), q = max(a, b), when p ≥ 10
 * −½ log q + ½ log 2π + δ*(p) + δ*(q) − δ*(p + q) + (p − ½) log(p/(p + q)) + q log1p(−p/(p + q)),
 * where δ*(x) = log Γ(x) − (x − ½) log x + x − ½ log 2π = {@link stirlingError}(x); when only q ≥ 10,
 * log Γ(p) + δ*(q) − δ*(p + q) + p − p log(p + q) + (q − ½) log1p(−p/(p + q)); otherwise the three
 * log-gammas. Relative error about 1e-15 also at a, b ~ 1e9 (where log B itself is ~ −1e9).
 * Cost: O(1). Throws StatsError('invalid_argument') unless a > 0 and b > 0.
 * @example logBeta(8, 10) //=> -12.178084608990005 (B(8, 10) = 7!·9!/17! = 1/194480)
 */
export function logBeta(a: number, b: number): number {
  ensure(a > 0 && b > 0, `logBeta needs a > 0 and b > 0, got ${a}, ${b}`);
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  if (q === Infinity) return -Infinity;
  if (p >= 10) {
    const correction = stirlingError(p) + stirlingError(q) - stirlingError(p + q);
    return (
      -0.5 * Math.log(q) + HALF_LOG_2PI + correction + (p - 0.5) * Math.log(p / (p + q)) + q * Math.log1p(-p / (p + q))
    );
  }
  if (q >= 10) {
    const correction = stirlingError(q) - stirlingError(p + q);
    return logGamma(p) + correction + p - p * Math.log(p + q) + (q - 0.5) * Math.log1p(-p / (p + q));
  }
  return logGamma(p) + logGamma(q) - logGamma(p + q);
}

/**
 * The digamma function ψ(x) = d/dx log Γ(x), for x > 0.
 *
 * Method: the recurrence ψ(x) = ψ(x + 1) − 1/x up to x ≥ 10, then the asymptotic series
 * log x − 1/(2x) − Σ B_2k / (2k x^(2k)) (Abramowitz & Stegun 6.3.18), 8 terms. Absolute error about 1e-15
 * (relative error grows only near the root x ≈ 1.4616). Cost: O(1), at most 10 recurrence steps.
 * Throws StatsError('invalid_argument') unless x > 0.
 * @example digamma(1) //=> -0.5772156649015324 (−γ = −0.5772156649015329)
 */
export function digamma(x: number): number {
  // The condition first: the message is built only on failure (digamma sits in inner loops).
  if (!(x > 0)) throw new StatsError('invalid_argument', `digamma needs x > 0, got ${x}`);
  if (x === Infinity) return Infinity;
  let shift = 0;
  let y = x;
  while (y < 10) {
    shift -= 1 / y;
    y += 1;
  }
  const inverseSquare = 1 / (y * y);
  let power = inverseSquare;
  let series = 0;
  for (let k = 1; k <= 8; k++) {
    series += ((BERNOULLI_EVEN[k - 1] as number) / (2 * k)) * power;
    power *= inverseSquare;
  }
  return shift + Math.log(y) - 0.5 / y - series;
}

/**
 * The trigamma function ψ′(x) = d²/dx² log Γ(x), for x > 0.
 *
 * Method: the recurrence ψ′(x) = ψ′(x + 1) + 1/x² up to x ≥ 10, then the asymptotic series
 * 1/x + 1/(2x²) + Σ B_2k / x^(2k+1) (Abramowitz & Stegun 6.4.12), 8 terms. Relative error about 1e-15.
 * Cost: O(1). Throws StatsError('invalid_argument') unless x > 0.
 * @example trigamma(1) //=> 1.6449340668482264 (π²/6)
 */
export function trigamma(x: number): number {
  if (!(x > 0)) throw new StatsError('invalid_argument', `trigamma needs x > 0, got ${x}`);
  if (x === Infinity) return 0;
  let shift = 0;
  let y = x;
  while (y < 10) {
    shift += 1 / (y * y);
    y += 1;
  }
  const inverseSquare = 1 / (y * y);
  let power = inverseSquare / y;
  let series = 0;
  for (let k = 1; k <= 8; k++) {
    series += (BERNOULLI_EVEN[k - 1] as number) * power;
    power *= inverseSquare;
  }
  return shift + 1 / y + 0.5 * inverseSquare + series;
}

/**
 * The tetragamma function ψ″(x) = d³/dx³ log Γ(x), for x > 0.
 *
 * Method: the recurrence ψ″(x) = ψ″(x + 1) − 2/x³ up to x ≥ 10, then the asymptotic series
 * −[1/x² + 1/x³ + Σ B_2k (2k + 1)/x^(2k+2)], k = 1 … 5 (Abramowitz & Stegun 6.4.11). The first term left
 * out, B₁₂·13/x¹⁴, is 3.3e-14 at x = 10: relative error ≤ 3e-12 there (carried down by the recurrence,
 * 1.3e-14 at x = 1), falling as x^-12 beyond; measured against mpmath psi(2, x) in
 * test/stats/special/gamma.test.ts. Enough for the cumulants of decision power (planning.ts), which use
 * it. Cost: O(1), at most 10 recurrence steps. Throws StatsError('invalid_argument') unless x > 0.
 * @example tetragamma(1) //=> -2.40411380631922 (−2ζ(3) = −2.4041138063191885)
 */
export function tetragamma(x: number): number {
  if (!(x > 0)) throw new StatsError('invalid_argument', `tetragamma needs x > 0, got ${x}`);
  let shift = 0;
  let y = x;
  while (y < 10) {
    shift -= 2 / (y * y * y);
    y += 1;
  }
  const inv = 1 / y;
  const inv2 = inv * inv;
  // −[1/y² + 1/y³ + Σ B_2k (2k+1) / y^(2k+2)], k = 1 … 5.
  const series = inv2 * (1 / 2 + inv2 * (-1 / 6 + inv2 * (1 / 6 + inv2 * (-3 / 10 + inv2 * (5 / 6)))));
  return shift - (inv2 + inv2 * inv + inv2 * series);
}

/**
 * The pentagamma function ψ‴(x) = d⁴/dx⁴ log Γ(x), for x > 0.
 *
 * Method: the recurrence ψ‴(x) = ψ‴(x + 1) + 6/x⁴ up to x ≥ 10, then the asymptotic series
 * 2/x³ + 3/x⁴ + Σ B_2k (2k + 1)(2k + 2)/x^(2k+3), k = 1 … 5 (Abramowitz & Stegun 6.4.11). The first
 * term left out, B₁₂·13·14/x¹⁵, is 4.6e-14 at x = 10: relative error ≤ 2e-11 there (7e-15 at x = 1),
 * falling as x^-12 beyond; measured against mpmath psi(3, x). Used by the cumulants of decision power
 * (planning.ts). Cost: O(1), at most 10 recurrence steps. Throws StatsError('invalid_argument') unless x > 0.
 * @example pentagamma(1) //=> 6.49393940226687 (π⁴/15 = 6.493939402266829)
 */
export function pentagamma(x: number): number {
  if (!(x > 0)) throw new StatsError('invalid_argument', `pentagamma needs x > 0, got ${x}`);
  let shift = 0;
  let y = x;
  while (y < 10) {
    shift += 6 / (y * y * y * y);
    y += 1;
  }
  const inv = 1 / y;
  const inv2 = inv * inv;
  const inv3 = inv2 * inv;
  // 2/y³ + 3/y⁴ + Σ B_2k (2k+1)(2k+2) / y^(2k+3), k = 1 … 5.
  const series = inv2 * (2 + inv2 * (-1 + inv2 * (4 / 3 + inv2 * (-3 + inv2 * 10))));
  return shift + 2 * inv3 + 3 * inv3 * inv + inv3 * series;
}

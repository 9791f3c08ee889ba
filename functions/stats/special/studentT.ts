/**
 * Student's t distribution with real degrees of freedom ν > 0: distribution function, quantile and log
 * density, each accurate in both tails. Built on the incomplete beta function:
 * P(T ≤ −|t|) = ½ I_x(ν/2, ½) with x = ν/(ν + t²) (Abramowitz & Stegun 26.7.1). Pure and stateless.
 */
import { ensure } from '../errors';
import { log1pmx } from '../numeric';
import { logBeta, stirlingError } from './gamma';
import { betaQuantilePair, betaTailLog } from './incompleteBeta';
import { normalCdf, normalLogDensity, normalQuantile } from './normal';

const HALF_LOG_2PI = 0.918938533204672741780329736406;

function checkDegrees(df: number, name: string): void {
  ensure(df > 0, `${name} needs degrees of freedom above 0, got ${df}`);
}

/** x = ν/(ν + t²) and y = t²/(ν + t²), each computed directly (and without overflow for huge |t|). */
function betaArguments(t: number, df: number): [number, number] {
  const absT = Math.abs(t);
  if (absT > 1e150) {
    const x = df / absT / absT;
    return [x, 1 - x];
  }
  const t2 = t * t;
  return [df / (df + t2), t2 / (df + t2)];
}

/**
 * log P(T ≤ −|t|) when x = ν/(ν + t²) is below 1e-300, from log x: there
 * ½ I_x(ν/2, ½) = ½ x^(ν/2) / ((ν/2) B(ν/2, ½)) · (1 + O(x)) (the first term of the series behind the
 * continued fraction), exact to double precision.
 */
function farTailLog(logX: number, df: number): number {
  return -Math.LN2 + (df / 2) * logX - Math.log(df / 2) - logBeta(df / 2, 0.5);
}

/**
 * The Student t distribution function P(T ≤ t) with ν = df degrees of freedom (real, > 0).
 *
 * Method: P(T ≤ −|t|) = ½ I_x(ν/2, ½), x = ν/(ν + t²), with x and 1 − x = t²/(ν + t²) both formed
 * directly and the incomplete beta evaluated on its fast side (see betaTailLog); the lower tail is
 * therefore accurate relative to itself down to 1e-300, and for t > 0 the value is 1 − (that tail).
 * For the upper tail P(T > t) use studentTCdf(−t, df). df = Infinity gives the normal distribution.
 * Cost: as one incomplete beta evaluation, O(1)–O(√ν). Throws StatsError('invalid_argument') for
 * df ≤ 0 or NaN arguments.
 * @example studentTCdf(-2.0, 3) //=> 0.0696629842794216
 * @example studentTCdf(2.228138851986274, 10) //=> 0.975 (the 97.5 % point of t with 10 df)
 */
export function studentTCdf(t: number, df: number): number {
  checkDegrees(df, 'studentTCdf');
  ensure(!Number.isNaN(t), 'studentTCdf needs a number t, got NaN');
  if (t === 0) return 0.5;
  if (t === -Infinity) return 0;
  if (t === Infinity) return 1;
  if (df === Infinity) return normalCdf(t);
  const [x, y] = betaArguments(t, df);
  const lowerTail =
    x < 1e-300
      ? Math.exp(farTailLog(Math.log(df) - 2 * Math.log(Math.abs(t)), df))
      : 0.5 * Math.exp(betaTailLog(x, y, df / 2, 0.5, false));
  return t < 0 ? lowerTail : 1 - lowerTail;
}

/**
 * The Student t quantile: the t with studentTCdf(t, df) = p.
 *
 * Method: for p < ½ solve I_x(ν/2, ½) = 2p (or, for p > ¼, its complement 1 − I_x = 1 − 2p, which is
 * exact there) with betaQuantilePair, which returns x and 1 − x each to full relative precision; then
 * t = −√ν·√(1 − x)/√x (where x underflows, the far-tail form ½x^(ν/2)/((ν/2)B(ν/2, ½)), exact there,
 * is inverted in logs, so |t| up to ~1e308 comes out right). For p > ½ the symmetry t(p) = −t(1 − p). studentTCdf(studentTQuantile(p)) = p to
 * ~1e-13 relative in the smaller tail. Cost: about 4–8 incomplete beta evaluations.
 * Throws StatsError('invalid_argument') for df ≤ 0 or p outside [0, 1]. p = 0 and 1 give ∓Infinity.
 * @example studentTQuantile(0.975, 10) //=> 2.2281388519862744
 */
export function studentTQuantile(p: number, df: number): number {
  checkDegrees(df, 'studentTQuantile');
  ensure(p >= 0 && p <= 1, `studentTQuantile needs a probability between 0 and 1, got ${p}`);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p === 0.5) return 0;
  if (df === Infinity) return normalQuantile(p);
  if (p > 0.5) return -studentTQuantile(1 - p, df);
  const [x, y] =
    p <= 0.25 ? betaQuantilePair(2 * p, df / 2, 0.5, false) : betaQuantilePair(1 - 2 * p, df / 2, 0.5, true);
  if (x < 1e-300) {
    // Heavy tails (small ν, tiny p): invert the far-tail form of farTailLog for log x; |t| = √ν·x^(−½).
    const logX = (Math.log(p) - farTailLog(0, df)) / (df / 2);
    return -Math.sqrt(df) * Math.exp(-0.5 * logX);
  }
  return -Math.sqrt(df) * (Math.sqrt(y) / Math.sqrt(x));
}

/**
 * log of the Student t density with ν = df degrees of freedom at t.
 *
 * Method: log Γ((ν+1)/2) − log Γ(ν/2) − ½ log(νπ) − (ν+1)/2 · log(1 + t²/ν), with the gamma ratio written
 * through Loader's Stirling error, log Γ(h + ½) − log Γ(h) − ½ log h = δ(h + ½) − δ(h) + h·log1pmx(1/(2h))
 * (h = ν/2; δ = stirlingError), so it stays accurate for ν up to 1e15 and beyond (no difference of two
 * huge log-gammas). Relative error about 1e-15. df = Infinity gives the normal log density.
 * Cost: O(1). Throws StatsError('invalid_argument') for df ≤ 0 or NaN t.
 * @example studentTLogDensity(0, 1) //=> -1.1447298858494002 (log 1/π, the Cauchy density at 0)
 */
export function studentTLogDensity(t: number, df: number): number {
  checkDegrees(df, 'studentTLogDensity');
  ensure(!Number.isNaN(t), 'studentTLogDensity needs a number t, got NaN');
  if (df === Infinity) return normalLogDensity(t);
  if (!Number.isFinite(t)) return -Infinity;
  const h = df / 2;
  const gammaRatio = stirlingError(h + 0.5) - stirlingError(h) + h * log1pmx(1 / (2 * h));
  const absT = Math.abs(t);
  const kernel =
    absT > 1e150 ? -((df + 1) / 2) * (2 * Math.log(absT) - Math.log(df)) : -((df + 1) / 2) * Math.log1p((t * t) / df);
  return gammaRatio - HALF_LOG_2PI + kernel;
}

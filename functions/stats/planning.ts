/**
 * Planning an experiment: how likely a test of a given size is to end with a clear read-out, how many
 * visitors that takes, and the classic two-proportion sample size for comparison.
 *
 * Cautions: these numbers assume the read-out is taken once, at the planned size. Looking at the results
 * again and again and stopping at the first good-looking one raises the false-alarm rate well above what
 * is planned here (peeking). With many variants each comparison has its own chance of a false alarm.
 * For regulated or health-related decisions, have a qualified statistician check the plan.
 */
import { CLOSED_FORM_MAX_TERMS, closedFormLogProbGreater } from './betaComparison';
import { ensure, StatsError } from './errors';
import { probAboveControl } from './conversion';
import { TableMemo, type TableSource } from './tableMemo';
import { digamma, pentagamma, tetragamma, trigamma } from './special/gamma';
import { betaCdf, betaLogDensity, betaSf } from './special/incompleteBeta';
import { normalCdf, normalQuantile } from './special/normal';
import { type BetaPrior, UNIFORM_PRIOR } from './types';

/** Largest number of visitors per variant the planning functions work with. */
export const MAX_PLANNED_VISITORS = 1e10;

function checkFinite(value: number, what: string): void {
  ensure(typeof value === 'number' && !Number.isNaN(value), `${what} must be a number, got ${String(value)}`);
  ensure(Number.isFinite(value), `${what} must be a finite number, got ${value}`);
}

function checkProbability(value: number, what: string): void {
  checkFinite(value, what);
  ensure(value > 0 && value < 1, `${what} must be between 0 and 1 (exclusive), got ${value}`);
}

/** Checks the baseline rate and lift; returns the challenger's rate baseline·(1 + lift). */
function challengerRate(baselineRate: number, lift: number): number {
  checkProbability(baselineRate, 'the baseline rate');
  checkFinite(lift, 'the lift');
  ensure(lift > -1, `the lift must be greater than -1 (a rate cannot fall below 0), got ${lift}`);
  const rate = baselineRate * (1 + lift);
  ensure(rate > 0, `the lift must be greater than -1 (a rate cannot fall below 0), got ${lift}`);
  ensure(rate < 1, `baseline rate × (1 + lift) must be below 1, got ${rate} (baseline ${baselineRate}, lift ${lift})`);
  return rate;
}

function checkPrior(prior: BetaPrior): void {
  ensure(
    typeof prior === 'object' && prior !== null && Number.isFinite(prior.alpha) && Number.isFinite(prior.beta),
    'the prior must have finite alpha and beta',
  );
  ensure(
    prior.alpha > 0 && prior.beta > 0,
    `the prior's alpha and beta must both be greater than 0, got ${prior.alpha} and ${prior.beta}`,
  );
}

/**
 * Visitors per variant for the classic two-proportion z-test, unrounded.
 *
 * Method: the normal-approximation test with pooled variance under the null and no continuity correction
 * (Fleiss, Levin & Paik, "Statistical Methods for Rates and Proportions", 3rd ed., 2003, §4.2, without the
 * correction); the same formula that R's power.prop.test solves numerically (strict = FALSE):
 * n = (z_{α/sides}·√(2 p̄ (1 − p̄)) + z_power·√(p₁q₁ + p₂q₂))² / (p₁ − p₂)², with p₂ = p₁(1 + lift),
 * p̄ = (p₁ + p₂)/2. It is the closed form; R's uniroot result differs from it by up to ~1e-4 visitor.
 * This is a frequentist plan for comparison with {@link visitorsNeeded}; it assumes one look at the end.
 * Cost: O(1).
 * Throws StatsError('invalid_argument') unless 0 < baselineRate < 1, lift ≠ 0 with 0 < rate·(1+lift) < 1,
 * 0 < alpha < 1, 0 < power < 1, sides 1 or 2, and the power is above the false-alarm rate.
 * @example classicSampleSizeExact(0.10, 0.5) //=> 685.5968583253… (R: power.prop.test(p1 = 0.1, p2 = 0.15, power = 0.8) n = 685.596858)
 */
export function classicSampleSizeExact(
  baselineRate: number,
  lift: number,
  alpha = 0.05,
  power = 0.8,
  sides: 1 | 2 = 2,
): number {
  const p2 = challengerRate(baselineRate, lift);
  ensure(lift !== 0, 'the lift must not be 0: no test can detect a difference of nothing');
  checkProbability(alpha, 'alpha');
  checkProbability(power, 'the power');
  ensure(sides === 1 || sides === 2, `sides must be 1 or 2, got ${String(sides)}`);
  const p1 = baselineRate;
  const pooled = (p1 + p2) / 2;
  const zAlpha = -normalQuantile(alpha / sides);
  const zPower = normalQuantile(power);
  const numerator = zAlpha * Math.sqrt(2 * pooled * (1 - pooled)) + zPower * Math.sqrt(p1 * (1 - p1) + p2 * (1 - p2));
  ensure(numerator > 0, `the power (${power}) must be above the false-alarm rate alpha/sides (${alpha / sides})`);
  const difference = p2 - p1;
  return (numerator * numerator) / (difference * difference);
}

/**
 * Visitors per variant for the classic two-proportion z-test, rounded up to a whole visitor.
 *
 * Method, cost and errors as {@link classicSampleSizeExact} (pooled variance under the null, no continuity
 * correction; matches R's power.prop.test rounded up). Throws StatsError('not_available') if the size
 * exceeds 2^53.
 * @example classicSampleSize(0.05, 0.1) //=> 31234 (R: power.prop.test(p1 = 0.05, p2 = 0.055, power = 0.8) n = 31233.44)
 */
export function classicSampleSize(
  baselineRate: number,
  lift: number,
  alpha = 0.05,
  power = 0.8,
  sides: 1 | 2 = 2,
): number {
  const n = Math.ceil(classicSampleSizeExact(baselineRate, lift, alpha, power, sides));
  if (!(n <= 2 ** 53)) {
    throw new StatsError(
      'not_available',
      'the classic sample size is beyond 2^53 visitors: the lift is too small to detect',
    );
  }
  return n;
}

// ---------------------------------------------------------------------------------------------------
// Decision power

/**
 * Cumulants of logit p for the posterior Beta(α + x, β + n − x), for x = lo, lo + 1, … in turn: logit of a
 * Beta(a, b) is log G_a − log G_b for independent Gamma variates, so κ_r = ψ^(r−1)(a) + (−1)^r ψ^(r−1)(b).
 * Computed directly every 32 steps from lo and by the recurrences ψ^(k)(a + 1) = ψ^(k)(a) + (−1)^k k!/a^(k+1)
 * in between (a rounding error of ~1e-14 absolute at most). A cursor that only moves forward (the
 * walk of powerOf visits outcomes in increasing order), so no table of the whole range is kept: O(1)
 * memory where a table at 1e10 visitors took ~50 MB.
 */
class LogitCumulants {
  k1 = 0;
  k2 = 0;
  k3 = 0;
  k4 = 0;
  private index = -1;
  private d0a = 0;
  private d0b = 0;
  private d1a = 0;
  private d1b = 0;
  private d2a = 0;
  private d2b = 0;
  private d3a = 0;
  private d3b = 0;

  constructor(
    private readonly lo: number,
    private readonly n: number,
    private readonly prior: BetaPrior,
  ) {}

  /** Moves to entry i (x = lo + i; never backwards) and sets k1 … k4. */
  at(i: number): this {
    if (i < this.index) throw new RangeError('the cumulant cursor only moves forward');
    while (this.index < i) this.step();
    return this;
  }

  private step(): void {
    const i = ++this.index;
    const a = this.prior.alpha + this.lo + i;
    const b = this.prior.beta + this.n - this.lo - i;
    if (i % 32 === 0) {
      this.d0a = digamma(a);
      this.d0b = digamma(b);
      this.d1a = trigamma(a);
      this.d1b = trigamma(b);
      this.d2a = tetragamma(a);
      this.d2b = tetragamma(b);
      this.d3a = pentagamma(a);
      this.d3b = pentagamma(b);
    } else {
      // from (a − 1, b + 1) to (a, b)
      const ia = 1 / (a - 1);
      const ib = 1 / b;
      this.d0a += ia;
      this.d0b -= ib;
      this.d1a -= ia * ia;
      this.d1b += ib * ib;
      this.d2a += 2 * ia * ia * ia;
      this.d2b -= 2 * ib * ib * ib;
      this.d3a -= 6 * ia * ia * ia * ia;
      this.d3b += 6 * ib * ib * ib * ib;
    }
    this.k1 = this.d0a - this.d0b;
    this.k2 = this.d1a + this.d1b;
    this.k3 = this.d2a - this.d2b;
    this.k4 = this.d3a + this.d3b;
  }
}

/**
 * P(p_B > p_A) for independent posteriors by a second-order Edgeworth expansion of
 * D = logit p_B − logit p_A from its exact cumulants (the current entries of the cursors `a` and `b`).
 */
function approximateProbAbove(a: LogitCumulants, b: LogitCumulants): number {
  const k1 = b.k1 - a.k1;
  const k2 = b.k2 + a.k2;
  const k3 = b.k3 - a.k3;
  const k4 = b.k4 + a.k4;
  const sd = Math.sqrt(k2);
  const z = -k1 / sd; // P(D ≤ 0) = F(z) in standard units
  const g1 = k3 / (k2 * sd);
  const g2 = k4 / (k2 * k2);
  const z2 = z * z;
  const correction = (g1 / 6) * (z2 - 1) + (g2 / 24) * z * (z2 - 3) + ((g1 * g1) / 72) * z * (z2 * z2 - 10 * z2 + 15);
  return normalCdf(-z) + Math.exp(-0.5 * z2) * INV_SQRT_2PI * correction;
}

const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/**
 * The exact P(B beats A) after x_A and x_B conversions out of n each: Evan Miller's closed form
 * (betaComparison.ts) when a whole-number shape keeps it short and accurate, otherwise the quadrature of
 * {@link probAboveControl}.
 */
function exactProbAbove(xA: number, xB: number, n: number, prior: BetaPrior, work: ExactWork): number {
  const aA = prior.alpha + xA;
  const bA = prior.beta + n - xA;
  const aB = prior.alpha + xB;
  const bB = prior.beta + n - xB;
  const closed = closedFormLogProbGreater(aB, bB, aA, bA, CLOSED_FORM_MAX_TERMS);
  if (closed !== undefined) return Math.exp(closed);
  work.quadratures += 1;
  if (work.quadratures > EXACT_QUADRATURE_BUDGET) throw work.overBudget();
  return probAboveControl(
    [
      { conversions: xA, visitors: n },
      { conversions: xB, visitors: n },
    ],
    prior,
    work.tables,
  )[0] as number;
}

/**
 * Most exact comparisons by quadrature in one planning call (~0.1–1 ms each). A plan read out at a
 * threshold up to 0.9999 with priors down to 0.001 needs at most a few hundred (the bench's worst cases);
 * a threshold much closer to 1 makes the Edgeworth approximation's error margin wider than the distance
 * to 1, so every outcome near the boundary is a close call, and the call stops here with a clear error
 * instead of computing for seconds to minutes.
 */
export const EXACT_QUADRATURE_BUDGET = 800;

/**
 * The exact comparisons of one planning call: their count against EXACT_QUADRATURE_BUDGET and the
 * tables they share (a close call's posteriors recur for neighbouring outcomes and bracket steps).
 */
interface ExactWork {
  quadratures: number;
  readonly tables: TableSource;
  overBudget(): StatsError;
}

function exactWork(what: string): ExactWork {
  return {
    quadratures: 0,
    tables: new TableMemo(50_000),
    overBudget: () =>
      new StatsError(
        'not_available',
        `${what} needs more than ${EXACT_QUADRATURE_BUDGET} exact comparisons of close outcomes, more than one ` +
          'calculation may use; a threshold this close to 1 cannot be planned here (0.9999 and below can)',
      ),
  };
}

/**
 * Error allowed for {@link approximateProbAbove} as a function of the smallest of the four shapes m:
 * measured against the exact closed form (Evan Miller 2015) and scipy quadrature on seeded random cases
 * with P in [0.5, 0.99999] (test/reference/planning/planning_edgeworth.py, 3600 cases), the error stays below
 * 0.0095·m^−1.5 (0.001·m^−1.5 for m ≥ 512); we allow 0.1·m^−1.5 + 1e-9, ten times that, and compute
 * exactly below m = 3.
 */
function approximationMargin(smallestShape: number): number {
  return 0.1 / (smallestShape * Math.sqrt(smallestShape)) + 1e-9;
}
const EXACT_BELOW_SHAPE = 3;
/** Pairs (x_A, x_B) less likely than this are decided by the approximation even in a close call. */
const NEGLIGIBLE_PAIR = 1e-15;

/** The binomial pmf of n trials at rate p on the range [lo, hi] where it is above 1e-14 of its peak. */
interface PmfRange {
  readonly lo: number;
  readonly hi: number;
  readonly pmf: Float64Array;
}

const PMF_CUTOFF = 1e-14;

function binomialPmfRange(n: number, p: number): PmfRange {
  // pmf(k) = Beta(k + 1, n − k + 1) density at p / (n + 1), Loader-accurate through betaLogDensity, every
  // 32 steps; in between the ratio pmf(k + 1)/pmf(k) = (n − k)/(k + 1) · p/(1 − p).
  const logScale = Math.log(n + 1);
  const logPmf = (k: number): number => betaLogDensity(p, k + 1, n - k + 1) - logScale;
  const odds = p / (1 - p);
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const peak = Math.exp(logPmf(mode));
  const floor = peak * PMF_CUTOFF;
  const values: number[] = [peak];
  const below: number[] = [];
  let hi = mode;
  let v = peak;
  while (hi < n) {
    v = (hi + 1 - mode) % 32 === 0 ? Math.exp(logPmf(hi + 1)) : (v * (n - hi) * odds) / (hi + 1);
    if (v < floor) break;
    values.push(v);
    hi++;
  }
  let lo = mode;
  v = peak;
  while (lo > 0) {
    v = (mode - lo + 1) % 32 === 0 ? Math.exp(logPmf(lo - 1)) : (v * lo) / ((n - lo + 1) * odds);
    if (v < floor) break;
    below.push(v);
    lo--;
  }
  const pmf = new Float64Array(hi - lo + 1);
  below.reverse().forEach((value, i) => {
    pmf[i] = value;
  });
  values.forEach((value, i) => {
    pmf[below.length + i] = value;
  });
  return { lo, hi, pmf };
}

/** Upper tails P(X ≥ c) for c in [lo, hi + 1] of a tabulated binomial pmf, each tail summed directly. */
function upperTails(range: PmfRange, n: number, p: number): Float64Array {
  const { lo, hi, pmf } = range;
  const size = hi - lo + 1;
  const tails = new Float64Array(size + 1);
  // The mass outside [lo, hi] is below ~1e-13; it is added from the incomplete beta at the two ends:
  // P(X ≥ hi + 1) = I_p(hi + 1, n − hi) and P(X ≤ lo − 1) = 1 − I_p(lo, n − lo + 1).
  const above = hi < n ? betaCdf(p, hi + 1, n - hi) : 0;
  const beneath = lo > 0 ? betaSf(p, lo, n - lo + 1) : 0;
  let upper = above;
  tails[size] = upper;
  const mid = Math.floor(size / 2);
  for (let i = size - 1; i >= mid; i--) {
    upper += pmf[i] as number;
    tails[i] = upper;
  }
  let lower = beneath;
  for (let i = 0; i < mid; i++) {
    tails[i] = 1 - lower;
    lower += pmf[i] as number;
  }
  return tails;
}

/**
 * Decision power of a two-variant conversion test: the probability that, with `visitorsPerVariant`
 * visitors in each arm, a control of true rate `baselineRate` and a challenger of true rate
 * baselineRate·(1 + lift), the read-out ends with P(challenger beats control) ≥ `threshold` (the
 * posterior probability of {@link probAboveControl} under `prior`). With lift 0 it is the false-alarm rate.
 *
 * Method: exact over the binomial outcomes x_A ~ Bin(n, p₀), x_B ~ Bin(n, p₀(1+lift)). For each x_A the
 * accepting x_B form a tail x_B ≥ c(x_A) (P(B beats A) rises with x_B), and c never falls as x_A rises, so
 * power = Σ_{x_A} Bin(x_A; n, p₀)·P(X_B ≥ c(x_A)), with c walked upwards once. Each comparison uses a
 * second-order Edgeworth expansion of logit p_B − logit p_A with exact digamma-family cumulants, and
 * only where that falls within its measured error of the threshold (or a shape is below 3) an exact
 * value decides: Evan Miller's closed form (2015, betaComparison.ts) when the prior's α or β is a whole
 * number (the default uniform prior), the sum has at most 20 000 terms and the shapes are small enough for
 * 1e-12 accuracy, else the quadrature of {@link probAboveControl}. The binomial pmf comes from Loader's saddle-point density
 * ({@link betaLogDensity}); outcomes below 1e-14 of the peak pmf are skipped (their mass is below 1e-12),
 * the tails are summed directly with the ends from the incomplete beta. The result equals the brute-force
 * sum over every (x_A, x_B) with the exact P to about 1e-12 (tested at n = 50 and against scipy at 200,
 * 1000 and beyond).
 * Cost: O(√(n p(1 − p))) Edgeworth evaluations (cumulants tabulated once per outcome) plus the exact
 * comparisons of close calls (a closed-form sum of a_B terms, or ~3 ms for the quadrature): measured
 * under 1 ms at n = 50 … 30 000 and ~15 ms at 1e8 with the uniform prior (`npm run bench`); with a
 * prior whose shapes are both fractional each close call costs a quadrature (~5–40 ms at small n).
 * Pairs whose joint probability is below 1e-15 are decided by the approximation even in a close call.
 * Throws StatsError('invalid_argument') for a rate outside (0, 1), lift ≤ −1 or rate·(1+lift) ≥ 1,
 * visitors that are not a whole number in 1 … 1e10, a threshold outside (0, 1) or a bad prior.
 * @example decisionPower(0.1, 0.2, 3000) //=> 0.79760… (about 80% chance of a clear read-out)
 */
export function decisionPower(
  baselineRate: number,
  lift: number,
  visitorsPerVariant: number,
  threshold = 0.95,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  const challenger = challengerRate(baselineRate, lift);
  checkFinite(visitorsPerVariant, 'the visitors per variant');
  ensure(Number.isInteger(visitorsPerVariant), `${visitorsPerVariant} is not a whole number of visitors`);
  ensure(visitorsPerVariant >= 1, `the visitors per variant must be at least 1, got ${visitorsPerVariant}`);
  ensure(
    visitorsPerVariant <= MAX_PLANNED_VISITORS,
    `the visitors per variant must be at most 1e10, got ${visitorsPerVariant}`,
  );
  checkProbability(threshold, 'the threshold');
  checkPrior(prior);
  return powerOf(baselineRate, challenger, visitorsPerVariant, threshold, prior, exactWork('this decision power'));
}

function powerOf(p0: number, p1: number, n: number, threshold: number, prior: BetaPrior, work: ExactWork): number {
  const { alpha, beta } = prior;
  const rangeA = binomialPmfRange(n, p0);
  const rangeB = binomialPmfRange(n, p1);
  const tailsB = upperTails(rangeB, n, p1);

  const cumulantsA = new LogitCumulants(rangeA.lo, n, prior);
  const cumulantsB = new LogitCumulants(rangeB.lo, n, prior);

  const accepted = (xA: number, xB: number): boolean => {
    const i = xA - rangeA.lo;
    const j = xB - rangeB.lo;
    const smallest = Math.min(alpha + xA, beta + n - xA, alpha + xB, beta + n - xB);
    if (smallest >= EXACT_BELOW_SHAPE) {
      const approximate = approximateProbAbove(cumulantsA.at(i), cumulantsB.at(j));
      const margin = approximationMargin(smallest);
      if (approximate >= threshold + margin) return true;
      if (approximate < threshold - margin) return false;
      // A close call on a pair this unlikely cannot move the power by more than its probability.
      if ((rangeA.pmf[i] as number) * (rangeB.pmf[j] as number) < NEGLIGIBLE_PAIR) return approximate >= threshold;
    }
    return exactProbAbove(xA, xB, n, prior, work) >= threshold;
  };

  let power = 0;
  let c = rangeB.lo; // smallest accepted x_B in [lo_B, hi_B] for the current x_A (hi_B + 1: none)
  for (let xA = rangeA.lo; xA <= rangeA.hi; xA++) {
    while (c <= rangeB.hi && !accepted(xA, c)) c++;
    if (c > rangeB.hi) break; // no later x_A accepts anything with visible probability either
    power += (rangeA.pmf[xA - rangeA.lo] as number) * (tailsB[c - rangeB.lo] as number);
  }
  return Math.min(Math.max(power, 0), 1);
}

/**
 * Smallest number of visitors per variant at which the decision power ({@link decisionPower}) reaches
 * `power`: the planned size for a test read out once with "P(challenger beats control) ≥ threshold".
 *
 * Method: bracket from the classic one-sided z-test size at level 1 − threshold ({@link classicSampleSizeExact})
 * by halving or doubling, then shrink the bracket by interpolation of probit(power) against √n, ending
 * with integer bisection. Decision power is slightly saw-toothed in n (the outcomes are whole numbers:
 * at ~3000 visitors it can dip by ~2e-4 from one n to the next while rising ~1.3e-4 per visitor), so
 * "smallest" is defined as a crossing: the n returned has decisionPower(n) ≥ power > decisionPower(n − 1).
 * Where the saw-tooth straddles the target another crossing may exist a few visitors away; beyond
 * that the steady rise dominates (scipy's values around 537, 443 and 3024 visitors in
 * test/reference/planning/planning_power.json each show a single crossing).
 * Cost: about 8–20 evaluations of decisionPower: measured 1.5–9 ms for plans of 16 000–45 000 visitors
 * with the uniform prior, ~10–15 ms with fractional priors (`npm run bench`).
 * Throws StatsError('invalid_argument') for a bad rate, a lift ≤ 0, a threshold or power outside (0, 1)
 * or a bad prior; StatsError('not_available') when more than 1e10 visitors per variant would be needed.
 * @example visitorsNeeded(0.1, 0.2) //=> 3024 (80% decision power at threshold 0.95, uniform prior)
 */
export function visitorsNeeded(
  baselineRate: number,
  lift: number,
  threshold = 0.95,
  power = 0.8,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  const challenger = challengerRate(baselineRate, lift);
  ensure(lift > 0, `the lift must be greater than 0 to plan for detecting it, got ${lift}`);
  checkProbability(threshold, 'the threshold');
  checkProbability(power, 'the power');
  checkPrior(prior);
  const target = power;
  const work = exactWork('this plan');
  const powerAt = (n: number): number => powerOf(baselineRate, challenger, n, threshold, prior, work);
  const tooMany = (): StatsError =>
    new StatsError(
      'not_available',
      `more than 1e10 visitors per variant would be needed to detect a lift of ${lift} on a rate of ${baselineRate}`,
    );

  let guess: number;
  try {
    guess = classicSampleSizeExact(baselineRate, lift, 1 - threshold, power, 1);
  } catch (error) {
    if (error instanceof StatsError && error.code === 'invalid_argument')
      guess = 1; // power below the false-alarm rate
    else throw error;
  }
  if (!(guess <= MAX_PLANNED_VISITORS * 4)) throw tooMany();
  const start = Math.min(Math.max(Math.ceil(guess), 1), MAX_PLANNED_VISITORS);

  // Bracket: lo fails (or is 0), hi meets the target.
  let lo: number;
  let hi: number;
  let powerLo: number;
  let powerHi: number;
  const first = powerAt(start);
  if (first >= target) {
    hi = start;
    powerHi = first;
    lo = Math.floor(start / 2);
    powerLo = lo >= 1 ? powerAt(lo) : 0;
    while (lo >= 1 && powerLo >= target) {
      hi = lo;
      powerHi = powerLo;
      lo = Math.floor(lo / 2);
      powerLo = lo >= 1 ? powerAt(lo) : 0;
    }
  } else {
    lo = start;
    powerLo = first;
    if (start >= MAX_PLANNED_VISITORS) throw tooMany();
    hi = Math.min(start * 2, MAX_PLANNED_VISITORS);
    powerHi = powerAt(hi);
    while (powerHi < target) {
      if (hi >= MAX_PLANNED_VISITORS) throw tooMany();
      lo = hi;
      powerLo = powerHi;
      hi = Math.min(hi * 2, MAX_PLANNED_VISITORS);
      powerHi = powerAt(hi);
    }
  }

  // Shrink: interpolation of probit(power) in √n while the bracket is wide, then bisection.
  // An interpolation step that fails to halve the bracket is followed by a bisection step.
  const probit = (p: number): number => normalQuantile(Math.min(Math.max(p, 1e-12), 1 - 1e-12));
  let interpolate = true;
  while (hi - lo > 1) {
    const width = hi - lo;
    let mid: number;
    if (interpolate && width > 16 && lo >= 1) {
      const zLo = probit(powerLo);
      const zHi = probit(powerHi);
      const zTarget = probit(target);
      const sLo = Math.sqrt(lo);
      const sHi = Math.sqrt(hi);
      const fraction = zHi > zLo ? (zTarget - zLo) / (zHi - zLo) : 0.5;
      const s = sLo + Math.min(Math.max(fraction, 0), 1) * (sHi - sLo);
      const guard = Math.max(1, Math.floor((hi - lo) / 16));
      mid = Math.min(Math.max(Math.round(s * s), lo + guard), hi - guard);
    } else {
      mid = Math.floor((lo + hi) / 2);
    }
    const powerMid = powerAt(mid);
    if (powerMid >= target) {
      hi = mid;
      powerHi = powerMid;
    } else {
      lo = mid;
      powerLo = powerMid;
    }
    interpolate = hi - lo <= width / 2;
  }
  return hi;
}

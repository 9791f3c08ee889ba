/**
 * Choosing a Beta prior for a conversion rate: from a mean and a weight in visitors, from a range the
 * rate is believed to lie in, or fitted to past experiments.
 *
 * A Beta(α, β) prior has mean α/(α + β) and is "worth α + β visitors" (a fact of the trade, common
 * practice): after n visitors the posterior mean is a weighted average of the prior mean (weight α + β)
 * and the observed rate (weight n). A strong prior moves read-outs; check how much the answer changes
 * with a weaker one before relying on it (prior sensitivity).
 */
import { ensure, StatsError } from './errors';
import { MAX_COUNT } from './limits';
import { findRoot } from './numeric';
import { digamma, logBeta } from './special/gamma';
import { betaCdf, betaSf } from './special/incompleteBeta';
import type { BetaPrior } from './types';

function checkFinite(value: number, what: string): void {
  ensure(typeof value === 'number' && !Number.isNaN(value), `${what} must be a number, got ${String(value)}`);
  ensure(Number.isFinite(value), `${what} must be a finite number, got ${value}`);
}

function logistic(u: number): number {
  return 1 / (1 + Math.exp(-u));
}

function logit(p: number): number {
  return Math.log(p / (1 - p));
}

/**
 * The Beta prior with a given mean rate and strength (weight in visitors).
 *
 * Method: α = mean·strength, β = (1 − mean)·strength, so the prior has mean `meanRate` and is worth
 * `strength` visitors (common practice). Cost: O(1).
 * Throws StatsError('invalid_argument') unless 0 < meanRate < 1 and strength > 0 (both finite).
 * @example priorFromMean(0.04, 500) //=> { alpha: 20, beta: 480 }
 */
export function priorFromMean(meanRate: number, strength: number): BetaPrior {
  checkFinite(meanRate, 'the mean rate');
  checkFinite(strength, 'the strength');
  ensure(meanRate > 0 && meanRate < 1, `the mean rate must be between 0 and 1 (exclusive), got ${meanRate}`);
  ensure(strength > 0, `the strength must be greater than 0 visitors, got ${strength}`);
  const alpha = meanRate * strength;
  const beta = (1 - meanRate) * strength;
  ensure(alpha > 0 && beta > 0, 'the mean rate is too close to 0 or 1 for this strength');
  return { alpha, beta };
}

/** Smallest and largest strength (α + β) priorFromInterval searches. */
const MIN_INTERVAL_STRENGTH = 1e-4;
const MAX_INTERVAL_STRENGTH = 1e9;

/**
 * The Beta prior whose central `level` credible interval is [low, high].
 *
 * Method: with tail t = (1 − level)/2, solve I_low(α, β) = t and 1 − I_high(α, β) = t (I the regularized
 * incomplete beta, {@link betaCdf}/{@link betaSf}) by nested one-dimensional root finding with Brent's
 * method ({@link findRoot}) in (logit mean, log strength): for a strength s, the mean m(s) at which the
 * mass below `low` is exactly t is unique (with s fixed, the Beta is stochastically increasing in its
 * mean); then s is the root of P(X > high) − t along that curve, bracketed by expanding from the
 * normal-approximation guess in steps of e². Such a Beta always exists in theory (as s → 0 the Beta tends
 * to two point masses at 0 and 1, as s → ∞ to one point); we search strengths 1e-4 … 1e9 visitors (the
 * range where the incomplete beta is measured accurate). A range wider than the uniform prior's (for
 * level 0.9, wider than 5%–95%) gets a U-shaped Beta with both shapes below 1, which piles its weight
 * near 0% and 100%: the honest answer to the question, but rarely a sensible belief about a rate.
 * Deterministic. Cost: about 40 × 40 evaluations of the incomplete beta (well under 50 ms).
 * Throws StatsError('invalid_argument') unless 0 < low < high < 1 and 0 < level < 1;
 * StatsError('not_available') when the range is too narrow (the prior would be worth more than 1e9 visitors)
 * or, as a numerical guard, too wide (worth less than 1e-4 visitors; not reached with double-precision ends).
 * @example priorFromInterval(0.02, 0.06, 0.9) //=> { alpha: 9.0590067…, beta: 230.509814… } (scipy agrees to 1e-14)
 */
export function priorFromInterval(low: number, high: number, level = 0.9): BetaPrior {
  checkFinite(low, 'the low end of the range');
  checkFinite(high, 'the high end of the range');
  checkFinite(level, 'the level');
  ensure(low > 0 && low < 1, `the low end of the range must be between 0 and 1 (exclusive), got ${low}`);
  ensure(high > 0 && high < 1, `the high end of the range must be between 0 and 1 (exclusive), got ${high}`);
  ensure(low < high, `the low end of the range (${low}) must be below the high end (${high})`);
  ensure(level > 0 && level < 1, `the level must be between 0 and 1 (exclusive), got ${level}`);
  const tail = (1 - level) / 2;

  const shapes = (u: number, s: number): [number, number] => [s * logistic(u), s * logistic(-u)];

  // For strength s: the logit mean u at which P(X ≤ low) = tail. P(X ≤ low) falls as u rises.
  const meanFor = (s: number): number => {
    const massBelow = (u: number): number => {
      const [a, b] = shapes(u, s);
      return betaCdf(low, a, b) - tail;
    };
    let lo = logit(low) - 1;
    let hi = logit(high) + 1;
    for (let step = 1; massBelow(lo) <= 0; step *= 2) {
      lo -= step;
      if (lo < -60) throw tooWide(low, high, level);
    }
    for (let step = 1; massBelow(hi) >= 0; step *= 2) {
      hi += step;
      if (hi > 60) throw tooWide(low, high, level);
    }
    return findRoot(massBelow, lo, hi, 1e-13);
  };
  // Along that curve, P(X > high) − tail falls from about 1 − 2·tail (s → 0) to −tail (s → ∞).
  const massAbove = (logS: number): number => {
    const s = Math.exp(logS);
    const [a, b] = shapes(meanFor(s), s);
    let above = betaSf(high, a, b);
    // The mirror image 1 − X ~ Beta(b, a) gives the same tail if the direct one fails to evaluate.
    if (!Number.isFinite(above)) above = betaCdf(1 - high, b, a);
    if (!Number.isFinite(above)) {
      throw new StatsError(
        'not_available',
        `the Beta tail above ${high} could not be evaluated for a prior worth ${s} visitors`,
      );
    }
    return above - tail;
  };

  // Normal-approximation guess: mean at the midpoint, sd = half-width / z.
  const mid = (low + high) / 2;
  const halfWidth = (high - low) / 2;
  const z = Math.abs(logit(tail)) * 0.6; // close enough to Φ⁻¹(1 − t) for a starting guess
  const guess = Math.min(
    Math.max((mid * (1 - mid) * z * z) / (halfWidth * halfWidth) - 1, 1),
    MAX_INTERVAL_STRENGTH / 10,
  );
  const minLog = Math.log(MIN_INTERVAL_STRENGTH);
  const maxLog = Math.log(MAX_INTERVAL_STRENGTH);
  let lo = Math.log(guess) - 1;
  let hi = Math.log(guess) + 1;
  while (massAbove(lo) <= 0) {
    hi = lo;
    if (lo <= minLog) throw tooWide(low, high, level);
    lo = Math.max(lo - 2, minLog);
  }
  while (massAbove(hi) >= 0) {
    lo = hi;
    if (hi >= maxLog) {
      throw new StatsError(
        'not_available',
        `the range ${low} to ${high} is too narrow for a Beta prior at level ${level}: it would be worth more than 1e9 visitors`,
      );
    }
    hi = Math.min(hi + 2, maxLog);
  }
  const logS = findRoot(massAbove, lo, hi, 1e-12);
  const s = Math.exp(logS);
  const [alpha, beta] = shapes(meanFor(s), s);
  return { alpha, beta };
}

function tooWide(low: number, high: number, level: number): StatsError {
  return new StatsError(
    'not_available',
    `the range ${low} to ${high} is too wide for a Beta prior at level ${level}: it would need a prior worth ` +
      'almost nothing that puts nearly all its weight at 0% and 100%; use a narrower range or a lower level',
  );
}

/** Fewest past results priorFromHistory accepts. */
export const MIN_HISTORY_RESULTS = 3;

const NO_OVERDISPERSION =
  'the past results vary no more than chance would explain, so they do not pin down a prior strength; ' +
  'use PRIOR_FROM_MEAN with a strength you can defend';

const ALL_OR_NOTHING =
  'the past results are spread as if every visitor in an experiment did the same thing, so no Beta prior ' +
  'worth a positive number of visitors fits them';

/** B_2j / (2j) for j = 1 … 8: the coefficients of the asymptotic series of ψ (Abramowitz & Stegun 6.3.18). */
const DIGAMMA_SERIES: readonly number[] = Object.freeze([
  1 / 12,
  -1 / 120,
  1 / 252,
  -1 / 240,
  1 / 132,
  -691 / 32760,
  1 / 12,
  -3617 / 8160,
]);

/** ψ(a + k) − ψ(a) for a > 0 and a whole k ≥ 0, without the cancellation of the two digammas at large a. */
function digammaIncrement(a: number, k: number): number {
  if (k === 0) return 0;
  if (k <= 32) {
    let sum = 0;
    for (let j = k - 1; j >= 0; j--) sum += 1 / (a + j);
    return sum;
  }
  if (a < 10) return digamma(a + k) - digamma(a);
  // Asymptotic series ψ(z) = log z − 1/(2z) − Σ B_2j/(2j z^2j) (Abramowitz & Stegun 6.3.18) taken as a
  // difference term by term: each term of the difference is small and computed to full relative precision.
  const b = a + k;
  const x = 1 / (a * a);
  const y = 1 / (b * b);
  let series = 0;
  let px = x;
  let py = y;
  for (const c of DIGAMMA_SERIES) {
    series += c * (py - px);
    px *= x;
    py *= y;
  }
  return Math.log1p(k / a) + k / (2 * a * b) - series;
}

interface History {
  readonly conversions: readonly number[];
  readonly visitors: readonly number[];
}

function checkHistory(conversions: readonly number[], visitors: readonly number[]): void {
  ensure(Array.isArray(conversions) && Array.isArray(visitors), 'conversions and visitors must be lists of counts');
  ensure(
    conversions.length === visitors.length,
    `there are ${conversions.length} conversion counts for ${visitors.length} visitor counts; give one of each per past result`,
  );
  ensure(
    conversions.length >= MIN_HISTORY_RESULTS,
    `a prior from history needs at least ${MIN_HISTORY_RESULTS} past results, got ${conversions.length}`,
  );
  conversions.forEach((x, i) => {
    const n = visitors[i] as number;
    checkFinite(x, 'a conversion count');
    checkFinite(n, 'a visitor count');
    ensure(Number.isInteger(x) && Number.isInteger(n), `${Number.isInteger(x) ? n : x} is not a whole number`);
    ensure(n >= 1, `${n} visitors is too few; each past result needs at least 1 visitor`);
    ensure(n <= MAX_COUNT, `${n} is larger than the largest count allowed (2^53)`);
    ensure(x >= 0, `${x} is below 0; conversions must be 0 or more`);
    ensure(x <= n, `${x} conversions is more than the ${n} visitors`);
  });
}

/** Pooled rate; throws when every result is all-zero or all-converted (no spread to learn from). */
function pooledRate(history: History): number {
  let x = 0;
  let n = 0;
  history.conversions.forEach((c, i) => {
    x += c;
    n += history.visitors[i] as number;
  });
  if (x === 0 || x === n) {
    throw new StatsError(
      'not_available',
      x === 0
        ? 'none of the past results had a conversion, so they do not pin down a prior; use PRIOR_FROM_MEAN with a mean and strength you can defend'
        : 'every visitor in the past results converted, so they do not pin down a prior; use PRIOR_FROM_MEAN with a mean and strength you can defend',
    );
  }
  return x / n;
}

/** Log likelihood of the Beta–Binomial model (without the binomial coefficients, which do not vary). */
function logLikelihood(history: History, alpha: number, beta: number): number {
  let sum = 0;
  const base = logBeta(alpha, beta);
  history.conversions.forEach((x, i) => {
    const n = history.visitors[i] as number;
    sum += logBeta(x + alpha, n - x + beta) - base;
  });
  return sum;
}

/**
 * Beta–Binomial maximum likelihood by profiling: for each strength s the best mean is unique (the log
 * likelihood is concave in the mean: its second derivative is s² Σ[ψ′(x+α) + ψ′(n−x+β) − ψ′(α) − ψ′(β)] < 0),
 * found as the root of the mean score; the profile's slope in s is then scanned on a grid and its
 * sign changes from + to − refined with Brent's method.
 */
function fitLikelihood(history: History): BetaPrior {
  const { conversions, visitors } = history;
  const pooled = pooledRate(history);

  // Score test at infinite strength (θ = 1/s = 0): the profile's slope in θ there is
  // [Σ (x_i − n_i p)² − p(1 − p) Σ n_i] / (2 p (1 − p)) with p the pooled rate (Tarone's statistic;
  // R. E. Tarone, Biometrika 66, 1979). At or below zero the likelihood peaks at infinite strength.
  let spread = 0;
  let totalVisitors = 0;
  let largest = 0;
  conversions.forEach((x, i) => {
    const n = visitors[i] as number;
    const gap = x - n * pooled;
    spread += gap * gap;
    totalVisitors += n;
    largest = Math.max(largest, n);
  });
  if (spread <= pooled * (1 - pooled) * totalVisitors * (1 + 1e-12)) {
    throw new StatsError('not_available', NO_OVERDISPERSION);
  }

  // d/dμ of the log likelihood, divided by s: Σ [ψ(x+α) − ψ(α)] − [ψ(n−x+β) − ψ(β)].
  const meanScore = (u: number, s: number): number => {
    const alpha = s * logistic(u);
    const beta = s * logistic(-u);
    let sum = 0;
    conversions.forEach((x, i) => {
      const n = visitors[i] as number;
      sum += digammaIncrement(alpha, x) - digammaIncrement(beta, n - x);
    });
    return sum;
  };
  const bestMean = (s: number): number => {
    const centre = logit(pooled);
    let lo = centre - 1;
    let hi = centre + 1;
    for (let step = 1; meanScore(lo, s) <= 0; step *= 2) {
      lo -= step;
      if (lo < -745) throw new StatsError('not_available', NO_OVERDISPERSION);
    }
    for (let step = 1; meanScore(hi, s) >= 0; step *= 2) {
      hi += step;
      if (hi > 745) throw new StatsError('not_available', NO_OVERDISPERSION);
    }
    return findRoot((u) => meanScore(u, s), lo, hi, 1e-13);
  };
  // d/ds of the profile log likelihood (envelope theorem), times s²/(number of results) to keep it O(1):
  // Σ μ[ψ(x+α) − ψ(α)] + (1−μ)[ψ(n−x+β) − ψ(β)] − [ψ(n+s) − ψ(s)].
  const strengthSlope = (logS: number): number => {
    const s = Math.exp(logS);
    const u = bestMean(s);
    const mu = logistic(u);
    const alpha = s * mu;
    const beta = s * logistic(-u);
    let sum = 0;
    conversions.forEach((x, i) => {
      const n = visitors[i] as number;
      sum += mu * digammaIncrement(alpha, x) + (1 - mu) * digammaIncrement(beta, n - x) - digammaIncrement(s, n);
    });
    return (sum * s * s) / conversions.length;
  };

  // Strengths beyond a million times the largest experiment add less than a millionth to any result's
  // variance: such a fit says "no spread" in all but name, and its slope is lost in rounding.
  const minLog = Math.log(1e-3);
  const maxLog = Math.log(Math.min(1e6 * largest, 1e15));
  const steps = Math.max(8, Math.ceil((maxLog - minLog) / Math.log(4)));
  const grid: number[] = [];
  const slopes: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const t = minLog + ((maxLog - minLog) * i) / steps;
    grid.push(t);
    slopes.push(strengthSlope(t));
  }
  if ((slopes[0] as number) <= 0) throw new StatsError('not_available', ALL_OR_NOTHING);
  let best: BetaPrior | undefined;
  let bestValue = -Infinity;
  for (let i = 0; i < steps; i++) {
    if ((slopes[i] as number) > 0 && (slopes[i + 1] as number) <= 0) {
      const logS = findRoot(strengthSlope, grid[i] as number, grid[i + 1] as number, 1e-12);
      const s = Math.exp(logS);
      const u = bestMean(s);
      const candidate = { alpha: s * logistic(u), beta: s * logistic(-u) };
      const value = logLikelihood(history, candidate.alpha, candidate.beta);
      if (value > bestValue) {
        bestValue = value;
        best = candidate;
      }
    }
  }
  if (best === undefined) throw new StatsError('not_available', NO_OVERDISPERSION);
  return best;
}

/**
 * Method of moments with the binomial noise removed (D. G. Kleinman, "Proportions with extraneous
 * variance: single and independent samples", JASA 68, 1973), weights w_i = n_i.
 */
function fitMoments(history: History): BetaPrior {
  const { conversions, visitors } = history;
  const p = pooledRate(history); // = Σ w_i r_i / Σ w_i with w_i = n_i
  let weight = 0;
  for (const n of visitors) weight += n;
  let spread = 0; // S = Σ w_i (r_i − p)²
  let noise = 0; // Σ c_i / n_i with c_i = w_i (1 − w_i / W)
  let extra = 0; // Σ c_i (1 − 1/n_i)
  conversions.forEach((x, i) => {
    const n = visitors[i] as number;
    const gap = x / n - p;
    spread += n * gap * gap;
    const c = n * (1 - n / weight);
    noise += c / n;
    extra += c * (1 - 1 / n);
  });
  // E[S] = p(1 − p) [Σ c_i/n_i + ρ Σ c_i (1 − 1/n_i)], ρ = 1/(α + β + 1) the intra-experiment correlation.
  const excess = spread / (p * (1 - p)) - noise;
  if (!(extra > 0) || excess <= 0) throw new StatsError('not_available', NO_OVERDISPERSION);
  const rho = excess / extra;
  if (rho >= 1) throw new StatsError('not_available', ALL_OR_NOTHING);
  const strength = 1 / rho - 1;
  return { alpha: p * strength, beta: (1 - p) * strength };
}

/**
 * A Beta prior fitted to past results: one past experiment (or arm) per entry, `conversions[i]` out of
 * `visitors[i]`, the true rates taken to vary between experiments as a Beta(α, β).
 *
 * Method `'likelihood'` (default): Beta–Binomial maximum likelihood, maximising
 * Σ log B(x_i + α, n_i − x_i + β) − log B(α, β) (e.g. Gelman et al., Bayesian Data Analysis, 3rd ed.,
 * §5.3, the rat-tumour example) by profiling the mean for each strength (the likelihood is concave in the
 * mean) and a grid-then-Brent search over log strength; deterministic. First the score test at infinite
 * strength (Tarone 1979) decides whether there is any extra-binomial spread at all.
 * Method `'moments'`: Kleinman's (1973) method of moments with weights n_i: pooled rate p = Σx/Σn,
 * S = Σ n_i (x_i/n_i − p)², and ρ = 1/(α + β + 1) solved from E[S] = p(1 − p)[Σ c_i/n_i + ρ Σ c_i(1 − 1/n_i)],
 * c_i = n_i(1 − n_i/Σn) — the between-experiment variance of the rates minus what binomial noise explains.
 * At least 3 results are required (2 give one degree of freedom for the spread, and a strength fitted to
 * them is nearly arbitrary); 10 or more give a usable estimate. The fit treats the past experiments as
 * exchangeable: if the product or the audience has changed since, the prior can mislead.
 * Cost: O(k) per likelihood evaluation for k results, a few thousand evaluations in all ('likelihood');
 * O(k) ('moments').
 * Throws StatsError('invalid_argument') for lists of different lengths, fewer than 3 results, counts that
 * are not whole, conversions above visitors, no visitors, or an unknown method;
 * StatsError('not_available') when the results vary no more than chance would explain (the maximum is at
 * infinite strength, or the moment estimate of the extra variance is ≤ 0), when no result or every visitor
 * converted, or when they look all-or-nothing (the fit runs to strength 0).
 * @example priorFromHistory([52, 61, 47, 70], [1000, 1000, 1000, 1000]) //=> { alpha: 136.4107…, beta: 2235.949… }
 * @example priorFromHistory([52, 61, 47, 70], [1000, 1000, 1000, 1000], "moments") //=> { alpha: 63.7258…, beta: 1044.549… }
 */
export function priorFromHistory(
  conversions: readonly number[],
  visitors: readonly number[],
  method: 'likelihood' | 'moments' = 'likelihood',
): BetaPrior {
  ensure(
    method === 'likelihood' || method === 'moments',
    `the method must be "likelihood" or "moments", got ${JSON.stringify(method)}`,
  );
  checkHistory(conversions, visitors);
  const history = { conversions, visitors };
  return method === 'likelihood' ? fitLikelihood(history) : fitMoments(history);
}

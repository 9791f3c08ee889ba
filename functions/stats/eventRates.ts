/**
 * Counts per exposure (Gamma–Poisson): each variant's `events` over its `exposure` (user-days,
 * sessions, …) with a Gamma(shape, rate) prior on the event rate λ. The posterior is
 * Gamma(a = shape + events, b = rate + exposure) (conjugate Gamma–Poisson, common practice; Gelman et al.,
 * Bayesian Data Analysis, 3rd ed., §2.6). The first variant is the control.
 *
 * Production paths: intervals from the Gamma quantile, P(above control) and the lift quantiles from
 * exact incomplete-beta closed forms, P(highest) for two variants from the same closed form; P(highest)
 * for three or more variants and the expected losses by quadrature of the tabulated posteriors (quadrature/,
 * compare/) in z = log λ.
 */
import { expectedLosses, highestProbabilities } from './compare';
import { ensure } from './errors';
import { gammaWorkingDensity } from './gammaDensity';
import { tabulate } from './quadrature';
import { chooseByLoss, lossThreshold } from './decisionRule';
import type { LossDecision } from './decisionRule';
import { MAX_COUNT, checkLevel, checkVariantCount } from './limits';
import { betaQuantilePair, betaTailLog } from './special/incompleteBeta';
import { gammaQuantile, gammaQuantileUpper } from './special/incompleteGamma';
import type { TabulatedDistribution } from './quadrature';
import { FLAT_GAMMA_PRIOR } from './types';
import type { EventCounts, GammaPrior, Interval, IntervalWithMedian } from './types';

/** The posterior Gamma(shape, rate) of one variant's event rate. */
interface GammaPosterior {
  readonly shape: number;
  readonly rate: number;
}

function checkPrior(prior: GammaPrior): void {
  ensure(
    Number.isFinite(prior.shape) && prior.shape > 0,
    `prior_shape: ${prior.shape} is not allowed; the prior's shape must be a number greater than 0`,
  );
  ensure(
    Number.isFinite(prior.rate) && prior.rate >= 0,
    `prior_rate: ${prior.rate} is not allowed; the prior's rate must be a number of at least 0`,
  );
}

/** Checks every variant and the prior; returns the posteriors. */
function posteriors(variants: readonly EventCounts[], prior: GammaPrior, minimum: number): GammaPosterior[] {
  checkPrior(prior);
  checkVariantCount(variants.length, minimum);
  return variants.map((v, i) => {
    const item = i + 1;
    ensure(Number.isFinite(v.events), `events, item ${item}: ${v.events} is not a number`);
    ensure(Number.isInteger(v.events), `events, item ${item}: ${v.events} is not a whole number`);
    ensure(v.events >= 0, `events, item ${item}: ${v.events} is below 0; events must be 0 or more`);
    ensure(v.events <= MAX_COUNT, `events, item ${item}: ${v.events} is above the largest count allowed, 2^53`);
    ensure(Number.isFinite(v.exposure), `exposure, item ${item}: ${v.exposure} is not a number`);
    ensure(v.exposure > 0, `exposure, item ${item}: ${v.exposure} is not allowed; exposure must be greater than 0`);
    return { shape: prior.shape + v.events, rate: prior.rate + v.exposure };
  });
}

/**
 * The posteriors tabulated in z = log λ. They share that working variable, so compare/ evaluates one
 * posterior's cdf at another's nodes directly in z, without the round trip through λ = e^z.
 */
function tabulateAll(ps: readonly GammaPosterior[]): TabulatedDistribution[] {
  return ps.map((p) => tabulate(gammaWorkingDensity(p.shape, p.rate), { coordinate: 'log-rate' }));
}

/**
 * P(λ_B > λ_A) for independent Gamma(a_A, b_A) and Gamma(a_B, b_B) rates: exactly I_z(a_A, a_B) with
 * z = b_A/(b_A + b_B) (b_A·λ_A/(b_A·λ_A + b_B·λ_B) is Beta(a_A, a_B); outside check values,
 * shared/check-values.md). Both z and 1 − z are formed as ratios, so neither is rounded from the other.
 */
function probGreater(b: GammaPosterior, a: GammaPosterior): number {
  // Both passed to the incomplete beta: near 1 a double holds 1 − z only to ~1e-16 absolute, which with a
  // small shape moved I_z by 2e-6 at an exposure ratio of 1e-14 (the pair then summed to 1.000002).
  const total = a.rate + b.rate;
  return Math.exp(betaTailLog(a.rate / total, b.rate / total, a.shape, b.shape, false));
}

/**
 * Per variant: the central credible interval of its event rate (events per unit of exposure) at `level`.
 *
 * Method: the equal-tailed quantiles of the posterior Gamma(shape + events, rate + exposure), each
 * tail computed directly (gammaQuantile for the lower end, gammaQuantileUpper for the upper), divided
 * by the posterior rate. Accuracy: that of the Gamma quantile (≤ 1e-13 relative, checked against
 * scipy.stats.gamma in test/stats/eventRates.test.ts). Cost: two Gamma quantiles per variant.
 * Throws StatsError('invalid_argument') for a bad count, exposure, prior or level; at least one and at
 * most 50 variants.
 * @example eventsRateInterval([{ events: 120, exposure: 1000 }], 0.95, FLAT_GAMMA_PRIOR)
 * //=> [{ lower: 0.10040259156274…, upper: 0.14349058536935… }] (scipy: gamma.ppf(0.025, 121, scale=1/1000))
 */
export function eventsRateInterval(
  variants: readonly EventCounts[],
  level = 0.95,
  prior: GammaPrior = FLAT_GAMMA_PRIOR,
): Interval[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  return posteriors(variants, prior, 1).map((p) => ({
    lower: gammaQuantile(tail, p.shape) / p.rate,
    upper: gammaQuantileUpper(tail, p.shape) / p.rate,
  }));
}

/**
 * Per variant: the probability that its true event rate is the highest; the values sum to 1.
 *
 * Method: with two variants the exact closed form P(λ_B > λ_A) = I_z(a_A, a_B), z = b_A/(b_A + b_B),
 * each of the pair computed directly (never 1 − the other). With three or more, quadrature
 * P(i highest) = ∫ f_i ∏_{j≠i} F_j of the posteriors tabulated in z = log λ (compare/ranking.ts). Accuracy 1e-9
 * absolute or better (tested against scipy.integrate.quad). Cost: two incomplete betas, or one
 * tabulation per variant plus O(k × nodes) on one shared grid (compare/sharedHighest.ts).
 * Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example eventsProbHighest([{ events: 120, exposure: 1000 }, { events: 145, exposure: 1010 }], FLAT_GAMMA_PRIOR)
 * //=> [0.07320343562…, 0.92679656437…]
 */
export function eventsProbHighest(variants: readonly EventCounts[], prior: GammaPrior = FLAT_GAMMA_PRIOR): number[] {
  const ps = posteriors(variants, prior, 2);
  const [a, b] = ps;
  if (ps.length === 2 && a !== undefined && b !== undefined) return [probGreater(a, b), probGreater(b, a)];
  return highestProbabilities(tabulateAll(ps));
}

/**
 * Per challenger (every variant after the first): P(its event rate > the control's).
 *
 * Method: the exact closed form P(λ_B > λ_A) = I_z(a_A, a_B) with z = b_A/(b_A + b_B) (outside check
 * values, shared/check-values.md), through the incomplete beta, which keeps relative accuracy in the
 * lower tail down to 1e-300. Cost: one incomplete beta per challenger (O(1) in the tails,
 * O(√(events)) near the centre). Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example eventsProbAboveControl([{ events: 120, exposure: 1000 }, { events: 145, exposure: 1010 }], FLAT_GAMMA_PRIOR)
 * //=> [0.92679656437…]
 */
export function eventsProbAboveControl(
  variants: readonly EventCounts[],
  prior: GammaPrior = FLAT_GAMMA_PRIOR,
): number[] {
  const [control, ...challengers] = posteriors(variants, prior, 2);
  if (control === undefined) return [];
  return challengers.map((p) => probGreater(p, control));
}

/**
 * The lift quantile: the r with P(λ_B/λ_A − 1 ≤ r) = p (or, with `upper`, P(… > r) = p).
 *
 * With W = b_B·λ_B/(b_A·λ_A + b_B·λ_B) ~ Beta(a_B, a_A), λ_B/λ_A = (W/(1 − W))·(b_A/b_B), increasing in
 * W; so the ratio's quantile is exp(logit w_p + log b_A − log b_B) with w_p the Beta(a_B, a_A) quantile
 * (equivalently (λ_B/λ_A)·(a_A b_B)/(a_B b_A) ~ F(2a_B, 2a_A)). The quantile solver returns w_p and
 * 1 − w_p each to full relative precision, so neither is rounded from the other, and the lift is expm1
 * of the log ratio.
 */
function liftQuantile(b: GammaPosterior, a: GammaPosterior, p: number, upper: boolean): number {
  const [w, oneMinusW] = betaQuantilePair(p, b.shape, a.shape, upper);
  return Math.expm1(Math.log(w) - Math.log(oneMinusW) + Math.log(a.rate) - Math.log(b.rate));
}

/**
 * Per challenger: lower, median and upper of the relative lift λ_i/λ_control − 1 at `level`
 * (0.1 means a 10% higher rate).
 *
 * Method: exact closed form. With a = shape + events and b = rate + exposure per variant,
 * P(λ_B/λ_A ≤ r) = I_x(a_B, a_A) with x = k/(1 + k), k = r·b_B/b_A (the scaled ratio is an F(2a_B, 2a_A)
 * variable: each b·λ is a unit Gamma and G_B/(G_A + G_B) is Beta(a_B, a_A); standard, e.g. Johnson,
 * Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 2, ch. 27). The quantiles invert it
 * through the incomplete-beta quantile pair [w, 1 − w]; each tail is solved as the smaller tail.
 * Accuracy 1e-9 absolute or better (tested against scipy quadrature of ∫ f_A(x) F_B(r x) dx).
 * Cost: three incomplete-beta quantiles (each 4–8 incomplete betas) per challenger.
 * Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example eventsLiftInterval([{ events: 120, exposure: 1000 }, { events: 145, exposure: 1010 }], 0.95, FLAT_GAMMA_PRIOR)
 * //=> [{ lower: -0.060332110831…, median: 0.195229448188…, upper: 0.523066893381… }]
 */
export function eventsLiftInterval(
  variants: readonly EventCounts[],
  level = 0.95,
  prior: GammaPrior = FLAT_GAMMA_PRIOR,
): IntervalWithMedian[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  const [control, ...challengers] = posteriors(variants, prior, 2);
  if (control === undefined) return [];
  return challengers.map((p) => ({
    lower: liftQuantile(p, control, tail, false),
    median: liftQuantile(p, control, 0.5, false),
    upper: liftQuantile(p, control, tail, true),
  }));
}

/**
 * Per variant: the expected loss E[max_j λ_j − λ_i], the event rate given up on average by choosing it.
 *
 * Method: quadrature of loss_i = ∫ F_i(x)·(1 − ∏_{j≠i} F_j(x)) dx over the posteriors tabulated in
 * z = log λ (compare/losses.ts), which keeps the tails that the two-variant closed form
 * m_B·I_z(a_A, a_B + 1) − m_A·I_z(a_A + 1, a_B) loses to cancellation. Accuracy 1e-9 relative to the
 * rates' scale (tested against scipy quadrature and that closed form in 50-digit mpmath).
 * Cost: one tabulation per variant plus O(k × nodes) on one shared grid (compare/losses.ts).
 * Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example eventsExpectedLoss([{ events: 120, exposure: 1000 }, { events: 145, exposure: 1010 }], FLAT_GAMMA_PRIOR)
 * //=> [0.0240855701596…, 0.000531114714063…]
 */
export function eventsExpectedLoss(variants: readonly EventCounts[], prior: GammaPrior = FLAT_GAMMA_PRIOR): number[] {
  return expectedLosses(tabulateAll(posteriors(variants, prior, 2)));
}

/**
 * Per challenger: P(λ_i/λ_control − 1 > minLift), the probability that its event rate is more than minLift
 * above the control's (a negative minLift asks "no worse than": −0.05 is "at most 5% lower").
 *
 * Method: exact closed form. With a = shape + events and b = rate + exposure per variant, each b·λ is a
 * unit Gamma, so λ_i/λ_control ≤ r exactly when W = b_i λ_i/(b_control λ_control + b_i λ_i) ≤ x with
 * x = r·b_i/(b_control + r·b_i), and W ~ Beta(a_i, a_control): P(lift > r − 1) = 1 − I_x(a_i, a_control)
 * (the scaled ratio is F(2a_i, 2a_control); Johnson, Kotz & Balakrishnan, vol. 2, ch. 27). x and 1 − x
 * = b_control/(b_control + r·b_i) are both formed as ratios, and the upper tail is computed directly
 * (betaTailLog), so a probability of 1e-30 keeps its relative accuracy. Accuracy: that of the incomplete
 * beta (checked against scipy.special.betainc in test/stats/eventRates.liftAbove.test.ts). Cost: one
 * incomplete beta per challenger.
 * Throws StatsError('invalid_argument') for bad input (2 to 50 variants) or minLift ≤ −1 or not finite.
 * @example eventsProbLiftAbove([{ events: 120, exposure: 1000 }, { events: 145, exposure: 1010 }], 0, FLAT_GAMMA_PRIOR)
 * //=> [0.92679656437…] (the same as eventsProbAboveControl at minLift 0)
 */
export function eventsProbLiftAbove(
  variants: readonly EventCounts[],
  minLift: number,
  prior: GammaPrior = FLAT_GAMMA_PRIOR,
): number[] {
  ensure(
    Number.isFinite(minLift) && minLift > -1,
    `min_lift: ${minLift} is not allowed; the minimum lift is a number greater than -1 (-0.05 asks "no worse than 5% below")`,
  );
  const [control, ...challengers] = posteriors(variants, prior, 2);
  if (control === undefined) return [];
  const ratio = 1 + minLift;
  return challengers.map((p) => {
    const scaled = ratio * p.rate;
    const total = control.rate + scaled;
    return Math.exp(betaTailLog(scaled / total, control.rate / total, p.shape, control.shape, true));
  });
}

/**
 * The decision rule of DECISION on event rates: choose the variant with the smallest expected loss once
 * that loss is at most maxLoss (default 1% of the control's posterior mean rate (shape + events)/(rate +
 * exposure), in events per unit of exposure). Cost and errors as eventsExpectedLoss, plus
 * StatsError('invalid_argument') for a maxLoss below 0.
 * @example eventsDecide([{ events: 1200, exposure: 10000 }, { events: 1450, exposure: 10100 }], undefined, FLAT_GAMMA_PRIOR).index //=> 1 (B is chosen: its loss, about 2.1e-9, is below the default max_loss 0.001201)
 */
export function eventsDecide(
  variants: readonly EventCounts[],
  maxLoss: number | undefined,
  prior: GammaPrior = FLAT_GAMMA_PRIOR,
): LossDecision {
  const losses = eventsExpectedLoss(variants, prior);
  const [control] = posteriors(variants, prior, 2);
  return chooseByLoss(losses, lossThreshold(maxLoss, control === undefined ? 0 : control.shape / control.rate));
}

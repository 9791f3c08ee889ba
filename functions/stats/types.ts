/**
 * Shared types of the statistics core. Plain data only: no Office, no DOM, no state.
 */

/** One variant's observed counts: `conversions` successes out of `visitors` trials. */
export interface ConversionCounts {
  readonly conversions: number;
  readonly visitors: number;
}

/** A Beta(alpha, beta) prior on a rate; both parameters > 0. Read as "worth alpha + beta visitors". */
export interface BetaPrior {
  readonly alpha: number;
  readonly beta: number;
}

/** The uniform prior Beta(1, 1), the catalogue's default. */
export const UNIFORM_PRIOR: BetaPrior = Object.freeze({ alpha: 1, beta: 1 });

/** A lower, median and upper summary of a posterior quantity (a lift, a difference). */
export interface IntervalWithMedian {
  readonly lower: number;
  readonly median: number;
  readonly upper: number;
}

/** A two-ended credible interval. */
export interface Interval {
  readonly lower: number;
  readonly upper: number;
}

/** A table for a chart: a grid of x values and one density column per series, each as long as the grid. */
export interface DensityTable {
  readonly grid: number[];
  readonly densities: number[][];
}

/**
 * A log-concave density written in a working variable z in which it is smooth and has exponential
 * (or lighter) tails: logit of a rate for a Beta, log of a rate for a Gamma, asinh of the standardised
 * value for a Student t. The tabulation (quadrature/) integrates in z and reports in the value x = toValue(z).
 */
export interface WorkingDensity {
  /** Unnormalised log density in z, accurate *relative to its maximum*: logDensity(mode) ≈ 0. */
  logDensity(z: number): number;
  /** d logDensity / dz. */
  slope(z: number): number;
  /** −d² logDensity / dz² (> 0 for a strictly log-concave density). */
  curvature(z: number): number;
  /** z at the maximum of logDensity. */
  readonly mode: number;
  /** The reported value at z (rate, mean, events per exposure). Strictly increasing. */
  toValue(z: number): number;
  /** Inverse of toValue. */
  toWorking(x: number): number;
  /** d toValue / dz, used to turn densities in z into densities in x and to integrate in x. */
  valueJacobian(z: number): number;
  /**
   * Optional: log valueJacobian(toWorking(x)) computed from the value x directly, where that is cheaper
   * (for a rate in logit it is log x + log(1 − x)). Integrals that map a value into this density use it.
   */
  logJacobianAtValue?(x: number): number;
  /** Smallest and largest value the quantity can take (e.g. 0 and 1 for a rate). */
  readonly valueRange: readonly [number, number];
  /** The exact mean of the value, when known in closed form. */
  readonly exactMean?: number;
}

/** One variant's summary statistics of a per-visitor metric (COUNT, AVERAGE, STDEV.S of its values). */
export interface MeanSummary {
  readonly count: number;
  readonly mean: number;
  readonly sd: number;
}

/** One variant's event count over its exposure (user-days, sessions, …). */
export interface EventCounts {
  readonly events: number;
  readonly exposure: number;
}

/** A Gamma(shape, rate) prior on an event rate: shape > 0, rate ≥ 0 (rate 0 is flat on the rate). */
export interface GammaPrior {
  readonly shape: number;
  readonly rate: number;
}

/** The catalogue's default Gamma prior, Gamma(1, 0). */
export const FLAT_GAMMA_PRIOR: GammaPrior = Object.freeze({ shape: 1, rate: 0 });

/**
 * Revenue per visitor from the totals an analytics export gives (orders, visitors, revenue and, when
 * known, the standard deviation of order values): the read-out behind the REVENUE_ worksheet functions.
 *
 * Per variant R = p × v with p the conversion rate and v the average order value, independent:
 *  - p ~ Beta(1 + orders, 1 + visitors − orders) (uniform prior, as the conversion functions' default);
 *  - v: with order_sd, Student t with orders − 1 degrees of freedom, centre revenue/orders, scale
 *    order_sd/√orders (reference prior, as the MEAN_ functions; orders ≥ 2); without, order values are
 *    exponential with mean v and the prior p(λ) ∝ 1/λ on λ = 1/v, so λ ~ Gamma(orders, revenue)
 *    (orders ≥ 1). The exponential model understates the spread when a few orders are very large.
 * The first variant is the control. Every posterior of R is tabulated (revenueDensity.ts,
 * revenueStudent.ts) and compared by compare.ts.
 *
 * What the edge cases mean (decided here, stated in the help):
 *  - 0 orders: nothing is known about that variant's order value, so its R has no posterior: not
 *    available (#N/A) naming the variant; revenue must then be 0 (else invalid: revenue comes from orders).
 *  - exponential model with revenue 0 (every order free): the order value's posterior is improper at 0:
 *    not available; with order_sd the t model computes it (a centre of 0).
 *  - 1 order with order_sd: the t needs 2 orders (STDEV.S of one value is undefined): not available.
 *  - order_sd 0: every order had the same value m, so v = m exactly (the t's limit) and R = m·p; with
 *    revenue 0 as well R is exactly 0: not available.
 *  - The t model lets v (and so R) be negative when order_sd is large beside revenue/orders and orders
 *    are few. Intervals, P(highest), P(above control) and expected losses use the whole posterior; a
 *    relative lift needs a control that is positive for sure: when the control's P(v ≤ 0) exceeds 1e-6
 *    the lift functions are not available (as MEAN_LIFT_INTERVAL), below that its small negative part is
 *    kept exactly.
 *  - Expected losses need a finite mean: the exponential model's v has none with 1 order, the t's none
 *    with 2 orders (a Cauchy): not available.
 */
import { expectedLosses, highestProbabilities, probabilityGreater, ratioCdf, ratioQuantile, ratioSf } from './compare';
import { chooseByLoss, lossThreshold } from './decisionRule';
import type { LossDecision } from './decisionRule';
import { ensure, StatsError } from './errors';
import { MAX_COUNT, MIN_ORDER_SD_SHARE, checkLevel, checkVariantCount } from './limits';
import { PANEL_ORDER, tabulate } from './quadrature';
import type { TabulatedDistribution } from './quadrature';
import { findRoot, gaussLegendre } from './numeric';
import { exponentialRevenueDensity, scaledRateDensity } from './revenueDensity';
import { logFrame, sinhFrame, studentModel, studentRevenueDensity } from './revenueStudent';
import type { RevenueFrame, StudentModel } from './revenueStudent';
import { studentTCdf } from './special/studentT';
import { NO_MEMO } from './tableMemo';
import type { TableSource } from './tableMemo';
import type { Interval, IntervalWithMedian } from './types';

/** One variant's totals. orderSd: the standard deviation of its order values (STDEV.S), if known. */
export interface RevenueTotals {
  readonly orders: number;
  readonly visitors: number;
  readonly revenue: number;
  readonly orderSd?: number;
}

/** Largest chance of a negative order value the control may have for a relative lift (as MEAN_LIFT_INTERVAL). */
const LIFT_ZERO_MASS = 1e-6;
/** Below this chance of a negative order value for every variant, the order_sd model is read in log R. */
const LOG_FRAME_MASS = 1e-13;

/** Checks the totals (argument names and items in every message); true when order_sd is given. */
function checkTotals(variants: readonly RevenueTotals[], minimum: number): boolean {
  checkVariantCount(variants.length, minimum);
  const withSd = variants[0]?.orderSd !== undefined;
  variants.forEach((v, i) => {
    const item = i + 1;
    ensure(Number.isFinite(v.visitors), `visitors, item ${item}: ${v.visitors} is not a number`);
    ensure(Number.isInteger(v.visitors), `visitors, item ${item}: ${v.visitors} is not a whole number`);
    ensure(
      v.visitors >= 1,
      `visitors, item ${item}: ${v.visitors} is below 1; every variant needs at least one visitor`,
    );
    ensure(v.visitors <= MAX_COUNT, `visitors, item ${item}: ${v.visitors} is above the largest count allowed, 2^53`);
    ensure(Number.isFinite(v.orders), `orders, item ${item}: ${v.orders} is not a number`);
    ensure(Number.isInteger(v.orders), `orders, item ${item}: ${v.orders} is not a whole number`);
    ensure(v.orders >= 0, `orders, item ${item}: ${v.orders} is below 0; orders are 0 or more`);
    ensure(
      v.orders <= v.visitors,
      `orders, item ${item}: ${v.orders} is more than its visitors (${v.visitors}); count each ordering visitor once`,
    );
    ensure(Number.isFinite(v.revenue), `revenue, item ${item}: ${v.revenue} is not a finite number`);
    ensure(v.revenue >= 0, `revenue, item ${item}: ${v.revenue} is below 0; total revenue is 0 or more`);
    ensure(
      v.orders > 0 || v.revenue === 0,
      `revenue, item ${item}: ${v.revenue} with 0 orders; revenue comes from orders, so it is 0 while orders is 0`,
    );
    ensure(
      (v.orderSd !== undefined) === withSd,
      `order_sd, item ${item}: ${withSd ? 'missing' : 'given'}; give order_sd for every variant or for none`,
    );
    if (v.orderSd !== undefined) {
      ensure(Number.isFinite(v.orderSd), `order_sd, item ${item}: ${v.orderSd} is not a finite number`);
      ensure(v.orderSd >= 0, `order_sd, item ${item}: ${v.orderSd} is below 0; a standard deviation is 0 or more`);
      const least = (MIN_ORDER_SD_SHARE * v.revenue) / v.orders;
      ensure(
        v.orderSd === 0 || v.orders < 2 || v.orderSd * v.orders >= MIN_ORDER_SD_SHARE * v.revenue * (1 - 1e-12),
        `order_sd, item ${item}: ${v.orderSd} is below 0.1% of this variant's average order value (revenue/orders = ` +
          `${shortNumber(v.revenue / v.orders)}); enter 0 if every order had about the same value, or an order_sd ` +
          `of at least ${shortNumber(least)}`,
      );
    }
  });
  return withSd;
}

/** A number for a message, to 3 significant digits as Excel shows it (6.09E+10, 0.05). */
function shortNumber(x: number): string {
  if (x !== 0 && (Math.abs(x) >= 1e6 || Math.abs(x) < 1e-3)) return x.toExponential(2).replace('e', 'E');
  return String(Number(x.toPrecision(3)));
}

/** Throws not_available where a variant's revenue per visitor has no posterior (see the file header). */
function checkPosteriors(variants: readonly RevenueTotals[]): void {
  variants.forEach((v, i) => {
    const item = i + 1;
    if (v.orders === 0) {
      throw new StatsError(
        'not_available',
        `orders, item ${item}: no orders yet, so nothing is known about this variant's order value and its ` +
          'revenue per visitor has no posterior; wait for its first order',
      );
    }
    if (v.orderSd === undefined && v.revenue === 0) {
      throw new StatsError(
        'not_available',
        `revenue, item ${item}: 0 from ${v.orders} orders; with exponential order values a total of 0 has no ` +
          'posterior; give order_sd (the t model) if orders can be free',
      );
    }
    if (v.orderSd !== undefined && v.orders === 1) {
      throw new StatsError(
        'not_available',
        `orders, item ${item}: 1 order, and order_sd needs at least 2 (STDEV.S of one value has no meaning); ` +
          'leave order_sd out to use exponential order values',
      );
    }
    if (v.orderSd === 0 && v.revenue === 0) {
      throw new StatsError(
        'not_available',
        `revenue, item ${item}: 0 with order_sd 0, so every order was free and revenue per visitor is exactly 0; ` +
          'there is nothing uncertain to compare',
      );
    }
  });
}

/** P(v ≤ 0) of a variant under the t model (exact, through the t distribution function); 0 otherwise. */
function negativeMass(v: RevenueTotals): number {
  if (v.orderSd === undefined || v.orderSd === 0) return 0;
  const model = studentModel(v.orders, v.visitors, v.revenue, v.orderSd);
  return studentTCdf(-model.m / model.s, model.nu);
}

/** The frame every order_sd variant of one call is tabulated in (see LOG_FRAME_MASS and sinhFrame). */
function frameFor(variants: readonly RevenueTotals[]): RevenueFrame {
  const models = variants
    .filter((v) => (v.orderSd ?? 0) > 0)
    .map((v) => studentModel(v.orders, v.visitors, v.revenue, v.orderSd as number));
  if (models.every((m) => studentTCdf(-m.m / m.s, m.nu) < LOG_FRAME_MASS)) return logFrame();
  // One stretched sinh for all (so compare.ts reads every table in one coordinate): centred in the middle
  // of the means, as wide as twice the widest posterior (or a quarter of the means' range), stretched by
  // √ν of the heaviest tails.
  let lo = Infinity;
  let hi = -Infinity;
  let widest = 0;
  let nu = Infinity;
  for (const m of models) {
    lo = Math.min(lo, m.centre);
    hi = Math.max(hi, m.centre);
    widest = Math.max(widest, scaleOf(m));
    nu = Math.min(nu, m.nu);
  }
  return sinhFrame(lo + (hi - lo) / 2, Math.max(2 * widest, (hi - lo) / 4), Math.max(1, Math.sqrt(nu)));
}

/** A scale of R under the t model: √((m·sd(p))² + (E[p]·s)²). */
function scaleOf(m: StudentModel): number {
  const { a, b } = m;
  const rateSd = Math.sqrt((a * b) / ((a + b) * (a + b) * (a + b + 1)));
  return Math.hypot(m.m * rateSd, (a / (a + b)) * m.s);
}

/** The tabulated posterior of one variant's R (from `tables`, keyed by model, totals and frame). */
function posteriorOf(v: RevenueTotals, frame: RevenueFrame, tables: TableSource): TabulatedDistribution {
  const { orders, visitors, revenue, orderSd } = v;
  if (orderSd === undefined) {
    return tables.table(`revenue-exp:${orders}:${visitors}:${revenue}`, () =>
      tabulate(exponentialRevenueDensity(orders, visitors, revenue), { coordinate: 'log-revenue' }),
    );
  }
  if (orderSd === 0) {
    return tables.table(`revenue-fixed:${orders}:${visitors}:${revenue}`, () =>
      tabulate(scaledRateDensity(1 + orders, 1 + (visitors - orders), revenue / orders)),
    );
  }
  return tables.table(`revenue-sd:${orders}:${visitors}:${revenue}:${orderSd}:${frame.coordinate}`, () =>
    tabulate(studentRevenueDensity(studentModel(orders, visitors, revenue, orderSd), frame), {
      coordinate: frame.coordinate,
    }),
  );
}

/** The control's R given R > 0 in log R (for a relative lift when its order value may be negative). */
function positivePartOf(v: RevenueTotals, tables: TableSource): TabulatedDistribution {
  return posteriorOf(v, logFrame(), tables);
}

/** Checks and tabulates every variant (equal totals share one table). */
function posteriors(variants: readonly RevenueTotals[], minimum: number, tables: TableSource): TabulatedDistribution[] {
  checkTotals(variants, minimum);
  checkPosteriors(variants);
  const frame = frameFor(variants);
  const seen = new Map<string, TabulatedDistribution>();
  return variants.map((v, i) => {
    const key = `${v.orders}/${v.visitors}/${v.revenue}/${v.orderSd}`;
    let d = seen.get(key);
    if (d === undefined) {
      d = posteriorInFrame(variants, i, frame, tables);
      seen.set(key, d);
    }
    return d;
  });
}

/** Most variants compared when some need a frame of their own (their losses then cost O(k³) mapped integrals). */
const MAX_OWN_FRAME_VARIANTS = 10;

/**
 * One variant's table in the call's shared frame, or, when its scale is so far below the frame's (a
 * variant at 2^53 visitors beside one at 3) that the shared coordinate cannot resolve it (the tabulation's
 * panel budget runs out), in a sinh frame of its own: compare.ts then maps between the coordinates (exact,
 * but the expected losses cost O(k³) mapped integrals, ~0.3 s at 10 variants), so only up to
 * MAX_OWN_FRAME_VARIANTS variants; beyond, not available, naming the variant.
 */
function posteriorInFrame(
  variants: readonly RevenueTotals[],
  i: number,
  frame: RevenueFrame,
  tables: TableSource,
): TabulatedDistribution {
  const v = variants[i] as RevenueTotals;
  try {
    return posteriorOf(v, frame, tables);
  } catch (error) {
    if (!(error instanceof StatsError) || v.orderSd === undefined || v.orderSd === 0) throw error;
    if (frame.valueRange[0] >= 0) throw error;
    const own = frameFor([v]);
    if (own.coordinate === frame.coordinate) throw error;
    if (variants.length > MAX_OWN_FRAME_VARIANTS) {
      const scales = variants
        .filter((w) => (w.orderSd ?? 0) > 0 && w.orders >= 2)
        .map((w) => scaleOf(studentModel(w.orders, w.visitors, w.revenue, w.orderSd as number)));
      const ratio = scaleOf(studentModel(v.orders, v.visitors, v.revenue, v.orderSd)) / Math.max(...scales);
      throw new StatsError(
        'not_available',
        `variant ${i + 1}: the spread of its revenue per visitor is about ${shortNumber(ratio)} of the widest ` +
          `variant's, too far apart to compare ${variants.length} variants at once (at most ` +
          `${MAX_OWN_FRAME_VARIANTS} when spreads differ this much); compare it in a smaller group`,
      );
    }
    return posteriorOf(v, own, tables);
  }
}

/**
 * The posterior mean of each variant's revenue per visitor, E[p]·E[v]: E[p] = (1 + orders)/(2 + visitors);
 * E[v] = revenue/(orders − 1) with exponential order values (none with 1 order: Infinity), revenue/orders
 * with order_sd (none with 2 orders and order_sd > 0, a Cauchy: Infinity is returned as "no finite mean").
 * Cost: O(k). Throws StatsError('invalid_argument') for bad totals and StatsError('not_available') where a
 * variant has no posterior (see the file header).
 * @example revenueMean([{ orders: 40, visitors: 1000, revenue: 2000 }]) //=> [2.0983…] (41/1002 · 2000/39)
 */
export function revenueMean(variants: readonly RevenueTotals[]): number[] {
  checkTotals(variants, 1);
  checkPosteriors(variants);
  return variants.map((v) => {
    const rate = (1 + v.orders) / (2 + v.visitors);
    if (v.orderSd === undefined) return v.orders > 1 ? rate * (v.revenue / (v.orders - 1)) : Infinity;
    if (v.orderSd > 0 && v.orders === 2) return Infinity;
    return rate * (v.revenue / v.orders);
  });
}

/**
 * Per variant: the central credible interval of its revenue per visitor at `level` (equal tails, each
 * end the tabulated posterior's quantile, the upper one from its upper tail directly).
 * Accuracy: within 1e-9 relative of the value (checked against mpmath quadrature of the product model,
 * test/reference/revenue/revenue_reference.py). Cost: one tabulation and two quantiles per variant.
 * Throws StatsError('invalid_argument') for bad totals or level; StatsError('not_available') where a
 * variant has no posterior. 1 to 50 variants.
 * @example revenueInterval([{ orders: 40, visitors: 1000, revenue: 2000 }], 0.95)[0].upper //=> 3.1620… (lower 1.3266…)
 */
export function revenueInterval(
  variants: readonly RevenueTotals[],
  level = 0.95,
  tables: TableSource = NO_MEMO,
): Interval[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  return posteriors(variants, 1, tables).map((d) => ({ lower: d.quantile(tail), upper: d.quantileUpper(tail) }));
}

/**
 * Per variant: the probability that its revenue per visitor is the highest; the values sum to 1.
 * Method: ∫ f_i Π_{j≠i} F_j over the tabulated posteriors (compare.ts). Accuracy 1e-9 absolute (against
 * mpmath / scipy quadrature of the product model). Cost: k tabulations plus O(k²) panel sums.
 * Throws as revenueInterval; 2 to 50 variants.
 * @example revenueProbHighest([{ orders: 40, visitors: 1000, revenue: 2000 }, { orders: 52, visitors: 1000, revenue: 2500 }]) //=> [0.2295…, 0.7704…]
 */
export function revenueProbHighest(variants: readonly RevenueTotals[], tables: TableSource = NO_MEMO): number[] {
  return highestProbabilities(posteriors(variants, 2, tables));
}

/**
 * Per challenger: P(its revenue per visitor > the control's). Method: ∫ f_X F_Y of the tabulated
 * posteriors, the smaller of the pair integrated directly (compare.ts). Accuracy 1e-9 absolute, tails to
 * 1e-6 relative. Cost: k tabulations plus O(panels) per challenger. Throws as revenueProbHighest.
 * @example revenueProbAboveControl([{ orders: 40, visitors: 1000, revenue: 2000 }, { orders: 52, visitors: 1000, revenue: 2500 }]) //=> [0.7704…]
 */
export function revenueProbAboveControl(variants: readonly RevenueTotals[], tables: TableSource = NO_MEMO): number[] {
  const [control, ...challengers] = posteriors(variants, 2, tables);
  if (control === undefined) return [];
  return challengers.map((d) => probabilityGreater(d, control));
}

/** The pieces of a relative lift against the control: its table given R > 0 and its negative part. */
interface LiftControl {
  /** The control's R in log R given R > 0. */
  readonly positive: TabulatedDistribution;
  /** P(R_control ≤ 0) (0 for the exponential model and order_sd 0). */
  readonly negative: number;
  /** The control's whole posterior (in the call's frame), for the negative part's integral. */
  readonly whole: TabulatedDistribution;
}

/**
 * Checks the totals and that the control's order value is positive for sure (P(v ≤ 0) ≤ 1e-6 under the t
 * model): before any tabulation, so a call that has no lift answers at once. Returns that P(v ≤ 0).
 */
function checkLiftControl(variants: readonly RevenueTotals[]): number {
  checkTotals(variants, 2);
  checkPosteriors(variants);
  const negative = negativeMass(variants[0] as RevenueTotals);
  if (negative > LIFT_ZERO_MASS) {
    const percent = 100 * negative;
    throw new StatsError(
      'not_available',
      `order_sd, item 1: the control's average order value could plausibly be zero or negative ` +
        `(${percent >= 0.1 ? percent.toFixed(1) : percent.toPrecision(2)}% under the t model, whose order_sd is ` +
        'large beside revenue/orders), so a relative lift has no meaning; compare with REVENUE_PROB_ABOVE_CONTROL',
    );
  }
  return negative;
}

/** The control's pieces for a relative lift (after checkLiftControl, whose P(v ≤ 0) is `negative`). */
function liftControl(
  variants: readonly RevenueTotals[],
  ds: readonly TabulatedDistribution[],
  negative: number,
  tables: TableSource,
): LiftControl {
  const control = variants[0] as RevenueTotals;
  const whole = ds[0] as TabulatedDistribution;
  // A table read in log R (or order_sd 0) is the posterior given R > 0, which the read-out uses whenever
  // P(R ≤ 0) < 1e-13: its negative part is then left out.
  if (whole.source.valueRange[0] >= 0) return { positive: whole, negative: 0, whole };
  return { positive: positivePartOf(control, tables), negative, whole };
}

/** 16-point Gauss–Legendre rule on [−1, 1] (the panels' rule), for the panel that holds R = 0. */
const RULE = gaussLegendre(PANEL_ORDER);

/**
 * ∫_{x<0} f_X(x)·T_Y(k·x) dx over the control's whole table X (signed frame), T = F or S: the part of a
 * lift probability from a negative control (weight P(X ≤ 0) ≤ 1e-6, so a node sum with the panel that
 * holds 0 split there is far more accurate than needed). 0 when X cannot be negative.
 */
function negativePart(x: TabulatedDistribution, y: TabulatedDistribution, k: number, upper: boolean): number {
  if (x.source.valueRange[0] >= 0) return 0;
  const zero = x.source.toWorking(0);
  if (!(zero > x.windowLeft)) return 0;
  const tail = (value: number): number => (upper ? y.sf(k * value) : y.cdf(k * value));
  let sum = 0;
  const n = PANEL_ORDER;
  for (let p = 0; p < x.panelCount; p++) {
    const a = x.edges[p] as number;
    const b = x.edges[p + 1] as number;
    if (a >= zero) break;
    if (b <= zero) {
      for (let k2 = p * n; k2 < p * n + n; k2++) {
        const mass = Math.exp((x.nodeLogWeight[k2] as number) + (x.nodeLogDensity[k2] as number));
        sum += mass * tail(x.source.toValue(x.nodeZ[k2] as number));
      }
      continue;
    }
    const half = (zero - a) / 2;
    const mid = (zero + a) / 2;
    for (let j = 0; j < n; j++) {
      const z = mid + half * (RULE.nodes[j] as number);
      sum += half * (RULE.weights[j] as number) * Math.exp(x.logDensityAt(z)) * tail(x.source.toValue(z));
    }
  }
  // Below the window (e^-230 of the peak) nothing is added.
  return sum;
}

/** P(R_y/R_x − 1 ≤ m) (upper: > m) with the control's negative part kept (see LiftControl). */
function liftTail(y: TabulatedDistribution, c: LiftControl, m: number, upper: boolean): number {
  const k = 1 + m;
  const positive = upper ? ratioSf(y, c.positive, m) : ratioCdf(y, c.positive, m);
  if (c.negative === 0) return positive;
  // R_x < 0: R_y/R_x ≤ k ⟺ R_y ≥ k·R_x.
  return (1 - c.negative) * positive + negativePart(c.whole, y, k, !upper);
}

/**
 * Per challenger: lower, median and upper of the relative lift R/R_control − 1 at `level`.
 * Method: quantiles of the ratio distribution of the tabulated posteriors (compare.ts ratioQuantile:
 * Newton on the smaller tail); under the t model with a control whose order value may be negative
 * (P ≤ 1e-6), Brent's method on the lift's distribution function with that negative part kept exactly.
 * Accuracy 1e-9 absolute (against mpmath). Cost: three quantiles per challenger (2–4 passes each).
 * Throws as revenueProbHighest, plus StatsError('not_available') naming the control when its order value
 * could plausibly be ≤ 0 (P > 1e-6) under the t model.
 * @example revenueLiftInterval([{ orders: 40, visitors: 1000, revenue: 2000 }, { orders: 52, visitors: 1000, revenue: 2500 }], 0.95)[0].median //=> 0.2428… (from −0.3018… to 1.2119…)
 */
export function revenueLiftInterval(
  variants: readonly RevenueTotals[],
  level = 0.95,
  tables: TableSource = NO_MEMO,
): IntervalWithMedian[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  const negative = checkLiftControl(variants);
  // Under the t model a challenger's R may be negative; where that is as likely as the lower tail, the
  // interval would reach below a lift of −100%, which a ratio cannot express (checked before tabulating).
  variants.slice(1).forEach((v, i) => {
    const below = negativeMass(v);
    if (below >= tail) {
      throw new StatsError(
        'not_available',
        `order_sd, item ${i + 2}: this challenger's average order value could be negative (` +
          `${(100 * below).toPrecision(2)}% under the t model), so its lift interval would reach below -100%; ` +
          'compare with REVENUE_PROB_ABOVE_CONTROL or REVENUE_PROB_LIFT_ABOVE',
      );
    }
  });
  const ds = posteriors(variants, 2, tables);
  const control = liftControl(variants, ds, negative, tables);
  return ds.slice(1).map((y) => {
    const quantile = (p: number): number => {
      const guess = ratioQuantile(y, control.positive, p);
      if (control.negative === 0) return guess;
      return liftQuantile(y, control, p, guess);
    };
    return { lower: quantile(tail), median: quantile(0.5), upper: quantile(1 - tail) };
  });
}

/**
 * The p-quantile of the lift with the control's negative part: Brent's method in v = log(1 + lift) on the
 * smaller tail, in a bracket grown from the positive part's quantile (the negative part, ≤ 1e-6, moves it
 * little).
 */
function liftQuantile(y: TabulatedDistribution, c: LiftControl, p: number, guess: number): number {
  const upper = p > 0.5;
  const target = upper ? 1 - p : p;
  // Increasing in v: P(lift ≤ m) − p, or (1 − p) − P(lift > m), at m = e^v − 1.
  const f = (v: number): number => {
    const m = Math.expm1(v);
    return upper ? target - liftTail(y, c, m, true) : liftTail(y, c, m, false) - target;
  };
  const start = Math.log1p(guess);
  let lo = start - 1e-6;
  let hi = start + 1e-6;
  for (let i = 0, w = 1e-6; i < 40 && f(lo) > 0; i++, w *= 4) lo = start - w;
  for (let i = 0, w = 1e-6; i < 40 && f(hi) < 0; i++, w *= 4) hi = start + w;
  return Math.expm1(findRoot(f, lo, hi, 1e-15));
}

/**
 * Per challenger: P(R/R_control − 1 > minLift); a negative minLift asks "no worse than". Method: the ratio
 * distribution's upper tail (compare.ts ratioSf, the smaller tail integrated directly), with the control's
 * negative part kept under the t model. Accuracy 1e-9 absolute, tails to 1e-6 relative (against mpmath).
 * Throws as revenueLiftInterval, and StatsError('invalid_argument') for minLift ≤ −1 or not finite.
 * @example revenueProbLiftAbove([{ orders: 40, visitors: 1000, revenue: 2000 }, { orders: 52, visitors: 1000, revenue: 2500 }], -0.02) //=> [0.7907…]
 */
export function revenueProbLiftAbove(
  variants: readonly RevenueTotals[],
  minLift: number,
  tables: TableSource = NO_MEMO,
): number[] {
  ensure(
    Number.isFinite(minLift) && minLift > -1,
    `min_lift: ${minLift} is not allowed; the minimum lift is a number greater than -1 (-0.02 asks "no worse than 2% below")`,
  );
  const negative = checkLiftControl(variants);
  const ds = posteriors(variants, 2, tables);
  const control = liftControl(variants, ds, negative, tables);
  return ds.slice(1).map((y) => {
    if (control.negative === 0) return ratioSf(y, control.positive, minLift);
    const lower = liftTail(y, control, minLift, false);
    return lower <= 0.5 ? 1 - lower : liftTail(y, control, minLift, true);
  });
}

/** Throws not_available when some variant's R has no finite mean (so every expected loss is infinite). */
function checkFiniteMeans(variants: readonly RevenueTotals[]): void {
  variants.forEach((v, i) => {
    if (v.orderSd === undefined && v.orders === 1) {
      throw new StatsError(
        'not_available',
        `orders, item ${i + 1}: with 1 order the exponential model's average order value has no finite mean, so ` +
          'every expected loss is infinite; wait for a second order (or give order_sd once there are 3)',
      );
    }
    if (v.orderSd !== undefined && v.orderSd > 0 && v.orders === 2) {
      throw new StatsError(
        'not_available',
        `orders, item ${i + 1}: with 2 orders the order value's posterior (a t with 1 degree of freedom) has no ` +
          'finite mean, so every expected loss is infinite; wait for a third order or leave order_sd out',
      );
    }
  });
}

/**
 * Per variant: the expected loss E[max_j R_j − R_i], revenue per visitor given up on average by choosing
 * it (in currency per visitor). Method: ∫ F_i (1 − Π_{j≠i} F_j) dR over the tabulated posteriors
 * (compare.ts; one shared grid for 3 or more variants in one coordinate). Accuracy 1e-9 relative to the
 * scale of R (against mpmath). Throws as revenueProbHighest, plus StatsError('not_available') when a
 * variant's R has no finite mean (1 order without order_sd, 2 with).
 * @example revenueExpectedLoss([{ orders: 40, visitors: 1000, revenue: 2000 }, { orders: 52, visitors: 1000, revenue: 2500 }]) //=> [0.5887…, 0.0942…]
 */
export function revenueExpectedLoss(variants: readonly RevenueTotals[], tables: TableSource = NO_MEMO): number[] {
  checkTotals(variants, 2);
  checkPosteriors(variants);
  checkFiniteMeans(variants);
  return expectedLosses(posteriors(variants, 2, tables));
}

/**
 * The decision rule of DECISION on revenue per visitor: choose the variant with the smallest expected
 * loss once it is at most maxLoss (default 1% of the control's posterior mean revenue per visitor, in
 * currency per visitor). Cost and errors as revenueExpectedLoss, plus StatsError('invalid_argument') for a
 * maxLoss below 0.
 * @example revenueDecide([{ orders: 400, visitors: 10000, revenue: 20000 }, { orders: 520, visitors: 10000, revenue: 26000 }], undefined).index //=> 1 (its loss, about 0.00016 per visitor, is below the default 0.0200…)
 */
export function revenueDecide(
  variants: readonly RevenueTotals[],
  maxLoss: number | undefined,
  tables: TableSource = NO_MEMO,
): LossDecision {
  const losses = revenueExpectedLoss(variants, tables);
  const threshold = lossThreshold(maxLoss, revenueMean([variants[0] as RevenueTotals])[0] as number);
  return chooseByLoss(losses, threshold);
}

/**
 * The posterior of revenue per visitor R = p × v as a working density for grid.ts, one variant at a time.
 *
 * p is the conversion rate, Beta(1 + orders, 1 + visitors − orders); v is the average order value,
 * independent of p: with exponential order values its rate λ = 1/v is Gamma(orders, revenue) (prior
 * p(λ) ∝ 1/λ), with a given order_sd it is a Student t (orders − 1 degrees of freedom, centre
 * revenue/orders, scale order_sd/√orders). The density of R has no closed form that stays accurate at
 * a billion visitors, so its log density at each working point is a one-dimensional integral over the
 * rate p, written in z = logit p:
 *
 *   g(ω) = ∫ f_Z(z) · k(z; ω) dz,
 *
 * with f_Z the tabulated posterior of the rate (grid.ts, nodes and weights kept) and k the order-value
 * density at the value that makes p × v = R (the "factor"). The integral is a sum over the rate table's
 * panels, visited by decreasing mass and skipped when their bound (panel mass × the factor's largest value
 * on the panel) lies e^-40 below the running total; each panel's 16 node values are integrated with the
 * trend-weighted rule of grid.ts (panelLogIntegral), accurate relative to itself where the integrand
 * changes by e^{±20} across a panel. Slope and curvature of log g (for the tabulation's window and panel
 * widths) come from the same sums: d/dω log g = E[∂k/k] and −d²/dω² log g = −E[∂² log k] − Var[∂ log k]
 * under the normalised integrand (differentiation under the integral; common practice).
 *
 * Everything is written relative to a reference point so that nothing cancels at a billion visitors:
 * the rate enters through log σ(z) − log σ(z0) = −log1p(q0·expm1(−(z − z0))) (exact for any z), and the
 * order value's log density through expm1mx around its mode (as gammaDensity.ts).
 */
import { betaWorkingDensity, logistic } from './betaDensity';
import { chebyshevDensity } from './chebyshevDensity';
import type { DensityPoint, ExactDensity } from './chebyshevDensity';
import { ensure } from './errors';
import { TabulatedDistribution, tabulate } from './quadrature';
import type { WorkingDensity } from './types';

/** Panels whose bound lies this far (in log) below the running total of an inner integral are skipped. */
export const INNER_PRUNE = 40;

/** Tabulation window of the rate (log density down to −330): covers where any outer point's integrand lives. */
export const RATE_LOG_RANGE = 330;

/** Panel width of the rate table, in local standard deviations (grid.ts uses 2 for its own tables). */
export const RATE_CURVATURE_WIDTH = 4;

/**
 * Widest rate-table panel (in z) where the curvature still matters: the integrand's nearest complex
 * singularities lie π from the real axis (where 1 + e^z = 0), so a 16-point rule on a panel of width 3
 * converges like (2π/3 + …)^-32 < 1e-19 (Davis & Rabinowitz, §4.6, Bernstein ellipse; common practice).
 */
const RATE_ABSOLUTE_WIDTH = 3;

/** log σ(z) − log σ(z0) for z0 with 1 − σ(z0) = q0, from d = z − z0, without cancellation. */
function logRateShift(d: number, q0: number): number {
  return -Math.log1p(q0 * Math.expm1(-d));
}

/** 1/k! for k = 2 … 17, the Taylor coefficients of e^e − 1 − e. */
const INVERSE_FACTORIALS: readonly number[] = (() => {
  const list: number[] = [];
  let f = 1;
  for (let k = 2; k <= 17; k++) {
    f *= k;
    list.push(1 / f);
  }
  return list;
})();

/** e^x − 1 − x: Taylor series by Horner below |x| = 0.5 (relative error < 1e-17), else the direct formula. */
function expm1mx(x: number): number {
  const size = Math.abs(x);
  if (size >= 0.5) return Math.expm1(x) - x;
  const top = size < 0.0625 ? 7 : 15;
  let sum = INVERSE_FACTORIALS[top] as number;
  for (let i = top - 1; i >= 0; i--) sum = sum * x + (INVERSE_FACTORIALS[i] as number);
  return sum * x * x;
}

/**
 * The rate's posterior Beta(a, b) in logit for the inner integrals, tabulated with wider panels
 * (4 local standard deviations) and a wider window (330), and in its left tail (log density below −20)
 * with the curvature taken as at least leftFloor·(1 − p)², so panels there are at most
 * 4/(√leftFloor·(1 − p)) wide: an outer point far in the left tail puts its whole integrand into a narrow
 * peak in the rate's exponential tail.
 */
export function rateTable(a: number, b: number, leftFloor: number): TabulatedDistribution {
  const beta = betaWorkingDensity(a, b);
  const mode = beta.mode;
  const floored: WorkingDensity = {
    ...beta,
    mode,
    curvature: (z: number): number => {
      const c = beta.curvature(z);
      // Only in the tail (20 below the peak): the bulk's integrands are as wide as the rate's own.
      if (z >= mode || beta.logDensity(z) > -20) return c;
      const q = logistic(-z);
      return Math.max(c, leftFloor * q * q);
    },
  };
  return tabulate(floored, {
    logRange: RATE_LOG_RANGE,
    curvatureWidth: RATE_CURVATURE_WIDTH,
    absoluteWidth: RATE_ABSOLUTE_WIDTH,
  });
}

/** Below this many orders a revenue density's window takes several pieces (see chebyshevDensity.ts). */
export const SEVERAL_PIECES_ORDERS = 1000;

/**
 * Revenue per visitor with exponential order values, evaluated exactly in ω = log R.
 *
 * With p ~ Beta(a, b) (a = 1 + orders, b = 1 + visitors − orders) and λ = 1/v ~ Gamma(α = orders,
 * β = revenue), log R = log p − log λ, so the density of ω is ∫ f_Z(z)·f_ℓ(log σ(z) − ω) dz with f_ℓ the
 * density of ℓ = log λ, exp(−α·expm1mx(ℓ − ℓ0)) around its mode ℓ0 = log(α/β) (gammaDensity.ts). Writing
 * L(z) = log σ(z) − log σ(z0) (z0 the rate's mode) and ω0 = log σ(z0) − ℓ0, the factor is
 * exp(−α·expm1mx(e)) with e = L(z) − (ω − ω0); ∂ log k/∂ω = α·expm1(e) and ∂² log k/∂ω² = −α·e^e.
 *
 * Cost: one rate tabulation (~30–70 panels), then per evaluation a walk over the nodes that carry the
 * integrand (~50 at large counts, ~200 at one order, whose integrand has long exponential tails).
 */
class ExponentialRevenue implements ExactDensity {
  readonly start: number;
  readonly severalPieces: boolean;
  readonly valueRange = [0, Infinity] as const;
  readonly exactMean?: number;
  private readonly table: TabulatedDistribution;
  private readonly shape: number;
  /** A = a + α and b of the integrand p^A (1 − p)^b e^{−xp}, and p0 = σ(z0). */
  private readonly sumA: number;
  private readonly shapeB: number;
  private readonly rateMode: number;
  /** L(z) at every node of the rate table. */
  private readonly nodeShift: Float64Array;
  /** log weight + log density of the rate table at every node. */
  private readonly nodeBase: Float64Array;

  constructor(orders: number, visitors: number, revenue: number) {
    const a = 1 + orders;
    const b = 1 + (visitors - orders);
    const alpha = orders;
    this.shape = alpha;
    // Below SEVERAL_PIECES_ORDERS / 2 orders the window never fitted one piece (orders 1 to 1e8 at rates
    // 0.001 to 1 tried: one piece from 1000 orders at rates up to 0.3, from 3000 at every rate; at 999 the
    // first try at FIRST_SHARE cost more pieces than the whole window's rejection).
    this.severalPieces = orders < SEVERAL_PIECES_ORDERS / 2;
    // Left of the rate's mode an outer point deep in the left tail concentrates its integrand in a peak
    // of width ~1/(√(a + α)·(1 − p)) in z: keep panels there within ~2.8 such widths (a floor of
    // 2(a + α)(1 − p)² on the curvature; with half that floor the log density 10–60 below its peak came
    // out with errors ~3e-11 at one order, against ~1e-13 with it).
    this.table = rateTable(a, b, 2 * (a + alpha));
    const n = a + b;
    const q0 = b / n;
    this.sumA = a + alpha;
    this.shapeB = b;
    this.rateMode = a / n;
    const z0 = this.table.source.mode;
    // ω0 = log σ(z0) − log(α/β) = log(a·β/((a + b)·α)), rounded once.
    this.start = Math.log(((a / n) * revenue) / alpha);
    const nodes = this.table.nodeZ;
    this.nodeBase = new Float64Array(nodes.length);
    this.nodeShift = new Float64Array(nodes.length);
    for (let i = 0; i < nodes.length; i++) {
      this.nodeBase[i] = (this.table.nodeLogWeight[i] as number) + (this.table.nodeLogDensity[i] as number);
      this.nodeShift[i] = logRateShift((nodes[i] as number) - z0, q0);
    }
    // E[R] = E[p]·E[v] with E[v] = β/(α − 1) for α > 1 (the inverse-gamma mean); none for α = 1.
    if (alpha > 1) this.exactMean = (a / n) * (revenue / (alpha - 1));
  }

  /**
   * The node of the rate table nearest the integrand's mode at ω. In z the integrand is
   * p^A (1 − p)^b e^{−x p} (x = α e^{−(ω − ω0)}/p0), whose mode solves x σ² − (x + A + b) σ + A = 0:
   * σ* = 2A/(x + A + b + √((x + A + b)² − 4xA)) (the root in (0, 1), in the form without cancellation);
   * for x beyond the double range σ* → A/x (z* = log A − log x).
   */
  private startNode(shift: number): number {
    const logX = Math.log(this.shape) - shift - Math.log(this.rateMode);
    let z: number;
    if (logX > 690) z = Math.log(this.sumA) - logX;
    else {
      const x = Math.exp(logX);
      const s = x + this.sumA + this.shapeB;
      const root = (2 * this.sumA) / (s + Math.sqrt(Math.max(0, s * s - 4 * x * this.sumA)));
      z = Math.log(root) - Math.log1p(-root);
    }
    const nodes = this.table.nodeZ;
    let lo = 0;
    let hi = nodes.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if ((nodes[mid] as number) < z) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /**
   * log ∫ f_Z k dz at ω (up to a constant) with the slope and curvature of its log: a
   * composite Gauss–Legendre sum over the rate table's nodes. The integrand is unimodal in z (log-concave
   * in log p, times the Jacobian 1 − p), so the sum starts at the node nearest its mode and walks left and
   * right until a node's term, already falling, lies e^-40 below the largest (the rest decays at least
   * exponentially). Terms are summed relative to the running largest one.
   */
  private integrate(omega: number): DensityPoint {
    const alpha = this.shape;
    const shift = omega - this.start;
    const base = this.nodeBase;
    const nodeShift = this.nodeShift;
    const count = base.length;
    const first = this.startNode(shift);
    let ref = -Infinity;
    let m0 = 0;
    let m1 = 0;
    let m2 = 0;
    let mc = 0;
    for (let side = 0; side < 2; side++) {
      const step = side === 0 ? -1 : 1;
      let previous = -Infinity;
      for (let k = side === 0 ? first : first + 1; k >= 0 && k < count; k += step) {
        const e = (nodeShift[k] as number) - shift;
        const em = expm1mx(e);
        const v = (base[k] as number) - alpha * em;
        if (v > ref) {
          const scale = ref === -Infinity ? 0 : Math.exp(ref - v);
          m0 *= scale;
          m1 *= scale;
          m2 *= scale;
          mc *= scale;
          ref = v;
        }
        const w = Math.exp(v - ref);
        m0 += w;
        const d = alpha * (em + e);
        m1 += w * d;
        m2 += w * d * d;
        mc += w * (alpha + d);
        if (v < previous && v < ref - INNER_PRUNE) break;
        previous = v;
      }
    }
    const total = ref + Math.log(m0);
    if (!(m0 > 0)) return { logDensity: total, slope: NaN, curvature: NaN };
    const mean = m1 / m0;
    const variance = Math.max(0, m2 / m0 - mean * mean);
    // ω − ω0 is known to ~2.2e-16·max(1, |ω|), which moves each term's log by α·expm1(e) times that.
    const noise = 4e-16 * Math.max(1, Math.abs(omega)) * Math.sqrt(m2 / m0);
    return { logDensity: total, slope: mean, curvature: mc / m0 - variance, noise };
  }

  evaluate(omega: number): DensityPoint {
    return this.integrate(omega);
  }

  toValue(omega: number): number {
    return Math.exp(omega);
  }

  toWorking(x: number): number {
    return Math.log(x);
  }

  valueJacobian(omega: number): number {
    return Math.exp(omega);
  }

  logJacobianAtValue(x: number): number {
    return Math.log(x);
  }
}

/**
 * The posterior of revenue per visitor with exponential order values, as a WorkingDensity in log R
 * (ExponentialRevenue, interpolated by chebyshevDensity.ts). Throws StatsError('invalid_argument') unless
 * orders ≥ 1 and visitors ≥ orders are whole and revenue > 0 is finite.
 * @example exponentialRevenueDensity(40, 1000, 2000).mode //=> 0.7163… (near log 2: about 2 per visitor)
 */
export function exponentialRevenueDensity(orders: number, visitors: number, revenue: number): WorkingDensity {
  ensure(Number.isInteger(orders) && orders >= 1, `orders must be a whole number of at least 1, not ${orders}`);
  ensure(
    Number.isInteger(visitors) && visitors >= orders,
    `visitors must be a whole number of at least orders, not ${visitors}`,
  );
  ensure(Number.isFinite(revenue) && revenue > 0, `revenue must be a finite number above 0, not ${revenue}`);
  return chebyshevDensity(new ExponentialRevenue(orders, visitors, revenue));
}

/**
 * Revenue per visitor when every order has the same value m (order_sd 0, the limit of the t as its scale
 * goes to 0): R = m·p exactly, the rate's Beta(a, b) in logit with the value scaled by m.
 * Throws StatsError('invalid_argument') unless m > 0 is finite (and a, b as betaWorkingDensity).
 * @example scaledRateDensity(3, 9, 20).toValue(0) //=> 10
 */
export function scaledRateDensity(a: number, b: number, m: number): WorkingDensity {
  ensure(Number.isFinite(m) && m > 0, `the order value must be a finite number above 0, not ${m}`);
  const beta = betaWorkingDensity(a, b);
  return {
    mode: beta.mode,
    valueRange: [0, m] as const,
    exactMean: (a / (a + b)) * m,
    logDensity: (z: number): number => beta.logDensity(z),
    slope: (z: number): number => beta.slope(z),
    curvature: (z: number): number => beta.curvature(z),
    toValue: (z: number): number => m * logistic(z),
    toWorking: (x: number): number => Math.log(x) - Math.log(m - x),
    valueJacobian: (z: number): number => m * logistic(z) * logistic(-z),
    logJacobianAtValue: (x: number): number => Math.log(x) + Math.log(m - x) - Math.log(m),
  };
}

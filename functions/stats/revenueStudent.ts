/**
 * Revenue per visitor when the order values' standard deviation is given (the order_sd model): the rate
 * p ~ Beta(1 + orders, 1 + visitors − orders) and the average order value v ~ Student t (orders − 1
 * degrees of freedom, centre revenue/orders, scale order_sd/√orders), independent; R = p·v, which is
 * negative where v is. Its density at each working point is an integral over one of the two posteriors
 * (revenueDensity.ts explains the design), in a frame of the caller's choice: log R for the part R > 0
 * (used when every variant's chance of a negative order value is negligible, or for the positive part
 * of a control), or a stretched sinh shared by all variants of a comparison.
 */
import { studentTLogDensity } from './special/studentT';
import { logistic } from './betaDensity';
import { chebyshevDensity } from './chebyshevDensity';
import type { DensityPoint, ExactDensity } from './chebyshevDensity';
import { ensure, StatsError } from './errors';
import { PANEL_NODES, PANEL_ORDER, TabulatedDistribution } from './quadrature';
import { gaussLegendre } from './numeric';
import { INNER_PRUNE, SEVERAL_PIECES_ORDERS, rateTable } from './revenueDensity';
import type { WorkingDensity } from './types';

/**
 * A working coordinate u for revenue per visitor: R as a function of u, and what the densities need of it.
 * offset(u, c) is R − c formed without cancellation where the frame allows (for the sinh frame its centre
 * minus c is a constant formed once).
 */
export interface RevenueFrame {
  /** The coordinate's name: tables with the same name are compared directly in u (grid.ts). */
  readonly coordinate: string;
  readonly valueRange: readonly [number, number];
  toValue(u: number): number;
  toWorking(x: number): number;
  /** dR/du and d²R/du². */
  first(u: number): number;
  second(u: number): number;
  /** log dR/du, its derivative and its second derivative. */
  logJacobian(u: number): number;
  logJacobianSlope(u: number): number;
  logJacobianSecond(u: number): number;
  offset(u: number, c: number): number;
  logJacobianAtValue?(x: number): number;
}

/** The frame u = log R (R > 0 only). @example logFrame().toValue(0) //=> 1 */
export function logFrame(): RevenueFrame {
  return {
    coordinate: 'log-revenue',
    valueRange: [0, Infinity] as const,
    toValue: (u) => Math.exp(u),
    toWorking: (x) => Math.log(x),
    first: (u) => Math.exp(u),
    second: (u) => Math.exp(u),
    logJacobian: (u) => u,
    logJacobianSlope: () => 1,
    logJacobianSecond: () => 0,
    offset: (u, c) => Math.exp(u) - c,
    logJacobianAtValue: (x) => Math.log(x),
  };
}

/**
 * The frame R = C + S·κ·sinh(u/κ): linear over |R − C| ≲ S·κ and exponential beyond, where the t's
 * polynomial tails become exponential in u (rate ν/κ). Throws StatsError('invalid_argument') unless C is
 * finite and S, κ > 0 are finite.
 * @example sinhFrame(2, 0.5, 3).toValue(0) //=> 2
 */
export function sinhFrame(C: number, S: number, K: number): RevenueFrame {
  ensure(
    Number.isFinite(C) && Number.isFinite(S) && S > 0 && Number.isFinite(K) && K > 0,
    'a revenue frame needs a finite centre and positive scales',
  );
  return {
    coordinate: `revenue-sinh:${C}:${S}:${K}`,
    valueRange: [-Infinity, Infinity] as const,
    toValue: (u) => C + S * K * Math.sinh(u / K),
    toWorking: (x) => K * Math.asinh((x - C) / (S * K)),
    first: (u) => S * Math.cosh(u / K),
    second: (u) => (S * Math.sinh(u / K)) / K,
    logJacobian: (u) => Math.log(S) + logCosh(u / K),
    logJacobianSlope: (u) => Math.tanh(u / K) / K,
    logJacobianSecond: (u) => sech2(u / K) / (K * K),
    offset: (u, c) => C - c + S * K * Math.sinh(u / K),
  };
}

/** log of the 16-point Gauss–Legendre weights (the same rule as grid.ts's panels). */
const PANEL_LOG_WEIGHTS: readonly number[] = Array.from(gaussLegendre(PANEL_ORDER).weights, (w) => Math.log(w));

/** Up to this many orders, R = 0 is a kink of the order_sd model's density (see StudentRevenue). */
const KINK_ORDERS = 20;

/** Most parts one rate panel is cut into for a narrow order-value factor (the budget of one panel). */
const MAX_PARTS = 400;

/** Terms one call of InnerSum.addTerms takes at most (a panel's nodes). */
const TERMS = PANEL_ORDER;

/**
 * Moments of the inner integrand accumulated relative to a running largest term. The terms of one panel
 * are staged in the buffers and added in one loop over locals (one call per panel: a call per node boxed
 * its three double arguments, some 60 MB of short-lived numbers in a 50-variant comparison).
 */
class InnerSum {
  ref = -Infinity;
  m0 = 0;
  m1 = 0;
  m2 = 0;
  mc = 0;
  /** log base density + log weight, τ and 1/(s·σ(z)) of the staged terms. */
  readonly base = new Float64Array(TERMS);
  readonly tau = new Float64Array(TERMS);
  readonly inverse = new Float64Array(TERMS);

  reset(): void {
    this.ref = -Infinity;
    this.m0 = 0;
    this.m1 = 0;
    this.m2 = 0;
    this.mc = 0;
  }

  /**
   * Adds the first `count` staged terms e^v, v = base − half·log1p(τ²/ν), with the first and second
   * derivatives of the log factor in the outer variable, d1 = −2·half·τ·inverse/(ν + τ²) and
   * d2 = −2·half·(ν − τ²)·inverse²/(ν + τ²)².
   */
  addTerms(count: number, half: number, nu: number): void {
    let ref = this.ref;
    let m0 = this.m0;
    let m1 = this.m1;
    let m2 = this.m2;
    let mc = this.mc;
    for (let j = 0; j < count; j++) {
      const tau = this.tau[j] as number;
      const inverse = this.inverse[j] as number;
      const v = (this.base[j] as number) + -half * Math.log1p((tau * tau) / nu);
      if (v === -Infinity) continue;
      const d = nu + tau * tau;
      const d1 = (-2 * half * tau * inverse) / d;
      const d2 = (-2 * half * (nu - tau * tau) * inverse * inverse) / (d * d);
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
      m1 += w * d1;
      m2 += w * d1 * d1;
      mc += w * d2;
    }
    this.ref = ref;
    this.m0 = m0;
    this.m1 = m1;
    this.m2 = m2;
    this.mc = mc;
  }

  get logTotal(): number {
    return this.m0 > 0 ? this.ref + Math.log(this.m0) : -Infinity;
  }
}

/** The parameters of the order-value-with-order_sd model . */
export interface StudentModel {
  /** Rate posterior Beta(a, b): a = 1 + orders, b = 1 + visitors − orders. */
  readonly a: number;
  readonly b: number;
  /** Order value: Student t with ν = orders − 1, centre m = revenue/orders, scale s = order_sd/√orders. */
  readonly nu: number;
  readonly m: number;
  readonly s: number;
  /** E[R] = E[p]·m, the point R is measured from inside the integrals. */
  readonly centre: number;
}

/**
 * The inner integral of the order_sd model over the rate: the base is the rate's Beta(orders, b) in
 * z = logit p (f_p(p)/p in z, tabulated), the factor the order value's t density at v = R/p, i.e. at
 * τ = (R/σ(z) − m)/s = (R − C − m(σ(z) − E[p]))/(s σ(z)) with R − C from the frame and σ(z) − p0 formed
 * as −σ(z)·q0·expm1(−(z − z0)), so nothing cancels. log k = −((ν + 1)/2)·log1p(τ²/ν),
 * ∂ log k/∂R = −(ν + 1)τ/((ν + τ²)·sσ), ∂²/∂R² = −(ν + 1)(ν − τ²)/((ν + τ²)²·(sσ)²).
 *
 * The rate's panels are visited by decreasing mass and skipped when their bound (mass × the factor's
 * largest value on them: τ is monotone in z and the factor falls with |τ|) lies e^-40 below the running
 * total. A panel across which the factor changes too much is cut into parts, walking outwards in τ from
 * the part nearest τ = 0 with steps of min(1.3·√(ν + τ²), 3·√((ν + τ²)/(ν + 1))) (at most 1.3 times the
 * distance to the t's poles ±i√ν and three of its local widths: a 16-point rule then converges like
 * 3.3^-32; common practice), only as far as the factor stays within e^-40 of what could matter; each
 * part takes the rate's density from its source directly. A narrow factor (order values far more
 * precise than the rate) so costs a few parts on the one or two panels it crosses.
 */
class StudentOverRate {
  private readonly base: TabulatedDistribution;
  private readonly sum = new InnerSum();
  private readonly half: number;
  private readonly q0: number;
  private readonly z0: number;
  private readonly meanShift: number;
  /** log((n + b)/n) + log c_ν − log s: with it the value is log f_R exactly (see point). */
  private readonly constant: number;
  /** m·(σ(z) − E[p]) and 1/(s·σ(z)) at every node. */
  private readonly nodeOffset: Float64Array;
  private readonly nodeInverse: Float64Array;
  private readonly cuts: number[] = [];
  private readonly taus: number[] = [];
  private sh = 0;
  private r = 0;
  private offset = 0;
  private inverse = 0;

  constructor(
    private readonly model: StudentModel,
    private readonly frame: RevenueFrame,
  ) {
    const { a, b, nu } = model;
    this.base = rateTable(a - 1, b, 0);
    const n = a - 1 + b;
    this.q0 = b / n;
    this.z0 = this.base.source.mode;
    this.half = (nu + 1) / 2;
    // E[p] − p0 = a/(a + b) − (a − 1)/(a − 1 + b) = b/((a + b)(a − 1 + b)).
    this.meanShift = b / ((a + b) * n);
    // f_R(r) = (B(n, b)/B(n + 1, b))·∫ g(z)·t_ν(τ)/s dz with g the normalised Beta(n, b) in logit.
    this.constant = Math.log(n / (a - 1)) + studentTLogDensity(0, nu) - Math.log(model.s);
    const z = this.base.nodeZ;
    this.nodeOffset = new Float64Array(z.length);
    this.nodeInverse = new Float64Array(z.length);
    for (let k = 0; k < z.length; k++) {
      this.at(z[k] as number);
      this.nodeOffset[k] = this.offset;
      this.nodeInverse[k] = this.inverse;
    }
  }

  /** Sets offset = m·(σ(z) − E[p]) and inverse = 1/(s·σ(z)) at z. */
  private at(z: number): void {
    const sigma = logistic(z);
    const delta = -sigma * this.q0 * Math.expm1(-(z - this.z0));
    this.offset = this.model.m * (delta - this.meanShift);
    this.inverse = 1 / (this.model.s * sigma);
  }

  private tauAt(z: number): number {
    this.at(z);
    return (this.sh - this.offset) * this.inverse;
  }

  private logFactor(tau: number): number {
    return -this.half * Math.log1p((tau * tau) / this.model.nu);
  }

  /** The step in τ allowed from a point whose |τ| is t (see the class comment). */
  private step(t: number): number {
    const nu = this.model.nu;
    const reach = Math.sqrt(nu + t * t);
    return Math.min(1.3 * reach, (3 * reach) / Math.sqrt(nu + 1));
  }

  /** z at which τ takes the value t: σ(z) = R/(m + s·t). */
  private zOfTau(t: number): number {
    const q = this.r / (this.model.m + this.model.s * t);
    return Math.log(q) - Math.log1p(-q);
  }

  /**
   * Cuts [za, zb] (τ from ta to tb) into parts for the factor, into `cuts` (z values, ascending, ends
   * included), keeping only where log factor ≥ least; returns false when it would take more than MAX_PARTS.
   */
  private cut(za: number, zb: number, ta: number, tb: number, least: number): boolean {
    const cuts = this.cuts;
    cuts.length = 0;
    const nu = this.model.nu;
    // |τ| beyond which the factor is below e^least: log1p(τ²/ν) = −least/half.
    const reach = least >= 0 ? 0 : Math.sqrt(nu * Math.expm1(-least / this.half));
    const lo = Math.max(Math.min(ta, tb), -reach);
    const hi = Math.min(Math.max(ta, tb), reach);
    if (!(hi > lo)) return true;
    // Walk outwards from the point of [lo, hi] nearest τ = 0: down to lo (then turned ascending), up to hi.
    const start = Math.min(Math.max(0, lo), hi);
    const taus = this.taus;
    taus.length = 0;
    for (let t = start; t > lo;) {
      t = Math.max(lo, t - this.step(Math.abs(t)));
      taus.push(t);
      if (taus.length + 1 > MAX_PARTS) return false;
    }
    taus.reverse();
    taus.push(start);
    for (let t = start; t < hi;) {
      t = Math.min(hi, t + this.step(Math.abs(t)));
      taus.push(t);
      if (taus.length > MAX_PARTS) return false;
    }
    // Map to z (τ is monotone in z, so the cuts come out ascending or descending; sorted only if rounding
    // left them neither); the panel's own ends where τ was not clipped.
    for (const t of taus) cuts.push(t === ta ? za : t === tb ? zb : this.zOfTau(t));
    if ((cuts[0] as number) > (cuts[cuts.length - 1] as number)) cuts.reverse();
    for (let i = 1; i < cuts.length; i++) {
      if ((cuts[i] as number) < (cuts[i - 1] as number)) {
        cuts.sort((u, v) => u - v);
        break;
      }
    }
    return true;
  }

  /** log ∫ f_base k dz (up to a constant), the moments in the sum; NaN when a panel is over budget. */
  private integrate(u: number): number {
    this.sh = this.frame.offset(u, this.model.centre);
    this.r = this.frame.toValue(u);
    const t = this.base;
    const n = PANEL_ORDER;
    const sum = this.sum;
    const nu = this.model.nu;
    sum.reset();
    const order = t.panelOrder;
    for (let r = 0; r < order.length; r++) {
      const p = order[r] as number;
      const mass = t.panelLogMass[p] as number;
      const total = sum.logTotal;
      if (mass < total - INNER_PRUNE) break;
      const za = t.edges[p] as number;
      const zb = t.edges[p + 1] as number;
      const ta = this.tauAt(za);
      const tb = this.tauAt(zb);
      const nearest = ta <= 0 !== tb <= 0 ? 0 : Math.min(Math.abs(ta), Math.abs(tb));
      const most = this.logFactor(nearest);
      if (mass + most < total - INNER_PRUNE) continue;
      if (Math.abs(tb - ta) <= this.step(nearest)) {
        for (let j = 0, k = p * n; j < n; j++, k++) {
          const inverse = this.nodeInverse[k] as number;
          sum.base[j] = (t.nodeLogWeight[k] as number) + (t.nodeLogDensity[k] as number);
          sum.tau[j] = (this.sh - (this.nodeOffset[k] as number)) * inverse;
          sum.inverse[j] = inverse;
        }
        sum.addTerms(n, this.half, nu);
        continue;
      }
      // Parts where the factor could matter: within e^-40 of the larger of the running total and this
      // panel's own best (its density is at most ~e^5 times its mean over the panel).
      const density = mass - Math.log(zb - za) + 5;
      const least = Math.max(total, mass + most) - INNER_PRUNE - density - Math.log(zb - za);
      if (!this.cut(za, zb, ta, tb, least)) return NaN;
      const cuts = this.cuts;
      for (let c = 0; c + 1 < cuts.length; c++) {
        const a = cuts[c] as number;
        const b = cuts[c + 1] as number;
        if (!(b > a)) continue;
        const half = (b - a) / 2;
        const mid = (a + b) / 2;
        const logHalf = Math.log(half);
        for (let k = 0; k < n; k++) {
          const z = mid + half * (PANEL_NODES[k] as number);
          sum.tau[k] = this.tauAt(z);
          sum.inverse[k] = this.inverse;
          sum.base[k] = logHalf + (PANEL_LOG_WEIGHTS[k] as number) + t.logDensityAt(z);
        }
        sum.addTerms(n, this.half, nu);
      }
    }
    return sum.logTotal;
  }

  /** The exact log density of u, log f_R(R(u)) + log dR/du, with slope and curvature; NaN over budget. */
  point(u: number): DensityPoint {
    const f = this.frame;
    const logSum = this.integrate(u);
    const logDensity = logSum + this.constant + f.logJacobian(u);
    if (Number.isNaN(logSum)) return { logDensity, slope: NaN, curvature: NaN };
    const s = this.sum;
    if (!(s.m0 > 0)) return { logDensity, slope: NaN, curvature: NaN };
    const mean = s.m1 / s.m0;
    const variance = Math.max(0, s.m2 / s.m0 - mean * mean);
    const second = s.mc / s.m0;
    const r1 = f.first(u);
    const slope = r1 * mean + f.logJacobianSlope(u);
    const curvature = -(r1 * r1 * (second + variance) + f.second(u) * mean) - f.logJacobianSecond(u);
    // R − C is known to ~2.2e-16·(|R| + |C|), which moves each term's log by ∂ log k/∂R times that.
    const noise = 4e-16 * (Math.abs(this.r) + Math.abs(this.model.centre)) * Math.sqrt(s.m2 / s.m0);
    return { logDensity, slope, curvature, noise };
  }
}

/** log cosh u for any u (log1p(2 sinh²(u/2)) near 0, no overflow far out). */
function logCosh(u: number): number {
  const a = Math.abs(u);
  if (a < 20) {
    const h = Math.sinh(a / 2);
    return Math.log1p(2 * h * h);
  }
  return a - Math.LN2 + Math.log1p(Math.exp(-2 * a));
}

/** sech² u, underflowing to 0 far out. */
function sech2(u: number): number {
  const a = Math.abs(u);
  if (a > 300) return 4 * Math.exp(-2 * a);
  const c = Math.cosh(a);
  return 1 / (c * c);
}

/**
 * Revenue per visitor with a given order_sd, evaluated exactly in a frame's coordinate u (each value an
 * integral over the rate, StudentOverRate).
 */
class StudentRevenue implements ExactDensity {
  readonly start: number;
  readonly severalPieces: boolean;
  readonly kink?: number;
  readonly valueRange: readonly [number, number];
  readonly exactMean?: number;
  private readonly overRate: StudentOverRate;

  constructor(
    model: StudentModel,
    private readonly frame: RevenueFrame,
  ) {
    const { a, s, nu, centre } = model;
    this.valueRange = frame.valueRange;
    this.start = frame.toWorking(centre > frame.valueRange[0] ? centre : frame.valueRange[0] + Math.abs(s));
    this.overRate = new StudentOverRate(model, frame);
    // One piece was seen only from 3000 orders (order_sd 0.2 to 1.6 of revenue/orders, rates 0.001 to 1).
    this.severalPieces = a - 1 < SEVERAL_PIECES_ORDERS;
    if (nu > 1 && frame.valueRange[0] < 0) this.exactMean = centre;
    // At R = 0 the order value jumps from +∞ to −∞ as p → 0, and f_R is only orders − 1 times
    // differentiable there (its next derivative is ∫ f_p(p) p^(−orders−…) dp, log-divergent at p = 0);
    // beyond 20 orders the 16-point rules (exact to degree 31) no longer see it at 1e-13. In the log
    // frame R = 0 lies at u = −∞.
    if (a - 1 <= KINK_ORDERS && frame.valueRange[0] < 0) this.kink = frame.toWorking(0);
  }

  evaluate(u: number): DensityPoint {
    const v = this.overRate.point(u);
    if (!Number.isNaN(v.logDensity)) return v;
    throw new StatsError(
      'not_available',
      'the revenue posterior could not be computed within its budget (the order values are far more ' +
        'precise than the conversion rate, beyond what the quadrature resolves)',
    );
  }

  toValue(u: number): number {
    return this.frame.toValue(u);
  }

  toWorking(x: number): number {
    return this.frame.toWorking(x);
  }

  valueJacobian(u: number): number {
    return this.frame.first(u);
  }

  logJacobianAtValue(x: number): number {
    const f = this.frame;
    return f.logJacobianAtValue !== undefined ? f.logJacobianAtValue(x) : f.logJacobian(f.toWorking(x));
  }
}

/**
 * The model's parameters from one variant's totals: a = 1 + orders, b = 1 + visitors − orders, ν =
 * orders − 1, m = revenue/orders, s = order_sd/√orders, centre E[p]·m.
 * @example studentModel(40, 1000, 2000, 30).centre //=> 2.0459…
 */
export function studentModel(orders: number, visitors: number, revenue: number, orderSd: number): StudentModel {
  ensure(Number.isInteger(orders) && orders >= 2, `orders must be a whole number of at least 2, not ${orders}`);
  ensure(
    Number.isInteger(visitors) && visitors >= orders,
    `visitors must be a whole number of at least orders, not ${visitors}`,
  );
  ensure(Number.isFinite(revenue), `revenue must be a finite number, not ${revenue}`);
  ensure(Number.isFinite(orderSd) && orderSd > 0, `order_sd must be a finite number above 0, not ${orderSd}`);
  const a = 1 + orders;
  const b = 1 + (visitors - orders);
  const m = revenue / orders;
  return { a, b, nu: orders - 1, m, s: orderSd / Math.sqrt(orders), centre: (a / (a + b)) * m };
}

/**
 * The posterior of revenue per visitor with a given order_sd as a WorkingDensity in the frame's coordinate
 * (StudentRevenue, interpolated by chebyshevDensity.ts; its log density is not concave where the rate's
 * and the order value's shapes meet). In the log frame it is the part R > 0 (grid.ts normalises it: the
 * posterior given R > 0). Throws StatsError('invalid_argument') for a bad model (see studentModel) and
 * StatsError('not_available') when it cannot be tabulated within its budgets.
 * @example studentRevenueDensity(studentModel(40, 1000, 2000, 30), logFrame()).toValue(0) //=> 1
 */
export function studentRevenueDensity(model: StudentModel, frame: RevenueFrame): WorkingDensity {
  return chebyshevDensity(new StudentRevenue(model, frame), false);
}

/**
 * Revenue per visitor when the order values' standard deviation is given (the order_sd model): the rate
 * p ~ Beta(1 + orders, 1 + visitors − orders) and the average order value v ~ Student t (orders − 1
 * degrees of freedom, centre revenue/orders, scale order_sd/√orders), independent; R = p·v, which is
 * negative where v is. Its density at each working point is an integral over one of the two posteriors
 * (revenueDensity.ts explains the design), in a frame of the caller's choice: log R for the part R > 0
 * (used when every variant's chance of a negative order value is negligible, or for the positive part
 * of a control), or a stretched sinh shared by all variants of a comparison.
 */
import { betaLogDensity } from './special/incompleteBeta';
import { studentTLogDensity } from './special/studentT';
import { logistic } from './betaDensity';
import { chebyshevDensity } from './chebyshevDensity';
import type { DensityPoint, ExactDensity } from './chebyshevDensity';
import { ensure, StatsError } from './errors';
import { PANEL_NODES, PANEL_ORDER, TabulatedDistribution, tabulate } from './grid';
import { gaussLegendre, log1pmx } from './numeric';
import { INNER_PRUNE, RATE_CURVATURE_WIDTH, RATE_LOG_RANGE, rateTable } from './revenueDensity';
import { studentTWorkingDensity } from './studentTDensity';
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
  ensure(Number.isFinite(C) && Number.isFinite(S) && S > 0 && Number.isFinite(K) && K > 0, 'a revenue frame needs a finite centre and positive scales');
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

/** Most sub-panels a rate (or order-value) panel is split into for a narrow factor (the budget of one panel). */
const MAX_SPLIT = 64;

/** Moments of the inner integrand accumulated relative to a running largest term. */
class InnerSum {
  ref = -Infinity;
  m0 = 0;
  m1 = 0;
  m2 = 0;
  mc = 0;

  reset(): void {
    this.ref = -Infinity;
    this.m0 = 0;
    this.m1 = 0;
    this.m2 = 0;
    this.mc = 0;
  }

  /** Adds e^v with the first and second derivatives d1, d2 of the log factor in the outer variable. */
  add(v: number, d1: number, d2: number): void {
    if (v === -Infinity) return;
    if (v > this.ref) {
      const scale = this.ref === -Infinity ? 0 : Math.exp(this.ref - v);
      this.m0 *= scale;
      this.m1 *= scale;
      this.m2 *= scale;
      this.mc *= scale;
      this.ref = v;
    }
    const w = Math.exp(v - this.ref);
    this.m0 += w;
    this.m1 += w * d1;
    this.m2 += w * d1 * d1;
    this.mc += w * d2;
  }

  get logTotal(): number {
    return this.m0 > 0 ? this.ref + Math.log(this.m0) : -Infinity;
  }
}

/**
 * The inner integral ∫ f_base(z)·k(z; outer) dz of the order-value model with a given order_sd, over a
 * tabulated base (the rate, or the order value), for a factor k that may be much narrower than the base's
 * panels somewhere: the base's panels are visited by decreasing mass, skipped when their bound (mass ×
 * the factor's largest value on them) lies e^-40 below the running total, and split into up to 64 equal
 * parts where the factor varies too much across them (the factor says how many); a split panel's points
 * take the base density from its source directly. Subclasses define the factor.
 */
abstract class ProductIntegral {
  protected readonly sum = new InnerSum();
  private readonly rule = PANEL_NODES;
  private readonly ruleWeights = PANEL_LOG_WEIGHTS;

  constructor(protected readonly base: TabulatedDistribution) {}

  /** Sets up the factor for one outer point. */
  protected abstract prepare(outer: number): void;
  /** log of the factor at base node k (of the table). */
  protected abstract logAtNode(k: number): number;
  /** log of the factor at a base point z that is not a node. */
  protected abstract logAt(z: number): number;
  /**
   * Sets d1, d2 to the first and second derivatives in the outer variable of the log factor at the last
   * point evaluated (fields, so the inner loop allocates nothing).
   */
  protected abstract derivatives(): void;
  protected d1 = 0;
  protected d2 = 0;
  /**
   * Sets most to the largest log factor on [za, zb] (an upper bound) and parts to the sub-panels the
   * factor needs there.
   */
  protected abstract panel(za: number, zb: number): void;
  protected most = 0;
  protected parts = 1;
  /** The part of [za, zb] where the factor can be nonzero ([za, zb] itself unless a subclass says less). */
  protected support(za: number, zb: number): readonly [number, number] {
    return [za, zb];
  }

  /**
   * log ∫ f_base k dz (up to a constant), with the moments for slope and curvature left in the sum; NaN
   * when a panel would need more than MAX_SPLIT parts (the caller then tries the other orientation).
   */
  protected integrate(outer: number, moments: boolean): number {
    this.prepare(outer);
    const t = this.base;
    const n = PANEL_ORDER;
    const sum = this.sum;
    sum.reset();
    const order = t.panelOrder;
    for (let r = 0; r < order.length; r++) {
      const p = order[r] as number;
      const mass = t.panelLogMass[p] as number;
      if (mass < sum.logTotal - INNER_PRUNE) break;
      const ea = t.edges[p] as number;
      const eb = t.edges[p + 1] as number;
      const [za, zb] = this.support(ea, eb);
      if (!(zb > za)) continue;
      this.panel(za, zb);
      const parts = this.parts;
      if (mass + this.most < sum.logTotal - INNER_PRUNE) continue;
      if (parts <= 1 && za === ea && zb === eb) {
        for (let k = p * n; k < p * n + n; k++) {
          const f = this.logAtNode(k);
          if (f === -Infinity) continue;
          const v = (t.nodeLogWeight[k] as number) + (t.nodeLogDensity[k] as number) + f;
          if (moments) {
            this.derivatives();
            sum.add(v, this.d1, this.d2);
          } else sum.add(v, 0, 0);
        }
        continue;
      }
      if (parts > MAX_SPLIT) return NaN;
      // Equal sub-panels; each skipped when its own bound is negligible.
      const count = Math.max(1, parts);
      const width = (zb - za) / count;
      const top = mass - Math.log(eb - ea) + 5;
      for (let s = 0; s < count; s++) {
        const a = za + s * width;
        const b = s === count - 1 ? zb : a + width;
        this.panel(a, b);
        if (top + Math.log(b - a) + this.most < sum.logTotal - INNER_PRUNE) continue;
        const half = (b - a) / 2;
        const mid = (a + b) / 2;
        const logHalf = Math.log(half);
        for (let k = 0; k < n; k++) {
          const z = mid + half * (this.rule[k] as number);
          const f = this.logAt(z);
          if (f === -Infinity) continue;
          const v = logHalf + (this.ruleWeights[k] as number) + t.logDensityAt(z) + f;
          if (moments) {
            this.derivatives();
            sum.add(v, this.d1, this.d2);
          } else sum.add(v, 0, 0);
        }
      }
    }
    return sum.logTotal;
  }

  /** Slope and curvature of log ∫ f_base k dz from the last integrate(…, true), given the outer Jacobian terms. */
  protected moments(): { readonly mean: number; readonly variance: number; readonly second: number } {
    const s = this.sum;
    if (!(s.m0 > 0)) return { mean: NaN, variance: NaN, second: NaN };
    const mean = s.m1 / s.m0;
    return { mean, variance: Math.max(0, s.m2 / s.m0 - mean * mean), second: s.mc / s.m0 };
  }
}

/** The parameters of the order-value-with-order_sd model that both orientations share. */
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
 * Orientation "rate": the base is the rate's Beta(orders, b) in z = logit p (f_p(p)/p in z), the factor
 * the order value's t density at v = R/p, i.e. at τ = (R/σ(z) − m)/s = (S sinh u − m(σ(z) − E[p]))/(s σ(z))
 * (σ(z) − p0 formed as −σ(z)·q0·expm1(−(z − z0)), so nothing cancels). log k = −((ν + 1)/2)·log1p(τ²/ν),
 * ∂ log k/∂R = −(ν + 1)τ/((ν + τ²)·sσ), ∂²/∂R² = −(ν + 1)(ν − τ²)/((ν + τ²)²·(sσ)²). The factor is
 * largest where τ = 0 and falls with |τ|, and τ is monotone in z, so its bound on a panel comes from the
 * edges; a panel is split so that each part spans at most min(1.3, 3/√(ν + 1))·√(ν + τ²) in τ (τ its
 * smallest |τ| there): three local widths of the t, and 1.3 times the distance to its poles ±i√ν.
 */
class StudentOverRate extends ProductIntegral {
  private readonly half: number;
  private readonly p0: number;
  private readonly q0: number;
  private readonly z0: number;
  /** m·(σ(z) − E[p]) and 1/(s·σ(z)) at every node. */
  private readonly nodeOffset: Float64Array;
  private readonly nodeInverse: Float64Array;
  private readonly meanShift: number;
  /** log((n + b)/n) + log c_ν − log s: with it the value is log f_R exactly (see point). */
  private readonly constant: number;
  private sh = 0;
  private lastTau = 0;
  private lastInverse = 0;

  constructor(
    private readonly model: StudentModel,
    private readonly frame: RevenueFrame,
  ) {
    super(rateTable(model.a - 1, model.b, 0));
    const { a, b } = model;
    const n = a - 1 + b;
    this.p0 = (a - 1) / n;
    this.q0 = b / n;
    this.z0 = this.base.source.mode;
    this.half = (model.nu + 1) / 2;
    // E[p] − p0 = a/(a + b) − (a − 1)/(a − 1 + b) = b/((a + b)(a − 1 + b)).
    this.meanShift = b / ((a + b) * n);
    // f_R(r) = (B(n, b)/B(n + 1, b))·∫ g(z)·t_ν(τ)/s dz with g the normalised Beta(n, b) in logit.
    this.constant = Math.log(n / (a - 1)) + studentTLogDensity(0, model.nu) - Math.log(model.s);
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

  private offset = 0;
  private inverse = 0;

  protected prepare(u: number): void {
    this.sh = this.frame.offset(u, this.model.centre);
  }

  private logFactor(tau: number): number {
    return -this.half * Math.log1p((tau * tau) / this.model.nu);
  }

  protected logAtNode(k: number): number {
    const inverse = this.nodeInverse[k] as number;
    const tau = (this.sh - (this.nodeOffset[k] as number)) * inverse;
    this.lastTau = tau;
    this.lastInverse = inverse;
    return this.logFactor(tau);
  }

  protected logAt(z: number): number {
    this.at(z);
    const tau = (this.sh - this.offset) * this.inverse;
    this.lastTau = tau;
    this.lastInverse = this.inverse;
    return this.logFactor(tau);
  }

  protected derivatives(): void {
    const nu = this.model.nu;
    const t = this.lastTau;
    const d = nu + t * t;
    const g = this.lastInverse;
    this.d1 = (-2 * this.half * t * g) / d;
    this.d2 = (-2 * this.half * (nu - t * t) * g * g) / (d * d);
  }

  protected panel(za: number, zb: number): void {
    this.at(za);
    const ta = (this.sh - this.offset) * this.inverse;
    this.at(zb);
    const tb = (this.sh - this.offset) * this.inverse;
    const crosses = ta <= 0 !== tb <= 0;
    const nearest = crosses ? 0 : Math.min(Math.abs(ta), Math.abs(tb));
    const most = crosses ? 0 : this.logFactor(nearest);
    const nu = this.model.nu;
    // Each part spans at most three local widths of the t, and at most 1.3 times the distance
    // √(ν + τ²) to its complex poles τ = ±i√ν (a 16-point rule then converges like 3.3^-32; common practice).
    const reach = Math.sqrt(nu + nearest * nearest);
    const allowed = Math.min(1.3 * reach, (3 * reach) / Math.sqrt(nu + 1));
    this.most = most;
    this.parts = Math.ceil(Math.abs(tb - ta) / allowed);
  }

  /** The exact log density of u, log f_R(R(u)) + log dR/du, with slope and curvature; NaN over budget. */
  point(u: number, moments: boolean): DensityPoint {
    const f = this.frame;
    const logSum = this.integrate(u, moments);
    const logDensity = logSum + this.constant + f.logJacobian(u);
    if (!moments) return { logDensity, slope: NaN, curvature: NaN };
    const { mean, variance, second } = this.moments();
    const r1 = f.first(u);
    const slope = r1 * mean + f.logJacobianSlope(u);
    const curvature = -(r1 * r1 * (second + variance) + f.second(u) * mean) - f.logJacobianSecond(u);
    return { logDensity, slope, curvature };
  }
}

/**
 * Orientation "order value": the base is the order value's t in u′ (v = m + s·sinh u′,
 * studentTDensity.ts), the factor the rate's density at q = R/v, times |q|/|R| (= 1/|v|):
 * ∝ q^a (1 − q)^(b − 1) on 0 < q < 1. Around its mode q0 = a/(a + b − 1), with δ = R − q0·v formed as
 * S sinh u − (q0·s·sinh u′ − m·(E[p] − q0)) (no cancellation), x1 = δ/(q0 v) = q/q0 − 1 and
 * x2 = −δ/((1 − q0) v) = (1 − q)/(1 − q0) − 1, its log is a·log1pmx(x1) + (b − 1)·log1pmx(x2) (the linear
 * terms cancel at the mode); with b = 1 (every visitor ordered) it is a·log1p(x1) = a·log q. The factor is
 * unimodal in q and q = R/v is monotone in v, so its bound on a panel comes from the edges; the panel is
 * cut to the support (v beyond R on R's side of zero; the factor is a rational function of v, analytic
 * at the cut, with its only pole at v = 0) and split so that each part spans at most min(1, 3σ) in
 * log v (σ = √((1 − q0)/a), the factor's width there; 1 keeps a part's distance to the pole at v = 0
 * above its length) and the log factor changes by at most 12 across a part.
 */
class RateOverStudent extends ProductIntegral {
  private readonly q0: number;
  private readonly meanGap: number;
  private readonly peakWidth: number;
  private readonly nodeValue: Float64Array;
  private readonly nodeOffset: Float64Array;
  /** log q0 + log f_p(q0): with it (and −log|R|) the value is log f_R exactly (see point). */
  private readonly constant: number;
  private sh = 0;
  private r = 0;
  private lastX1 = 0;
  private lastX2 = 0;
  private lastValue = 1;

  constructor(
    private readonly model: StudentModel,
    private readonly frame: RevenueFrame,
  ) {
    super(
      tabulate(studentTWorkingDensity(model.nu, model.m, model.s), {
        logRange: RATE_LOG_RANGE,
        curvatureWidth: RATE_CURVATURE_WIDTH,
      }),
    );
    const { a, b, m, s } = model;
    this.q0 = a / (a + b - 1);
    // E[p] − q0 = a/(a + b) − a/(a + b − 1) = −a/((a + b)(a + b − 1)).
    this.meanGap = m * (-a / ((a + b) * (a + b - 1)));
    this.peakWidth = 2 * Math.sqrt((1 - this.q0) / a);
    // f_R(r) = ∫ g(u′)·f_p(q)/|v| du′ and f_p(q)/|v| = q·f_p(q)/|r| = e^{log factor}·q0·f_p(q0)/|r|
    // (betaLogDensity keeps 1e-14 at a billion counts); with b = 1 the factor's peak is q0 = 1.
    this.constant = Math.log(this.q0) + (this.q0 < 1 ? betaLogDensity(this.q0, a, b) : Math.log(a));
    const u = this.base.nodeZ;
    this.nodeValue = new Float64Array(u.length);
    this.nodeOffset = new Float64Array(u.length);
    for (let k = 0; k < u.length; k++) {
      const sinh = Math.sinh(u[k] as number);
      this.nodeValue[k] = m + s * sinh;
      this.nodeOffset[k] = this.q0 * s * sinh - this.meanGap;
    }
  }

  protected prepare(u: number): void {
    this.sh = this.frame.offset(u, this.model.centre);
    this.r = this.frame.toValue(u);
  }

  private logFactor(v: number, offset: number): number {
    const r = this.r;
    // Support: q = r/v in (0, 1), i.e. v beyond r on r's side of zero.
    if (!(r / v > 0 && (v - r) / v > 0)) return -Infinity;
    const delta = this.sh - offset;
    const x1 = delta / (this.q0 * v);
    this.lastValue = v;
    this.lastX1 = x1;
    const { a, b } = this.model;
    if (b === 1) return a * Math.log1p(x1);
    const x2 = -delta / ((1 - this.q0) * v);
    this.lastX2 = x2;
    return a * log1pmx(x1) + (b - 1) * log1pmx(x2);
  }

  protected logAtNode(k: number): number {
    return this.logFactor(this.nodeValue[k] as number, this.nodeOffset[k] as number);
  }

  protected logAt(z: number): number {
    const sinh = Math.sinh(z);
    return this.logFactor(this.model.m + this.model.s * sinh, this.q0 * this.model.s * sinh - this.meanGap);
  }

  protected derivatives(): void {
    const { a, b } = this.model;
    const v = this.lastValue;
    const x1 = this.lastX1;
    const g1 = 1 / (this.q0 * v);
    if (b === 1) {
      this.d1 = (a * g1) / (1 + x1);
      this.d2 = (-a * g1 * g1) / ((1 + x1) * (1 + x1));
      return;
    }
    const x2 = this.lastX2;
    const g2 = -1 / ((1 - this.q0) * v);
    this.d1 = (-a * x1 * g1) / (1 + x1) + (-(b - 1) * x2 * g2) / (1 + x2);
    this.d2 = (-a * g1 * g1) / ((1 + x1) * (1 + x1)) - ((b - 1) * g2 * g2) / ((1 + x2) * (1 + x2));
  }

  protected override support(za: number, zb: number): readonly [number, number] {
    // v = r at u′ = asinh((r − m)/s): the factor lives on u′ above it (r > 0) or below it (r < 0).
    const wall = Math.asinh((this.r - this.model.m) / this.model.s);
    return this.r > 0 ? [Math.max(za, wall), zb] : [za, Math.min(zb, wall)];
  }

  protected panel(za: number, zb: number): void {
    const { m, s } = this.model;
    const sa = Math.sinh(za);
    const sb = Math.sinh(zb);
    const va = m + s * sa;
    const vb = m + s * sb;
    const da = this.sh - (this.q0 * s * sa - this.meanGap);
    const db = this.sh - (this.q0 * s * sb - this.meanGap);
    const fa = this.logFactor(va, this.q0 * s * sa - this.meanGap);
    const fb = this.logFactor(vb, this.q0 * s * sb - this.meanGap);
    const la = da / (this.q0 * va);
    const lb = db / (this.q0 * vb);
    const crosses = da <= 0 !== db <= 0;
    const most = crosses || this.model.b === 1 ? 0 : Math.max(fa, fb);
    // Span in log q across the panel, against four peak widths; and the change of the log factor.
    const span = la > -1 && lb > -1 ? Math.abs(Math.log1p(lb) - Math.log1p(la)) : Infinity;
    const change = Number.isFinite(fa) && Number.isFinite(fb) ? Math.abs(fa - fb) : 0;
    // Equal parts in u′ must each stay shorter than their distance to the pole at v = 0 (in v).
    const pole = Math.abs(vb - va) / Math.min(Math.abs(va), Math.abs(vb));
    this.most = most;
    this.parts = Math.ceil(Math.max(span / Math.min(1, 1.5 * this.peakWidth), change / 12, pole));
  }

  /** The exact log density of u, log f_R(R(u)) + log dR/du, with slope and curvature; NaN over budget. */
  point(u: number, moments: boolean): DensityPoint {
    const f = this.frame;
    const logSum = this.integrate(u, moments);
    const logDensity = logSum + this.constant - Math.log(Math.abs(this.r)) + f.logJacobian(u);
    if (!moments) return { logDensity, slope: NaN, curvature: NaN };
    const { mean, variance, second } = this.moments();
    const r1 = f.first(u);
    const d1 = mean - 1 / this.r;
    const slope = r1 * d1 + f.logJacobianSlope(u);
    const curvature = -(r1 * r1 * (second + variance + 1 / (this.r * this.r)) + f.second(u) * d1) - f.logJacobianSecond(u);
    return { logDensity, slope, curvature };
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
 * Revenue per visitor with a given order_sd, evaluated exactly in a frame's coordinate u. Each evaluation
 * integrates over the rate (its t factor is then at least 1/8 as wide as the rate's panels need: the
 * order value's relative spread s/m against the rate's ≈ √(b/(a(a + b))) in log p), else over the order
 * value, and falls back to the other orientation where a panel would need more than 64 parts (near R = 0
 * the order-value orientation does, in the far tails the rate orientation may).
 */
class StudentRevenue implements ExactDensity {
  readonly start: number;
  readonly kink?: number;
  readonly valueRange: readonly [number, number];
  readonly exactMean?: number;
  private readonly rateFirst: boolean;
  private overRate: StudentOverRate | undefined;
  private overValue: RateOverStudent | undefined;

  constructor(
    private readonly model: StudentModel,
    private readonly frame: RevenueFrame,
  ) {
    const { a, b, m, s, nu, centre } = model;
    this.valueRange = frame.valueRange;
    this.start = frame.toWorking(centre > frame.valueRange[0] ? centre : frame.valueRange[0] + Math.abs(s));
    // The rate orientation splits a panel into ~4σ_rate/(3σ_value) parts: past 8, start with the other.
    this.rateFirst = !(8 * s < Math.abs(m) * Math.sqrt(b / (a * (a + b))));
    if (nu > 1 && frame.valueRange[0] < 0) this.exactMean = centre;
    // At R = 0 the order value jumps from +∞ to −∞ as p → 0, and f_R is only orders − 1 times
    // differentiable there (its next derivative is ∫ f_p(p) p^(−orders−…) dp, log-divergent at p = 0);
    // beyond 20 orders the 16-point rules (exact to degree 31) no longer see it at 1e-13. In the log
    // frame R = 0 lies at u = −∞.
    if (a - 1 <= KINK_ORDERS && frame.valueRange[0] < 0) this.kink = frame.toWorking(0);
  }

  private orientation(rate: boolean): StudentOverRate | RateOverStudent {
    if (rate) return (this.overRate ??= new StudentOverRate(this.model, this.frame));
    return (this.overValue ??= new RateOverStudent(this.model, this.frame));
  }

  private point(u: number, moments: boolean): DensityPoint {
    const first = this.orientation(this.rateFirst).point(u, moments);
    if (!Number.isNaN(first.logDensity)) return first;
    const second = this.orientation(!this.rateFirst).point(u, moments);
    if (!Number.isNaN(second.logDensity)) return second;
    throw new StatsError(
      'not_available',
      'the revenue posterior could not be computed within its budget (the order values are far more ' +
        'precise than the conversion rate, or the other way round, beyond what the quadrature resolves)',
    );
  }

  evaluate(u: number): DensityPoint {
    return this.point(u, true);
  }

  logDensity(u: number): number {
    return this.point(u, false).logDensity;
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
 * @example studentModel(40, 1000, 2000, 30).centre //=> 2.0438…
 */
export function studentModel(orders: number, visitors: number, revenue: number, orderSd: number): StudentModel {
  ensure(Number.isInteger(orders) && orders >= 2, `orders must be a whole number of at least 2, not ${orders}`);
  ensure(Number.isInteger(visitors) && visitors >= orders, `visitors must be a whole number of at least orders, not ${visitors}`);
  ensure(Number.isFinite(revenue), `revenue must be a finite number, not ${revenue}`);
  ensure(Number.isFinite(orderSd) && orderSd > 0, `order_sd must be a finite number above 0, not ${orderSd}`);
  const a = 1 + orders;
  const b = 1 + visitors - orders;
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

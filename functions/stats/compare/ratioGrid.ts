/**
 * The density of the relative lift R = Y/X − 1 (X > 0) on a whole grid of lifts at once, for a chart
 * table: each exact value is an integral (ratio.ts logRatioDensity), so the log density of V = log(1 + R)
 * is evaluated exactly at a few Chebyshev points per piece of the grid and interpolated at the grid's
 * points, wherever a piece's Chebyshev coefficients show that the interpolant is accurate; elsewhere each
 * grid point is evaluated exactly. In v = log(1 + m) the log density is smooth across the whole grid (its
 * singularity at m = −1 becomes a straight tail), so at a thousand visitors one piece of 16 points stands
 * for a hundred or a thousand rows. Each exact value is the integral over the narrower posterior taken by
 * that posterior's own Gauss rules where they pass their check (PairRule, 24 evaluations; typical when a
 * challenger has many more or many fewer visitors than the control), 0 where a bound shows it is below
 * the smallest double, else ratio.ts's pruned integral.
 */
import { barycentric, chebyshevNodes } from '../chebyshevNodes';
import { gaussLegendre, logAddExp } from '../numeric';
import { PANEL_NODES, PANEL_ORDER, panelLogIntegral } from '../quadrature';
import { PANEL_LOG_WEIGHTS } from '../quadrature/panelRule';
import type { TabulatedDistribution } from '../quadrature';
import { factor, forEachPiece, innerEdges } from './factors';
import { PRUNE, logTailAndDensity, xIsBase } from './integrate';
import type { TailAndDensity } from './integrate';
import { checkProbability, solveQuantile } from './quantileSolver';
import { logRatioDensity, ratioLogTail, ratioQuantileStart } from './ratio';
import type { QuantileOf } from './ratio';

/** Chebyshev points per piece. */
const POINTS = 16;
/**
 * A piece is accepted when its last four Chebyshev coefficients are at most ACCEPT_ABSOLUTE +
 * ACCEPT_RELATIVE·(largest |log density| on it): the interpolant's error in the log density is about
 * that size once the coefficients have decayed (Trefethen, "Approximation Theory and Approximation
 * Practice", 2013, ch. 8; common practice in chebfun), i.e. a relative error in the density of ~1e-13,
 * the size of the exact values' own rounding (the relative part is the rounding of a log density of
 * several hundred).
 */
const ACCEPT_ABSOLUTE = 1e-13;
const ACCEPT_RELATIVE = 4e-16;

/** The POINTS first-kind Chebyshev points (descending in [−1, 1]) with their weights, and the cosine table. */
const NODES = chebyshevNodes(POINTS);
const ANGLES = NODES.angles;
const CHEB_POINTS = NODES.points;
const COSINES = (() => {
  const table = new Float64Array(POINTS * POINTS);
  for (let k = 0; k < POINTS; k++)
    for (let j = 0; j < POINTS; j++) table[k * POINTS + j] = Math.cos(k * (ANGLES[j] as number));
  return table;
})();

/** The largest of the last four Chebyshev coefficients of the values at the points. */
function tailCoefficient(values: Float64Array): number {
  let most = 0;
  for (let k = POINTS - 4; k < POINTS; k++) {
    let c = 0;
    for (let j = 0; j < POINTS; j++) c += (values[j] as number) * (COSINES[k * POINTS + j] as number);
    most = Math.max(most, Math.abs((2 / POINTS) * c));
  }
  return most;
}

/**
 * log of the ratio density at many lifts of one pair: the same integral as ratio.ts logRatioDensity
 * (integrate.ts logIntegral with the one density factor: the same panels in the same order, the same
 * pruning bounds, the same splits at the other's panel edges and the same node values), so the same number
 * to the last bit, with what does not depend on the lift (which posterior is the base, its node values
 * and their logs) found once and no working arrays made per lift.
 */
class PairDensity {
  private readonly base: TabulatedDistribution;
  private readonly other: TabulatedDistribution;
  private readonly baseIsX: boolean;
  private readonly globalBound: number;
  private readonly values = new Float64Array(PANEL_ORDER);
  private readonly breaks: number[] = [];

  constructor(
    private readonly y: TabulatedDistribution,
    private readonly x: TabulatedDistribution,
  ) {
    // The checks of logRatioDensity (a positive denominator), once.
    logRatioDensity(y, x, 0);
    this.baseIsX = xIsBase(x, y);
    this.base = this.baseIsX ? x : y;
    this.other = this.baseIsX ? y : x;
    const src = this.base.source;
    this.globalBound = Math.log(src.toValue(this.base.windowRight)) + this.other.logMaxValueDensity;
  }

  /** log of the density of Y/X − 1 at m > −1. */
  logAt(m: number): number {
    const s = 1 + m;
    // At s = 1 with a shared coordinate logIntegral evaluates the other's density in the working variable.
    if (s === 1) return logRatioDensity(this.y, this.x, m);
    // Over X: ∫ f_X(t) t f_Y(st) dt; over Y: ∫ f_Y(t) t f_X(t/s) dt / s² (as logRatioDensity).
    const scale = this.baseIsX ? s : 1 / s;
    const logOffset = this.baseIsX ? 0 : -2 * Math.log(s);
    const base = this.base;
    const other = this.other;
    const src = base.source;
    const n = PANEL_ORDER;
    const panels = base.panelCount;
    const order = base.panelOrder;
    const mass = base.panelLogMass;
    const nodeLogDensity = base.nodeLogDensity;
    const nodeValue = base.nodeValue;
    const nodeLogValue = base.nodeLogValue;
    const maxDensity = other.logMaxValueDensity;
    const f = factor(other, 'density', scale, 0);
    const values = this.values;
    const breaks = this.breaks;
    let total = -Infinity;
    for (let r = 0; r < panels; r++) {
      const p = order[r] as number;
      const panelMass = mass[p] as number;
      if (panelMass + this.globalBound < total - PRUNE || panelMass === -Infinity) break;
      const bound = panelMass + maxDensity + Math.log(src.toValue(base.edges[p + 1] as number));
      if (bound === -Infinity || bound < total - PRUNE) continue;
      const a = base.edges[p] as number;
      const b = base.edges[p + 1] as number;
      breaks.length = 0;
      innerEdges(base, f, false, a, b, breaks);
      if (breaks.length === 0) {
        for (let k = 0; k < n; k++) {
          const i = p * n + k;
          const logDensity = nodeLogDensity[i] as number;
          if (logDensity === -Infinity) {
            values[k] = -Infinity;
            continue;
          }
          const v = logDensity + (nodeLogValue[i] as number);
          values[k] = v === -Infinity ? v : v + other.logValueDensity(scale * (nodeValue[i] as number) + 0);
        }
        total = logAddExp(total, panelLogIntegral(values, 0, (b - a) / 2));
        continue;
      }
      forEachPiece(a, b, breaks, (mid, half) => {
        for (let k = 0; k < n; k++) {
          const z = mid + half * (PANEL_NODES[k] as number);
          const logDensity = base.logDensityAt(z);
          if (logDensity === -Infinity) {
            values[k] = -Infinity;
            continue;
          }
          const x = src.toValue(z);
          const v = logDensity + Math.log(x);
          values[k] = v === -Infinity ? v : v + other.logValueDensity(scale * x + 0);
        }
        total = logAddExp(total, panelLogIntegral(values, 0, half));
      });
    }
    return total + logOffset;
  }
}

/** The orders of a PairRule's two Gauss rules: the lower checks the higher. */
const RULE_LOW = 10;
const RULE_HIGH = 14;
/**
 * A PairRule's measure is the base's panels whose log mass is within this of the largest: for a
 * log-concave base the panels beyond hold at most ~e^-60 of it (bounded again per integral, below).
 */
const RULE_WINDOW = 60;
/** The two rules' results must agree to this (in log, i.e. relatively), and the truncation bound stay below it. */
const RULE_AGREE = 1e-14;
/**
 * The rules are tried only when the base's spread relative to its mean is at most this fraction of the
 * other's: the other factor then varies on a scale at least twice the base's in log(1 + lift).
 */
const RULE_RATIO = 0.5;
/**
 * How far from its mode (in standard deviations at the mode, 1/√curvature) a posterior's panels within
 * e^-60 of its largest may reach for it to count as regular: a normal density reaches √120 ≈ 11; a Beta
 * in logit with a few conversions reaches ~1.5 times that on its exponential side; a prior of 0.001
 * (a tail of rate 0.001 in logit) reaches thousands.
 */
const REGULAR_REACH = 22;
/** QL iterations per eigenvalue at most (it converges cubically: typically 2 or 3). */
const QL_ITERATIONS = 60;

/** A quadrature rule on the base: log weights (base density included), the values and their logs at the nodes. */
interface RuleNodes {
  readonly logWeight: Float64Array;
  readonly value: Float64Array;
  readonly logValue: Float64Array;
}

/** The first and last panels of d whose log mass is within RULE_WINDOW of its largest. */
function keptPanels(d: TabulatedDistribution): [number, number] {
  const mass = d.panelLogMass;
  const floor = (mass[d.panelOrder[0] as number] as number) - RULE_WINDOW;
  let first = 0;
  let last = d.panelCount - 1;
  while (first < last && (mass[first] as number) < floor) first++;
  while (last > first && (mass[last] as number) < floor) last--;
  return [first, last];
}

/**
 * Whether a posterior is close enough to normal in its working variable for PairRule: its panels within
 * e^-60 of the largest lie within REGULAR_REACH standard deviations (at the mode) of the mode.
 */
function regular(d: TabulatedDistribution): boolean {
  const [first, last] = keptPanels(d);
  const mode = d.source.mode;
  const reach = REGULAR_REACH / Math.sqrt(d.source.curvature(mode));
  return (d.edges[first] as number) >= mode - reach && (d.edges[last + 1] as number) <= mode + reach;
}

/**
 * The n-point Gauss rule of a discrete measure (points x_i of spread about 1 with weights w_i > 0,
 * i < count, count > n):
 * the Stieltjes–Lanczos recurrence for its orthonormal polynomials gives the Jacobi matrix, whose
 * eigenvalues are the nodes and the squared first components of whose eigenvectors, times the total
 * weight, are the weights (Golub and Welsch, "Calculation of Gauss quadrature rules", Math. Comp. 23,
 * 1969; Gautschi, "Orthogonal Polynomials: Computation and Approximation", 2004, §2.2.3). The
 * eigenproblem by the implicit QL method (Wilkinson and Reinsch, "Handbook for Automatic Computation II",
 * 1971, tql2), at most QL_ITERATIONS per eigenvalue. Returns undefined if the recurrence breaks down
 * (fewer than n distinct points carry weight) or QL does not converge.
 * Cost: O(n · count + QL_ITERATIONS · n²).
 */
export function gaussRuleOf(
  points: Float64Array,
  weights: Float64Array,
  count: number,
  n: number,
): { nodes: Float64Array; weights: Float64Array } | undefined {
  let total = 0;
  for (let i = 0; i < count; i++) total += weights[i] as number;
  const diagonal = new Float64Array(n);
  const offDiagonal = new Float64Array(n);
  let previous = new Float64Array(count);
  let current = new Float64Array(count).fill(1 / Math.sqrt(total));
  let next = new Float64Array(count);
  for (let k = 0; k < n; k++) {
    let a = 0;
    for (let i = 0; i < count; i++) a += (weights[i] as number) * (points[i] as number) * (current[i] as number) ** 2;
    diagonal[k] = a;
    if (k === n - 1) break;
    const b = offDiagonal[k] as number;
    let norm = 0;
    for (let i = 0; i < count; i++) {
      const q = ((points[i] as number) - a) * (current[i] as number) - b * (previous[i] as number);
      next[i] = q;
      norm += (weights[i] as number) * q * q;
    }
    const size = Math.sqrt(norm);
    // Zero but for rounding once the measure has no more distinct points (for points of spread ~1).
    if (!(size > 1e-8 && Number.isFinite(size))) return undefined;
    for (let i = 0; i < count; i++) next[i] = (next[i] as number) / size;
    offDiagonal[k + 1] = size;
    [previous, current, next] = [current, next, previous];
  }
  // The eigenvalues of the symmetric tridiagonal Jacobi matrix (diagonal d, couplings e[i] between i and
  // i + 1) by the implicit QL method with Wilkinson-type shifts, carrying only the first row of the
  // eigenvector matrix (each rotation mixes two of its columns row by row).
  const d = diagonal;
  const e = new Float64Array(n);
  for (let i = 0; i + 1 < n; i++) e[i] = offDiagonal[i + 1] as number;
  const first = new Float64Array(n);
  first[0] = 1;
  for (let l = 0; l < n; l++) {
    for (let iteration = 0; ; iteration++) {
      let m = l;
      while (
        m < n - 1 &&
        Math.abs(e[m] as number) > 1e-16 * (Math.abs(d[m] as number) + Math.abs(d[m + 1] as number))
      ) {
        m++;
      }
      if (m === l) break;
      if (iteration === QL_ITERATIONS) return undefined;
      let g = ((d[l + 1] as number) - (d[l] as number)) / (2 * (e[l] as number));
      let r = Math.hypot(g, 1);
      g = (d[m] as number) - (d[l] as number) + (e[l] as number) / (g + (g >= 0 ? r : -r));
      let sine = 1;
      let cosine = 1;
      let shift = 0;
      let i = m - 1;
      for (; i >= l; i--) {
        const f = sine * (e[i] as number);
        const b = cosine * (e[i] as number);
        r = Math.hypot(f, g);
        e[i + 1] = r;
        if (r === 0) {
          d[i + 1] = (d[i + 1] as number) - shift;
          e[m] = 0;
          break;
        }
        sine = f / r;
        cosine = g / r;
        g = (d[i + 1] as number) - shift;
        r = ((d[i] as number) - g) * sine + 2 * cosine * b;
        shift = sine * r;
        d[i + 1] = g + shift;
        g = cosine * r - b;
        const z = first[i + 1] as number;
        first[i + 1] = sine * (first[i] as number) + cosine * z;
        first[i] = cosine * (first[i] as number) - sine * z;
      }
      if (r === 0 && i >= l) continue;
      d[l] = (d[l] as number) - shift;
      e[l] = g;
      e[m] = 0;
    }
  }
  const nodes = new Float64Array(n);
  const ruleWeights = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    nodes[k] = d[k] as number;
    ruleWeights[k] = total * (first[k] as number) ** 2;
  }
  return { nodes, weights: ruleWeights };
}

/**
 * The integrals of a ratio's density and tails over the narrower posterior (the base) by Gauss rules of
 * the base's own distribution: the base's panel nodes within e^-60 of its largest panel mass, as a
 * discrete measure (16-point Gauss–Legendre weights times the density), give the Gauss rules of orders
 * 10 and 14 of that measure once for every lift (gaussRuleOf). An integral of the base density times the
 * other's density or tail at scale·value is then 24 evaluations of the other instead of ~16 a panel for
 * every kept panel (and more where panels are split). The 14-point rule is exact for the other factor
 * times a polynomial of degree 27 (in the working variable); its result is taken where the 10-point rule
 * agrees with it to 1e-14 relatively (as a Gauss–Kronrod pair: the error of a Gauss rule for an analytic
 * integrand falls geometrically with its order, so the lower order's difference bounds the higher's
 * error; common practice) and the mass outside the window times the largest the factor can be is below
 * 1e-14 of it; elsewhere the answer is undefined and the caller takes the exact pruned integral. An
 * other posterior much wider than the base is the common case (a challenger with many more visitors than
 * the control, or the reverse): its factor is then nearly a polynomial across the base.
 */
export class PairRule {
  readonly baseIsX: boolean;
  /** Whether the other is wide enough against the base for the rules to be tried at all. */
  readonly usable: boolean;
  private readonly base: TabulatedDistribution;
  private readonly other: TabulatedDistribution;
  private readonly low: RuleNodes | undefined;
  private readonly high: RuleNodes | undefined;
  /** log of the base's mass outside the window. */
  private readonly logOutside: number;
  /** log of the largest base value in the base's whole window (bounds the value factor). */
  private readonly logTopValue: number;
  /** The base's values at the ends of the rules' window. */
  private readonly lowValue: number;
  private readonly highValue: number;

  constructor(
    private readonly y: TabulatedDistribution,
    private readonly x: TabulatedDistribution,
  ) {
    this.exactBaseIsX = xIsBase(x, y);
    // In log(1 + lift) = log Y − log X what matters is each one's spread relative to its size.
    const relativeX = x.spread / x.mean;
    const relativeY = y.spread / y.mean;
    this.baseIsX = relativeX <= relativeY;
    this.usable =
      Math.min(relativeX, relativeY) <= RULE_RATIO * Math.max(relativeX, relativeY) && regular(this.baseIsX ? x : y);
    this.base = this.baseIsX ? x : y;
    this.other = this.baseIsX ? y : x;
    const base = this.base;
    const mass = base.panelLogMass;
    const [first, last] = keptPanels(base);
    this.lowValue = base.source.toValue(base.edges[first] as number);
    this.highValue = base.source.toValue(base.edges[last + 1] as number);
    this.logTopValue = Math.log(base.source.toValue(base.windowRight));
    if (!this.usable) {
      this.logOutside = 0;
      this.low = undefined;
      this.high = undefined;
      return;
    }
    let outside = -Infinity;
    const kept: number[] = [];
    for (let p = 0; p < base.panelCount; p++) {
      if (p >= first && p <= last) kept.push(p);
      else outside = logAddExp(outside, mass[p] as number);
    }
    this.logOutside = outside;
    // The discrete measure: the kept panels' nodes, in z scaled to mean 0 and spread 1.
    const count = kept.length * PANEL_ORDER;
    const z = new Float64Array(count);
    const logW = new Float64Array(count);
    let most = -Infinity;
    kept.forEach((p, i) => {
      const half = ((base.edges[p + 1] as number) - (base.edges[p] as number)) / 2;
      for (let k = 0; k < PANEL_ORDER; k++) {
        z[i * PANEL_ORDER + k] = base.nodeZ[p * PANEL_ORDER + k] as number;
        const w =
          (PANEL_LOG_WEIGHTS[k] as number) + Math.log(half) + (base.nodeLogDensity[p * PANEL_ORDER + k] as number);
        logW[i * PANEL_ORDER + k] = w;
        if (w > most) most = w;
      }
    });
    const w = new Float64Array(count);
    let sum = 0;
    let mean = 0;
    for (let i = 0; i < count; i++) {
      w[i] = Math.exp((logW[i] as number) - most);
      sum += w[i] as number;
      mean += (w[i] as number) * (z[i] as number);
    }
    mean /= sum;
    let variance = 0;
    for (let i = 0; i < count; i++) variance += (w[i] as number) * ((z[i] as number) - mean) ** 2;
    const spread = Math.sqrt(variance / sum);
    const scaled = z.map((zi) => (zi - mean) / spread);
    const make = (order: number): RuleNodes | undefined => {
      if (!(count > 2 * order && spread > 0)) return undefined;
      const rule = gaussRuleOf(scaled, w, count, order);
      if (rule === undefined) return undefined;
      const logWeight = new Float64Array(order);
      const value = new Float64Array(order);
      const logValue = new Float64Array(order);
      for (let k = 0; k < order; k++) {
        logWeight[k] = Math.log(rule.weights[k] as number) + most;
        value[k] = base.source.toValue(mean + spread * (rule.nodes[k] as number));
        logValue[k] = Math.log(value[k] as number);
      }
      return { logWeight, value, logValue };
    };
    this.low = make(RULE_LOW);
    this.high = make(RULE_HIGH);
  }

  /** log Σ_j w_j · x_j^{withValue} · e^{term(scale · x_j)} over one rule. */
  private static sum(nodes: RuleNodes, term: (u: number) => number, scale: number, withValue: boolean): number {
    const n = nodes.logWeight.length;
    let max = -Infinity;
    const logs = SCRATCH;
    for (let j = 0; j < n; j++) {
      const v =
        (nodes.logWeight[j] as number) +
        (withValue ? (nodes.logValue[j] as number) : 0) +
        term(scale * (nodes.value[j] as number));
      logs[j] = v;
      if (v > max) max = v;
    }
    if (!Number.isFinite(max)) return max;
    let sum = 0;
    for (let j = 0; j < n; j++) sum += Math.exp((logs[j] as number) - max);
    return max + Math.log(sum);
  }

  /** The checked high-rule result, or undefined; `logBound` is the log of the largest the factor can be. */
  private checked(
    term: (u: number) => number,
    scale: number,
    withValue: boolean,
    logBound: number,
  ): number | undefined {
    if (!this.usable || this.high === undefined || this.low === undefined) return undefined;
    // The upper end of the other's value range (where a Beta's density and tails are singular) at least
    // the window's own width beyond the window's image (its lower end 0 is at −∞ in the logs of the values).
    const hi = this.other.source.valueRange[1];
    const a = scale * this.lowValue;
    const b = scale * this.highValue;
    if (!(hi - b >= b - a)) return undefined;
    const high = PairRule.sum(this.high, term, scale, withValue);
    if (!Number.isFinite(high)) return undefined;
    const low = PairRule.sum(this.low, term, scale, withValue);
    if (!(Math.abs(high - low) <= RULE_AGREE)) return undefined;
    if (!(this.logOutside + logBound <= high + Math.log(RULE_AGREE))) return undefined;
    return high;
  }

  /** Per panel of the exact integrals' other posterior, its largest log value density at its nodes (on first use). */
  private otherPanelMax: Float64Array | undefined;
  /** Whether the exact integrals take X as their base (integrate.ts xIsBase). */
  private readonly exactBaseIsX: boolean;

  /**
   * An upper bound on the log of the exact integral ∫ f_B(t) t f_O(scale·t) dt over the panels of B, the
   * posterior the exact integrals take as their base (integrate.ts xIsBase, which may differ from this
   * rule's base): per panel of B, its mass times its largest value times the largest O's value density
   * reaches over the panel's image (the largest at O's nodes there and at the image's ends, plus 1: the
   * margin the exact integrals' own pruning bounds take, tabulated.ts logMaxValueDensity; a Beta's value
   * density is largest over an interval without its mode at an end). Infinity where the image reaches O's
   * upper value end. Returns as soon as the bound passes `stop` (the panels visited heaviest first).
   * Cost: O(B's panels + O's panels met).
   */
  private logDensityIntegralBound(scale: number, stop: number): number {
    const base = this.exactBaseIsX ? this.x : this.y;
    const other = this.exactBaseIsX ? this.y : this.x;
    const os = other.source;
    const hi = os.valueRange[1];
    if (this.otherPanelMax === undefined) {
      const most = new Float64Array(other.panelCount).fill(-Infinity);
      for (let i = 0; i < other.nodeZ.length; i++) {
        const p = Math.floor(i / PANEL_ORDER);
        const v = (other.nodeLogDensity[i] as number) - Math.log(os.valueJacobian(other.nodeZ[i] as number));
        if (v > (most[p] as number)) most[p] = v;
      }
      this.otherPanelMax = most;
    }
    const panelMax = this.otherPanelMax;
    let bound = -Infinity;
    // The heaviest panels first: a lift near the middle shows a bound above the threshold at once.
    const order = base.panelOrder;
    for (let r = 0; r < base.panelCount; r++) {
      const p = order[r] as number;
      const mass = base.panelLogMass[p] as number;
      if (mass === -Infinity) continue;
      const ta = base.source.toValue(base.edges[p] as number);
      const tb = base.source.toValue(base.edges[p + 1] as number);
      const a = scale * ta;
      const b = scale * tb;
      if (!(b < hi)) return Infinity;
      let most = Math.max(other.logValueDensity(a), other.logValueDensity(b));
      const za = os.toWorking(a);
      const zb = os.toWorking(b);
      if (zb > other.windowLeft && za < other.windowRight) {
        const last = other.findPanel(zb);
        for (let q = other.findPanel(za); q <= last; q++) most = Math.max(most, panelMax[q] as number);
      }
      bound = logAddExp(bound, mass + Math.log(tb) + most + 1);
      if (bound > stop) return bound;
    }
    return bound;
  }

  /**
   * Whether the exact density of R at s = 1 + m is below the smallest positive double for sure (by
   * logDensityIntegralBound): then it is 0 in the table, as the exact integral's exponential would be.
   */
  densityUnderflows(s: number): boolean {
    const scale = this.exactBaseIsX ? s : 1 / s;
    const offset = this.exactBaseIsX ? 0 : -2 * Math.log(s);
    return this.logDensityIntegralBound(scale, LOG_UNDERFLOW - offset) + offset < LOG_UNDERFLOW;
  }

  /**
   * log of the density of R at m (s = 1 + m), as ratio.ts logRatioDensity: over X ∫ f_X(t) t f_Y(st) dt,
   * over Y ∫ f_Y(t) t f_X(t/s) dt / s²; undefined where the check fails.
   */
  logDensity(s: number): number | undefined {
    const other = this.other;
    const scale = this.baseIsX ? s : 1 / s;
    const bound = this.logTopValue + other.logMaxValueDensity + (this.baseIsX ? 0 : 0);
    const r = this.checked((u) => other.logValueDensity(u), scale, true, bound);
    return r === undefined || this.baseIsX ? r : r - 2 * Math.log(s);
  }

  /**
   * log P(R ≤ m) (log P(R > m) when upper) at s = 1 + m: over X ∫ f_X(t) F_Y(st) dt, over Y
   * ∫ f_Y(t) S_X(t/s) dt (cdf and survival swapped when upper); undefined where the check fails.
   */
  logTail(s: number, upper: boolean): number | undefined {
    const other = this.other;
    const cdf = this.baseIsX !== upper;
    const scale = this.baseIsX ? s : 1 / s;
    return this.checked(cdf ? (u) => other.logCdf(u) : (u) => other.logSf(u), scale, false, 0);
  }
}

const SCRATCH = new Float64Array(64);
/** Below this log a density is 0 in double precision (e^-745.2 is the smallest positive double's half). */
const LOG_UNDERFLOW = -746;

/**
 * One challenger against the control for a chart: the lift's log density and tails, each from the
 * checked Gauss rules (PairRule) where they pass their check, else from the exact pruned integrals
 * (PairDensity; integrate.ts logTailAndDensity, as ratio.ts does), and its quantiles by ratio.ts's solver
 * on those values.
 */
export class LiftPair {
  private readonly exact: PairDensity;
  private readonly rule: PairRule;

  constructor(
    private readonly y: TabulatedDistribution,
    private readonly x: TabulatedDistribution,
  ) {
    this.exact = new PairDensity(y, x);
    this.rule = new PairRule(y, x);
  }

  /** log of the density of R at m > −1. */
  logAt(m: number): number {
    const fast = this.rule.logDensity(1 + m);
    if (fast !== undefined) return fast;
    return this.rule.densityUnderflows(1 + m) ? -Infinity : this.exact.logAt(m);
  }

  /**
   * log P(R ≤ m) (log P(R > m) when upper) at v = log(1 + m) and log of the density of R per unit of v,
   * as ratio.ts's pass for its Newton steps (the same integrals when the rules do not pass).
   */
  tailAndDensity(v: number, upper: boolean): TailAndDensity {
    const s = 1 + Math.expm1(v);
    const tail = this.rule.logTail(s, upper);
    const density = tail === undefined ? undefined : this.rule.logDensity(s);
    if (tail !== undefined && density !== undefined) return { logTail: tail, logDensity: density + v };
    const { x, y } = this;
    if (xIsBase(x, y)) {
      const t = logTailAndDensity(x, y, upper ? 'sf' : 'cdf', s, 0, true);
      return { logTail: t.logTail, logDensity: t.logDensity + v };
    }
    const t = logTailAndDensity(y, x, upper ? 'cdf' : 'sf', 1 / s, 0, true);
    return { logTail: t.logTail, logDensity: t.logDensity - 2 * Math.log(s) + v };
  }

  /** log P(R ≤ m) at v = log(1 + m). */
  logCdf(v: number): number {
    return this.rule.logTail(1 + Math.expm1(v), false) ?? ratioLogTail(this.y, this.x, v, false);
  }

  /** The p-quantile of R from the start v0 (in v), as ratio.ts ratioQuantile (the same solver and bracket). */
  quantile(p: number, start: number): number {
    checkProbability(p);
    const { x, y } = this;
    const ratio = (a: number, b: number) => Math.log(a) - Math.log(b);
    const bracket = (): [number, number] => {
      const lo = ratio(y.quantile(p / 2), x.quantileUpper(p / 2));
      const hi = ratio(y.quantileUpper((1 - p) / 2), x.quantile((1 - p) / 2));
      return [Number.isFinite(lo) ? lo : -745, Number.isFinite(hi) ? hi : 745];
    };
    return Math.expm1(solveQuantile((v, upper) => this.tailAndDensity(v, upper), p, start, bracket));
  }
}

/** log h, the density of V = log(1 + R) per unit of v, on [mid − half, mid + half]: its values at 16 points. */
export interface LogDensityPiece {
  readonly mid: number;
  readonly half: number;
  readonly values: Float64Array;
}

/**
 * log h on [va, vb] from 16 exact values, if its last four Chebyshev coefficients show the interpolant is
 * as accurate as they are (see ACCEPT_ABSOLUTE); undefined otherwise (or where a value is not finite).
 */
function fitPiece(logDensityAt: (m: number) => number, va: number, vb: number): LogDensityPiece | undefined {
  const mid = (va + vb) / 2;
  const half = (vb - va) / 2;
  const values = new Float64Array(POINTS);
  let largest = 0;
  for (let j = 0; j < POINTS; j++) {
    const vj = mid + half * (CHEB_POINTS[j] as number);
    // log h(v) = log g(m) + v: the density of V = log(1 + R) at v, per unit of v.
    const value = logDensityAt(Math.expm1(vj)) + vj;
    if (!Number.isFinite(value)) return undefined;
    values[j] = value;
    largest = Math.max(largest, Math.abs(value));
  }
  return tailCoefficient(values) <= ACCEPT_ABSOLUTE + ACCEPT_RELATIVE * largest ? { mid, half, values } : undefined;
}

/** The interpolated log h at v inside the piece. */
function pieceAt(piece: LogDensityPiece, v: number): number {
  return barycentric(NODES, piece.values, Math.max(-1, Math.min(1, (v - piece.mid) / piece.half)));
}

/** What ratioDensityGrid did: its densities and how many exact integrals they took. */
export interface RatioDensityGrid {
  /** The density of R at each lift of the grid (0 at lifts ≤ −1). */
  readonly densities: number[];
  /** Exact density integrals evaluated (at most 1.25 times the number of lifts above −1). */
  readonly integrals: number;
}

/**
 * The density of R = Y/X − 1 at each lift of an ascending grid. The lifts above −1 are cut into pieces
 * in v = log(1 + m): a piece holding at least 32 lifts is tried with the log density of V exactly at 16
 * Chebyshev points and accepted when its last four coefficients are below 1e-13 (+ 4e-16 of the largest
 * |log density|, its rounding): its lifts then take the interpolated value; else it is halved in v. A
 * piece of fewer lifts, a piece met once the tries would pass a quarter as many integrals as there are
 * lifts, and the halves of a piece where an exact value is not finite (a density below ~1e-308) or the
 * coefficients do not fall are evaluated exactly lift by lift. A kink (two uniforms at m = 0) is never
 * interpolated across: its coefficients do not fall.
 * Accuracy: that of the exact values (ratioDensity, ~1e-13 relative); tested against mpmath.
 * Cost: at most 1.25 × (lifts above −1) density integrals; 16 for a thousand lifts at thousands of visitors.
 * Throws StatsError('invalid_argument') unless X is positive for sure (as ratioDensity).
 * @example
 * const [y, x] = [tabulate(betaWorkingDensity(1, 1)), tabulate(betaWorkingDensity(1, 1))]; // two uniforms
 * ratioDensityGrid(y, x, [-1, -0.5, 1]).densities //=> [0, 0.5, 0.125] (1/2 up to m = 0, 1/(2(1 + m)²) above)
 */
export function ratioDensityGrid(
  y: TabulatedDistribution,
  x: TabulatedDistribution,
  grid: readonly number[],
  known?: LogDensityPiece,
  reuse?: LiftPair,
): RatioDensityGrid {
  const densities = grid.map(() => 0);
  let first = 0;
  while (first < grid.length && !((grid[first] as number) > -1)) first++;
  const v = grid.map((m) => (m > -1 ? Math.log1p(m) : -Infinity));
  // The lifts inside a piece already known take its values; the rest (before and after it) are pieced.
  let knownFrom = grid.length;
  let knownTo = grid.length - 1;
  if (known !== undefined) {
    for (let i = first; i < grid.length; i++) {
      const vi = v[i] as number;
      if (Math.abs(vi - known.mid) <= known.half) {
        if (knownFrom === grid.length) knownFrom = i;
        knownTo = i;
        densities[i] = Math.exp(pieceAt(known, vi) - vi);
      }
    }
  }
  const count = grid.length - first - (knownTo - knownFrom + 1);
  let integrals = 0;
  let tried = 0;
  const pair = count > 0 ? (reuse ?? new LiftPair(y, x)) : undefined;
  const exact = (m: number): number => {
    integrals++;
    return (pair as LiftPair).logAt(m);
  };
  const direct = (from: number, to: number): void => {
    for (let i = from; i <= to; i++) densities[i] = Math.exp(exact(grid[i] as number));
  };
  // Pieces as index ranges [from, to] of the grid, their ends in v the first and last lifts' v.
  const piece = (from: number, to: number): void => {
    const n = to - from + 1;
    const va = v[from] as number;
    const vb = v[to] as number;
    if (n < 2 * POINTS || 4 * (tried + POINTS) > count || !(vb > va)) {
      direct(from, to);
      return;
    }
    tried += POINTS;
    const mid = (va + vb) / 2;
    const fitted = fitPiece(exact, va, vb);
    if (fitted !== undefined) {
      for (let i = from; i <= to; i++) densities[i] = Math.exp(pieceAt(fitted, v[i] as number) - (v[i] as number));
      return;
    }
    // Halve in v: the last lift at or below the middle ends the left piece.
    let split = from;
    while (split < to - 1 && (v[split + 1] as number) <= mid) split++;
    // The half with more lifts first: the tries left are spent where they save the most.
    if (split - from >= to - split - 1) {
      piece(from, split);
      piece(split + 1, to);
    } else {
      piece(split + 1, to);
      piece(from, split);
    }
  };
  if (knownFrom === grid.length) {
    if (count > 0) piece(first, grid.length - 1);
  } else {
    if (knownFrom > first) piece(first, knownFrom - 1);
    if (knownTo < grid.length - 1) piece(knownTo + 1, grid.length - 1);
  }
  return { densities, integrals };
}

/**
 * The widest range of starts (in v = log(1 + lift)) a chart piece is fitted to: wider ranges come from
 * small counts or a control without conversions, whose log h is too far from a polynomial of degree 15
 * across them (measured: last coefficients 1e-3 to 1e-1), so a fit would only cost its 16 integrals.
 */
const MAX_CHART_WIDTH = 1;

/** Sub-intervals of a chart piece for its cumulative integral (each by 16-point Gauss–Legendre). */
const CUMULATIVE_PARTS = 32;
const RULE = gaussLegendre(16);

/** What ratioChartQuantiles found: the lift quantiles, and the piece of log h it used (for the grid). */
export interface RatioChartQuantiles {
  /** The quantiles: solved, or (when `estimated`) the fitted piece's estimates. */
  readonly quantiles: number[];
  readonly piece: LogDensityPiece | undefined;
  /**
   * Whether `quantiles` are the estimates from the fitted piece's cdf (right to ~1e-12 in log(1 + lift),
   * the accuracy of the piece) rather than the roots themselves.
   */
  readonly estimated: boolean;
  /** The roots (ratioQuantile's, to ~1e-13), solved on first call from the estimates. */
  solved(): number[];
  /** The pair's rules and exact integrals, for ratioDensityGrid to reuse. */
  readonly pair: LiftPair;
}

/**
 * Quantiles of R = Y/X − 1 for a chart (ratioQuantile, the same roots), with the Newton steps started
 * from the interpolated distribution: log h is fitted (as ratioDensityGrid) on the range of the normal
 * approximations' starts widened by a quarter of its width on each side (when that range is at most 1
 * wide in v), the cdf there is one exact tail at its
 * middle plus the integral of the interpolated density (32 parts of 16-point Gauss–Legendre), and each
 * quantile's start is where that cdf reaches p; such a start is right to ~1e-12, so ratioQuantile
 * accepts its first Newton step after one pass (instead of two to four). Where the fit fails, the middle
 * tail is below 0.001 or a start falls outside the piece, the normal approximation's start is used.
 * X's marginal quantiles for the starts from `xQuantile` when given (as ratioQuantileStart).
 * With `estimate`, when every start came from the piece those estimates are returned as they are
 * (`estimated`), and `solved()` finds the roots when a caller needs them (a lift chart needs them only
 * for the challengers whose range may set the grid's ends: conversion.ts liftDensityTable).
 * The densities and tails come from the checked Gauss rules of the narrower posterior where those pass
 * their check (PairRule), else from the exact integrals of ratio.ts.
 * Cost: 16 density integrals and one tail pass, then one pass a quantile (typically; none when estimated
 * and not solved). Errors as ratioQuantile.
 */
export function ratioChartQuantiles(
  y: TabulatedDistribution,
  x: TabulatedDistribution,
  ps: readonly number[],
  xQuantile?: QuantileOf,
  estimate = false,
): RatioChartQuantiles {
  const starts = ps.map((p) => ratioQuantileStart(y, x, p, xQuantile));
  const pair = new LiftPair(y, x);
  const solvedFrom = (from: readonly number[], piece: LogDensityPiece | undefined): RatioChartQuantiles => {
    const quantiles = ps.map((p, i) => pair.quantile(p, from[i] as number));
    return { quantiles, piece, estimated: false, solved: () => quantiles, pair };
  };
  const low = Math.min(...starts);
  const high = Math.max(...starts);
  const width = high - low;
  if (!(width > 0 && width <= MAX_CHART_WIDTH)) return solvedFrom(starts, undefined);
  const piece = fitPiece((m) => pair.logAt(m), low - width / 4, high + width / 4);
  if (piece === undefined) return solvedFrom(starts, undefined);
  const middleCdf = Math.exp(pair.logCdf(piece.mid));
  if (!(middleCdf > 1e-3 && middleCdf < 1 - 1e-3)) return solvedFrom(starts, piece);
  // cumulative[k] = ∫ h from the piece's left end to its k-th part edge.
  const left = piece.mid - piece.half;
  const step = (2 * piece.half) / CUMULATIVE_PARTS;
  const integral = (a: number, b: number): number => {
    let sum = 0;
    for (let j = 0; j < RULE.nodes.length; j++) {
      const t = (a + b) / 2 + ((b - a) / 2) * (RULE.nodes[j] as number);
      sum += (RULE.weights[j] as number) * Math.exp(pieceAt(piece, t));
    }
    return (sum * (b - a)) / 2;
  };
  const cumulative = new Float64Array(CUMULATIVE_PARTS + 1);
  for (let k = 0; k < CUMULATIVE_PARTS; k++) {
    cumulative[k + 1] = (cumulative[k] as number) + integral(left + k * step, left + (k + 1) * step);
  }
  const middle = cumulative[CUMULATIVE_PARTS / 2] as number;
  // Each quantile's start in v from the interpolated cdf (NaN where the piece does not hold it).
  const estimates = ps.map((p) => {
    // ∫ h from the left end to the quantile, by the cdf at the middle.
    const target = middle + (p - middleCdf);
    let k = 0;
    while (k < CUMULATIVE_PARTS && (cumulative[k + 1] as number) < target) k++;
    if (!(target > 0) || k === CUMULATIVE_PARTS) return NaN;
    // Newton inside part k on ∫ from its left edge, the derivative h.
    const a = left + k * step;
    const rest = target - (cumulative[k] as number);
    let v = a + (rest / ((cumulative[k + 1] as number) - (cumulative[k] as number))) * step;
    for (let iteration = 0; iteration < 8; iteration++) {
      const next = v - (integral(a, v) - rest) / Math.exp(pieceAt(piece, v));
      if (!Number.isFinite(next)) break;
      const done = Math.abs(next - v) <= 1e-15 * Math.max(1, Math.abs(v));
      v = next;
      if (done) break;
    }
    return v;
  });
  const from = estimates.map((v, i) => (Number.isFinite(v) ? v : (starts[i] as number)));
  if (!estimate || !estimates.every((v) => Number.isFinite(v))) return solvedFrom(from, piece);
  let solved: number[] | undefined;
  return {
    quantiles: estimates.map((v) => Math.expm1(v)),
    piece,
    estimated: true,
    solved: () => (solved ??= solvedFrom(from, piece).quantiles),
    pair,
  };
}

/**
 * The quadrature engine of the read-outs: a log-concave density tabulated on composite 16-point
 * Gauss–Legendre panels in its working variable, with log F and log(1 − F) kept at every node so that
 * both tails keep their relative accuracy (the smaller tail is never formed as 1 − something near 1).
 *
 * Everything here is deterministic: the same density gives the same panels, nodes and values.
 */
import { StatsError } from './errors';
import { gaussLegendre, log1mExp, logAddExp, logSumExp } from './numeric';
import type { WorkingDensity } from './types';

/** Gauss–Legendre points per panel. */
export const PANEL_ORDER = 16;

/** Largest |trend| (in units of the panel's half-width) removed before the in-panel integration. */
const MAX_TREND = 16;

/** Points of the auxiliary rule used once to build the in-panel integration matrices. */
const AUX_ORDER = 48;

/** The tabulation's fixed tables, computed once at load from the Gauss–Legendre rule (read only). */
interface PanelTables {
  /** Nodes t_k of the 16-point rule on [−1, 1], ascending. */
  readonly nodes: readonly number[];
  /** Weights of the 16-point rule. */
  readonly weights: readonly number[];
  /**
   * left[β + MAX_TREND][16·k + j] = ∫_{−1}^{t_k} ℓ_j(t) e^{βt} dt and right[…] = ∫_{t_k}^{1} ℓ_j(t) e^{βt} dt,
   * ℓ_j the Lagrange basis through the nodes. Applied to g(t_j)e^{−βt_j} they integrate g = poly·e^{βt}
   * exactly; removing the panel's exponential trend β first keeps the partial integrals accurate to
   * ~1e-15 *relative* even where the density changes by e^{±20} across a panel (a tail panel).
   */
  readonly left: readonly Float64Array[];
  readonly right: readonly Float64Array[];
  /** whole[β + MAX_TREND][j] = ∫_{−1}^{1} ℓ_j(t) e^{βt} dt: the trend-weighted rule for a whole panel. */
  readonly whole: readonly Float64Array[];
  /** Barycentric weights of the 18 interpolation points −1, t_0 … t_15, +1. */
  readonly barycentric: readonly number[];
  /** The 18 interpolation points themselves. */
  readonly points: readonly number[];
}

function buildPanelTables(): PanelTables {
  const rule = gaussLegendre(PANEL_ORDER);
  const nodes = Array.from(rule.nodes);
  const weights = Array.from(rule.weights);
  const aux = gaussLegendre(AUX_ORDER);
  const n = PANEL_ORDER;
  const lagrangeWeight = nodes.map((tj, j) => {
    let product = 1;
    for (let m = 0; m < n; m++) if (m !== j) product *= tj - (nodes[m] as number);
    return 1 / product;
  });
  const basis = (s: number, out: Float64Array): void => {
    for (let j = 0; j < n; j++) {
      let product = lagrangeWeight[j] as number;
      for (let m = 0; m < n; m++) if (m !== j) product *= s - (nodes[m] as number);
      out[j] = product;
    }
  };
  // For each node k: the auxiliary points on [−1, t_k] and on [t_k, 1] with their weights and basis values.
  const leftSamples: { s: number; w: number; l: Float64Array }[][] = [];
  const rightSamples: { s: number; w: number; l: Float64Array }[][] = [];
  for (let k = 0; k < n; k++) {
    const tk = nodes[k] as number;
    const sampleOn = (a: number, b: number) => {
      const half = (b - a) / 2;
      const mid = (a + b) / 2;
      const list: { s: number; w: number; l: Float64Array }[] = [];
      for (let m = 0; m < AUX_ORDER; m++) {
        const s = mid + half * (aux.nodes[m] as number);
        const l = new Float64Array(n);
        basis(s, l);
        list.push({ s, w: half * (aux.weights[m] as number), l });
      }
      return list;
    };
    leftSamples.push(sampleOn(-1, tk));
    rightSamples.push(sampleOn(tk, 1));
  }
  const left: Float64Array[] = [];
  const right: Float64Array[] = [];
  const whole: Float64Array[] = [];
  const fullSamples = (() => {
    const list: { s: number; w: number; l: Float64Array }[] = [];
    for (let m = 0; m < AUX_ORDER; m++) {
      const l = new Float64Array(n);
      basis(aux.nodes[m] as number, l);
      list.push({ s: aux.nodes[m] as number, w: aux.weights[m] as number, l });
    }
    return list;
  })();
  for (let beta = -MAX_TREND; beta <= MAX_TREND; beta++) {
    const wv = new Float64Array(n);
    for (const sample of fullSamples) {
      const e = sample.w * Math.exp(beta * sample.s);
      for (let j = 0; j < n; j++) wv[j] = (wv[j] as number) + e * (sample.l[j] as number);
    }
    whole.push(wv);
    const l = new Float64Array(n * n);
    const r = new Float64Array(n * n);
    for (let k = 0; k < n; k++) {
      for (const sample of leftSamples[k] ?? []) {
        const e = sample.w * Math.exp(beta * sample.s);
        for (let j = 0; j < n; j++) l[n * k + j] = (l[n * k + j] as number) + e * (sample.l[j] as number);
      }
      for (const sample of rightSamples[k] ?? []) {
        const e = sample.w * Math.exp(beta * sample.s);
        for (let j = 0; j < n; j++) r[n * k + j] = (r[n * k + j] as number) + e * (sample.l[j] as number);
      }
    }
    left.push(l);
    right.push(r);
  }
  const points = [-1, ...nodes, 1];
  const barycentric = points.map((pj, j) => {
    let product = 1;
    for (let m = 0; m < points.length; m++) if (m !== j) product *= pj - (points[m] as number);
    return 1 / product;
  });
  return { nodes, weights, left, right, whole, barycentric, points };
}

/** Read-only tables shared by every tabulation (no state: computed once, never written again). */
const TABLES: PanelTables = buildPanelTables();

/** The 18 interpolation points −1, t_0 … t_15, +1 and their barycentric weights, as typed arrays. */
const INTERPOLATION_POINTS: Float64Array = Float64Array.from(TABLES.points);
const INTERPOLATION_WEIGHTS: Float64Array = Float64Array.from(TABLES.barycentric);

/** log of the 16 Gauss–Legendre weights. */
const LOG_WEIGHTS: readonly number[] = TABLES.weights.map((w) => Math.log(w));

/** The 16 Gauss–Legendre nodes on [−1, 1] that every panel uses, ascending (read only). */
export const PANEL_NODES: readonly number[] = TABLES.nodes;

/** Options of {@link tabulate}; the defaults are what the accuracy tests were run with. */
export interface TabulationOptions {
  /**
   * The window is where logDensity ≥ −logRange (default 230: tails down to ~1e-100 are tabulated, which
   * keeps probabilities and losses down to ~1e-90 relatively accurate; beyond the window the
   * exponential-tail form f/|slope| is used). 700 reaches 1e-300 at three times the cost.
   */
  readonly logRange?: number;
  /** Panel width at most curvatureWidth/√curvature (default 2: two local standard deviations). */
  readonly curvatureWidth?: number;
  /** Panel width at most slopeWidth/|slope| (default 24: the density changes by at most ~e^24
   * across a panel; the trend-weighted rules keep such panels exact). */
  readonly slopeWidth?: number;
  /**
   * Panel width at most absoluteWidth in z wherever curvature·width² > 1e-6 (default 1.5), against
   * complex singularities of the density a few units from the real axis.
   */
  readonly absoluteWidth?: number;
  /**
   * Name of the working variable (e.g. "logit"). Two tabulations with the same name are compared
   * directly in the working variable, skipping the round trip through the value, which loses digits
   * near the ends of the value range (a rate of 1 − 1e-9).
   */
  readonly coordinate?: string;
}

const DEFAULT_LOG_RANGE = 230;
const DEFAULT_CURVATURE_WIDTH = 2;
const DEFAULT_SLOPE_WIDTH = 24;
const DEFAULT_ABSOLUTE_WIDTH = 1.5;
const MAX_PANELS = 20000;

/** Integrated cdf tables G(z) = ∫ F dx (value units), built on first use. */
interface LowerMomentTables {
  readonly node: Float64Array;
  readonly edge: Float64Array;
}

function failure(message: string): StatsError {
  return new StatsError('not_available', `the posterior could not be tabulated: ${message}`);
}

/**
 * Finds where logDensity falls to −range on one side of the mode (direction ±1) by Newton's method,
 * which for a concave log density approaches the crossing monotonically from outside after one step.
 */
function windowEnd(density: WorkingDensity, range: number, direction: 1 | -1): number {
  const mode = density.mode;
  const c0 = density.curvature(mode);
  let step = c0 > 0 && Number.isFinite(c0) ? Math.sqrt((2 * range) / c0) : 1;
  let z = mode + direction * step;
  // Make sure the start is beyond the mode with a usable slope (log-concavity makes it so for any z ≠ mode).
  for (let i = 0; i < 2000; i++) {
    const phi = density.logDensity(z);
    const s = density.slope(z);
    if (!Number.isFinite(phi) || !Number.isFinite(s)) {
      // Too far: come back half-way towards the mode.
      step /= 2;
      z = mode + direction * step;
      continue;
    }
    const g = phi + range;
    if (direction * s >= 0) {
      step *= 2;
      z = mode + direction * step;
      continue;
    }
    const next = z - g / s;
    if (Math.abs(g) <= 1e-6 || Math.abs(next - z) <= 1e-13 * (1 + Math.abs(z))) return next;
    z = next;
    step = direction * (z - mode);
  }
  throw failure('the tail window did not converge');
}

/**
 * A density tabulated on composite Gauss–Legendre panels in its working variable z, normalised
 * numerically, with log f, log F and log(1 − F) at every node. Build it with {@link tabulate}.
 *
 * All arrays are exposed read-only for compare.ts; do not modify them.
 */
export class TabulatedDistribution {
  /** The density this table was built from. */
  readonly source: WorkingDensity;
  /** The working variable's name (see {@link TabulationOptions.coordinate}), if given. */
  readonly coordinate: string | undefined;
  /** Panel edges in z, ascending (panelCount + 1 entries). */
  readonly edges: Float64Array;
  /** Nodes in z, 16 per panel, ascending. */
  readonly nodeZ: Float64Array;
  /** log of each node's quadrature weight (in z). */
  readonly nodeLogWeight: Float64Array;
  /** log of the normalised density in z at each node. */
  readonly nodeLogDensity: Float64Array;
  /** log F at each edge. */
  readonly edgeLogCdf: Float64Array;
  /** log(1 − F) at each edge. */
  readonly edgeLogSf: Float64Array;
  /** log of each panel's probability mass. */
  readonly panelLogMass: Float64Array;
  /** log of the numerical normalising constant of exp(logDensity). */
  readonly logNormaliser: number;
  /** Mean of the value: the exact mean when the density gives one, else by quadrature. */
  readonly mean: number;
  /** A width of the value near the mode: valueJacobian(mode)/√curvature(mode). */
  readonly spread: number;
  /** Cache of {@link logMaxValueDensity}. */
  private maxValueDensity: number | undefined;
  /** Cache of {@link panelOrder}. */
  private order: Int32Array | undefined;
  /** log F at each node (filled per panel on first use; see {@link panelCdfTables}). */
  private readonly nodeLogCdf: Float64Array;
  /** log(1 − F) at each node, accumulated from the right (filled with nodeLogCdf). */
  private readonly nodeLogSf: Float64Array;
  /** Working space of {@link ensurePanel} (its contents never outlive one call). */
  private readonly scratchLeft = new Float64Array(PANEL_ORDER);
  private readonly scratchRight = new Float64Array(PANEL_ORDER);
  private readonly scratchWork = new Float64Array(PANEL_ORDER);
  /** Working space of {@link interpolate} (its contents never outlive one call). */
  private readonly scratchSuffix = new Float64Array(PANEL_ORDER + 2);
  /** 1 where a panel's node log F and log(1 − F) have been computed. */
  private readonly panelReady: Uint8Array;
  /** 1 for panels left of the median (log F interpolated there), 0 right of it (log(1 − F) interpolated). */
  private readonly leftSide: Uint8Array;
  private lowerMoment: LowerMomentTables | undefined;
  /** Caches of {@link nodeValue} and {@link nodeLogValue}. */
  private nodeValues: Float64Array | undefined;
  private nodeLogValues: Float64Array | undefined;
  /** Cache of {@link median}. */
  private medianValue: number | undefined;

  /** @internal Use {@link tabulate}. */
  constructor(source: WorkingDensity, options: TabulationOptions = {}) {
    const range = options.logRange ?? DEFAULT_LOG_RANGE;
    const cw = options.curvatureWidth ?? DEFAULT_CURVATURE_WIDTH;
    const sw = options.slopeWidth ?? DEFAULT_SLOPE_WIDTH;
    const aw = options.absoluteWidth ?? DEFAULT_ABSOLUTE_WIDTH;
    this.source = source;
    this.coordinate = options.coordinate;
    const zLeft = windowEnd(source, range, -1);
    const zRight = windowEnd(source, range, 1);
    if (!(zLeft < source.mode && source.mode < zRight)) throw failure('the window is empty');

    const width = (z: number): number => {
      const c = source.curvature(z);
      const s = Math.abs(source.slope(z));
      const a = c > 0 ? cw / Math.sqrt(c) : Infinity;
      const b = s > 0 ? sw / s : Infinity;
      let w = Math.min(a, b, (zRight - zLeft) / 4);
      // Where the curvature still matters, also keep panels short against nearby complex singularities
      // (the logit Beta has poles at distance π from the real axis).
      if (w > aw && c * w * w > 1e-6) w = Math.max(aw, Math.min(w, Math.sqrt(1e-6 / c)));
      return w;
    };
    const edgeList: number[] = [zLeft];
    let z = zLeft;
    while (z < zRight) {
      // The width rule at the start, the middle, the end and (if inside) the mode, until it holds on all.
      // Halving towards the local rule where it is stricter further on (never cutting below it at once,
      // which would make a panel far from a narrow region as short as the region needs).
      let w = width(z);
      for (let pass = 0; pass < 80; pass++) {
        let need = Math.min(width(z + w), width(z + w / 2));
        if (z < source.mode && source.mode < z + w) need = Math.min(need, width(source.mode));
        if (need >= w) break;
        w = Math.max(need, w / 2);
      }
      if (!(w > 0)) throw failure('a panel has no width');
      // Only rounding dust is absorbed into the last panel (a longer panel could swallow the bulk).
      if (zRight - (z + w) < 1e-9 * w) w = zRight - z;
      z = w === zRight - z ? zRight : z + w;
      edgeList.push(z);
      if (edgeList.length > MAX_PANELS) throw failure('too many panels');
    }
    const panels = edgeList.length - 1;
    const n = PANEL_ORDER;
    const { nodes } = TABLES;
    this.edges = Float64Array.from(edgeList);
    this.nodeZ = new Float64Array(panels * n);
    this.nodeLogWeight = new Float64Array(panels * n);
    this.nodeLogDensity = new Float64Array(panels * n);
    this.nodeLogCdf = new Float64Array(panels * n);
    this.nodeLogSf = new Float64Array(panels * n);
    this.edgeLogCdf = new Float64Array(panels + 1);
    this.edgeLogSf = new Float64Array(panels + 1);
    this.panelLogMass = new Float64Array(panels);
    this.panelReady = new Uint8Array(panels);
    this.leftSide = new Uint8Array(panels);

    for (let p = 0; p < panels; p++) {
      const a = this.edges[p] as number;
      const b = this.edges[p + 1] as number;
      const half = (b - a) / 2;
      const logHalf = Math.log(half);
      const mid = (a + b) / 2;
      let max = -Infinity;
      for (let k = 0; k < n; k++) {
        const zk = mid + half * (nodes[k] as number);
        const phi = source.logDensity(zk);
        if (Number.isNaN(phi)) throw failure(`the log density is NaN at ${zk}`);
        this.nodeZ[p * n + k] = zk;
        this.nodeLogWeight[p * n + k] = logHalf + (LOG_WEIGHTS[k] as number);
        this.nodeLogDensity[p * n + k] = phi;
        if (phi > max) max = phi;
      }
      this.panelLogMass[p] = panelLogIntegral(this.nodeLogDensity, p * n, half);
    }
    const logZ = logSumExp(this.panelLogMass);
    if (!Number.isFinite(logZ)) throw failure('the total mass is not finite');
    this.logNormaliser = logZ;
    for (let i = 0; i < panels * n; i++) this.nodeLogDensity[i] = (this.nodeLogDensity[i] as number) - logZ;
    for (let p = 0; p < panels; p++) this.panelLogMass[p] = (this.panelLogMass[p] as number) - logZ;

    // Tails beyond the window, by the exponential-tail bound f/|slope| of a log-concave density.
    this.edgeLogCdf[0] = source.logDensity(zLeft) - logZ - Math.log(Math.abs(source.slope(zLeft)));
    this.edgeLogSf[panels] = source.logDensity(zRight) - logZ - Math.log(Math.abs(source.slope(zRight)));
    for (let p = 0; p < panels; p++) {
      this.edgeLogCdf[p + 1] = logAddExp(this.edgeLogCdf[p] as number, this.panelLogMass[p] as number);
    }
    for (let p = panels - 1; p >= 0; p--) {
      this.edgeLogSf[p] = logAddExp(this.edgeLogSf[p + 1] as number, this.panelLogMass[p] as number);
    }
    for (let p = 0; p < panels; p++) {
      this.leftSide[p] = (this.edgeLogCdf[p + 1] as number) <= (this.edgeLogSf[p] as number) ? 1 : 0;
    }
    this.order = undefined;

    let mean = source.exactMean;
    if (mean === undefined) {
      mean = 0;
      for (let i = 0; i < panels * n; i++) {
        mean += Math.exp((this.nodeLogWeight[i] as number) + (this.nodeLogDensity[i] as number)) * source.toValue(this.nodeZ[i] as number);
      }
    }
    this.mean = mean;
    this.maxValueDensity = undefined;
    this.spread = source.valueJacobian(source.mode) / Math.sqrt(source.curvature(source.mode));
    this.lowerMoment = undefined;
  }

  /**
   * An upper bound of the log density of the value (the largest node value plus one, for the peak between
   * nodes); +Infinity where the value density is unbounded (a Beta with a < 1). Computed on first use.
   * @example tabulate(betaWorkingDensity(1, 1)).logMaxValueDensity // ≈ 1 (log of the uniform density, plus 1)
   */
  get logMaxValueDensity(): number {
    if (this.maxValueDensity === undefined) {
      let max = -Infinity;
      for (let i = 0; i < this.nodeZ.length; i++) {
        const v = (this.nodeLogDensity[i] as number) - Math.log(this.source.valueJacobian(this.nodeZ[i] as number));
        if (v > max) max = v;
      }
      this.maxValueDensity = max + 1;
    }
    return this.maxValueDensity;
  }

  /**
   * Panel indices by decreasing mass (ties by index): the order compare.ts visits them in. Sorted on
   * first use. @example tabulate(betaWorkingDensity(8, 10)).panelOrder.length //=> its panelCount
   */
  get panelOrder(): Int32Array {
    if (this.order === undefined) {
      const mass = this.panelLogMass;
      const order = Array.from({ length: mass.length }, (_, p) => p);
      order.sort((p, q) => (mass[q] as number) - (mass[p] as number) || p - q);
      this.order = Int32Array.from(order);
    }
    return this.order;
  }

  /** Number of panels. */
  get panelCount(): number {
    return this.edges.length - 1;
  }

  /** Left end of the window in z. */
  get windowLeft(): number {
    return this.edges[0] as number;
  }

  /** Right end of the window in z. */
  get windowRight(): number {
    return this.edges[this.edges.length - 1] as number;
  }

  /**
   * Index of the panel containing z (clamped to the window). Binary search, O(log panels).
   * @example tabulate(betaWorkingDensity(8, 10)).findPanel(-1e9) //=> 0
   */
  findPanel(z: number): number {
    let lo = 0;
    let hi = this.edges.length - 2;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((this.edges[mid] as number) <= z) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }

  /**
   * log of the normalised density in z at any z (direct evaluation of the source density). O(1).
   * @example Math.exp(tabulate(betaWorkingDensity(1, 1)).logDensityAt(0)) // 0.25 (p(1 − p) at p = ½)
   */
  logDensityAt(z: number): number {
    return this.source.logDensity(z) - this.logNormaliser;
  }

  /**
   * Computes panel p's node values of log F and log(1 − F) if not done yet: the partial integrals from
   * the panel's edges to its nodes (trend-weighted spectral integration) added to the edge values.
   * Deterministic: the result depends only on the panel, never on the order of use.
   */
  private ensurePanel(p: number): void {
    if (this.panelReady[p] === 1) return;
    const n = PANEL_ORDER;
    const left = this.scratchLeft;
    const right = this.scratchRight;
    const work = this.scratchWork;
    const half = ((this.edges[p + 1] as number) - (this.edges[p] as number)) / 2;
    // log(e^edge + e^logScale · partial) for each node, with e^{logScale − edge} formed once per panel:
    // edge + log1p(ratio) while the edge's term dominates, else the partial's log plus log1p(1/ratio).
    const logScale = inPanelSums(this.nodeLogDensity, p * n, half, left, right, work);
    const edgeCdf = this.edgeLogCdf[p] as number;
    const edgeSf = this.edgeLogSf[p + 1] as number;
    const scaleCdf = Math.exp(logScale - edgeCdf);
    const scaleSf = Math.exp(logScale - edgeSf);
    for (let k = 0; k < n; k++) {
      this.nodeLogCdf[p * n + k] = addPartial(edgeCdf, scaleCdf, logScale, left[k] as number);
      this.nodeLogSf[p * n + k] = addPartial(edgeSf, scaleSf, logScale, right[k] as number);
    }
    this.panelReady[p] = 1;
  }

  /**
   * log F and log(1 − F) at panel p's 16 nodes (views into the tables; do not modify). log F is accurate
   * relative to F where F is small and to ~1e-16 absolute near 1, log(1 − F) the other way round.
   * Cost: one panel's partial integrals on first use, then O(1).
   * @example tabulate(betaWorkingDensity(8, 10)).panelCdfTables(0).logCdf.length //=> 16
   */
  panelCdfTables(p: number): { readonly logCdf: Float64Array; readonly logSf: Float64Array } {
    this.ensurePanel(p);
    const n = PANEL_ORDER;
    return { logCdf: this.nodeLogCdf.subarray(p * n, p * n + n), logSf: this.nodeLogSf.subarray(p * n, p * n + n) };
  }

  /**
   * log F at the working value z: barycentric interpolation (Berrut & Trefethen, "Barycentric Lagrange
   * interpolation", SIAM Review 2004) through the panel's 16 nodes and 2 edges of log F left of the
   * median, of log(1 − F) right of it (then converted with log1mExp), so it is accurate relative to F in
   * the lower tail and relative to 1 − F in the upper. Beyond the window the exponential-tail form
   * f/|slope| is used. Cost: ~60 flops (+ exp and log1p right of the median).
   * @example Math.exp(tabulate(betaWorkingDensity(8, 10)).logCdfAt(0)) // 0.685470581054… (pbeta(0.5, 8, 10))
   */
  logCdfAt(z: number): number {
    if (z <= this.windowLeft || z >= this.windowRight) return this.tailOutside(z, false);
    return this.tailInPanel(this.findPanel(z), z, false);
  }

  /**
   * log F (upper = false) or log(1 − F) (upper = true) at z inside panel p: the smaller tail's table (log F
   * left of the median, log(1 − F) right of it), converted with log1mExp on the far side. Interpolating
   * the far side's own table instead is not accurate enough where a slow tail makes the panels wide
   * (8e-9 absolute for Beta(0.1, 10), measured against mpmath).
   */
  private tailInPanel(p: number, z: number, upper: boolean): number {
    this.ensurePanel(p);
    if (this.leftSide[p] === 1) {
      const v = Math.min(0, this.interpolate(this.edgeLogCdf, this.nodeLogCdf, p, z));
      return upper ? log1mExp(v) : v;
    }
    const v = Math.min(0, this.interpolate(this.edgeLogSf, this.nodeLogSf, p, z));
    return upper ? v : log1mExp(v);
  }

  /** The same beyond the window (z at or outside its ends): the exponential-tail form f/|slope|. */
  private tailOutside(z: number, upper: boolean): number {
    if (z <= this.windowLeft) return upper ? log1mExp(this.leftTail(z)) : this.leftTail(z);
    return upper ? this.rightTail(z) : log1mExp(this.rightTail(z));
  }

  /**
   * Adds log F (upper = false) or log(1 − F) (upper = true) at each of `count` ascending working values
   * zs[offset … offset + count − 1] to out[0 … count − 1], skipping entries of out that are already −Infinity. The same
   * values as {@link logCdfAt} / {@link logSfAt} point by point (bit for bit), with the panel found once by
   * binary search and then by stepping forward (the points are ascending). Cost: one interpolation a
   * point (plus a log1mExp on the far side of the median).
   * Used by compare.ts for the nodes of one base panel.
   * @example tabulate(betaWorkingDensity(8, 10)).addLogTailsAt(Float64Array.of(0), 0, 1, new Float64Array(1), false) // out[0] = log 0.6854705810546875
   */
  addLogTailsAt(zs: ArrayLike<number>, offset: number, count: number, out: Float64Array, upper: boolean): void {
    const left = this.windowLeft;
    const right = this.windowRight;
    const last = this.panelCount - 1;
    let p = -1;
    for (let k = 0; k < count; k++) {
      const before = out[k] as number;
      if (before === -Infinity) continue;
      const z = zs[offset + k] as number;
      let v: number;
      if (z <= left || z >= right) v = this.tailOutside(z, upper);
      else {
        if (p < 0) p = this.findPanel(z);
        else while (p < last && (this.edges[p + 1] as number) <= z) p++;
        v = this.tailInPanel(p, z, upper);
      }
      out[k] = before + v;
    }
  }

  /**
   * The value toValue(z) at every node (computed on first use; read only): the same numbers as calling
   * source.toValue on nodeZ, kept for integrals that visit the nodes many times (quantile searches).
   * @example tabulate(betaWorkingDensity(8, 10)).nodeValue.length //=> 16 × its panelCount
   */
  get nodeValue(): Float64Array {
    if (this.nodeValues === undefined) {
      const values = new Float64Array(this.nodeZ.length);
      for (let i = 0; i < values.length; i++) values[i] = this.source.toValue(this.nodeZ[i] as number);
      this.nodeValues = values;
    }
    return this.nodeValues;
  }

  /** log of {@link nodeValue} at every node (computed on first use; read only; NaN where the value is negative). */
  get nodeLogValue(): Float64Array {
    if (this.nodeLogValues === undefined) {
      const values = this.nodeValue;
      const logs = new Float64Array(values.length);
      for (let i = 0; i < logs.length; i++) logs[i] = Math.log(values[i] as number);
      this.nodeLogValues = logs;
    }
    return this.nodeLogValues;
  }

  /**
   * log(1 − F) at the working value z, relative to 1 − F in the upper tail (mirror of {@link logCdfAt}).
   * @example Math.exp(tabulate(betaWorkingDensity(8, 10)).logSfAt(0)) // 0.314529418945… (1 − pbeta(0.5, 8, 10))
   */
  logSfAt(z: number): number {
    if (z <= this.windowLeft || z >= this.windowRight) return this.tailOutside(z, true);
    return this.tailInPanel(this.findPanel(z), z, true);
  }

  /**
   * log F(x) of the value x. Cost: one toWorking and one interpolation.
   * @example tabulate(betaWorkingDensity(8, 10)).logCdf(0.5) //=> log(0.685470581054688) (R pbeta)
   */
  logCdf(x: number): number {
    const [lo, hi] = this.source.valueRange;
    if (x <= lo) return -Infinity;
    if (x >= hi) return 0;
    return this.logCdfAt(this.source.toWorking(x));
  }

  /** log(1 − F(x)) of the value x. */
  logSf(x: number): number {
    const [lo, hi] = this.source.valueRange;
    if (x <= lo) return 0;
    if (x >= hi) return -Infinity;
    return this.logSfAt(this.source.toWorking(x));
  }

  /**
   * P(X ≤ x). @example tabulate(betaWorkingDensity(8, 10)).cdf(0.5) //=> 0.685470581054688 (R pbeta)
   */
  cdf(x: number): number {
    return Math.exp(this.logCdf(x));
  }

  /**
   * P(X > x), accurate relative to itself in the upper tail.
   * @example tabulate(betaWorkingDensity(8, 10)).sf(0.5) // 0.3145294189453… (1 − pbeta(0.5, 8, 10))
   */
  sf(x: number): number {
    return Math.exp(this.logSf(x));
  }

  /**
   * log of the density of the value at x (per unit of value); −Infinity outside the value range. O(1).
   * @example tabulate(betaWorkingDensity(1, 1)).logValueDensity(0.3) // ≈ 0 (the uniform density is 1)
   */
  logValueDensity(x: number): number {
    const [lo, hi] = this.source.valueRange;
    if (!(x > lo && x < hi)) return -Infinity;
    const z = this.source.toWorking(x);
    return this.logDensityAt(z) - Math.log(this.source.valueJacobian(z));
  }

  /**
   * The density of the value at x (per unit of value; a rate's density for a Beta).
   * @example tabulate(betaWorkingDensity(8, 10)).density(0.5) //=> 2.9675292968750 (R dbeta(0.5, 8, 10))
   */
  density(x: number): number {
    return Math.exp(this.logValueDensity(x));
  }

  /**
   * The working value z with F(z) = p. Newton on the interpolated log F with the exact density as
   * derivative, safeguarded by bisection inside the panel found from the edge values. Cost: ~5 steps.
   * Throws StatsError('invalid_argument') unless 0 < p < 1.
   * @example tabulate(betaWorkingDensity(8, 10)).workingQuantile(0.685470581054688) // ≈ 0 (logit of 0.5)
   */
  workingQuantile(p: number): number {
    if (!(p > 0 && p < 1)) throw new StatsError('invalid_argument', `a probability must be strictly between 0 and 1, not ${p}`);
    if (p > 0.5) return this.workingQuantileUpper(1 - p);
    const target = Math.log(p);
    const e = this.edgeLogCdf;
    if (target <= (e[0] as number)) return this.windowLeft;
    let lo = 0;
    let hi = this.panelCount - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((e[mid] as number) <= target) lo = mid;
      else hi = mid - 1;
    }
    return this.solveMonotone(
      (z) => this.logCdfAt(z) - target,
      (z) => Math.exp(this.logDensityAt(z) - this.logCdfAt(z)),
      this.edges[lo] as number,
      this.edges[lo + 1] as number,
    );
  }

  /**
   * The working value z with 1 − F(z) = q (for small q without forming 1 − q). Same method and errors as
   * workingQuantile. @example tabulate(betaWorkingDensity(1, 1)).workingQuantileUpper(0.5) // ≈ 0
   */
  workingQuantileUpper(q: number): number {
    if (!(q > 0 && q < 1)) throw new StatsError('invalid_argument', `a probability must be strictly between 0 and 1, not ${q}`);
    if (q > 0.5) return this.workingQuantile(1 - q);
    const target = Math.log(q);
    const e = this.edgeLogSf;
    const last = this.panelCount;
    if (target <= (e[last] as number)) return this.windowRight;
    // Largest edge index with logSf ≥ target.
    let lo = 0;
    let hi = last - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((e[mid] as number) >= target) lo = mid;
      else hi = mid - 1;
    }
    return this.solveMonotone(
      (z) => target - this.logSfAt(z),
      (z) => Math.exp(this.logDensityAt(z) - this.logSfAt(z)),
      this.edges[lo] as number,
      this.edges[lo + 1] as number,
    );
  }

  /**
   * The value x with P(X ≤ x) = p. cdf(quantile(p)) = p to ~1e-14 relative.
   * Throws StatsError('invalid_argument') unless 0 < p < 1.
   * @example tabulate(betaWorkingDensity(8, 10)).quantile(0.685470581054688) //=> 0.5 (R pbeta)
   */
  quantile(p: number): number {
    return this.source.toValue(this.workingQuantile(p));
  }

  /**
   * The median, quantile(0.5), computed on first use and kept (quantile searches start from it).
   * @example tabulate(betaWorkingDensity(1, 1)).median // 0.5
   */
  get median(): number {
    if (this.medianValue === undefined) this.medianValue = this.quantile(0.5);
    return this.medianValue;
  }

  /**
   * The value x with P(X > x) = q, accurate for tiny q (no 1 − q is formed).
   * @example tabulate(betaWorkingDensity(1, 11)).quantileUpper(1e-30) // 0.9982… (1 − 1e-30^(1/11))
   */
  quantileUpper(q: number): number {
    return this.source.toValue(this.workingQuantileUpper(q));
  }

  /**
   * log G(z) with G(x) = ∫_{lo}^{x} F(u) du = E[(x − X)^+], the integrated cdf (lower partial moment),
   * in value units, accurate relative to itself in the left tail. Built on first use. Used for
   * expected losses: E[(Y − X)^+] = ∫ f_Y(y) G_X(y) dy. Cost: all panels' tables on first use, then O(1).
   * @example Math.exp(tabulate(betaWorkingDensity(1, 1)).logLowerMomentAt(0)) // 0.125 (x²/2 at x = ½)
   */
  logLowerMomentAt(z: number): number {
    const tables = this.lowerMomentTables();
    if (z <= this.windowLeft) {
      return this.leftTail(z) + Math.log(this.source.valueJacobian(z)) - Math.log(Math.abs(this.source.slope(z)) + 1);
    }
    if (z >= this.windowRight) {
      const g = Math.exp(tables.edge[this.panelCount] as number);
      return Math.log(g + (this.source.toValue(z) - this.source.toValue(this.windowRight)));
    }
    return this.interpolate(tables.edge, tables.node, this.findPanel(z), z);
  }

  /**
   * log E[(x − X)^+] at the value x; −Infinity at or below the lowest value.
   * @example Math.exp(tabulate(betaWorkingDensity(1, 1)).logLowerMoment(0.3)) // 0.045 (x²/2)
   */
  logLowerMoment(x: number): number {
    const [lo, hi] = this.source.valueRange;
    if (x <= lo) return -Infinity;
    if (x >= hi) return Math.log(x - this.mean);
    return this.logLowerMomentAt(this.source.toWorking(x));
  }

  private lowerMomentTables(): LowerMomentTables {
    if (this.lowerMoment !== undefined) return this.lowerMoment;
    const n = PANEL_ORDER;
    const panels = this.panelCount;
    const node = new Float64Array(panels * n);
    const edge = new Float64Array(panels + 1);
    const integrand = new Float64Array(n);
    const partialLeft = new Float64Array(n);
    const partialRight = new Float64Array(n);
    const scratch = new Float64Array(n);
    for (let p = 0; p < panels; p++) this.ensurePanel(p);
    const z0 = this.windowLeft;
    edge[0] = (this.edgeLogCdf[0] as number) + Math.log(this.source.valueJacobian(z0)) - Math.log(Math.abs(this.source.slope(z0)) + 1);
    for (let p = 0; p < panels; p++) {
      const half = ((this.edges[p + 1] as number) - (this.edges[p] as number)) / 2;
      for (let k = 0; k < n; k++) {
        integrand[k] = (this.nodeLogCdf[p * n + k] as number) + Math.log(this.source.valueJacobian(this.nodeZ[p * n + k] as number));
      }
      const total = inPanelPartials(integrand, 0, half, partialLeft, partialRight, scratch);
      for (let k = 0; k < n; k++) node[p * n + k] = logAddExp(edge[p] as number, partialLeft[k] as number);
      edge[p + 1] = logAddExp(edge[p] as number, total);
    }
    this.lowerMoment = { node, edge };
    return this.lowerMoment;
  }

  private leftTail(z: number): number {
    // log F beyond the left end: f/slope, the exponential-tail bound of a log-concave density.
    return Math.min(this.edgeLogCdf[0] as number, this.logDensityAt(z) - Math.log(Math.abs(this.source.slope(z))));
  }

  private rightTail(z: number): number {
    const last = this.panelCount;
    return Math.min(this.edgeLogSf[last] as number, this.logDensityAt(z) - Math.log(Math.abs(this.source.slope(z))));
  }

  /**
   * Interpolation of [edge[p], node[16p … 16p+15], edge[p+1]] at z in panel p, by the polynomial through
   * those 18 points in the first ("modified Lagrange") barycentric form p(t) = Σ_j y_j w_j Π_{m≠j}(t − t_m)
   * (Berrut & Trefethen 2004, §3; backward stable, Higham 2004), with the products Π_{m<j} and Π_{m>j}
   * from one forward and one backward sweep: no divisions, ~70 flops.
   */
  private interpolate(edge: Float64Array, node: Float64Array, p: number, z: number): number {
    const a = this.edges[p] as number;
    const b = this.edges[p + 1] as number;
    const t = (2 * z - a - b) / (b - a);
    const points = INTERPOLATION_POINTS;
    const weights = INTERPOLATION_WEIGHTS;
    const count = PANEL_ORDER + 2;
    const suffix = this.scratchSuffix;
    // suffix[j] = Π_{m ≥ j} (t − t_m); an exact hit returns the tabulated value.
    let product = 1;
    for (let j = count - 1; j >= 0; j--) {
      suffix[j] = product;
      const diff = t - (points[j] as number);
      if (diff === 0) return j === 0 ? (edge[p] as number) : j === count - 1 ? (edge[p + 1] as number) : (node[p * PANEL_ORDER + j - 1] as number);
      product *= diff;
    }
    // Here suffix[j] = Π_{m > j}; sweep forward with prefix = Π_{m < j}. The values are interpolated
    // relative to the panel's middle node, so the rounding error scales with their spread over the panel
    // (as in the second barycentric form, exact for constants) rather than with their size (log F ≈ −207
    // at F = 1e-90).
    const offset = p * PANEL_ORDER - 1;
    const middle = node[offset + PANEL_ORDER / 2] as number;
    const ref = Number.isFinite(middle) ? middle : 0;
    let prefix = t - (points[0] as number);
    let sum = (weights[0] as number) * ((edge[p] as number) - ref) * (suffix[0] as number);
    for (let j = 1; j < count - 1; j++) {
      sum += (weights[j] as number) * ((node[offset + j] as number) - ref) * prefix * (suffix[j] as number);
      prefix *= t - (points[j] as number);
    }
    sum += (weights[count - 1] as number) * ((edge[p + 1] as number) - ref) * prefix;
    return ref + sum;
  }

  /** Root of an increasing function inside [a, b]: Newton with derivative `slope`, kept in a bisection bracket. */
  private solveMonotone(f: (z: number) => number, slope: (z: number) => number, a: number, b: number): number {
    let lo = a;
    let hi = b;
    let flo = f(lo);
    let fhi = f(hi);
    if (flo >= 0) return lo;
    if (fhi <= 0) return hi;
    let z = (lo + hi) / 2;
    // Start from the linear interpolation of the residual.
    if (Number.isFinite(flo) && Number.isFinite(fhi)) z = lo - (flo * (hi - lo)) / (fhi - flo);
    for (let i = 0; i < 100; i++) {
      const fz = f(z);
      if (fz === 0) return z;
      if (fz < 0) {
        lo = z;
        flo = fz;
      } else {
        hi = z;
        fhi = fz;
      }
      const d = slope(z);
      let next = d > 0 && Number.isFinite(d) ? z - fz / d : NaN;
      if (!(next > lo && next < hi)) next = (lo + hi) / 2;
      if (Math.abs(next - z) <= Number.EPSILON * Math.abs(z) || Math.abs(fz) <= 1e-16) return next;
      if (hi - lo <= 2 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi))) return z;
      z = next;
    }
    return z;
  }
}

/** The panel's exponential trend: the nearest whole β to the slope of logValues in t ∈ [−1, 1]. */
function panelTrend(logValues: ArrayLike<number>, offset: number): number {
  const n = PANEL_ORDER;
  const { nodes } = TABLES;
  const first = logValues[offset] as number;
  const last = logValues[offset + n - 1] as number;
  if (!Number.isFinite(first) || !Number.isFinite(last)) return 0;
  const beta = Math.round((last - first) / ((nodes[n - 1] as number) - (nodes[0] as number)));
  return Math.max(-MAX_TREND, Math.min(MAX_TREND, beta));
}

/**
 * log ∫ over one panel of exp(v(t)), given v at the panel's 16 nodes (logValues[offset … offset+15]) and
 * the panel's half-width. The exponential trend β of v is taken out and the trend-weighted rule
 * ∫ ℓ_j(t) e^{βt} dt applied, which integrates poly(15)·e^{βt} exactly: accurate to ~1e-15 relative where
 * plain Gauss–Legendre would lose digits on a panel across which the integrand changes by e^{±20}.
 * Cost: 16 exp and one log. Returns −Infinity when every value is −Infinity.
 * @example panelLogIntegral(new Float64Array(16), 0, 1) //=> 0.6931471805599453 (log ∫_{−1}^{1} 1 dt = log 2)
 */
export function panelLogIntegral(logValues: ArrayLike<number>, offset: number, half: number): number {
  const n = PANEL_ORDER;
  let max = -Infinity;
  for (let j = 0; j < n; j++) {
    const v = logValues[offset + j] as number;
    if (v > max) max = v;
  }
  if (max === -Infinity) return -Infinity;
  const beta = panelTrend(logValues, offset);
  const { nodes } = TABLES;
  const w = TABLES.whole[beta + MAX_TREND] as Float64Array;
  let sum = 0;
  for (let j = 0; j < n; j++) {
    sum += (w[j] as number) * Math.exp((logValues[offset + j] as number) - max - beta * (nodes[j] as number));
  }
  return sum > 0 ? max + Math.log(half * sum) : -Infinity;
}

/**
 * log(e^edge + e^logScale · partial), given scale = e^{logScale − edge} (+Infinity when edge is −Infinity
 * or far below): the edge's log plus log1p of the ratio while that is at most 1, else the partial's log
 * plus log1p of the inverse ratio; the edge alone when the partial is 0.
 */
function addPartial(edge: number, scale: number, logScale: number, partial: number): number {
  if (!(partial > 0)) return edge;
  const ratio = partial * scale;
  if (ratio <= 1) return edge + Math.log1p(ratio);
  return logScale + Math.log(partial) + Math.log1p(1 / ratio);
}

/**
 * The linear form of {@link inPanelPartials}: the partial integrals from the panel's left edge to each
 * node (out `left`) and from each node to its right edge (out `right`) as multiples of e^{returned
 * value}, with the same trend-weighted matrices; returns −Infinity (and zeros) when every value is −Infinity.
 */
function inPanelSums(
  logValues: ArrayLike<number>,
  offset: number,
  half: number,
  left: Float64Array,
  right: Float64Array,
  scratch: Float64Array,
): number {
  const n = PANEL_ORDER;
  const { nodes } = TABLES;
  let max = -Infinity;
  for (let j = 0; j < n; j++) {
    const v = logValues[offset + j] as number;
    if (v > max) max = v;
  }
  if (max === -Infinity) {
    left.fill(0);
    right.fill(0);
    return -Infinity;
  }
  const beta = panelTrend(logValues, offset);
  const h = scratch;
  for (let j = 0; j < n; j++) h[j] = Math.exp((logValues[offset + j] as number) - max - beta * (nodes[j] as number));
  const lm = TABLES.left[beta + MAX_TREND] as Float64Array;
  const rm = TABLES.right[beta + MAX_TREND] as Float64Array;
  for (let k = 0; k < n; k++) {
    let sl = 0;
    let sr = 0;
    for (let j = 0; j < n; j++) {
      const hj = h[j] as number;
      sl += (lm[n * k + j] as number) * hj;
      sr += (rm[n * k + j] as number) * hj;
    }
    left[k] = sl;
    right[k] = sr;
  }
  return max + Math.log(half);
}

/**
 * Partial integrals of exp(logValues) over one panel, from its left edge to each node (out `left`) and
 * from each node to its right edge (out `right`), as logs; returns the log of the whole panel's integral.
 * The panel's exponential trend β is removed and the trend-weighted integration matrices applied, so
 * each partial is accurate relative to itself.
 */
function inPanelPartials(
  logValues: ArrayLike<number>,
  offset: number,
  half: number,
  left: Float64Array,
  right: Float64Array,
  scratch: Float64Array,
): number {
  const n = PANEL_ORDER;
  const { nodes } = TABLES;
  let max = -Infinity;
  for (let j = 0; j < n; j++) {
    const v = logValues[offset + j] as number;
    if (v > max) max = v;
  }
  if (max === -Infinity) {
    left.fill(-Infinity);
    right.fill(-Infinity);
    return -Infinity;
  }
  const beta = panelTrend(logValues, offset);
  const h = scratch;
  for (let j = 0; j < n; j++) h[j] = Math.exp((logValues[offset + j] as number) - max - beta * (nodes[j] as number));
  const lm = TABLES.left[beta + MAX_TREND] as Float64Array;
  const rm = TABLES.right[beta + MAX_TREND] as Float64Array;
  const wm = TABLES.whole[beta + MAX_TREND] as Float64Array;
  const logScale = max + Math.log(half);
  let total = 0;
  for (let k = 0; k < n; k++) {
    let sl = 0;
    let sr = 0;
    for (let j = 0; j < n; j++) {
      const hj = h[j] as number;
      sl += (lm[n * k + j] as number) * hj;
      sr += (rm[n * k + j] as number) * hj;
    }
    total += (wm[k] as number) * (h[k] as number);
    left[k] = sl > 0 ? logScale + Math.log(sl) : -Infinity;
    right[k] = sr > 0 ? logScale + Math.log(sr) : -Infinity;
  }
  return total > 0 ? logScale + Math.log(total) : -Infinity;
}

/**
 * Tabulates a log-concave working density: finds the window where logDensity ≥ −230 (by Newton from the
 * mode), steps panels of width min(2/√curvature, 24/|slope|) across it, puts 16 Gauss–Legendre nodes on
 * each (composite Gauss–Legendre quadrature; Davis & Rabinowitz, "Methods of Numerical Integration",
 * 2nd ed., §2.7), normalises numerically and accumulates log F from the left and log(1 − F) from the right.
 *
 * Cost: ~100–300 panels × 16 density evaluations (a few hundred microseconds at most).
 * Throws StatsError('not_available') if the density cannot be tabulated (NaN, no finite window).
 * @example tabulate(betaWorkingDensity(8, 10), { coordinate: 'logit' }).cdf(0.5) //=> 0.685470581054688 (R pbeta)
 */
export function tabulate(density: WorkingDensity, options?: TabulationOptions): TabulatedDistribution {
  return new TabulatedDistribution(density, options);
}

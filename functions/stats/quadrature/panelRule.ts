/**
 * The panel rule every tabulation uses: 16 Gauss–Legendre nodes on each panel, mapped from [−1, 1], and
 * the fixed tables built from them once at load (read only afterwards):
 *  - the nodes, their weights and the logs of the weights;
 *  - the trend-weighted integration matrices of panelIntegral.ts (∫ ℓ_j(t) e^{βt} dt over [−1, t_k],
 *    [t_k, 1] and [−1, 1] for whole trends β = −16 … 16, ℓ_j the Lagrange basis through the nodes);
 *  - the 18 interpolation points −1, t_0 … t_15, +1 with their barycentric weights, and
 *    {@link interpolateOnPanel}, the interpolation through a panel's two edges and 16 nodes.
 */
import { gaussLegendre } from '../numeric';

/** Gauss–Legendre points per panel. */
export const PANEL_ORDER = 16;

/** Largest |trend| (in units of the panel's half-width) removed before the in-panel integration. */
export const MAX_TREND = 16;

/** Points of the auxiliary rule used once to build the in-panel integration matrices. */
const AUX_ORDER = 48;

/** The fixed tables, computed once at load from the Gauss–Legendre rule (read only). */
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

/** One point of the auxiliary rule: position s, weight w and the 16 Lagrange basis values ℓ_j(s). */
interface Sample {
  readonly s: number;
  readonly w: number;
  readonly l: Float64Array;
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
  const leftSamples: Sample[][] = [];
  const rightSamples: Sample[][] = [];
  for (let k = 0; k < n; k++) {
    const tk = nodes[k] as number;
    const sampleOn = (a: number, b: number): Sample[] => {
      const half = (b - a) / 2;
      const mid = (a + b) / 2;
      const list: Sample[] = [];
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
    const list: Sample[] = [];
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

/** The 16 Gauss–Legendre nodes on [−1, 1] that every panel uses, ascending (read only). */
export const PANEL_NODES: readonly number[] = TABLES.nodes;

/** log of the 16 Gauss–Legendre weights (read only). */
export const PANEL_LOG_WEIGHTS: readonly number[] = TABLES.weights.map((w) => Math.log(w));

/**
 * The trend-weighted matrices of PanelTables, indexed by β + MAX_TREND for whole trends |β| ≤ MAX_TREND
 * (read only): TREND_LEFT[i][16k + j] = ∫_{−1}^{t_k} ℓ_j(t) e^{βt} dt, TREND_RIGHT[i][16k + j] =
 * ∫_{t_k}^{1} ℓ_j(t) e^{βt} dt and TREND_WHOLE[i][j] = ∫_{−1}^{1} ℓ_j(t) e^{βt} dt.
 */
export const TREND_LEFT: readonly Float64Array[] = TABLES.left;
export const TREND_RIGHT: readonly Float64Array[] = TABLES.right;
export const TREND_WHOLE: readonly Float64Array[] = TABLES.whole;

/** The 18 interpolation points −1, t_0 … t_15, +1 and their barycentric weights, as typed arrays. */
const INTERPOLATION_POINTS: Float64Array = Float64Array.from(TABLES.points);
const INTERPOLATION_WEIGHTS: Float64Array = Float64Array.from(TABLES.barycentric);

/**
 * Interpolation of [edge[p], node[16p … 16p+15], edge[p+1]] at z in panel p (edges[p] ≤ z ≤ edges[p+1]),
 * by the polynomial through those 18 points in the first ("modified Lagrange") barycentric form
 * p(t) = Σ_j y_j w_j Π_{m≠j}(t − t_m) (Berrut & Trefethen, "Barycentric Lagrange interpolation", SIAM
 * Review 2004, §3; backward stable, Higham 2004), with the products Π_{m<j} and Π_{m>j} from one forward
 * and one backward sweep: no divisions, ~70 flops. `scratch` (18 entries) is working space whose contents
 * never outlive the call.
 * @example
 * const [edges, edgeValues, nodeValues] = [Float64Array.of(0, 2), Float64Array.of(1, 5), new Float64Array(16).fill(3)];
 * interpolateOnPanel(edges, edgeValues, nodeValues, 0, 2, new Float64Array(18)) //=> 5 (the right edge's value)
 */
export function interpolateOnPanel(
  edges: Float64Array,
  edge: Float64Array,
  node: Float64Array,
  p: number,
  z: number,
  scratch: Float64Array,
): number {
  const a = edges[p] as number;
  const b = edges[p + 1] as number;
  const t = (2 * z - a - b) / (b - a);
  const points = INTERPOLATION_POINTS;
  const weights = INTERPOLATION_WEIGHTS;
  const count = PANEL_ORDER + 2;
  const suffix = scratch;
  // suffix[j] = Π_{m ≥ j} (t − t_m); an exact hit returns the tabulated value.
  let product = 1;
  for (let j = count - 1; j >= 0; j--) {
    suffix[j] = product;
    const diff = t - (points[j] as number);
    if (diff === 0) {
      if (j === 0) return edge[p] as number;
      return j === count - 1 ? (edge[p + 1] as number) : (node[p * PANEL_ORDER + j - 1] as number);
    }
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

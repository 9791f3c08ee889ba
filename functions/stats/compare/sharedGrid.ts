/**
 * The grid shared by three or more posteriors in one working coordinate (losses.ts sharedGridLosses,
 * ranking.ts's shared P(highest)): the union of their panel edges, cut where the gaps are long and merged
 * into pieces no wider than the narrowest panel of any posterior there, so one set of nodes resolves every
 * posterior at once and each cdf is read once per node for all the integrals.
 */
import { StatsError } from '../errors';
import type { TabulatedDistribution } from '../quadrature';

/** Widest sub-panel (in the working coordinate) of the shared grid. */
const GAP_WIDTH = 1;

/** Within this distance (in the working coordinate) of an anchor (see anchorsOf) pieces are GAP_WIDTH wide. */
const GRADED_FROM = 64;

/**
 * Most cells (pieces × posteriors) of the shared grid: its three tables of that many doubles stay within
 * ~25 MB. Inside the documented domain a grid has a few thousand pieces at most (the panels of the
 * posteriors near their bulk, ~130 pieces near the anchors, ~5 per e-fold of length beyond), so this
 * bound is only met by inputs far outside it; then the calculation stops with a clear error.
 */
export const MAX_GRID_CELLS = 1_000_000;

/**
 * The anchors of the shared grid on [lo, hi]: its ends and the point nearest z = 0. The Jacobian dx/dz of
 * every working coordinate (logit: largest at 0; log rate: at the right end; scaled asinh: at the ends,
 * with the posteriors' centre at 0) is largest at one of them and changes by a factor of at most e per
 * unit of z, so a piece d away from every anchor carries dx/dz below e^-d of its largest value.
 */
function anchorsOf(lo: number, hi: number): number[] {
  return [lo, hi, Math.min(hi, Math.max(lo, 0))];
}

/**
 * The widest piece allowed at z for the Jacobian's sake: GAP_WIDTH within GRADED_FROM of an anchor, a
 * quarter of the distance d to the nearest anchor beyond. 16 nodes integrate e^z to ~1e-15 on a piece
 * up to 16 wide, and a wider piece lies over 64 from every anchor, where dx/dz is below e^-60 of its
 * largest value, so its error cannot show. (Inside the posteriors' windows the narrowest panel also
 * limits a piece: narrowestPanels.) The count of pieces grows with the logarithm of the length: a prior
 * shape of 1e-12 gives a window ~2e14 long in logit, covered by ~300 pieces instead of 2e14.
 */
function jacobianWidth(anchors: readonly number[], z: number): number {
  let d = Infinity;
  for (const c of anchors) d = Math.min(d, Math.abs(z - c));
  return d <= GRADED_FROM ? GAP_WIDTH : d / 4;
}

/**
 * The union of the posteriors' panel edges, ascending, with longer intervals cut into pieces: into equal
 * ones of at most GAP_WIDTH up to GRADED_FROM long (there F = 1 below and 0 above, or smooth, and the
 * integrand is dx/dz times it, whose complex singularities lie π from the axis in logit), beyond that at
 * most jacobianWidth wide (graded: logarithmically many). Throws StatsError('not_available') beyond
 * MAX_GRID_CELLS.
 */
function unionOfEdges(
  ds: readonly TabulatedDistribution[],
  maxGridCells: number,
): { union: number[]; anchors: number[] } {
  const all: number[] = [];
  for (const d of ds) for (let e = 0; e < d.edges.length; e++) all.push(d.edges[e] as number);
  all.sort((u, v) => u - v);
  const anchors = anchorsOf(all[0] as number, all[all.length - 1] as number);
  const union: number[] = [];
  for (const e of all) {
    const last = union[union.length - 1];
    if (last === undefined) union.push(e);
    else if (e - last > 1e-12 * Math.max(1, Math.abs(e))) {
      if (e - last <= GRADED_FROM) {
        const parts = Math.ceil((e - last) / GAP_WIDTH);
        for (let j = 1; j < parts; j++) union.push(last + ((e - last) * j) / parts);
      } else {
        let z = last;
        for (;;) {
          // The width allowed over the whole step (jacobianWidth changes by at most 1/4 per unit of z).
          let w = jacobianWidth(anchors, z);
          for (let pass = 0; pass < 8; pass++) w = Math.min(w, jacobianWidth(anchors, z + w));
          if (z + w >= e - GAP_WIDTH / 2) break;
          z += w;
          union.push(z);
          if (union.length * ds.length > maxGridCells) throw gridTooLarge(ds.length, maxGridCells);
        }
      }
      union.push(e);
      if (union.length * ds.length > maxGridCells) throw gridTooLarge(ds.length, maxGridCells);
    }
  }
  return { union, anchors };
}

/** The error of a shared grid over its budget (not reached inside the documented domain). */
function gridTooLarge(k: number, maxGridCells: number): StatsError {
  return new StatsError(
    'not_available',
    `the expected losses of these ${k} variants need a finer comparison grid than one calculation may use ` +
      `(over ${maxGridCells} cells); compare fewer variants at once`,
  );
}

/**
 * The edges of the shared grid: neighbouring pieces of the union of edges merged while the merged piece
 * stays no wider than the narrowest panel of any posterior at its ends and middle (each table's
 * interpolant is smooth across its own panel edges to ~1e-15, so a piece may straddle one; the integrand
 * is then resolved as finely as the narrowest posterior).
 */
export function sharedPieces(ds: readonly TabulatedDistribution[], maxGridCells: number): number[] {
  const { union, anchors } = unionOfEdges(ds, maxGridCells);
  const { atPoint, inInterval } = narrowestPanels(ds, union);
  // The narrowest panel there (or the Jacobian's limit) at a union point (by index) and at a point between
  // two (its interval found by bisection).
  const widthAtPoint = (i: number): number =>
    Math.min(jacobianWidth(anchors, union[i] as number), atPoint[i] as number);
  const widthBetween = (lo: number, hi: number, z: number): number => {
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if ((union[mid] as number) <= z) lo = mid;
      else hi = mid;
    }
    const width = (union[lo] as number) === z ? (atPoint[lo] as number) : (inInterval[lo] as number);
    return Math.min(jacobianWidth(anchors, z), width);
  };
  const edges: number[] = [union[0] as number];
  let start = 0;
  let next = 1;
  while (next < union.length) {
    const a = union[start] as number;
    let m = next;
    const limitAtA = widthAtPoint(start);
    while (m + 1 < union.length) {
      const e = union[m + 1] as number;
      if (e - a > limitAtA || e - a > Math.min(widthAtPoint(m + 1), widthBetween(start, m + 1, (a + e) / 2))) break;
      m += 1;
    }
    start = m;
    edges.push(union[m] as number);
    next = m + 1;
  }
  return edges;
}

/**
 * The width of the narrowest panel, over the posteriors whose window holds it, at each union point
 * (atPoint[i]; sharedPieces adds the Jacobian's limit, jacobianWidth) and inside each interval between two
 * (inInterval[i], read at its middle: no panel edge lies strictly inside an interval, so the same panels
 * hold all of it). One walk over each posterior's panels: O(union × k) instead of a search per point.
 */
function narrowestPanels(
  ds: readonly TabulatedDistribution[],
  union: readonly number[],
): { atPoint: Float64Array; inInterval: Float64Array } {
  const m = union.length;
  const atPoint = new Float64Array(m).fill(Infinity);
  const inInterval = new Float64Array(m).fill(Infinity);
  for (const d of ds) {
    const left = d.windowLeft;
    const right = d.windowRight;
    const last = d.panelCount - 1;
    let lo = 0;
    let hi = m;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if ((union[mid] as number) < left) lo = mid + 1;
      else hi = mid;
    }
    let p = 0;
    for (let i = lo; i < m; i++) {
      const z = union[i] as number;
      if (z > right) break;
      while (p < last && (d.edges[p + 1] as number) <= z) p++;
      const w = (d.edges[p + 1] as number) - (d.edges[p] as number);
      if (w < (atPoint[i] as number)) atPoint[i] = w;
      const after = union[i + 1];
      if (after !== undefined && after <= right) {
        const middle = (z + after) / 2;
        let q = p;
        while (q < last && (d.edges[q + 1] as number) <= middle) q++;
        const wm = (d.edges[q + 1] as number) - (d.edges[q] as number);
        if (wm < (inInterval[i] as number)) inInterval[i] = wm;
      }
    }
  }
  return { atPoint, inInterval };
}

/**
 * Upper bounds of log F and log(1 − F) of every posterior at every edge of a shared grid, from the tables'
 * panel edges alone (no interpolation, so no panel's node tables are built for them): log F from the panel
 * edge at or right of the grid's edge, log(1 − F) from the one at or left of it; below a window log F is
 * at most its value at the window's left edge (and log(1 − F) at most 0), above it the other way round.
 * Returned as cdf[e·k + j] and sf[e·k + j]. Cost: O(edges × k) plus one walk over each table's panels.
 */
export function tailBoundsAtEdges(
  ds: readonly TabulatedDistribution[],
  edges: ArrayLike<number>,
): { cdf: Float64Array; sf: Float64Array } {
  const k = ds.length;
  const cdf = new Float64Array(edges.length * k);
  const sf = new Float64Array(edges.length * k);
  for (let j = 0; j < k; j++) {
    const d = ds[j] as TabulatedDistribution;
    const left = d.windowLeft;
    const right = d.windowRight;
    const last = d.panelCount - 1;
    let p = 0;
    for (let e = 0; e < edges.length; e++) {
      const z = edges[e] as number;
      let c = 0;
      let s = 0;
      if (z <= left) c = d.edgeLogCdf[0] as number;
      else if (z >= right) s = d.edgeLogSf[last + 1] as number;
      else {
        while (p < last && (d.edges[p + 1] as number) <= z) p++;
        const onEdge = (d.edges[p] as number) === z;
        c = onEdge ? (d.edgeLogCdf[p] as number) : (d.edgeLogCdf[p + 1] as number);
        s = d.edgeLogSf[p] as number;
      }
      cdf[e * k + j] = c;
      sf[e * k + j] = s;
    }
  }
  return { cdf, sf };
}

/** log 1e-18: from the first panel edge where 1 − F falls below this, F is 1 to double precision. */
const ONE_LOG_TAIL = Math.log(1e-18);

/**
 * The working value from which F is 1 to double precision: the first panel edge where log(1 − F) is
 * below log 1e-18 (+Infinity when there is none). The per-variant integrals leave such a factor out the
 * same way (integrate.ts).
 */
export function cdfOneFrom(d: TabulatedDistribution): number {
  for (let e = 0; e < d.edges.length; e++) if ((d.edgeLogSf[e] as number) < ONE_LOG_TAIL) return d.edges[e] as number;
  return Infinity;
}

/**
 * P(each is highest) of three or more posteriors on one grid for all of them: at each node log F_j of every
 * posterior that is not 1 there is read once, and each variant's integrand f_i Π_{j≠i} F_j takes the product
 * of the others from prefix and suffix sums of those logs (never a total minus one term, so an exact zero
 * needs no care). The work is O(k × nodes) instead of the O(k² × nodes) of integrating each variant on its
 * own panels against k − 1 factors (ranking.ts). Two ways in: posteriors sharing one working coordinate
 * (sharedHighestIntegrals, the grid of sharedGrid.ts), or posteriors each in its own coordinate read through
 * a coordinate w common to all (mappedHighestIntegrals, the grid of mappedPieces).
 */
import { StatsError } from '../errors';
import { logAddExp } from '../numeric';
import { PANEL_NODES, PANEL_ORDER, panelLogIntegral } from '../quadrature';
import type { TabulatedDistribution } from '../quadrature';
import { PRUNE } from './integrate';
import { MAX_GRID_CELLS, cdfOneFrom, sharedPieces, tailBoundsAtEdges } from './sharedGrid';

/**
 * Below this log an integrand's piece cannot show: e^-745 is below the smallest double, so a piece whose
 * bound lies e^-46 lower still (as the pruning) is left out even while a running total is smaller.
 */
const LOG_FLOOR = -745 - PRUNE;

/** A piece whose factors change a lot is split into ⌈√(1 + active)/SPLIT_SCALE⌉ parts (as integrate.ts). */
const SPLIT_SCALE = 3.2;

/** A factor counts as changing on a piece when its log F moves by more than this across it (as integrate.ts). */
const ACTIVE_CHANGE = 0.01;

/**
 * A posterior's own working coordinate z seen from a coordinate w common to several posteriors (both
 * increasing functions of the value): mappedHighestIntegrals reads each table through it.
 */
export interface CoordinateMap {
  /** The own coordinate z at w (increasing). */
  toOwn(w: number): number;
  /** Its inverse: w at z. */
  fromOwn(z: number): number;
  /** log dz/dw at w, given z = toOwn(w). */
  logSlope(w: number, z: number): number;
  /**
   * A function of w that every map of one comparison shares (the same function in each), computed once per
   * node for all the tables: toOwn(w) is ownFromInner(inner(w)), bit for bit, wherever the grid reaches.
   */
  inner(w: number): number;
  /** The own coordinate from inner(w). */
  ownFromInner(v: number): number;
}

/**
 * Reads every table's own coordinate at the n points, sharing inner(w) across the tables: own[j·n + q] for the
 * tables listed in `which` (the others' rows are left as they are). Cost: n inner values and n maps per table.
 */
export function mapNodes(
  maps: readonly CoordinateMap[],
  which: readonly number[],
  points: Float64Array,
  inner: Float64Array,
  own: Float64Array,
): void {
  const n = points.length;
  const first = maps[0] as CoordinateMap;
  for (let q = 0; q < n; q++) inner[q] = first.inner(points[q] as number);
  for (const j of which) {
    const map = maps[j] as CoordinateMap;
    for (let q = 0; q < n; q++) own[j * n + q] = map.ownFromInner(inner[q] as number);
  }
}

/**
 * The raw integrals ∫ f_i Π_{j≠i} F_j dz (before normalising) of posteriors sharing one working
 * coordinate, on the shared grid. Four steps:
 *  1. the grid (sharedPieces) and, at each of its edges, an upper bound of every log F from the tables'
 *     panel edges (tailBoundsAtEdges);
 *  2. each piece's bound for variant i: the mass of i's panels the piece overlaps times the
 *     others' F at the right edge; a factor is left out of a piece from the point where it is 1 to double
 *     precision on (as the per-variant integrals do);
 *  3. the pieces by decreasing priority (the largest bound − best over the variants);
 *  4. the integrals: a piece is integrated (split in parts when many factors change on it) for the
 *     variants whose bound lies within e^-46 of their running total and whose window it touches; a
 *     bound below e^-791 is left out (LOG_FLOOR: it cannot show in a double).
 * A table listed twice (the same object) is integrated once and both get the identical value.
 * Cost: O(edges × k) for the bounds, then per integrated piece 16 × (factors not 1 there + variants in need)
 * interpolations or density values and O(k) sums per node. Throws StatsError('not_available') when the
 * grid would exceed MAX_GRID_CELLS (outside the documented domain; ranking.ts then integrates per variant).
 */
export function sharedHighestIntegrals(ds: readonly TabulatedDistribution[], maxGridCells = MAX_GRID_CELLS): number[] {
  const edges = sharedPieces(ds, maxGridCells);
  const own = Float64Array.from(edges);
  return gridIntegrals(
    ds,
    edges,
    ds.map(() => own),
    undefined,
  );
}

/**
 * The same raw integrals ∫ f_i Π_{j≠i} F_j of posteriors each tabulated in its own coordinate z_i, on one
 * grid in a coordinate w common to all (maps[i] reads z_i at w): the Normal model's t posteriors, whose
 * heavy tails do not fit one shared coordinate (normalMeans.ts). Each table is read at z_i(w) and its
 * density in w is g_i(z_i(w))·dz_i/dw. The grid (mappedPieces) keeps every piece's image in every z_j
 * within one unit and within the narrowest panel of z_j there, so each integrand is smooth on its pieces
 * (see mappedPieces); the bounds, order and integrals are then those of sharedHighestIntegrals, the
 * tables' values at the pieces' edges and nodes read through the maps.
 * Cost: O(pieces × k) map evaluations and bounds, then per integrated piece 16 × (factors not 1 there +
 * variants in need) maps and interpolations; pieces ≤ maxGridCells / k. Throws
 * StatsError('not_available') when the grid would exceed that (the caller then integrates per variant).
 */
export function mappedHighestIntegrals(
  ds: readonly TabulatedDistribution[],
  maps: readonly CoordinateMap[],
  maxGridCells = MAX_GRID_CELLS,
): number[] {
  const edges = mappedPieces(ds, maps, maxGridCells);
  return gridIntegrals(ds, edges, ownEdges(ds, maps, edges), maps);
}

/**
 * The grid's edges in each table's own coordinate: mapped inside the table's window (and at the first edge
 * beyond each end), ∓Number.MAX_VALUE further out, where every use of them (the tails' bounds at the window's
 * ends, whether F is 1 from there on (cdfOneFrom: an edge of the window, or +Infinity), no mass of the table)
 * reads the same as from the mapped value. Cost: one map evaluation per edge inside a window.
 */
export function ownEdges(
  ds: readonly TabulatedDistribution[],
  maps: readonly CoordinateMap[],
  edges: readonly number[],
): Float64Array[] {
  return ds.map((d, j) => {
    const map = maps[j] as CoordinateMap;
    const lo = map.fromOwn(d.windowLeft);
    const hi = map.fromOwn(d.windowRight);
    const own = new Float64Array(edges.length);
    for (let e = 0; e < edges.length; e++) {
      const w = edges[e] as number;
      const before = e + 1 < edges.length && (edges[e + 1] as number) < lo;
      const after = e > 0 && (edges[e - 1] as number) > hi;
      own[e] = before ? -Number.MAX_VALUE : after ? Number.MAX_VALUE : map.toOwn(w);
    }
    return own;
  });
}

/** Widest piece of the mapped grid, in w and in each posterior's own coordinate (as GAP_WIDTH of sharedGrid.ts). */
const MAPPED_WIDTH = 1;

/**
 * The edges (in w) of the grid shared by posteriors in their own coordinates: from the leftmost window end
 * to the rightmost, each step the largest that keeps the piece within MAPPED_WIDTH in w and, for every
 * posterior whose window it lies in, its image in z_j within MAPPED_WIDTH and within the width of the panel
 * of z_j at its left end; every window end is an edge. Why this resolves the integrand: z_j(w) is analytic
 * with its nearest singularity about 1/(dz_j/dw) from a real w (for the t posteriors, where
 * centre + scale·sinh z_j is complex: z_j = asinh(a + b sinh w) at a + b sinh w = ±i), so a piece whose
 * image is at most one unit wide lies at least its own width from it (Bernstein ellipse ρ ≥ 2 + √5, the
 * 16-point rule's error ~ρ^-32 ≈ 1e-20), and within one panel's width the table's interpolant is as good as
 * at its own nodes. Outside its window a posterior's F is 0 or 1 to the window's tail mass (~e^-200) and
 * constrains nothing. Cost: O(k) per piece; at most maxGridCells / k pieces (else StatsError('not_available')).
 */
export function mappedPieces(
  ds: readonly TabulatedDistribution[],
  maps: readonly CoordinateMap[],
  maxGridCells: number,
): number[] {
  const k = ds.length;
  const lo = ds.map((d, j) => (maps[j] as CoordinateMap).fromOwn(d.windowLeft));
  const hi = ds.map((d, j) => (maps[j] as CoordinateMap).fromOwn(d.windowRight));
  const cuts = [...lo, ...hi].sort((u, v) => u - v);
  let w = cuts[0] as number;
  const end = cuts[cuts.length - 1] as number;
  if (!(Number.isFinite(w) && Number.isFinite(end) && end > w)) throw mappedGridFailed(k);
  const edges: number[] = [w];
  const panel = new Int32Array(k);
  let c = 0;
  while (w < end) {
    while (c < cuts.length && (cuts[c] as number) <= w) c++;
    let next = Math.min(w + MAPPED_WIDTH, c < cuts.length ? (cuts[c] as number) : end);
    for (let j = 0; j < k; j++) {
      if (!((lo[j] as number) <= w && w < (hi[j] as number))) continue;
      const d = ds[j] as TabulatedDistribution;
      const map = maps[j] as CoordinateMap;
      const z = map.toOwn(w);
      let p = panel[j] as number;
      while (p < d.panelCount - 1 && (d.edges[p + 1] as number) <= z) p++;
      panel[j] = p;
      const h = Math.min(MAPPED_WIDTH, (d.edges[p + 1] as number) - (d.edges[p] as number));
      next = Math.min(next, map.fromOwn(z + h));
    }
    // A step lost to rounding (a posterior too narrow for w's doubles) cannot be resolved on this grid.
    if (!(next > w)) throw mappedGridFailed(k);
    edges.push(next);
    w = next;
    if (edges.length * k > maxGridCells) throw mappedGridFailed(k);
  }
  return edges;
}

/** The mapped grid could not be laid within its budget (the callers fall back to the per-variant integrals). */
function mappedGridFailed(k: number): StatsError {
  return new StatsError(
    'not_available',
    `these ${k} variants need a finer comparison grid than one calculation may use`,
  );
}

/**
 * Steps 2–4 of sharedHighestIntegrals on a grid with edges `edges` (in the common coordinate) that are
 * own[j] in table j's coordinate; `maps` reads the tables at the nodes (undefined: the tables share the
 * grid's coordinate and are read directly, bit for bit as before the mapped grid existed).
 */
function gridIntegrals(
  ds: readonly TabulatedDistribution[],
  edges: readonly number[],
  own: readonly Float64Array[],
  maps: readonly CoordinateMap[] | undefined,
): number[] {
  const k = ds.length;
  const n = PANEL_ORDER;
  const pieces = edges.length - 1;
  const one = ds.map(cdfOneFrom);
  // The first index of each distinct table: only those are integrated.
  const firstOf = ds.map((d) => ds.indexOf(d));

  // 1. Upper bounds of log F at the edges (tailBoundsAtEdges; in one pass when the tables share the grid's
  // coordinate), 0 from the point where F is 1; oneAt[e·k + j] = 1 from there on.
  const edgeCdf = maps === undefined ? tailBoundsAtEdges(ds, edges).cdf : new Float64Array(edges.length * k);
  const oneAt = new Uint8Array(edges.length * k);
  for (let j = 0; j < k; j++) {
    const at = own[j] as Float64Array;
    const column = maps === undefined ? undefined : tailBoundsAtEdges([ds[j] as TabulatedDistribution], at).cdf;
    for (let e = 0; e < edges.length; e++) {
      if ((at[e] as number) >= (one[j] as number)) {
        edgeCdf[e * k + j] = 0;
        oneAt[e * k + j] = 1;
      } else if (column !== undefined) edgeCdf[e * k + j] = column[e] as number;
    }
  }

  // 2. Piece bounds: bound[s·k + i] (−Infinity where i is not integrated on s). First, per piece, the sum of
  // log F at its right edge over the factors not 1 on it, the −Infinity ones counted apart.
  const finite = new Float64Array(pieces);
  const zeros = new Int32Array(pieces);
  for (let s = 0; s < pieces; s++) {
    let sum = 0;
    let count = 0;
    for (let j = 0; j < k; j++) {
      if (oneAt[s * k + j] === 1) continue;
      const v = edgeCdf[(s + 1) * k + j] as number;
      if (v === -Infinity) count += 1;
      else sum += v;
    }
    finite[s] = sum;
    zeros[s] = count;
  }
  const bound = new Float64Array(pieces * k).fill(-Infinity);
  const best = new Float64Array(k).fill(-Infinity);
  for (let i = 0; i < k; i++) {
    if (firstOf[i] !== i) continue;
    const d = ds[i] as TabulatedDistribution;
    const at = own[i] as Float64Array;
    const left = d.windowLeft;
    const right = d.windowRight;
    const last = d.panelCount - 1;
    // The mass of i's panels that piece [a, b] overlaps, the panels found by walking (the pieces ascend).
    let pa = 0;
    let pb = 0;
    // The first piece reaching into i's window (at ascends).
    let first = 0;
    for (let hiS = pieces; first < hiS;) {
      const mid = (first + hiS) >> 1;
      if ((at[mid + 1] as number) <= left) first = mid + 1;
      else hiS = mid;
    }
    for (let s = first; s < pieces; s++) {
      const a = at[s] as number;
      const b = at[s + 1] as number;
      if (b <= left) continue;
      if (a >= right) break;
      let others = finite[s] as number;
      let otherZeros = zeros[s] as number;
      if (oneAt[s * k + i] !== 1) {
        const mine = edgeCdf[(s + 1) * k + i] as number;
        if (mine === -Infinity) otherZeros -= 1;
        else others -= mine;
      }
      if (otherZeros > 0) continue;
      while (pa < last && (d.edges[pa + 1] as number) <= a) pa++;
      while (pb < last && (d.edges[pb + 1] as number) < b) pb++;
      let mass = -Infinity;
      for (let p = pa; p <= pb; p++) mass = logAddExp(mass, d.panelLogMass[p] as number);
      const v = mass + Math.min(0, others);
      if (!(v >= LOG_FLOOR)) continue;
      bound[s * k + i] = v;
      if (v > (best[i] as number)) best[i] = v;
    }
  }

  // 3. The visiting order.
  const priority = new Float64Array(pieces);
  for (let s = 0; s < pieces; s++) {
    let most = -Infinity;
    for (let i = 0; i < k; i++) most = Math.max(most, (bound[s * k + i] as number) - (best[i] as number));
    priority[s] = most;
  }
  const order = Array.from({ length: pieces }, (_, s) => s);
  order.sort((u, v) => (priority[v] as number) - (priority[u] as number) || u - v);

  // 4. The integrals.
  const totals = new Array<number>(k).fill(-Infinity);
  const need: number[] = [];
  const factors: number[] = [];
  const position = new Int32Array(k);
  const logF = new Float64Array(k * n);
  const rows = Array.from({ length: k }, (_, f) => logF.subarray(f * n, f * n + n));
  const values = new Float64Array(k * n);
  const points = new Float64Array(n);
  const inner = new Float64Array(n);
  const mapped = new Float64Array(k * n);
  const both: number[] = [];
  const inNeed = new Uint8Array(k);
  const prefix = new Float64Array(k + 1);
  const suffix = new Float64Array(k + 1);
  for (const s of order) {
    if ((priority[s] as number) === -Infinity) break;
    need.length = 0;
    for (let i = 0; i < k; i++) {
      const v = bound[s * k + i] as number;
      if (v !== -Infinity && v >= (totals[i] as number) - PRUNE) need.push(i);
    }
    if (need.length === 0) continue;
    const a = edges[s] as number;
    const b = edges[s + 1] as number;
    factors.length = 0;
    let active = 0;
    for (let j = 0; j < k; j++) {
      position[j] = -1;
      if (oneAt[s * k + j] === 1) continue;
      position[j] = factors.length;
      factors.push(j);
      const change = (edgeCdf[(s + 1) * k + j] as number) - (edgeCdf[s * k + j] as number);
      if (!(change <= ACTIVE_CHANGE)) active += 1;
    }
    const parts = Math.ceil(Math.sqrt(1 + active) / SPLIT_SCALE);
    const half = (b - a) / (2 * parts);
    for (let part = 0; part < parts; part++) {
      const mid = a + (2 * part + 1) * half;
      for (let q = 0; q < n; q++) points[q] = mid + half * (PANEL_NODES[q] as number);
      const m = factors.length;
      if (maps !== undefined) {
        both.length = 0;
        for (const i of need) inNeed[i] = 1;
        for (let j = 0; j < k; j++) if ((position[j] as number) >= 0 || inNeed[j] === 1) both.push(j);
        for (const i of need) inNeed[i] = 0;
        mapNodes(maps, both, points, inner, mapped);
      }
      for (let f = 0; f < m; f++) {
        const row = rows[f] as Float64Array;
        row.fill(0);
        const j = factors[f] as number;
        const at = maps === undefined ? points : mapped.subarray(j * n, j * n + n);
        (ds[j] as TabulatedDistribution).addLogTailsAt(at, 0, n, row, false);
      }
      for (const i of need) {
        const d = ds[i] as TabulatedDistribution;
        const map = maps === undefined ? undefined : (maps[i] as CoordinateMap);
        for (let q = 0; q < n; q++) {
          const w = points[q] as number;
          if (map === undefined) values[i * n + q] = d.logDensityAt(w);
          else {
            const z = mapped[i * n + q] as number;
            values[i * n + q] = d.logDensityAt(z) + map.logSlope(w, z);
          }
        }
      }
      for (let q = 0; q < n; q++) {
        prefix[0] = 0;
        for (let f = 0; f < m; f++) prefix[f + 1] = (prefix[f] as number) + (logF[f * n + q] as number);
        suffix[m] = 0;
        for (let f = m - 1; f >= 0; f--) suffix[f] = (suffix[f + 1] as number) + (logF[f * n + q] as number);
        for (const i of need) {
          const at = position[i] as number;
          const others = at < 0 ? (prefix[m] as number) : (prefix[at] as number) + (suffix[at + 1] as number);
          values[i * n + q] = (values[i * n + q] as number) + others;
        }
      }
      for (const i of need) totals[i] = logAddExp(totals[i] as number, panelLogIntegral(values, i * n, half));
    }
  }
  return ds.map((_, i) => Math.exp(totals[firstOf[i] as number] as number));
}

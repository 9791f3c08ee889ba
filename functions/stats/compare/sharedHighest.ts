/**
 * P(each is highest) of three or more posteriors sharing one working coordinate, on one grid for all of
 * them (sharedGrid.ts): at each node log F_j of every posterior that is not 1 there is read once, and each
 * variant's integrand f_i Π_{j≠i} F_j takes the product of the others from prefix and suffix sums of those
 * logs (never a total minus one term, so an exact zero needs no care). The work is O(k × nodes) instead of
 * the O(k² × nodes) of integrating each variant on its own panels against k − 1 factors (ranking.ts).
 */
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
  const k = ds.length;
  const n = PANEL_ORDER;
  const edges = sharedPieces(ds, maxGridCells);
  const pieces = edges.length - 1;
  const one = ds.map(cdfOneFrom);
  // The first index of each distinct table: only those are integrated.
  const firstOf = ds.map((d) => ds.indexOf(d));

  // 1. Upper bounds of log F at the edges (tailBoundsAtEdges), 0 from the point where F is 1.
  const edgeCdf = tailBoundsAtEdges(ds, edges).cdf;
  for (let j = 0; j < k; j++) {
    for (let e = 0; e < edges.length; e++) if ((edges[e] as number) >= (one[j] as number)) edgeCdf[e * k + j] = 0;
  }

  // 2. Piece bounds: bound[s·k + i] (−Infinity where i is not integrated on s). First, per piece, the sum of
  // log F at its right edge over the factors not 1 on it, the −Infinity ones counted apart.
  const finite = new Float64Array(pieces);
  const zeros = new Int32Array(pieces);
  for (let s = 0; s < pieces; s++) {
    const a = edges[s] as number;
    let sum = 0;
    let count = 0;
    for (let j = 0; j < k; j++) {
      if (a >= (one[j] as number)) continue;
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
    const left = d.windowLeft;
    const right = d.windowRight;
    const last = d.panelCount - 1;
    // The mass of i's panels that piece [a, b] overlaps, the panels found by walking (the pieces ascend).
    let pa = 0;
    let pb = 0;
    for (let s = 0; s < pieces; s++) {
      const a = edges[s] as number;
      const b = edges[s + 1] as number;
      if (b <= left) continue;
      if (a >= right) break;
      let others = finite[s] as number;
      let otherZeros = zeros[s] as number;
      if (a < (one[i] as number)) {
        const own = edgeCdf[(s + 1) * k + i] as number;
        if (own === -Infinity) otherZeros -= 1;
        else others -= own;
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
      if (a >= (one[j] as number)) continue;
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
      for (let f = 0; f < m; f++) {
        const row = rows[f] as Float64Array;
        row.fill(0);
        (ds[factors[f] as number] as TabulatedDistribution).addLogTailsAt(points, 0, n, row, false);
      }
      for (const i of need) {
        const d = ds[i] as TabulatedDistribution;
        for (let q = 0; q < n; q++) values[i * n + q] = d.logDensityAt(points[q] as number);
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

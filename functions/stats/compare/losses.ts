/**
 * Expected losses: loss_i = E[max_j X_j − X_i] = ∫ F_i (1 − Π_{j≠i} F_j) dx for each posterior, by the
 * pruned integrals of integrate.ts (two posteriors, or posteriors in different coordinates) or on one
 * grid shared by all of them (sharedGridLosses, three or more in one coordinate).
 */
import { StatsError } from '../errors';
import { logAddExp } from '../numeric';
import { PANEL_NODES, PANEL_ORDER, panelLogIntegral } from '../quadrature';
import type { TabulatedDistribution } from '../quadrature';
import { factor } from './factors';
import type { Factor } from './factors';
import { PRUNE, checkList, logIntegral } from './integrate';
import { MAX_GRID_CELLS, cdfOneFrom, sharedPieces, tailBoundsAtEdges } from './sharedGrid';
import { mapNodes, mappedPieces, ownEdges } from './sharedHighest';
import type { CoordinateMap } from './sharedHighest';

/** The value and dx/dw of a grid's coordinate w (a table's own source when the tables share it). */
export interface ValueFrame {
  toValue(w: number): number;
  valueJacobian(w: number): number;
}

/** The grid's edges read in each table's own coordinate, and the maps that read its nodes (none: shared). */
interface GridReading {
  readonly own: readonly Float64Array[];
  readonly maps: readonly CoordinateMap[] | undefined;
  readonly frame: ValueFrame;
}

/** The indices 0 … k − 1. */
function allOf(k: number): number[] {
  return Array.from({ length: k }, (_, j) => j);
}

/**
 * Expected loss of choosing each variant: loss_i = E[max_j X_j − X_i] = ∫ F_i (1 − Π_{j≠i} F_j) dx.
 * Method: written as Σ_{j≠i} ∫ f_j(y) Π_{l≠i,j} F_l(y) G_i(y) dy, with G_i(y) = E[(y − X_i)^+] the integrated
 * cdf tabulated beside F (TabulatedDistribution.logLowerMomentAt), so every term is a positive integral
 * against a density: no 1 − (near 1) and no difference of means, and a loss of 1e-30 is accurate
 * relative to itself. The identity loss_i − loss_j = mean_j − mean_i holds to quadrature accuracy (~1e-15).
 * For three or more posteriors sharing a working coordinate the same integral is taken directly as
 * ∫ F_i (1 − Π_{j≠i} F_j) dx on the union of their panels (see sharedGridLosses), O(k²) interpolations.
 * Cost: O(k² × nodes) (shared coordinate); in separate coordinates O(k² × nodes kept) for the top mean's loss
 * and as much again for each loss below 1e-3 of the means' size (O(k³) when all are); the shared grid holds at most
 * `maxGridCells` pieces × posteriors (default MAX_GRID_CELLS; tests lower it to reach the error).
 * Throws StatsError('invalid_argument') for an empty list, StatsError('not_available') when the shared
 * grid would exceed its budget.
 * @example
 * expectedLosses([tabulate(betaWorkingDensity(4, 8)), tabulate(betaWorkingDensity(6, 6))])
 * //=> [0.18772154170592…, 0.02105487503926…] (Stucchio 2015's closed form; their difference is 1/6 = 6/12 − 4/12)
 */
export function expectedLosses(ds: readonly TabulatedDistribution[], maxGridCells = MAX_GRID_CELLS): number[] {
  checkList(ds);
  if (ds.length === 1) return [0];
  const coordinate = (ds[0] as TabulatedDistribution).coordinate;
  // Three or more posteriors in one coordinate: the O(k²) shared grid (measured 230 ms for 50 variants
  // against 3.8 s); for two, the two pruned integrals below are cheaper.
  if (ds.length >= 3 && coordinate !== undefined && ds.every((d) => d.coordinate === coordinate)) {
    return sharedGridLosses(ds, maxGridCells);
  }
  // Posteriors in different coordinates: each loss is O(k²) integrals of O(nodes), so all of them O(k³).
  // With exact means, loss_i = loss_top + (mean_top − mean_i) for the highest mean (two non-negative terms,
  // no cancellation): the top one's loss is integrated once and a loss at least DIFFERENCE_FROM of the two
  // means' size is taken from it (the rounding of the means' difference, ~2e-16 of that size, then stays
  // below ~1e-12 of the loss); the others, close to the top, are integrated directly. O(k²) when few are close.
  const means = ds.map((d) => d.source.exactMean);
  let top = -1;
  means.forEach((m, i) => {
    if (m !== undefined && (top < 0 || m > (means[top] as number))) top = i;
  });
  if (top < 0 || means.some((m) => m === undefined)) return ds.map((_, i) => directLoss(ds, i));
  const topMean = means[top] as number;
  const topLoss = directLoss(ds, top);
  return ds.map((_, i) => {
    if (i === top) return topLoss;
    const mean = means[i] as number;
    const loss = topLoss + (topMean - mean);
    return loss >= DIFFERENCE_FROM * Math.max(Math.abs(topMean), Math.abs(mean)) ? loss : directLoss(ds, i);
  });
}

/** loss_i = Σ_{j≠i} ∫ f_j Π_{l≠i,j} F_l G_i by the pruned integrals of integrate.ts: O(k²) integrals. */
function directLoss(ds: readonly TabulatedDistribution[], i: number): number {
  const di = ds[i] as TabulatedDistribution;
  let total = -Infinity;
  ds.forEach((dj, j) => {
    if (j === i) return;
    const factors: Factor[] = [factor(di, 'lowerMoment')];
    ds.forEach((dl, l) => {
      if (l !== i && l !== j) factors.push(factor(dl, 'cdf'));
    });
    total = logAddExp(total, logIntegral(dj, factors));
  });
  return Math.exp(total);
}

/**
 * Expected losses of posteriors sharing one working coordinate, in O(k²) instead of O(k³): on one grid
 * for all of them, at each node log F_j for every j once, then for each i the integrand
 * F_i · (1 − Π_{j≠i} F_j) · dx/dz with 1 − Π F_j = −expm1(Σ_{j≠i} log F_j) (log F_j is accurate relative to
 * 1 − F_j near 1, so no 1 − (near 1) is formed) and the sums Σ_{j≠i} from prefix and suffix sums (never a
 * total minus one term). Four steps:
 *  1. sharedPieces: the union of the posteriors' panel edges, merged into pieces no wider than the
 *     narrowest panel there;
 *  2. pieceBounds: each piece's upper bound F_i(right) · Σ_{j≠i} (1 − F_j(left)) · Δx for each variant, the
 *     tails bounded from the tables' panel edges (sharedGrid.ts tailBoundsAtEdges);
 *  3. visitOrder: the pieces by decreasing bound (relative to each variant's largest);
 *  4. integratePieces: the integrals, a piece skipped for variant i when its bound lies e^-46 below i's
 *     running total (as in logIntegral), the others' product formed only where it is not negligible.
 */
function sharedGridLosses(ds: readonly TabulatedDistribution[], maxGridCells: number): number[] {
  const edges = sharedPieces(ds, maxGridCells);
  const own = Float64Array.from(edges);
  const tails = tailBoundsAtEdges(ds, edges);
  const reading = { own: ds.map(() => own), maps: undefined, frame: (ds[0] as TabulatedDistribution).source };
  return gridLosses(ds, edges, tails.cdf, tails.sf, reading);
}

/**
 * The expected losses of posteriors each tabulated in its own coordinate, on one grid in a coordinate w
 * common to all (maps[i] reads table i's coordinate at w; frame gives the value and dx/dw at w): the grid of
 * sharedHighest.ts mappedPieces, then the four steps of sharedGridLosses with every table read through its
 * map. O(k × nodes) instead of the O(k²)–O(k³) pruned integrals (the Normal model's t posteriors whose heavy
 * tails do not fit one shared coordinate, normalMeans.ts). Throws StatsError('invalid_argument') for an empty
 * list or maps of another length, StatsError('not_available') when the grid would exceed maxGridCells.
 */
export function mappedExpectedLosses(
  ds: readonly TabulatedDistribution[],
  maps: readonly CoordinateMap[],
  frame: ValueFrame,
  maxGridCells = MAX_GRID_CELLS,
): number[] {
  checkList(ds);
  if (maps.length !== ds.length) {
    throw new StatsError('invalid_argument', `${maps.length} coordinate maps for ${ds.length} posteriors`);
  }
  if (ds.length === 1) return [0];
  const edges = mappedPieces(ds, maps, maxGridCells);
  const k = ds.length;
  const own = ownEdges(ds, maps, edges);
  const cdf = new Float64Array(edges.length * k);
  const sf = new Float64Array(edges.length * k);
  ds.forEach((d, j) => {
    const column = tailBoundsAtEdges([d], own[j] as Float64Array);
    for (let e = 0; e < edges.length; e++) {
      cdf[e * k + j] = column.cdf[e] as number;
      sf[e * k + j] = column.sf[e] as number;
    }
  });
  return gridLosses(ds, edges, cdf, sf, { own, maps, frame });
}

/** Steps 2–4 of sharedGridLosses on a grid read through `reading` (the tails' bounds at its edges given). */
function gridLosses(
  ds: readonly TabulatedDistribution[],
  edges: readonly number[],
  edgeCdf: Float64Array,
  edgeSf: Float64Array,
  reading: GridReading,
): number[] {
  const k = ds.length;
  const tails = { cdf: edgeCdf, sf: edgeSf };
  const { bound, best } = pieceBounds(edges, tails.cdf, tails.sf, k, reading.frame);
  // The losses far from 0 as E[max] − mean_i (when every mean is exact), the others integrated.
  const byDifference = new Array<number | undefined>(k).fill(undefined);
  if (ds.every((d) => d.source.exactMean !== undefined)) {
    const { value, scale } = expectedMaximum(ds, edges, tails.cdf, reading);
    ds.forEach((d, i) => {
      const loss = value - d.mean;
      if (loss >= DIFFERENCE_FROM * scale) byDifference[i] = loss;
    });
  }
  const pieces = edges.length - 1;
  byDifference.forEach((v, i) => {
    if (v === undefined) return;
    for (let s = 0; s < pieces; s++) bound[s * k + i] = -Infinity;
    best[i] = 0;
  });
  const order = visitOrder(bound, best, pieces, k);
  const totals = integratePieces(ds, edges, bound, tails.cdf, order, reading);
  return totals.map((t, i) => byDifference[i] ?? Math.exp(t));
}

/**
 * A loss at least this fraction of the values' scale is taken as E[max] − mean_i: the rounding of that
 * difference (~1e-16 of the scale, E[max] summed with compensation) then stays below ~1e-12 of the loss.
 */
const DIFFERENCE_FROM = 1e-3;

/**
 * E[max_j X_j] = x_L + ∫_{x_L} (1 − Π_j F_j) dx on the shared grid (x_L its left end, where every F is
 * below its window's tail mass, ~e^-200), and the scale of the values (the largest of |x_L|, |E[max]| and
 * the |means|). A piece on which some F lies below e^-40 has 1 − Π F = 1 exactly (PRODUCT_NEGLIGIBLE) and adds
 * its width; a piece on which every F is 1 to double precision (cdfOneFrom) adds nothing (below k·1e-18 of its
 * width); the rest are integrated on 16 nodes with the F that are not 1 there. Summed with Neumaier's
 * compensation. Cost: O(pieces × k) checks, interpolations only near the top of the posteriors.
 */
function expectedMaximum(
  ds: readonly TabulatedDistribution[],
  edges: readonly number[],
  edgeCdf: Float64Array,
  reading: GridReading,
): { value: number; scale: number } {
  const k = ds.length;
  const n = PANEL_ORDER;
  const src = reading.frame;
  const one = ds.map(cdfOneFrom);
  const own = reading.own;
  const inner = new Float64Array(n);
  const mapped = new Float64Array(k * n);
  const every = allOf(k);
  const points = new Float64Array(n);
  const sums = new Float64Array(n);
  const values = new Float64Array(n);
  let sum = 0;
  let compensation = 0;
  const add = (v: number): void => {
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  };
  for (let s = 0; s + 1 < edges.length; s++) {
    const a = edges[s] as number;
    const b = edges[s + 1] as number;
    let negligible = false;
    let changing = false;
    for (let j = 0; j < k; j++) {
      if ((edgeCdf[(s + 1) * k + j] as number) <= PRODUCT_NEGLIGIBLE) negligible = true;
      if (((own[j] as Float64Array)[s] as number) < (one[j] as number)) changing = true;
    }
    if (negligible) {
      add(src.toValue(b) - src.toValue(a));
      continue;
    }
    if (!changing) continue;
    const half = (b - a) / 2;
    const mid = (a + b) / 2;
    for (let q = 0; q < n; q++) {
      points[q] = mid + half * (PANEL_NODES[q] as number);
      sums[q] = 0;
    }
    if (reading.maps !== undefined) mapNodes(reading.maps, every, points, inner, mapped);
    for (let j = 0; j < k; j++) {
      if (((own[j] as Float64Array)[s] as number) >= (one[j] as number)) continue;
      const at = reading.maps === undefined ? points : mapped.subarray(j * n, j * n + n);
      (ds[j] as TabulatedDistribution).addLogTailsAt(at, 0, n, sums, false);
    }
    for (let q = 0; q < n; q++) {
      const total = sums[q] as number;
      const above = total === 0 ? -Infinity : Math.log(-Math.expm1(total));
      values[q] = above + Math.log(src.valueJacobian(points[q] as number));
    }
    add(Math.exp(panelLogIntegral(values, 0, half)));
  }
  const left = src.toValue(edges[0] as number);
  const value = left + (sum + compensation);
  let scale = Math.max(Math.abs(left), Math.abs(value));
  for (const d of ds) scale = Math.max(scale, Math.abs(d.mean));
  return { value, scale };
}

/**
 * For each piece s and variant i, the log of the bound F_i(right) · Σ_{j≠i} (1 − F_j(left)) · Δx (in value
 * units, the tails' upper bounds at the edges from tailBoundsAtEdges; +Infinity where it is NaN, so such a piece is never skipped), bound[s·k + i], and each
 * variant's largest bound, best[i].
 */
function pieceBounds(
  edges: readonly number[],
  edgeCdf: Float64Array,
  edgeSf: Float64Array,
  k: number,
  src: ValueFrame,
): { bound: Float64Array; best: Float64Array } {
  const pieces = edges.length - 1;
  const edgeOthersSf = new Float64Array(edges.length * k);
  const logSf = new Float64Array(k);
  const sumScratch = new Float64Array(k + 1);
  for (let e = 0; e < edges.length; e++) {
    for (let j = 0; j < k; j++) logSf[j] = edgeSf[e * k + j] as number;
    logSumOfOthers(logSf, edgeOthersSf, e * k, sumScratch);
  }
  const bound = new Float64Array(pieces * k);
  const best = new Float64Array(k).fill(-Infinity);
  for (let s = 0; s < pieces; s++) {
    const width = Math.log(src.toValue(edges[s + 1] as number) - src.toValue(edges[s] as number));
    for (let i = 0; i < k; i++) {
      const b = (edgeCdf[(s + 1) * k + i] as number) + (edgeOthersSf[s * k + i] as number) + width;
      const v = Number.isNaN(b) ? Infinity : b;
      bound[s * k + i] = v;
      if (v > (best[i] as number)) best[i] = v;
    }
  }
  return { bound, best };
}

/**
 * out[offset + i] = log Σ_{j≠i} e^{values[j]} for every i, from prefix and suffix sums of e^{values[j] − top}
 * (never a total minus one term). `values` is overwritten (with the scaled exponentials); `suffix`
 * (length + 1 entries) is working space.
 */
function logSumOfOthers(values: Float64Array, out: Float64Array, offset: number, suffix: Float64Array): void {
  const k = values.length;
  let top = -Infinity;
  for (let j = 0; j < k; j++) if ((values[j] as number) > top) top = values[j] as number;
  for (let j = 0; j < k; j++) values[j] = top === -Infinity ? 0 : Math.exp((values[j] as number) - top);
  suffix[k] = 0;
  for (let j = k - 1; j >= 0; j--) suffix[j] = (suffix[j + 1] as number) + (values[j] as number);
  let prefix = 0;
  for (let i = 0; i < k; i++) {
    const sum = prefix + (suffix[i + 1] as number);
    out[offset + i] = sum > 0 ? top + Math.log(sum) : -Infinity;
    prefix += values[i] as number;
  }
}

/** The pieces by decreasing priority: the largest of bound − best over the variants (ties by index). */
function visitOrder(bound: Float64Array, best: Float64Array, pieces: number, k: number): number[] {
  const priority = new Float64Array(pieces);
  for (let s = 0; s < pieces; s++) {
    let most = -Infinity;
    for (let i = 0; i < k; i++) most = Math.max(most, (bound[s * k + i] as number) - (best[i] as number));
    priority[s] = most;
  }
  const order = Array.from({ length: pieces }, (_, s) => s);
  order.sort((u, v) => (priority[v] as number) - (priority[u] as number) || u - v);
  return order;
}

/**
 * Below this log of a product of cdfs, 1 − Π F is exactly 1 in double precision: expm1 returns −1 for
 * arguments below −56·ln 2 ≈ −38.8 (fdlibm's expm1, which JavaScript engines follow), so log(−expm1) is 0.
 */
const PRODUCT_NEGLIGIBLE = -40;

/**
 * log ∫ F_i (1 − Π_{j≠i} F_j) dx for every variant i over the pieces in `order`: at each piece's 16 nodes
 * log F_j of every posterior once, then per variant still in need the integrand and its panel integral.
 * Where two posteriors' F lie below e^-40 on the whole piece (their bound at its right edge, edgeCdf), every
 * product of the others holds one of them, so 1 − Π_{j≠i} F_j is exactly 1 (PRODUCT_NEGLIGIBLE) and only the
 * needed variants' own F are read; where one does, only that variant needs the others' product. The values
 * are the same, bit for bit, as from the full product.
 */
function integratePieces(
  ds: readonly TabulatedDistribution[],
  edges: readonly number[],
  bound: Float64Array,
  edgeCdf: Float64Array,
  order: readonly number[],
  reading: GridReading,
): number[] {
  const k = ds.length;
  const n = PANEL_ORDER;
  const src = reading.frame;
  const inner = new Float64Array(n);
  const mapped = new Float64Array(k * n);
  const which: number[] = [];
  const totals = new Array<number>(k).fill(-Infinity);
  const need = new Uint8Array(k);
  const logF = new Float64Array(k * n);
  const rows = Array.from({ length: k }, (_, j) => logF.subarray(j * n, j * n + n));
  const values = new Float64Array(k * n);
  const prefix = new Float64Array(k + 1);
  const suffix = new Float64Array(k + 1);
  const logJacobian = new Float64Array(n);
  const points = new Float64Array(n);
  for (const s of order) {
    let any = false;
    for (let i = 0; i < k; i++) {
      const b = bound[s * k + i] as number;
      need[i] = b !== -Infinity && b >= (totals[i] as number) - PRUNE ? 1 : 0;
      if (need[i] === 1) any = true;
    }
    if (!any) continue;
    const a = edges[s] as number;
    const b = edges[s + 1] as number;
    const half = (b - a) / 2;
    const mid = (a + b) / 2;
    // The posteriors whose F is negligible in every product on this piece.
    let negligible = 0;
    let lone = -1;
    for (let j = 0; j < k; j++) {
      if ((edgeCdf[(s + 1) * k + j] as number) <= PRODUCT_NEGLIGIBLE) {
        negligible += 1;
        lone = j;
      }
    }
    // Whether the others' product is needed at all: for the lone negligible one when it is in need, or with none.
    const full = negligible === 0 || (negligible === 1 && need[lone] === 1);
    for (let q = 0; q < n; q++) {
      const z = mid + half * (PANEL_NODES[q] as number);
      points[q] = z;
      logJacobian[q] = Math.log(src.valueJacobian(z));
    }
    if (reading.maps !== undefined) {
      which.length = 0;
      for (let j = 0; j < k; j++) if (full || need[j] === 1) which.push(j);
      mapNodes(reading.maps, which, points, inner, mapped);
    }
    for (let j = 0; j < k; j++) {
      if (!full && need[j] === 0) continue;
      const row = rows[j] as Float64Array;
      const d = ds[j] as TabulatedDistribution;
      if (reading.maps === undefined) for (let q = 0; q < n; q++) row[q] = d.logCdfAt(points[q] as number);
      else for (let q = 0; q < n; q++) row[q] = d.logCdfAt(mapped[j * n + q] as number);
    }
    for (let q = 0; q < n; q++) {
      if (full) {
        // Σ_{j≠i} log F_j from prefix and suffix sums; 1 − Π_{j≠i} F_j = −expm1 of it.
        prefix[0] = 0;
        for (let j = 0; j < k; j++) prefix[j + 1] = (prefix[j] as number) + (logF[j * n + q] as number);
        suffix[k] = 0;
        for (let j = k - 1; j >= 0; j--) suffix[j] = (suffix[j + 1] as number) + (logF[j * n + q] as number);
      }
      for (let i = 0; i < k; i++) {
        if (need[i] === 0) continue;
        let above = 0;
        if (negligible === 0 || (negligible === 1 && i === lone)) {
          const others = (prefix[i] as number) + (suffix[i + 1] as number);
          above = others === 0 ? -Infinity : Math.log(-Math.expm1(others));
        }
        values[i * n + q] = (logF[i * n + q] as number) + above + (logJacobian[q] as number);
      }
    }
    for (let i = 0; i < k; i++) {
      if (need[i] === 1) totals[i] = logAddExp(totals[i] as number, panelLogIntegral(values, i * n, half));
    }
  }
  return totals;
}

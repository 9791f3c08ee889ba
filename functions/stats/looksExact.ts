/**
 * The exact chance that a test looked at several times declares a winner: a dynamic programme over both
 * variants' conversion counts (x_A, x_B) from look to look, with the read-out's own decision at every
 * lattice point (decisionLattice.ts). Used by looks.ts while its work is within budget (small tests).
 *
 * State after look k: the probability of every (x_A, x_B) reached without a declaration so far. Between
 * looks each count grows by an independent Binomial(Δn, p) increment (a convolution along each axis);
 * at the look, the points where P(B beats A) ≥ threshold (and, two-sided, P(A beats B) ≥ threshold) are
 * declared: their mass is added to the answer and removed. Counts whose binomial pmf is below 1e-12 of
 * its peak are left out (beyond ~7.4 standard deviations: a mass below 1e-10 over 100 looks), otherwise the
 * sum is exact to rounding.
 */
import { type BinomialWindow, binomialWindow, DecisionCursor } from './decisionLattice';
import type { BetaPrior } from './types';

/** What one look of the programme needs, computed once and reused for any threshold. */
export interface LookLattice {
  readonly n: number;
  /** Window of x_A (and x_B) at this look: the unconditional binomial pmf of the look. */
  readonly windowA: BinomialWindow;
  readonly windowB: BinomialWindow;
  /** P(B beats A) on the window rectangle, row x_A, column x_B: probability[(xA − loA)·width + (xB − loB)]. */
  readonly probability: Float64Array;
  /** Count increments since the previous look (absent at the first look). */
  readonly stepA?: BinomialWindow;
  readonly stepB?: BinomialWindow;
}

/** The programme's windows keep counts whose pmf is at least this fraction of the peak. */
const DP_CUTOFF = 1e-12;
const WINDOW_WIDTH_PER_SD = 14.9; // a 1e-12-of-peak window spans about ±7.4 standard deviations

/** Length of a binomial window, estimated without computing it (for work budgets). */
export function estimatedWindow(n: number, p: number): number {
  return Math.min(n + 1, Math.ceil(WINDOW_WIDTH_PER_SD * Math.sqrt(n * p * (1 - p)) + 3));
}

/**
 * Estimated operations of one run of the programme (multiply-adds of the convolutions) and of building
 * the lattices (steps of the decision walk), for looks at `looks` visitors with rates pA and pB.
 * Cost: O(K).
 */
export function exactWork(looks: readonly number[], pA: number, pB: number): { perRun: number; setup: number } {
  let perRun = 0;
  let setup = 0;
  let prevA = 0;
  let prevB = 0;
  let prevN = 0;
  for (const n of looks) {
    const wA = estimatedWindow(n, pA);
    const wB = estimatedWindow(n, pB);
    if (prevN > 0) {
      const dn = n - prevN;
      perRun += prevA * prevB * estimatedWindow(dn, pB) + prevA * estimatedWindow(dn, pA) * wB;
    }
    // Each row is walked from its diagonal: across B's window, plus the gap between the two windows.
    setup += wA * (wB + Math.abs(n * (pB - pA)));
    prevA = wA;
    prevB = wB;
    prevN = n;
  }
  return { perRun, setup };
}

/**
 * P(B beats A) on the rectangle windowA × windowB of a look: each row walked from its diagonal, where
 * P = ½ exactly. Cost: O(rows·(columns + distance of the diagonal from the window)).
 */
function decisionTable(n: number, windowA: BinomialWindow, windowB: BinomialWindow, prior: BetaPrior): Float64Array {
  const width = windowB.hi - windowB.lo + 1;
  const table = new Float64Array((windowA.hi - windowA.lo + 1) * width);
  for (let xA = windowA.lo; xA <= windowA.hi; xA++) {
    const row = (xA - windowA.lo) * width;
    if (xA <= windowB.hi) {
      const up = new DecisionCursor(n, prior, xA);
      if (xA >= windowB.lo) table[row + xA - windowB.lo] = up.probability;
      while (up.xB < windowB.hi) {
        up.upB();
        if (up.xB >= windowB.lo) table[row + up.xB - windowB.lo] = up.probability;
      }
    }
    if (xA >= windowB.lo) {
      const down = new DecisionCursor(n, prior, xA);
      if (xA <= windowB.hi) table[row + xA - windowB.lo] = down.probability;
      while (down.xB > windowB.lo) {
        down.downB();
        if (down.xB <= windowB.hi) table[row + down.xB - windowB.lo] = down.probability;
      }
    }
  }
  return table;
}

/** The lattices of every look for rates pA (control) and pB (challenger). Cost: the `setup` of {@link exactWork}. */
export function lookLattices(looks: readonly number[], pA: number, pB: number, prior: BetaPrior): LookLattice[] {
  const out: LookLattice[] = [];
  let prev = 0;
  for (const n of looks) {
    const windowA = binomialWindow(n, pA, DP_CUTOFF);
    const windowB = pB === pA ? windowA : binomialWindow(n, pB, DP_CUTOFF);
    const probability = decisionTable(n, windowA, windowB, prior);
    if (prev === 0) out.push({ n, windowA, windowB, probability });
    else {
      const stepA = binomialWindow(n - prev, pA, DP_CUTOFF);
      const stepB = pB === pA ? stepA : binomialWindow(n - prev, pB, DP_CUTOFF);
      out.push({ n, windowA, windowB, probability, stepA, stepB });
    }
    prev = n;
  }
  return out;
}

/** First column of a row whose P(B beats A) is ≥ threshold (width when none). */
function firstAtLeast(table: Float64Array, row: number, width: number, threshold: number): number {
  let lo = 0;
  let hi = width;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((table[row + mid] as number) >= threshold) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** Last column of a row whose P(B beats A) is ≤ level (−1 when none). */
function lastAtMost(table: Float64Array, row: number, width: number, level: number): number {
  let lo = 0;
  let hi = width;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((table[row + mid] as number) > level) hi = mid;
    else lo = mid + 1;
  }
  return lo - 1;
}

/**
 * What a run leaves behind for the next one at another threshold: per look, its declaring columns and the
 * undeclared mass after it. A run whose first k looks declare at the same lattice points starts from the
 * stored state after look k (nearby thresholds usually differ only at a few looks).
 */
export interface CrossingMemo {
  sides?: 1 | 2;
  cuts: Int32Array[];
  lows: Int32Array[];
  states: Float64Array[];
  firsts: Int32Array[];
  lasts: Int32Array[];
  byLook: number[];
}

/** An empty memo for {@link exactCrossing}. */
export function crossingMemo(): CrossingMemo {
  return { cuts: [], lows: [], states: [], firsts: [], lasts: [], byLook: [] };
}

function sameColumns(a: Int32Array | undefined, b: Int32Array): boolean {
  if (a === undefined || a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * The exact probability that some look declares a winner: the challenger when P(B beats A) ≥ threshold,
 * and with two sides also the control when P(A beats B) = 1 − P(B beats A) ≥ threshold. Also the
 * probability of a first declaration at each look. With a `memo`, the looks before the first one whose
 * declaring points differ from the memo's are not recomputed (and the memo is updated).
 * Cost: up to the `perRun` of {@link exactWork} multiply-adds.
 */
export function exactCrossing(
  lattices: readonly LookLattice[],
  threshold: number,
  sides: 1 | 2,
  memo?: CrossingMemo,
): { probability: number; byLook: number[] } {
  // The declaring columns of every row at every look for this threshold: binary searches only.
  const cuts: Int32Array[] = [];
  const lows: Int32Array[] = [];
  for (const look of lattices) {
    const rows = look.windowA.hi - look.windowA.lo + 1;
    const width = look.windowB.hi - look.windowB.lo + 1;
    const cut = new Int32Array(rows);
    const low = new Int32Array(rows).fill(-1);
    for (let i = 0; i < rows; i++) {
      cut[i] = firstAtLeast(look.probability, i * width, width, threshold);
      if (sides === 2) low[i] = lastAtMost(look.probability, i * width, width, 1 - threshold);
    }
    cuts.push(cut);
    lows.push(low);
  }
  let start = 0;
  if (memo !== undefined && memo.sides === sides) {
    while (
      start < lattices.length &&
      sameColumns(memo.cuts[start], cuts[start] as Int32Array) &&
      sameColumns(memo.lows[start], lows[start] as Int32Array)
    ) {
      start++;
    }
  }
  const byLook: number[] = memo !== undefined && start > 0 ? memo.byLook.slice(0, start) : [];
  let state: Float64Array =
    start > 0 ? ((memo as CrossingMemo).states[start - 1] as Float64Array) : new Float64Array(0);
  let first: Int32Array = start > 0 ? ((memo as CrossingMemo).firsts[start - 1] as Int32Array) : new Int32Array(0);
  let last: Int32Array = start > 0 ? ((memo as CrossingMemo).lasts[start - 1] as Int32Array) : new Int32Array(0);
  for (let k = start; k < lattices.length; k++) {
    const look = lattices[k] as LookLattice;
    const { windowA, windowB } = look;
    const rows = windowA.hi - windowA.lo + 1;
    const width = windowB.hi - windowB.lo + 1;
    let next: Float64Array;
    if (k === 0) {
      next = new Float64Array(rows * width);
      for (let i = 0; i < rows; i++) {
        const a = windowA.pmf[i] as number;
        for (let j = 0; j < width; j++) next[i * width + j] = a * (windowB.pmf[j] as number);
      }
    } else {
      next = propagate(state, first, last, lattices[k - 1] as LookLattice, look);
    }
    // Declarations at this look.
    let declared = 0;
    first = new Int32Array(rows);
    last = new Int32Array(rows);
    const cut = cuts[k] as Int32Array;
    const low = lows[k] as Int32Array;
    for (let i = 0; i < rows; i++) {
      const row = i * width;
      for (let j = cut[i] as number; j < width; j++) {
        declared += next[row + j] as number;
        next[row + j] = 0;
      }
      for (let j = 0; j <= (low[i] as number); j++) {
        declared += next[row + j] as number;
        next[row + j] = 0;
      }
      first[i] = (low[i] as number) + 1;
      last[i] = (cut[i] as number) - 1;
    }
    byLook.push(declared);
    state = next;
    if (memo !== undefined) {
      memo.states[k] = next;
      memo.firsts[k] = first;
      memo.lasts[k] = last;
    }
  }
  if (memo !== undefined) {
    memo.sides = sides;
    memo.cuts = cuts;
    memo.lows = lows;
    memo.byLook = byLook.slice();
    memo.states.length = lattices.length;
  }
  let total = 0;
  for (const p of byLook) total += p;
  return { probability: Math.min(Math.max(total, 0), 1), byLook };
}

/**
 * States below this probability are not carried to the next look: at most ~1e6 states, so at most 1e-14
 * of probability is dropped per look (the corners of the windows hold ~1e-24 each).
 */
const NEGLIGIBLE_STATE = 1e-20;

/** Moves the undeclared mass of look `from` to look `to`: convolution along x_B, then along x_A. */
function propagate(
  state: Float64Array,
  first: Int32Array,
  last: Int32Array,
  from: LookLattice,
  to: LookLattice,
): Float64Array {
  const stepA = to.stepA as BinomialWindow;
  const stepB = to.stepB as BinomialWindow;
  const rowsFrom = from.windowA.hi - from.windowA.lo + 1;
  const widthFrom = from.windowB.hi - from.windowB.lo + 1;
  const rowsTo = to.windowA.hi - to.windowA.lo + 1;
  const widthTo = to.windowB.hi - to.windowB.lo + 1;
  const kB = stepB.pmf;
  const kA = stepA.pmf;
  const lenB = kB.length;
  const lenA = kA.length;
  // Along x_B: column j of the old window moves to column j + shiftB + m of the new one.
  const shiftB = from.windowB.lo - to.windowB.lo + stepB.lo;
  const middle = new Float64Array(rowsFrom * widthTo);
  const rowFirst = new Int32Array(rowsFrom).fill(widthTo);
  const rowLast = new Int32Array(rowsFrom).fill(-1);
  for (let i = 0; i < rowsFrom; i++) {
    const src = i * widthFrom;
    const dst = i * widthTo;
    for (let j = first[i] as number; j <= (last[i] as number); j++) {
      const v = state[src + j] as number;
      if (v < NEGLIGIBLE_STATE) continue;
      const base = j + shiftB;
      const m0 = Math.max(0, -base);
      const m1 = Math.min(lenB - 1, widthTo - 1 - base);
      if (m0 > m1) continue;
      for (let m = m0; m <= m1; m++)
        middle[dst + base + m] = (middle[dst + base + m] as number) + v * (kB[m] as number);
      if (base + m0 < (rowFirst[i] as number)) rowFirst[i] = base + m0;
      if (base + m1 > (rowLast[i] as number)) rowLast[i] = base + m1;
    }
  }
  // Along x_A: row i of the old window moves to row i + shiftA + m of the new one.
  const shiftA = from.windowA.lo - to.windowA.lo + stepA.lo;
  const next = new Float64Array(rowsTo * widthTo);
  for (let i = 0; i < rowsFrom; i++) {
    const c0 = rowFirst[i] as number;
    const c1 = rowLast[i] as number;
    if (c0 > c1) continue;
    const src = i * widthTo;
    const base = i + shiftA;
    const m0 = Math.max(0, -base);
    const m1 = Math.min(lenA - 1, rowsTo - 1 - base);
    for (let m = m0; m <= m1; m++) {
      const k = kA[m] as number;
      const dst = (base + m) * widthTo;
      for (let j = c0; j <= c1; j++) next[dst + j] = (next[dst + j] as number) + k * (middle[src + j] as number);
    }
  }
  return next;
}

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
 * sum is exact to rounding. The declaring points of a look for a threshold are found by one walk along
 * its boundary (decisionLattice.ts boundaryColumns), so no table of P over the lattice is kept: the memory
 * of a run is the two or three state arrays in flight (and what a memo keeps, within its own bound).
 */
import { type BinomialWindow, binomialWindow, boundaryColumns, DecisionCursor } from './decisionLattice';
import type { BetaPrior } from './types';

/** What one look of the programme needs, computed once and reused for any threshold. */
export interface LookLattice {
  readonly n: number;
  /** Window of x_A (and x_B) at this look: the unconditional binomial pmf of the look. */
  readonly windowA: BinomialWindow;
  readonly windowB: BinomialWindow;
  /** The read-out's prior. */
  readonly prior: BetaPrior;
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
 * Estimated operations of one run of the programme (multiply-adds of the convolutions) and the size of the
 * lattices (window rectangles, with the gap between the windows: the state arrays a run fills and clears),
 * for looks at `looks` visitors with rates pA and pB.
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
    // The rectangle of the windows, plus the gap between them (the measure the method choice was set on).
    setup += wA * (wB + Math.abs(n * (pB - pA)));
    prevA = wA;
    prevB = wB;
    prevN = n;
  }
  return { perRun, setup };
}

/** The lattices of every look for rates pA (control) and pB (challenger): their windows. Cost: O(Σ windows). */
export function lookLattices(looks: readonly number[], pA: number, pB: number, prior: BetaPrior): LookLattice[] {
  const out: LookLattice[] = [];
  let prev = 0;
  for (const n of looks) {
    const windowA = binomialWindow(n, pA, DP_CUTOFF);
    const windowB = pB === pA ? windowA : binomialWindow(n, pB, DP_CUTOFF);
    if (prev === 0) out.push({ n, windowA, windowB, prior });
    else {
      const stepA = binomialWindow(n - prev, pA, DP_CUTOFF);
      const stepB = pB === pA ? stepA : binomialWindow(n - prev, pB, DP_CUTOFF);
      out.push({ n, windowA, windowB, prior, stepA, stepB });
    }
    prev = n;
  }
  return out;
}

/**
 * The declaring columns of every row of a look: cut[i], the first column where P(B beats A) ≥ threshold
 * (the width when none), and with two sides low[i], the last column where P(B beats A) ≤ 1 − threshold
 * (−1 when none). Two walks along the boundaries. Cost: O(rows + columns) steps.
 */
function declaringColumns(look: LookLattice, threshold: number, sides: 1 | 2): { cut: Int32Array; low: Int32Array } {
  const { n, windowA, windowB, prior } = look;
  const cut = boundaryColumns(n, windowA, windowB, threshold, false, prior);
  if (sides === 1) return { cut, low: new Int32Array(cut.length).fill(-1) };
  // the last column with P ≤ 1 − threshold is the one before the first with P > 1 − threshold
  const low = boundaryColumns(n, windowA, windowB, 1 - threshold, true, prior);
  for (let i = 0; i < low.length; i++) low[i] = (low[i] as number) - 1;
  return { cut, low };
}

/**
 * The read-out probabilities of the lattice points of every look that lie strictly between `low` and
 * `high`: P(B beats A), and with two sides also 1 − P (the control's), sorted; undefined when there are more
 * than `most` (then the caller narrows first). The threshold solver bisects over them: the exact rate only
 * changes where the threshold passes one of them.
 * Cost: two boundary walks per look and side, plus a walk from a row's diagonal to its values for each row
 * that has some (at most `most` rows): O(K·(rows + columns) + most·(span + most)).
 */
export function readOutValuesBetween(
  lattices: readonly LookLattice[],
  low: number,
  high: number,
  sides: 1 | 2,
  most: number,
): number[] | undefined {
  const found = new Set<number>();
  // P in (from, to), and with two sides 1 − P in (low, high): P in (1 − high, 1 − low), kept as 1 − P.
  const ranges: [number, number, boolean][] = [[low, high, false]];
  if (sides === 2) ranges.push([1 - high, 1 - low, true]);
  for (const look of lattices) {
    const { n, windowA, windowB, prior } = look;
    for (const [from, to, mirrored] of ranges) {
      const first = boundaryColumns(n, windowA, windowB, from, true, prior);
      const end = boundaryColumns(n, windowA, windowB, to, false, prior);
      let count = 0;
      for (let i = 0; i < first.length; i++) count += Math.max((end[i] as number) - (first[i] as number), 0);
      if (found.size + count > most) return undefined;
      for (let i = 0; i < first.length; i++) {
        if ((end[i] as number) <= (first[i] as number)) continue;
        const xA = windowA.lo + i;
        const cursor = new DecisionCursor(n, prior, xA);
        const xB = windowB.lo + (first[i] as number);
        while (cursor.xB < xB) cursor.upB();
        while (cursor.xB > xB) cursor.downB();
        for (let j = first[i] as number; j < (end[i] as number); j++) {
          if (j > (first[i] as number)) cursor.upB();
          const value = mirrored ? 1 - cursor.probability : cursor.probability;
          if (value > low && value < high) found.add(value);
        }
      }
    }
  }
  return [...found].sort((a, b) => a - b);
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
  /** The state after each look, for the looks whose states fit MEMO_STATES (undefined beyond). */
  states: (Float64Array | undefined)[];
  firsts: Int32Array[];
  lasts: Int32Array[];
  byLook: number[];
}

/**
 * Most state values a memo keeps (8 bytes each: 8 MB), from the first look on; the looks after them are
 * computed afresh by every run. The 100 states of a 100-look plan could otherwise hold 100 MB and more.
 */
const MEMO_STATES = 1e6;

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
    const { cut, low } = declaringColumns(look, threshold, sides);
    cuts.push(cut);
    lows.push(low);
  }
  let start = 0;
  if (memo !== undefined && memo.sides === sides) {
    while (
      start < lattices.length &&
      memo.states[start] !== undefined &&
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
  let kept = 0; // state values the memo holds
  for (let k = 0; k < start; k++) kept += ((memo as CrossingMemo).states[k] as Float64Array).length;
  const scratch = new Scratch();
  if (memo !== undefined) {
    // The memo's states from `start` on are replaced by this run: their arrays are reused for it.
    for (let k = start; k < memo.states.length; k++) {
      const replaced = memo.states[k];
      if (replaced !== undefined) scratch.release(replaced);
      memo.states[k] = undefined;
    }
  }
  let owned = false; // whether `state` is this run's to reuse (not the memo's)
  for (let k = start; k < lattices.length; k++) {
    const look = lattices[k] as LookLattice;
    const { windowA, windowB } = look;
    const rows = windowA.hi - windowA.lo + 1;
    const width = windowB.hi - windowB.lo + 1;
    let next: Float64Array;
    if (k === 0) {
      next = scratch.array(rows * width);
      for (let i = 0; i < rows; i++) {
        const a = windowA.pmf[i] as number;
        for (let j = 0; j < width; j++) next[i * width + j] = a * (windowB.pmf[j] as number);
      }
    } else {
      next = propagate(state, first, last, lattices[k - 1] as LookLattice, look, scratch);
      if (owned) scratch.release(state);
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
    owned = true;
    if (memo !== undefined) {
      kept += next.length;
      memo.states[k] = kept <= MEMO_STATES ? next : undefined;
      owned = memo.states[k] === undefined;
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
 * States below this probability at the ends of a row are not carried to the next look: at most ~1e6 states,
 * so at most 1e-14 of probability is dropped per look (the corners of the windows hold ~1e-24 each).
 */
const NEGLIGIBLE_STATE = 1e-20;

/**
 * The arrays of one run, reused from look to look (zeroed) instead of made afresh: a 100-look run would
 * otherwise make 200 arrays of the lattice's size for the collector.
 */
class Scratch {
  private between = new Float64Array(0);
  private spare: Float64Array[] = [];

  /** The convolution's intermediate array, zeroed (valid until the next call). */
  middle(size: number): Float64Array {
    if (this.between.length < size) this.between = new Float64Array(size);
    return this.between.subarray(0, size).fill(0);
  }

  /** A zeroed state array, from a released one when it is large enough. */
  array(size: number): Float64Array {
    const spare = this.spare.pop();
    if (spare !== undefined && spare.length >= size) return spare.subarray(0, size).fill(0);
    return new Float64Array(size);
  }

  /** Gives back a state array no longer needed (its whole buffer). */
  release(values: Float64Array): void {
    this.spare.push(
      new Float64Array(values.buffer, values.byteOffset, values.buffer.byteLength / 8 - values.byteOffset / 8),
    );
  }
}

/** Moves the undeclared mass of look `from` to look `to`: convolution along x_B, then along x_A. */
function propagate(
  state: Float64Array,
  first: Int32Array,
  last: Int32Array,
  from: LookLattice,
  to: LookLattice,
  scratch: Scratch,
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
  const middle = scratch.middle(rowsFrom * widthTo);
  const rowFirst = new Int32Array(rowsFrom).fill(widthTo);
  const rowLast = new Int32Array(rowsFrom).fill(-1);
  for (let i = 0; i < rowsFrom; i++) {
    const src = i * widthFrom;
    const dst = i * widthTo;
    // The row's undeclared mass, without its negligible ends.
    let j0 = first[i] as number;
    let j1 = last[i] as number;
    while (j0 <= j1 && (state[src + j0] as number) < NEGLIGIBLE_STATE) j0++;
    while (j1 >= j0 && (state[src + j1] as number) < NEGLIGIBLE_STATE) j1--;
    // One term of the kernel at a time over the whole row (an inner loop over columns, however short the kernel).
    for (let m = 0; m < lenB; m++) {
      const shift = shiftB + m;
      const a = Math.max(j0, -shift);
      const b = Math.min(j1, widthTo - 1 - shift);
      if (a > b) continue;
      const k = kB[m] as number;
      const out = dst + shift;
      for (let j = a; j <= b; j++) middle[out + j] = (middle[out + j] as number) + k * (state[src + j] as number);
      if (a + shift < (rowFirst[i] as number)) rowFirst[i] = a + shift;
      if (b + shift > (rowLast[i] as number)) rowLast[i] = b + shift;
    }
  }
  // Along x_A: row i of the old window moves to row i + shiftA + m of the new one.
  const shiftA = from.windowA.lo - to.windowA.lo + stepA.lo;
  const next = scratch.array(rowsTo * widthTo);
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

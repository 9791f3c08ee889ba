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
 * of a run is the two or three state arrays in flight (and what a memo keeps, within its own bound). Each row
 * of a state holds only a range of columns (the undeclared side, without negligible ends), and only those
 * ranges are convolved and zeroed; with two sides and no difference between the variants the state is
 * symmetric and only its half on and above the diagonal is carried.
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
 * y[yAt + j] += k·x[xAt + j] for j < n: the programme's one inner loop, kept in a function of its own so that
 * the engine compiles it early (a large function holding it would run unoptimised for the first looks).
 */
function axpy(y: Float64Array, yAt: number, x: Float64Array, xAt: number, k: number, n: number): void {
  for (let j = 0; j < n; j++) y[yAt + j] = (y[yAt + j] as number) + k * (x[xAt + j] as number);
}

/** x[from] + … + x[to]. */
function sum(x: Float64Array, from: number, to: number): number {
  let total = 0;
  for (let j = from; j <= to; j++) total += x[j] as number;
  return total;
}

/**
 * The undeclared mass of a run after a look: values on the look's window rectangle (a row per count x_A of
 * windowA, a column per count x_B of windowB, row-major), of which only columns lo[i] … hi[i] of row i are
 * meaningful (an empty row has hi < lo). Nothing outside the ranges is ever read, so no array is zeroed
 * beyond the ranges a look writes: the declared side of the boundary and the windows' far corners cost
 * nothing.
 */
interface RunState {
  readonly values: Float64Array;
  readonly lo: Int32Array;
  readonly hi: Int32Array;
}

/**
 * What a run leaves behind for the next one at another threshold: per look, its declaring columns, the
 * undeclared state after it (copies, for the first looks within MEMO_STATES values) and the mass declared
 * there. A run whose first k looks declare at the same lattice points starts from the stored state after
 * look k (nearby thresholds often differ only at the later looks). It also keeps the run's arrays.
 */
export interface CrossingMemo {
  sides?: 1 | 2;
  cuts: Int32Array[];
  lows: Int32Array[];
  states: (RunState | undefined)[];
  byLook: number[];
  buffers?: RunBuffers;
}

/**
 * Most state values a memo keeps (8 bytes each: 8 MB), from the first look on; the looks after them are
 * computed afresh by every run. The 100 states of a 100-look plan could otherwise hold 100 MB and more.
 */
const MEMO_STATES = 1e6;

/** An empty memo for {@link exactCrossing}. */
export function crossingMemo(): CrossingMemo {
  return { cuts: [], lows: [], states: [], byLook: [] };
}

function sameColumns(a: Int32Array | undefined, b: Int32Array): boolean {
  if (a === undefined || a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * States below this probability at the ends of a row are not carried to the next look: at most ~1e6 states,
 * so at most 1e-14 of probability is dropped per look (the corners of the windows hold ~1e-24 each).
 */
const NEGLIGIBLE_STATE = 1e-20;

/**
 * The arrays of a run, made once for the largest look and reused from look to look (and from run to run
 * through a memo): two states in turn and the convolution's intermediate rows. Sized from the lattices, so
 * a run allocates nothing per look; the second state and the intermediate are made only for two looks or more.
 */
class RunBuffers {
  private readonly slots: (RunState | undefined)[] = [undefined, undefined];
  private between?: RunState;
  readonly rect: number;
  readonly rows: number;
  private readonly middleSize: number;

  constructor(lattices: readonly LookLattice[]) {
    let rect = 0;
    let rows = 0;
    let middle = 0;
    let prevRows = 0;
    for (const look of lattices) {
      const r = look.windowA.hi - look.windowA.lo + 1;
      const w = look.windowB.hi - look.windowB.lo + 1;
      rect = Math.max(rect, r * w);
      rows = Math.max(rows, r);
      middle = Math.max(middle, prevRows * w);
      prevRows = r;
    }
    this.rect = rect;
    this.rows = rows;
    this.middleSize = middle;
  }

  /** State slot 0 or 1. */
  state(slot: number): RunState {
    let s = this.slots[slot];
    if (s === undefined) {
      s = { values: new Float64Array(this.rect), lo: new Int32Array(this.rows), hi: new Int32Array(this.rows) };
      this.slots[slot] = s;
    }
    return s;
  }

  /** The convolution's intermediate: the old rows on the new look's columns. */
  middle(): RunState {
    if (this.between === undefined) {
      this.between = {
        values: new Float64Array(this.middleSize),
        lo: new Int32Array(this.rows),
        hi: new Int32Array(this.rows),
      };
    }
    return this.between;
  }
}

/** A copy of the first `rows` rows of a state of `width` columns (for the memo). */
function copyState(state: RunState, rows: number, width: number): RunState {
  return {
    values: state.values.slice(0, rows * width),
    lo: state.lo.slice(0, rows),
    hi: state.hi.slice(0, rows),
  };
}

/**
 * The exact probability that some look declares a winner: the challenger when P(B beats A) ≥ threshold,
 * and with two sides also the control when P(A beats B) = 1 − P(B beats A) ≥ threshold. Also the
 * probability of a first declaration at each look. With a `memo`, the looks before the first one whose
 * declaring points differ from the memo's are not recomputed (and the memo is updated).
 * Cost: up to the `perRun` of {@link exactWork} multiply-adds, plus a few passes over the undeclared part
 * of each look's window rectangle; memory: three arrays of the largest rectangle (and the memo's copies).
 */
export function exactCrossing(
  lattices: readonly LookLattice[],
  threshold: number,
  sides: 1 | 2,
  memo?: CrossingMemo,
): { probability: number; byLook: number[] } {
  // Two sides with no difference between the variants: both counts have the same distribution and the
  // decision is mirrored across the diagonal (P(B beats A) at (x, y) is 1 − P at (y, x)), so the state is
  // symmetric and only the part on and above the diagonal (x_B ≥ x_A) is carried: half the work.
  const symmetric = sides === 2 && lattices.every((l) => l.windowA === l.windowB && l.stepA === l.stepB);
  // The declaring columns of every row at every look for this threshold: boundary walks only (the low side
  // is not needed in the symmetric run).
  const cuts: Int32Array[] = [];
  const lows: Int32Array[] = [];
  for (const look of lattices) {
    const { cut, low } = declaringColumns(look, threshold, symmetric ? 1 : sides);
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
  const buffers = memo?.buffers ?? new RunBuffers(lattices);
  if (memo !== undefined) memo.buffers = buffers;
  let state: RunState | undefined = start > 0 ? (memo as CrossingMemo).states[start - 1] : undefined;
  let kept = 0; // state values the memo holds
  for (let k = 0; k < start; k++) kept += ((memo as CrossingMemo).states[k] as RunState).values.length;
  if (memo !== undefined) memo.states.length = start;
  let slot = 0;
  for (let k = start; k < lattices.length; k++) {
    const look = lattices[k] as LookLattice;
    const rows = look.windowA.hi - look.windowA.lo + 1;
    const width = look.windowB.hi - look.windowB.lo + 1;
    const next = buffers.state(slot);
    if (symmetric) {
      if (k === 0) firstLook(look, next, true);
      else propagateSymmetric(state as RunState, lattices[k - 1] as LookLattice, look, buffers.middle(), next);
      // The declarations below the diagonal mirror those above it.
      byLook.push(2 * declare(next, rows, width, cuts[k] as Int32Array, NO_LOW));
    } else {
      if (k === 0) firstLook(look, next, false);
      else propagate(state as RunState, lattices[k - 1] as LookLattice, look, buffers.middle(), next);
      byLook.push(declare(next, rows, width, cuts[k] as Int32Array, lows[k] as Int32Array));
    }
    state = next;
    slot = 1 - slot;
    if (memo !== undefined && kept + rows * width <= MEMO_STATES) {
      kept += rows * width;
      memo.states[k] = copyState(next, rows, width);
    }
  }
  if (memo !== undefined) {
    memo.sides = sides;
    memo.cuts = cuts;
    memo.lows = lows;
    memo.byLook = byLook.slice();
  }
  let total = 0;
  for (const p of byLook) total += p;
  return { probability: Math.min(Math.max(total, 0), 1), byLook };
}

/** No declaring column on the low side (the symmetric run's rows, which start at the diagonal). */
const NO_LOW = new Int32Array(0);

/**
 * The state at the first look: the product of both windows' pmfs, every row full (from the diagonal on when
 * `upper`: the symmetric run's rows).
 */
function firstLook(look: LookLattice, into: RunState, upper: boolean): void {
  const { windowA, windowB } = look;
  const rows = windowA.hi - windowA.lo + 1;
  const width = windowB.hi - windowB.lo + 1;
  const values = into.values;
  for (let i = 0; i < rows; i++) {
    const a = windowA.pmf[i] as number;
    const row = i * width;
    for (let j = 0; j < width; j++) values[row + j] = a * (windowB.pmf[j] as number);
    into.lo[i] = upper ? i : 0;
    into.hi[i] = width - 1;
  }
}

/**
 * The declarations of a look: the mass of each row at columns ≥ cut[i] and ≤ low[i] is declared (summed and
 * taken out of the row's range); the range is then trimmed of negligible ends. Returns the mass declared.
 */
function declare(state: RunState, rows: number, width: number, cut: Int32Array, low: Int32Array): number {
  const { values, lo, hi } = state;
  let declared = 0;
  for (let i = 0; i < rows; i++) {
    const row = i * width;
    let a = lo[i] as number;
    let b = hi[i] as number;
    const c = cut[i] as number;
    const l = low.length === 0 ? -1 : (low[i] as number);
    if (b >= c) declared += sum(values, row + Math.max(a, c), row + b);
    if (b >= c) b = c - 1;
    if (a <= l) declared += sum(values, row + a, row + Math.min(b, l));
    if (a <= l) a = l + 1;
    while (a <= b && (values[row + a] as number) < NEGLIGIBLE_STATE) a++;
    while (b >= a && (values[row + b] as number) < NEGLIGIBLE_STATE) b--;
    lo[i] = a;
    hi[i] = b;
  }
  return declared;
}

/**
 * Moves the undeclared mass of look `from` to look `to` (into `next`): convolution along x_B into `middle`,
 * then along x_A. Only the rows' ranges are read, and only the ranges written are zeroed first.
 */
function propagate(state: RunState, from: LookLattice, to: LookLattice, middle: RunState, next: RunState): void {
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
  const source = state.values;
  const between = middle.values;
  const midLo = middle.lo;
  const midHi = middle.hi;
  // Along x_B: column j of the old window moves to column j + shiftB + m of the new one.
  const shiftB = from.windowB.lo - to.windowB.lo + stepB.lo;
  for (let i = 0; i < rowsFrom; i++) {
    const src = i * widthFrom;
    const dst = i * widthTo;
    const j0 = state.lo[i] as number;
    const j1 = state.hi[i] as number;
    const c0 = Math.max(j0 + shiftB, 0);
    const c1 = Math.min(j1 + shiftB + lenB - 1, widthTo - 1);
    midLo[i] = c0;
    midHi[i] = c1;
    if (j0 > j1 || c0 > c1) {
      midHi[i] = -1;
      continue;
    }
    between.fill(0, dst + c0, dst + c1 + 1);
    // One term of the kernel at a time over the whole row (an inner loop over columns, however short the kernel).
    for (let m = 0; m < lenB; m++) {
      const shift = shiftB + m;
      const a = Math.max(j0, -shift);
      const b = Math.min(j1, widthTo - 1 - shift);
      if (a > b) continue;
      const k = kB[m] as number;
      const out = dst + shift;
      axpy(between, out + a, source, src + a, k, b - a + 1);
    }
  }
  // Along x_A: row i of the old window moves to row i + shiftA + m of the new one. The new rows' ranges are
  // the unions of the rows that reach them; those ranges are zeroed, then filled.
  const shiftA = from.windowA.lo - to.windowA.lo + stepA.lo;
  const values = next.values;
  const lo = next.lo;
  const hi = next.hi;
  lo.fill(widthTo, 0, rowsTo);
  hi.fill(-1, 0, rowsTo);
  for (let i = 0; i < rowsFrom; i++) {
    const c0 = midLo[i] as number;
    const c1 = midHi[i] as number;
    if (c0 > c1) continue;
    const base = i + shiftA;
    const m0 = Math.max(0, -base);
    const m1 = Math.min(lenA - 1, rowsTo - 1 - base);
    for (let m = m0; m <= m1; m++) {
      const r = base + m;
      if (c0 < (lo[r] as number)) lo[r] = c0;
      if (c1 > (hi[r] as number)) hi[r] = c1;
    }
  }
  for (let r = 0; r < rowsTo; r++) {
    const c0 = lo[r] as number;
    const c1 = hi[r] as number;
    if (c0 <= c1) values.fill(0, r * widthTo + c0, r * widthTo + c1 + 1);
  }
  for (let i = 0; i < rowsFrom; i++) {
    const c0 = midLo[i] as number;
    const c1 = midHi[i] as number;
    if (c0 > c1) continue;
    const src = i * widthTo;
    const base = i + shiftA;
    const m0 = Math.max(0, -base);
    const m1 = Math.min(lenA - 1, rowsTo - 1 - base);
    for (let m = m0; m <= m1; m++) {
      const k = kA[m] as number;
      const dst = (base + m) * widthTo;
      axpy(values, dst + c0, between, src + c0, k, c1 - c0 + 1);
    }
  }
}

/**
 * {@link propagate} for the symmetric run: the rows hold the state on and above the diagonal (columns ≥ the
 * row; windows and steps are the same for both variants, so the square's diagonal is x_A = x_B). Each row is
 * first completed below the diagonal by the mirror image as far as the kernel reaches (L − 1 columns), then
 * convolved along x_B from there; along x_A only the columns on and above the new diagonal are made.
 */
function propagateSymmetric(
  state: RunState,
  from: LookLattice,
  to: LookLattice,
  middle: RunState,
  next: RunState,
): void {
  const step = to.stepB as BinomialWindow;
  const size = from.windowB.hi - from.windowB.lo + 1;
  const sizeTo = to.windowB.hi - to.windowB.lo + 1;
  const kernel = step.pmf;
  const len = kernel.length;
  const source = state.values;
  const between = middle.values;
  const midLo = middle.lo;
  const midHi = middle.hi;
  // Column j (row i) of the old square moves to column j + shift + m (row i + shift + m) of the new one.
  const shift = from.windowB.lo - to.windowB.lo + step.lo;
  const lo = state.lo;
  const hi = state.hi;
  for (let i = 0; i < size; i++) {
    const row = i * size;
    const a = lo[i] as number;
    const b = hi[i] as number;
    // The row from max(i − L + 1, 0): the mirror image below the diagonal, zeros up to the row's range.
    const from0 = Math.max(i - len + 1, 0);
    for (let j = from0; j < i; j++) {
      const inRange = i >= (lo[j] as number) && i <= (hi[j] as number);
      source[row + j] = inRange ? (source[j * size + i] as number) : 0;
    }
    const to1 = b >= a ? b : i - 1;
    for (let j = i; j < Math.min(a, to1 + 1); j++) source[row + j] = 0;
    // Along x_B, only the columns reaching the new diagonal or beyond (c ≥ i + shift) are needed.
    const dst = i * sizeTo;
    const c0 = Math.max(from0 + shift, i + shift, 0);
    const c1 = Math.min(to1 + shift + len - 1, sizeTo - 1);
    midLo[i] = c0;
    midHi[i] = c1;
    if (from0 > to1 || c0 > c1) {
      midHi[i] = -1;
      continue;
    }
    between.fill(0, dst + c0, dst + c1 + 1);
    for (let m = 0; m < len; m++) {
      const s = shift + m;
      const j0 = Math.max(from0, c0 - s);
      const j1 = Math.min(to1, c1 - s);
      if (j0 > j1) continue;
      const k = kernel[m] as number;
      const out = dst + s;
      axpy(between, out + j0, source, row + j0, k, j1 - j0 + 1);
    }
  }
  // Along x_A: row i moves to row r = i + shift + m, on the columns c ≥ r.
  const values = next.values;
  const nextLo = next.lo;
  const nextHi = next.hi;
  nextLo.fill(sizeTo, 0, sizeTo);
  nextHi.fill(-1, 0, sizeTo);
  for (let i = 0; i < size; i++) {
    const c0 = midLo[i] as number;
    const c1 = midHi[i] as number;
    if (c0 > c1) continue;
    const base = i + shift;
    const m0 = Math.max(0, -base);
    const m1 = Math.min(len - 1, sizeTo - 1 - base);
    for (let m = m0; m <= m1; m++) {
      const r = base + m;
      const first = Math.max(c0, r);
      if (first > c1) continue;
      if (first < (nextLo[r] as number)) nextLo[r] = first;
      if (c1 > (nextHi[r] as number)) nextHi[r] = c1;
    }
  }
  for (let r = 0; r < sizeTo; r++) {
    const c0 = nextLo[r] as number;
    const c1 = nextHi[r] as number;
    if (c0 <= c1) values.fill(0, r * sizeTo + c0, r * sizeTo + c1 + 1);
  }
  for (let i = 0; i < size; i++) {
    const c0 = midLo[i] as number;
    const c1 = midHi[i] as number;
    if (c0 > c1) continue;
    const src = i * sizeTo;
    const base = i + shift;
    const m0 = Math.max(0, -base);
    const m1 = Math.min(len - 1, sizeTo - 1 - base);
    for (let m = m0; m <= m1; m++) {
      const r = base + m;
      const first = Math.max(c0, r);
      if (first > c1) continue;
      const k = kernel[m] as number;
      const dst = r * sizeTo;
      axpy(values, dst + first, between, src + first, k, c1 - first + 1);
    }
  }
}

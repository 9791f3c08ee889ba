/**
 * Where the read-outs get their tabulated posteriors from: built afresh on every call (the default, no
 * state at all), or from a bounded memo the caller owns and passes in.
 *
 * A tabulation is a pure function of its density and options, and everything a table computes lazily
 * (node cdf tables, integrated cdfs, the panel order) depends only on the table, never on the order of
 * use. So a table taken from a memo gives bit-for-bit the numbers a fresh one gives (tested in
 * test/stats/tableMemo.test.ts); the memo only saves time when several worksheet functions read out the
 * same variants. Nothing here is module-level state: a memo lives where the caller keeps it (the add-in
 * keeps one for its long-lived shared runtime, functions/functions.ts).
 */
import type { TabulatedDistribution } from './quadrature';

/** A source of tabulated distributions, each named by a key that determines it completely. */
export interface TableSource {
  /**
   * The table for `key`: `build()` or an identical table built earlier for the same key. The key must
   * determine the table (model, parameters in full precision, tabulation options).
   */
  table(key: string, build: () => TabulatedDistribution): TabulatedDistribution;
}

/**
 * No memo: every call builds its own tables (what the core's functions do unless told otherwise).
 * @example
 * const build = () => tabulate(betaWorkingDensity(8, 10));
 * NO_MEMO.table('beta:8:10', build) === NO_MEMO.table('beta:8:10', build) //=> false (built again each time)
 */
export const NO_MEMO: TableSource = Object.freeze({
  table: (_key: string, build: () => TabulatedDistribution): TabulatedDistribution => build(),
});

/** Default budget of a {@link TableMemo}: nodes kept in all its tables together (~64 bytes each). */
export const DEFAULT_NODE_BUDGET = 400_000;

/**
 * A least-recently-used memo of tables, bounded by the total number of quadrature nodes it holds (about
 * 64 bytes a node once a table's lazy parts are filled: the default 400 000 nodes held 961 conversion
 * posteriors of ~27 panels in 24 MB, measured with node 20). A table larger than the whole budget is
 * returned but not kept.
 * Cost: O(1) per lookup (a Map in recency order) plus the build on a miss.
 * Throws RangeError for a budget that is not a positive whole number.
 * @example
 * const memo = new TableMemo(10_000);
 * const build = () => tabulate(betaWorkingDensity(8, 10));
 * memo.table('beta:8:10', build) === memo.table('beta:8:10', build) //=> true (built once)
 */
export class TableMemo implements TableSource {
  private readonly entries = new Map<string, TabulatedDistribution>();
  private nodes = 0;

  constructor(readonly nodeBudget: number = DEFAULT_NODE_BUDGET) {
    if (!(Number.isInteger(nodeBudget) && nodeBudget > 0)) {
      throw new RangeError(`the node budget must be a positive whole number, not ${nodeBudget}`);
    }
  }

  table(key: string, build: () => TabulatedDistribution): TabulatedDistribution {
    const known = this.entries.get(key);
    if (known !== undefined) {
      // Most recent last: re-insert.
      this.entries.delete(key);
      this.entries.set(key, known);
      return known;
    }
    const made = build();
    const size = made.nodeZ.length;
    if (size > this.nodeBudget) return made;
    this.entries.set(key, made);
    this.nodes += size;
    for (const [oldKey, old] of this.entries) {
      if (this.nodes <= this.nodeBudget) break;
      this.entries.delete(oldKey);
      this.nodes -= old.nodeZ.length;
    }
    return made;
  }

  /** Number of tables kept. @example new TableMemo().size //=> 0 */
  get size(): number {
    return this.entries.size;
  }

  /** Total quadrature nodes of the kept tables (never above nodeBudget). */
  get nodeCount(): number {
    return this.nodes;
  }

  /** Forgets every table. */
  clear(): void {
    this.entries.clear();
    this.nodes = 0;
  }
}

/**
 * `solve` of each item, computed once per distinct `keyOf(item)` within this call (repeated challengers of one
 * read-out), each answer handed out as its own shallow copy. Cost: one solve per distinct key.
 * @example solveOncePerKey([2, 3, 2], (x) => x, (x) => ({ square: x * x }))
 * //=> [{ square: 4 }, { square: 9 }, { square: 4 }]
 */
export function solveOncePerKey<T, K, R extends object>(
  items: readonly T[],
  keyOf: (item: T) => K,
  solve: (item: T) => R,
): R[] {
  const solved = new Map<K, R>();
  return items.map((item) => {
    const key = keyOf(item);
    let answer = solved.get(key);
    if (answer === undefined) {
      answer = solve(item);
      solved.set(key, answer);
    }
    return { ...answer };
  });
}

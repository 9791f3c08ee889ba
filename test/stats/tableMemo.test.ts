import {
  decide,
  expectedLoss,
  liftInterval,
  posteriorOf,
  probAboveControl,
  probHighest,
  probLiftAbove,
  rateDiffInterval,
  rateInterval,
} from '../../functions/stats/conversion';
import type { TabulatedDistribution } from '../../functions/stats/quadrature';
import { DEFAULT_NODE_BUDGET, NO_MEMO, TableMemo } from '../../functions/stats/tableMemo';
import type { TableSource } from '../../functions/stats/tableMemo';
import type { ConversionCounts } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';

/*
 * The memo is a cache, so its contract is sameness, not a reference value: a table from it must give
 * bit-for-bit (Object.is) the numbers of a freshly built table, whatever was computed with it before.
 * The values themselves are checked against mpmath in conversion.test.ts (conversion_values.json).
 */

const VARIANTS: ConversionCounts[] = [
  { conversions: 50, visitors: 1000 },
  { conversions: 65, visitors: 1000 },
  { conversions: 58, visitors: 1000 },
  { conversions: 50, visitors: 1000 }, // the control's counts again: one shared table
];
const PRIOR = { alpha: 0.5, beta: 0.5 }; // fractional shapes: probAboveControl tabulates too

type ReadOut = [string, (tables: TableSource) => unknown];

const READ_OUTS: ReadOut[] = [
  ['liftInterval', (t) => liftInterval(VARIANTS, 0.95, PRIOR, t)],
  ['expectedLoss', (t) => expectedLoss(VARIANTS, PRIOR, t)],
  ['probHighest', (t) => probHighest(VARIANTS, PRIOR, t)],
  ['rateInterval', (t) => rateInterval(VARIANTS, 0.9, PRIOR, 'hdi', t)],
  ['decide', (t) => decide(VARIANTS, undefined, PRIOR, t)],
  ['probAboveControl', (t) => probAboveControl(VARIANTS, PRIOR, t)],
  ['rateDiffInterval', (t) => rateDiffInterval(VARIANTS, 0.8, PRIOR, t)],
  ['probLiftAbove', (t) => probLiftAbove(VARIANTS, 0.1, PRIOR, t)],
];

/** Every number in a result, in a fixed order (arrays and plain objects walked depth first). */
function numbers(value: unknown): number[] {
  if (typeof value === 'number') return [value];
  if (typeof value === 'boolean') return [value ? 1 : 0];
  if (Array.isArray(value)) return value.flatMap(numbers);
  if (value !== null && typeof value === 'object') {
    return Object.keys(value)
      .sort()
      .flatMap((k) => numbers((value as Record<string, unknown>)[k]));
  }
  throw new Error(`unexpected value ${String(value)}`);
}

function runAll(order: readonly ReadOut[], tables: TableSource): Map<string, number[]> {
  return new Map(order.map(([name, f]) => [name, numbers(f(tables))]));
}

function expectIdentical(actual: Map<string, number[]>, expected: Map<string, number[]>): void {
  for (const [name, values] of expected) {
    const got = actual.get(name) as number[];
    expect(got).toHaveLength(values.length);
    values.forEach((v, i) => {
      // toBe is Object.is: the same double, bit for bit (and -0 ≠ 0).
      expect([name, i, got[i]]).toEqual([name, i, v]);
      expect(Object.is(got[i], v)).toBe(true);
    });
  }
}

describe('a table from the memo gives bit-for-bit the numbers of a fresh table', () => {
  const fresh = runAll(READ_OUTS, NO_MEMO);

  it('in the listed order with one shared memo', () => {
    const memo = new TableMemo();
    expectIdentical(runAll(READ_OUTS, memo), fresh);
    expect(memo.size).toBe(3); // three distinct posteriors, each tabulated once
  });

  it('in the reverse order, and again on a memo already used (lazy parts filled)', () => {
    const memo = new TableMemo();
    const reversed = [...READ_OUTS].reverse();
    expectIdentical(runAll(reversed, memo), fresh);
    expectIdentical(runAll(READ_OUTS, memo), fresh);
    expectIdentical(runAll(reversed, memo), fresh);
  });

  it('after other work on the same tables (quantiles, densities, cdfs far in the tails)', () => {
    const memo = new TableMemo();
    for (const v of VARIANTS) {
      const d = posteriorOf(v, PRIOR, memo);
      d.quantile(1e-9);
      d.quantileUpper(0.3);
      d.cdf(0.01);
      d.density(0.07);
    }
    expectIdentical(runAll([...READ_OUTS.slice(3), ...READ_OUTS.slice(0, 3)], memo), fresh);
  });

  it('hands back the same table object for the same counts and prior, a new one for another prior', () => {
    const memo = new TableMemo();
    const v = VARIANTS[0] as ConversionCounts;
    const first = posteriorOf(v, PRIOR, memo);
    expect(posteriorOf({ ...v }, PRIOR, memo)).toBe(first);
    expect(posteriorOf(v, UNIFORM_PRIOR, memo)).not.toBe(first);
    expect(posteriorOf(v, PRIOR, NO_MEMO)).not.toBe(posteriorOf(v, PRIOR, NO_MEMO));
  });
});

describe('TableMemo: least recently used first, bounded by its node budget', () => {
  // Real conversion posteriors as the tables; their sizes are what the budget counts.
  const tables = [
    posteriorOf({ conversions: 3, visitors: 10 }),
    posteriorOf({ conversions: 300, visitors: 10000 }),
    posteriorOf({ conversions: 5, visitors: 1e9 }),
    posteriorOf({ conversions: 7, visitors: 9 }),
  ] as const;
  const size = (t: TabulatedDistribution) => t.nodeZ.length;
  const builder = (t: TabulatedDistribution) => jest.fn(() => t);

  it('the same key returns the same object and builds once', () => {
    const memo = new TableMemo();
    const build = builder(tables[0]);
    expect(memo.table('k', build)).toBe(tables[0]);
    expect(memo.table('k', build)).toBe(tables[0]);
    expect(build).toHaveBeenCalledTimes(1);
    expect(memo.size).toBe(1);
    expect(memo.nodeCount).toBe(size(tables[0]));
  });

  it('evicts the least recently used table when the budget is passed, never holding more nodes than it', () => {
    const [a, c, b] = tables; // a 608, b 560 and c 432 nodes
    expect(size(c)).toBeLessThanOrEqual(size(b));
    const memo = new TableMemo(size(a) + size(b)); // room for a and b, not for a third
    const buildA = builder(a);
    const buildB = builder(b);
    const buildC = builder(c);
    memo.table('a', buildA);
    memo.table('b', buildB);
    expect(memo.nodeCount).toBe(size(a) + size(b));
    memo.table('a', buildA); // a is now the most recently used, b the least
    expect(memo.table('c', buildC)).toBe(c);
    // b went first, and that was enough: a and c are kept.
    expect(memo.size).toBe(2);
    expect(memo.nodeCount).toBe(size(a) + size(c));
    expect(memo.nodeCount).toBeLessThanOrEqual(memo.nodeBudget);
    expect(memo.table('a', buildA)).toBe(a);
    expect(memo.table('c', buildC)).toBe(c);
    expect(buildA).toHaveBeenCalledTimes(1);
    expect(buildC).toHaveBeenCalledTimes(1);
    // b is built again, and now a (the least recently used of a, c) goes.
    memo.table('b', buildB);
    expect(buildB).toHaveBeenCalledTimes(2);
    expect(memo.nodeCount).toBe(size(c) + size(b));
    memo.table('c', buildC);
    expect(buildC).toHaveBeenCalledTimes(1);
    memo.table('a', buildA);
    expect(buildA).toHaveBeenCalledTimes(2);
  });

  it('keeps nodeCount equal to the kept tables and within the budget over a fixed sequence of keys, as an LRU model predicts', () => {
    const budget = size(tables[0]) + size(tables[1]) + size(tables[3]);
    const memo = new TableMemo(budget);
    const kept = new Map<string, TabulatedDistribution>();
    // A fixed sequence of keys (no random source): key i uses table i mod 4.
    const keys = [0, 1, 2, 3, 0, 0, 2, 1, 3, 1, 2, 0, 3, 3, 1, 2, 0, 1];
    keys.forEach((k, step) => {
      const t = tables[k % 4] as TabulatedDistribution;
      const got = memo.table(`t${k}`, () => t);
      expect(got).toBe(t);
      // Model of an LRU bounded by nodes: re-insert at the end, then drop from the front.
      kept.delete(`t${k}`);
      if (size(t) <= budget) kept.set(`t${k}`, t);
      let nodes = [...kept.values()].reduce((s, x) => s + size(x), 0);
      for (const [key, x] of kept) {
        if (nodes <= budget) break;
        kept.delete(key);
        nodes -= size(x);
      }
      expect([step, memo.nodeCount]).toEqual([step, nodes]);
      expect(memo.size).toBe(kept.size);
      expect(memo.nodeCount).toBeLessThanOrEqual(memo.nodeBudget);
    });
  });

  it('returns a table larger than the whole budget without keeping it', () => {
    const big = tables[1];
    const memo = new TableMemo(size(big) - 1);
    const build = builder(big);
    expect(memo.table('big', build)).toBe(big);
    expect(memo.size).toBe(0);
    expect(memo.nodeCount).toBe(0);
    memo.table('big', build);
    expect(build).toHaveBeenCalledTimes(2);
  });

  it('clear() forgets every table', () => {
    const memo = new TableMemo();
    memo.table('a', () => tables[0]);
    memo.clear();
    expect(memo.size).toBe(0);
    expect(memo.nodeCount).toBe(0);
  });

  it('has the documented default budget of 400 000 nodes', () => {
    expect(new TableMemo().nodeBudget).toBe(DEFAULT_NODE_BUDGET);
    expect(DEFAULT_NODE_BUDGET).toBe(400_000);
  });
});

describe('TableMemo rejects a budget that is not a positive whole number', () => {
  it.each([
    [0, 'the node budget must be a positive whole number, not 0'],
    [-5, 'the node budget must be a positive whole number, not -5'],
    [2.5, 'the node budget must be a positive whole number, not 2.5'],
    [NaN, 'the node budget must be a positive whole number, not NaN'],
    [Infinity, 'the node budget must be a positive whole number, not Infinity'],
  ])('budget %p', (budget, message) => {
    expect(() => new TableMemo(budget)).toThrow(RangeError);
    expect(() => new TableMemo(budget)).toThrow(message);
  });
});

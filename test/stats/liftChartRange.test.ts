import { liftDensityTable } from '../../functions/stats/conversion';
import { StatsError } from '../../functions/stats/errors';
import reference from '../reference/addin/lift_chart_range.json';
import { relativeError } from '../helpers/assertions';

/*
 * The grid of LIFT_DENSITY (conversion.ts liftChartRange): from the lowest to the highest of the challengers'
 * chart ranges, each its lift's 1%–99% quantiles kept within three interquartile ranges of the quartiles
 * (Tukey's far-out fences, common practice), as the function's help says.
 *
 * Reference values: test/reference/addin/lift_chart_range.json, printed by
 *   python3 test/reference/addin/lift_chart_range.py > test/reference/addin/lift_chart_range.json
 * (scipy: the lift's cdf ∫ f_X(x) F_Y((1 + l)x) dx by scipy.integrate.quad, quantiles by brentq, the ends by
 * the rule above). The counts are invented.
 */

describe('LIFT_DENSITY grid ends against scipy lift quantiles (lift_chart_range.py)', () => {
  it.each(reference.cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const variants = c.variants.map(([conversions, visitors]) => ({
      conversions: conversions as number,
      visitors: visitors as number,
    }));
    const [alpha, beta] = c.prior as [number, number];
    const table = liftDensityTable(variants, 11, { alpha, beta });
    expect(table.grid).toHaveLength(11);
    expect(relativeError(table.grid[0] as number, c.gridStart)).toBeLessThan(1e-9);
    expect(relativeError(table.grid[10] as number, c.gridEnd)).toBeLessThan(1e-9);
  });

  it('keeps a heavy tail from flattening the chart: the grid ends far below the 99% quantile', () => {
    // No conversions in the control: the lift's 99% quantile is ~1,092 (scipy), its upper fence ~128.
    const heavy = reference.cases[0] as (typeof reference.cases)[number];
    expect(heavy.gridEnd).toBeLessThan((heavy.challengers[0] as { q99: number }).q99 / 8);
    const table = liftDensityTable(
      [
        { conversions: 0, visitors: 1000 },
        { conversions: 10, visitors: 1000 },
      ],
      101,
    );
    // The densest row holds less than a quarter of the table's mass (a chart, not one spike).
    const f = table.densities[0] as number[];
    const step = (table.grid[1] as number) - (table.grid[0] as number);
    const mass = f.reduce((sum, v) => sum + v * step, 0);
    expect(Math.max(...f) * step).toBeLessThan(mass / 4);
  });

  it('answers not_available with a plain message when the prior is too weak for a finite range', () => {
    let thrown: unknown;
    try {
      liftDensityTable(
        [
          { conversions: 0, visitors: 1000 },
          { conversions: 3, visitors: 1000 },
        ],
        101,
        { alpha: 0.001, beta: 0.001 },
      );
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(StatsError);
    expect((thrown as StatsError).code).toBe('not_available');
    expect((thrown as StatsError).message).toBe(
      "the lift is spread too widely for a chart table (the prior is so weak that the control's rate could " +
        'be almost zero); use a stronger prior, such as 1 and 1',
    );
  });
});

describe('LIFT_DENSITY work budget: rows × challengers at most 5,000 (limits.ts MAX_LIFT_DENSITY_CELLS)', () => {
  const variants = (k: number) => Array.from({ length: k }, (_, i) => ({ conversions: 50 + i, visitors: 1000 }));

  it('accepts the default 101 rows for 50 variants (4,949 density values)', () => {
    expect(liftDensityTable(variants(50), 101).densities).toHaveLength(49);
  });

  it('refuses 1000 rows for 50 variants with invalid_argument naming the rows allowed', () => {
    let thrown: unknown;
    try {
      liftDensityTable(variants(50), 1000);
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(StatsError);
    expect((thrown as StatsError).code).toBe('invalid_argument');
    expect((thrown as StatsError).message).toBe(
      'points: 1000 rows for 49 challengers are too many for one table; with 49 challengers at most 102 rows ' +
        'are allowed (at most 5000 density values in all)',
    );
  });
});

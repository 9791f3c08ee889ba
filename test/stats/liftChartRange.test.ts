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

  const notAvailable = (variants: [number, number][], alpha: number, beta: number): StatsError => {
    let thrown: unknown;
    try {
      liftDensityTable(
        variants.map(([conversions, visitors]) => ({ conversions, visitors })),
        101,
        { alpha, beta },
      );
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(StatsError);
    expect((thrown as StatsError).code).toBe('not_available');
    return thrown as StatsError;
  };

  it('answers not_available naming prior_alpha and the control when the lift has no finite range', () => {
    // Beta(0.001, 1000): the control's rate is below 1e-300 with probability ~0.5, so the lift's upper
    // quartile overflows.
    expect(
      notAvailable(
        [
          [0, 1000],
          [3, 1000],
        ],
        0.001,
        0.001,
      ).message,
    ).toBe(
      'prior_alpha 0.001 is too weak for a lift chart: the control (conversions 0, visitors 1000) could have a ' +
        'rate of almost 0, so the lift has no finite range; use a prior_alpha of at least 1 (the default is 1)',
    );
  });

  it('names prior_alpha, prior_beta and the challenger when the middle half of the lift is one number', () => {
    // Beta(1.001, 0.001) twice: both rates are 1 to double precision in the middle half, so the lift's
    // quartiles are both exactly 0.
    expect(
      notAvailable(
        [
          [1, 1],
          [1, 1],
        ],
        0.001,
        0.001,
      ).message,
    ).toBe(
      'prior_alpha 0.001 and prior_beta 0.001 are too weak for a lift chart: the middle half of the lift of the ' +
        'challenger (conversions 1, visitors 1) is a single number; use a prior of at least 1 and 1 (the default)',
    );
  });

  it('answers the same for 46 all-converted variants at once, before any lift quantile is solved for', () => {
    // Beta(10.001, 0.001) for every variant: both quartiles of every rate are 1 in doubles, so the check on
    // the rates' middle halves answers (the lift quantile solves there could not converge; the fuzzer's case).
    const variants = Array.from({ length: 46 }, () => [10, 10] as [number, number]);
    const error = notAvailable(variants, 0.001, 0.001);
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      'prior_alpha 0.001 and prior_beta 0.001 are too weak for a lift chart: the middle half of the lift of the ' +
        'challenger (conversions 10, visitors 10) is a single number; use a prior of at least 1 and 1 (the default)',
    );
  });

  it('draws both of those tables under the default prior, as the messages advise', () => {
    const counts = [
      [0, 1000],
      [3, 1000],
      [1, 1],
    ].map(([conversions, visitors]) => ({ conversions: conversions as number, visitors: visitors as number }));
    expect(liftDensityTable(counts.slice(0, 2), 11).grid).toHaveLength(11);
    expect(liftDensityTable([counts[2], counts[2]] as typeof counts, 11).grid).toHaveLength(11);
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

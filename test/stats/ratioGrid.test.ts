import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { ratioDensity, ratioQuantile } from '../../functions/stats/compare';
import { ratioChartQuantiles, ratioDensityGrid } from '../../functions/stats/compare/ratioGrid';
import { posteriorOf } from '../../functions/stats/conversion';
import { tabulate } from '../../functions/stats/quadrature';
import reference from '../reference/addin/lift_chart_density.json';
import { relativeError } from '../helpers/assertions';

/*
 * The lift densities of LIFT_DENSITY on a whole grid (compare/ratioGrid.ts): exact ratio densities at
 * Chebyshev points of log(1 + lift), interpolated where the Chebyshev coefficients show it is as accurate.
 *
 * Reference values: test/reference/addin/lift_chart_density.json, printed by
 *   python3 test/reference/addin/lift_chart_density.py > test/reference/addin/lift_chart_density.json
 * (mpmath at 40 digits: g(l) = ∫ x f_X(x) f_Y((1 + l)x) dx by tanh-sinh quadrature split around the
 * integrand's peak). The counts are invented.
 */

const uniform = () => tabulate(betaWorkingDensity(1, 1), { coordinate: 'logit' });

describe('lift densities on a grid against mpmath (lift_chart_density.py)', () => {
  // 201 lifts with the reference's 41 among them (every fifth), so that the pieces are interpolated.
  it.each(reference.cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const prior = { alpha: c.prior[0] as number, beta: c.prior[1] as number };
    const [cx, nx] = c.control as [number, number];
    const [cy, ny] = c.challenger as [number, number];
    const x = posteriorOf({ conversions: cx, visitors: nx }, prior);
    const y = posteriorOf({ conversions: cy, visitors: ny }, prior);
    const lo = c.lifts[0] as number;
    const hi = c.lifts[40] as number;
    const grid = Array.from({ length: 201 }, (_, i) => lo + ((hi - lo) * i) / 200);
    const result = ratioDensityGrid(y, x, grid);
    c.densities.forEach((expected, j) => {
      expect(relativeError(result.densities[5 * j] as number, expected)).toBeLessThan(2e-12);
    });
    // Never more than 1.25 integrals a lift (the documented bound).
    expect(result.integrals).toBeLessThanOrEqual(1.25 * 201);
  });

  it('takes 16 integrals for 201 lifts of close variants of 10,000 visitors (one interpolated piece)', () => {
    const c = reference.cases[3] as (typeof reference.cases)[number];
    expect(c.why).toBe('close variants of 10,000 visitors');
    const x = posteriorOf({ conversions: 500, visitors: 10000 });
    const y = posteriorOf({ conversions: 510, visitors: 10007 });
    const grid = Array.from({ length: 201 }, (_, i) => -0.13 + (0.39 * i) / 200);
    expect(ratioDensityGrid(y, x, grid).integrals).toBe(16);
  });
});

describe('lift densities on a grid: closed forms', () => {
  it('two uniforms: density 1/2 up to a lift of 0 and 1/(2(1 + m)²) above; the kink is not interpolated', () => {
    // Y/X of two independent uniforms has density 1/2 on (0, 1] and 1/(2t²) above (common practice).
    const exact = (m: number) => (m <= 0 ? 0.5 : 1 / (2 * (1 + m) ** 2));
    for (const [lo, hi, n] of [
      [-0.9, 3, 201],
      [0.1, 3, 201],
      [-0.95, -0.05, 1000],
    ] as const) {
      const grid = Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
      const result = ratioDensityGrid(uniform(), uniform(), grid);
      grid.forEach((m, i) => expect(relativeError(result.densities[i] as number, exact(m))).toBeLessThan(1e-13));
    }
  });

  it('gives 0 at lifts of −1 and below and the exact ratio density at a short grid', () => {
    const x = posteriorOf({ conversions: 5, visitors: 40 });
    const y = posteriorOf({ conversions: 9, visitors: 41 });
    const grid = [-1.5, -1, -0.5, 0, 0.5, 1];
    const result = ratioDensityGrid(y, x, grid);
    expect(result.densities.slice(0, 2)).toEqual([0, 0]);
    grid.slice(2).forEach((m, i) => expect(result.densities[i + 2]).toBe(ratioDensity(y, x, m)));
    expect(result.integrals).toBe(4);
  });
});

describe('lift quantiles for a chart (ratioChartQuantiles): the roots of ratioQuantile, started closer', () => {
  const levels = [0.01, 0.25, 0.75, 0.99];

  it('close variants: a fitted piece, and each quantile within 1e-12 of ratioQuantile', () => {
    const x = posteriorOf({ conversions: 500, visitors: 10000 });
    const y = posteriorOf({ conversions: 510, visitors: 10007 });
    const result = ratioChartQuantiles(y, x, levels);
    expect(result.piece).toBeDefined();
    levels.forEach((p, i) => {
      expect(relativeError(result.quantiles[i] as number, ratioQuantile(y, x, p))).toBeLessThan(1e-12);
    });
  });

  it('a control without conversions: no piece (too wide in log(1 + lift)), ratioQuantile bit for bit', () => {
    const x = posteriorOf({ conversions: 0, visitors: 1000 });
    const y = posteriorOf({ conversions: 10, visitors: 1000 });
    const result = ratioChartQuantiles(y, x, levels);
    expect(result.piece).toBeUndefined();
    levels.forEach((p, i) => expect(result.quantiles[i]).toBe(ratioQuantile(y, x, p)));
  });

  it('the grid densities taken from that piece agree with mpmath (close variants)', () => {
    const c = reference.cases[3] as (typeof reference.cases)[number];
    const x = posteriorOf({ conversions: 500, visitors: 10000 });
    const y = posteriorOf({ conversions: 510, visitors: 10007 });
    const { piece } = ratioChartQuantiles(y, x, levels);
    const result = ratioDensityGrid(y, x, c.lifts, piece);
    c.densities.forEach((expected, j) => {
      expect(relativeError(result.densities[j] as number, expected)).toBeLessThan(2e-12);
    });
  });
});

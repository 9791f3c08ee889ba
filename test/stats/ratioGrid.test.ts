import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { ratioDensity, ratioQuantile } from '../../functions/stats/compare';
import { PairRule, gaussRuleOf, ratioChartQuantiles, ratioDensityGrid } from '../../functions/stats/compare/ratioGrid';
import { gaussLegendre } from '../../functions/stats/numeric';
import { posteriorOf } from '../../functions/stats/conversion';
import { tabulate } from '../../functions/stats/quadrature';
import reference from '../reference/addin/lift_chart_density.json';
import underflow from '../reference/addin/lift_density_underflow.json';
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

describe('lift densities from Gauss rules of the narrower posterior (PairRule) against mpmath', () => {
  // The last two cases of lift_chart_density.py: challengers of 12,649 and ten million visitors against
  // controls of 10 and 2,000 (invented counts), where the rules pass their check at almost every lift.
  const cases = reference.cases.filter((c) => c.why.startsWith('a challenger of'));
  it.each(cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const prior = { alpha: c.prior[0] as number, beta: c.prior[1] as number };
    const [cx, nx] = c.control as [number, number];
    const [cy, ny] = c.challenger as [number, number];
    const rule = new PairRule(
      posteriorOf({ conversions: cy, visitors: ny }, prior),
      posteriorOf({ conversions: cx, visitors: nx }, prior),
    );
    let used = 0;
    c.lifts.forEach((lift, j) => {
      const logDensity = rule.logDensity(1 + lift);
      if (logDensity === undefined) return;
      used++;
      expect(relativeError(Math.exp(logDensity), c.densities[j] as number)).toBeLessThan(2e-12);
    });
    expect(used).toBeGreaterThanOrEqual(37);
  });

  it('declines a pair of equal spreads (the rules are not tried) and gives no density there', () => {
    const rule = new PairRule(
      posteriorOf({ conversions: 510, visitors: 10007 }),
      posteriorOf({ conversions: 500, visitors: 10000 }),
    );
    expect(rule.usable).toBe(false);
    expect(rule.logDensity(1)).toBeUndefined();
  });
});

describe('lift densities below the smallest double (PairRule densityUnderflows) against mpmath', () => {
  // lift_density_underflow.py: the log density by mpmath; below −746 the table's value is 0 (as the exact
  // integral's exponential is), found from the bound without the integral; above it the bound must not claim it.
  it.each(underflow.cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const [cx, nx] = c.control as [number, number];
    const [cy, ny] = c.challenger as [number, number];
    const x = posteriorOf({ conversions: cx, visitors: nx });
    const y = posteriorOf({ conversions: cy, visitors: ny });
    const below = c.logDensity < -746;
    expect(new PairRule(y, x).densityUnderflows(1 + c.lift)).toBe(below);
    const [density] = ratioDensityGrid(y, x, [c.lift]).densities;
    if (below) expect(density).toBe(0);
    else expect(relativeError(Math.log(density as number), c.logDensity)).toBeLessThan(1e-12);
  });
});

describe('Gauss rules of a discrete measure (ratioGrid.ts gaussRuleOf, used by the checked lift rules)', () => {
  // The standard normal density on 400 Gauss–Legendre points over [−12, 12]: a discrete measure whose
  // moments match the normal's to ~1e-15, so its Gauss rules are the probabilists' Gauss–Hermite rules.
  const rule = gaussLegendre(400);
  const points = rule.nodes.map((t) => 12 * t);
  const weights = points.map(
    (x, i) => (12 * (rule.weights[i] as number) * Math.exp((-x * x) / 2)) / Math.sqrt(2 * Math.PI),
  );

  it('3 points: 0 and ±√3 with weights 2/3 and 1/6 (the roots of He₃ = x³ − 3x; closed form, common practice)', () => {
    const r = gaussRuleOf(points, weights, points.length, 3);
    expect(r).toBeDefined();
    const order = Array.from(r!.nodes.keys()).sort((i, j) => (r!.nodes[i] as number) - (r!.nodes[j] as number));
    const nodes = order.map((i) => r!.nodes[i] as number);
    const w = order.map((i) => r!.weights[i] as number);
    [-Math.sqrt(3), 0, Math.sqrt(3)].forEach((x, i) => expect(Math.abs((nodes[i] as number) - x)).toBeLessThan(1e-12));
    [1 / 6, 2 / 3, 1 / 6].forEach((x, i) => expect(Math.abs((w[i] as number) - x)).toBeLessThan(1e-12));
  });

  it('5 points: the roots of He₅ = x⁵ − 10x³ + 15x, x² = 5 ± √10 (closed form)', () => {
    const r = gaussRuleOf(points, weights, points.length, 5);
    const nodes = Array.from(r!.nodes).sort((a, b) => a - b);
    const root = (sign: number) => Math.sqrt(5 + sign * Math.sqrt(10));
    [-root(1), -root(-1), 0, root(-1), root(1)].forEach((x, i) =>
      expect(Math.abs((nodes[i] as number) - x)).toBeLessThan(1e-12),
    );
    // The weights sum to the measure's total and integrate x⁸ exactly (E x⁸ = 105 for a standard normal).
    const sum = Array.from(r!.weights).reduce((a, b) => a + b, 0);
    expect(Math.abs(sum - 1)).toBeLessThan(1e-13);
    const m8 = Array.from(r!.nodes).reduce((a, x, i) => a + (r!.weights[i] as number) * x ** 8, 0);
    expect(Math.abs(m8 - 105) / 105).toBeLessThan(1e-12);
  });

  it('answers undefined when the measure has fewer points than the rule needs', () => {
    const few = new Float64Array([0, 1]);
    expect(gaussRuleOf(few, new Float64Array([0.5, 0.5]), 2, 3)).toBeUndefined();
  });
});

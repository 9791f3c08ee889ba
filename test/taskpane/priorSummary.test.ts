/**
 * The Prior section's summaries: 90% range, mean, worth and the weight rule, and the density curve,
 * against scipy (test/reference/addin/taskpane_crosscheck.json from test/reference/addin/taskpane_crosscheck.py).
 */
import { PRIOR_WEIGHT_RULE, priorDensityCurve, summarizePrior } from '../../taskpane/logic/priorSummary';
import reference from '../reference/addin/taskpane_crosscheck.json';

const ref = reference as unknown as Record<string, Record<string, number>>;
const rel = (got: number, want: number): number => Math.abs(got / want - 1);

describe('summarizePrior', () => {
  test('Beta(20, 480): mean 4%, worth 500, 90% range equal to scipy beta.ppf(0.05 / 0.95)', () => {
    const s = summarizePrior({ alpha: 20, beta: 480 }, 10000);
    const want = ref.prior_summary_20_480 as Record<string, number>;
    expect(s.mean).toBe(0.04);
    expect(s.worth).toBe(500);
    expect(rel(s.low90, want.low90 as number)).toBeLessThan(1e-12);
    expect(rel(s.high90, want.high90 as number)).toBeLessThan(1e-12);
    expect(s.weight).toBe('light');
    expect(s.warning).toBeNull();
  });

  test('a skewed prior with a shape below 1, Beta(0.5, 12): range equal to scipy', () => {
    const s = summarizePrior({ alpha: 0.5, beta: 12 }, 10000);
    const want = ref['prior_summary_0.5_12'] as Record<string, number>;
    expect(rel(s.low90, want.low90 as number)).toBeLessThan(1e-10);
    expect(rel(s.high90, want.high90 as number)).toBeLessThan(1e-12);
  });

  test('the weight rule: worth > planned visitors per variant dominates, > a quarter of it pulls noticeably', () => {
    expect(summarizePrior({ alpha: 20, beta: 480 }, 400)).toMatchObject({
      weight: 'dominant',
      warning:
        "This prior is worth about 500 visitors, more than the 400 each variant will get: it would outweigh the test's own data. Use a weaker prior unless you can defend it to others.",
    });
    expect(summarizePrior({ alpha: 20, beta: 480 }, 1999).weight).toBe('noticeable');
    expect(summarizePrior({ alpha: 20, beta: 480 }, 2000).weight).toBe('light');
    expect(PRIOR_WEIGHT_RULE).toContain('alpha + beta');
    expect(() => summarizePrior({ alpha: 1, beta: 1 }, 0)).toThrow(
      new RangeError('the planned visitors per variant must be a positive number'),
    );
  });
});

describe('priorDensityCurve', () => {
  test("spans scipy's 0.05%–99.95% quantiles and gives scipy beta.pdf values", () => {
    const want = ref.prior_summary_20_480 as Record<string, number>;
    const curve = priorDensityCurve({ alpha: 20, beta: 480 }, 121);
    expect(curve.x).toHaveLength(121);
    expect(rel(curve.x[0] as number, want.q0005 as number)).toBeLessThan(1e-10);
    expect(rel(curve.x[120] as number, want.q9995 as number)).toBeLessThan(1e-10);
    // Beta(2, 2) density at 1/2 is 6·(1/2)(1/2) = 1.5 (closed form); a 3-point grid is symmetric about 1/2
    const small = priorDensityCurve({ alpha: 2, beta: 2 }, 3);
    expect(small.x[1]).toBeCloseTo(0.5, 12);
    expect(small.y[1]).toBeCloseTo(1.5, 12);
  });

  test('density at 0.04 on a fine grid matches scipy beta.pdf(0.04, 20, 480)', () => {
    const want = ref.prior_summary_20_480 as Record<string, number>;
    const curve = priorDensityCurve({ alpha: 20, beta: 480 }, 2001);
    const i = curve.x.findIndex((x) => x >= 0.04);
    const x0 = curve.x[i - 1] as number;
    const x1 = curve.x[i] as number;
    const y =
      (curve.y[i - 1] as number) + (((curve.y[i] as number) - (curve.y[i - 1] as number)) * (0.04 - x0)) / (x1 - x0);
    expect(rel(y, want['pdf_at_0.04'] as number)).toBeLessThan(1e-3); // linear interpolation between grid points
  });

  test('refuses fewer than two points', () => {
    expect(() => priorDensityCurve({ alpha: 1, beta: 1 }, 1)).toThrow(
      new RangeError('a curve needs at least 2 points'),
    );
  });
});

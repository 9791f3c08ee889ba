import { betaWorkingDensity, logit } from '../../functions/stats/betaDensity';
import { TabulatedDistribution, tabulate } from '../../functions/stats/quadrature';
import medians from '../reference/conversion/beta_medians.json';
import marginals from '../reference/conversion/conversion_marginals.json';
import { relativeError } from '../helpers/assertions';

/*
 * TabulatedDistribution.logTailAt, nodeValue, nodeLogValue, median and Beta's logJacobianAtValue.
 *
 * Reference values: test/reference/conversion/beta_medians.json, printed by
 *   python3 test/reference/conversion/beta_medians.py > test/reference/conversion/beta_medians.json
 * (scipy 1.17.1 scipy.special.betaincinv(a, b, 0.5); mpmath.findroot on mpmath.betainc agrees to the
 * digits printed under "checks" where betainc converges). The other checks are identities between the
 * new caches and the functions they cache.
 */

const SHAPES: readonly (readonly [number, number])[] = [
  [8, 10],
  [1, 1],
  [1, 1001],
  [1001, 1],
  [0.5, 0.5],
  [101, 901],
  [50001, 950001],
  [20000001, 980000001],
];

const table = (a: number, b: number): TabulatedDistribution =>
  tabulate(betaWorkingDensity(a, b), { coordinate: 'logit' });

/** Working values across and beyond the window: every edge, every node, panel midpoints, the far tails. */
function probePoints(d: TabulatedDistribution): number[] {
  const zs: number[] = [];
  const left = d.windowLeft;
  const right = d.windowRight;
  const span = right - left;
  for (const f of [-3, -1, -0.25, -1e-9]) zs.push(left + f * span);
  for (let e = 0; e < d.edges.length; e++) zs.push(d.edges[e] as number);
  for (let e = 0; e + 1 < d.edges.length; e++) zs.push(((d.edges[e] as number) + (d.edges[e + 1] as number)) / 2);
  for (let q = 0; q < d.nodeZ.length; q += 5) zs.push(d.nodeZ[q] as number);
  for (const f of [1e-9, 0.25, 1, 3]) zs.push(right + f * span);
  return zs.sort((u, v) => u - v);
}

describe('TabulatedDistribution.addLogTailsAt (the batched tails of P(highest) and P(greater))', () => {
  // "The same value" is ===: addLogTailsAt adds to out[k] = 0, and 0 + (−0) is +0, so where the tail
  // is −0 (log 1 far beyond the window) the two differ only in the sign of zero.
  it.each(SHAPES)('Beta(%d, %d): bit for bit the values of logCdfAt / logSfAt, point by point', (a, b) => {
    const d = table(a, b);
    const zs = probePoints(d);
    for (const upper of [false, true]) {
      const out = new Float64Array(zs.length);
      d.addLogTailsAt(zs, 0, zs.length, out, upper);
      zs.forEach((z, k) => {
        const single = upper ? d.logSfAt(z) : d.logCdfAt(z);
        if (single !== out[k])
          throw new Error(`z = ${z}, upper ${upper}: logCdfAt/logSfAt ${single}, addLogTailsAt ${out[k]}`);
      });
    }
  });

  // Against the truth (mpmath, 40 digits), at the points and tolerances quadrature.test.ts uses for logCdfAt:
  // the smaller tail relative to itself, the larger one absolutely. Interpolating the larger tail's own
  // table instead (as an earlier version did) missed by 8e-9 absolute for Beta(0.1, 10), whose slow logit
  // tail has panels over 100 wide.
  for (const c of marginals.cases) {
    it(`Beta(${c.a}, ${c.b}): exp of the batched tails against mpmath (conversion_marginals.json)`, () => {
      const d = table(c.a, c.b);
      const huge = c.a + c.b > 1e8;
      const relative = huge ? 5e-11 : 1e-11;
      const absolute = huge ? 2e-12 : 1e-13;
      const zs = c.points.map((p) => p.z).sort((u, v) => u - v);
      for (const upper of [false, true]) {
        const out = new Float64Array(zs.length);
        d.addLogTailsAt(zs, 0, zs.length, out, upper);
        zs.forEach((z, k) => {
          const point = c.points.find((p) => p.z === z);
          const want = Number(upper ? point?.sf : point?.cdf);
          const got = Math.exp(out[k] as number);
          if (want <= 0.5) expect(relativeError(got, want)).toBeLessThan(relative);
          else expect(Math.abs(got - want)).toBeLessThan(absolute);
        });
      }
    });
  }
});

describe('TabulatedDistribution.nodeValue and nodeLogValue', () => {
  it.each(SHAPES)('Beta(%d, %d): source.toValue(nodeZ[i]) and its log, exactly, and kept', (a, b) => {
    const d = table(a, b);
    const values = d.nodeValue;
    const logs = d.nodeLogValue;
    expect(values).toHaveLength(d.nodeZ.length);
    expect(logs).toHaveLength(d.nodeZ.length);
    for (let i = 0; i < d.nodeZ.length; i++) {
      const x = d.source.toValue(d.nodeZ[i] as number);
      expect(values[i]).toBe(x);
      expect(logs[i]).toBe(Math.log(x));
    }
    expect(d.nodeValue).toBe(values);
    expect(d.nodeLogValue).toBe(logs);
  });
});

describe('TabulatedDistribution.median against scipy.special.betaincinv(a, b, 0.5) (beta_medians.py)', () => {
  const cases = medians.cases.map((c) => [c.why, c] as const);

  it.each(cases)('%s', (_why, c) => {
    const d = table(c.a, c.b);
    const median = d.median;
    expect(median).toBe(d.quantile(0.5));
    expect(d.median).toBe(median);
    expect(relativeError(median, Number(c.median))).toBeLessThan(1e-12);
  });
});

describe('betaWorkingDensity logJacobianAtValue', () => {
  it('equals log(valueJacobian(logit(x))) to 1e-13 relative for x from 1e-300 to 1 − 1e-12', () => {
    const density = betaWorkingDensity(3, 7);
    const fn = density.logJacobianAtValue;
    expect(fn).toBeDefined();
    const xs: number[] = [];
    for (let e = -300; e <= -1; e += 1) xs.push(10 ** e, 3 * 10 ** e);
    for (let k = 1; k < 100; k++) xs.push(k / 100);
    for (let e = -2; e >= -12; e -= 0.5) xs.push(1 - 10 ** e);
    let worst = 0;
    for (const x of xs) {
      if (!(x > 0 && x < 1)) continue;
      const got = (fn as (x: number) => number).call(density, x);
      const want = Math.log(density.valueJacobian(logit(x)));
      worst = Math.max(worst, relativeError(got, want));
      expect(relativeError(got, want)).toBeLessThan(1e-13);
    }
    expect(worst).toBeLessThan(1e-13);
  });
});

import fc from 'fast-check';
import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { PANEL_NODES, panelLogIntegral, tabulate } from '../../functions/stats/quadrature';
import { log1mExp, logAddExp } from '../../functions/stats/numeric';
import marginals from '../reference/conversion/conversion_marginals.json';
import { relativeErrorFloored as relativeError, thrownStatsError as thrown } from '../helpers/assertions';

const logit = { coordinate: 'logit' } as const;

describe('Beta tabulation against the values in shared/check-values.md', () => {
  it('pbeta(0.5, 8, 10) = 0.685470581054688 (R; Excel BETA.DIST(2, 8, 10, TRUE, 1, 3) = 0.6854706)', () => {
    const d = tabulate(betaWorkingDensity(8, 10), logit);
    expect(Math.abs(d.cdf(0.5) - 0.685470581054688)).toBeLessThan(1e-14);
  });

  it('dbeta(0.5, 8, 10) = 2 × 1.4837646 (Excel BETA.DIST(2, 8, 10, FALSE, 1, 3) on [1, 3])', () => {
    // R: dbeta(0.5, 8, 10) = 2.967529296875 exactly (a polynomial with a rational constant).
    const d = tabulate(betaWorkingDensity(8, 10), logit);
    expect(relativeError(d.density(0.5), 2.967529296875)).toBeLessThan(1e-13);
    expect(Math.abs(d.density(0.5) / 2 - 1.4837646)).toBeLessThan(1e-7);
  });

  it('BETA.INV(0.685470581, 8, 10, 1, 3) = 2 (Excel help): quantile(0.685470581) = 0.5', () => {
    const d = tabulate(betaWorkingDensity(8, 10), logit);
    expect(Math.abs(d.quantile(0.685470581) - 0.5)).toBeLessThan(1e-9);
  });

  it('pbeta(0.2, 8, 42) = 0.790882697830027 and pbeta(0.3, 0.5, 0.5) = 0.369010119565545 (R 4.2)', () => {
    expect(Math.abs(tabulate(betaWorkingDensity(8, 42)).cdf(0.2) - 0.790882697830027)).toBeLessThan(1e-14);
    expect(Math.abs(tabulate(betaWorkingDensity(0.5, 0.5)).cdf(0.3) - 0.369010119565545)).toBeLessThan(1e-14);
  });

  it('qbeta(0.9, 0.1, 10) = 0.0274696222960978 (R 4.2)', () => {
    expect(relativeError(tabulate(betaWorkingDensity(0.1, 10)).quantile(0.9), 0.0274696222960978)).toBeLessThan(1e-12);
  });

  it('cdf(0.05) of Beta(5e7 + 1, 9.5e8 + 1) is 0.49996527 (check-values.md, the billion-visitor case)', () => {
    const d = tabulate(betaWorkingDensity(5e7 + 1, 9.5e8 + 1), logit);
    expect(Math.abs(d.cdf(0.05) - 0.49996527)).toBeLessThan(1e-8);
  });
});

describe('Beta tabulation against mpmath (test/reference/conversion/conversion_marginals.json, 40 digits)', () => {
  // Points at the mode ± {0 … 30} standard deviations in logit, both tails, shapes 0.1 … 1e9.
  for (const c of marginals.cases) {
    it(`Beta(${c.a}, ${c.b}): cdf and sf relative to themselves, relative log density to 1e-12`, () => {
      const density = betaWorkingDensity(c.a, c.b);
      const d = tabulate(density, logit);
      // The smaller tail is accurate relative to itself: 1e-11 (far inside the 1e-6 the read-outs promise
      // for tails), the larger one to 1e-13 absolute. At a billion visitors the mode log(a/b) itself is
      // rounded by ~3e-16, i.e. 2e-12 standard deviations, which moves a 12-SD tail by ~2e-11 relative:
      // there the tolerance is 5e-11 relative and 2e-12 absolute.
      const huge = c.a + c.b > 1e8;
      const relative = huge ? 5e-11 : 1e-11;
      const absolute = huge ? 2e-12 : 1e-13;
      for (const p of c.points) {
        const cdf = Number(p.cdf);
        const sf = Number(p.sf);
        if (cdf <= 0.5) expect(relativeError(Math.exp(d.logCdfAt(p.z)), cdf)).toBeLessThan(relative);
        else expect(Math.abs(Math.exp(d.logCdfAt(p.z)) - cdf)).toBeLessThan(absolute);
        if (sf <= 0.5) expect(relativeError(Math.exp(d.logSfAt(p.z)), sf)).toBeLessThan(relative);
        else expect(Math.abs(Math.exp(d.logSfAt(p.z)) - sf)).toBeLessThan(absolute);
        // The relative log density, no log-gamma anywhere: exact to ~1e-12 of its size.
        const ld = Number(p.logDensityRelative);
        expect(Math.abs(density.logDensity(p.z) - ld)).toBeLessThan(1e-12 * Math.max(1, Math.abs(ld)));
        expect(relativeError(Math.exp(d.logDensityAt(p.z)), Number(p.zDensity))).toBeLessThan(relative);
      }
    });
  }
});

describe('the quadrature is converged', () => {
  it('halving every panel width changes tail probabilities by less than 1e-12 relative', () => {
    // The accuracy check the design asks for: the default rule against one with panels half as wide.
    // At a billion visitors the nodes themselves are rounded to ~3e-12 standard deviations (z ≈ −2.9 is
    // stored to 4e-16), which is ~1e-10 relative at a 1e-80 tail: tolerance 1e-9 there.
    for (const [a, b] of [
      [8, 10],
      [1, 2],
      [0.5, 0.5],
      [51, 951],
      [5e7 + 1, 9.5e8 + 1],
      [1, 1e9 + 1],
    ] as const) {
      const coarse = tabulate(betaWorkingDensity(a, b), logit);
      const fine = tabulate(betaWorkingDensity(a, b), {
        ...logit,
        curvatureWidth: 1,
        slopeWidth: 12,
        absoluteWidth: 0.75,
      });
      expect(fine.panelCount).toBeGreaterThan(coarse.panelCount);
      const tolerance = a + b > 1e8 ? 1e-9 : 1e-12;
      for (const p of [1e-80, 1e-30, 1e-8, 0.01, 0.3, 0.5, 0.8, 0.999]) {
        const z = fine.workingQuantile(p);
        expect(relativeError(Math.exp(coarse.logCdfAt(z)), p)).toBeLessThan(tolerance);
        const zu = fine.workingQuantileUpper(p);
        expect(relativeError(Math.exp(coarse.logSfAt(zu)), p)).toBeLessThan(tolerance);
      }
      expect(Math.abs(coarse.logNormaliser - fine.logNormaliser)).toBeLessThan(a + b > 1e8 ? 1e-12 : 1e-14);
    }
  });
});

describe('identities of one tabulated distribution', () => {
  it('quantile inverts cdf to the last representable z for p from 1e-90 to 1 − 1e-15 (fast-check)', () => {
    // cdf(quantile(p)) = p up to the resolution of z itself: p lies between the cdf two ulps either
    // side of the computed quantile (with 1e-13 relative slack). At 2e6 visitors one ulp of z moves a
    // 10-SD tail by ~4e-11 relative, so a fixed relative tolerance would test the double format.
    const ulp = (z: number) => Math.max(Number.MIN_VALUE, Math.abs(z) * Number.EPSILON);
    fc.assert(
      fc.property(
        fc.double({ min: 0.05, max: 2e6, noNaN: true }),
        fc.double({ min: 0.05, max: 2e6, noNaN: true }),
        fc.double({ min: -90, max: -1e-15, noNaN: true }),
        (a, b, logP) => {
          const d = tabulate(betaWorkingDensity(a, b), logit);
          const p = Math.pow(10, logP);
          const lower = p <= 0.5;
          const z = d.workingQuantile(p);
          const tail = (v: number) => (lower ? Math.exp(d.logCdfAt(v)) : Math.exp(d.logSfAt(v)));
          const target = lower ? p : 1 - p;
          const [below, above] = lower
            ? [tail(z - 2 * ulp(z)), tail(z + 2 * ulp(z))]
            : [tail(z + 2 * ulp(z)), tail(z - 2 * ulp(z))];
          return below * (1 - 1e-13) <= target * (1 + 1e-15) && target <= above * (1 + 1e-13);
        },
      ),
      { numRuns: 100, seed: 20261201 },
    );
  });

  it('F + (1 − F) = 1 to 1e-15 at every node and the mean is the exact mean a/(a + b)', () => {
    const d = tabulate(betaWorkingDensity(12, 30), logit);
    for (let p = 0; p < d.panelCount; p++) {
      const { logCdf, logSf } = d.panelCdfTables(p);
      for (let k = 0; k < logCdf.length; k++) {
        expect(Math.abs(Math.exp(logCdf[k] as number) + Math.exp(logSf[k] as number) - 1)).toBeLessThan(2e-15);
      }
    }
    expect(d.mean).toBe(12 / 42);
  });

  it('the lower partial moment E[(x − X)^+] matches x − mean + E[(X − x)^+] and the uniform closed form', () => {
    // Beta(1, 1) is uniform on [0, 1]: E[(x − X)^+] = x²/2 (elementary).
    const u = tabulate(betaWorkingDensity(1, 1), logit);
    for (const x of [1e-9, 0.01, 0.3, 0.5, 0.9, 0.999]) {
      expect(relativeError(Math.exp(u.logLowerMoment(x)), (x * x) / 2)).toBeLessThan(1e-12);
    }
    // Far in the upper tail of Beta(40, 60) the moment is x − mean to 1e-15 (the upper remainder is < 1e-30).
    const d = tabulate(betaWorkingDensity(40, 60), logit);
    expect(Math.abs(Math.exp(d.logLowerMoment(0.9)) - (0.9 - 0.4))).toBeLessThan(1e-15);
  });

  it('is deterministic: the same density gives bit-identical tables', () => {
    const a = tabulate(betaWorkingDensity(37, 1234), logit);
    const b = tabulate(betaWorkingDensity(37, 1234), logit);
    expect(Array.from(b.nodeLogDensity)).toEqual(Array.from(a.nodeLogDensity));
    expect(b.quantile(0.025)).toBe(a.quantile(0.025));
  });
});

describe('helpers and errors', () => {
  it('logAddExp, log1mExp and panelLogIntegral on values with closed forms', () => {
    expect(logAddExp(Math.log(1), Math.log(3))).toBeCloseTo(Math.log(4), 15);
    expect(logAddExp(-Infinity, 2)).toBe(2);
    expect(log1mExp(Math.log(0.25))).toBeCloseTo(Math.log(0.75), 15);
    // log(1 − e^−1e-20) = log(1e-20) to full precision (Mächler 2012's reason for the two branches).
    expect(relativeError(log1mExp(-1e-20), Math.log(1e-20))).toBeLessThan(1e-15);
    // ∫_{−1}^{1} e^{12t} dt = (e^12 − e^−12)/12: the trend-weighted rule is exact for exponentials.
    const values = Array.from({ length: 16 }, (_, k) => 12 * (PANEL_NODES[k] as number));
    expect(relativeError(panelLogIntegral(values, 0, 1), Math.log((Math.exp(12) - Math.exp(-12)) / 12))).toBeLessThan(
      1e-15,
    );
  });

  it('rejects a probability outside (0, 1) with a clear message', () => {
    const d = tabulate(betaWorkingDensity(2, 3));
    const error = thrown(() => d.quantile(1));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe('a probability must be strictly between 0 and 1, not 1');
  });

  it('rejects Beta shapes that are not positive', () => {
    const error = thrown(() => betaWorkingDensity(0, 3));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe('the Beta shape a must be a finite number > 0, not 0');
  });
});

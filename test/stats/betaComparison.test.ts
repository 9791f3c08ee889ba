import fc from 'fast-check';
import { CLOSED_FORM_MAX_LOG_BETA, closedFormLogProbGreater } from '../../functions/stats/betaComparison';
import { probabilityGreater } from '../../functions/stats/compare';
import { posteriorOf } from '../../functions/stats/conversion';
import { logBeta } from '../../functions/stats/special/gamma';
import reference from '../reference/conversion/beta_comparison.json';
import { relativeError, thrownStatsError } from '../helpers/assertions';

/*
 * Reference values: test/reference/conversion/beta_comparison.json, printed by test/reference/conversion/beta_comparison.py
 * (mpmath 1.3.0 at 40 digits; whole-number shapes by the binomial form of the incomplete beta summed
 * term by term, the others by mpmath.quad with betainc; neither is Miller's sum).
 */

/** The larger |log B| of the first term of the sum over aY (the arrangement's accuracy measure). */
function firstTermLogBeta(aY: number, bY: number, aX: number, bX: number): number {
  return Math.max(Math.abs(logBeta(aX, bX + bY)), Math.abs(logBeta(aX, bX)));
}

type Shapes = [number, number, number, number];

/** True when a sum over `n` terms with these shapes is within the term limit and the accuracy bound. */
function sumApplies(n: number, shapes: Shapes, maxTerms: number): boolean {
  return Number.isInteger(n) && n <= maxTerms && firstTermLogBeta(...shapes) <= CLOSED_FORM_MAX_LOG_BETA;
}

/** A direct sum for P(Y > X) applies: over aY, or mirrored over bX. */
function directApplies(aY: number, bY: number, aX: number, bX: number, maxTerms: number): boolean {
  return sumApplies(aY, [aY, bY, aX, bX], maxTerms) || sumApplies(bX, [bX, aX, bY, aY], maxTerms);
}

/** A sum for the complement P(X > Y) applies: over aX, or mirrored over bY. */
function complementApplies(aY: number, bY: number, aX: number, bX: number, maxTerms: number): boolean {
  return directApplies(aX, bX, aY, bY, maxTerms);
}

describe('closedFormLogProbGreater against mpmath (beta_comparison.py, 40 digits)', () => {
  const cases = reference.cases.map((c) => [c.why, c] as const);

  it.each(cases)('%s', (_why, c) => {
    const log = closedFormLogProbGreater(c.aY, c.bY, c.aX, c.bX, 20000);
    const p = Number(c.p);
    const logP = Number(c.logP);
    const direct = directApplies(c.aY, c.bY, c.aX, c.bX, 20000);
    const complement = complementApplies(c.aY, c.bY, c.aX, c.bX, 20000) && p >= 1e-3;
    if (!direct && !complement) {
      expect(log).toBeUndefined();
      return;
    }
    expect(log).toBeDefined();
    // The bound keeps the result within 1e-12 relative (betaComparison.ts CLOSED_FORM_MAX_LOG_BETA).
    expect(relativeError(Math.exp(log as number), p)).toBeLessThan(1e-12);
    expect(Math.abs((log as number) - logP)).toBeLessThan(1e-12 * Math.max(1, Math.abs(logP)) + 1e-12);
  });

  it('the labelled cases get no closed form: past the bound, P below 1e-3 by a complement, no whole shape', () => {
    const none = reference.cases.filter((c) => /past the bound|below 1e-3|no whole-number/.test(c.why));
    expect(none.length).toBe(3);
    for (const c of none) expect(closedFormLogProbGreater(c.aY, c.bY, c.aX, c.bX, 20000)).toBeUndefined();
  });

  it("gives Miller's worked example 521/646 (Evan Miller 2015) and its mirror 125/646", () => {
    expect(relativeError(Math.exp(closedFormLogProbGreater(6, 6, 4, 8, 100) as number), 521 / 646)).toBeLessThan(1e-14);
    expect(relativeError(Math.exp(closedFormLogProbGreater(4, 8, 6, 6, 100) as number), 125 / 646)).toBeLessThan(1e-14);
  });

  it('keeps a tail of 6e-199 relative to itself (mpmath, the 1e-200 case)', () => {
    const c = reference.cases.find((r) => r.why === 'tail near 1e-200');
    expect(c).toBeDefined();
    const log = closedFormLogProbGreater(c!.aY, c!.bY, c!.aX, c!.bX, 20000) as number;
    expect(Math.exp(log)).toBeLessThan(1e-198);
    expect(relativeError(Math.exp(log), Number(c!.p))).toBeLessThan(1e-12);
  });

  it('the reference cases near the bound lie on either side of it', () => {
    const near = reference.cases.filter((c) => c.why.includes('near the bound'));
    const past = reference.cases.filter((c) => c.why.includes('past the bound'));
    expect(near.length).toBeGreaterThan(0);
    expect(past.length).toBeGreaterThan(0);
    for (const c of near)
      expect(firstTermLogBeta(c.aY, c.bY, c.aX, c.bX)).toBeGreaterThan(0.9 * CLOSED_FORM_MAX_LOG_BETA);
    for (const c of past) {
      expect(firstTermLogBeta(c.aY, c.bY, c.aX, c.bX)).toBeGreaterThan(CLOSED_FORM_MAX_LOG_BETA);
      expect(firstTermLogBeta(c.bX, c.aX, c.bY, c.aY)).toBeGreaterThan(CLOSED_FORM_MAX_LOG_BETA);
    }
  });
});

describe('closedFormLogProbGreater: when it gives no value', () => {
  it('returns undefined without a whole-number shape (mpmath case "no whole-number shape")', () => {
    expect(closedFormLogProbGreater(6.5, 5.5, 4.5, 8.5, 20000)).toBeUndefined();
  });

  it('returns undefined when every whole-number sum is longer than maxTerms', () => {
    // Miller's example has sums of 6 (aY), 8 (bX), 4 (aX) and 8 (bY) terms.
    expect(closedFormLogProbGreater(6, 6, 4, 8, 3)).toBeUndefined();
    expect(closedFormLogProbGreater(6, 6, 4, 8, 4)).toBeDefined(); // the complement over aX: P = 0.806… ≥ 1e-3
    expect(closedFormLogProbGreater(6.5, 6.5, 4.5, 8, 7)).toBeUndefined();
    expect(closedFormLogProbGreater(6.5, 6.5, 4.5, 8, 8)).toBeDefined();
    expect(closedFormLogProbGreater(20001, 20001, 20001, 20001.5, 20000)).toBeUndefined();
  });

  it('uses a complement sum only for a result of at least 1e-3 (mpmath cases)', () => {
    const kept = reference.cases.find((c) => c.why === 'only aX whole: the complement sum');
    const refused = reference.cases.find((c) => c.why.includes('below 1e-3'));
    expect(Number(kept!.p)).toBeGreaterThan(1e-3);
    expect(Number(refused!.p)).toBeLessThan(1e-3);
    expect(
      relativeError(
        Math.exp(closedFormLogProbGreater(kept!.aY, kept!.bY, kept!.aX, kept!.bX, 20000) as number),
        Number(kept!.p),
      ),
    ).toBeLessThan(1e-12);
    expect(closedFormLogProbGreater(refused!.aY, refused!.bY, refused!.aX, refused!.bX, 20000)).toBeUndefined();
  });

  it('rejects shapes that are not finite and positive, and a bad maxTerms', () => {
    expect(thrownStatsError(() => closedFormLogProbGreater(0, 1, 1, 1, 10)).message).toBe(
      'the shape aY must be a finite number greater than 0, not 0',
    );
    expect(thrownStatsError(() => closedFormLogProbGreater(1, 1, 1, NaN, 10)).message).toBe(
      'the shape bX must be a finite number greater than 0, not NaN',
    );
    expect(thrownStatsError(() => closedFormLogProbGreater(1, 1, 1, 1, 2.5)).message).toBe(
      'the largest number of terms must be a whole number of at least 0, not 2.5',
    );
  });
});

describe('closedFormLogProbGreater against the quadrature of compare/ (fast-check, seeded)', () => {
  // Posterior shapes of random counts: 1 + conversions, 1 + misses (whole numbers).
  const posterior = fc
    .tuple(fc.integer({ min: 1, max: 5000 }), fc.double({ min: 0, max: 1, noNaN: true }))
    .map(([visitors, share]) => {
      const conversions = Math.round(share * visitors);
      return { conversions, visitors, a: 1 + conversions, b: 1 + visitors - conversions };
    });

  it('agrees to 1e-12 absolute and 1e-9 relative, and P(Y > X) + P(X > Y) = 1', () => {
    fc.assert(
      fc.property(posterior, posterior, (y, x) => {
        const log = closedFormLogProbGreater(y.a, y.b, x.a, x.b, 20000);
        const back = closedFormLogProbGreater(x.a, x.b, y.a, y.b, 20000);
        const dy = posteriorOf(y);
        const dx = posteriorOf(x);
        const q = probabilityGreater(dy, dx);
        const qBack = probabilityGreater(dx, dy); // the smaller of the two is integrated directly
        const agrees = (l: number | undefined, expected: number, direct: boolean, complement: boolean): boolean => {
          // Undefined only when no direct sum applies and a complement sum either does not or would give
          // a result below 1e-3 (the quadrature's value, itself within 1e-12 of the truth).
          if (l === undefined) return !direct && (!complement || expected < 1e-3 + 1e-12);
          const p = Math.exp(l);
          return Math.abs(p - expected) <= 1e-12 && Math.abs(p - expected) <= 1e-9 * expected;
        };
        const ok =
          agrees(log, q, directApplies(y.a, y.b, x.a, x.b, 20000), complementApplies(y.a, y.b, x.a, x.b, 20000)) &&
          agrees(back, qBack, directApplies(x.a, x.b, y.a, y.b, 20000), complementApplies(x.a, x.b, y.a, y.b, 20000));
        return ok && (log === undefined || back === undefined || Math.abs(Math.exp(log) + Math.exp(back) - 1) <= 1e-12);
      }),
      { numRuns: 60, seed: 2015 },
    );
  });
});

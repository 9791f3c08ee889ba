/**
 * Counts per exposure (functions/stats/eventRates.ts) against outside references:
 * test/reference/events/events_reference.py → events_values.json (scipy.stats.gamma, scipy.special.betainc and
 * betaincinv, scipy.integrate.quad at epsrel 1e-13, optimize.brentq; and 50-digit mpmath for the
 * two-variant probability and the closed-form expected loss). The scenario numbers are invented
 * (a garden-supply shop's store visits per user-day).
 */
import reference from '../reference/events/events_values.json';
import extremeRatio from '../reference/events/events_extreme_ratio.json';
import {
  eventsExpectedLoss,
  eventsLiftInterval,
  eventsProbAboveControl,
  eventsProbHighest,
  eventsRateInterval,
} from '../../functions/stats/eventRates';
import { FLAT_GAMMA_PRIOR } from '../../functions/stats/types';
import type { EventCounts, GammaPrior } from '../../functions/stats/types';
import { expectProbability, expectStatsErrorExact } from '../helpers/assertions';

interface Case {
  name: string;
  variants: EventCounts[];
  prior: GammaPrior;
  intervals: Record<string, number[][]>;
  liftIntervals: Record<string, number[][]>;
  liftIntervalsClosedForm: Record<string, number[][]>;
  probAboveControl: number[];
  probBelowControl: number[];
  probAboveControlQuad: number[];
  probHighest: number[];
  expectedLoss: number[];
}

const cases = reference.cases as unknown as Case[];
const byName = (name: string): Case => {
  const found = cases.find((c) => c.name === name);
  if (found === undefined) throw new Error(`no reference case ${name}`);
  return found;
};

/** Posterior mean rate of each variant: (shape + events)/(rate + exposure). */
const means = (c: Case): number[] => c.variants.map((v) => (c.prior.shape + v.events) / (c.prior.rate + v.exposure));

describe.each(cases.map((c) => [c.name, c]))('eventRates against scipy/mpmath: %s', (_name, kase) => {
  const c = kase as Case;
  const scale = Math.max(...means(c));

  test('rate intervals match scipy.stats.gamma.ppf/isf to 1e-12 relative', () => {
    for (const [level, rows] of Object.entries(c.intervals)) {
      const got = eventsRateInterval(c.variants, Number(level), c.prior);
      rows.forEach(([lower = NaN, upper = NaN], i) => {
        expect(Math.abs((got[i]?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-12 * lower + 1e-300);
        expect(Math.abs((got[i]?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-12 * upper);
      });
    }
  });

  test('P(above control) matches scipy.special.betainc (closed form) and scipy quadrature', () => {
    const got = eventsProbAboveControl(c.variants, c.prior);
    c.probAboveControl.forEach((want, i) => {
      expectProbability(got[i] ?? NaN, want);
      // scipy.integrate.quad of ∫ f_i F_0, independent of the closed form.
      expect(Math.abs((got[i] ?? NaN) - (c.probAboveControlQuad[i] ?? NaN))).toBeLessThanOrEqual(1e-11);
    });
  });

  test('P(below control) in the lower tail keeps relative accuracy (swap the pair)', () => {
    c.probBelowControl.forEach((want, i) => {
      const control = c.variants[0] as EventCounts;
      const challenger = c.variants[i + 1] as EventCounts;
      const [below = NaN] = eventsProbAboveControl([challenger, control], c.prior);
      expectProbability(below, want);
      const [above = NaN] = eventsProbAboveControl([control, challenger], c.prior);
      // Identity: P(A > B) + P(B > A) = 1 (ties have probability 0).
      expect(Math.abs(above + below - 1)).toBeLessThanOrEqual(1e-12);
    });
  });

  test('P(highest) matches scipy quadrature (and, for two variants, scipy.special.betainc); sums to 1', () => {
    const got = eventsProbHighest(c.variants, c.prior);
    // scipy.special.gammainc jumps by ~1e-8 relative inside the lower tail at shape 1e9 (QUADPACK reports
    // "extremely bad integrand behavior" there), so the quadrature reference of billion_events is only
    // good to ~2e-9; its two-variant closed form (Boost's ibeta) is checked to 1e-12 below instead.
    const quadratureSlack = c.name === 'billion_events' ? 3e-9 : 0;
    c.probHighest.forEach((want, i) => {
      if (quadratureSlack > 0) expect(Math.abs((got[i] ?? NaN) - want)).toBeLessThanOrEqual(quadratureSlack);
      else expectProbability(got[i] ?? NaN, want);
    });
    if (c.variants.length === 2) {
      expect(Math.abs((got[0] ?? NaN) - (c.probBelowControl[0] ?? NaN))).toBeLessThanOrEqual(1e-12);
      expect(Math.abs((got[1] ?? NaN) - (c.probAboveControl[0] ?? NaN))).toBeLessThanOrEqual(1e-12);
    }
    expect(Math.abs(got.reduce((s, p) => s + p, 0) - 1)).toBeLessThanOrEqual(1e-12);
  });

  test('lift intervals match quadrature of ∫ f_0(x) F_i(r x) dx with brentq (scipy) to 1e-9', () => {
    for (const [level, rows] of Object.entries(c.liftIntervals)) {
      const got = eventsLiftInterval(c.variants, Number(level), c.prior);
      rows.forEach((row, i) => {
        const g = got[i];
        const [lower = NaN, median = NaN, upper = NaN] = row;
        expect(Math.abs((g?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-9);
        expect(Math.abs((g?.median ?? NaN) - median)).toBeLessThanOrEqual(1e-9);
        expect(Math.abs((g?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-9);
        // And the F-distribution closed form through scipy.special.betaincinv, to 1e-12.
        const closed = c.liftIntervalsClosedForm[level]?.[i] ?? [];
        expect(Math.abs((g?.median ?? NaN) - (closed[1] ?? NaN))).toBeLessThanOrEqual(
          1e-12 * Math.max(1, Math.abs(median)),
        );
      });
    }
  });

  test('expected losses match scipy quadrature to 1e-9 of the rate scale; differences are mean differences', () => {
    const got = eventsExpectedLoss(c.variants, c.prior);
    c.expectedLoss.forEach((want, i) => {
      expect(Math.abs((got[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-9 * scale);
    });
    // Identity: loss_i − loss_j = mean_j − mean_i, to 1e-12 of the rate scale.
    const m = means(c);
    for (let i = 1; i < got.length; i++) {
      const lhs = (got[i] ?? NaN) - (got[0] ?? NaN);
      const rhs = (m[0] ?? NaN) - (m[i] ?? NaN);
      expect(Math.abs(lhs - rhs)).toBeLessThanOrEqual(1e-12 * scale);
    }
  });
});

describe('eventRates against 50-digit mpmath', () => {
  const checks = reference.mpmath as unknown as Record<string, { probAboveControl: number; expectedLoss: number[] }>;
  test.each(Object.entries(checks))('%s', (name, check) => {
    const c = byName(name);
    // mpmath: quad of the Beta density in logit space (I_z(a_A, a_B) with z = b_A/(b_A + b_B)).
    const [p = NaN] = eventsProbAboveControl(c.variants, c.prior);
    expect(Math.abs(p - check.probAboveControl)).toBeLessThanOrEqual(1e-13);
    // mpmath: E[(λ_B − λ_A)+] = m_B I_z(a_A, a_B + 1) − m_A I_z(a_A + 1, a_B) at 50 digits (no cancellation there).
    const loss = eventsExpectedLoss(c.variants, c.prior);
    const scale = Math.max(...means(c));
    check.expectedLoss.forEach((want, i) =>
      expect(Math.abs((loss[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-10 * scale),
    );
  });
});

describe('eventRates at an exposure ratio of 4e-14 (a fuzzer finding)', () => {
  // mpmath betainc at 50 digits (events_extreme_ratio.py): both probabilities, summing to 1 within 1e-40.
  // Formed from 1 − z as a double, the smaller one was 2e-6 too large and the pair summed to 1.000002.
  it('gives both P(highest) within 1e-15 of mpmath, summing to 1', () => {
    const variants = extremeRatio.events.map((events, i) => ({ events, exposure: extremeRatio.exposure[i] as number }));
    const values = eventsProbHighest(variants, { shape: extremeRatio.priorShape, rate: 0 });
    values.forEach((v, i) => expect(Math.abs(v - (extremeRatio.probHighest[i] as number))).toBeLessThanOrEqual(1e-15));
    expect(Math.abs((values[0] as number) + (values[1] as number) - 1)).toBeLessThanOrEqual(2e-16);
  });
});

describe('eventRates: worked example and defaults', () => {
  test('default level and prior are 0.95 and Gamma(1, 0)', () => {
    const c = byName('visits_1e2');
    expect(eventsRateInterval(c.variants)).toEqual(eventsRateInterval(c.variants, 0.95, FLAT_GAMMA_PRIOR));
    expect(eventsLiftInterval(c.variants)).toEqual(eventsLiftInterval(c.variants, 0.95, FLAT_GAMMA_PRIOR));
    expect(eventsProbHighest(c.variants)).toEqual(eventsProbHighest(c.variants, FLAT_GAMMA_PRIOR));
  });

  test('zero events with the flat prior is an exponential posterior: interval ends −log(1 − p)/exposure', () => {
    // Gamma(1, b) is Exponential(b): closed form, common practice.
    const [interval] = eventsRateInterval([{ events: 0, exposure: 500 }], 0.9);
    expect(interval?.lower).toBeCloseTo(-Math.log1p(-0.05) / 500, 15);
    expect(interval?.upper).toBeCloseTo(-Math.log(0.05) / 500, 15);
  });

  test('deterministic: the same inputs give identical outputs', () => {
    const c = byName('twenty');
    expect(eventsProbHighest(c.variants, c.prior)).toEqual(eventsProbHighest(c.variants, c.prior));
    expect(eventsExpectedLoss(c.variants, c.prior)).toEqual(eventsExpectedLoss(c.variants, c.prior));
  });
});

describe('eventRates: bad input gets a clear error', () => {
  const ok: EventCounts[] = [
    { events: 3, exposure: 10 },
    { events: 4, exposure: 10 },
  ];
  test.each([
    [[{ events: -1, exposure: 10 }, ok[1]], 'events, item 1: -1 is below 0; events must be 0 or more'],
    [[ok[0], { events: 2.5, exposure: 10 }], 'events, item 2: 2.5 is not a whole number'],
    [[ok[0], { events: 2, exposure: 0 }], 'exposure, item 2: 0 is not allowed; exposure must be greater than 0'],
    [[ok[0], { events: NaN, exposure: 1 }], 'events, item 2: NaN is not a number'],
    [[ok[0]], 'at least 2 variants are needed (the first is the control), got 1'],
  ])('%j', (variants, message) => {
    expectStatsErrorExact(
      () => eventsProbAboveControl(variants as EventCounts[], FLAT_GAMMA_PRIOR),
      'invalid_argument',
      message,
    );
  });

  test('more than 50 variants', () => {
    const many = Array.from({ length: 51 }, () => ({ events: 1, exposure: 1 }));
    expectStatsErrorExact(() => eventsProbHighest(many), 'invalid_argument', 'at most 50 variants are allowed, got 51');
  });

  test('bad prior and level', () => {
    expectStatsErrorExact(
      () => eventsRateInterval(ok, 0.95, { shape: 0, rate: 0 }),
      'invalid_argument',
      "prior_shape: 0 is not allowed; the prior's shape must be a number greater than 0",
    );
    expectStatsErrorExact(
      () => eventsLiftInterval(ok, 0.95, { shape: 1, rate: -1 }),
      'invalid_argument',
      "prior_rate: -1 is not allowed; the prior's rate must be a number of at least 0",
    );
    expectStatsErrorExact(
      () => eventsLiftInterval(ok, 1),
      'invalid_argument',
      'level: 1 is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)',
    );
  });
});

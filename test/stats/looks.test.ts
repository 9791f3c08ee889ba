import {
  crossingWithLooks,
  falseAlarmWithLooks,
  powerWithLooks,
  thresholdForLooks,
  thresholdForLooksDetails,
} from '../../functions/stats/looks';
import { decisionPower } from '../../functions/stats/planning';
import { normalQuantile } from '../../functions/stats/special/normal';
import { thrownStatsError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';

const UNIFORM = { alpha: 1, beta: 1 };
const spaced = (k: number, step: number): number[] => Array.from({ length: k }, (_, i) => (i + 1) * step);

interface ExactCase {
  rate: number;
  lift: number;
  looks: number[];
  threshold: number;
  sides: number;
  prior?: number[];
  probability: number;
  byLook: number[];
}
const exact = values.exact as ExactCase[];
const priorOf = (c: ExactCase): { alpha: number; beta: number } =>
  c.prior === undefined ? UNIFORM : { alpha: c.prior[0] as number, beta: c.prior[1] as number };
const label = (c: ExactCase): string =>
  `rate ${c.rate}, lift ${c.lift}, looks ${c.looks.length} to ${c.looks.at(-1)}, threshold ${c.threshold}, ` +
  `${c.sides} side${c.sides === 2 ? 's' : ''}${c.prior ? `, prior Beta(${c.prior.join(', ')})` : ''}`;

describe("looks against the exact enumeration over both variants' outcomes (scipy, looks_reference.py exact)", () => {
  // scipy: a dynamic programme over (x_A, x_B) with scipy.stats.binom pmfs, the read-out's decision at every
  // look from Evan Miller's closed form (or scipy quad for a fractional prior), each boundary by bisection.
  it.each(exact.map((c) => [label(c), c] as const))('%s', (_label, c) => {
    const prior = priorOf(c);
    const sides = c.sides as 1 | 2;
    const result =
      c.lift === 0
        ? falseAlarmWithLooks(c.rate, c.looks, c.threshold, sides, prior)
        : powerWithLooks(c.rate, c.lift, c.looks, c.threshold, prior);
    // The issue's bar: within 1e-3 of the exact enumeration. The exact method meets it to rounding: both
    // sides add thousands of floating-point terms in different orders (measured agreement 5e-12 at worst).
    if (result.method === 'exact') {
      expect(Math.abs(result.probability - c.probability)).toBeLessThan(1e-10);
      result.byLook.forEach((p, k) => expect(Math.abs(p - c.byLook[k]!)).toBeLessThan(1e-10));
    } else {
      expect(Math.abs(result.probability - c.probability)).toBeLessThan(1e-3);
    }
  });

  it("uses the exact method for the issue's smallest tests (2–10 looks of 50–500 visitors at 1–5%)", () => {
    const small = exact.filter((c) => c.rate <= 0.05 && c.looks.length <= 10 && c.looks.at(-1)! <= 1000);
    expect(small.length).toBeGreaterThan(10);
    for (const c of small) {
      expect(
        crossingWithLooks(c.rate, c.rate * (1 + c.lift), c.looks, c.threshold, c.sides as 1 | 2, priorOf(c)).method,
      ).toBe('exact');
    }
  });

  it('the calibrated normal method alone is within 1e-3 of the exact enumeration once n·p·(1 − p) ≥ 80 at the last look', () => {
    // Where the choice by work uses it, and beyond: the measured error falls like 1/(n p (1 − p)).
    const large = exact.filter((c) => c.looks.at(-1)! * c.rate * (1 - c.rate) >= 80);
    expect(large.length).toBeGreaterThan(15);
    for (const c of large) {
      const normal = crossingWithLooks(
        c.rate,
        c.rate * (1 + c.lift),
        c.looks,
        c.threshold,
        c.sides as 1 | 2,
        priorOf(c),
        'normal',
      );
      expect(Math.abs(normal.probability - c.probability)).toBeLessThan(1e-3);
    }
  });
});

describe('looks in the normal limit (large looks, equally spaced)', () => {
  // Large looks of a 5% rate: each look's own false-alarm rate is within ~1e-6 of 1 − threshold, so the
  // rates approach the repeated-significance-test values of the normal limit.
  const big = (k: number): number[] => spaced(k, 1e6);

  it.each(values.normal.twoSided196.map((c) => [c.looks, c] as const))(
    '%p looks, two-sided at 0.975 (|z| ≥ 1.96): scipy multivariate normal and Jennison & Turnbull Table 1.1',
    (K, c) => {
      const got = falseAlarmWithLooks(0.05, big(K), 0.975, 2).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(1e-4);
      const published = { 2: 0.083, 3: 0.107, 4: 0.126, 5: 0.142, 10: 0.193, 20: 0.248 }[K as 2]; // three decimals
      expect(Math.abs(got - published)).toBeLessThan(0.0005 + 1e-4);
    },
  );

  it.each(values.normal.oneSided1645.map((c) => [c.looks, c] as const))(
    '%p looks, one-sided at 0.95: scipy multivariate normal (issue #14 measured 0.080, 0.130, 0.172, 0.215)',
    (K, c) => {
      const got = falseAlarmWithLooks(0.05, big(K), 0.95, 1).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(1e-4);
    },
  );

  it.each(values.normal.pocock.map((c) => [c.looks, c] as const))(
    "%p looks: THRESHOLD_FOR_LOOKS(…, 0.05, 2) is Φ(Pocock's z) (Pocock 1977; scipy root of the multivariate normal)",
    (K, c) => {
      const t = thresholdForLooks(0.05, big(K), 0.05, 2);
      expect(Math.abs(normalQuantile(t) - c.z)).toBeLessThan(2e-4 + c.spread);
      const pocock = { 2: 2.178, 3: 2.289, 4: 2.361, 5: 2.413, 10: 2.555 }[K as 2]; // three decimals
      expect(Math.abs(normalQuantile(t) - pocock)).toBeLessThan(0.0005 + 2e-4);
    },
  );
});

describe('looks: properties', () => {
  it('one look is DECISION_POWER (exact and normal methods)', () => {
    for (const [p, lift, n, t, prior] of [
      [0.1, 0.2, 3000, 0.95, UNIFORM],
      [0.05, 0, 200, 0.9, { alpha: 0.5, beta: 0.5 }],
      [0.3, 0.05, 200000, 0.975, UNIFORM],
    ] as const) {
      const want = decisionPower(p, lift, n, t, prior);
      for (const method of ['exact', 'normal'] as const) {
        if (method === 'exact' && n > 10000) continue;
        const got = crossingWithLooks(p, p * (1 + lift), [n], t, 1, prior, method).probability;
        expect(Math.abs(got - want)).toBeLessThan(1e-11);
      }
    }
  });

  it('more looks, more false alarms; two sides at a threshold t are at least one side', () => {
    const one = falseAlarmWithLooks(0.1, [1000]).probability;
    const five = falseAlarmWithLooks(0.1, spaced(5, 200)).probability;
    const ten = falseAlarmWithLooks(0.1, spaced(10, 100)).probability;
    expect(five).toBeGreaterThan(one);
    expect(ten).toBeGreaterThan(five);
    expect(falseAlarmWithLooks(0.1, spaced(5, 200), 0.95, 2).probability).toBeGreaterThan(five);
  });

  it('looks a visitor apart at a million visitors add little to one look (the normal method joins close looks)', () => {
    // 100 looks spanning 1e-4 of their size: in the normal limit 0.0507 (scipy, looks_close.py: 5 such looks
    // 0.05057); Simpson's rule alone on the integration grid answered 1 here.
    const looks = Array.from({ length: 100 }, (_, i) => 1e6 + i);
    const many = crossingWithLooks(0.5, 0.5, looks, 0.95, 1, UNIFORM, 'normal');
    const one = decisionPower(0.5, 0, 1e6, 0.95);
    expect(many.probability).toBeGreaterThan(one);
    expect(many.probability).toBeLessThan(one + 0.002);
    const auto = falseAlarmWithLooks(0.5, looks, 0.95, 2);
    expect(auto.method).toBe('normal');
    expect(auto.probability).toBeLessThan(2 * one + 0.004);
  });

  it('two sides at a threshold just above ½ declare for certain within a few looks (normal method; fuzz seed 7)', () => {
    // From a few looks on each side alone declares half the time or more, so the two together declare
    // for certain (no region is left between the bounds); this answered an internal message once.
    const looks = Array.from({ length: 10 }, (_, i) => 69522 * (i + 1));
    const r = falseAlarmWithLooks(0.003828007706476486, looks, 0.5000000000000001, 2);
    expect(r.method).toBe('normal');
    expect(r.probability).toBe(1);
    expect(Math.abs(r.byLook.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-10);
  });

  it('POWER_WITH_LOOKS with lift 0 is the one-sided false-alarm rate', () => {
    const a = powerWithLooks(0.04, 0, spaced(4, 500));
    const b = falseAlarmWithLooks(0.04, spaced(4, 500));
    expect(a.probability).toBe(b.probability);
  });

  it('the first declarations by look add up to the total', () => {
    for (const method of ['exact', 'normal'] as const) {
      const r = crossingWithLooks(0.1, 0.12, spaced(6, 300), 0.95, 1, UNIFORM, method);
      expect(Math.abs(r.byLook.reduce((s, v) => s + v, 0) - r.probability)).toBeLessThan(1e-12);
    }
  });

  it.each([
    [0.05, spaced(5, 100), 0.05, 1],
    [0.05, spaced(10, 200), 0.05, 2],
    [0.3, spaced(3, 20), 0.05, 2],
    [0.02, spaced(30, 300), 0.05, 1],
    [0.1, spaced(20, 50000), 0.01, 2],
  ] as const)(
    'THRESHOLD_FOR_LOOKS keeps FALSE_ALARM_WITH_LOOKS at or below the target (rate %p, %p looks)',
    (p, looks, alpha, sides) => {
      const d = thresholdForLooksDetails(p, looks, alpha, sides);
      expect(falseAlarmWithLooks(p, looks, d.threshold, sides).probability).toBeLessThanOrEqual(alpha);
      expect(falseAlarmWithLooks(p, looks, d.below, sides).probability).toBeGreaterThan(alpha);
      expect(d.below).toBeLessThan(d.threshold);
      // The smallest such threshold: within 1e-4 on the probit scale, or a step of the exact rate apart.
      const gap = normalQuantile(d.threshold) - normalQuantile(d.below);
      if (d.method === 'normal') expect(gap).toBeLessThanOrEqual(1e-4 + 1e-12);
      expect(thresholdForLooks(p, looks, alpha, sides)).toBe(d.threshold);
    },
  );

  it('THRESHOLD_FOR_LOOKS at a one-in-a-million false alarm on 100 looks of 1 to 100 visitors (fuzz seed 2)', () => {
    // The normal limit's start on a rough grid met continuation regions beyond its reach here (an internal
    // error once); the answer must still keep the exact rate at or below the target.
    const looks = Array.from({ length: 100 }, (_, i) => i + 1);
    const prior = { alpha: 0.001, beta: 1e6 };
    const d = thresholdForLooksDetails(0.0013201712008310295, looks, 1e-6, 2, prior);
    expect(d.method).toBe('exact');
    expect(falseAlarmWithLooks(0.0013201712008310295, looks, d.threshold, 2, prior).probability).toBeLessThanOrEqual(
      1e-6,
    );
  });

  it('with one look the threshold is the one DECISION_POWER needs for the same false alarm', () => {
    const d = thresholdForLooksDetails(0.1, [5000], 0.05, 1);
    expect(decisionPower(0.1, 0, 5000, d.threshold)).toBeLessThanOrEqual(0.05);
    expect(decisionPower(0.1, 0, 5000, d.below)).toBeGreaterThan(0.05);
  });
});

describe('looks input checks', () => {
  it.each([
    [() => falseAlarmWithLooks(0, [100]), 'the baseline rate must be between 0 and 1 (exclusive), got 0'],
    [() => falseAlarmWithLooks(0.1, []), 'there must be 1 to 100 looks, got 0'],
    [() => falseAlarmWithLooks(0.1, spaced(101, 10)), 'there must be 1 to 100 looks, got 101'],
    [
      () => falseAlarmWithLooks(0.1, [100, 100]),
      'look 2: 100 visitors is not more than the 100 of look 1 (the counts are cumulative)',
    ],
    [() => falseAlarmWithLooks(0.1, [100, 150.5]), 'look 2: 150.5 is not a whole number of visitors'],
    [() => falseAlarmWithLooks(0.1, [0, 10]), 'look 1: 0 visitors is outside 1 to 1000000000'],
    [() => falseAlarmWithLooks(0.1, [100], 0.5), 'the threshold must be above 0.5 and at most 0.999999, got 0.5'],
    [() => falseAlarmWithLooks(0.1, [100], 0.95, 3 as 1), 'sides must be 1 or 2, got 3'],
    [
      () => falseAlarmWithLooks(0.1, [100], 0.95, 1, { alpha: 0, beta: 1 }),
      'prior_alpha and prior_beta must each be between 0.001 and 10000000 for planning, got 0 and 1',
    ],
    [() => powerWithLooks(0.6, 1, [100]), 'baseline rate × (1 + lift) must be between 0 and 1, got 1.2'],
    [() => powerWithLooks(0.1, -1, [100]), 'the lift must be a number greater than -1, got -1'],
    [() => thresholdForLooks(0.1, [100], 0.7), 'the false-alarm rate must be between 0.000001 and 0.5, got 0.7'],
  ])('%#', (run, message) => {
    const error = thrownStatsError(run);
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });

  it('refuses looks too large for the work budget, naming the argument', () => {
    const error = thrownStatsError(() => falseAlarmWithLooks(0.5, spaced(100, 1e7)));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toMatch(
      /^visitors_at_looks: these looks are too many and too large to plan within the time a worksheet function may take \(about \d+(\.\d+)? million steps of work; at most 6 million\)/,
    );
  });

  it('says when no threshold keeps the false alarm that low', () => {
    const error = thrownStatsError(() => thresholdForLooks(0.3, spaced(50, 100000), 1e-6, 2));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      'false_alarm 0.000001: even the threshold 0.999999 gives a false-alarm rate above it with these looks',
    );
  });
});

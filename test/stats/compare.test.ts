import fc from 'fast-check';
import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import {
  differenceCdf,
  differenceDensity,
  differenceQuantile,
  differenceSf,
  expectedLosses,
  highestProbabilities,
  highestProbabilityIntegrals,
  logProbabilityGreater,
  probabilityGreater,
  ratioCdf,
  ratioDensity,
  ratioQuantile,
  ratioSf,
} from '../../functions/stats/compare';
import { TabulatedDistribution, tabulate } from '../../functions/stats/quadrature';
import { relativeErrorFloored as relativeError, thrownStatsError as thrown } from '../helpers/assertions';

/** A Beta(a, b) posterior tabulated in logit. */
function beta(a: number, b: number, coordinate: string | undefined = 'logit'): TabulatedDistribution {
  return tabulate(betaWorkingDensity(a, b), coordinate === undefined ? {} : { coordinate });
}

// ----- exact rationals (BigInt) for the closed forms -------------------------------------------------

interface Fraction {
  readonly n: bigint;
  readonly d: bigint;
}

function gcd(a: bigint, b: bigint): bigint {
  let x = a < 0n ? -a : a;
  let y = b < 0n ? -b : b;
  while (y !== 0n) [x, y] = [y, x % y];
  return x;
}

function fraction(n: bigint, d: bigint): Fraction {
  const g = gcd(n, d);
  return d < 0n ? { n: -n / g, d: -d / g } : { n: n / g, d: d / g };
}

const add = (a: Fraction, b: Fraction) => fraction(a.n * b.d + b.n * a.d, a.d * b.d);
const sub = (a: Fraction, b: Fraction) => fraction(a.n * b.d - b.n * a.d, a.d * b.d);
const mul = (a: Fraction, b: Fraction) => fraction(a.n * b.n, a.d * b.d);
const div = (a: Fraction, b: Fraction) => fraction(a.n * b.d, a.d * b.n);

function toNumber(f: Fraction): number {
  // 30 significant digits by BigInt division, scaled by the size of the quotient (values down to 1e-300).
  const shift = f.d.toString().length - f.n.toString().length + 30;
  const q = shift >= 0 ? (f.n * 10n ** BigInt(shift)) / f.d : f.n / (f.d * 10n ** BigInt(-shift));
  return Number(`${q}e-${shift}`);
}

function factorial(k: number): bigint {
  let r = 1n;
  for (let i = 2; i <= k; i++) r *= BigInt(i);
  return r;
}

/** The Beta function of positive integers, (x − 1)!(y − 1)!/(x + y − 1)!. */
function betaFunction(x: number, y: number): Fraction {
  return fraction(factorial(x - 1) * factorial(y - 1), factorial(x + y - 1));
}

/**
 * P(p_B > p_A) for p_A ~ Beta(aA, bA), p_B ~ Beta(aB, bB), integer aB: Evan Miller, "Formulas for
 * Bayesian A/B Testing" (2015): Σ_{i<aB} B(aA + i, bA + bB) / ((bB + i) B(1 + i, bB) B(aA, bA)).
 */
function evanMiller(aA: number, bA: number, aB: number, bB: number): Fraction {
  let sum: Fraction = { n: 0n, d: 1n };
  for (let i = 0; i < aB; i++) {
    const term = div(
      betaFunction(aA + i, bA + bB),
      mul(mul(fraction(BigInt(bB + i), 1n), betaFunction(1 + i, bB)), betaFunction(aA, bA)),
    );
    sum = add(sum, term);
  }
  return sum;
}

/**
 * E[max(p_B − p_A, 0)] = m_B h(aA, bA, aB + 1, bB) − m_A h(aA + 1, bA, aB, bB) (C. Stucchio, "Bayesian A/B
 * Testing at VWO", 2015), with h the probability above: exact in rationals here, so its cancellation
 * does not matter.
 */
function stucchioLoss(aA: number, bA: number, aB: number, bB: number): Fraction {
  const mA = fraction(BigInt(aA), BigInt(aA + bA));
  const mB = fraction(BigInt(aB), BigInt(aB + bB));
  return sub(mul(mB, evanMiller(aA, bA, aB + 1, bB)), mul(mA, evanMiller(aA + 1, bA, aB, bB)));
}

// ------------------------------------------------------------------------------------------------------

describe('probabilityGreater against exact closed forms', () => {
  it('Beta(6, 6) above Beta(4, 8) is exactly 521/646 (Evan Miller 2015; shared/check-values.md)', () => {
    const exact = evanMiller(4, 8, 6, 6);
    expect(exact).toEqual({ n: 521n, d: 646n });
    expect(Math.abs(probabilityGreater(beta(6, 6), beta(4, 8)) - 521 / 646)).toBeLessThan(1e-13);
    expect(Math.abs(probabilityGreater(beta(4, 8), beta(6, 6)) - 125 / 646)).toBeLessThan(1e-13);
  });

  // Integer shapes of posteriors with a uniform prior: conversions + 1, failures + 1.
  const cases: [number, number, number, number][] = [
    [1, 2, 2, 1], // 1 visitor each: control 0 of 1, challenger 1 of 1
    [11, 91, 16, 86], // 10/100 against 15/100
    [31, 271, 41, 261], // 30/300 against 40/300
    [1, 1001, 4, 998], // 0/1000 against 3/1000
    [101, 901, 131, 871],
    [3, 40, 200, 5], // far apart: P(A > B) ~ 1e-60
  ];
  for (const [aA, bA, aB, bB] of cases) {
    it(`Beta(${aB}, ${bB}) above Beta(${aA}, ${bA}) matches the exact rational sum (Evan Miller 2015)`, () => {
      const exact = toNumber(evanMiller(aA, bA, aB, bB));
      const complement = toNumber(evanMiller(aB, bB, aA, bA)); // P(A > B) by the same formula
      const up = probabilityGreater(beta(aB, bB), beta(aA, bA));
      const down = probabilityGreater(beta(aA, bA), beta(aB, bB));
      expect(Math.abs(up - exact)).toBeLessThan(1e-13);
      expect(relativeError(down, complement)).toBeLessThan(1e-11);
      expect(up + down).toBe(1);
    });
  }
});

describe('expectedLosses against Stucchio’s closed form (exact rationals)', () => {
  const cases: [number, number, number, number][] = [
    [4, 8, 6, 6],
    [11, 91, 16, 86],
    [31, 271, 41, 261],
    [1, 1001, 4, 998],
    [3, 40, 60, 5], // loss of the better one is ~1e-40: relative accuracy in the far tail
  ];
  for (const [aA, bA, aB, bB] of cases) {
    it(`Beta(${aA}, ${bA}) against Beta(${aB}, ${bB})`, () => {
      const lossA = toNumber(stucchioLoss(aA, bA, aB, bB)); // E[max(pB − pA, 0)]
      const lossB = toNumber(stucchioLoss(aB, bB, aA, bA)); // E[max(pA − pB, 0)]
      const [a, b] = expectedLosses([beta(aA, bA), beta(aB, bB)]) as [number, number];
      expect(relativeError(a, lossA)).toBeLessThan(1e-11);
      expect(relativeError(b, lossB)).toBeLessThan(1e-9);
    });
  }
});

describe('closed forms of differences and ratios of uniforms (elementary)', () => {
  const u1 = beta(1, 1);
  const u2 = beta(1, 1);
  it('Y − X of two uniforms is triangular: P(D ≤ d) = 1 − (1 − d)²/2 for d ≥ 0, density 1 − |d|', () => {
    for (const d of [0, 0.1, 0.5, 0.9, 0.999]) {
      expect(Math.abs(differenceCdf(u2, u1, d) - (1 - (1 - d) ** 2 / 2))).toBeLessThan(1e-13);
      expect(relativeError(differenceSf(u2, u1, d), (1 - d) ** 2 / 2)).toBeLessThan(1e-11);
      expect(Math.abs(differenceDensity(u2, u1, d) - (1 - d))).toBeLessThan(1e-12);
    }
    expect(Math.abs(differenceQuantile(u2, u1, 0.9) - (1 - Math.sqrt(0.2)))).toBeLessThan(1e-13);
  });

  it('Y/X of two uniforms: P(Y/X ≤ t) = t/2 (t ≤ 1), 1 − 1/(2t) (t ≥ 1); density 1/2, 1/(2t²)', () => {
    for (const t of [0.1, 0.5, 1, 2, 10]) {
      const cdf = t <= 1 ? t / 2 : 1 - 1 / (2 * t);
      expect(Math.abs(ratioCdf(u2, u1, t - 1) - cdf)).toBeLessThan(1e-13);
      expect(Math.abs(ratioSf(u2, u1, t - 1) - (1 - cdf))).toBeLessThan(1e-13);
      const density = t <= 1 ? 0.5 : 1 / (2 * t * t);
      if (t !== 1) expect(relativeError(ratioDensity(u2, u1, t - 1), density)).toBeLessThan(1e-11);
    }
    expect(Math.abs(ratioQuantile(u2, u1, 0.9) - 4)).toBeLessThan(1e-12);
  });
});

describe('identities (fast-check over posteriors from 0 … 1e6 visitors)', () => {
  const counts = fc
    .tuple(fc.integer({ min: 1, max: 1_000_000 }), fc.double({ min: 0, max: 1, noNaN: true }))
    .map(([visitors, rate]) => {
      const conversions = Math.min(visitors, Math.round(rate * rate * visitors));
      return { a: 1 + conversions, b: 1 + visitors - conversions };
    });

  it('P(X > Y) + P(Y > X) = 1 and log P is consistent', () => {
    fc.assert(
      fc.property(counts, counts, (x, y) => {
        const dx = beta(x.a, x.b);
        const dy = beta(y.a, y.b);
        const up = probabilityGreater(dx, dy);
        const down = probabilityGreater(dy, dx);
        return Math.abs(up + down - 1) <= 1e-15 && relativeError(Math.exp(logProbabilityGreater(dx, dy)), up) < 1e-14;
      }),
      { numRuns: 30, seed: 11 },
    );
  });

  it('P(highest) sums to 1 (raw integrals within 1e-10 before normalising) and loss_i − loss_j = mean_j − mean_i', () => {
    fc.assert(
      fc.property(fc.array(counts, { minLength: 2, maxLength: 5 }), (vs) => {
        const ds = vs.map((v) => beta(v.a, v.b));
        const raw = highestProbabilityIntegrals(ds);
        const rawSum = raw.reduce((s, v) => s + v, 0);
        const p = highestProbabilities(ds);
        const sum = p.reduce((s, v) => s + v, 0);
        const losses = expectedLosses(ds);
        const identity = losses.every(
          (l, i) =>
            Math.abs(
              l -
                (losses[0] as number) -
                ((ds[0] as TabulatedDistribution).mean - (ds[i] as TabulatedDistribution).mean),
            ) < 1e-12,
        );
        return Math.abs(rawSum - 1) < 1e-10 && Math.abs(sum - 1) < 1e-12 && identity;
      }),
      { numRuns: 12, seed: 12 },
    );
  });

  it('more conversions for B never lower P(B beats A)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 100_000 }),
        fc.integer({ min: 0, max: 99_999 }),
        fc.integer({ min: 0, max: 100_000 }),
        (n, c, cA) => {
          const conv = Math.min(c, n - 1);
          const control = beta(1 + Math.min(cA, n), 1 + n - Math.min(cA, n));
          const before = probabilityGreater(beta(1 + conv, 1 + n - conv), control);
          const after = probabilityGreater(beta(2 + conv, n - conv), control);
          return after >= before;
        },
      ),
      { numRuns: 25, seed: 13 },
    );
  });

  it('difference and ratio quantiles invert their cdfs: cdf(quantile(p)) = p to 1e-12', () => {
    // Up to the resolution of the returned number: p must lie between the cdf two ulps either side of the
    // quantile, with 1e-12 relative slack (a lift of −0.9999985 is only known to 1e-16/1.5e-6 ≈ 7e-11 of
    // 1 + lift, which moves its cdf by as much).
    const ulp = (v: number) => Math.max(Number.MIN_VALUE, Math.abs(v) * Number.EPSILON);
    const brackets = (tail: (v: number) => number, v: number, target: number, increasing: boolean) => {
      const [lo, hi] = increasing
        ? [tail(v - 2 * ulp(v)), tail(v + 2 * ulp(v))]
        : [tail(v + 2 * ulp(v)), tail(v - 2 * ulp(v))];
      return lo * (1 - 1e-12) <= target && target <= hi * (1 + 1e-12);
    };
    fc.assert(
      fc.property(counts, counts, fc.constantFrom(1e-6, 0.025, 0.3, 0.5, 0.8, 0.975, 1 - 1e-6), (x, y, p) => {
        const dx = beta(x.a, x.b);
        const dy = beta(y.a, y.b);
        const d = differenceQuantile(dy, dx, p);
        const m = ratioQuantile(dy, dx, p);
        if (p <= 0.5) {
          return (
            brackets((v) => differenceCdf(dy, dx, v), d, p, true) && brackets((v) => ratioCdf(dy, dx, v), m, p, true)
          );
        }
        return (
          brackets((v) => differenceSf(dy, dx, v), d, 1 - p, false) &&
          brackets((v) => ratioSf(dy, dx, v), m, 1 - p, false)
        );
      }),
      { numRuns: 15, seed: 14 },
    );
  });

  it('the difference and ratio densities are the derivatives of their cdfs (central differences)', () => {
    const x = beta(51, 951);
    const y = beta(66, 936);
    for (const d of [-0.01, 0.005, 0.015, 0.04]) {
      const h = 1e-5;
      const numeric = (differenceCdf(y, x, d + h) - differenceCdf(y, x, d - h)) / (2 * h);
      expect(relativeError(differenceDensity(y, x, d), numeric)).toBeLessThan(1e-6);
    }
    for (const m of [-0.2, 0.1, 0.3, 1]) {
      const h = 1e-5;
      const numeric = (ratioCdf(y, x, m + h) - ratioCdf(y, x, m - h)) / (2 * h);
      expect(relativeError(ratioDensity(y, x, m), numeric)).toBeLessThan(1e-6);
    }
  });
});

describe('edge cases', () => {
  it('identical posteriors give exactly equal P(highest) = 1/k, for k = 2, 3, 7 and 50', () => {
    for (const k of [2, 3, 7, 50]) {
      const ds = Array.from({ length: k }, () => beta(13, 988));
      const p = highestProbabilities(ds);
      for (const v of p) expect(v).toBe(p[0]);
      expect(Math.abs((p[0] as number) - 1 / k)).toBeLessThan(1e-14);
      if (k <= 7) {
        const losses = expectedLosses(ds);
        for (const l of losses) expect(relativeError(l, losses[0] as number)).toBeLessThan(1e-14);
      }
    }
  });

  it('one table listed twice (variants with equal counts share it) gives what two separate tables give', () => {
    // Exchangeability (common practice): P(X > Y) = 1/2 for two independent draws of one continuous
    // distribution; the shared-table shortcut must agree with the quadrature on separate tables.
    const shared = beta(13, 988);
    const other = beta(17, 984);
    expect(probabilityGreater(shared, shared)).toBe(0.5);
    expect(Math.abs(probabilityGreater(beta(13, 988), beta(13, 988)) - 0.5)).toBeLessThan(1e-14);
    const once = highestProbabilities([shared, other, shared]);
    const separate = highestProbabilities([beta(13, 988), other, beta(13, 988)]);
    expect(once[0]).toBe(once[2]);
    for (let i = 0; i < 3; i++) expect(Math.abs((once[i] as number) - (separate[i] as number))).toBeLessThan(1e-14);
  });

  it('50 different posteriors: P(highest) sums to 1, the raw integrals within 1e-10', () => {
    const ds = Array.from({ length: 50 }, (_, i) => beta(1 + 50 + i, 1 + 950 - i));
    const raw = highestProbabilityIntegrals(ds);
    expect(Math.abs(raw.reduce((s, v) => s + v, 0) - 1)).toBeLessThan(1e-10);
    expect(Math.abs(highestProbabilities(ds).reduce((s, v) => s + v, 0) - 1)).toBeLessThan(1e-12);
  });

  it('gives the same answers through the value (no shared coordinate) as through logit, to 1e-13', () => {
    const pairs: [number, number][] = [
      [11, 91],
      [16, 86],
    ];
    const [x, y] = pairs.map(([a, b]) => beta(a, b)) as [TabulatedDistribution, TabulatedDistribution];
    const [vx, vy] = pairs.map(([a, b]) => beta(a, b, undefined)) as [TabulatedDistribution, TabulatedDistribution];
    expect(Math.abs(probabilityGreater(vy, vx) - probabilityGreater(y, x))).toBeLessThan(1e-13);
    const lv = expectedLosses([vx, vy]);
    const l = expectedLosses([x, y]);
    expect(relativeError(lv[0] as number, l[0] as number)).toBeLessThan(1e-12);
  });

  it('rejects a ratio lift of −1 or less and a probability outside (0, 1)', () => {
    const x = beta(3, 5);
    const e1 = thrown(() => ratioCdf(x, x, -1));
    expect(e1.code).toBe('invalid_argument');
    expect(e1.message).toBe('a relative lift must be a finite number greater than -1, not -1');
    const e2 = thrown(() => differenceQuantile(x, x, 0));
    expect(e2.code).toBe('invalid_argument');
    expect(e2.message).toBe('a probability must be strictly between 0 and 1, not 0');
  });
});

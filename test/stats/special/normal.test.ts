/**
 * Standard normal Φ, Φ⁻¹ and log φ against mpmath 1.2 (ncdf and findroot at 40 digits;
 * test/reference/special/special_reference.py → special_values.json).
 */
import { normalCdf, normalLogDensity, normalQuantile } from '../../../functions/stats/special/normal';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument, relativeErrorOrAbsoluteAtZero } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('normalCdf against mpmath ncdf', () => {
  it.each(rows('normalCdf').map((r) => [r[0], r[1]] as const))('Φ(%p)', (x, truth) => {
    // Cody's approximation: relative 1e-15 level in the lower tail down to 1e-300; absolute above ½
    expect(relativeErrorOrAbsoluteAtZero(normalCdf(x), truth)).toBeLessThanOrEqual(1e-14);
  });
  it('gives the upper tail directly as Φ(−x)', () => {
    // 1 − Φ(8) = 6.22096057427178e-16 (mpmath ncdf(-8))
    const tail = rows('normalCdf').find((r) => r[0] === -8);
    expect(relativeErrorOrAbsoluteAtZero(normalCdf(-8), (tail as Row)[1] as number)).toBeLessThan(1e-14);
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalCdf(-40)).toBe(0); // below the smallest double
  });
});

describe('normalQuantile against mpmath (root of ncdf)', () => {
  it.each(rows('normalQuantile').map((r) => [r[0], r[1]] as const))('Φ⁻¹(%p)', (p, truth) => {
    // AS 241: about 1e-16 relative; 4e-16 allowed here
    expect(Math.abs(normalQuantile(p) - truth)).toBeLessThanOrEqual(8e-16 * Math.abs(truth) + 1e-30);
  });
  it('round-trips with normalCdf in the lower tail, to 1e-14 plus the condition z²·ε', () => {
    // one rounding of z moves log Φ by |z|·ulp(z) ≈ z²·ε (2.6e-13 at p = 1e-300, where z = −37)
    for (const p of [1e-300, 1e-200, 1e-50, 1e-10, 0.01, 0.3, 0.5]) {
      const z = normalQuantile(p);
      expect(relativeErrorOrAbsoluteAtZero(normalCdf(z), p)).toBeLessThan(1e-14 + 2 * z * z * Number.EPSILON);
    }
  });
  it('has the exact limits and a common-practice value', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(0.5)).toBe(0);
    // 1.959963984540054: the 97.5 % point every statistics handbook tabulates as 1.96 (common practice)
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14);
  });
});

describe('normalLogDensity', () => {
  it('is −x²/2 − ½ log 2π (closed form)', () => {
    expect(normalLogDensity(0)).toBeCloseTo(-0.5 * Math.log(2 * Math.PI), 15);
    expect(normalLogDensity(3)).toBeCloseTo(-4.5 - 0.5 * Math.log(2 * Math.PI), 14);
    expect(normalLogDensity(Infinity)).toBe(-Infinity);
  });
});

describe('argument checks', () => {
  it('throws invalid_argument with a message', () => {
    expectInvalidArgument(() => normalCdf(Number.NaN), /normalCdf needs a number, got NaN/);
    expectInvalidArgument(() => normalQuantile(-0.1), /normalQuantile needs a probability between 0 and 1, got -0.1/);
    expectInvalidArgument(() => normalQuantile(Number.NaN), /normalQuantile needs a probability/);
    expectInvalidArgument(() => normalLogDensity(Number.NaN), /normalLogDensity needs a number/);
  });
});

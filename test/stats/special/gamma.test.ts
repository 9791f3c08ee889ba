/**
 * The gamma family against mpmath 1.2 (40 digits; 80 digits for the Stirling error, which cancels):
 * values in test/reference/special/special_values.json, made by test/reference/special_reference.py.
 */
import {
  binomialDeviance,
  digamma,
  logBeta,
  logGamma,
  pentagamma,
  stirlingError,
  tetragamma,
  trigamma,
} from '../../../functions/stats/special/gamma';
import polygammas from '../../reference/special/polygamma_values.json';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('logGamma against mpmath loggamma', () => {
  it.each(rows('logGamma').map((r) => [r[0], r[1]] as const))('log Γ(%p)', (x, truth) => {
    // relative 1e-15 (2 ulp-ish), absolute 2e-16 near the zeros at 1 and 2
    expect(Math.abs(logGamma(x) - truth)).toBeLessThanOrEqual(2e-15 * Math.abs(truth) + 2e-16);
  });
});

describe('stirlingError against mpmath (80 digits)', () => {
  it.each(rows('stirlingError').map((r) => [r[0], r[1]] as const))('δ(%p)', (x, truth) => {
    expect(Math.abs(stirlingError(x) - truth)).toBeLessThanOrEqual(1e-14 * Math.abs(truth) + 4e-15);
  });
  it('is exact at the tabulated half-integers (Loader 2000 / R stirlerr table)', () => {
    // δ(1) = 1 − ½ log 2π (from the definition with Γ(2) = 1); δ(0.5) = log Γ(1.5) − log 0.5 + 0.5 − ½ log 2π
    expect(Math.abs(stirlingError(1) - 0.08106146679532726)).toBeLessThanOrEqual(1.4e-17);
  });
});

describe('binomialDeviance against mpmath', () => {
  it.each(rows('binomialDeviance').map((r) => [r[0], r[1], r[2]] as const))('bd0(%p, %p)', (x, M, truth) => {
    expect(Math.abs(binomialDeviance(x, M) - truth)).toBeLessThanOrEqual(2e-15 * Math.abs(truth) + 1e-300);
  });
});

describe('logBeta against mpmath', () => {
  it.each(rows('logBeta').map((r) => [r[0], r[1], r[2]] as const))('log B(%p, %p)', (a, b, truth) => {
    expect(Math.abs(logBeta(a, b) - truth)).toBeLessThanOrEqual(4e-15 * Math.abs(truth) + 1e-15);
    expect(logBeta(b, a)).toBe(logBeta(a, b));
  });
});

describe('digamma and trigamma against mpmath psi', () => {
  it.each(rows('digamma').map((r) => [r[0], r[1]] as const))('ψ(%p)', (x, truth) => {
    expect(Math.abs(digamma(x) - truth)).toBeLessThanOrEqual(2e-15 * Math.abs(truth) + 2e-15);
  });
  it.each(rows('trigamma').map((r) => [r[0], r[1]] as const))('ψ′(%p)', (x, truth) => {
    expect(Math.abs(trigamma(x) - truth)).toBeLessThanOrEqual(4e-15 * Math.abs(truth));
  });
});

describe('tetragamma and pentagamma against mpmath psi(2, x) and psi(3, x)', () => {
  // Values: test/reference/special/polygamma_values.json, printed by test/reference/special/polygamma_reference.py
  // (mpmath, 40 digits). Tolerances: the first term the asymptotic series leaves out at x = 10, where
  // it takes over from the recurrence, relative to the value there: B₁₂·13/10¹⁴ / |ψ″(10)| = 3.0e-12
  // and B₁₂·13·14/10¹⁵ / ψ‴(10) = 2.0e-11 (Abramowitz & Stegun 6.4.11; B₁₂ = −691/2730). Far from
  // x = 10 the error is near rounding: checked at 1e-14 for x ≤ 0.5 and x ≥ 100.
  const near = (x: number): boolean => x > 0.5 && x < 100;
  it.each(polygammas.tetragamma.map((r) => [r[0] as number, r[1] as number] as const))('ψ″(%p)', (x, truth) => {
    expect(Math.abs(tetragamma(x) - truth)).toBeLessThanOrEqual((near(x) ? 3.0e-12 : 1e-14) * Math.abs(truth));
  });
  it.each(polygammas.pentagamma.map((r) => [r[0] as number, r[1] as number] as const))('ψ‴(%p)', (x, truth) => {
    expect(Math.abs(pentagamma(x) - truth)).toBeLessThanOrEqual((near(x) ? 2.0e-11 : 1e-14) * Math.abs(truth));
  });
});

describe('argument checks', () => {
  it('throws invalid_argument with the function name and value', () => {
    expectInvalidArgument(() => logGamma(0), /logGamma needs x > 0, got 0/);
    expectInvalidArgument(() => logGamma(Number.NaN), /logGamma needs x > 0, got NaN/);
    expectInvalidArgument(() => stirlingError(-1), /stirlingError needs x > 0, got -1/);
    expectInvalidArgument(() => binomialDeviance(-1, 2), /binomialDeviance needs x ≥ 0 and M > 0/);
    expectInvalidArgument(() => logBeta(1, 0), /logBeta needs a > 0 and b > 0, got 1, 0/);
    expectInvalidArgument(() => digamma(0), /digamma needs x > 0/);
    expectInvalidArgument(() => trigamma(-3), /trigamma needs x > 0/);
    expectInvalidArgument(() => tetragamma(0), /tetragamma needs x > 0, got 0/);
    expectInvalidArgument(() => pentagamma(Number.NaN), /pentagamma needs x > 0, got NaN/);
  });
});

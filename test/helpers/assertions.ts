/**
 * Small assertion and tolerance helpers shared by the test files. Not a suite itself (jest runs only
 * test/**\/*.test.ts). Each helper keeps the exact logic of the per-file copies it replaced; where those
 * copies differed in a way that matters (an absolute floor, a special case at zero, a fixed error code,
 * an exact versus a pattern message), the difference is a separate helper here, not merged away.
 */
import { StatsError } from '../../functions/stats/errors';

/**
 * Plain relative error |actual − expected| / |expected|. No special case: expected 0 gives Infinity or
 * NaN, so a check against an exact zero fails rather than passes silently.
 *
 * @example relativeError(1.000001, 1) // ≈ 1e-6
 */
export function relativeError(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected);
}

/**
 * Relative error with an absolute floor on the denominator: |actual − expected| / max(|expected|, 1e-300),
 * so an expected value of exactly zero gives |actual|·1e300 instead of Infinity or NaN.
 *
 * @example relativeErrorFloored(0, 0) // 0
 */
export function relativeErrorFloored(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300);
}

/**
 * Relative error that switches to absolute error when the expected value is exactly zero:
 * expected === 0 ? |actual| : |actual − expected| / |expected|.
 *
 * @example relativeErrorOrAbsoluteAtZero(1e-20, 0) // 1e-20
 */
export function relativeErrorOrAbsoluteAtZero(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}

/**
 * The 1e-9 bar on probabilities used by the read-out tests, with tails held to 1e-6 relative (and never
 * looser than 1e-9): |got − want| ≤ min(1e-9, 1e-12 + 1e-6·want + 1e-6·(1 − want)).
 */
export function expectProbability(got: number, want: number): void {
  expect(Math.abs(got - want)).toBeLessThanOrEqual(Math.min(1e-9, 1e-12 + 1e-6 * want + 1e-6 * (1 - want)));
}

/**
 * Runs `run` and returns the StatsError it threw. Any other thrown value is rethrown unchanged; if `run`
 * returns normally, throws Error('expected a StatsError'). The caller asserts on the code and message.
 */
export function thrownStatsError(run: () => unknown): StatsError {
  try {
    run();
  } catch (error) {
    if (error instanceof StatsError) return error;
    throw error;
  }
  throw new Error('expected a StatsError');
}

/**
 * Asserts that `run` throws a StatsError with exactly this `code` and exactly this `message` (toBe, not a
 * pattern). Fails if `run` returns normally or throws anything that is not a StatsError.
 */
export function expectStatsErrorExact(run: () => unknown, code: string, message: string): void {
  let caught: unknown;
  try {
    run();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(StatsError);
  expect((caught as StatsError).code).toBe(code);
  expect((caught as StatsError).message).toBe(message);
}

/**
 * Asserts that `run` throws a StatsError whose code is 'invalid_argument' and whose message matches the
 * pattern `message`. Fails if `run` returns normally (Error 'expected a StatsError') or throws anything
 * that is not a StatsError.
 */
export function expectInvalidArgument(run: () => unknown, message: RegExp): void {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(StatsError);
    expect((error as StatsError).code).toBe('invalid_argument');
    expect((error as StatsError).message).toMatch(message);
    return;
  }
  throw new Error('expected a StatsError');
}

/**
 * Runs `run` and returns the `code` and `message` of what it threw (worksheet errors carry both). With
 * `codeIfMissing`, a thrown value without a code (a raw Error) reports that text as its code, so a raw
 * failure shows up by name in a failed comparison; without it, the code is returned exactly as thrown.
 * If `run` returns normally, throws Error('expected a worksheet error').
 */
export function thrownWorksheetError(run: () => unknown, codeIfMissing?: string): { code: string; message: string } {
  try {
    run();
  } catch (e) {
    const err = e as { code?: string; message: string };
    return {
      code: codeIfMissing === undefined ? (err.code as string) : (err.code ?? codeIfMissing),
      message: err.message,
    };
  }
  throw new Error('expected a worksheet error');
}

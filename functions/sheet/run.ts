/**
 * The one place where failures become worksheet errors.
 *
 * - {@link ArgumentProblem} (found by the sheet layer) and a core `StatsError` with code
 *   `invalid_argument` become `#VALUE!` with their message.
 * - A core `StatsError` with code `not_available` becomes `#N/A` with its message.
 * - A core message that prints an infinity (a quantity overflowed) becomes `#N/A` with
 *   {@link BEYOND_CELL_MESSAGE}; one that prints NaN becomes the catch-all below. No NaN or Infinity reaches
 *   a cell's message.
 * - Anything else (a raw JavaScript error, a NaN) becomes `#VALUE!` with {@link CATCH_ALL_MESSAGE}, plain
 *   words with no code detail, so no raw error or NaN reaches a cell. Inside the declared domain (the
 *   argument rules of rules.ts) nothing reaches this branch: the fuzzer (npm run fuzz) reports every call
 *   that does.
 */
import { StatsError } from '../stats/errors';
import { ArgumentProblem } from './cells';
import { BEYOND_CELL_MESSAGE } from './spill';

/** The message of a failure the sheet layer did not foresee (no code detail reaches a cell). */
export const CATCH_ALL_MESSAGE =
  'could not compute this result for these inputs; check that every argument is within the range its help page gives';

/** Longest message shown in a cell's error tooltip; longer ones are cut with an ellipsis. */
const MAX_MESSAGE_LENGTH = 250;

function clip(message: string): string {
  return message.length <= MAX_MESSAGE_LENGTH ? message : `${message.slice(0, MAX_MESSAGE_LENGTH - 1)}…`;
}

/**
 * Maps any thrown value to the worksheet error Excel shows.
 *
 * Cost O(message length). Never throws.
 * @example toWorksheetError(new StatsError('not_available', 'no HDI')) // CustomFunctions.Error #N/A "no HDI"
 */
export function toWorksheetError(thrown: unknown): CustomFunctions.Error {
  if (thrown instanceof CustomFunctions.Error) return thrown;
  if (thrown instanceof ArgumentProblem) {
    return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, clip(thrown.message));
  }
  if (thrown instanceof StatsError) {
    // a core message that had to print an overflowed number: the answer is beyond what a cell holds
    if (/\bNaN\b/.test(thrown.message)) {
      return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, CATCH_ALL_MESSAGE);
    }
    if (/\bInfinity\b/.test(thrown.message)) {
      return new CustomFunctions.Error(CustomFunctions.ErrorCode.notAvailable, BEYOND_CELL_MESSAGE);
    }
    const code =
      thrown.code === 'not_available' ? CustomFunctions.ErrorCode.notAvailable : CustomFunctions.ErrorCode.invalidValue;
    return new CustomFunctions.Error(code, clip(thrown.message));
  }
  return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, CATCH_ALL_MESSAGE);
}

/**
 * Runs the body of a worksheet function and throws a `CustomFunctions.Error` if anything fails.
 *
 * Cost: that of `body`.
 * @throws {CustomFunctions.Error} `#VALUE!` or `#N/A` as described above.
 * @example runSheet(() => [[1]]) //=> [[1]]
 */
export function runSheet<T>(body: () => T): T {
  try {
    return body();
  } catch (thrown) {
    throw toWorksheetError(thrown);
  }
}

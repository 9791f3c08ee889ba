/**
 * The one place where failures become worksheet errors.
 *
 * - {@link ArgumentProblem} (found by the sheet layer) and a core `StatsError` with code
 *   `invalid_argument` become `#VALUE!` with their message.
 * - A core `StatsError` with code `not_available` becomes `#N/A` with its message.
 * - Anything else (a raw JavaScript error, a non-finite result) becomes `#VALUE!` with a message that says
 *   it is unexpected, so no raw error or NaN reaches a cell.
 */
import { StatsError } from '../stats/errors';
import { ArgumentProblem } from './cells';

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
    const code =
      thrown.code === 'not_available' ? CustomFunctions.ErrorCode.notAvailable : CustomFunctions.ErrorCode.invalidValue;
    return new CustomFunctions.Error(code, clip(thrown.message));
  }
  const detail = thrown instanceof Error ? thrown.message : String(thrown);
  return new CustomFunctions.Error(
    CustomFunctions.ErrorCode.invalidValue,
    clip(`unexpected problem while computing (please report it): ${detail}`),
  );
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

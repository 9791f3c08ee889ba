/**
 * The one failure convention of the statistics core.
 *
 * Every core function that cannot answer throws a {@link StatsError}; nothing returns NaN, null or
 * Infinity to signal failure. The sheet layer (functions/sheet/) maps the code to a worksheet error in
 * exactly one place: `invalid_argument` becomes `#VALUE!`, `not_available` becomes `#N/A`.
 */
export type StatsErrorCode =
  /** The input is outside what the function accepts (a count below zero, a level of 1, ...). */
  | 'invalid_argument'
  /** The input is fine but the asked-for quantity does not exist (an HDI of a U-shaped density, ...). */
  | 'not_available';

export class StatsError extends Error {
  override readonly name = 'StatsError';
  constructor(
    readonly code: StatsErrorCode,
    message: string,
  ) {
    super(message);
  }
}

/** Throws `invalid_argument` with `message` unless `condition` holds. */
export function ensure(condition: boolean, message: string): asserts condition {
  if (!condition) throw new StatsError('invalid_argument', message);
}

/**
 * The preview's stand-in for Excel's `CustomFunctions` runtime global: just enough for dist/functions.js
 * to register its functions (`CustomFunctions.associate`) and to throw worksheet errors
 * (`new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, message)`).
 *
 * Nothing here is module-level state: every call of {@link createCustomFunctionsStandIn} returns a fresh
 * object with its own registry, so the page, the headless test and a second workbook never share one.
 */

/** The error codes of Excel's `CustomFunctions.ErrorCode`, with the worksheet error each one shows. */
export const ERROR_CODES = Object.freeze({
  invalidValue: '#VALUE!',
  notAvailable: '#N/A',
  divisionByZero: '#DIV/0!',
  invalidNumber: '#NUM!',
  nullReference: '#NULL!',
  invalidName: '#NAME?',
  invalidReference: '#REF!',
});

/** A worksheet error text such as `#VALUE!`. */
export type WorksheetErrorText = (typeof ERROR_CODES)[keyof typeof ERROR_CODES];

/** The shape of a `CustomFunctions.Error` instance: a worksheet error code and a message. */
export interface CustomFunctionsErrorLike {
  readonly code: string;
  readonly message: string;
}

/** What {@link createCustomFunctionsStandIn} returns. */
export interface CustomFunctionsStandIn {
  /** The object to install as the `CustomFunctions` global before functions.js runs. */
  readonly api: {
    Error: new (code: string, message?: string) => Error & CustomFunctionsErrorLike;
    ErrorCode: typeof ERROR_CODES;
    associate(id: string | Record<string, unknown>, fn?: unknown): void;
  };
  /** Every function registered so far, by custom-function id. */
  readonly associations: Map<string, (...args: unknown[]) => unknown>;
}

/**
 * Makes a fresh `CustomFunctions` stand-in with its own registry of associated functions.
 *
 * Cost: O(1). Throws a TypeError from `associate` when something other than a function is associated,
 * as Excel's runtime refuses it too.
 *
 * @example
 * const host = createCustomFunctionsStandIn();
 * host.api.associate('TWICE', (x: number) => 2 * x);
 * host.associations.get('TWICE')?.(21); //=> 42
 */
export function createCustomFunctionsStandIn(): CustomFunctionsStandIn {
  const associations = new Map<string, (...args: unknown[]) => unknown>();
  class CustomFunctionsError extends Error implements CustomFunctionsErrorLike {
    readonly code: string;
    constructor(code: string, message?: string) {
      super(message ?? '');
      this.name = 'CustomFunctions.Error';
      this.code = code;
    }
  }
  const add = (id: string, fn: unknown): void => {
    if (typeof fn !== 'function') throw new TypeError(`CustomFunctions.associate: ${id} is not a function`);
    associations.set(id.toUpperCase(), fn as (...args: unknown[]) => unknown);
  };
  return {
    api: {
      Error: CustomFunctionsError,
      ErrorCode: ERROR_CODES,
      associate(id: string | Record<string, unknown>, fn?: unknown): void {
        if (typeof id === 'string') add(id, fn);
        else for (const [key, value] of Object.entries(id)) add(key, value);
      },
    },
    associations,
  };
}

/**
 * True when `error` looks like a `CustomFunctions.Error` (a string `code` that is a worksheet error text).
 * Works across realms (an error made in an iframe or a `vm` context fails `instanceof`).
 *
 * @example
 * isCustomFunctionsError({ code: '#VALUE!', message: 'visitors, item 3: 12.5 is not a whole number' }); //=> true
 */
export function isCustomFunctionsError(error: unknown): error is CustomFunctionsErrorLike {
  if (typeof error !== 'object' || error === null) return false;
  const code = (error as { code?: unknown }).code;
  return typeof code === 'string' && (Object.values(ERROR_CODES) as string[]).includes(code);
}

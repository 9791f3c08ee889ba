/**
 * Jest setup: Excel's runtime provides a `CustomFunctions` global that does not exist under node.
 * This stand-in mirrors the documented shape (CustomFunctions.Error with a code and a message,
 * CustomFunctions.ErrorCode, CustomFunctions.associate) so tests can assert on the exact error a
 * worksheet would show.
 */
class CustomFunctionsErrorStub extends Error {
  readonly code: string;
  constructor(code: string, message?: string) {
    super(message ?? '');
    this.name = 'CustomFunctions.Error';
    this.code = code;
  }
}

const errorCode = {
  invalidValue: '#VALUE!',
  notAvailable: '#N/A',
  divisionByZero: '#DIV/0!',
  invalidNumber: '#NUM!',
  nullReference: '#NULL!',
  invalidName: '#NAME?',
  invalidReference: '#REF!',
} as const;

const associations = new Map<string, unknown>();

(globalThis as Record<string, unknown>).CustomFunctions = {
  Error: CustomFunctionsErrorStub,
  ErrorCode: errorCode,
  associate(id: string | Record<string, unknown>, fn?: unknown) {
    if (typeof id === 'string') associations.set(id, fn);
    else for (const [key, value] of Object.entries(id)) associations.set(key, value);
  },
  __associations: associations,
};

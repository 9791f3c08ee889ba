/**
 * What a fuzzer child installs before it runs dist/functions.js: a `CustomFunctions` stand-in with the
 * documented shape (CustomFunctions.Error with a code and a message, CustomFunctions.ErrorCode,
 * CustomFunctions.associate), as the preview and the jest setup do, and an inert `Office`. Also the
 * decoding of the tagged cells the generator writes (an error value, a linked-data cell) into what the
 * functions receive.
 */
'use strict';

const ERROR_CODES = Object.freeze({
  invalidValue: '#VALUE!',
  notAvailable: '#N/A',
  divisionByZero: '#DIV/0!',
  invalidNumber: '#NUM!',
  nullReference: '#NULL!',
  invalidName: '#NAME?',
  invalidReference: '#REF!',
});

/** A fresh stand-in with its own registry: { api, associations }. */
function createStandIn() {
  const associations = new Map();
  class CustomFunctionsError extends Error {
    constructor(code, message) {
      super(message ?? '');
      this.name = 'CustomFunctions.Error';
      this.code = code;
    }
  }
  const add = (id, fn) => {
    if (typeof fn !== 'function') throw new TypeError(`CustomFunctions.associate: ${id} is not a function`);
    associations.set(String(id).toUpperCase(), fn);
  };
  const api = {
    Error: CustomFunctionsError,
    ErrorCode: ERROR_CODES,
    associate(id, fn) {
      if (typeof id === 'string') add(id, fn);
      else for (const [key, value] of Object.entries(id)) add(key, value);
    },
  };
  const office = {
    onReady: () => Promise.resolve({ host: 'Excel', platform: 'PC' }),
    actions: { associate: () => undefined },
  };
  return { api, office, associations };
}

/**
 * Turns the generator's tagged cells into the values a function receives: `{ $error: '#N/A' }` becomes a
 * CustomFunctions.Error, `{ $entity: v }` a linked-data cell `{ type, basicValue: v }`; arrays are copied.
 */
function decodeValue(value, api) {
  if (Array.isArray(value)) return value.map((item) => decodeValue(item, api));
  if (value !== null && typeof value === 'object') {
    if ('$error' in value) return new api.Error(value.$error);
    if ('$entity' in value) {
      const basic = value.$entity;
      return {
        type: 'Entity',
        text: String(basic),
        basicValue: basic,
        basicType: typeof basic === 'number' ? 'Double' : 'String',
      };
    }
  }
  return value;
}

module.exports = { ERROR_CODES, createStandIn, decodeValue };

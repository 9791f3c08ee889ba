/**
 * The worksheet functions of Lift Ledger (namespace ABTEST): the entry point of dist/functions.js.
 *
 * The wrappers live one family a file in functions/wrappers/ (the families of functions/catalogue.ts, in
 * its order); custom-functions-metadata reads those files (webpack.config.js, help/build.js) and appends
 * the CustomFunctions.associate calls to each. This module gathers them for the bundle, the tests and
 * the benchmark. A test (test/addin/catalogue.test.ts) fails when a family file is missing here.
 */
export * from './wrappers/conversion';
export * from './wrappers/prior';
export * from './wrappers/planning';
export * from './wrappers/looks';
export * from './wrappers/checking';
export * from './wrappers/means';
export * from './wrappers/events';
export * from './wrappers/revenue';

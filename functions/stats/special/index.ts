/** The special functions of the statistics core, re-exported in one place (see each file for methods). */
export * from './gamma';
export * from './incompleteBeta';
export * from './incompleteGamma';
export * from './normal';
export * from './studentT';
export * from './chiSquare';

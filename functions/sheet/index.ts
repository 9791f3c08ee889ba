/**
 * The sheet layer: cell ranges → checked numbers (declared argument rules) → core → spills, and the one
 * place where failures become worksheet errors. The wrappers (functions/wrappers/) use only this module,
 * the catalogue and the core.
 */
export * from './cells';
export * from './rules';
export * from './variants';
export * from './readers';
export * from './spill';
export * from './run';
export * from './decision';
export * from './labels';
export * from './entry';
export * from './args';
export * from './days';

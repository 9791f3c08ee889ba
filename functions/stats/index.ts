/**
 * The public surface of Lift Ledger's statistics core, one namespace per topic. The sheet layer and the
 * side panel may import from here or from the topic files directly; nothing here adds behaviour.
 *
 * @example
 * import { conversion, UNIFORM_PRIOR } from './stats';
 * conversion.probAboveControl([{ conversions: 120, visitors: 2400 }, { conversions: 150, visitors: 2380 }], UNIFORM_PRIOR);
 * //=> [0.97432195080106…] (mpmath quad of the two Betas: 0.97432195080105781)
 */
export * from './types';
export { StatsError } from './errors';
export type { StatsErrorCode } from './errors';
export * as conversion from './conversion';
export * as prior from './prior';
export * as planning from './planning';
export * as srm from './srm';
export * as normalMeans from './normalMeans';
export * as eventRates from './eventRates';
export * as compare from './compare';
export * as quadrature from './quadrature';
export * as special from './special';

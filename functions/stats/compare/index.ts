/**
 * Comparisons of tabulated posteriors (../quadrature), generic over the model, read top-down:
 *  - ranking.ts     P(X > Y) and P(each is highest) (sharedHighest.ts for 3+ posteriors in one coordinate);
 *  - losses.ts      expected losses (pruned integrals, or one grid shared by 3+ posteriors);
 *  - sharedGrid.ts  the grid those shared-coordinate integrals use;
 *  - difference.ts  the distribution of Y − X: tails, density, quantiles;
 *  - ratio.ts       the distribution of Y/X − 1: tails, density, quantiles (X > 0), and the quantiles
 *                   when X and Y may take either sign;
 *  - ratioGrid.ts   the density of Y/X − 1 on a whole grid of lifts (checked Chebyshev interpolation);
 *  - quantileSolver.ts  Newton on the log of the smaller tail, for both;
 *  - integrate.ts   the integrals all of them are made of: ∫ f_base Π factors over a base's panels,
 *                   pruned and refined, and the fused tail-and-density pass;
 *  - factors.ts     the factors of those integrals and the piece walk inside a panel.
 */
export {
  highestProbabilities,
  highestProbabilityIntegrals,
  logProbabilityGreater,
  mappedHighestProbabilities,
  probabilityGreater,
} from './ranking';
export type { CoordinateMap } from './sharedHighest';
export { expectedLosses, mappedExpectedLosses } from './losses';
export type { ValueFrame } from './losses';
export { differenceCdf, differenceDensity, differenceQuantile, differenceSf } from './difference';
export { ratioCdf, ratioDensity, ratioQuantile, ratioSf, signedRatioCdf, signedRatioQuantile } from './ratio';
export { ratioChartQuantiles, ratioDensityGrid } from './ratioGrid';
export type { LiftPair, LogDensityPiece } from './ratioGrid';
export type { QuantileOf } from './ratio';

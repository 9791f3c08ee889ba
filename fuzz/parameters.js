/**
 * What the function catalogue (functions/catalogue.ts) does not say and the fuzzer needs: which realistic
 * experiment generator fits a set of paired ranges, and what the values of each function's result mean,
 * for the value checks. Everything else — parameters, their declared rules, variant counts, spill shapes —
 * comes from the catalogue, so a new function is fuzzed without any edit here: its ranges are then
 * generated from their rules alone and its result gets the shape checks its spill implies.
 */
'use strict';

/**
 * Generators of realistic paired ranges (generate.js, FAMILIES), chosen by the names of a function's
 * range parameters; `history` when the function takes past results rather than variants.
 */
const DATA_FAMILIES = [
  { ranges: ['conversions', 'visitors'], family: 'conversion', pastResults: 'history' },
  { ranges: ['count', 'mean', 'sd'], family: 'means' },
  { ranges: ['events', 'exposure'], family: 'events' },
  { ranges: ['visitors'], family: 'split' },
];

/**
 * What the numbers of a result are, by function id: probability (in [0, 1]), sumToOne (probabilities adding
 * up to 1), rate (in [0, 1]), loss (≥ 0), positive (> 0), whole (a whole number ≥ 1); `min`/`max` bound every
 * number; `gridMin`/`gridMax` bound a density table's grid. Intervals need no entry: a spill of two values
 * per variant is lower ≤ upper, of three lower ≤ median ≤ upper (the catalogue's convention).
 */
const VALUES = {
  POSTERIOR_MEAN: { values: 'rate' },
  RATE_INTERVAL: { min: 0, max: 1 },
  PROB_HIGHEST: { values: 'sumToOne' },
  PROB_ABOVE_CONTROL: { values: 'probability' },
  LIFT_INTERVAL: { min: -1 },
  RATE_DIFF_INTERVAL: { min: -1, max: 1 },
  PROB_LIFT_ABOVE: { values: 'probability' },
  EXPECTED_LOSS: { values: 'loss', max: 1 },
  POSTERIOR_DENSITY: { gridMin: 0, gridMax: 1 },
  LIFT_DENSITY: { gridMin: -1 },
  PRIOR_FROM_MEAN: { values: 'positive' },
  PRIOR_FROM_INTERVAL: { values: 'positive' },
  PRIOR_FROM_HISTORY: { values: 'positive' },
  DECISION_POWER: { values: 'probability' },
  VISITORS_NEEDED: { values: 'whole' },
  CLASSIC_SAMPLE_SIZE: { values: 'whole' },
  SRM_PVALUE: { values: 'probability' },
  MEAN_PROB_HIGHEST: { values: 'sumToOne' },
  MEAN_PROB_ABOVE_CONTROL: { values: 'probability' },
  MEAN_EXPECTED_LOSS: { values: 'loss' },
  EVENTS_RATE_INTERVAL: { min: 0 },
  EVENTS_PROB_HIGHEST: { values: 'sumToOne' },
  EVENTS_PROB_ABOVE_CONTROL: { values: 'probability' },
  EVENTS_LIFT_INTERVAL: { min: -1 },
  EVENTS_EXPECTED_LOSS: { values: 'loss' },
  PROB_ABOVE_CONTROL_BY_DAY: { values: 'probability' },
  SRM_PVALUE_BY_DAY: { values: 'probability' },
  FALSE_ALARM_WITH_LOOKS: { values: 'probability' },
  POWER_WITH_LOOKS: { values: 'probability' },
  THRESHOLD_FOR_LOOKS: { values: 'probability' },
};

/**
 * Lists that hold one value per column of the function's day tables (the catalogue's `planned_shares` of
 * SRM_PVALUE_BY_DAY: "one per column"); another count is refused naming the list.
 */
const PER_COLUMN_LISTS = ['planned_shares'];

/**
 * Priors whose two parts are given together or not at all (the input policy: the Beta prior is
 * both-or-neither; the Gamma prior's shape and rate each have a default of their own).
 */
const BOTH_OR_NEITHER = ['beta'];

module.exports = { DATA_FAMILIES, VALUES, BOTH_OR_NEITHER, PER_COLUMN_LISTS };

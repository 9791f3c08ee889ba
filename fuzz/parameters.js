/**
 * The fuzzer's own table of the worksheet functions' parameters, used until the function catalogue
 * (functions/catalogue.ts) describes them: for each parameter name, its role and the name of its declared
 * rule in functions/sheet/rules.ts (the bounds themselves are read from that file, never copied here),
 * with the few per-function differences; the variant counts per function; and what each function's
 * result is, for the checks.
 *
 * A function whose parameters all have names listed here is fuzzed without any edit of the fuzzer: its
 * ids and parameter lists come from dist/functions.json. A parameter name missing here is generated from
 * its declared type alone (see models.js).
 */
'use strict';

/**
 * Roles:
 * - `range`:   one of the paired ranges that hold the variants (same shape, one cell per variant);
 * - `aligned`: an optional range lined up with the variants (`labels`, `planned_shares`);
 * - `scalar`:  one number; `choice`: one word from a rule's list.
 * `family` names the generator of realistic paired ranges (generate.js); `pair` a parameter that must be
 * given together with this one (both or neither).
 */
const PARAMETERS = {
  conversions: { role: 'range', rule: 'CONVERSIONS', family: 'conversion' },
  visitors: { role: 'range', rule: 'VISITORS', family: 'conversion' },
  count: { role: 'range', rule: 'COUNT', family: 'means' },
  mean: { role: 'range', rule: 'MEAN', family: 'means' },
  sd: { role: 'range', rule: 'SD', family: 'means' },
  events: { role: 'range', rule: 'EVENTS', family: 'events' },
  exposure: { role: 'range', rule: 'EXPOSURE', family: 'events' },
  planned_shares: { role: 'aligned', rule: 'PLANNED_SHARES' },
  labels: { role: 'aligned', text: true },
  level: { role: 'scalar', rule: 'LEVEL' },
  prior_alpha: { role: 'scalar', rule: 'PRIOR_ALPHA', pair: 'prior_beta' },
  prior_beta: { role: 'scalar', rule: 'PRIOR_BETA', pair: 'prior_alpha' },
  prior_shape: { role: 'scalar', rule: 'PRIOR_SHAPE' },
  prior_rate: { role: 'scalar', rule: 'PRIOR_RATE' },
  min_lift: { role: 'scalar', rule: 'MIN_LIFT' },
  max_loss: { role: 'scalar', rule: 'MAX_LOSS' },
  points: { role: 'scalar', rule: 'POINTS' },
  mean_rate: { role: 'scalar', rule: 'MEAN_RATE' },
  strength: { role: 'scalar', rule: 'STRENGTH' },
  low: { role: 'scalar', rule: 'LOW' },
  high: { role: 'scalar', rule: 'HIGH' },
  baseline_rate: { role: 'scalar', rule: 'BASELINE_RATE' },
  lift: { role: 'scalar', rule: 'LIFT' },
  visitors_per_variant: { role: 'scalar', rule: 'VISITORS_PER_VARIANT' },
  threshold: { role: 'scalar', rule: 'THRESHOLD' },
  power: { role: 'scalar', rule: 'POWER' },
  alpha: { role: 'scalar', rule: 'ALPHA' },
  sides: { role: 'scalar', rule: 'SIDES' },
  method: { role: 'choice', rule: 'RATE_INTERVAL_METHOD' },
};

/** Per-function differences from the table above. */
const FUNCTION_PARAMETERS = {
  SRM_PVALUE: { visitors: { role: 'range', rule: 'SRM_VISITORS', family: 'split' } },
  PRIOR_FROM_INTERVAL: { level: { role: 'scalar', rule: 'PRIOR_LEVEL' } },
  PRIOR_FROM_HISTORY: {
    method: { role: 'choice', rule: 'HISTORY_METHOD' },
    conversions: { role: 'range', rule: 'CONVERSIONS', family: 'history' },
    visitors: { role: 'range', rule: 'VISITORS', family: 'history' },
  },
};

/**
 * Variant counts: the name of an export of functions/sheet/variants.ts, or the limits themselves where
 * they are not exported (PRIOR_FROM_HISTORY's, in functions.ts). Functions not listed compare (COMPARISON).
 */
const VARIANT_COUNTS = {
  POSTERIOR_MEAN: 'ONE_OR_MORE',
  RATE_INTERVAL: 'ONE_OR_MORE',
  POSTERIOR_DENSITY: 'ONE_OR_MORE',
  MEAN_INTERVAL: 'ONE_OR_MORE',
  EVENTS_RATE_INTERVAL: 'ONE_OR_MORE',
  PRIOR_FROM_HISTORY: { min: 3, max: 100000, noun: 'past results' },
};

/**
 * What each function returns (the catalogue's spill shapes, and the range of its values):
 * - shape `perVariant` / `versusControl`: one cell per position, in the input's direction; `""` at blank
 *   positions (and in the control's slot for versusControl);
 * - shape `block` / `blockVersusControl` with `width`: `width` values per position, one row per variant
 *   for a column input, one column per variant for a row input;
 * - shape `density` with `per` 'variant' or 'challenger': `points` rows, the grid then one column per
 *   position (challengers: positions after the first), always columns;
 * - shape `row` with `width`: one row; `scalar`: one value.
 * `values` says what every number is: probability (in [0, 1]), sumToOne (probabilities adding up to 1),
 * rate (in [0, 1]), interval (lower ≤ upper), median (lower ≤ median ≤ upper), loss (≥ 0), positive,
 * whole (a whole number ≥ 1), text; `min`/`max` bound every number.
 */
const OUTPUTS = {
  POSTERIOR_MEAN: { shape: 'perVariant', values: 'rate' },
  RATE_INTERVAL: { shape: 'block', width: 2, values: 'interval', min: 0, max: 1 },
  PROB_HIGHEST: { shape: 'perVariant', values: 'sumToOne' },
  PROB_ABOVE_CONTROL: { shape: 'versusControl', values: 'probability' },
  LIFT_INTERVAL: { shape: 'blockVersusControl', width: 3, values: 'median', min: -1 },
  RATE_DIFF_INTERVAL: { shape: 'blockVersusControl', width: 3, values: 'median', min: -1, max: 1 },
  PROB_LIFT_ABOVE: { shape: 'versusControl', values: 'probability' },
  EXPECTED_LOSS: { shape: 'perVariant', values: 'loss', max: 1 },
  DECISION: { shape: 'scalar', values: 'text' },
  POSTERIOR_DENSITY: { shape: 'density', per: 'variant', gridMin: 0, gridMax: 1 },
  LIFT_DENSITY: { shape: 'density', per: 'challenger', gridMin: -1 },
  PRIOR_FROM_MEAN: { shape: 'row', width: 2, values: 'positive' },
  PRIOR_FROM_INTERVAL: { shape: 'row', width: 2, values: 'positive' },
  PRIOR_FROM_HISTORY: { shape: 'row', width: 2, values: 'positive' },
  DECISION_POWER: { shape: 'scalar', values: 'probability' },
  VISITORS_NEEDED: { shape: 'scalar', values: 'whole' },
  CLASSIC_SAMPLE_SIZE: { shape: 'scalar', values: 'whole' },
  SRM_PVALUE: { shape: 'scalar', values: 'probability' },
  MEAN_INTERVAL: { shape: 'block', width: 2, values: 'interval' },
  MEAN_PROB_HIGHEST: { shape: 'perVariant', values: 'sumToOne' },
  MEAN_PROB_ABOVE_CONTROL: { shape: 'versusControl', values: 'probability' },
  MEAN_DIFF_INTERVAL: { shape: 'blockVersusControl', width: 3, values: 'median' },
  MEAN_LIFT_INTERVAL: { shape: 'blockVersusControl', width: 3, values: 'median' },
  MEAN_EXPECTED_LOSS: { shape: 'perVariant', values: 'loss' },
  EVENTS_RATE_INTERVAL: { shape: 'block', width: 2, values: 'interval', min: 0 },
  EVENTS_PROB_HIGHEST: { shape: 'perVariant', values: 'sumToOne' },
  EVENTS_PROB_ABOVE_CONTROL: { shape: 'versusControl', values: 'probability' },
  EVENTS_LIFT_INTERVAL: { shape: 'blockVersusControl', width: 3, values: 'median', min: -1 },
  EVENTS_EXPECTED_LOSS: { shape: 'perVariant', values: 'loss' },
};

module.exports = { PARAMETERS, FUNCTION_PARAMETERS, VARIANT_COUNTS, OUTPUTS };

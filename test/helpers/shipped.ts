/**
 * The worksheet function ids released in version 0.1.0. They are stored in users' workbooks, so none may
 * disappear or be renamed (test/addin/catalogue.test.ts), and the demo workbook shows each of them
 * (test/preview/workbook.test.ts). This is a record of a release, not a list to extend when a function is
 * added: the catalogue (functions/catalogue.ts) is the list of functions.
 */
export const SHIPPED_0_1_0: readonly string[] = [
  'POSTERIOR_MEAN',
  'RATE_INTERVAL',
  'PROB_HIGHEST',
  'PROB_ABOVE_CONTROL',
  'LIFT_INTERVAL',
  'RATE_DIFF_INTERVAL',
  'PROB_LIFT_ABOVE',
  'EXPECTED_LOSS',
  'DECISION',
  'POSTERIOR_DENSITY',
  'LIFT_DENSITY',
  'PRIOR_FROM_MEAN',
  'PRIOR_FROM_INTERVAL',
  'PRIOR_FROM_HISTORY',
  'DECISION_POWER',
  'VISITORS_NEEDED',
  'CLASSIC_SAMPLE_SIZE',
  'SRM_PVALUE',
  'MEAN_INTERVAL',
  'MEAN_PROB_HIGHEST',
  'MEAN_PROB_ABOVE_CONTROL',
  'MEAN_DIFF_INTERVAL',
  'MEAN_LIFT_INTERVAL',
  'MEAN_EXPECTED_LOSS',
  'EVENTS_RATE_INTERVAL',
  'EVENTS_PROB_HIGHEST',
  'EVENTS_PROB_ABOVE_CONTROL',
  'EVENTS_LIFT_INTERVAL',
  'EVENTS_EXPECTED_LOSS',
];

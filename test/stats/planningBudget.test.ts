import { StatsError } from '../../functions/stats/errors';
import { EXACT_QUADRATURE_BUDGET, decisionPower, visitorsNeeded } from '../../functions/stats/planning';

/*
 * The work budget of planning (planning.ts EXACT_QUADRATURE_BUDGET): a threshold this close to 1 makes every
 * outcome near the decision boundary a close call for the Edgeworth approximation, each needing an exact
 * quadrature; issue #10 measured 17 s and 3.3 s for these calls. They now stop with a clear error.
 * (No reference value: the check is the error code and message.)
 */

function thrownBy(run: () => unknown): StatsError {
  try {
    run();
  } catch (error) {
    if (error instanceof StatsError) return error;
    throw error;
  }
  throw new Error('the call did not throw');
}

const overBudget = (what: string): string =>
  `${what} needs more than ${EXACT_QUADRATURE_BUDGET} exact comparisons of close outcomes, more than one ` +
  'calculation may use; a threshold this close to 1 cannot be planned here (0.9999 and below can)';

describe('planning stops with a clear error beyond its budget of exact comparisons', () => {
  it('VISITORS_NEEDED(0.01, 0.01, 0.999999999, 0.95) (issue #10: 17 s)', () => {
    const error = thrownBy(() => visitorsNeeded(0.01, 0.01, 0.999999999, 0.95));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(overBudget('this plan'));
  });

  it('VISITORS_NEEDED(0.03, 0.05, 0.999999999, 0.9, 0.001, 1e-12) (issue #10: 3.3 s)', () => {
    const error = thrownBy(() => visitorsNeeded(0.03, 0.05, 0.999999999, 0.9, { alpha: 0.001, beta: 1e-12 }));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(overBudget('this plan'));
  });

  it('DECISION_POWER(0.03, 0.05, 1403648, 0.999999999, 0.001, 1e-12): one evaluation over the budget too', () => {
    const error = thrownBy(() => decisionPower(0.03, 0.05, 1403648, 0.999999999, { alpha: 0.001, beta: 1e-12 }));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(overBudget('this decision power'));
  });
});

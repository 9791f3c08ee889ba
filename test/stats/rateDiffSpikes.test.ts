import { rateDiffInterval } from '../../functions/stats/conversion';
import type { IntervalWithMedian } from '../../functions/stats/types';
import reference from '../reference/conversion/rate_diff_spikes.json';
import { relativeError } from '../helpers/assertions';

/*
 * RATE_DIFF_INTERVAL's core (compare/difference.ts differenceQuantile through conversion.rateDiffInterval)
 * where both posteriors pile up against 0: no conversions under a prior with alpha far below 1, so half of
 * each posterior lies below ~1e-40 and the difference's quantiles sit near ±1e-20. The regime of a fuzzed
 * 50-variant call that ran out of time (the quantile solver crawled to its step cap) before the solver and
 * the cusp cuts of compare/factors.ts shiftEdges.
 *
 * Reference values: test/reference/conversion/rate_diff_spikes.json, printed by
 *   python3 test/reference/conversion/rate_diff_spikes.py > test/reference/conversion/rate_diff_spikes.json
 * (mpmath 1.3.0 at 25 digits: the tails as integrals over log x with mpmath.quad and mpmath.betainc, a
 * closed-form piece below x = |d|·e^-90, bisection to ~1e-10 relative; its tails-sum-to-one self-check is
 * printed under "checks"). The target of the read-outs in this tail regime: 1e-6 relative.
 */

const cases = reference.cases.map((c) => [c.name, c] as const);

describe('rateDiffInterval of posteriors piled up against 0, against mpmath (rate_diff_spikes.py): ends to 1e-6 relative', () => {
  it.each(cases)('%s', (_name, c) => {
    const [alpha, beta] = c.prior as [number, number];
    const variants = [
      { conversions: c.control[0] as number, visitors: c.control[1] as number },
      { conversions: c.challenger[0] as number, visitors: c.challenger[1] as number },
    ];
    const [diff] = rateDiffInterval(variants, c.level, { alpha, beta }) as [IntervalWithMedian];
    expect(relativeError(diff.lower, Number(c.lower))).toBeLessThan(1e-6);
    expect(relativeError(diff.upper, Number(c.upper))).toBeLessThan(1e-6);
    // The median lies between the two ends (the reference does not give it: it is below 1e-40 in size).
    expect(diff.median).toBeGreaterThan(diff.lower);
    expect(diff.median).toBeLessThan(diff.upper);
  });
});

/**
 * Explaining an error cell by its error: the Explain section re-checks a formula's inputs with the
 * worksheet function's own reader, so it can quote the message the cell carries. Each check here is held
 * against the message the worksheet function itself throws for the same cells (functions/wrappers, run
 * under the CustomFunctions stand-in of test/setup).
 */
import { probHighest, rateInterval } from '../../functions/wrappers/conversion';
import { argumentSource, recheckArguments } from '../../taskpane/logic/recheck';

/** The message of the error the worksheet function throws for these arguments. */
function cellMessage(run: () => unknown): string {
  try {
    run();
  } catch (error) {
    return (error as Error).message;
  }
  throw new Error('the function did not fail');
}

describe('argumentSource', () => {
  test('literals, array constants, cells on other sheets, names', () => {
    expect(argumentSource('')).toEqual({ kind: 'absent' });
    expect(argumentSource(' 0.95 ')).toEqual({ kind: 'literal', value: 0.95 });
    expect(argumentSource('"hdi"')).toEqual({ kind: 'literal', value: 'hdi' });
    expect(argumentSource('TRUE')).toEqual({ kind: 'literal', value: true });
    expect(argumentSource('{120;150}')).toEqual({ kind: 'literal', value: [[120], [150]] });
    expect(argumentSource("'Past tests'!$B$4:$B$15")).toEqual({
      kind: 'cells',
      sheet: 'Past tests',
      address: 'B4:B15',
    });
    expect(argumentSource('C4:C6')).toEqual({ kind: 'cells', sheet: '', address: 'C4:C6' });
    expect(argumentSource('visitors_range')).toEqual({ kind: 'unknown' });
    expect(argumentSource('C4:C6*2')).toEqual({ kind: 'unknown' });
  });
});

describe('recheckArguments: the same message as the cell', () => {
  const conversions = [[412], [463], [431]];

  test('a text cell in the visitors column ("10,050" typed as text)', () => {
    const visitors = [[10412], ['10,050'], [10451]];
    const found = recheckArguments('PROB_HIGHEST', { conversions, visitors, prior_alpha: null, prior_beta: null });
    expect(found).toEqual({
      kind: 'problem',
      message: cellMessage(() => probHighest(conversions, visitors, undefined, undefined)),
    });
    expect(found.kind === 'problem' && found.message).toMatch(/^visitors, item 2: /);
  });

  test('ranges of different sizes', () => {
    const visitors = [[10412], [10388]];
    const found = recheckArguments('PROB_HIGHEST', { conversions, visitors, prior_alpha: null, prior_beta: null });
    expect(found).toEqual({
      kind: 'problem',
      message: cellMessage(() => probHighest(conversions, visitors, undefined, undefined)),
    });
  });

  test('a level out of range', () => {
    const visitors = [[10412], [10388], [10451]];
    const found = recheckArguments('RATE_INTERVAL', {
      conversions,
      visitors,
      level: 95,
      prior_alpha: null,
      prior_beta: null,
      method: null,
    });
    expect(found).toEqual({
      kind: 'problem',
      message: cellMessage(() => rateInterval(conversions, visitors, 95, undefined, undefined, undefined)),
    });
  });

  test('good inputs pass; an unknown function or a missing argument cannot be checked', () => {
    const visitors = [[10412], [10388], [10451]];
    expect(recheckArguments('PROB_HIGHEST', { conversions, visitors, prior_alpha: null, prior_beta: null })).toEqual({
      kind: 'inputs fine',
    });
    expect(recheckArguments('NOT_A_FUNCTION', {})).toEqual({ kind: 'cannot check' });
    expect(recheckArguments('PROB_HIGHEST', { conversions, visitors })).toEqual({ kind: 'cannot check' });
  });
});

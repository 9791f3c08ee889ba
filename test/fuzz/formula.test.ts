/**
 * The fuzzer's formulas (fuzz/formula.js): a call written as an `=ABTEST.…` formula with array constants
 * and read back. The written forms follow Excel's array-constant syntax (common practice: `,` separates
 * items of a row, `;` rows; text in double quotes with `""` for a quote; error literals such as #N/A).
 * The three formulas of issue #10 are read as they were filed.
 */
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { renderCall, parseFormula } = require('../../fuzz/formula.js') as {
  renderCall(fn: string, args: unknown[], names?: string[]): { formula: string; notes: string[] };
  parseFormula(text: string): { fn: string; args: unknown[] };
};

describe('fuzzer formulas', () => {
  it('writes columns with ";", rows with ",", omitted arguments as empty slots, exponents as Excel does', () => {
    expect(
      renderCall('DECISION', [[[0], [30000], [0]], [[60000], [60000], [60000]], null, undefined, 1e-12, 1]).formula,
    ).toBe('=ABTEST.DECISION({0;30000;0},{60000;60000;60000},,,1E-12,1)');
    expect(renderCall('PROB_HIGHEST', [[[1, 2]], [[10, 10]], undefined, null]).formula).toBe(
      '=ABTEST.PROB_HIGHEST({1,2},{10,10})',
    );
    expect(renderCall('MEAN_INTERVAL', [[[2]], [[1e300]], [[5e-324]], -0]).formula).toBe(
      '=ABTEST.MEAN_INTERVAL({2},{1E+300},{5E-324},-0)',
    );
  });

  it('writes text, logicals, error values and blanks, and names a linked-data cell in a note', () => {
    const { formula, notes } = renderCall(
      'SRM_PVALUE',
      [[['a"b', true, { $error: '#N/A' }, null, '  ', { $entity: 12 }]]],
      ['visitors'],
    );
    expect(formula).toBe('=ABTEST.SRM_PVALUE({"a""b",TRUE,#N/A,"","  ",12})');
    expect(notes).toEqual(['visitors, item 6 is a linked-data (entity) cell whose basic value is 12']);
  });

  it('reads the formulas of issue #10 back into calls', () => {
    expect(parseFormula('=ABTEST.EXPECTED_LOSS({0;15;9},{5000;5000;5000},0.000001,0.999999)')).toEqual({
      fn: 'EXPECTED_LOSS',
      args: [[[0], [15], [9]], [[5000], [5000], [5000]], 0.000001, 0.999999],
    });
    expect(parseFormula('=ABTEST.DECISION({0;30000;0},{60000;60000;60000},,,1E-12,1)').args).toEqual([
      [[0], [30000], [0]],
      [[60000], [60000], [60000]],
      null,
      null,
      1e-12,
      1,
    ]);
    expect(parseFormula('LIFT_INTERVAL({0,3,1},{3,3,3},0.5,0.001,1)')).toEqual({
      fn: 'LIFT_INTERVAL',
      args: [[[0, 3, 1]], [[3, 3, 3]], 0.5, 0.001, 1],
    });
  });

  it('round-trips every kind of cell', () => {
    const args = [[['x', 'say ""hi""', false, { $error: '#DIV/0!' }, 1.5e-7, -2]], [[1], [2]], 0.95, 'hdi'];
    const again = parseFormula(renderCall('RATE_INTERVAL', args).formula);
    expect(again).toEqual({ fn: 'RATE_INTERVAL', args });
    expect(Object.is(parseFormula('=ABTEST.X(-0)').args[0], -0)).toBe(true);
  });

  it('says where a formula cannot be read', () => {
    expect(() => parseFormula('=SUM(1')).toThrow('"," or ")" is expected at character 7 of =SUM(1');
    expect(() => parseFormula('=ABTEST.X({1;2)')).toThrow('"," ";" or "}" is expected at character 15');
    expect(() => parseFormula('hello')).toThrow('a formula such as =ABTEST.PROB_HIGHEST({1;2},{10;10}) is expected');
    expect(() => parseFormula('=ABTEST.X("open)')).toThrow('an unterminated text');
  });
});

/**
 * The formula reader of the CLI (cli/core/formula.ts), the A1 helpers and the frozen-copy rules.
 *
 * Sources: A1 references and ranges, ECMA-376 Part 1 §18.18.62 (ST_Ref) and Excel's limits (XFD, 1 048 576
 * rows); shared formulas, §18.3.1.40 (a dependent's relative references move with its offset from the
 * master, absolute ones stay); formula grammar (quoted sheet names with '' for ', array constants with ","
 * between columns and ";" between rows, % as divide-by-100), ECMA-376 Part 1 §18.17 — common practice of
 * Excel formulas. The ABTEST spellings in a file (`_xldudf_ABTEST_NAME`, `_xll.ABTEST.NAME`) are from memory.
 */
import { columnIndex, columnLetters, parseRange, rangeName, sheetPrefix } from '../../cli/core/cellAddress';
import { DEFAULT_TOLERANCE, showValue, valuesAgree } from '../../cli/core/compare';
import {
  abtestFunctionName,
  containsAbtestCall,
  displayFormula,
  parseFormula,
  shiftFormula,
  tokenize,
} from '../../cli/core/formula';
import { frozenHeaderLine, frozenTime, howComputedNote, isAbtestResult } from '../../cli/core/frozenCopy';

describe('A1 addresses (ECMA-376 ST_Ref)', () => {
  test('columns A, Z, AA, XFD and past XFD', () => {
    expect([columnIndex('A'), columnIndex('Z'), columnIndex('AA'), columnIndex('xfd')]).toEqual([0, 25, 26, 16383]);
    expect(columnIndex('XFE')).toBe(-1);
    expect(columnLetters(16383)).toBe('XFD');
    expect(columnLetters(701)).toBe('ZZ');
  });
  test('ranges are normalised; rows past 1048576 are not cells', () => {
    expect(parseRange('D4:B2')).toEqual({
      top: 1,
      left: 1,
      bottom: 3,
      right: 3,
    });
    expect(rangeName({ top: 0, left: 0, bottom: 0, right: 0 })).toBe('A1');
    expect(parseRange('A1048577')).toBeUndefined();
  });
  test('sheet names are quoted when they need it', () => {
    expect(sheetPrefix('Counts')).toBe('Counts!');
    expect(sheetPrefix('Read-out')).toBe("'Read-out'!");
    expect(sheetPrefix("Bob's tests")).toBe("'Bob''s tests'!");
    expect(sheetPrefix('A1')).toBe("'A1'!");
  });
});

describe('ABTEST names in a file', () => {
  test('the three spellings, any case; other functions are not ours', () => {
    expect(abtestFunctionName('ABTEST.PROB_HIGHEST')).toBe('PROB_HIGHEST');
    expect(abtestFunctionName('_xldudf_ABTEST_PROB_HIGHEST')).toBe('PROB_HIGHEST');
    expect(abtestFunctionName('_xll.abtest.decision')).toBe('DECISION');
    expect(abtestFunctionName('_xlfn.STDEV.S')).toBeUndefined();
    expect(abtestFunctionName('ABTESTING.X')).toBeUndefined();
  });
  test('a call anywhere counts; text in quotes does not', () => {
    expect(containsAbtestCall('ROUND(ABTEST.POSTERIOR_MEAN(C2,B2),3)')).toBe(true);
    expect(containsAbtestCall('"ABTEST.POSTERIOR_MEAN(C2,B2)"&A1')).toBe(false);
    expect(containsAbtestCall('SUM(ABTEST_DATA)')).toBe(false);
    expect(isAbtestResult('_xldudf_ABTEST_DECISION(C2:C3,B2:B3)')).toBe(true);
  });
});

describe('tokenizer and parser (ECMA-376 §18.17 formula grammar)', () => {
  test('references with sheets, quoted sheets, whole columns and rows', () => {
    const refs = tokenize("SUM('Bob''s tests'!$A$1:B2,Data!C:C,3:4,[1]Other!A1,Jan:Mar!B2)").filter(
      (t) => t.type === 'ref',
    );
    expect(refs.map((t) => (t.type === 'ref' ? t.sheet : undefined))).toEqual([
      { name: "Bob's tests" },
      { name: 'Data' },
      undefined,
      { name: 'Other', external: '1' },
      { name: 'Jan', lastName: 'Mar' },
    ]);
    const first = refs[0];
    expect(first?.type === 'ref' && first.first).toEqual({
      row: 0,
      col: 0,
      rowAbsolute: true,
      colAbsolute: true,
    });
  });
  test('a name that looks like a cell followed by "(" is a function (LOG10)', () => {
    expect(tokenize('LOG10(A1)').map((t) => t.type)).toEqual(['func', 'lparen', 'ref', 'rparen']);
  });
  test('arguments: constants, percent, negative numbers, arrays, omitted, names, expressions', () => {
    const parsed = parseFormula('ABTEST.X(5%,-0.05,{1,2;3,4},,conv,A1*2,"a""b",TRUE,#N/A)');
    expect(parsed.ok).toBe(true);
    if (!parsed.ok || parsed.node.kind !== 'call') throw new Error('expected a call');
    const kinds = parsed.node.args.map((a) => a.kind);
    expect(kinds).toEqual([
      'constant',
      'constant',
      'array',
      'missing',
      'name',
      'expression',
      'constant',
      'constant',
      'constant',
    ]);
    const [pct, neg, arr] = parsed.node.args;
    expect(pct?.kind === 'constant' && pct.value).toBe(0.05);
    expect(neg?.kind === 'constant' && neg.value).toBe(-0.05);
    expect(arr?.kind === 'array' && arr.rows).toEqual([
      [1, 2],
      [3, 4],
    ]);
    const text = parsed.node.args[6];
    expect(text?.kind === 'constant' && text.value).toBe('a"b');
    const err = parsed.node.args[8];
    expect(err?.kind === 'constant' && err.value).toEqual({ error: '#N/A' });
  });
  test('text it cannot read gives a problem, not a throw', () => {
    const bad = parseFormula('ABTEST.X(A1,');
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.problem).toMatch(/expected|ends too early/);
    const ragged = parseFormula('ABTEST.X({1,2;3})');
    expect(!ragged.ok && ragged.problem).toBe('the rows of an array constant differ in length');
  });
});

describe('shared formulas (ECMA-376 §18.3.1.40)', () => {
  test('relative references move, absolute ones stay', () => {
    expect(shiftFormula('ABTEST.POSTERIOR_MEAN(C2,$B$2,B$2,$C2)', 2, 1)).toBe('ABTEST.POSTERIOR_MEAN(D4,$B$2,C$2,$C4)');
    expect(shiftFormula("X('My sheet'!A1:B2,C:C)", 1, 1)).toBe("X('My sheet'!B2:C3,D:D)");
  });
  test('a reference moved off the sheet becomes #REF!, as in Excel', () => {
    expect(shiftFormula('X(A1)', -1, 0)).toBe('X(#REF!)');
  });
  test('text inside quotes never moves', () => {
    expect(shiftFormula('X("A1",A1)', 1, 0)).toBe('X("A1",A2)');
  });
});

describe('formulas as a user sees them', () => {
  test('file prefixes are dropped, ABTEST spelled as typed', () => {
    expect(displayFormula('_xldudf_ABTEST_PROB_HIGHEST(C2:C4,B2:B4)')).toBe('=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)');
    expect(displayFormula('_xlfn.STDEV.S(A1:A3)+_xll.ABTEST.SRM_PVALUE(B1:B2)')).toBe(
      '=STDEV.S(A1:A3)+ABTEST.SRM_PVALUE(B1:B2)',
    );
  });
});

describe('frozen-copy wording (our own)', () => {
  const at = new Date(Date.UTC(2025, 2, 14, 9, 26, 53));
  test('times are UTC to the minute', () => {
    expect(frozenTime(at)).toBe('2025-03-14 09:26 UTC');
  });
  test('the note names the formula and its spill', () => {
    expect(
      howComputedNote({
        formula: '_xldudf_ABTEST_PROB_HIGHEST(C2:C3,B2:B3)',
        spill: 'D2:D3',
        frozenAt: at,
      }),
    ).toBe(
      'Computed by =ABTEST.PROB_HIGHEST(C2:C3,B2:B3) (its result filled D2:D3).\nFrozen 2025-03-14 09:26 UTC: a plain value now, it no longer updates.',
    );
  });
  test('the header says when, from what and how many', () => {
    expect(frozenHeaderLine({ frozenAt: at, source: 'q3.xlsx', results: 1 })).toMatch(
      /^Frozen copy made 2025-03-14 09:26 UTC from q3\.xlsx: 1 Lift Ledger result is a plain value;/,
    );
    expect(frozenHeaderLine({ frozenAt: at, source: 'q3.xlsx', results: 4 })).toContain(
      '4 Lift Ledger results are plain values',
    );
  });
});

describe('agreement of saved and recomputed values', () => {
  test('numbers within the relative tolerance; zero only with zero', () => {
    expect(DEFAULT_TOLERANCE).toBe(1e-9);
    expect(valuesAgree(0.1 + 0.2, 0.3)).toBe(true);
    expect(valuesAgree(1, 1 + 2e-9)).toBe(false);
    expect(valuesAgree(1e-40, 1.0000000001e-40)).toBe(true);
    expect(valuesAgree(0, 1e-300)).toBe(false);
  });
  test('blank and empty text agree; errors by code; types never mix', () => {
    expect(valuesAgree('', null)).toBe(true);
    expect(valuesAgree({ error: '#n/a' }, { error: '#N/A' })).toBe(true);
    expect(valuesAgree('1', 1)).toBe(false);
    expect(valuesAgree(true, 1)).toBe(false);
    expect(showValue({ error: '#VALUE!' })).toBe('#VALUE!');
    expect(showValue(null)).toBe('(blank)');
  });
});

/**
 * The HyperFormula bridge of the preview (preview/src/abtestPlugin.ts), exercised with a small hand-written
 * fixture bundle (test/preview/fixtures/), so the bridge is tested without a build: what Excel passes to a
 * custom function (2-D arrays, blanks as "", omitted optional arguments as null), spills, and errors with
 * their messages. The demo workbook against the real dist/ bundle is tested in workbook.test.ts.
 */
import * as path from 'path';
import { DetailedCellError, HyperFormula } from 'hyperformula';
import { HYPERFORMULA_CONFIG } from '../../preview/src/demoWorkbook';
import { loadAndRegister } from './loadBundle';

const fixtures = path.join(__dirname, 'fixtures');

describe('preview bridge: custom functions inside HyperFormula', () => {
  const loaded = loadAndRegister(path.join(fixtures, 'functions.js'), path.join(fixtures, 'functions.json'));
  let hf: HyperFormula;

  beforeEach(() => {
    hf = HyperFormula.buildFromSheets(
      {
        S: [
          // A, B: visitors, conversions; F1 holds an error value
          [
            10,
            3,
            '=ABTEST.POSTERIOR_MEAN(B1:B3, A1:A3)',
            '=ABTEST.DESCRIBE_ARGUMENTS(A1:B2)',
            '=ABTEST.DESCRIBE_ARGUMENTS(A4:A5, 2.5)',
            '=1/0',
            '=ABTEST.POSTERIOR_MEAN(F1:F2, A1:A2)',
            '=ABTEST.POSTERIOR_MEAN(B1:B2, A1:A2, 1, F1)',
          ],
          [20, 5, null, '=ABTEST.POSTERIOR_MEAN(B1:B2, A1:A2, 2, 8)'],
          [12.5, 1, null, null, '=ABTEST.EXPLODE()'],
          [null, null, '=ABTEST.POSTERIOR_MEAN(B1:B2, A1:A2)'],
          ['x'],
        ],
      },
      { ...HYPERFORMULA_CONFIG },
    );
  });
  afterEach(() => hf.destroy());

  it('registers every function of the metadata under the ABTEST namespace', () => {
    expect([...loaded.definition.names].sort()).toEqual([
      'ABTEST.DESCRIBE_ARGUMENTS',
      'ABTEST.EXPLODE',
      'ABTEST.POSTERIOR_MEAN',
    ]);
  });

  it('spills a matrix result down a column: closed-form Beta posterior mean (1 + x)/(2 + n), common practice', () => {
    // C4 holds B1:B2 over A1:A2: (1 + 3)/(2 + 10) and (1 + 5)/(2 + 20)
    expect(hf.getCellValue({ sheet: 0, row: 3, col: 2 })).toBeCloseTo(4 / 12, 15);
    expect(hf.getCellValue({ sheet: 0, row: 4, col: 2 })).toBeCloseTo(6 / 22, 15);
    // with a prior Beta(2, 8): (2 + 3)/(10 + 10), (2 + 5)/(10 + 20)
    expect(hf.getCellValue({ sheet: 0, row: 1, col: 3 })).toBeCloseTo(5 / 20, 15);
    expect(hf.getCellValue({ sheet: 0, row: 2, col: 3 })).toBeCloseTo(7 / 30, 15);
  });

  it('shows a CustomFunctions.Error as that worksheet error with its message', () => {
    const value = hf.getCellValue({ sheet: 0, row: 0, col: 2 });
    expect(value).toBeInstanceOf(DetailedCellError);
    const error = value as DetailedCellError;
    expect(error.value).toBe('#VALUE!');
    expect(error.message).toBe('visitors, item 3: 12.5 is not a whole number');
  });

  it('passes ranges as 2-D arrays with blanks as "" and an omitted optional argument as null', () => {
    expect(hf.getCellValue({ sheet: 0, row: 0, col: 3 })).toBe('first=[[10,3],[20,5]] second=null');
    expect(hf.getCellValue({ sheet: 0, row: 0, col: 4 })).toBe('first=[[""],["x"]] second=2.5');
  });

  it('turns a raw JavaScript throw into #VALUE! saying it is unexpected', () => {
    const error = hf.getCellValue({ sheet: 0, row: 2, col: 4 }) as DetailedCellError;
    expect(error.value).toBe('#VALUE!');
    expect(error.message).toBe('unexpected failure inside the function (please report it): raw failure');
  });

  it('passes an error in an argument on without calling the function', () => {
    const inRange = hf.getCellValue({ sheet: 0, row: 0, col: 6 }) as DetailedCellError;
    expect(inRange.value).toBe('#DIV/0!');
    const inScalar = hf.getCellValue({ sheet: 0, row: 0, col: 7 }) as DetailedCellError;
    expect(inScalar.value).toBe('#DIV/0!');
  });

  it('recalculates a spill when an input changes', () => {
    hf.setCellContents({ sheet: 0, row: 0, col: 1 }, 7);
    expect(hf.getCellValue({ sheet: 0, row: 3, col: 2 })).toBeCloseTo(8 / 12, 15);
  });
});

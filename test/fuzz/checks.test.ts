/**
 * The fuzzer's oracle (fuzz/spec.js) and its checks on results (fuzz/checks.js): every check fires on a
 * result made to break it and stays quiet on a result that keeps it. The inputs follow the input policy
 * of DEVELOPERS.md and the declared rules of functions/sheet/rules.ts; the "good" results are written by
 * hand from the function contract (P(highest) adds up to 1, intervals ordered, the control's slot "").
 * The functions' parameters come from the function catalogue (functions/catalogue.ts), their ids from the
 * fixture metadata (copied from dist/functions.json).
 */
import * as path from 'path';
import * as catalogue from '../../functions/catalogue';

interface Finding {
  kind: string;
  detail: string;
}
interface Model {
  id: string;
  params: { name: string; role: string }[];
}
/* eslint-disable @typescript-eslint/no-require-imports */
const { loadModels } = require('../../fuzz/models.js') as {
  loadModels(options: { metadataPath: string; catalogue: unknown }): Model[];
};
const { checkResult, internalWording } = require('../../fuzz/checks.js') as {
  checkResult(model: Model, args: unknown[], result: Record<string, unknown>, limits: { memoryMb: number }): Finding[];
  internalWording(message: string): string[];
};
const { judge, numberProblem } = require('../../fuzz/spec.js') as {
  numberProblem(rule: object, cell: unknown): string | undefined;
  judge(
    model: Model,
    args: unknown[],
  ): { violations: { param: string; why: string }[]; countProblem: boolean; table?: { positions: number[] } };
};
/* eslint-enable @typescript-eslint/no-require-imports */

const models = loadModels({
  metadataPath: path.join(__dirname, 'fixtures', 'functions.json'),
  catalogue,
});
const model = (id: string): Model => {
  const found = models.find((m) => m.id === id);
  if (!found) throw new Error(`no model ${id}`);
  return found;
};
const limits = { memoryMb: 50 };
/** The kinds of finding for one result, each once. */
const kinds = (id: string, args: unknown[], result: Record<string, unknown>): string[] => [
  ...new Set(checkResult(model(id), args, result, limits).map((f) => f.kind)),
];
const value = (v: unknown) => ({ outcome: 'value', value: v, cpuMs: 1, heapGrowthMb: 0 });
const error = (code: string, message: string) => ({ outcome: 'error', code, message, cpuMs: 1, heapGrowthMb: 0 });

const COLUMN = [
  [[120], [150]],
  [[2400], [2380]],
];
const ROW = [[[120, 150, 90]], [[2400, 2380, 2000]]];
const WITH_BLANK = [
  [[120], [''], [150]],
  [[2400], [null], [2380]],
];

describe('fuzzer oracle: the declared rules read independently of the sheet layer', () => {
  it('accepts ordinary input and finds the variants, skipping positions blank in both ranges', () => {
    expect(judge(model('PROB_HIGHEST'), COLUMN)).toEqual({
      violations: [],
      countProblem: false,
      table: { orientation: 'column', length: 2, positions: [0, 1] },
    });
    expect(judge(model('PROB_HIGHEST'), WITH_BLANK).table?.positions).toEqual([0, 2]);
    // -0 is not below 0; 2^53 is the largest count
    expect(judge(model('SRM_PVALUE'), [[[-0], [2 ** 53]]]).violations).toEqual([]);
  });

  it('names the argument that breaks a rule', () => {
    const why = (id: string, args: unknown[]) => judge(model(id), args).violations.map((v) => `${v.param}: ${v.why}`);
    expect(
      why('PROB_HIGHEST', [
        [[120], [151]],
        [[2400], [150]],
      ]),
    ).toEqual(['conversions: more than visitors at item 2']);
    expect(
      why('PROB_HIGHEST', [
        [[120], [150]],
        [[2400], ['2380']],
      ]),
    ).toEqual(['visitors: text cell at item 2']);
    expect(
      why('PROB_HIGHEST', [
        [[120], [150]],
        [[2400], [null]],
      ]),
    ).toEqual(['visitors: blank alone at item 2']);
    expect(
      why('PROB_HIGHEST', [
        [
          [120, 1],
          [150, 2],
        ],
        [[2400], [2380]],
      ]),
    ).toEqual(['conversions: 2 × 2 range']);
    expect(why('PROB_HIGHEST', [[[120, 150]], [[2400], [2380]]])).toEqual([
      'visitors: shape differs',
      'conversions: shape differs',
    ]);
    expect(why('PROB_HIGHEST', [...COLUMN, 0.5])).toEqual(['prior_alpha: given without prior_beta']);
    expect(why('PROB_HIGHEST', [...COLUMN, 0, 1])).toEqual(['prior_alpha: below min 0.001']);
    // a rule that allows 0 besides its bounds (sd: 0, or 1E-6 to 1E+12)
    const sd = { name: 'sd', kind: 'real', min: 1e-6, max: 1e12, orZero: true };
    expect([0, -0, 1e-6, 1e12].map((x) => numberProblem(sd, x))).toEqual([undefined, undefined, undefined, undefined]);
    expect([5e-324, 1e-7, -1].map((x) => numberProblem(sd, x))).toEqual(Array(3).fill('below min 0.000001'));
    expect(why('SRM_PVALUE', [[[1], [2 ** 53 + 2]]])).toEqual(['visitors: count above 2^53 at item 2']);
    expect(why('RATE_INTERVAL', [...COLUMN, null, null, null, ' HDI '])).toEqual([]);
    expect(why('RATE_INTERVAL', [...COLUMN, null, null, null, 'exact'])).toEqual(['method: not one of the choices']);
    expect(why('DECISION', [...COLUMN, null, [['A', 'B']]])).toEqual(['labels: shape differs from the variants']);
    expect(why('PRIOR_FROM_MEAN', [null, 10])).toEqual(['mean_rate: missing']);
  });

  it('tells a wrong number of variants apart from a broken argument', () => {
    expect(judge(model('PROB_HIGHEST'), [[[1]], [[10]]]).countProblem).toBe(true);
    const many = Array.from({ length: 51 }, () => [1]);
    expect(judge(model('PROB_HIGHEST'), [many, many.map(() => [10])]).countProblem).toBe(true);
    expect(judge(model('POSTERIOR_MEAN'), [[[1]], [[10]]]).countProblem).toBe(false);
  });
});

describe('fuzzer checks: each check fires on a broken result and not on a good one', () => {
  it('passes results that keep the contract', () => {
    expect(kinds('PROB_HIGHEST', COLUMN, value([[0.25], [0.75]]))).toEqual([]);
    expect(kinds('PROB_HIGHEST', ROW, value([[0.2, 0.7, 0.1]]))).toEqual([]);
    expect(kinds('PROB_HIGHEST', WITH_BLANK, value([[0.25], [''], [0.75]]))).toEqual([]);
    expect(
      kinds(
        'LIFT_INTERVAL',
        ROW,
        value([
          ['', -0.1, -0.3],
          ['', 0.2, 0.1],
          ['', 0.5, 0.4],
        ]),
      ),
    ).toEqual([]);
    expect(
      kinds(
        'RATE_INTERVAL',
        COLUMN,
        value([
          [0.04, 0.06],
          [0.05, 0.07],
        ]),
      ),
    ).toEqual([]);
    expect(
      kinds('DECISION', COLUMN, value('Choose B: its expected loss 0.0065% is within the 0.050% allowed')),
    ).toEqual([]);
    expect(kinds('PRIOR_FROM_MEAN', [0.05, 200], value([[10, 190]]))).toEqual([]);
    const grid = Array.from({ length: 101 }, (_, i) => [i / 100, 1, '', 2]);
    expect(
      kinds(
        'POSTERIOR_DENSITY',
        [
          [[1], [''], [2]],
          [[10], [''], [10]],
        ],
        value(grid),
      ),
    ).toEqual([]);
  });

  it('finds broken values, shapes and blanks', () => {
    expect(kinds('PROB_HIGHEST', COLUMN, value([[0.25], [0.8]]))).toEqual(['sum-to-one']);
    expect(kinds('PROB_HIGHEST', COLUMN, value([[-0.2], [1.2]]))).toEqual(['probability']);
    expect(kinds('PROB_HIGHEST', COLUMN, value([[NaN], [1]]))).toEqual(['cell']);
    expect(kinds('PROB_HIGHEST', COLUMN, value([[undefined], [1]]))).toEqual(['cell']);
    expect(kinds('PROB_HIGHEST', ROW, value([[0.2], [0.7], [0.1]]))).toEqual(['shape']);
    expect(kinds('PROB_HIGHEST', WITH_BLANK, value([[0.25], [0], [0.75]]))).toEqual(['blank']);
    expect(
      kinds(
        'LIFT_INTERVAL',
        COLUMN,
        value([
          [0, 0, 0],
          [0.1, 0.2, 0.3],
        ]),
      ),
    ).toEqual(['blank']);
    expect(
      kinds(
        'LIFT_INTERVAL',
        COLUMN,
        value([
          ['', '', ''],
          [0.1, 0.3, 0.2],
        ]),
      ),
    ).toEqual(['order']);
    expect(
      kinds(
        'LIFT_INTERVAL',
        COLUMN,
        value([
          ['', '', ''],
          [-1.5, 0.3, 0.4],
        ]),
      ),
    ).toEqual(['range']);
    expect(
      kinds(
        'RATE_INTERVAL',
        COLUMN,
        value([
          [0.06, 0.04],
          [0.05, 1.07],
        ]),
      ),
    ).toEqual(['range', 'order']);
    expect(kinds('EXPECTED_LOSS', COLUMN, value([[-1e-3], [0]]))).toEqual(['range']);
    expect(kinds('DECISION', COLUMN, value('Choose undefined: its expected loss NaN%'))).toEqual(['wording']);
    expect(kinds('PRIOR_FROM_MEAN', [0.05, 200], value([[0, 190]]))).toEqual(['range']);
    const grid = Array.from({ length: 101 }, (_, i) => [1 - i / 100, -1]);
    expect(kinds('POSTERIOR_DENSITY', [[[1]], [[10]]], value(grid))).toEqual(['density']);
    expect(kinds('POSTERIOR_DENSITY', [[[1]], [[10]], 5], value(grid))).toEqual(['shape']);
  });

  it('finds raw exceptions, wrong error codes, internal wording and messages that name no argument', () => {
    expect(kinds('PROB_HIGHEST', COLUMN, { outcome: 'raw', name: 'TypeError', message: 'x is undefined' })).toEqual([
      'raw',
    ]);
    expect(kinds('PROB_HIGHEST', COLUMN, error('#NUM!', 'prior_alpha: too small'))).toEqual(['error-code']);
    expect(
      kinds('PROB_HIGHEST', COLUMN, error('#VALUE!', 'unexpected problem while computing (please report it): boom')),
    ).toEqual(['wording']);
    expect(kinds('PROB_HIGHEST', COLUMN, error('#N/A', 'tail window did not converge'))).toEqual(['unnamed-argument']);
    expect(kinds('PROB_HIGHEST', COLUMN, error('#N/A', 'prior_alpha: 1e-12 is too small for these counts'))).toEqual(
      [],
    );
    // a broken argument must be refused with #VALUE! naming it
    const text = [
      [[120], [150]],
      [[2400], ['2380']],
    ];
    expect(kinds('PROB_HIGHEST', text, error('#VALUE!', 'visitors, item 2: "2380" is text, not a number'))).toEqual([]);
    expect(kinds('PROB_HIGHEST', text, error('#VALUE!', 'item 2 is text'))).toEqual(['unnamed-argument']);
    expect(kinds('PROB_HIGHEST', text, error('#N/A', 'visitors, item 2 is text'))).toEqual(['not-refused']);
    expect(kinds('PROB_HIGHEST', text, value([[0.5], [0.5]]))).toEqual(['not-refused']);
    // too many variants: any #VALUE! message
    const many = Array.from({ length: 51 }, () => [1]);
    expect(
      kinds(
        'PROB_HIGHEST',
        [many, many.map(() => [10])],
        error('#VALUE!', 'at most 50 variants can be compared; 51 were given'),
      ),
    ).toEqual([]);
  });

  it('knows the internal wording the issue lists', () => {
    expect(internalWording('betaTailLog needs 0 ≤ x ≤ 1 … NaN')).toEqual(['camelCase identifier', 'NaN']);
    expect(internalWording('no root between NaN and Infinity')).toEqual(['NaN', 'Infinity']);
    expect(internalWording('normalCdf needs a number, got NaN')).toEqual(['camelCase identifier', 'NaN']);
    expect(internalWording('a lift is undefined here')).toEqual(['undefined']);
    expect(internalWording('Error: x\n    at f (grid.js:10:5)')).toEqual(['stack trace']);
    expect(internalWording('visitors, item 2: a object value is not a number')).toEqual(['JavaScript type name']);
    expect(internalWording('visitors, item 3: 12.5 is not a whole number')).toEqual([]);
    expect(internalWording('prior_alpha and prior_beta: give both or neither')).toEqual([]);
  });

  it('reports aborts, calls over the budget and memory over the limit', () => {
    expect(kinds('PROB_HIGHEST', COLUMN, { outcome: 'abort', reason: 'Fatal JavaScript invalid size error' })).toEqual([
      'abort',
    ]);
    expect(kinds('PROB_HIGHEST', COLUMN, { outcome: 'timeout', cpuMs: 1000 })).toEqual(['timeout']);
    expect(kinds('PROB_HIGHEST', COLUMN, { ...value([[0.25], [0.75]]), heapGrowthMb: 51 })).toEqual(['memory']);
  });
});

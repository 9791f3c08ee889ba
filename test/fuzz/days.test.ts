/**
 * The fuzzer's day tables and lists (fuzz/generate.js, fuzz/spec.js, fuzz/checks.js): the by-day functions
 * get realistic daily counts (2–10 variant columns, 1–60 days, conversions ≤ visitors cell by cell, blank
 * days sometimes) and the look planners increasing look sizes (1–100 looks), so that ordinary calls pass the
 * shape check; each fault breaks one thing of a day table or list and the oracle expects the refusal to name
 * that argument; a by-day result is checked for one row per day, "" on blank days and probabilities in
 * [0, 1]. The rules come from the function catalogue (functions/catalogue.ts, functions/sheet/days.ts);
 * nothing here is a statistical value. Reads dist/functions.json (run `npm run build` first).
 */
import * as fs from 'fs';
import * as path from 'path';
import * as catalogue from '../../functions/catalogue';

interface Param {
  name: string;
  role: string;
  optional: boolean;
}
interface Model {
  id: string;
  params: Param[];
  output: { shape: string; per?: string; values?: string };
}
interface Call {
  fn: string;
  args: unknown[];
  mode: string;
  fault?: string;
}
interface Judged {
  violations: { param: string; why: string }[];
  days?: { height: number; width: number; filled: number[] };
}
/* eslint-disable @typescript-eslint/no-require-imports */
const { loadModels } = require('../../fuzz/models.js') as {
  loadModels(options: { metadataPath: string; catalogue: unknown }): Model[];
};
const { generateCall } = require('../../fuzz/generate.js') as {
  generateCall(models: Model[], seed: number | string, index: number): Call;
};
const { judge } = require('../../fuzz/spec.js') as { judge(model: Model, args: unknown[]): Judged };
const { checkResult } = require('../../fuzz/checks.js') as {
  checkResult(
    model: Model,
    args: unknown[],
    result: Record<string, unknown>,
    limits: { memoryMb: number },
  ): {
    kind: string;
    detail: string;
  }[];
};
/* eslint-enable @typescript-eslint/no-require-imports */

const METADATA = path.join(__dirname, '..', '..', 'dist', 'functions.json');
if (!fs.existsSync(METADATA)) throw new Error('dist/functions.json is missing: run `npm run build` before `npm test`');
const all = loadModels({ metadataPath: METADATA, catalogue });
const model = (id: string): Model => {
  const found = all.find((m) => m.id === id);
  if (!found) throw new Error(`${id} is not registered`);
  return found;
};
const BY_DAY = ['PROB_ABOVE_CONTROL_BY_DAY', 'SRM_PVALUE_BY_DAY'].map(model);
const LOOKS = ['FALSE_ALARM_WITH_LOOKS', 'POWER_WITH_LOOKS', 'THRESHOLD_FOR_LOOKS'].map(model);
const calls = (models: Model[], n: number): Call[] =>
  Array.from({ length: n }, (_, i) => generateCall(models, 'days', i));
const isBlank = (c: unknown): boolean => c === null || c === undefined || (typeof c === 'string' && c.trim() === '');
const argOf = (m: Model, call: Call, name: string): unknown => call.args[m.params.findIndex((p) => p.name === name)];
const modelOf = (call: Call): Model => model(call.fn);

describe('the models of the by-day and looks functions', () => {
  it('read day tables, lists and the by-day spill from the catalogue', () => {
    expect(BY_DAY[0]?.params.map((p) => p.role)).toEqual(['days', 'days', 'scalar', 'scalar']);
    expect(BY_DAY[1]?.params.map((p) => `${p.name}:${p.role}`)).toEqual([
      'visitors_by_day:days',
      'planned_shares:list',
    ]);
    expect(BY_DAY.map((m) => m.output)).toEqual([
      { shape: 'byDay', per: 'challenger', values: 'probability' },
      { shape: 'byDay', per: 'day', values: 'probability' },
    ]);
    for (const m of LOOKS) expect(m.params.find((p) => p.name === 'visitors_at_looks')?.role).toBe('list');
  });
});

describe('ordinary calls of the by-day functions', () => {
  const ordinary = calls(BY_DAY, 600).filter((c) => c.mode === 'ordinary');
  it('give day tables of 2 to 10 variant columns and 1 to 60 days, counts per day in their rules', () => {
    expect(ordinary.length).toBeGreaterThan(150);
    let blankDays = 0;
    for (const call of ordinary) {
      const m = modelOf(call);
      const visitors = argOf(m, call, 'visitors_by_day') as unknown[][];
      const judged = judge(m, call.args);
      // only the prior (drawn from 1e-12 to 1e12 on purpose) may be outside its rules
      expect(judged.violations.filter((v) => !v.param.startsWith('prior_'))).toEqual([]);
      expect(judged.days?.width).toBeGreaterThanOrEqual(2);
      expect(judged.days?.width).toBeLessThanOrEqual(10);
      expect(judged.days?.filled.length).toBeGreaterThanOrEqual(1);
      expect(judged.days?.filled.length).toBeLessThanOrEqual(60);
      blankDays += visitors.length - (judged.days?.filled.length ?? 0);
      if (m.id === 'PROB_ABOVE_CONTROL_BY_DAY') {
        const conversions = argOf(m, call, 'conversions_by_day') as unknown[][];
        conversions.forEach((row, r) =>
          row.forEach((c, j) => {
            if (!isBlank(c)) expect(c as number).toBeLessThanOrEqual(visitors[r]?.[j] as number);
          }),
        );
      }
    }
    expect(blankDays).toBeGreaterThan(0);
  });
});

describe('ordinary calls of the look planners', () => {
  it('give 1 to 100 increasing whole look sizes up to 1e9', () => {
    const ordinary = calls(LOOKS, 600).filter((c) => c.mode === 'ordinary');
    const sizes = new Set<number>();
    for (const call of ordinary) {
      const m = modelOf(call);
      const looks = (argOf(m, call, 'visitors_at_looks') as unknown[][]).flat().filter((c) => !isBlank(c)) as number[];
      sizes.add(looks.length);
      expect(looks.length).toBeGreaterThanOrEqual(1);
      expect(looks.length).toBeLessThanOrEqual(100);
      looks.forEach((x, i) => {
        expect(Number.isInteger(x) && x >= 1 && x <= 1e9).toBe(true);
        if (i > 0) expect(x).toBeGreaterThan(looks[i - 1] as number);
      });
      expect(judge(m, call.args).violations.filter((v) => v.param === 'visitors_at_looks')).toEqual([]);
    }
    expect(Math.max(...sizes)).toBeGreaterThan(10);
    expect(sizes.has(1)).toBe(true);
  });
});

describe('faults in day tables and lists', () => {
  const faults = calls([...BY_DAY, ...LOOKS], 3000).filter((c) => c.mode === 'fault');
  const kinds = new Set(faults.map((c) => c.fault));
  it('break each rule of the day tables and the lists', () => {
    for (const kind of ['dayKind', 'dayOutside', 'dayBlank', 'dayShape', 'dayColumns', 'dayEmpty', 'dayRows'])
      expect(kinds).toContain(kind);
    for (const kind of ['listKind', 'listOutside', 'listOrder', 'listTwoD', 'listCount', 'listMissing', 'listColumns'])
      expect(kinds).toContain(kind);
  });
  it('are judged as a refusal naming the day table or list perturbed', () => {
    for (const call of faults.filter((c) => /^(day|list)/.test(c.fault ?? ''))) {
      const m = modelOf(call);
      const named = judge(m, call.args).violations.map((v) => v.param);
      const own = m.params
        .filter((p) => p.role === (call.fault?.startsWith('day') ? 'days' : 'list'))
        .map((p) => p.name);
      expect(named.some((n) => own.includes(n))).toBe(true);
    }
  });
});

describe('the checks of a by-day result', () => {
  const prob = model('PROB_ABOVE_CONTROL_BY_DAY');
  // two days (the second blank), three variants
  const args = [
    [
      [21, 19, 27],
      ['', '', ''],
      [17, 22, 24],
    ],
    [
      [412, 398, 405],
      ['', '', ''],
      [388, 401, 377],
    ],
  ];
  const check = (value: unknown): string[] =>
    checkResult(prob, args, { outcome: 'value', value }, { memoryMb: 50 }).map((f) => f.kind);
  it('accept one row per day, "" on the blank day, probabilities in [0, 1]', () => {
    expect(
      check([
        [0.4, 0.8],
        ['', ''],
        [0.6, 0.9],
      ]),
    ).toEqual([]);
  });
  it('find a wrong shape, a filled blank day, a blank filled day and a probability above 1', () => {
    expect(
      check([
        [0.4, 0.8],
        [0.6, 0.9],
      ]),
    ).toEqual(['shape']);
    expect(check([[0.4], [''], [0.6]])).toEqual(['shape']);
    expect(
      check([
        [0.4, 0.8],
        [0.5, ''],
        [0.6, 0.9],
      ]),
    ).toEqual(['blank']);
    expect(
      check([
        [0.4, ''],
        ['', ''],
        [0.6, 0.9],
      ]),
    ).toEqual(['blank']);
    expect(
      check([
        [0.4, 1.2],
        ['', ''],
        [0.6, 0.9],
      ]),
    ).toEqual(['probability']);
  });
  it('expect "" while the control has had no visitor yet', () => {
    const quiet = [
      [
        [0, 1],
        [2, 3],
      ],
      [
        [0, 5],
        [9, 9],
      ],
    ];
    const findings = (value: unknown): string[] =>
      checkResult(prob, quiet, { outcome: 'value', value }, { memoryMb: 50 }).map((f) => f.kind);
    expect(findings([[''], [0.3]])).toEqual([]);
    expect(findings([[0.5], [0.3]])).toEqual(['blank']);
  });
  it('expect a refusal naming planned_shares when it does not hold one share per column', () => {
    const srm = model('SRM_PVALUE_BY_DAY');
    const judged = judge(srm, [[[500, 510, 490]], [[1], [1]]]);
    expect(judged.violations).toEqual([{ param: 'planned_shares', why: 'not one value per column' }]);
    const findings = checkResult(
      srm,
      [[[500, 510, 490]], [[1], [1]]],
      { outcome: 'error', code: '#VALUE!', message: 'the shares do not match' },
      { memoryMb: 50 },
    );
    expect(findings.map((f) => f.kind)).toEqual(['unnamed-argument']);
  });
  it('expect a refusal naming visitors_at_looks when the looks do not increase', () => {
    const looks = model('FALSE_ALARM_WITH_LOOKS');
    expect(judge(looks, [0.05, [[100], [200], [200]]]).violations).toEqual([
      { param: 'visitors_at_looks', why: 'not increasing at item 3' },
    ]);
  });
});

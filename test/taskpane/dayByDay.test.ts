/**
 * The Day by day section's logic (taskpane/logic/dayByDay.ts): reading a table of daily counts, the
 * verdict for today under the plan's threshold, and the block of live formulas it inserts. The verdict's
 * numbers are held to scipy (test/reference/looks/looks_reference.py, section byday: Evan Miller's closed form
 * for P(beats control) on the running totals, scipy.stats.chisquare for the split check) on the invented
 * daily table there; the block to the functions' catalogue signatures.
 */
import { dailyArea, dailyBlock, dailyVerdict, readDailyTable, SPLIT_ALARM } from '../../taskpane/logic/dayByDay';
import type { CellValue } from '../../taskpane/workbook/workbook';
import values from '../reference/looks/looks_values.json';

const byday = values.byday;
const names = ['Control', 'Wide', 'Short'];

/** The reference's invented daily table in the section's layout: day, visitors per variant, conversions per variant. */
function referenceTable(): CellValue[][] {
  const header: CellValue[] = ['Day', ...names.map((n) => `${n} visitors`), ...names.map((n) => `${n} conversions`)];
  const rows = byday.visitors.map((v, d): CellValue[] =>
    v.every((x) => x === 0)
      ? [`Day ${d + 1}`, '', '', '', '', '', '']
      : [`Day ${d + 1}`, ...v, ...byday.conversions[d]!],
  );
  return [header, ...rows];
}

describe('readDailyTable', () => {
  test('names from the visitors headers, a blank row is a day without data', () => {
    const reading = readDailyTable(referenceTable());
    expect(reading.ok).toBe(true);
    if (!reading.ok) return;
    expect(reading.table.names).toEqual(names);
    expect(reading.table.days).toHaveLength(7);
    expect(reading.table.days[2]).toBeNull();
    expect(reading.table.days[0]).toEqual({ visitors: [412, 398, 405], conversions: [21, 19, 27] });
  });

  test.each([
    [[['Day', 'A', 'B', 'C']], 'select the header row and at least one day'],
    [
      [
        ['Day', 'A', 'B', 'C'],
        ['Mon', 1, 2, 3],
      ],
      'after the day column, the table needs one visitors column per variant and then one conversions column per ' +
        'variant (2 to 50 variants, the control first): an even number of columns, at least 4; this table has 3',
    ],
    [
      [
        ['Day', 'A visitors', 'B visitors', 'A conversions', 'B conversions'],
        ['Mon', 100, 'x', 3, 4],
      ],
      'row 2, column 3: a whole number of at least 0 is needed, not "x"',
    ],
    [
      [
        ['Day', 'A visitors', 'B visitors', 'A conversions', 'B conversions'],
        ['Mon', 100, 10, 3, 11],
      ],
      'row 2: B has more conversions (11) than visitors (10)',
    ],
    [
      [
        ['Day', 'A visitors', 'B visitors', 'A conversions', 'B conversions'],
        ['Mon', '', '', '', ''],
      ],
      'every day is blank',
    ],
  ] as const)('refuses a bad table in words (%#)', (table, problem) => {
    const reading = readDailyTable(table as unknown as CellValue[][]);
    expect(reading.ok).toBe(false);
    if (reading.ok) return;
    expect(reading.problems[0]).toBe(problem);
  });
});

describe('dailyVerdict against scipy (looks_reference.py, section byday)', () => {
  const reading = readDailyTable(referenceTable());
  if (!reading.ok) throw new Error('the reference table must read');
  const table = reading.table;
  const lastProb = byday.probAboveControl[byday.probAboveControl.length - 1]!;
  const lastSplit = byday.srmPValue[byday.srmPValue.length - 1]!;

  test("today's P(beats control) and split check are scipy's on the running totals", () => {
    const verdict = dailyVerdict(table, 0.95);
    verdict.probabilities.forEach((p, j) => expect(Math.abs((p as number) - lastProb[j]!)).toBeLessThan(1e-11));
    expect(Math.abs((verdict.splitPValue as number) - lastSplit)).toBeLessThan(1e-12);
    expect(verdict.best).toBe(lastProb[1]! > lastProb[0]! ? 1 : 0);
  });

  test('below the threshold: keep running; at or above it: may stop, said in words', () => {
    const top = Math.max(...lastProb);
    const below = dailyVerdict(table, Math.min(0.999999, top + 0.001));
    expect(below.mayStop).toBe(false);
    expect(below.text).toMatch(/^Keep the test running: the highest P\(beats control\) today is /);
    const above = dailyVerdict(table, Math.max(0.5001, top - 0.001));
    expect(above.mayStop).toBe(true);
    expect(above.text).toMatch(/^Under its plan the test may stop today: Short has P\(beats control\) = /);
    expect(above.text).toContain('provided today is one of the looks the plan counted');
  });

  test('a broken split comes first: do not stop on those numbers', () => {
    const broken = readDailyTable([
      ['Day', 'A visitors', 'B visitors', 'A conversions', 'B conversions'],
      ['Mon', 1000, 800, 40, 80],
    ]);
    if (!broken.ok) throw new Error('must read');
    const verdict = dailyVerdict(broken.table, 0.95);
    expect(verdict.splitPValue as number).toBeLessThan(SPLIT_ALARM);
    expect(verdict.splitBroken).toBe(true);
    expect(verdict.mayStop).toBe(false);
    expect(verdict.text).toMatch(/^Do not stop on these numbers: the split check is /);
  });
});

describe('dailyBlock', () => {
  test('the by-day functions over the table, the threshold line, the verdict and its caution', () => {
    const built = dailyBlock({ tableAddress: 'A4:G18', names: ['Control', 'Green', 'Tall'] }, 0.9927, 'I4');
    const cells = built.block.cells;
    expect(cells).toHaveLength(dailyArea(14, 3).rowCount);
    expect(cells.every((row) => row.length === dailyArea(14, 3).columnCount)).toBe(true);
    expect(cells[1]).toEqual([
      'Day',
      'P(Green beats control)',
      'P(Tall beats control)',
      "Plan's threshold",
      'Split check p-value',
    ]);
    expect(cells[2]).toEqual([
      '=IF(A5="","",A5)',
      '=ABTEST.PROB_ABOVE_CONTROL_BY_DAY(E5:G18,B5:D18)',
      '',
      '=$J$21',
      '=ABTEST.SRM_PVALUE_BY_DAY(B5:D18)',
    ]);
    expect(cells[3]).toEqual(['=IF(A6="","",A6)', '', '', '=$J$21', '']);
    expect(built.cells.threshold).toBe('J21');
    expect(cells[17]?.slice(0, 2)).toEqual(["Plan's threshold: P(beats control) at each look", 0.9927]);
    expect(built.cells.verdict).toBe('J22');
    expect(cells[18]?.[1]).toBe(
      '=IF(AND(ISNUMBER(M19),M19<0.001),"No: the split check is below 0.1%",IF(MAX(J19:K19)>=J21,' +
        '"Yes, if today is a planned look: a challenger reached the threshold","No: keep it running"))',
    );
    expect(built.chartSource).toBe('I5:M19');
  });

  test('on another sheet the table is referred to with its sheet name', () => {
    const built = dailyBlock({ sheet: 'Daily test', tableAddress: 'A4:E6', names: ['A', 'B'] }, 0.95, 'A1', 'By day');
    expect(built.block.cells[2]?.[1]).toBe("=ABTEST.PROB_ABOVE_CONTROL_BY_DAY('Daily test'!D5:E6,'Daily test'!B5:C6)");
    expect(built.block.cells[2]?.[3]).toBe("=ABTEST.SRM_PVALUE_BY_DAY('Daily test'!B5:C6)");
  });
});

/**
 * Table detection for the Read-out and Prior sections: header rows, which column is which, spare
 * rows, and the problems a user is told about. Tables are invented (garden-supply checkout tests).
 */
import { checkTable, detectTable, usedRows } from '../../taskpane/logic/tableDetect';

describe('detectTable', () => {
  test('names, visitors, conversions with a header row', () => {
    const result = detectTable([
      ['Variant', 'Visitors', 'Conversions'],
      ['Green button', 10000, 412],
      ['Orange button', 10050, 455],
    ]);
    expect(result).toEqual({
      ok: true,
      mapping: { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null },
      dataRows: 2,
      note: 'columns chosen by their headings ("Visitors", "Conversions")',
    });
  });

  test('headings decide even when conversions come first', () => {
    const result = detectTable([
      ['Orders', 'Sessions', 'Name'],
      [412, 10000, 'A'],
      [455, 10050, 'B'],
    ]);
    expect(result.ok && result.mapping).toEqual({ hasHeader: true, namesColumn: 2, visitorsColumn: 1, conversionsColumn: 0, sharesColumn: null });
  });

  test('no header: visitors is the column at least the other in every row', () => {
    const result = detectTable([
      ['A', 412, 10000],
      ['B', 455, 10050],
      ['C', 430, 9980],
    ]);
    expect(result).toEqual({
      ok: true,
      mapping: { hasHeader: false, namesColumn: 0, visitorsColumn: 2, conversionsColumn: 1, sharesColumn: null },
      dataRows: 3,
      note: 'visitors taken as the column that is at least the other in every row',
    });
  });

  test('unclear headings fall back to the dominance rule; spare blank rows are ignored', () => {
    const values = [
      ['Arm', 'col 1', 'col 2'],
      ['A', 10000, 412],
      ['B', 10050, 455],
      ['', '', ''],
      ['', '', ''],
    ];
    expect(usedRows(values)).toBe(3);
    const result = detectTable(values);
    expect(result.ok && result.mapping).toEqual({ hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null });
  });

  test('past results without names (two count columns) for PRIOR_FROM_HISTORY', () => {
    const result = detectTable([
      ['conversions', 'visitors'],
      [38, 1000],
      [51, 1200],
      [29, 900],
    ]);
    expect(result.ok && result.mapping).toEqual({ hasHeader: true, namesColumn: null, visitorsColumn: 1, conversionsColumn: 0, sharesColumn: null });
  });

  test('problems the user is told about', () => {
    expect(detectTable([['x']])).toEqual({ ok: false, problem: 'select the variant table: one row per variant with visitors and conversions columns' });
    expect(detectTable([['Variant', 'Visitors', 'Conversions'], ['A', 1000, 50]])).toEqual({
      ok: false,
      problem: 'a read-out needs at least two variants (two data rows): the control first, then the challengers',
    });
    expect(detectTable([['A', 'x', 50], ['B', 'y', 61]])).toEqual({
      ok: false,
      problem: 'found fewer than two columns of whole numbers ≥ 0; the table needs a visitors column and a conversions column',
    });
    // neither column dominates: 100 ≥ 90 but 80 < 95
    expect(detectTable([['A', 100, 90], ['B', 80, 95]])).toEqual({
      ok: false,
      problem: 'could not tell the visitors column from the conversions column (neither is at least the other in every row); set them below',
    });
  });
});

test('a planned-shares column is found by its heading (for the split check)', () => {
  const values = [
    ['Variant', 'Visitors', 'Conversions', 'Revenue: mean', 'Planned share'],
    ['Green', 10000, 412, 2.41, 0.25],
    ['Orange', 20100, 855, 2.63, 0.5],
    ['Blue', 9980, 430, 2.5, 0.25],
  ];
  const result = detectTable(values);
  expect(result.ok && result.mapping).toEqual({ hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: 4 });
  const checked = result.ok ? checkTable(values, result.mapping) : null;
  expect(checked?.ok === true && checked.shares).toEqual([0.25, 0.5, 0.25]);
  const bad = checkTable([['V', 'Visitors', 'Conversions', 'Share'], ['A', 10, 1, 0], ['B', 10, 2, 1]], { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: 3 });
  expect(bad).toEqual({ ok: false, problems: ['row 2: planned share 0 is not a number above 0'] });
});

describe('checkTable', () => {
  const mapping = { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null };

  test('pulls names and counts out of a good table', () => {
    expect(
      checkTable(
        [
          ['Variant', 'Visitors', 'Conversions'],
          ['Green', 10000, 412],
          ['Orange', 10050, 455],
          ['', '', ''],
        ],
        mapping,
      ),
    ).toEqual({ ok: true, names: ['Green', 'Orange'], visitors: [10000, 10050], conversions: [412, 455], shares: null, firstRow: 1, lastRow: 2 });
  });

  test('a mapping the user got wrong is reported row by row', () => {
    const result = checkTable(
      [
        ['Variant', 'Visitors', 'Conversions'],
        ['Green', 412, 10000],
        ['Orange', 12.5, 455],
      ],
      mapping,
    );
    expect(result).toEqual({
      ok: false,
      problems: ['row 2: 10000 conversions is more than 412 visitors', 'row 3: visitors 12.5 is not a whole number ≥ 1', 'row 3: 455 conversions is more than 12.5 visitors'],
    });
  });

  test('same column for both is refused', () => {
    const result = checkTable([['A', 10, 1], ['B', 10, 2]], { hasHeader: false, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 1, sharesColumn: null });
    expect(result.ok === false && result.problems[0]).toBe('visitors and conversions must be different columns');
  });
});

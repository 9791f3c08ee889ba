/**
 * Table detection for the Read-out and Prior sections: header rows, which column is which, spare
 * rows, and the problems a user is told about. Tables are invented (garden-supply checkout tests).
 */
import { checkTable, describeCell, detectTable, usedRows } from '../../taskpane/logic/tableDetect';

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
      basis: 'headings',
      flags: [],
      flagCount: 0,
    });
  });

  test('headings decide even when conversions come first', () => {
    const result = detectTable([
      ['Orders', 'Sessions', 'Name'],
      [412, 10000, 'A'],
      [455, 10050, 'B'],
    ]);
    expect(result.ok && result.mapping).toEqual({
      hasHeader: true,
      namesColumn: 2,
      visitorsColumn: 1,
      conversionsColumn: 0,
      sharesColumn: null,
    });
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
      note: 'a guess from the numbers: visitors taken as the column that is at least the other in every row',
      basis: 'guess',
      flags: [],
      flagCount: 0,
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
    expect(result.ok && result.mapping).toEqual({
      hasHeader: true,
      namesColumn: 0,
      visitorsColumn: 1,
      conversionsColumn: 2,
      sharesColumn: null,
    });
  });

  test('past results without names (two count columns) for PRIOR_FROM_HISTORY', () => {
    const result = detectTable([
      ['conversions', 'visitors'],
      [38, 1000],
      [51, 1200],
      [29, 900],
    ]);
    expect(result.ok && result.mapping).toEqual({
      hasHeader: true,
      namesColumn: null,
      visitorsColumn: 1,
      conversionsColumn: 0,
      sharesColumn: null,
    });
  });

  test('problems the user is told about', () => {
    expect(detectTable([['x']])).toEqual({
      ok: false,
      problem: 'select the variant table: one row per variant with visitors and conversions columns',
    });
    expect(
      detectTable([
        ['Variant', 'Visitors', 'Conversions'],
        ['A', 1000, 50],
      ]),
    ).toEqual({
      ok: false,
      problem: 'a read-out needs at least two variants (two data rows): the control first, then the challengers',
    });
    expect(
      detectTable([
        ['A', 'x', 50],
        ['B', 'y', 61],
      ]),
    ).toEqual({
      ok: false,
      problem:
        'found fewer than two columns of whole numbers ≥ 0; the table needs a visitors column and a conversions column',
    });
    // neither column dominates: 100 ≥ 90 but 80 < 95
    expect(
      detectTable([
        ['A', 100, 90],
        ['B', 80, 95],
      ]),
    ).toEqual({
      ok: false,
      problem:
        'could not tell the visitors column from the conversions column (neither is at least the other in every row); set them below',
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
  expect(result.ok && result.mapping).toEqual({
    hasHeader: true,
    namesColumn: 0,
    visitorsColumn: 1,
    conversionsColumn: 2,
    sharesColumn: 4,
  });
  const checked = result.ok ? checkTable(values, result.mapping) : null;
  expect(checked?.ok === true && checked.shares).toEqual([0.25, 0.5, 0.25]);
  const bad = checkTable(
    [
      ['V', 'Visitors', 'Conversions', 'Share'],
      ['A', 10, 1, 0],
      ['B', 10, 2, 1],
    ],
    { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: 3 },
  );
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
    ).toEqual({
      ok: true,
      names: ['Green', 'Orange'],
      visitors: [10000, 10050],
      conversions: [412, 455],
      shares: null,
      firstRow: 1,
      lastRow: 2,
    });
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
      problems: [
        'row 2: 10000 conversions is more than 412 visitors',
        'row 3: visitors 12.5 is not a whole number ≥ 1',
        'row 3: 455 conversions is more than 12.5 visitors',
      ],
    });
  });

  test('same column for both is refused', () => {
    const result = checkTable(
      [
        ['A', 10, 1],
        ['B', 10, 2],
      ],
      { hasHeader: false, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 1, sharesColumn: null },
    );
    expect(result.ok === false && result.problems[0]).toBe('visitors and conversions must be different columns');
  });
});

describe('cells that are not numbers, weak guesses and large selections', () => {
  // The slip from issue #11: a count typed as text ("10,050") in the Visitors column. Before, the column
  // stopped counting as a count column and the numbers alone made Day the conversions column.
  const daily = [
    ['Day', 'Visitors', 'Conversions'],
    [1, 10000, 412],
    [2, '10,050', 455],
    [3, 9980, 430],
  ];

  test('one text cell in the Visitors column: the headings still decide, and the cell is flagged', () => {
    const result = detectTable(daily);
    expect(result).toEqual({
      ok: true,
      mapping: { hasHeader: true, namesColumn: null, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null },
      dataRows: 3,
      note: 'columns chosen by their headings ("Visitors", "Conversions"), but one of their cells is not a whole number: see below',
      basis: 'headings',
      flags: [
        {
          row: 2,
          column: 1,
          problem: 'visitors is the text "10,050", not a number: type it as a number (or use =VALUE())',
        },
      ],
      flagCount: 1,
    });
    // … and the read-out is refused until the cell is a number
    expect(result.ok && checkTable(daily, result.mapping)).toEqual({
      ok: false,
      problems: ['row 3: visitors is the text "10,050", not a number: type it as a number (or use =VALUE())'],
    });
  });

  test('a mapping found from the numbers alone is marked as a guess', () => {
    const result = detectTable([
      ['Arm', 'a', 'b', 'c'],
      ['A', 14, 10000, 412],
      ['B', 14, 10050, 455],
    ]);
    expect(result.ok && result.basis).toBe('guess');
    expect(result.ok && result.note).toBe(
      'a guess from the numbers: visitors taken as the column that is at least the other in every row; 3 columns hold counts, so check which is which',
    );
  });

  test('thousands of rows of text in a number column give a short list of problems, not one per row', () => {
    const values: (string | number)[][] = [['Variant', 'Visitors', 'Conversions']];
    for (let r = 0; r < 4000; r += 1) values.push([`V${r}`, `${10000 + r}`.replace(/(\d{2})(\d{3})$/, '$1,$2'), 400]);
    const result = detectTable(values);
    expect(result.ok && result.flags).toHaveLength(8);
    expect(result.ok && result.flagCount).toBe(4000);
    expect(result.ok && result.note).toBe(
      'columns chosen by their headings ("Visitors", "Conversions"), but 4,000 of their cells are not a whole number: see below',
    );
    const checked = result.ok ? checkTable(values, result.mapping) : null;
    expect(checked?.ok).toBe(false);
    const problems = checked?.ok === false ? checked.problems : [];
    expect(problems).toHaveLength(9);
    // 4,000 text cells + "at most 50 variants" = 4,001 problems, 8 listed
    expect(problems[8]).toBe('and 3,993 more problems of the same kinds');
    expect(problems.join('; ').length).toBeLessThan(1200);
    // 10,000 such rows are more than detection reads: one short sentence
    for (let r = 4000; r < 10000; r += 1) values.push([`V${r}`, '10,000', 400]);
    const long = detectTable(values);
    expect(long.ok === false && long.problem.length).toBeLessThan(120);
  });

  test('a selection longer than the row cap is refused at once', () => {
    const values = Array.from({ length: 5001 }, (_, r) => [r, 1000, 10]);
    expect(detectTable(values)).toEqual({
      ok: false,
      problem:
        'the selection has more than 5,000 rows; select only the table (one row per variant, or per past result)',
    });
    expect(
      checkTable(values, {
        hasHeader: false,
        namesColumn: null,
        visitorsColumn: 1,
        conversionsColumn: 2,
        sharesColumn: null,
      }),
    ).toEqual({
      ok: false,
      problems: ['the selection has more than 5,000 rows; select only the table'],
    });
  });

  test('describeCell says what a refused cell holds', () => {
    expect([
      describeCell(''),
      describeCell(true),
      describeCell('#N/A'),
      describeCell(12.5),
      describeCell('a very long name that goes on and on'),
    ]).toEqual(['an empty cell', 'TRUE', 'the error #N/A', '12.5', 'the text "a very long name that g…"']);
  });
});

test('a table without names calls its variants A … Z, AA, AB by position (the helper DECISION uses)', () => {
  const rows: (string | number)[][] = [['Visitors', 'Conversions']];
  for (let i = 0; i < 28; i += 1) rows.push([1000 + i, 10 + i]);
  const checked = checkTable(rows, {
    hasHeader: true,
    namesColumn: null,
    visitorsColumn: 0,
    conversionsColumn: 1,
    sharesColumn: null,
  });
  if (!checked.ok) throw new Error(checked.problems.join('; '));
  expect([0, 1, 25, 26, 27].map((i) => checked.names[i])).toEqual(['A', 'B', 'Z', 'AA', 'AB']);
});

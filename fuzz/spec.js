/**
 * The fuzzer's oracle for inputs: reads a call's arguments under the documented input policy (DEVELOPERS.md,
 * "The input policy") and the declared rules, independently of the sheet layer, and says whether the
 * worksheet function must refuse them (#VALUE! naming the argument) and, for accepted inputs, where the
 * variants are (so the spill can be checked).
 */
'use strict';

const MAX_COUNT = 2 ** 53;

/** 'blank' | 'number' | 'text' | 'logical' | 'other', as the input policy reads one cell. */
function classify(cell) {
  if (cell === null || cell === undefined) return 'blank';
  if (typeof cell === 'string') return cell.trim() === '' ? 'blank' : 'text';
  if (typeof cell === 'number') return Number.isFinite(cell) ? 'number' : 'other';
  if (typeof cell === 'boolean') return 'logical';
  return 'other';
}

/** A range as a list of cells: { rows, columns, cells, orientation } or { problem }. */
function cellList(range) {
  const rows = Array.isArray(range) ? range.map((row) => (Array.isArray(row) ? row : [row])) : [[range]];
  const height = rows.length;
  const width = rows[0] ? rows[0].length : 0;
  if (height === 0 || width === 0) return { problem: 'empty range' };
  if (rows.some((row) => row.length !== width)) return { problem: 'ragged range' };
  if (height > 1 && width > 1) return { problem: `${height} × ${width} range` };
  const cells = height > 1 || width === 1 ? rows.map((row) => row[0]) : rows[0];
  return { rows: height, columns: width, cells, orientation: height === 1 && width > 1 ? 'row' : 'column' };
}

/** Why `cell` breaks a numeric rule, or undefined when it keeps it. */
function numberProblem(rule, cell) {
  const kind = classify(cell);
  if (kind !== 'number') return kind === 'blank' ? 'blank' : `${kind} cell`;
  const x = cell;
  if (rule.kind === 'count') {
    if (x < 0) return 'negative count';
    if (!Number.isInteger(x)) return 'count not whole';
    if (x > MAX_COUNT) return 'count above 2^53';
  }
  if (rule.orZero && x === 0) return undefined;
  if (rule.min !== undefined && x < rule.min) return `below min ${rule.min}`;
  if (rule.max !== undefined && x > rule.max) return `above max ${rule.max}`;
  if (rule.above !== undefined && !(x > rule.above)) return `not above ${rule.above}`;
  if (rule.below !== undefined && !(x < rule.below)) return `not below ${rule.below}`;
  return undefined;
}

/** Most rows (days) a day table may have (the sheet layer's bound, declared in the day-table rules). */
const MAX_DAY_ROWS = 1000;

/** Rows of a 2-D argument (a scalar is one cell), or a problem. */
function rowsOf(range) {
  const rows = Array.isArray(range) ? range.map((row) => (Array.isArray(row) ? row : [row])) : [[range]];
  const width = rows[0] ? rows[0].length : 0;
  if (rows.length === 0 || width === 0) return { problem: 'empty range' };
  if (rows.some((row) => row.length !== width)) return { problem: 'ragged range' };
  return { rows };
}

/**
 * Judges the day tables of a call together (one row per day, one column per variant, a row blank in every
 * table is a day without data): flags each table that breaks a rule, and returns the days when readable.
 * @returns {{ height, width, filled: number[], visitors?: number[][] } | undefined}
 */
function judgeDays(model, value, flagParam) {
  let flagged = false;
  const flag = (param, why) => {
    flagged = true;
    flagParam(param, why);
  };
  const params = model.params.filter((p) => p.role === 'days');
  if (params.length === 0) return undefined;
  const tables = params.map((p) => ({ param: p, ...rowsOf(value(p.name)) }));
  tables.filter((t) => t.problem).forEach((t) => flag(t.param.name, t.problem));
  if (tables.some((t) => t.problem)) return undefined;
  const first = tables[0];
  const height = first.rows.length;
  const width = first.rows[0].length;
  let ok = true;
  for (const t of tables.slice(1)) {
    if (t.rows.length !== height || t.rows[0].length !== width) {
      flag(t.param.name, 'day table shape differs');
      flag(first.param.name, 'day table shape differs');
      ok = false;
    }
  }
  if (!ok) return undefined;
  if (width < model.variants.min || width > model.variants.max) {
    flag(first.param.name, `${width} variant columns`);
    return undefined;
  }
  if (height > MAX_DAY_ROWS) {
    flag(first.param.name, `${height} rows`);
    return undefined;
  }
  const filled = [];
  for (let r = 0; r < height; r++) {
    const cells = tables.map((t) => t.rows[r]);
    const blank = cells.map((row) => row.map((c) => classify(c) === 'blank'));
    if (blank.every((row) => row.every(Boolean))) continue;
    let good = true;
    blank.forEach((row, i) => {
      if (row.some(Boolean)) {
        flag(tables[i].param.name, `blank cell in a filled day at row ${r + 1}`);
        good = false;
      }
    });
    if (!good) continue;
    tables.forEach((t, i) => {
      cells[i].forEach((cell, c) => {
        const problem = numberProblem(t.param.rule, cell);
        if (problem) {
          flag(t.param.name, `${problem} at row ${r + 1}, column ${c + 1}`);
          good = false;
        }
      });
    });
    if (!good) continue;
    tables.forEach((t, i) => {
      const j = tables.findIndex((u) => u.param.name === t.param.rule.atMost);
      if (j < 0) return;
      cells[i].forEach((cell, c) => {
        if (cell > cells[j][c]) flag(t.param.name, `more than ${t.param.rule.atMost} at row ${r + 1}`);
      });
    });
    filled.push(r);
  }
  if (filled.length === 0 && !flagged) flag(first.param.name, 'every day blank');
  // the visitors: the table another one is bounded by, else the first
  const limit = tables.find((t) => tables.some((u) => u.param.rule.atMost === t.param.name)) ?? first;
  return { height, width, filled, visitors: limit.rows };
}

/** Judges a list argument (a row or a column of its own; blank cells skipped) and returns its values. */
function judgeList(p, v, days, flag) {
  const omitted = v === null || v === undefined || (!Array.isArray(v) && classify(v) === 'blank');
  if (omitted) {
    if (!p.optional) flag(p.name, 'missing');
    return;
  }
  const list = cellList(v);
  if (list.problem) return flag(p.name, list.problem);
  const values = [];
  for (const [i, cell] of list.cells.entries()) {
    if (classify(cell) === 'blank') continue;
    const problem = numberProblem(p.rule, cell);
    if (problem) return flag(p.name, `${problem} at item ${i + 1}`);
    if (p.increasing && values.length > 0 && !(cell > values[values.length - 1]))
      return flag(p.name, `not increasing at item ${i + 1}`);
    values.push(cell);
  }
  if (values.length < p.count.min || values.length > p.count.max) return flag(p.name, `${values.length} values`);
  if (p.perColumn && days && values.length !== days.width) flag(p.name, 'not one value per column');
}

/**
 * Judges the arguments of one call.
 * @returns {{ violations: {param: string, why: string}[], countProblem: boolean,
 *   table?: { orientation, length, positions }, days?: { height, width, filled, visitors } }}
 *   `violations` lists every argument that breaks its declared rule; `countProblem` says the number of
 *   variants is outside the function's limits; `table` (when the variant ranges are readable) gives the
 *   orientation, the number of positions and the positions that hold a variant; `days` (when the day tables
 *   are readable) their rows and columns, the rows that hold a day and the visitors' rows.
 */
function judge(model, args) {
  const violations = [];
  const flag = (param, why) => violations.push({ param, why });
  const value = (name) => args[model.params.findIndex((p) => p.name === name)];
  const ranges = model.params.filter((p) => p.role === 'range');
  let table;
  let countProblem = false;

  if (ranges.length > 0) {
    const lists = ranges.map((p) => ({ param: p, list: cellList(value(p.name)) }));
    lists.filter((l) => l.list.problem).forEach((l) => flag(l.param.name, l.list.problem));
    if (!lists.some((l) => l.list.problem)) {
      const first = lists[0].list;
      lists.slice(1).forEach((l) => {
        if (l.list.rows !== first.rows || l.list.columns !== first.columns) {
          flag(l.param.name, 'shape differs');
          flag(lists[0].param.name, 'shape differs');
        }
      });
      if (!lists.some((l) => l.list.rows !== first.rows || l.list.columns !== first.columns)) {
        const positions = [];
        for (let p = 0; p < first.cells.length; p++) {
          const cells = lists.map((l) => l.list.cells[p]);
          const blank = cells.map((c) => classify(c) === 'blank');
          if (blank.every(Boolean)) continue;
          let ok = true;
          blank.forEach((isBlank, i) => {
            if (isBlank) {
              flag(lists[i].param.name, `blank alone at item ${p + 1}`);
              ok = false;
            }
          });
          if (!ok) continue;
          lists.forEach((l, i) => {
            const problem = numberProblem(l.param.rule, cells[i]);
            if (problem) {
              flag(l.param.name, `${problem} at item ${p + 1}`);
              ok = false;
            }
          });
          if (!ok) continue;
          lists.forEach((l, i) => {
            const limitName = l.param.rule.atMost;
            if (!limitName) return;
            const j = lists.findIndex((m) => m.param.name === limitName);
            if (j >= 0 && cells[i] > cells[j]) {
              flag(l.param.name, `more than ${limitName} at item ${p + 1}`);
              ok = false;
            }
          });
          if (ok) positions.push(p);
        }
        // the sheet layer checks the count only when every position was readable
        if (
          violations.length === 0 &&
          (positions.length < model.variants.min || positions.length > model.variants.max)
        ) {
          countProblem = true;
        }
        table = { orientation: first.orientation, length: first.cells.length, positions };
      }
    }
  }

  const days = judgeDays(model, value, flag);

  for (const p of model.params) {
    const v = value(p.name);
    if (p.role === 'list') judgeList(p, v, days, flag);
    else if (p.role === 'aligned') {
      if (v === null || v === undefined || !table) continue;
      const list = cellList(v);
      if (list.problem) {
        flag(p.name, list.problem);
        continue;
      }
      const matches =
        list.cells.length === table.length && (table.length === 1 || list.orientation === table.orientation);
      if (!matches) {
        flag(p.name, 'shape differs from the variants');
        continue;
      }
      if (!p.text) {
        for (const pos of table.positions) {
          const problem = numberProblem(p.rule, list.cells[pos]);
          if (problem) flag(p.name, `${problem} at item ${pos + 1}`);
        }
      }
    } else if (p.role === 'scalar') {
      if (classify(v) === 'blank') {
        if (!p.optional) flag(p.name, 'missing');
        continue;
      }
      const problem = numberProblem(p.rule, v);
      if (problem) flag(p.name, problem);
    } else if (p.role === 'choice') {
      const kind = classify(v);
      if (kind === 'blank' || p.rule.choices.length === 0) continue;
      if (kind !== 'text' || !p.rule.choices.includes(v.trim().toLowerCase())) flag(p.name, 'not one of the choices');
    }
    if (p.pair) {
      const mate = model.params.find((q) => q.name === p.pair);
      if (mate && (classify(v) === 'blank') !== (classify(value(mate.name)) === 'blank'))
        flag(p.name, `given without ${p.pair}`);
    }
  }
  return { violations, countProblem, table, days };
}

module.exports = { classify, cellList, numberProblem, judge, MAX_COUNT };

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

/**
 * Judges the arguments of one call.
 * @returns {{ violations: {param: string, why: string}[], countProblem: boolean,
 *   table?: { orientation, length, positions } }}
 *   `violations` lists every argument that breaks its declared rule; `countProblem` says the number of
 *   variants is outside the function's limits; `table` (when the variant ranges are readable) gives the
 *   orientation, the number of positions and the positions that hold a variant.
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

  for (const p of model.params) {
    const v = value(p.name);
    if (p.role === 'aligned') {
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
  return { violations, countProblem, table };
}

module.exports = { classify, cellList, numberProblem, judge, MAX_COUNT };

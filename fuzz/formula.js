/**
 * Calls as worksheet formulas and back: `=ABTEST.NAME(arg, …)` with array constants (`{1;2}` is a
 * column, `{1,2}` a row), so a finding can be pasted into a cell or replayed with `--formula`.
 *
 * A blank cell inside an array is written `""` (Excel's array constants have no empty items; the input
 * policy reads `""` as blank). A linked-data (entity) cell cannot be typed: it is written as its basic
 * value and named in a note beside the formula.
 */
'use strict';

const NAMESPACE = 'ABTEST';
const ERROR_LITERALS = ['#N/A', '#VALUE!', '#DIV/0!', '#REF!', '#NUM!', '#NAME?', '#NULL!'];

function renderNumber(x) {
  if (Object.is(x, -0)) return '-0';
  return String(x).replace('e', 'E');
}

function renderText(s) {
  return `"${String(s).replace(/"/g, '""')}"`;
}

function renderCell(cell, notes, where) {
  if (cell === null || cell === undefined) return '""';
  if (typeof cell === 'number') return renderNumber(cell);
  if (typeof cell === 'boolean') return cell ? 'TRUE' : 'FALSE';
  if (typeof cell === 'string') return renderText(cell);
  if (cell && typeof cell === 'object' && '$error' in cell) return cell.$error;
  if (cell && typeof cell === 'object' && '$entity' in cell) {
    const basic = typeof cell.$entity === 'string' ? renderText(cell.$entity) : renderNumber(cell.$entity);
    notes.push(`${where} is a linked-data (entity) cell whose basic value is ${basic}`);
    return typeof cell.$entity === 'string' ? renderText(cell.$entity) : renderNumber(cell.$entity);
  }
  return renderText(String(cell));
}

/**
 * The formula of a call, and notes for what a formula cannot say.
 * @param {string} fn the function id, e.g. "PROB_HIGHEST"
 * @param {unknown[]} args the arguments as generate.js writes them
 * @param {string[]} [paramNames] the parameter names, for the notes
 * @returns {{ formula: string, notes: string[] }}
 */
function renderCall(fn, args, paramNames = []) {
  const notes = [];
  const parts = args.map((arg, i) => {
    const name = paramNames[i] ?? `argument ${i + 1}`;
    if (arg === undefined || arg === null) return '';
    if (Array.isArray(arg)) {
      const rows = arg.map((row) => (Array.isArray(row) ? row : [row]));
      const flat = rows.length === 1 || rows.every((r) => r.length === 1);
      return `{${rows
        .map((row, r) =>
          row
            .map((cell, c) =>
              renderCell(cell, notes, `${name}, item ${flat ? r + c + 1 : `row ${r + 1} column ${c + 1}`}`),
            )
            .join(','),
        )
        .join(';')}}`;
    }
    return renderCell(arg, notes, name);
  });
  while (parts.length > 0 && parts[parts.length - 1] === '') parts.pop();
  return { formula: `=${NAMESPACE}.${fn}(${parts.join(',')})`, notes };
}

/**
 * Reads a formula written by {@link renderCall} (or typed by hand in the same style) into a call.
 * Cost O(length). Throws an Error naming the position when the text is not such a formula.
 * @example parseFormula('=ABTEST.PROB_HIGHEST({1;2},{10;10})')
 * //=> { fn: 'PROB_HIGHEST', args: [[[1],[2]], [[10],[10]]] }
 */
function parseFormula(text) {
  const source = String(text).trim();
  const head = /^=?\s*(?:ABTEST\.)?([A-Z_][A-Z0-9_]*)\s*\(/i.exec(source);
  if (!head) throw new Error('a formula such as =ABTEST.PROB_HIGHEST({1;2},{10;10}) is expected');
  let i = head[0].length;
  const fail = (what) => {
    throw new Error(`${what} at character ${i + 1} of ${source}`);
  };
  const skip = () => {
    while (i < source.length && /\s/.test(source[i])) i++;
  };
  const scalar = () => {
    skip();
    const rest = source.slice(i);
    let m;
    if (rest[0] === '"') {
      let out = '';
      i++;
      for (;;) {
        if (i >= source.length) fail('an unterminated text');
        if (source[i] === '"') {
          if (source[i + 1] === '"') {
            out += '"';
            i += 2;
            continue;
          }
          i++;
          return out;
        }
        out += source[i++];
      }
    }
    if ((m = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:E[+-]?\d+)?/i.exec(rest))) {
      i += m[0].length;
      return Number(m[0]);
    }
    if ((m = /^(TRUE|FALSE)\b/i.exec(rest))) {
      i += m[0].length;
      return m[1].toUpperCase() === 'TRUE';
    }
    const error = ERROR_LITERALS.find((e) => rest.toUpperCase().startsWith(e));
    if (error) {
      i += error.length;
      return { $error: error };
    }
    return fail('a value is expected');
  };
  const array = () => {
    i++; // {
    const rows = [[]];
    for (;;) {
      rows[rows.length - 1].push(scalar());
      skip();
      const c = source[i++];
      if (c === ',') continue;
      if (c === ';') {
        rows.push([]);
        continue;
      }
      if (c === '}') return rows;
      i--;
      fail('"," ";" or "}" is expected');
    }
  };
  const args = [];
  skip();
  if (source[i] === ')') i++;
  else {
    for (;;) {
      skip();
      if (source[i] === ',' || source[i] === ')') args.push(null);
      else if (source[i] === '{') args.push(array());
      else args.push(scalar());
      skip();
      const c = source[i++];
      if (c === ',') continue;
      if (c === ')') break;
      i--;
      fail('"," or ")" is expected');
    }
  }
  skip();
  if (i !== source.length) fail('nothing is expected after the closing parenthesis');
  return { fn: head[1].toUpperCase(), args };
}

module.exports = { renderCall, parseFormula, renderNumber };

/**
 * Minimal reproductions: a failing call is made smaller while it still fails the same way — optional
 * arguments left out, variants removed, numbers rounded — within a budget of attempts. Each attempt is
 * one more call through the pool, so an attempt that hangs or aborts is contained like any other.
 */
'use strict';

/** Candidate simpler forms of a number (same sign, fewer digits), simplest first. */
function simplerNumbers(x) {
  if (typeof x !== 'number' || !Number.isFinite(x) || x === 0 || (Number.isInteger(x) && Math.abs(x) < 10)) return [];
  const out = [];
  for (const digits of [1, 2, 3]) {
    const y = Number(x.toPrecision(digits));
    if (y !== x && !out.includes(y)) out.push(y);
  }
  if (!Number.isInteger(x) && Math.abs(x) > 1 && Math.abs(x) < 1e15) out.push(Math.round(x));
  return out;
}

const clone = (args) =>
  args.map((a) => (Array.isArray(a) ? a.map((row) => (Array.isArray(row) ? row.slice() : row)) : a));

/** The 1-D cell list of a range argument and a way to rebuild it, or undefined for a 2-D range. */
function asList(arg) {
  if (!Array.isArray(arg) || !arg.every(Array.isArray)) return undefined;
  if (arg.length === 1) return { cells: arg[0].slice(), build: (cells) => [cells] };
  if (arg.every((row) => row.length === 1))
    return { cells: arg.map((row) => row[0]), build: (cells) => cells.map((c) => [c]) };
  return undefined;
}

/** Simpler variants of a call, in the order they are tried. */
function* candidates(model, args) {
  // 1. leave out optional arguments (a both-or-neither pair together)
  for (let i = args.length - 1; i >= 0; i--) {
    const p = model.params[i];
    if (!p || !p.optional || args[i] === null || args[i] === undefined) continue;
    const next = clone(args);
    next[i] = null;
    const mate = p.pair ? model.params.findIndex((q) => q.name === p.pair) : -1;
    if (mate >= 0 && mate < next.length) next[mate] = null;
    yield next;
  }
  // 2. remove one position from every range that lines up with the variants
  const positional = model.params
    .map((p, i) => (p.role === 'range' || p.role === 'aligned' ? i : -1))
    .filter((i) => i >= 0 && i < args.length && args[i] !== null && args[i] !== undefined);
  const lists = positional.map((i) => asList(args[i]));
  if (positional.length > 0 && lists.every(Boolean)) {
    const length = lists[0].cells.length;
    if (lists.every((l) => l.cells.length === length) && length > 1) {
      for (let p = length - 1; p >= 0; p--) {
        const next = clone(args);
        positional.forEach((i, k) => {
          const cells = lists[k].cells.filter((_, q) => q !== p);
          next[i] = cells.length === 1 ? [[cells[0]]] : lists[k].build(cells);
        });
        yield next;
      }
    }
  }
  // 3. round numbers
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (Array.isArray(arg)) {
      for (let r = 0; r < arg.length; r++) {
        const row = Array.isArray(arg[r]) ? arg[r] : [arg[r]];
        for (let c = 0; c < row.length; c++) {
          for (const y of simplerNumbers(row[c])) {
            const next = clone(args);
            if (Array.isArray(next[i][r])) next[i][r][c] = y;
            else next[i][r] = y;
            yield next;
          }
        }
      }
    } else {
      for (const y of simplerNumbers(arg)) {
        const next = clone(args);
        next[i] = y;
        yield next;
      }
    }
  }
}

/**
 * Shrinks `args` while `stillFails(candidate)` resolves true.
 * @param {object} model
 * @param {unknown[]} args
 * @param {(args: unknown[]) => Promise<boolean>} stillFails
 * @param {number} budget the most attempts
 * @returns {Promise<{ args: unknown[], attempts: number }>}
 */
async function shrink(model, args, stillFails, budget) {
  let best = args;
  let attempts = 0;
  let progress = true;
  while (progress && attempts < budget) {
    progress = false;
    for (const next of candidates(model, best)) {
      if (attempts >= budget) break;
      attempts++;
      if (await stillFails(next)) {
        best = next;
        progress = true;
        break;
      }
    }
  }
  return { args: best, attempts };
}

module.exports = { shrink, simplerNumbers, candidates };

/**
 * A running test day by day: the read-out and the split check on the counts so far, one row per day.
 *
 * Input days hold each variant's counts of that day (not cumulative), the control first. Each day's row
 * is computed on the cumulative counts up to and including that day, with the same core functions as the
 * one-day read-out (conversion.probAboveControl, srm.srmPValue), so the last row equals the read-out of
 * the whole test.
 *
 * Caution (peeking): a row per day invites stopping on the first good-looking day. Unless the threshold
 * was chosen for looking every day (looks.thresholdForLooks), the chance of a false alarm is far above
 * the one a single look suggests.
 */
import { ensure } from './errors';
import { probAboveControl } from './conversion';
import { MAX_VARIANTS } from './limits';
import { srmPValue } from './srm';
import { NO_MEMO, type TableSource } from './tableMemo';
import { type BetaPrior, type ConversionCounts, UNIFORM_PRIOR } from './types';

/** Most days a by-day table may have. */
export const MAX_DAYS = 1000;
/** Most cells (days × challengers) of one by-day read-out: bounds the work of one call. */
export const MAX_DAY_CELLS = 2000;

const MAX_COUNT = 2 ** 53;

function checkDays<T>(days: readonly (readonly T[])[], what: string): number {
  ensure(Array.isArray(days), `${what} must be a list of days`);
  ensure(
    days.length >= 1 && days.length <= MAX_DAYS,
    `${what}: there must be 1 to ${MAX_DAYS} days, got ${days.length}`,
  );
  const width = (days[0] as readonly T[]).length;
  ensure(width >= 2 && width <= MAX_VARIANTS, `${what}: each day needs 2 to ${MAX_VARIANTS} variants, got ${width}`);
  days.forEach((day, d) => {
    ensure(Array.isArray(day) && day.length === width, `${what}, day ${d + 1}: needs ${width} variants like day 1`);
  });
  return width;
}

function checkCount(value: number, where: string): void {
  ensure(typeof value === 'number' && Number.isInteger(value), `${where}: ${String(value)} is not a whole number`);
  ensure(value >= 0 && value <= MAX_COUNT, `${where}: ${value} is outside 0 to 2^53`);
}

/**
 * P(challenger beats control) on the cumulative counts up to each day: one row per day, one value per
 * challenger (variants 2, 3, … of the day). An entry is null while the control or that challenger has had
 * no visitors yet (the read-out needs at least one).
 *
 * Method: conversion.probAboveControl on the running totals (Evan Miller's exact sum where it applies,
 * otherwise quadrature); `tables` as there (a TableMemo lets repeated days share posteriors).
 * Cost: one probAboveControl per day: typically 2–100 µs per day and challenger.
 * Throws StatsError('invalid_argument') for 1 … 1000 days not given, days of different widths, 2 … 50
 * variants not given, counts that are not whole numbers in [0, 2^53], conversions above visitors (on a day
 * or in total), more than 2000 cells (days × challengers), or a bad prior.
 * @example probAboveControlByDay([[{ conversions: 10, visitors: 200 }, { conversions: 14, visitors: 200 }], [{ conversions: 12, visitors: 210 }, { conversions: 15, visitors: 190 }]])
 * //=> [[0.7953…], [0.8830…]] (the second row is the read-out of 22 of 410 against 29 of 390)
 */
export function probAboveControlByDay(
  days: readonly (readonly ConversionCounts[])[],
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): (number | null)[][] {
  const width = checkDays(days, 'the daily counts');
  ensure(
    days.length * (width - 1) <= MAX_DAY_CELLS,
    `the daily counts: at most ${MAX_DAY_CELLS} days × challengers, got ${days.length * (width - 1)}`,
  );
  const conversions = new Array<number>(width).fill(0);
  const visitors = new Array<number>(width).fill(0);
  return days.map((day, d) => {
    day.forEach((v, i) => {
      const where = `day ${d + 1}, variant ${i + 1}`;
      checkCount(v.conversions, `${where}, conversions`);
      checkCount(v.visitors, `${where}, visitors`);
      ensure(v.conversions <= v.visitors, `${where}: ${v.conversions} conversions is more than ${v.visitors} visitors`);
      conversions[i] = (conversions[i] as number) + v.conversions;
      visitors[i] = (visitors[i] as number) + v.visitors;
      ensure((visitors[i] as number) <= MAX_COUNT, `${where}: the running total of visitors exceeds 2^53`);
    });
    const row: (number | null)[] = new Array<number | null>(width - 1).fill(null);
    if ((visitors[0] as number) === 0) return row;
    const present: number[] = [];
    for (let i = 1; i < width; i++) if ((visitors[i] as number) > 0) present.push(i);
    if (present.length === 0) return row;
    const counts: ConversionCounts[] = [0, ...present].map((i) => ({
      conversions: conversions[i] as number,
      visitors: visitors[i] as number,
    }));
    const values = probAboveControl(counts, prior, tables);
    present.forEach((i, k) => {
      row[i - 1] = values[k] as number;
    });
    return row;
  });
}

/**
 * The split check (srm.srmPValue, Pearson's chi-square against the planned shares) on the cumulative
 * visitors up to each day: one p-value per day, null while no variant has had a visitor.
 *
 * Method and cost as srmPValue, once per day (O(variants) each).
 * Throws StatsError('invalid_argument') as {@link probAboveControlByDay} for the days, and as srmPValue for
 * the planned shares.
 * @example srmPValueByDay([[500, 520], [480, 530]]) //=> [0.5311…, 0.1202…] (X² = 0.392 and 2.414, df 1)
 */
export function srmPValueByDay(
  visitorsByDay: readonly (readonly number[])[],
  plannedShares?: readonly number[],
): (number | null)[] {
  const width = checkDays(visitorsByDay, 'the daily visitors');
  const totals = new Array<number>(width).fill(0);
  return visitorsByDay.map((day, d) => {
    day.forEach((v, i) => {
      checkCount(v, `day ${d + 1}, variant ${i + 1}, visitors`);
      totals[i] = (totals[i] as number) + v;
      ensure(
        (totals[i] as number) <= MAX_COUNT,
        `day ${d + 1}, variant ${i + 1}: the running total of visitors exceeds 2^53`,
      );
    });
    if (totals.every((t) => t === 0)) return null;
    return srmPValue(totals, plannedShares);
  });
}

/**
 * The add-in's one piece of state: the conversion posteriors tabulated by recent calls, so that the
 * several functions of one read-out (interval, P(highest), lift, loss, decision on the same ranges) tabulate
 * each posterior once. A table from the memo gives bit-for-bit the values of a fresh one (stats/tableMemo.ts
 * and its tests); the memo is bounded (~25 MB) and lives as long as the shared runtime.
 */
import { TableMemo } from './stats/tableMemo';

export const POSTERIOR_TABLES = new TableMemo();

/**
 * The audit's report: plain text for people, JSON for machines (`--json`), and the progress bar on stderr.
 */
import { showValue } from './core/compare';
import type { AuditReport } from './audit';

/** Differences listed per formula in the text report (all of them are in the JSON). */
const SHOWN_DIFFERENCES = 5;

const STATUS_WORD = {
  agrees: 'agrees',
  differs: 'DIFFERS',
  'not-checkable': 'not checkable',
} as const;

/**
 * The text report: one line per ABTEST formula, the differing cells under it, and a summary.
 * @example textReport(report).split('\n')[0] //=> 'Audit of book.xlsx with the add-in in dist'
 */
export function textReport(report: AuditReport, addinLabel: string): string {
  const lines = [`Audit of ${report.file} with the add-in in ${addinLabel}`];
  if (report.entries.length === 0) lines.push('  no ABTEST formulas found');
  for (const e of report.entries) {
    const where = `${e.sheet}!${e.cell}`;
    const cells = e.compared > 1 ? ` (${e.compared} cells${e.spill ? `, ${e.spill}` : ''})` : '';
    let line = `  ${where}  ${e.formula}  ${STATUS_WORD[e.status]}${cells}`;
    if (e.status === 'not-checkable') line += `: ${e.reason}`;
    lines.push(line);
    if (e.status === 'differs' && e.reason) lines.push(`      ${e.reason}`);
    for (const d of e.differences.slice(0, SHOWN_DIFFERENCES)) {
      lines.push(`      ${d.cell}: saved ${showValue(d.saved)}, recomputed ${showValue(d.recomputed)}`);
    }
    if (e.differences.length > SHOWN_DIFFERENCES)
      lines.push(`      … and ${e.differences.length - SHOWN_DIFFERENCES} more cells (see --json)`);
    if (e.errorMessage && e.status !== 'not-checkable') lines.push(`      the function's message: ${e.errorMessage}`);
  }
  const s = report.summary;
  const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;
  lines.push(
    `${plural(s.formulas, 'ABTEST formula', 'ABTEST formulas')}: ${s.agree} ${s.agree === 1 ? 'agrees' : 'agree'}, ` +
      `${s.differ} ${s.differ === 1 ? 'differs' : 'differ'}, ${s.notCheckable} not checkable ` +
      `(numbers agree within ${report.tolerance} relative).`,
  );
  if (s.differ > 0) {
    lines.push(
      'A difference means the saved value is not what the add-in computes from the saved inputs: the inputs changed after the ' +
        'last calculation, the file was edited outside Excel, or it was computed by another version of the add-in. Recalculate in Excel and check again.',
    );
  }
  return lines.join('\n');
}

/** The JSON report (stable field names; values as JSON numbers, strings, booleans, {"error": "#N/A"} or null). */
export function jsonReport(report: AuditReport): string {
  return JSON.stringify(
    {
      file: report.file,
      tolerance: report.tolerance,
      summary: report.summary,
      formulas: report.entries,
    },
    null,
    2,
  );
}

/**
 * A progress bar on a terminal: redrawn at most ten times a second, cleared at the end. Does nothing when
 * the stream is not a terminal (a pipe, a file, CI), so logs stay clean.
 */
export class ProgressBar {
  private last = 0;
  private shown = false;

  constructor(
    private readonly stream: NodeJS.WriteStream,
    private readonly label: string,
    private readonly now: () => number = Date.now,
  ) {}

  get enabled(): boolean {
    return this.stream.isTTY === true;
  }

  update(done: number, total: number, part: string): void {
    if (!this.enabled) return;
    const t = this.now();
    if (t - this.last < 100) return;
    this.last = t;
    const fraction = total > 0 ? Math.min(1, done / total) : 0;
    const width = 30;
    const filled = Math.round(fraction * width);
    const columns = this.stream.columns ?? 80;
    const text = `${this.label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${Math.floor(fraction * 100)}% ${part}`;
    this.stream.write(`\r${text.slice(0, columns - 1).padEnd(Math.min(columns - 1, text.length + 10))}`);
    this.shown = true;
  }

  clear(): void {
    if (this.shown) this.stream.write(`\r${' '.repeat((this.stream.columns ?? 80) - 1)}\r`);
    this.shown = false;
  }
}

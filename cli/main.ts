/**
 * The `lift-ledger` command line: `audit` and `freeze` of saved workbooks, outside Excel.
 *
 * Exit codes: 0 everything checkable agrees (audit) or the copy was written (freeze); 1 the audit found a
 * difference; 2 a usage, setup or file problem, with a message on stderr.
 */
import * as fs from 'fs';
import * as path from 'path';
import { REPO_ROOT, SetupError, buildAddin, builtState, loadAddin } from './addin';
import { auditWorkbook } from './audit';
import { DEFAULT_TOLERANCE } from './core/compare';
import { freezeWorkbook } from './freeze';
import { ProgressBar, jsonReport, textReport } from './report';
import { WorkbookFileError } from './xlsx/zip';

/** Where the command writes. */
export interface CliIo {
  readonly stdout: NodeJS.WritableStream;
  readonly stderr: NodeJS.WriteStream;
  /** The time a frozen copy is stamped with (default: now, or SOURCE_DATE_EPOCH when set). */
  readonly now?: () => Date;
}

/** The help text. */
export const USAGE = `lift-ledger — check and share saved workbooks that use the Lift Ledger add-in (no Excel needed)

Usage:
  lift-ledger audit <book.xlsx> [--json] [--tolerance <relative>] [--addin <folder>] [--no-build]
  lift-ledger freeze <book.xlsx> -o <copy.xlsx> [--force]
  lift-ledger help

audit   recomputes every ABTEST formula from the saved values of its argument cells with the add-in's
        own functions and reports, for each, whether the saved result agrees, differs (both values shown)
        or cannot be checked (and why). Numbers agree within --tolerance relative (default ${DEFAULT_TOLERANCE}).
          --json        the report as JSON on stdout
          --addin DIR   use functions.js and functions.json from DIR (default: the project's dist/,
                        built first when it is missing or older than the sources)
          --no-build    never build dist/; stop with exit code 2 when it is missing or out of date
        Exit code 0: every checkable formula agrees; 1: at least one differs; 2: usage or file problem.

freeze  writes a shareable copy in which every ABTEST result is its saved value, with the formula that
        computed it kept in a note on the cell and a header note (cell A1) saying when and from which file
        the copy was made. Everything else in the file (charts, formats, other formulas, names) is copied
        unchanged. The input is never changed.
          -o, --output FILE   the copy to write (required)
          --force             replace FILE if it exists
        Exit code 0: the copy was written; 2: usage or file problem.

Cautions: a frozen copy does not update when data changes. A read-out is only as good as its experiment:
check the traffic split, do not stop a test the first time it looks good (peeking), allow for many
variants and try another prior; for regulated or health-related decisions ask a qualified statistician.`;

class UsageError extends Error {}

interface Parsed {
  command: string;
  file?: string;
  json: boolean;
  tolerance: number;
  addin?: string;
  build: boolean;
  output?: string;
  force: boolean;
}

function parseArgs(argv: readonly string[]): Parsed {
  const out: Parsed = {
    command: argv[0] ?? 'help',
    json: false,
    tolerance: DEFAULT_TOLERANCE,
    build: true,
    force: false,
  };
  const value = (i: number, flag: string): string => {
    const v = argv[i + 1];
    if (v === undefined || v.startsWith('--')) throw new UsageError(`${flag} needs a value`);
    return v;
  };
  for (let i = 1; i < argv.length; i += 1) {
    const arg = argv[i] as string;
    if (arg === '--json') out.json = true;
    else if (arg === '--no-build') out.build = false;
    else if (arg === '--force') out.force = true;
    else if (arg === '--tolerance') {
      const v = Number(value(i, arg));
      if (!Number.isFinite(v) || v < 0 || v >= 1)
        throw new UsageError('--tolerance must be a number from 0 to below 1, e.g. 1e-9');
      out.tolerance = v;
      i += 1;
    } else if (arg === '--addin') {
      out.addin = value(i, arg);
      i += 1;
    } else if (arg === '-o' || arg === '--output') {
      out.output = value(i, arg);
      i += 1;
    } else if (arg.startsWith('-')) throw new UsageError(`unknown option ${arg}`);
    else if (out.file === undefined) out.file = arg;
    else throw new UsageError(`one workbook at a time (got ${out.file} and ${arg})`);
  }
  return out;
}

function stampTime(io: CliIo): Date {
  if (io.now) return io.now();
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000);
  return new Date();
}

async function runAudit(args: Parsed, io: CliIo): Promise<number> {
  const file = args.file as string;
  let folder: string;
  if (args.addin) folder = path.resolve(args.addin);
  else {
    folder = path.join(REPO_ROOT, 'dist');
    const state = builtState(folder);
    if (state) {
      const why =
        state === 'missing'
          ? 'dist/functions.js is missing'
          : 'dist/functions.js is older than the sources in functions/';
      if (!args.build) throw new SetupError(`${why}: run \`npm run build\` (or leave out --no-build to build it now)`);
      io.stderr.write(`lift-ledger: ${why}.\n`);
      buildAddin((line) => io.stderr.write(`lift-ledger: ${line}\n`));
    }
  }
  const addin = loadAddin(folder);
  const bar = new ProgressBar(io.stderr, 'auditing');
  let report;
  try {
    report = await auditWorkbook(file, addin, {
      tolerance: args.tolerance,
      onProgress: (d, t, part) => bar.update(d, t, part),
    });
  } finally {
    bar.clear();
  }
  const label = args.addin ? folder : 'dist/';
  io.stdout.write(`${args.json ? jsonReport(report) : textReport(report, label)}\n`);
  return report.summary.differ > 0 ? 1 : 0;
}

async function runFreeze(args: Parsed, io: CliIo): Promise<number> {
  const file = args.file as string;
  if (!args.output)
    throw new UsageError('freeze needs the copy to write: lift-ledger freeze <book.xlsx> -o <copy.xlsx>');
  const input = path.resolve(file);
  const output = path.resolve(args.output);
  if (!fs.existsSync(input)) throw new WorkbookFileError(`${file}: no such file`);
  const same = fs.existsSync(output) && fs.realpathSync(output) === fs.realpathSync(input);
  if (same || output === input)
    throw new UsageError('the copy must be a different file from the workbook: freeze never changes its input');
  if (fs.existsSync(output) && !args.force) throw new UsageError(`${args.output} exists; use --force to replace it`);
  const bar = new ProgressBar(io.stderr, 'freezing');
  let result;
  try {
    result = await freezeWorkbook(input, output, {
      frozenAt: stampTime(io),
      source: path.basename(file),
      onProgress: (d, t, part) => bar.update(d, t, part),
    });
  } finally {
    bar.clear();
  }
  const lines = [
    `Wrote ${args.output}: ${result.frozen} ABTEST ${result.frozen === 1 ? 'result' : 'results'} frozen as values on ${result.sheets.length} ${result.sheets.length === 1 ? 'sheet' : 'sheets'}.`,
  ];
  for (const s of result.sheets)
    lines.push(
      `  ${s.name}: ${s.frozen} ${s.frozen === 1 ? 'result' : 'results'}, ${s.notes} ${s.notes === 1 ? 'note' : 'notes'} added`,
    );
  for (const w of result.warnings) lines.push(`  note: ${w}`);
  io.stdout.write(`${lines.join('\n')}\n`);
  return 0;
}

/**
 * Runs the command line `argv` (without node and the script) and returns the exit code. Never throws:
 * problems are written to stderr with exit code 2.
 */
export async function main(argv: readonly string[], io: CliIo): Promise<number> {
  let args: Parsed;
  try {
    args = parseArgs(argv);
    if (['help', '--help', '-h'].includes(args.command)) {
      io.stdout.write(`${USAGE}\n`);
      return 0;
    }
    if (args.command !== 'audit' && args.command !== 'freeze')
      throw new UsageError(`unknown command "${args.command}"`);
    if (args.file === undefined) throw new UsageError(`${args.command} needs a workbook file (.xlsx)`);
    return args.command === 'audit' ? await runAudit(args, io) : await runFreeze(args, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr.write(`lift-ledger: ${error.message}\nRun \`lift-ledger help\` for usage.\n`);
      return 2;
    }
    if (error instanceof WorkbookFileError || error instanceof SetupError) {
      io.stderr.write(`lift-ledger: ${error.message}\n`);
      return 2;
    }
    io.stderr.write(
      `lift-ledger: unexpected problem (please report it): ${(error as Error)?.stack ?? String(error)}\n`,
    );
    return 2;
  }
}

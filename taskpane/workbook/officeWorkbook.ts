/**
 * The Workbook interface on the Excel JavaScript API. It uses only the agreed subset (getSelectedRange,
 * worksheets.getItem/getActiveWorksheet, getRange, load of address/values/formulas/rowCount/columnCount,
 * formulas/numberFormat/format writes, getCell/getResizedRange, charts.add + title + setPosition,
 * onSelectionChanged), so the same code runs in Excel and in the no-Excel preview's stand-in.
 */
import type {
  CellValue,
  ChartOutcome,
  ChartRequest,
  FormulaBlock,
  RangeContents,
  Subscription,
  Workbook,
  WriteOutcome,
} from './workbook';
import { cellAddress, parseAddress, rangeAddress } from './address';

/** How the implementation gets a request context: Excel.run in the add-in, a mock in tests. */
export type ExcelRunner = <T>(batch: (context: Excel.RequestContext) => Promise<T>) => Promise<T>;

const LOAD = 'address, values, formulas, rowCount, columnCount';

/** The error code and message of a failed sync (Office.js errors carry a string `code`). */
function describeError(error: unknown): { code: string; message: string } {
  const record = (typeof error === 'object' && error !== null ? error : {}) as { code?: unknown; message?: unknown };
  const code = typeof record.code === 'string' && record.code !== '' ? record.code : 'GeneralException';
  const message = typeof record.message === 'string' && record.message !== '' ? record.message : String(error);
  return { code, message };
}

function toContents(range: Excel.Range): RangeContents {
  const parsed = parseAddress(range.address);
  const local = range.address.slice(range.address.lastIndexOf('!') + 1).replace(/\$/g, '');
  return {
    address: range.address,
    sheet: parsed.sheet,
    localAddress: local,
    rowCount: range.rowCount,
    columnCount: range.columnCount,
    values: range.values as CellValue[][],
    formulas: range.formulas as CellValue[][],
  };
}

function worksheetOf(context: Excel.RequestContext, sheet: string | undefined): Excel.Worksheet {
  return sheet === undefined || sheet === ''
    ? context.workbook.worksheets.getActiveWorksheet()
    : context.workbook.worksheets.getItem(sheet);
}

function isBlank(value: unknown): boolean {
  return value === '' || value === null || value === undefined;
}

/**
 * Queue the contents of a block: one broadcast clear of the whole target ([[""]], which Excel applies
 * to every cell), then each non-blank cell as its own 1×1 write. Same batch, same all-or-nothing
 * behaviour as one 2-D write, and robust to hosts that cannot take array objects made in another
 * frame (the no-Excel preview runs the panel in an iframe).
 */
function queueContents(target: Excel.Range, cells: readonly (readonly CellValue[])[]): void {
  target.formulas = [['']];
  cells.forEach((row, r) =>
    row.forEach((value, c) => {
      if (!isBlank(value)) target.getCell(r, c).formulas = [[value as string]];
    }),
  );
}

/** Check a block's shapes; returns a message for a malformed block, else null. */
function shapeProblem(block: FormulaBlock): string | null {
  const rows = block.cells.length;
  const columns = block.cells[0]?.length ?? 0;
  if (rows === 0 || columns === 0) return 'the block to write is empty';
  if (block.cells.some((row) => row.length !== columns)) return 'the block to write is not rectangular';
  if (block.numberFormats) {
    if (block.numberFormats.length !== rows || block.numberFormats.some((row) => row.length !== columns)) {
      return 'the number formats do not match the block';
    }
  }
  const area = block.area ?? { rowCount: rows, columnCount: columns };
  if (area.rowCount < rows || area.columnCount < columns) return 'the area to keep free is smaller than the block';
  for (const style of block.styles ?? []) {
    const r = style.row + (style.rowCount ?? 1);
    const c = style.column + (style.columnCount ?? 1);
    if (style.row < 0 || style.column < 0 || r > rows || c > columns) return 'a style lies outside the block';
  }
  return null;
}

/**
 * Create the Office.js implementation of Workbook.
 * Cost: one Excel.run per call; writeBlock makes two syncs (read the area, write it) and a third only
 * to restore after a failure; its write batch holds one operation per non-blank cell. Methods never throw for workbook failures except readRange/readSelection,
 * which reject with the Office error (bad address, unknown sheet).
 * @example const workbook = createOfficeWorkbook(); await workbook.readSelection() //=> { address: "Sheet1!B2:D4", … }
 */
export function createOfficeWorkbook(run: ExcelRunner = (batch) => Excel.run(batch)): Workbook {
  return {
    async readSelection(): Promise<RangeContents> {
      return run(async (context) => {
        const range = context.workbook.getSelectedRange();
        range.load(LOAD);
        await context.sync();
        return toContents(range);
      });
    },

    async readRange(address: string, sheet?: string): Promise<RangeContents> {
      return run(async (context) => {
        const range = worksheetOf(context, sheet).getRange(address);
        range.load(LOAD);
        await context.sync();
        return toContents(range);
      });
    },

    async activeSheetName(): Promise<string> {
      return run(async (context) => {
        const sheet = context.workbook.worksheets.getActiveWorksheet();
        sheet.load('name');
        await context.sync();
        return sheet.name;
      });
    },

    async writeBlock(block: FormulaBlock): Promise<WriteOutcome> {
      const rows = block.cells.length;
      const columns = block.cells[0]?.length ?? 0;
      const topLeft = parseAddress(block.topLeft).start;
      const areaSize = block.area ?? { rowCount: rows, columnCount: columns };
      // Everything is written through the area's range: its cells are cleared (so an overwritten area
      // leaves no stale values in the spill room) and the block is placed at its top-left.
      const areaLocal = rangeAddress(topLeft, areaSize.rowCount, areaSize.columnCount);
      const targetLocal = areaLocal;
      const problem = shapeProblem(block);
      if (problem !== null) {
        return { kind: 'failed', address: areaLocal, code: 'InvalidArgument', message: problem, restored: true };
      }

      // 1. Read what is there now.
      let before: { address: string; formulas: CellValue[][]; values: CellValue[][] };
      try {
        before = await run(async (context) => {
          const area = worksheetOf(context, block.sheet).getRange(areaLocal);
          area.load(LOAD);
          await context.sync();
          return {
            address: area.address,
            formulas: area.formulas as CellValue[][],
            values: area.values as CellValue[][],
          };
        });
      } catch (error) {
        const { code, message } = describeError(error);
        return { kind: 'failed', address: areaLocal, code, message: `could not read ${areaLocal}: ${message}`, restored: true };
      }

      const occupied: string[] = [];
      for (let r = 0; r < areaSize.rowCount; r += 1) {
        for (let c = 0; c < areaSize.columnCount; c += 1) {
          if (!isBlank(before.formulas[r]?.[c]) || !isBlank(before.values[r]?.[c])) {
            occupied.push(cellAddress({ row: topLeft.row + r, column: topLeft.column + c }));
          }
        }
      }
      if (occupied.length > 0 && block.overwrite !== true) {
        return { kind: 'occupied', address: before.address, occupiedCells: occupied };
      }
      const previous = before.formulas.map((row) => row.map((v) => (isBlank(v) ? '' : v)));
      const wasEmpty = occupied.length === 0;

      // 2. Write everything in one sync.
      try {
        await run(async (context) => {
          const target = worksheetOf(context, block.sheet).getRange(targetLocal);
          queueContents(target, block.cells);
          block.numberFormats?.forEach((row, r) =>
            row.forEach((format, c) => {
              if (format !== null && format !== '') target.getCell(r, c).numberFormat = [[format]];
            }),
          );
          for (const style of block.styles ?? []) {
            const cells = target
              .getCell(style.row, style.column)
              .getResizedRange((style.rowCount ?? 1) - 1, (style.columnCount ?? 1) - 1);
            if (style.style.bold !== undefined) cells.format.font.bold = style.style.bold;
            if (style.style.fontColor !== undefined) cells.format.font.color = style.style.fontColor;
            if (style.style.fillColor !== undefined) cells.format.fill.color = style.style.fillColor;
          }
          if (block.autofit === true) target.format.autofitColumns();
          await context.sync();
        });
        return { kind: 'written', address: before.address };
      } catch (error) {
        const { code, message } = describeError(error);
        // 3. Put back what was there (Excel may have applied part of a failed batch).
        try {
          await run(async (context) => {
            const target = worksheetOf(context, block.sheet).getRange(targetLocal);
            queueContents(target, previous);
            if (wasEmpty && block.numberFormats) target.numberFormat = [['General']];
            await context.sync();
          });
          return {
            kind: 'failed',
            address: before.address,
            code,
            message: `nothing was written to ${before.address} (${message})`,
            restored: true,
          };
        } catch (restoreError) {
          const second = describeError(restoreError);
          return {
            kind: 'failed',
            address: before.address,
            code,
            message: `writing to ${before.address} failed (${message}) and putting back its previous contents failed too (${second.message}); check those cells`,
            restored: false,
          };
        }
      }
    },

    async insertChart(request: ChartRequest): Promise<ChartOutcome> {
      try {
        return await run(async (context) => {
          const sheet = worksheetOf(context, request.sheet);
          const source = sheet.getRange(request.sourceAddress);
          const chart = sheet.charts.add(request.type as Excel.ChartType, source, 'Columns' as Excel.ChartSeriesBy);
          chart.title.text = request.title;
          chart.setPosition(request.topLeft, request.bottomRight);
          // The agreed subset reads a chart's name without load(); Office.js needs load('name') first.
          const loadable = typeof (chart as { load?: unknown }).load === 'function';
          if (loadable) chart.load('name');
          await context.sync();
          const name = loadable ? chart.name : (chart as { name?: unknown }).name;
          return { kind: 'inserted', name: typeof name === 'string' && name !== '' ? name : request.title } as ChartOutcome;
        });
      } catch (error) {
        const { code, message } = describeError(error);
        return { kind: 'failed', code, message: `the chart could not be added (${message})` };
      }
    },

    async onSelectionChanged(listener: () => void): Promise<Subscription> {
      return run(async (context) => {
        const handle = context.workbook.onSelectionChanged.add(async () => {
          listener();
        });
        await context.sync();
        return {
          async remove(): Promise<void> {
            handle.remove();
            const own = (handle as unknown as { context?: { sync?: () => Promise<unknown> } }).context;
            if (own && typeof own.sync === 'function') await own.sync();
          },
        };
      });
    },
  };
}

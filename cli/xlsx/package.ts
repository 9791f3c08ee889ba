/**
 * The structure of a SpreadsheetML package: where the workbook part is (the package relationships,
 * ECMA-376 Part 2 §9.3), its worksheets in tab order with their names and parts, its defined names, the
 * shared strings and calculation chain parts (Part 1 §18.2, §12.3), and each worksheet's own
 * relationships (notes, VML drawings). Only small parts are read here.
 */
import * as path from 'path';
import { attributeLocal, childrenNamed, parseSmallXml, type XmlElement } from './xml';
import { WorkbookFileError, type ZipPackage, type ZipPart } from './zip';

/** Relationship type URIs end with these names, in the transitional and the strict namespace alike. */
export const REL = {
  officeDocument: '/officeDocument',
  worksheet: '/worksheet',
  sharedStrings: '/sharedStrings',
  calcChain: '/calcChain',
  comments: '/comments',
  vmlDrawing: '/vmlDrawing',
  threadedComment: '/threadedComment',
} as const;

/** One relationship of a part. */
export interface Relationship {
  readonly id: string;
  readonly type: string;
  /** The target part's name in the package (no leading slash), or the raw target when external. */
  readonly target: string;
  readonly external: boolean;
}

/** One worksheet. */
export interface SheetInfo {
  /** Position among the workbook's sheets (all kinds), zero-based: what a defined name's localSheetId counts. */
  readonly index: number;
  readonly name: string;
  readonly sheetId: string;
  readonly part: ZipPart;
}

/** A defined name of the workbook (ECMA-376 Part 1 §18.2.5). */
export interface DefinedName {
  readonly name: string;
  readonly formula: string;
  /** The sheet's position for a sheet-level name. */
  readonly localSheetIndex?: number;
}

/** What {@link readWorkbookStructure} returns. */
export interface WorkbookStructure {
  readonly workbookPart: string;
  readonly workbookRelsPart: string;
  readonly sheets: readonly SheetInfo[];
  readonly definedNames: readonly DefinedName[];
  readonly sharedStrings?: ZipPart;
  readonly calcChain?: ZipPart;
  readonly date1904: boolean;
}

/** The relationships part of `partName`: "xl/workbook.xml" → "xl/_rels/workbook.xml.rels". */
export function relsPartName(partName: string): string {
  const dir = path.posix.dirname(partName);
  const base = path.posix.basename(partName);
  return dir === '.' ? `_rels/${base}.rels` : `${dir}/_rels/${base}.rels`;
}

/** Resolves a relationship target against its source part (ECMA-376 Part 2 §9.3.3.2). */
export function resolveTarget(sourcePart: string, target: string): string {
  if (target.startsWith('/')) return target.slice(1);
  const dir = path.posix.dirname(sourcePart);
  return path.posix.normalize(dir === '.' ? target : `${dir}/${target}`);
}

/** The relationships of `sourcePart` (empty when it has no relationships part). */
export async function readRelationships(pkg: ZipPackage, sourcePart: string): Promise<Relationship[]> {
  const relsName = relsPartName(sourcePart);
  const part = pkg.part(relsName);
  if (!part) return [];
  const root = parseSmallXml(await pkg.text(part), relsName);
  return childrenNamed(root, 'Relationship').map((r) => {
    const external = r.attributes.TargetMode === 'External';
    const raw = r.attributes.Target ?? '';
    return {
      id: r.attributes.Id ?? '',
      type: r.attributes.Type ?? '',
      target: external ? raw : resolveTarget(sourcePart, raw),
      external,
    };
  });
}

function requirePart(pkg: ZipPackage, name: string, what: string): ZipPart {
  const part = pkg.part(name);
  if (!part) throw new WorkbookFileError(`the package names ${what} ${name}, but it is missing`);
  return part;
}

/**
 * Reads the workbook's sheets, defined names and the locations of shared strings and calculation chain.
 * @throws {WorkbookFileError} when the package is not a workbook.
 */
export async function readWorkbookStructure(pkg: ZipPackage, fileLabel: string): Promise<WorkbookStructure> {
  const rootRels = await readRelationships(pkg, '');
  const office = rootRels.find((r) => r.type.endsWith(REL.officeDocument) && !r.external);
  if (!office)
    throw new WorkbookFileError(
      `${fileLabel} is not a workbook file: it has no main document (is it a .xlsx saved by a spreadsheet program?)`,
    );
  const workbookPart = requirePart(pkg, office.target, 'the workbook part');
  const workbook = parseSmallXml(await pkg.text(workbookPart), workbookPart.name);
  if (workbook.local !== 'workbook')
    throw new WorkbookFileError(`${fileLabel} is not a spreadsheet (its main part is <${workbook.name}>)`);
  const rels = await readRelationships(pkg, workbookPart.name);
  const relById = new Map(rels.map((r) => [r.id, r]));

  const sheets: SheetInfo[] = [];
  const sheetsElement = childrenNamed(workbook, 'sheets')[0];
  childrenNamed(sheetsElement ?? workbook, 'sheet').forEach((sheet: XmlElement, index: number) => {
    const rel = relById.get(attributeLocal(sheet, 'id') ?? '');
    if (!rel || !rel.type.endsWith(REL.worksheet)) return; // chart sheets, dialog and macro sheets hold no cells we read
    sheets.push({
      index,
      name: sheet.attributes.name ?? `Sheet${index + 1}`,
      sheetId: sheet.attributes.sheetId ?? String(index + 1),
      part: requirePart(pkg, rel.target, 'the worksheet'),
    });
  });

  const definedNames: DefinedName[] = [];
  for (const names of childrenNamed(workbook, 'definedNames')) {
    for (const dn of childrenNamed(names, 'definedName')) {
      const local = dn.attributes.localSheetId;
      definedNames.push({
        name: dn.attributes.name ?? '',
        formula: dn.text,
        ...(local !== undefined ? { localSheetIndex: Number(local) } : {}),
      });
    }
  }
  const pr = childrenNamed(workbook, 'workbookPr')[0];
  const date1904 = pr ? /^(1|true)$/.test(pr.attributes.date1904 ?? '') : false;
  const sst = rels.find((r) => r.type.endsWith(REL.sharedStrings) && !r.external);
  const chain = rels.find((r) => r.type.endsWith(REL.calcChain) && !r.external);
  const sstPart = sst ? pkg.part(sst.target) : undefined;
  const chainPart = chain ? pkg.part(chain.target) : undefined;
  return {
    workbookPart: workbookPart.name,
    workbookRelsPart: relsPartName(workbookPart.name),
    sheets,
    definedNames,
    ...(sstPart ? { sharedStrings: sstPart } : {}),
    ...(chainPart ? { calcChain: chainPart } : {}),
    date1904,
  };
}

#!/usr/bin/env node
/**
 * Writes a large invented workbook for measuring `lift-ledger audit` and `freeze` (time, memory):
 *
 *   node cli/scripts/bigWorkbook.js big.xlsx [--rows N]     (default 600 000 rows of 16 numbers ≈ 57 MB)
 *
 * Sheet "Log" holds N rows of invented daily counts (16 numeric columns; a deterministic generator, no
 * real data), streamed into the zip so the generator itself stays small in memory. Sheet "Read-out" holds
 * ABTEST formulas reading pairs of Log rows, with cached values from the closed form of the posterior mean
 * (alpha + conversions) / (alpha + beta + visitors) (Gelman et al., BDA3 §2.4) and of PRIOR_FROM_MEAN, so
 * an audit of a correct file agrees. One more ABTEST spill sits at the end of the Log sheet itself.
 *
 * Also used by test/cli/large.test.ts with a small N.
 */
'use strict';
const fs = require('fs');
const { Readable } = require('stream');
const yazl = require('yazl');

const MAIN = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const RT = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const PKG = 'http://schemas.openxmlformats.org/package/2006/relationships';
const HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n';

/** Column letters of a zero-based index. */
function col(i) {
  let n = i + 1;
  let s = '';
  while (n > 0) {
    s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/** Deterministic invented counts for row r: visitors A, B, conversions A, B, and twelve extra columns. */
function logRow(r) {
  let x = (r * 2654435761) >>> 0;
  const next = () => {
    x = (x * 1664525 + 1013904223) >>> 0;
    return x / 4294967296;
  };
  const visitorsA = 1000 + Math.floor(next() * 9000);
  const visitorsB = 1000 + Math.floor(next() * 9000);
  const conversionsA = Math.floor(visitorsA * (0.02 + next() * 0.06));
  const conversionsB = Math.floor(visitorsB * (0.02 + next() * 0.06));
  const extra = [];
  for (let i = 0; i < 12; i += 1) extra.push(i % 3 === 0 ? Math.round(next() * 1e6) / 100 : Math.round(next() * 1e4));
  return [visitorsA, visitorsB, conversionsA, conversionsB, ...extra];
}

/** Excel's last row is 1 048 576: the log keeps below it (header, rows, a blank row and one spill). */
const MAX_ROWS = 1048570;

/** The number of ABTEST formulas on the Read-out sheet for `rows` log rows. */
function readoutCount(rows) {
  return Math.max(1, Math.min(5000, Math.floor(rows / 130)));
}

function* logSheetXml(rows) {
  yield `${HEAD}<worksheet xmlns="${MAIN}" xmlns:r="${RT}"><sheetData>`;
  yield (
    '<row r="1"><c r="A1" t="inlineStr"><is><t>Visitors A (invented)</t></is></c><c r="B1" t="inlineStr"><is><t>Visitors B</t></is></c>' +
    '<c r="C1" t="inlineStr"><is><t>Conversions A</t></is></c><c r="D1" t="inlineStr"><is><t>Conversions B</t></is></c></row>'
  );
  let chunk = '';
  for (let r = 0; r < rows; r += 1) {
    const n = r + 2;
    const values = logRow(r);
    chunk += `<row r="${n}">`;
    for (let c = 0; c < values.length; c += 1) chunk += `<c r="${col(c)}${n}"><v>${values[c]}</v></c>`;
    chunk += '</row>';
    if (chunk.length > 1 << 16) {
      yield chunk;
      chunk = '';
    }
  }
  // One spill on the Log sheet itself: the posterior means of the first row's two variants.
  const first = logRow(0);
  const last = rows + 3;
  chunk +=
    `<row r="${last}"><c r="J${last}" cm="1"><f t="array" ref="J${last}:K${last}">ABTEST.POSTERIOR_MEAN(C2:D2,A2:B2)</f><v>${(1 + first[2]) / (2 + first[0])}</v></c>` +
    `<c r="K${last}"><v>${(1 + first[3]) / (2 + first[1])}</v></c></row>`;
  yield `${chunk}</sheetData></worksheet>`;
}

function readoutSheetXml(rows) {
  const count = readoutCount(rows);
  let xml = `${HEAD}<worksheet xmlns="${MAIN}" xmlns:r="${RT}"><sheetData>`;
  xml +=
    '<row r="1"><c r="A1" t="inlineStr"><is><t>Read-out of invented tests</t></is></c>' +
    '<c r="D1" cm="1"><f t="array" ref="D1:E1">ABTEST.PRIOR_FROM_MEAN(0.04,100)</f><v>4</v></c><c r="E1"><v>96</v></c></row>';
  for (let i = 0; i < count; i += 1) {
    const logRowIndex = Math.floor((i * (rows - 1)) / count);
    const n = logRowIndex + 2;
    const v = logRow(logRowIndex);
    const out = i * 2 + 3;
    xml +=
      `<row r="${out}"><c r="B${out}" cm="1"><f t="array" ref="B${out}:C${out}">ABTEST.POSTERIOR_MEAN(Log!$C$${n}:$D$${n},Log!$A$${n}:$B$${n})</f><v>${(1 + v[2]) / (2 + v[0])}</v></c>` +
      `<c r="C${out}"><v>${(1 + v[3]) / (2 + v[1])}</v></c>` +
      `<c r="E${out}"><f>ABTEST.POSTERIOR_MEAN(Log!C${n},Log!A${n},$D$1,$E$1)</f><v>${(4 + v[2]) / (100 + v[0])}</v></c></row>`;
  }
  return `${xml}</sheetData></worksheet>`;
}

/**
 * Writes the workbook to `file` with `rows` log rows. Resolves with the file's size in bytes.
 * @param {string} file
 * @param {number} rows
 * @returns {Promise<number>}
 */
async function writeBigWorkbook(file, rows) {
  if (!Number.isInteger(rows) || rows < 2 || rows > MAX_ROWS)
    throw new RangeError(`rows must be a whole number from 2 to ${MAX_ROWS}`);
  const zip = new yazl.ZipFile();
  const when = new Date(Date.UTC(2024, 0, 2));
  const add = (name, text) => zip.addBuffer(Buffer.from(text, 'utf8'), name, { mtime: when });
  add(
    '[Content_Types].xml',
    `${HEAD}<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
      '<Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>' +
      '<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>' +
      '<Override PartName="/xl/worksheets/sheet2.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/></Types>',
  );
  add(
    '_rels/.rels',
    `${HEAD}<Relationships xmlns="${PKG}"><Relationship Id="rId1" Type="${RT}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
  );
  add(
    'xl/workbook.xml',
    `${HEAD}<workbook xmlns="${MAIN}" xmlns:r="${RT}"><sheets><sheet name="Read-out" sheetId="1" r:id="rId1"/><sheet name="Log" sheetId="2" r:id="rId2"/></sheets></workbook>`,
  );
  add(
    'xl/_rels/workbook.xml.rels',
    `${HEAD}<Relationships xmlns="${PKG}"><Relationship Id="rId1" Type="${RT}/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="${RT}/worksheet" Target="worksheets/sheet2.xml"/></Relationships>`,
  );
  add('xl/worksheets/sheet1.xml', readoutSheetXml(rows));
  zip.addReadStream(Readable.from(logSheetXml(rows), { objectMode: false }), 'xl/worksheets/sheet2.xml', {
    mtime: when,
  });
  zip.end();
  await new Promise((resolve, reject) => {
    const sink = fs.createWriteStream(file);
    zip.outputStream.pipe(sink).on('close', resolve).on('error', reject);
  });
  return fs.statSync(file).size;
}

module.exports = { writeBigWorkbook, readoutCount, logRow, MAX_ROWS };

if (require.main === module) {
  const file = process.argv[2];
  const rowsAt = process.argv.indexOf('--rows');
  const rows = rowsAt > 0 ? Number(process.argv[rowsAt + 1]) : 600000;
  if (!file || !Number.isInteger(rows) || rows < 2 || rows > MAX_ROWS) {
    process.stderr.write(
      'usage: node cli/scripts/bigWorkbook.js <out.xlsx> [--rows N]   (2 ≤ N ≤ 1048570; default 600000 ≈ 57 MB)\n',
    );
    process.exit(2);
  }
  writeBigWorkbook(file, rows).then((size) => {
    process.stdout.write(
      `wrote ${file}: ${rows} log rows, ${readoutCount(rows) * 2 + 2} ABTEST formulas, ${(size / 1e6).toFixed(1)} MB\n`,
    );
  });
}

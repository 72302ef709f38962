/**
 * Project tables on disk (Node only): CSV (csv.ts) or .xlsx (exceljs). The
 * reader keeps every cell exactly as typed; the writer puts the input columns
 * back unchanged and the plan outputs in added columns. Not part of the plan
 * barrel, so the add-in bundle never pulls in exceljs.
 */
import { promises as fs } from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { MODEL_VERSION } from '../physics/constants';
import { HushInputError } from '../physics/errors';
import { parseCsv, writeCsv } from './csv';
import { COST_CONSTANTS, INPUT_FIELDS, OUTPUT_COLUMNS, OUTPUT_NAMES, headerName, outputHeaderText } from './fields';
import type { PlanCell } from './index';
import type { FieldValue } from './units';

export interface Table {
  header: FieldValue[];
  rows: FieldValue[][];
}

export type TableFormat = 'csv' | 'xlsx' | 'json';

export function tableFormat(file: string): TableFormat | null {
  const ext = path.extname(file).toLowerCase();
  return ext === '.csv' ? 'csv' : ext === '.xlsx' ? 'xlsx' : ext === '.json' ? 'json' : null;
}

function cellText(v: ExcelJS.CellValue): FieldValue {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof Date) return v.toISOString();
  if (typeof v === 'object') {
    if ('result' in v) return cellText((v as ExcelJS.CellFormulaValue).result as ExcelJS.CellValue);
    if ('richText' in v) return (v as ExcelJS.CellRichTextValue).richText.map((r) => r.text).join('');
    if ('text' in v) return String((v as ExcelJS.CellHyperlinkValue).text);
    if ('error' in v) return String((v as ExcelJS.CellErrorValue).error);
  }
  return String(v);
}

/** Largest project table `hush plan` accepts, in study rows (a larger one is almost surely not a project table). */
export const MAX_TABLE_ROWS = 100_000;
/** Largest table file read, bytes. */
export const MAX_TABLE_BYTES = 64 * 1024 * 1024;

function checkRows(file: string, rows: number): void {
  if (rows > MAX_TABLE_ROWS) {
    throw new HushInputError('table', `${file} has ${rows} rows: a project table may have at most ${MAX_TABLE_ROWS} studies; split it`, 'value');
  }
}

/** Reads the first worksheet of an .xlsx, or a CSV file; the first row is the header. */
export async function readTable(file: string): Promise<Table> {
  const format = tableFormat(file);
  if (format) {
    const size = (await fs.stat(file)).size;
    if (size > MAX_TABLE_BYTES) {
      throw new HushInputError('table', `${file} is ${size} bytes: a project table file may be at most ${MAX_TABLE_BYTES} bytes`, 'value');
    }
  }
  if (format === 'csv') {
    const rows = parseCsv(await fs.readFile(file, 'utf8'));
    if (!rows.length) throw new HushInputError('table', `${file} is empty: a project table needs a header row`, 'value');
    checkRows(file, rows.length - 1);
    return { header: rows[0], rows: rows.slice(1) };
  }
  if (format === 'xlsx') {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(file);
    const ws = wb.worksheets[0];
    if (!ws || ws.rowCount === 0) throw new HushInputError('table', `${file} has no rows: a project table needs a header row`, 'value');
    checkRows(file, ws.rowCount - 1);
    const width = ws.getRow(1).cellCount;
    const read = (r: number) => {
      const row = ws.getRow(r);
      const out: FieldValue[] = [];
      for (let c = 1; c <= width; c++) out.push(cellText(row.getCell(c).value));
      return out;
    };
    const header = read(1);
    const rows: FieldValue[][] = [];
    for (let r = 2; r <= ws.rowCount; r++) rows.push(read(r));
    while (rows.length && rows[rows.length - 1].every((v) => v === '')) rows.pop();
    return { header, rows };
  }
  throw new HushInputError('table', `${file}: a project table must be a .csv or .xlsx file`, 'value');
}

/** Columns of the input table that are kept (everything but earlier plan outputs). */
export function keptColumns(header: readonly FieldValue[]): number[] {
  const outputs = new Set(OUTPUT_NAMES);
  const keep: number[] = [];
  header.forEach((h, k) => {
    if (!outputs.has(headerName(h))) keep.push(k);
  });
  return keep;
}

export interface PlannedRow {
  /** Values as read, full width of the input table. */
  values: FieldValue[];
  /** Output values in OUTPUT_COLUMNS order; null for a blank row. */
  outputs: PlanCell[] | null;
  failed: boolean;
}

export const ESTIMATE_NOTE =
  'Runtime and cost are planning estimates from the throughput and price you give for your hardware, not measurements. ' +
  'Before relying on a design, run a convergence check: repeat one study with the absorber a few layers thicker (or the gap larger) and confirm the monitored result does not change beyond your tolerance.';

/** Writes the planned table to `file` (.csv, .xlsx or .json). */
export async function writeTable(file: string, header: readonly FieldValue[], rows: readonly PlannedRow[]): Promise<void> {
  const format = tableFormat(file);
  if (format === null) throw new HushInputError('out', `${file}: the plan can be written as .xlsx, .csv or .json`, 'value');
  // Written beside the target and renamed over it, so a failed write leaves
  // no half-written file (and an existing one as it was).
  const temp = path.join(path.dirname(file), `.${path.basename(file)}.${process.pid}.${Date.now()}.tmp`);
  try {
    await writePlanFile(temp, format, header, rows);
    await fs.rename(temp, file);
  } catch (e) {
    await fs.rm(temp, { force: true }).catch(() => undefined);
    throw e;
  }
}

async function writePlanFile(file: string, format: TableFormat, header: readonly FieldValue[], rows: readonly PlannedRow[]): Promise<void> {
  const keep = keptColumns(header);
  const outHeader = OUTPUT_COLUMNS.map(outputHeaderText);
  if (format === 'csv') {
    const lines: (FieldValue | PlanCell)[][] = [[...keep.map((k) => header[k]), ...outHeader]];
    for (const r of rows) lines.push([...keep.map((k) => r.values[k]), ...(r.outputs ?? OUTPUT_NAMES.map(() => null))]);
    await fs.writeFile(file, writeCsv(lines as (string | number | boolean | null)[][]), 'utf8');
    return;
  }
  if (format === 'json') {
    const list = rows.map((r, i) => {
      const inputs: Record<string, FieldValue> = {};
      for (const k of keep) inputs[String(header[k])] = r.values[k];
      const outputs: Record<string, PlanCell> = {};
      if (r.outputs) OUTPUT_NAMES.forEach((n, j) => (outputs[n] = (r.outputs as PlanCell[])[j]));
      return { row: i + 2, inputs, outputs: r.outputs ? outputs : null, failed: r.failed };
    });
    await fs.writeFile(file, JSON.stringify({ model_version: MODEL_VERSION, note: ESTIMATE_NOTE, cost_constants: COST_CONSTANTS, rows: list }, null, 2) + '\n', 'utf8');
    return;
  }
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Hush';
  const ws = wb.addWorksheet('plan', { views: [{ state: 'frozen', xSplit: 1, ySplit: 1 }] });
  const nIn = keep.length;
  ws.addRow([...keep.map((k) => header[k] as ExcelJS.CellValue), ...outHeader]);
  for (const r of rows) {
    ws.addRow([...keep.map((k) => r.values[k] as ExcelJS.CellValue), ...(r.outputs ?? []).map((v) => v as ExcelJS.CellValue)]);
  }
  const head = ws.getRow(1);
  head.font = { bold: true };
  head.alignment = { vertical: 'bottom', wrapText: true };
  head.height = 32;
  const inputFill: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFEDEDED' } };
  const outputFill: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFDCE8F5' } };
  for (let c = 1; c <= nIn; c++) {
    const col = ws.getColumn(c);
    col.width = Math.max(10, Math.min(28, String(header[keep[c - 1]] ?? '').length + 4));
    head.getCell(c).fill = inputFill;
  }
  OUTPUT_COLUMNS.forEach((oc, j) => {
    const c = nIn + 1 + j;
    const col = ws.getColumn(c);
    col.numFmt = oc.format;
    col.width = oc.name === 'notes' ? 70 : Math.max(11, Math.min(24, outputHeaderText(oc).length + 2));
    const cell = head.getCell(c);
    cell.fill = outputFill;
    cell.note = oc.name === 'runtime' || oc.name === 'cost' ? `${oc.description}. Planning estimate: see the "about" sheet.` : oc.description;
    if (oc.name === 'notes') col.alignment = { wrapText: true, vertical: 'top' };
  });
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: nIn + OUTPUT_COLUMNS.length } };

  const about = wb.addWorksheet('about');
  about.getColumn(1).width = 24;
  about.getColumn(2).width = 16;
  about.getColumn(3).width = 90;
  about.addRow(['Hush absorber plan']).font = { bold: true, size: 14 };
  about.addRow(['model version', MODEL_VERSION]);
  const note = about.addRow(['note', '', ESTIMATE_NOTE]);
  note.getCell(3).alignment = { wrapText: true };
  note.height = 48;
  about.addRow([]);
  about.addRow(['cost constant', 'input field', 'value (adjust with the input field)']).font = { bold: true };
  for (const c of COST_CONSTANTS) about.addRow([c.name, c.field, c.value]);
  about.addRow([]);
  about.addRow(['output column', 'unit', 'meaning']).font = { bold: true };
  for (const oc of OUTPUT_COLUMNS) about.addRow([oc.name, oc.unit, oc.description]);
  about.addRow([]);
  about.addRow(['input field', 'bare number in', 'meaning']).font = { bold: true };
  for (const f of INPUT_FIELDS) about.addRow([f.name, f.unit, f.description]);
  await wb.xlsx.writeFile(file);
}

/**
 * The plan as an .xlsx workbook, streamed out with exceljs's streaming writer
 * (rows go to the file as they are made, the writer waiting while the zip
 * catches up: zipQueueDrained; the workbook is never built in memory). Sheets: "plan" (the table as read, cells in their places, with
 * the outputs in added columns), "summary" (per study and in total, printed
 * on one page) and "about" (model version, estimate note, constants,
 * columns). Numbers are number cells: an .xlsx input's cells keep their
 * number formats, formulas and notes; a CSV cell that is a plain number
 * becomes a number, anything else stays text exactly as typed. Document
 * dates and zip timestamps are fixed, so the same plan gives the same bytes.
 */
import { promises as fs } from 'fs';
import type * as ExcelJSModule from 'exceljs';
import { MODEL_VERSION } from '../../physics/constants';
import { COST_CONSTANTS, INPUT_FIELDS, OUTPUT_COLUMNS } from '../fields';
import type { PlanCell } from '../index';
import type { FieldValue } from '../units';
import { renameNote } from './header';
import { planLayout, type PlannedRow, type Slot } from './layout';
import type { SourceRow, Table } from './model';
import { share, type PlanTotals } from './summary';
import { ooxmlEscape, plainNumber } from './text';
import { ESTIMATE_NOTE } from './write-json';
import { fixZipTimes } from './zip';

/** Creation and modification date written into every plan workbook (fixed, so runs give identical files). */
export const DOCUMENT_DATE = new Date(Date.UTC(1980, 0, 1));

type CellValue = ExcelJSModule.CellValue;
type Worksheet = ExcelJSModule.Worksheet;

const INPUT_FILL: ExcelJSModule.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFEDEDED' } };
const OUTPUT_FILL: ExcelJSModule.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFDCE8F5' } };

/**
 * Shared style objects: exceljs's writer recognises a style object it has
 * seen (a WeakMap), so cells that share one object skip styling work; a
 * cell made by the writer gets a fresh object, so each cell's style is
 * replaced by the shared object for its number format.
 */
class Styles {
  private readonly byFormat = new Map<string, Partial<ExcelJSModule.Style>>();
  private readonly plain: Partial<ExcelJSModule.Style> = {};
  of(numFmt: string | undefined): Partial<ExcelJSModule.Style> {
    if (numFmt === undefined) return this.plain;
    let s = this.byFormat.get(numFmt);
    if (!s) this.byFormat.set(numFmt, (s = { numFmt }));
    return s;
  }
}

/** Rows written between two looks at the zip's queue (zipQueueDrained). */
const ROWS_PER_LOOK = 200;
/** Bytes of sheet XML allowed to wait for the zip before the writer waits (8 MiB). */
const ZIP_QUEUE_LIMIT = 8 << 20;

/**
 * Waits while more than ZIP_QUEUE_LIMIT bytes of `ws`'s XML wait to be
 * compressed. exceljs's streaming writer hands each sheet's XML to the zip
 * without backpressure (its buffer's write never returns false), so a sheet
 * written in one synchronous loop is queued whole, uncompressed, before the
 * zip takes any of it (283 MB of XML for 100,000 rows). The queue is the
 * stream the zip reads the sheet from (the `pipes` of exceljs's stream
 * buffer, a Node stream with its `_writableState`); where that is not found
 * (another exceljs), nothing waits and the bytes are the same.
 */
async function zipQueueDrained(ws: Worksheet): Promise<void> {
  let queued = zipQueueLength(ws);
  while (queued !== null && queued > ZIP_QUEUE_LIMIT) {
    await new Promise((resolve) => setTimeout(resolve, 1));
    queued = zipQueueLength(ws);
  }
}

/** Bytes of a streamed sheet's XML waiting for the zip, or null where the queue is not found (see zipQueueDrained). */
export function zipQueueLength(ws: Worksheet): number | null {
  const stream = (ws as unknown as { stream?: { pipes?: { _writableState?: { length?: unknown } }[] } }).stream;
  const length = stream?.pipes?.[0]?._writableState?.length;
  return typeof length === 'number' ? length : null;
}

/** The value written for a cell of the table (a CSV cell that is a plain number becomes a number). */
function inputValue(table: Table, row: SourceRow, c: number): CellValue {
  const v = row.values[c];
  const formula = row.formulas?.[c];
  if (formula !== undefined) return (row.noResult?.has(c) ? { formula } : { formula, result: text(v) }) as CellValue;
  if (v === undefined || v === null || v === '') return null;
  if (typeof v === 'string' && table.format === 'csv') return plainNumber(v) ?? ooxmlEscape(v);
  return text(v) as CellValue;
}

/** A value as the workbook holds it: text with control characters escaped (ooxmlEscape), so none is dropped. */
function text<T>(v: T): T {
  return (typeof v === 'string' ? ooxmlEscape(v) : v) as T;
}

function textLength(v: FieldValue): number {
  return v === undefined || v === null ? 0 : typeof v === 'string' ? v.length : String(v).length;
}

function columnWidth(table: Table, slot: Slot, header: string): number {
  if (slot.output !== undefined) {
    const c = OUTPUT_COLUMNS[slot.output];
    return c.name === 'notes' ? 70 : Math.max(11, Math.min(24, header.length + 2));
  }
  const col = slot.column;
  let longest = 0;
  // Every study name counts; other columns are sized from their first rows.
  const rows = col.field === 'study' ? table.rows.length : Math.min(table.rows.length, 1000);
  for (let i = 0; i < rows; i++) longest = Math.max(longest, textLength(table.rows[i].values[col.index]));
  // The study names set the width of their column (up to 60 characters); other columns fit their header, up to 28.
  if (col.field === 'study') return Math.max(10, Math.min(60, Math.max(longest, header.length) + 2));
  return Math.max(10, Math.min(28, Math.max(header.length + 4, longest + 2)));
}

function outputNote(j: number, renamedTo: string | null): string {
  const oc = OUTPUT_COLUMNS[j];
  const base = oc.name === 'runtime' || oc.name === 'cost' ? `${oc.description}. Planning estimate: see the "about" sheet.` : oc.description;
  return renamedTo ? `${base} (Hush's "${oc.name}" output, named ${renamedTo} because the table has a column of that name.)` : base;
}

async function writePlanSheet(wb: ExcelJSModule.stream.xlsx.WorkbookWriter, table: Table, planned: readonly PlannedRow[]): Promise<void> {
  const { slots, headers } = planLayout(table);
  const renamed = new Map(headers.renamed);
  const headerNumber = table.header.number;
  const studySlot = slots.findIndex((s) => s.column?.field === 'study');
  const ws = wb.addWorksheet('plan', { views: [{ state: 'frozen', xSplit: studySlot >= 0 ? studySlot + 1 : 1, ySplit: headerNumber }] });
  const headerTexts = slots.map((s) => (s.column ? s.column.name : headers.texts[s.output]));
  ws.columns = slots.map((s, k) => ({ width: columnWidth(table, s, headerTexts[k]) }));
  const styles = new Styles();
  const outputStyles = OUTPUT_COLUMNS.map((c) => styles.of(c.format));
  ws.autoFilter = { from: { row: headerNumber, column: 1 }, to: { row: headerNumber, column: slots.length } };

  const writeRow = (source: SourceRow, outputs: readonly PlanCell[] | null) => {
    const row = ws.getRow(source.number);
    slots.forEach((s, k) => {
      if (s.column) {
        const c = s.column.index;
        const value = inputValue(table, source, c);
        const note = source.notes?.[c];
        if (value === null && note === undefined) return;
        const cell = row.getCell(k + 1);
        cell.value = value;
        cell.style = styles.of(source.formats?.[c]);
        if (note !== undefined) cell.note = text(note);
      } else if (outputs && outputs[s.output] !== null && outputs[s.output] !== undefined) {
        const cell = row.getCell(k + 1);
        cell.value = text(outputs[s.output]) as CellValue;
        cell.style = outputStyles[s.output];
      }
    });
    row.commit();
  };

  for (const r of table.above) writeRow(r, null);
  const head = ws.getRow(headerNumber);
  head.font = { bold: true };
  head.alignment = { vertical: 'bottom', wrapText: true };
  head.height = 32;
  slots.forEach((s, k) => {
    const cell = head.getCell(k + 1);
    if (s.column) {
      const c = s.column;
      const note = table.header.notes?.[c.index];
      if (c.name !== '' || note !== undefined) {
        cell.value = text(c.generated ? c.name : (table.header.values[c.index] as CellValue) ?? c.name);
        if (table.header.formats?.[c.index]) cell.numFmt = table.header.formats[c.index] as string;
      }
      if (note !== undefined) cell.note = text(note);
      else if (c.generated) cell.note = 'This column had cells but no header; Hush named it by its column letter.';
      cell.fill = INPUT_FILL;
    } else {
      cell.value = headers.texts[s.output];
      cell.fill = OUTPUT_FILL;
      cell.note = outputNote(s.output, renamed.get(OUTPUT_COLUMNS[s.output].name) ?? null);
    }
  });
  head.commit();
  for (let i = 0; i < planned.length; i++) {
    writeRow(planned[i].row, planned[i].outputs);
    if ((i + 1) % ROWS_PER_LOOK === 0) await zipQueueDrained(ws);
  }
  ws.commit();
}

/** Summary sheet columns: header, number format, width. */
const SUMMARY_COLUMNS: [string, string, number][] = [
  ['study', '@', 30],
  ['table row', '0', 9],
  ['cells', '#,##0', 15],
  ['absorber share of cells', '0.0%', 11],
  ['memory [GB]', '0.000', 11],
  ['absorber share of memory', '0.0%', 11],
  ['steps', '#,##0', 12],
  ['node-hours (estimate)', '#,##0.00', 12],
  ['absorber share of node-hours', '0.0%', 11],
  ['runtime [h] (estimate)', '#,##0.00', 12],
  ['absorber share of runtime', '0.0%', 11],
  ['cost (estimate, price currency)', '#,##0.00', 13],
  ['absorber share of cost', '0.0%', 11],
  ['nodes', '0', 7],
  ['throughput [cell updates/s per node]', '0.00E+00', 14],
  ['price per node-hour (as typed)', '@', 14],
  ['precision', '@', 10],
];

/** First row of the per-study rows on the summary sheet. */
export const SUMMARY_FIRST_ROW = 5;

async function writeSummarySheet(wb: ExcelJSModule.stream.xlsx.WorkbookWriter, planned: readonly PlannedRow[], totals: PlanTotals): Promise<void> {
  const figures = planned.map((p) => p.figures).filter((f): f is NonNullable<typeof f> => f !== null);
  const onePage = figures.length <= 60;
  const ws: Worksheet = wb.addWorksheet('summary', {
    views: [{ state: 'frozen', xSplit: 1, ySplit: SUMMARY_FIRST_ROW - 1 }],
    pageSetup: { orientation: 'landscape', fitToPage: true, fitToWidth: 1, fitToHeight: onePage ? 1 : 0 },
  });
  const longest = figures.reduce((m, f) => Math.max(m, Array.from(f.study).length), 0);
  ws.columns = SUMMARY_COLUMNS.map(([, , width], k) => ({ width: k === 0 ? Math.max(12, Math.min(60, longest + 2)) : width }));
  const styles = new Styles();
  const columnStyles = SUMMARY_COLUMNS.map(([, numFmt]) => styles.of(numFmt));
  const title = ws.getRow(1);
  title.getCell(1).value = `Hush plan summary: ${totals.studies} planned ${totals.studies === 1 ? 'study' : 'studies'}${totals.failed ? `, ${totals.failed} failed (not in the totals)` : ''}`;
  title.font = { bold: true, size: 14 };
  title.commit();
  const note = ws.getRow(2);
  note.getCell(1).value =
    'Runtime, node-hours and cost are planning estimates from the throughput and price given for each study (columns O and P), not measurements. ' +
    'Totals are sums over the studies, except memory: the largest study, since each study is its own run.';
  note.commit();
  const head = ws.getRow(SUMMARY_FIRST_ROW - 1);
  head.font = { bold: true };
  head.alignment = { vertical: 'bottom', wrapText: true };
  head.height = 45;
  SUMMARY_COLUMNS.forEach(([h], k) => {
    const cell = head.getCell(k + 1);
    cell.value = h;
    cell.fill = k >= 13 ? INPUT_FILL : OUTPUT_FILL;
    cell.numFmt = '@';
  });
  head.commit();
  let n = SUMMARY_FIRST_ROW;
  for (const f of figures) {
    const row = ws.getRow(n++);
    const values: (CellValue | null)[] = [
      f.study,
      f.row,
      f.cells,
      share(f.cellsAbsorber, f.cells),
      f.memoryBytes / 1e9,
      share(f.memoryAbsorberBytes, f.memoryBytes),
      f.steps,
      f.nodeHours,
      f.nodeHours === null ? null : share(f.nodeHoursAbsorber ?? 0, f.nodeHours),
      f.runtimeHours,
      f.runtimeHours === null ? null : share(f.runtimeAbsorberHours ?? 0, f.runtimeHours),
      f.cost,
      f.cost === null ? null : share(f.costAbsorber ?? 0, f.cost),
      f.nodes,
      f.throughput,
      f.price || null,
      f.precision,
    ];
    values.forEach((v, k) => {
      if (v === null || v === undefined) return;
      const cell = row.getCell(k + 1);
      cell.value = text(v);
      cell.style = columnStyles[k];
    });
    row.commit();
    if ((n - SUMMARY_FIRST_ROW) % ROWS_PER_LOOK === 0) await zipQueueDrained(ws);
  }
  if (figures.length) {
    const first = SUMMARY_FIRST_ROW;
    const last = n - 1;
    const range = (c: string) => `${c}${first}:${c}${last}`;
    const row = ws.getRow(n);
    row.font = { bold: true };
    const put = (col: number, formula: string, result: number | null) => {
      if (result === null || !Number.isFinite(result)) return;
      const cell = row.getCell(col);
      cell.value = { formula, result } as CellValue;
      cell.numFmt = SUMMARY_COLUMNS[col - 1][1];
    };
    row.getCell(1).value = `total (${figures.length} ${figures.length === 1 ? 'study' : 'studies'})`;
    put(3, `SUM(${range('C')})`, totals.cells);
    put(4, `SUMPRODUCT(${range('C')},${range('D')})/SUM(${range('C')})`, share(totals.cellsAbsorber, totals.cells));
    put(5, `MAX(${range('E')})`, totals.peakMemoryBytes / 1e9);
    put(6, `INDEX(${range('F')},MATCH(MAX(${range('E')}),${range('E')},0))`, share(totals.peakMemoryAbsorberBytes, totals.peakMemoryBytes));
    if (totals.withSteps) put(7, `SUM(${range('G')})`, totals.steps);
    if (totals.withRuntime) {
      put(8, `SUM(${range('H')})`, totals.nodeHours);
      put(9, `SUMPRODUCT(${range('H')},${range('I')})/SUM(${range('H')})`, share(totals.nodeHoursAbsorber, totals.nodeHours));
      put(10, `SUM(${range('J')})`, totals.runtimeHours);
      put(11, `SUMPRODUCT(${range('J')},${range('K')})/SUM(${range('J')})`, share(totals.runtimeAbsorberHours, totals.runtimeHours));
    }
    if (totals.withCost && totals.cost !== null) {
      put(12, `SUM(${range('L')})`, totals.cost);
      put(13, `SUMPRODUCT(${range('L')},${range('M')})/SUM(${range('L')})`, share(totals.costAbsorber ?? 0, totals.cost));
    }
    row.commit();
    n++;
    if (totals.cost === null) {
      const r = ws.getRow(n++);
      r.getCell(1).value = `No cost total: the studies price in different currencies (${totals.currencies.join(', ')}).`;
      r.commit();
    }
  }
  ws.commit();
}

async function writeAboutSheet(wb: ExcelJSModule.stream.xlsx.WorkbookWriter, table: Table, read: string | null): Promise<void> {
  const about = wb.addWorksheet('about');
  about.columns = [{ width: 24 }, { width: 16 }, { width: 90 }];
  const add = (values: CellValue[], bold = false) => {
    const r = about.addRow(values.map(text));
    if (bold) r.font = { bold: true };
    return r;
  };
  add(['Hush absorber plan']).font = { bold: true, size: 14 };
  add(['model version', MODEL_VERSION]);
  const note = add(['note', '', ESTIMATE_NOTE]);
  note.getCell(3).alignment = { wrapText: true };
  note.height = 48;
  if (read) add(['table read', '', read]);
  const renames = renameNote(planLayout(table).headers.renamed);
  if (renames) add(['output columns', '', renames]);
  add([]);
  add(['cost constant', 'input field', 'value (adjust with the input field)'], true);
  for (const c of COST_CONSTANTS) add([c.name, c.field, c.value]);
  add([]);
  add(['output column', 'unit', 'meaning'], true);
  for (const oc of OUTPUT_COLUMNS) add([oc.name, oc.unit, oc.description]);
  add([]);
  add(['input field', 'bare number in', 'meaning'], true);
  for (const f of INPUT_FIELDS) add([f.name, f.unit, f.description]);
  about.commit();
}

/** Writes the plan workbook to `file` (a temporary file the caller renames into place). */
export async function writePlanXlsx(file: string, table: Table, planned: readonly PlannedRow[], totals: PlanTotals, read: string | null): Promise<void> {
  const ExcelJS = await import('exceljs');
  const Writer = (ExcelJS.stream ?? (ExcelJS as unknown as { default: typeof ExcelJSModule }).default.stream).xlsx.WorkbookWriter;
  const options = { filename: file, useStyles: true, useSharedStrings: true, created: DOCUMENT_DATE, modified: DOCUMENT_DATE, creator: 'Hush', lastModifiedBy: 'Hush' };
  const wb = new Writer(options as ConstructorParameters<typeof Writer>[0]);
  await writePlanSheet(wb, table, planned);
  await writeSummarySheet(wb, planned, totals);
  await writeAboutSheet(wb, table, read);
  await wb.commit();
  const bytes = await fs.readFile(file);
  fixZipTimes(bytes);
  await fs.writeFile(file, bytes);
}

/**
 * Reading a project table file: a CSV (decoded, delimiter found) or one
 * sheet of an .xlsx (--sheet NAME|N, or the first visible sheet with a
 * header), with the header row found below any title rows. Bounded by
 * construction: the file size is checked first, rows and cells are counted
 * as they are read, and reading stops at the first one beyond a bound.
 */
import { promises as fs } from 'fs';
import * as path from 'path';
import { HushInputError } from '../../physics/errors';
import { INPUT_NAMES, headerName } from '../fields';
import { eachCsvRecord } from '../csv';
import { decodeTable } from './decode';
import { buildTable, findHeader, noHeaderMessage, tooManyRows } from './header';
import { HEADER_SEARCH_ROWS, MAX_CELL_CHARS, MAX_TABLE_BYTES, MAX_TABLE_CELLS, MAX_TABLE_COLUMNS, MAX_TABLE_ROWS } from './limits';
import type { SourceRow, Table } from './model';
import { columnIndex as columnIndexOf, quoteInput } from './text';
import { openWorkbook, readSheetNotes, readSheetRows, type ReadStats, type SheetInfo, type Workbook } from './xlsx-read';

export type { ReadStats } from './xlsx-read';

export type TableFormat = 'csv' | 'xlsx' | 'json';

export function tableFormat(file: string): TableFormat | null {
  const ext = path.extname(file).toLowerCase();
  return ext === '.csv' ? 'csv' : ext === '.xlsx' ? 'xlsx' : ext === '.json' ? 'json' : null;
}

export interface ReadOptions {
  /** .xlsx: the sheet to read, by name or 1-based position. */
  sheet?: string;
  /** Filled with the work done (rows, cells, bytes unpacked). */
  stats?: ReadStats;
}

/** Work of every table read in this process (counted, like the design search's designWork). */
const work: ReadStats = { bytesUnpacked: 0, rowsRead: 0, cellsRead: 0 };

/** Rows, cells and unpacked bytes read by all readTable calls so far in this process. */
export function tableReadWork(): ReadStats {
  return { ...work };
}

function count(s: ReadStats): void {
  work.bytesUnpacked += s.bytesUnpacked;
  work.rowsRead += s.rowsRead;
  work.cellsRead += s.cellsRead;
}

function bad(message: string): HushInputError {
  return new HushInputError('table', message, 'value');
}

/** Reads a project table (.csv or .xlsx). Throws HushInputError with a message naming the file and what is wrong. */
export async function readTable(file: string, options: ReadOptions = {}): Promise<Table> {
  const format = tableFormat(file);
  if (format !== 'csv' && format !== 'xlsx') throw bad(`${file}: a project table must be a .csv or .xlsx file`);
  const size = (await fs.stat(file)).size;
  if (size > MAX_TABLE_BYTES) throw bad(`${file} is ${size} bytes: a project table file may be at most ${MAX_TABLE_BYTES} bytes`);
  const bytes = await fs.readFile(file);
  const stats: ReadStats = { bytesUnpacked: 0, rowsRead: 0, cellsRead: 0 };
  try {
    if (format === 'csv') {
      if (options.sheet !== undefined) throw bad(`--sheet applies to .xlsx workbooks; ${file} is a CSV file`);
      return readCsvTable(file, bytes, stats);
    }
    return await readXlsxTable(file, bytes, { ...options, stats });
  } finally {
    count(stats);
    if (options.stats) Object.assign(options.stats, stats);
  }
}

const FIELD_SET = new Set(INPUT_NAMES);

/**
 * The delimiter of a CSV: ";" when the first line that names a plan field
 * (split at "," or ";") has no "," but has ";"; "," otherwise.
 */
export function detectDelimiter(text: string): ',' | ';' {
  const lines = text.slice(0, 1 << 16).split(/\r\n|\n|\r/, HEADER_SEARCH_ROWS);
  for (const line of lines) {
    const names = line.split(/[,;]/).map((t) => headerName(t.replace(/^\s*"|"\s*$/g, '')));
    if (names.some((n) => FIELD_SET.has(n))) return !line.includes(',') && line.includes(';') ? ';' : ',';
  }
  return ',';
}

function readCsvTable(file: string, bytes: Buffer, stats: ReadStats): Table {
  const decoded = decodeTable(bytes, file);
  const text = decoded.text;
  const delimiter = detectDelimiter(text);
  const rows: SourceRow[] = [];
  let header: SourceRow | null = null;
  let cells = 0;
  let n = 0;
  eachCsvRecord(
    text,
    (fields) => {
      n++;
      for (const f of fields) if (f !== '' && ++cells > MAX_TABLE_CELLS) throw bad(`${file} has more than ${MAX_TABLE_CELLS} cells: a project table may have at most ${MAX_TABLE_CELLS}; split it`);
      stats.rowsRead = n;
      stats.cellsRead = cells;
      rows.push({ number: n, values: fields });
      if (header === null) {
        if (n === HEADER_SEARCH_ROWS) {
          header = findHeader(rows);
          if (!header) throw bad(noHeaderMessage(file));
        }
      } else if (n - header.number > MAX_TABLE_ROWS) throw tooManyRows(file, header.number);
    },
    { delimiter, maxFields: MAX_TABLE_COLUMNS, maxFieldChars: MAX_CELL_CHARS },
  );
  if (!rows.length) throw bad(`${file} is empty: a project table needs a header row`);
  header ??= findHeader(rows);
  if (!header) throw bad(noHeaderMessage(file));
  const notes = decoded.note ? [decoded.note] : [];
  return buildTable(rows, header, { file, format: 'csv', sheet: null, encoding: decoded.encoding, delimiter, notes, date1904: false });
}

function describeSheet(s: SheetInfo): string {
  return `${quoteInput(s.name).replace(/^"|"$/g, "'")}${s.state !== 'visible' ? ` (${s.state === 'hidden' ? 'hidden' : 'very hidden'})` : ''}${s.kind === 'chartsheet' ? ' (chart)' : ''}`;
}

function sheetList(wb: Workbook): string {
  const names = wb.sheets.map(describeSheet);
  return names.length > 12 ? `${names.slice(0, 12).join(', ')} and ${names.length - 12} more` : names.join(', ');
}

/** The sheet `--sheet` names: a name (exact, else ignoring case) or a 1-based position. */
function namedSheet(wb: Workbook, wanted: string): SheetInfo {
  const exact = wb.sheets.find((s) => s.name === wanted) ?? wb.sheets.find((s) => s.name.toLowerCase() === wanted.toLowerCase());
  const byNumber = /^\d+$/.test(wanted) ? wb.sheets[Number(wanted) - 1] : undefined;
  const s = exact ?? byNumber;
  if (!s) {
    throw bad(`${wb.file} has no sheet ${quoteInput(wanted)}${/^\d+$/.test(wanted) ? ` (it has ${wb.sheets.length})` : ''}; its sheets: ${sheetList(wb)}`);
  }
  if (s.kind === 'chartsheet' || !s.part) throw bad(`${wb.file}: sheet ${describeSheet(s)} is a chart sheet, not a table`);
  return s;
}

function where(wb: Workbook, s: SheetInfo): string {
  return `${wb.file}, sheet ${describeSheet(s).replace(/ \(.*$/, '')}`;
}

async function readXlsxTable(file: string, bytes: Buffer, options: ReadOptions): Promise<Table> {
  const wb = await openWorkbook(file, bytes);
  const report = () => {
    if (options.stats) Object.assign(options.stats, wb.stats);
  };
  try {
    if (!wb.sheets.length) throw bad(`${file} has no sheets`);
    let sheet: SheetInfo | null = null;
    let header: SourceRow | null = null;
    const skipped: string[] = [];
    if (options.sheet !== undefined) {
      sheet = namedSheet(wb, options.sheet);
      header = findHeader(await readSheetRows(wb, sheet, { lastRow: HEADER_SEARCH_ROWS, where: where(wb, sheet) }));
      if (!header) throw bad(noHeaderMessage(where(wb, sheet)));
    } else {
      const hiddenWithHeader: SheetInfo[] = [];
      for (const s of wb.sheets) {
        if (s.kind === 'chartsheet' || !s.part) continue;
        const h = findHeader(await readSheetRows(wb, s, { lastRow: HEADER_SEARCH_ROWS, where: where(wb, s) }));
        if (s.state !== 'visible') {
          if (h) hiddenWithHeader.push(s);
          continue;
        }
        if (h) {
          sheet = s;
          header = h;
          break;
        }
        skipped.push(describeSheet(s));
      }
      if (!sheet || !header) {
        const hidden = hiddenWithHeader.length ? `; hidden sheet ${describeSheet(hiddenWithHeader[0]).replace(/ \(.*$/, '')} has one: give --sheet ${quoteInput(hiddenWithHeader[0].name)} to plan it` : '';
        throw bad(`${file}: no visible sheet has a header row naming plan fields (study, band_short, cell, …) within its first ${HEADER_SEARCH_ROWS} rows; sheets: ${sheetList(wb)}${hidden}`);
      }
    }
    const w = where(wb, sheet);
    const rows = await readSheetRows(wb, sheet, { headerRow: header.number, where: w });
    const notes = await readSheetNotes(wb, sheet);
    attachNotes(rows, notes);
    const head = rows.find((r) => r.number === header!.number) ?? header;
    const table = buildTable(rows, head, {
      file,
      format: 'xlsx',
      sheet: { name: sheet.name, position: sheet.position, count: wb.sheets.length, skipped },
      encoding: null,
      delimiter: null,
      notes: [],
      date1904: wb.date1904,
    });
    return table;
  } finally {
    report();
  }
}

/** Puts the notes of a sheet on its rows (a note on an empty cell among the rows read makes that row). */
function attachNotes(rows: SourceRow[], notes: Map<string, string>): void {
  if (!notes.size) return;
  const byNumber = new Map(rows.map((r) => [r.number, r]));
  const last = rows.length ? rows[rows.length - 1].number : 0;
  let added = false;
  for (const [ref, text] of notes) {
    const m = /^([A-Z]{1,3})(\d+)$/.exec(ref);
    if (!m) continue;
    const col = columnIndexOf(m[1]);
    const number = Number(m[2]);
    if (col < 0 || col >= MAX_TABLE_COLUMNS || number > last) continue;
    let r = byNumber.get(number);
    if (!r) {
      r = { number, values: [] };
      byNumber.set(number, r);
      rows.push(r);
      added = true;
    }
    (r.notes ??= [])[col] = text;
  }
  if (added) rows.sort((a, b) => a.number - b.number);
}

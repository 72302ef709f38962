/**
 * Reads .xlsx workbooks (ECMA-376 SpreadsheetML) without building them in
 * memory: the zip directory first, then the workbook's sheet list, shared
 * strings and number formats, then one sheet's rows as they stream out of
 * its part. Only cells that are present are kept; rows and columns are
 * counted against the table bounds as they are read, and reading stops at
 * the first cell beyond one.
 */
import { HushInputError } from '../../physics/errors';
import type { FieldValue } from '../units';
import { builtinFormat } from './formats';
import { MAX_CELL_CHARS, MAX_TABLE_CELLS, MAX_TABLE_COLUMNS, MAX_TABLE_ROWS, MAX_XLSX_UNPACKED_BYTES } from './limits';
import type { SourceRow } from './model';
import { cellName, columnIndex, columnLetters, ooxmlUnescape, quoteInput } from './text';
import { readXml, StopReading, XmlError } from './xml';
import { BudgetSpent, entryChunks, zipEntries, ZipError, type UnpackBudget, type ZipEntry } from './zip';
import { tooManyRows } from './header';

export interface SheetInfo {
  name: string;
  /** 1-based position in the workbook (tab order). */
  position: number;
  state: 'visible' | 'hidden' | 'veryHidden';
  /** Path of the sheet's part in the archive; null for a chart sheet or a missing part. */
  part: string | null;
  kind: 'worksheet' | 'chartsheet';
}

/** Work done while reading (counted, for tests and messages). */
export interface ReadStats {
  bytesUnpacked: number;
  rowsRead: number;
  cellsRead: number;
}

export interface Workbook {
  file: string;
  buf: Buffer;
  entries: Map<string, ZipEntry>;
  sheets: SheetInfo[];
  strings: string[];
  /** Number format code by cell style index (undefined: General). */
  styleFormats: (string | undefined)[];
  date1904: boolean;
  budget: UnpackBudget;
  stats: ReadStats;
}

function bad(file: string, why: string): HushInputError {
  return new HushInputError('table', `${file}: ${why}`, 'value');
}

/** An error whose message already names the file (and sheet). */
function refused(message: string): HushInputError {
  return new HushInputError('table', message, 'value');
}

/** Path of a relationship target relative to the part `from` (e.g. "xl/workbook.xml" + "worksheets/sheet1.xml"). */
function resolvePart(from: string, target: string): string {
  if (target.startsWith('/')) return target.replace(/^\/+/, '');
  const parts = from.split('/').slice(0, -1);
  for (const p of target.split('/')) {
    if (p === '..') parts.pop();
    else if (p !== '.' && p !== '') parts.push(p);
  }
  return parts.join('/');
}

function relsPath(part: string): string {
  const i = part.lastIndexOf('/');
  return `${part.slice(0, i + 1)}_rels/${part.slice(i + 1)}.rels`;
}

async function readPart(wb: Workbook, part: string, handlers: Parameters<typeof readXml>[2]): Promise<void> {
  const e = wb.entries.get(part);
  if (!e) return;
  try {
    await readXml(entryChunks(wb.buf, e, wb.budget), part, handlers);
  } catch (err) {
    if (err instanceof BudgetSpent) {
      throw bad(wb.file, `unpacks to more than ${MAX_XLSX_UNPACKED_BYTES / 1048576} MiB of XML: a project table is far smaller; split it or remove what is not the table`);
    }
    if (err instanceof ZipError || err instanceof XmlError) throw bad(wb.file, `${err.message}: the file is damaged or not a workbook; save it again from a spreadsheet program`);
    throw err;
  } finally {
    wb.stats.bytesUnpacked = wb.budget.used;
  }
}

interface Relationship {
  type: string;
  target: string;
  external: boolean;
}

async function relationships(wb: Workbook, part: string): Promise<Map<string, Relationship>> {
  const out = new Map<string, Relationship>();
  await readPart(wb, relsPath(part), {
    open(name, a) {
      if (name === 'Relationship' && a.Id && a.Target) out.set(a.Id, { type: a.Type ?? '', target: a.Target, external: a.TargetMode === 'External' });
    },
    close() {},
    text() {},
  });
  return out;
}

function relOfType(rels: Map<string, Relationship>, suffix: string): Relationship | undefined {
  for (const r of rels.values()) if (r.type.endsWith(suffix) && !r.external) return r;
  return undefined;
}

/** Opens a workbook: its sheets (in tab order, with their visibility), shared strings and number formats. */
export async function openWorkbook(file: string, buf: Buffer): Promise<Workbook> {
  if (buf.length >= 8 && buf.readUInt32BE(0) === 0xd0cf11e0) {
    throw bad(file, 'is a password-protected workbook or an old .xls file, not an .xlsx: save it as .xlsx without a password');
  }
  let entries: Map<string, ZipEntry>;
  try {
    entries = zipEntries(buf);
  } catch (err) {
    throw bad(file, `is not an .xlsx workbook (${err instanceof Error ? err.message : String(err)}): save it as .xlsx, or as CSV UTF-8 with a .csv name`);
  }
  const wb: Workbook = {
    file,
    buf,
    entries,
    sheets: [],
    strings: [],
    styleFormats: [],
    date1904: false,
    budget: { left: MAX_XLSX_UNPACKED_BYTES, used: 0 },
    stats: { bytesUnpacked: 0, rowsRead: 0, cellsRead: 0 },
  };
  const rootRels = await relationships(wb, '');
  const book = relOfType(rootRels, '/officeDocument');
  const bookPart = book ? resolvePart('', book.target) : 'xl/workbook.xml';
  if (!entries.has(bookPart)) throw bad(file, 'has no workbook part: it is not a spreadsheet (.xlsx) file');
  const rels = await relationships(wb, bookPart);

  const listed: { name: string; state: string; id: string }[] = [];
  await readPart(wb, bookPart, {
    open(name, a) {
      if (name === 'workbookPr') wb.date1904 = a.date1904 === '1' || a.date1904 === 'true';
      if (name === 'sheet') listed.push({ name: a.name ?? '', state: a.state ?? 'visible', id: a.id ?? '' });
    },
    close() {},
    text() {},
  });
  wb.sheets = listed.map((s, k) => {
    const rel = rels.get(s.id);
    const kind = rel && rel.type.endsWith('/chartsheet') ? 'chartsheet' : 'worksheet';
    const part = rel && kind === 'worksheet' ? resolvePart(bookPart, rel.target) : null;
    const state = s.state === 'hidden' || s.state === 'veryHidden' ? s.state : 'visible';
    return { name: s.name, position: k + 1, state, part: part && entries.has(part) ? part : null, kind };
  });

  const strings = relOfType(rels, '/sharedStrings');
  if (strings) await readSharedStrings(wb, resolvePart(bookPart, strings.target));
  const styles = relOfType(rels, '/styles');
  if (styles) await readStyles(wb, resolvePart(bookPart, styles.target));
  return wb;
}

async function readSharedStrings(wb: Workbook, part: string): Promise<void> {
  let text = '';
  let inT = false;
  let phonetic = 0;
  await readPart(wb, part, {
    open(name) {
      if (name === 'si') text = '';
      else if (name === 't') inT = true;
      else if (name === 'rPh') phonetic++;
    },
    close(name) {
      if (name === 't') inT = false;
      else if (name === 'rPh') phonetic--;
      else if (name === 'si') {
        if (wb.strings.length >= MAX_TABLE_CELLS) throw bad(wb.file, `has more than ${MAX_TABLE_CELLS} shared strings: a project table has at most ${MAX_TABLE_CELLS} cells`);
        wb.strings.push(ooxmlUnescape(text));
      }
    },
    text(t) {
      if (!inT || phonetic > 0) return;
      text += t;
      if (text.length > MAX_CELL_CHARS) throw bad(wb.file, `shared string ${wb.strings.length + 1} has more than ${MAX_CELL_CHARS} characters, more than a cell holds`);
    },
  });
}

async function readStyles(wb: Workbook, part: string): Promise<void> {
  const custom = new Map<number, string>();
  let inCellXfs = false;
  await readPart(wb, part, {
    open(name, a) {
      if (name === 'numFmt' && a.numFmtId !== undefined && a.formatCode !== undefined) custom.set(Number(a.numFmtId), a.formatCode);
      else if (name === 'cellXfs') inCellXfs = true;
      else if (name === 'xf' && inCellXfs) {
        const id = Number(a.numFmtId ?? 0);
        const code = custom.get(id) ?? builtinFormat(id);
        wb.styleFormats.push(code === undefined || code === 'General' ? undefined : code);
      }
    },
    close(name) {
      if (name === 'cellXfs') inCellXfs = false;
    },
    text() {},
  });
}

/**
 * Moves the relative references of a shared formula from its first cell to
 * another (a follower cell stores no text of its own): A1-style references
 * without "$" shift by the rows and columns between the two cells; text in
 * double quotes is left alone.
 */
export function slideFormula(formula: string, rows: number, columns: number): string {
  return formula
    .split(/("(?:[^"]|"")*")/)
    .map((piece, k) =>
      k % 2 === 1
        ? piece
        : piece.replace(/(^|[^A-Za-z0-9_.$])(\$?)([A-Z]{1,3})(\$?)(\d{1,7})(?![A-Za-z0-9_(])/g, (m, pre: string, dc: string, col: string, dr: string, row: string) => {
            const c = columnIndex(col);
            if (c < 0) return m;
            const nc = dc ? c : c + columns;
            const nr = dr ? Number(row) : Number(row) + rows;
            if (nc < 0 || nr < 1) return m;
            return `${pre}${dc}${columnLetters(nc)}${dr}${nr}`;
          }),
    )
    .join('');
}

export interface SheetReadOptions {
  /** Stop after the rows numbered up to this (header search). */
  lastRow?: number;
  /** Row of the header: rows beyond it are counted against MAX_TABLE_ROWS. */
  headerRow?: number;
  /** Name used in messages ("t.xlsx, sheet 'studies'"). */
  where: string;
}

/** Reads the rows of a sheet (only rows that have cells), in order. */
export async function readSheetRows(wb: Workbook, sheet: SheetInfo, o: SheetReadOptions): Promise<SourceRow[]> {
  if (!sheet.part) return [];
  const rows: SourceRow[] = [];
  const shared = new Map<string, { formula: string; row: number; col: number }>();
  let row: SourceRow | null = null;
  let lastRow = 0;
  let lastCol = -1;
  // The open cell.
  let col = -1;
  let style = 0;
  let type = '';
  let value: string | null = null;
  let formula: string | null = null;
  let formulaAttrs: Record<string, string> | null = null;
  let inline: string | null = null;
  let target: 'v' | 'f' | 't' | null = null;
  let phonetic = 0;
  let inData = false;
  let cells = 0;

  const finishCell = () => {
    if (!row) return;
    let v: FieldValue = '';
    let format: string | undefined;
    switch (type) {
      case 's': {
        const k = Number(value);
        if (value !== null) {
          if (!Number.isInteger(k) || k < 0 || k >= wb.strings.length) throw refused(`${o.where}: cell ${cellName(col, row.number)} refers to shared string ${value}, which the workbook does not have`);
          v = wb.strings[k];
        }
        break;
      }
      case 'inlineStr':
        v = ooxmlUnescape(inline ?? '');
        break;
      case 'str':
        v = ooxmlUnescape(value ?? '');
        break;
      case 'e':
      case 'd':
        v = value ?? '';
        break;
      case 'b':
        v = value === null ? '' : value.trim() === '1' || value.trim() === 'true';
        break;
      default:
        if (value !== null && value.trim() !== '') {
          const x = Number(value);
          if (!Number.isFinite(x)) throw refused(`${o.where}: cell ${cellName(col, row.number)} holds ${quoteInput(value)}, which is not a number`);
          v = x;
          format = wb.styleFormats[style];
        }
    }
    let f: string | undefined;
    if (formula !== null || formulaAttrs) {
      const a = formulaAttrs ?? {};
      if (a.t === 'shared' && a.si !== undefined) {
        if (formula) shared.set(a.si, { formula, row: row.number, col });
        else {
          const master = shared.get(a.si);
          if (master) f = slideFormula(master.formula, row.number - master.row, col - master.col);
        }
      }
      f ??= formula || undefined;
    }
    const present = (typeof v === 'string' ? v !== '' : true) || f !== undefined;
    if (!present) return;
    if (col >= MAX_TABLE_COLUMNS) {
      throw refused(
        `${o.where}: cell ${cellName(col, row.number)} is in column ${col + 1}: a project table may have at most ${MAX_TABLE_COLUMNS} columns; delete that cell or move the table`,
      );
    }
    if (++cells > MAX_TABLE_CELLS) throw refused(`${o.where} has more than ${MAX_TABLE_CELLS} cells: a project table may have at most ${MAX_TABLE_CELLS}; split it`);
    wb.stats.cellsRead++;
    const vals = row.values;
    while (vals.length < col) vals.push('');
    vals[col] = v;
    if (format !== undefined) (row.formats ??= [])[col] = format;
    if (f !== undefined) {
      (row.formulas ??= [])[col] = f;
      if (value === null && type !== 'inlineStr') {
        (row.noResult ??= new Set()).add(col);
        vals[col] = '';
      }
    }
  };

  await readPart(wb, sheet.part, {
    open(name, a) {
      if (name === 'sheetData') inData = true;
      else if (!inData) return;
      else if (name === 'row') {
        const r = a.r !== undefined ? Number(a.r) : lastRow + 1;
        if (!Number.isInteger(r) || r < 1 || r > 1048576) throw refused(`${o.where}: row number ${quoteInput(a.r)} is not a row of a sheet`);
        if (r <= lastRow) throw refused(`${o.where}: row ${r} comes after row ${lastRow}; rows must be in order (save the file again from a spreadsheet program)`);
        if (o.lastRow !== undefined && r > o.lastRow) throw new StopReading();
        if (o.headerRow !== undefined && r - o.headerRow > MAX_TABLE_ROWS) throw tooManyRows(o.where, o.headerRow);
        lastRow = r;
        lastCol = -1;
        row = { number: r, values: [] };
        wb.stats.rowsRead++;
      } else if (name === 'c' && row) {
        const ref = a.r;
        const m = ref !== undefined ? /^([A-Z]{1,3})(\d+)$/.exec(ref) : null;
        col = m ? columnIndex(m[1]) : lastCol + 1;
        if (ref !== undefined && (!m || Number(m[2]) !== row.number)) throw refused(`${o.where}: cell reference ${quoteInput(ref)} is not a cell of row ${row.number}`);
        if (col > 16383) throw refused(`${o.where}: cell ${quoteInput(ref)} lies beyond the last column of a sheet (XFD)`);
        lastCol = col;
        style = a.s !== undefined ? Number(a.s) : 0;
        type = a.t ?? 'n';
        value = null;
        formula = null;
        formulaAttrs = null;
        inline = null;
        target = null;
      } else if (name === 'v') {
        target = 'v';
        value = '';
      } else if (name === 'f') {
        target = 'f';
        formula = '';
        formulaAttrs = a;
      } else if (name === 'is') inline = '';
      else if (name === 'rPh') phonetic++;
      else if (name === 't' && inline !== null) target = 't';
    },
    close(name) {
      if (name === 'sheetData') inData = false;
      else if (name === 'v' || name === 'f' || name === 't') target = null;
      else if (name === 'rPh') phonetic--;
      else if (name === 'c') {
        finishCell();
        col = -1;
      } else if (name === 'row' && row) {
        if (row.values.length || row.noResult) rows.push(row);
        row = null;
      }
    },
    text(t) {
      let length = 0;
      if (target === 'v') length = (value += t).length;
      else if (target === 'f') length = (formula += t).length;
      else if (target === 't' && phonetic === 0) length = (inline += t).length;
      if (length > MAX_CELL_CHARS && row) {
        throw refused(`${o.where}: cell ${cellName(col, row.number)} has more than ${MAX_CELL_CHARS} characters, more than a spreadsheet cell holds`);
      }
    },
  });
  return rows;
}

/** Reads the notes (comments) of a sheet: cell reference → text. */
export async function readSheetNotes(wb: Workbook, sheet: SheetInfo): Promise<Map<string, string>> {
  const notes = new Map<string, string>();
  if (!sheet.part) return notes;
  const rels = await relationships(wb, sheet.part);
  const c = relOfType(rels, '/comments');
  if (!c) return notes;
  let ref: string | null = null;
  let text = '';
  let inT = false;
  await readPart(wb, resolvePart(sheet.part, c.target), {
    open(name, a) {
      if (name === 'comment') {
        ref = a.ref ?? null;
        text = '';
      } else if (name === 't') inT = true;
    },
    close(name) {
      if (name === 't') inT = false;
      else if (name === 'comment') {
        if (ref) notes.set(ref, ooxmlUnescape(text));
        if (notes.size > MAX_TABLE_CELLS) throw bad(wb.file, `has more than ${MAX_TABLE_CELLS} notes`);
        ref = null;
      }
    },
    text(t) {
      if (inT && ref) {
        text += t;
        if (text.length > MAX_CELL_CHARS) throw bad(wb.file, `a note on cell ${ref} has more than ${MAX_CELL_CHARS} characters`);
      }
    },
  });
  return notes;
}

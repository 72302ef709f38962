/**
 * The header of a project table: found in the first rows (title rows may sit
 * above it), its columns named (a column with cells but no header gets
 * "column L"), the output columns of an earlier plan recognised, and the
 * plan's output columns named so they never take the name of a user column.
 */
import { HushInputError } from '../../physics/errors';
import { INPUT_NAMES, OUTPUT_COLUMNS, headerName, type OutputColumn } from '../fields';
import type { FieldValue } from '../units';
import { HEADER_SEARCH_ROWS, MAX_TABLE_ROWS } from './limits';
import { blankRow, blankValue, type SourceRow, type Table, type TableColumn } from './model';
import { columnLetters, quoteInput } from './text';

const INPUTS = new Set(INPUT_NAMES);

/** Text of a header cell as typed ('' when empty). */
export function headerText(v: FieldValue): string {
  return blankValue(v) ? '' : String(v);
}

/** Number of distinct plan input fields a row names. */
export function headerScore(values: readonly FieldValue[]): number {
  const seen = new Set<string>();
  for (const v of values) {
    const n = headerName(headerText(v));
    if (INPUTS.has(n)) seen.add(n);
  }
  return seen.size;
}

/**
 * The header row among the first HEADER_SEARCH_ROWS rows: the first that
 * names two or more plan fields, else the first that names one (a title row
 * such as "Study plan" names none). Null when no row names a field.
 */
export function findHeader(rows: readonly SourceRow[]): SourceRow | null {
  let one: SourceRow | null = null;
  for (const r of rows) {
    if (r.number > HEADER_SEARCH_ROWS) break;
    const s = headerScore(r.values);
    if (s >= 2) return r;
    if (s === 1 && !one) one = r;
  }
  return one;
}

/** The message for a table without a header row. */
export function noHeaderMessage(where: string): string {
  return `${where} has no header row: none of its first ${HEADER_SEARCH_ROWS} rows names a plan field (study, band_short, cell, intensity_error, …)`;
}

/** The error for a table with more rows below its header than MAX_TABLE_ROWS. */
export function tooManyRows(where: string, headerRow: number): HushInputError {
  return new HushInputError(
    'table',
    `${where} has more than ${MAX_TABLE_ROWS} rows below its header (row ${headerRow}): a project table may have at most ${MAX_TABLE_ROWS} studies; split it`,
    'value',
  );
}

/** Name of an output column in a table whose own columns take `taken` (header names, see headerName). */
function outputName(c: OutputColumn, taken: ReadonlySet<string>): string {
  if (!taken.has(c.name)) return c.name;
  let name = `plan_${c.name}`;
  for (let k = 2; taken.has(name); k++) name = `plan_${c.name}_${k}`;
  return name;
}

/** Header text of an output column under a name: "name [unit]". */
function withUnit(name: string, c: OutputColumn): string {
  return c.unit ? `${name} [${c.unit}]` : name;
}

/** True when `text` is the header an earlier plan wrote for output column `c` (under its own name or a renamed one). */
function isOutputHeader(text: string, c: OutputColumn): boolean {
  const unit = c.unit ? ` [${c.unit}]` : '';
  if (!text.endsWith(unit)) return false;
  const name = text.slice(0, text.length - unit.length);
  return name === c.name || name === `plan_${c.name}` || new RegExp(`^plan_${c.name}_\\d+$`).test(name);
}

/**
 * Where the output columns of an earlier plan start: the first run of
 * OUTPUT_COLUMNS.length header cells that are exactly the headers a plan
 * writes, in order. A user column that only shares a name with an output
 * ("notes", "Cost (EUR)") is never taken for one.
 */
export function earlierOutputStart(headers: readonly string[]): number | null {
  const k = OUTPUT_COLUMNS.length;
  for (let s = 0; s + k <= headers.length; s++) {
    if (!isOutputHeader(headers[s], OUTPUT_COLUMNS[0])) continue;
    let all = true;
    for (let j = 1; j < k && all; j++) all = isOutputHeader(headers[s + j], OUTPUT_COLUMNS[j]);
    if (all) return s;
  }
  return null;
}

/** First words of the notes cell of the total row a plan writes into CSV (a row of sums, not a study). */
export const TOTAL_ROW_MARK = 'total of ';

function lastNonBlank(values: readonly FieldValue[]): number {
  for (let c = values.length - 1; c >= 0; c--) if (!blankValue(values[c])) return c;
  return -1;
}

export interface TableMeta {
  file: string;
  format: 'csv' | 'xlsx';
  sheet: Table['sheet'];
  encoding: string | null;
  delimiter: string | null;
  notes: string[];
  date1904: boolean;
}

/**
 * The table of `rows` (in row order) with `header` one of them: rows above
 * and below it, gaps between row numbers filled with blank rows (so rows keep
 * their places), trailing blank rows dropped, columns named.
 */
export function buildTable(rows: readonly SourceRow[], header: SourceRow, meta: TableMeta): Table {
  const above: SourceRow[] = [];
  const below: SourceRow[] = [];
  let expected = 1;
  for (const r of rows) {
    for (; expected < r.number; expected++) (expected < header.number ? above : below).push({ number: expected, values: [] });
    if (r.number < header.number) above.push(r);
    else if (r.number > header.number) below.push(r);
    expected = r.number + 1;
  }
  while (below.length && blankRow(below[below.length - 1])) below.pop();

  let width = lastNonBlank(header.values) + 1;
  for (const r of [...above, ...below]) {
    width = Math.max(width, lastNonBlank(r.values) + 1);
    if (r.noResult) for (const c of r.noResult) width = Math.max(width, c + 1);
  }
  const headers = Array.from({ length: width }, (_, c) => headerText(header.values[c]));
  const earlier = earlierOutputStart(headers);
  const inBlock = (c: number) => earlier !== null && c >= earlier && c < earlier + OUTPUT_COLUMNS.length;

  // The total row of an earlier plan written as CSV is that plan's, not a study: dropped like its output columns.
  if (earlier !== null && below.length) {
    const last = below[below.length - 1];
    const notes = last.values[earlier + OUTPUT_COLUMNS.findIndex((c) => c.name === 'notes')];
    if (typeof notes === 'string' && notes.startsWith(TOTAL_ROW_MARK)) {
      below.pop();
      while (below.length && blankRow(below[below.length - 1])) below.pop();
    }
  }

  const hasCells = new Array<boolean>(width).fill(false);
  for (const r of below) {
    for (let c = 0; c < Math.min(width, r.values.length); c++) if (!blankValue(r.values[c])) hasCells[c] = true;
    if (r.noResult) for (const c of r.noResult) hasCells[c] = true;
  }
  const columns: TableColumn[] = headers.map((h, c) => {
    const generated = h === '' && hasCells[c] && !inBlock(c);
    const name = generated ? `column ${columnLetters(c)}` : h;
    const field = inBlock(c) ? null : headerName(name);
    return { index: c, header: h, name, generated, key: name, field: field !== null && INPUTS.has(field) ? field : null };
  });
  // JSON keys: a name given to several columns (or none) gets its column letter.
  const count = new Map<string, number>();
  for (const col of columns) if (!inBlock(col.index)) count.set(col.name, (count.get(col.name) ?? 0) + 1);
  for (const col of columns) {
    if (col.name === '' || (count.get(col.name) ?? 0) > 1) col.key = `${col.name}${col.name ? ' ' : ''}(column ${columnLetters(col.index)})`;
  }
  return { ...meta, above, header, rows: below, columns, earlier };
}

/** The columns of the table that are kept as the user's (all but an earlier plan's outputs). */
export function userColumns(table: Table): TableColumn[] {
  const e = table.earlier;
  return table.columns.filter((c) => e === null || c.index < e || c.index >= e + OUTPUT_COLUMNS.length);
}

export interface OutputHeaders {
  /** Header text of each output column, OUTPUT_COLUMNS order. */
  texts: string[];
  /** Output columns renamed because a user column has their name: [output name, name used]. */
  renamed: [string, string][];
}

/** Headers of the plan's output columns in this table: "name [unit]", or "plan_name [unit]" where a user column already has the name. */
export function outputHeaders(table: Table): OutputHeaders {
  const taken = new Set(userColumns(table).filter((c) => c.name !== '').map((c) => headerName(c.name)));
  const renamed: [string, string][] = [];
  const texts = OUTPUT_COLUMNS.map((c) => {
    const name = outputName(c, taken);
    if (name !== c.name) renamed.push([c.name, name]);
    return withUnit(name, c);
  });
  return { texts, renamed };
}

/** The note on renamed output columns, or null. */
export function renameNote(renamed: readonly [string, string][]): string | null {
  if (!renamed.length) return null;
  return `output columns renamed because the table has columns of the same name: ${renamed.map(([a, b]) => `${a} → ${b}`).join(', ')}`;
}

/** Names of the user's columns that are not plan fields, quoted, for the note on kept columns (at most `max` listed). */
export function keptColumnNames(table: Table, max = 12): string[] {
  const names = userColumns(table)
    .filter((c) => c.field === null && c.name !== '')
    .map((c) => (c.generated ? `${quoteInput(c.name)} (no header; cells below it)` : quoteInput(c.name)));
  return names.length > max ? [...names.slice(0, max), `and ${names.length - max} more`] : names;
}

/**
 * The one interface through which the task pane reads a project row and writes
 * a design back. Two implementations: Office.js (office.ts) for Excel, and an
 * in-page table (memory.ts) for the preview outside Excel. The pane's logic is
 * the same for both.
 *
 * A project table is a block of cells whose first row holds field names (the
 * plan's input names must all be there); each row below is one study. The pane
 * reads the selected row by header name and writes only output columns.
 */

/** What a cell can hold, as the pane sees it. Empty cells read as ''. */
export type CellValue = string | number | boolean;

/** Field name → value, keyed by the header text exactly as written in the table. */
export type RowValues = Record<string, CellValue>;

/** Which fields the pane reads and which it may write. */
export interface TableSchema {
  /** Every input name: never written, and checked for changes before a write. */
  inputs: readonly string[];
  /** Input names that must all be in the header for a block to count as a project table. */
  required: readonly string[];
  /** Header names the pane may write; every other column is never touched. */
  outputs: readonly string[];
  /** How header text is compared (e.g. dropping a unit in brackets); default trim and lower case. */
  normalise?: (text: unknown) => string;
}

/** The selected study row, with enough to write it back and to say where it is. */
export interface SelectedRow {
  /** Header names in column order. */
  header: string[];
  /** Values of this row by header name (every header is present). */
  values: RowValues;
  /** Human-readable place of the row, e.g. "Sheet1!A5:K5" or "demo row 3". */
  where: string;
  /** Short label for the row (its name column when there is one). */
  label: string;
  /** Opaque handle for `writeOutputs`; only the implementation that made it understands it. */
  handle: unknown;
}

/** What a write did. */
export interface WriteReport {
  /** Cells written, in column order, e.g. ["Sheet1!H5", "Sheet1!I5"]. */
  cells: string[];
  /** The row written, as its sheet shows it (1-based: the worksheet row in Excel, the table row in the demo). */
  row: number;
  /** Output fields that had no column in the table (nothing written for them). */
  missing: string[];
}

export interface Workbook {
  /** "excel" or "demo": lets the pane say where it is working. */
  readonly kind: 'excel' | 'demo';
  /**
   * Reads the selected row. Rejects with a `WorkbookError` saying what to do
   * when the selection is not one data row of a project table.
   */
  readSelectedRow(): Promise<SelectedRow>;
  /**
   * Writes `outputs` (field name → value) into the row's output cells in one
   * batch. Fields not in `TableSchema.outputs` are refused, never written.
   */
  writeOutputs(row: SelectedRow, outputs: RowValues): Promise<WriteReport>;
}

/** A problem the user can fix in the workbook (wrong selection, missing columns). */
export class WorkbookError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'WorkbookError';
  }
}

/** The required input names missing from a header, in schema order. */
export function missingInputs(header: readonly string[], schema: TableSchema): string[] {
  const norm = normaliser(schema);
  const have = new Set(header.map(norm));
  return schema.required.filter((f) => !have.has(norm(f)));
}

/** Default header comparison: without surrounding spaces and case. */
export function normaliseHeader(text: unknown): string {
  return String(text ?? '').trim().toLowerCase();
}

export function normaliser(schema: TableSchema): (text: unknown) => string {
  return schema.normalise ?? normaliseHeader;
}

/** Index of the column named `field` in `header`, or −1. */
export function columnOf(header: readonly string[], field: string, schema: TableSchema): number {
  const norm = normaliser(schema);
  const key = norm(field);
  return header.findIndex((h) => norm(h) === key);
}

/**
 * Checks that every field of `outputs` is an output of the schema; throws a
 * `WorkbookError` naming the first one that is not (the pane never writes inputs).
 */
export function checkOutputFields(outputs: RowValues, schema: TableSchema): void {
  const norm = normaliser(schema);
  const allowed = new Set(schema.outputs.map(norm));
  const inputs = new Set(schema.inputs.map(norm));
  for (const k of Object.keys(outputs)) {
    if (!allowed.has(norm(k)) || inputs.has(norm(k))) {
      throw new WorkbookError(`"${k}" is not an output column: the pane writes only ${schema.outputs.join(', ')}`);
    }
  }
}

/** Column letters for a 0-based column index: 0 → A, 25 → Z, 26 → AA. */
export function columnLetters(index: number): string {
  if (!Number.isInteger(index) || index < 0 || index > 16383) {
    throw new RangeError(`column index must be a whole number from 0 to 16383 (got ${index})`);
  }
  let n = index + 1;
  let s = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/** A1 address of one cell from 0-based sheet row and column, with the sheet name quoted when needed. */
export function cellAddress(sheet: string, row: number, column: number): string {
  const name = /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) ? sheet : `'${sheet.replace(/'/g, "''")}'`;
  return `${name}!${columnLetters(column)}${row + 1}`;
}

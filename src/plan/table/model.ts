/** What a table reader gives: the rows as read, the header found, and the columns kept. */
import type { FieldValue } from '../units';

/** One row of a sheet or CSV file, as read. */
export interface SourceRow {
  /** 1-based row number in the sheet (CSV: record number). */
  number: number;
  /** Cell values by 0-based column ('' for an empty cell); a row may end before the table's width. */
  values: FieldValue[];
  /** .xlsx only, by column: the number format of a number cell, when not General. */
  formats?: (string | undefined)[];
  /** .xlsx only, by column: the formula of a formula cell (without "="); its value is the result saved with it. */
  formulas?: (string | undefined)[];
  /** .xlsx only: columns whose formula has no saved result (their value is ''). */
  noResult?: Set<number>;
  /** .xlsx only, by column: the note (comment) on a cell. */
  notes?: (string | undefined)[];
}

export interface TableColumn {
  /** 0-based column. */
  index: number;
  /** Header cell as typed ('' when empty). */
  header: string;
  /** The header, or for a column with cells but no header a generated one ("column L"); '' for an empty column. */
  name: string;
  /** True when `name` was generated. */
  generated: boolean;
  /** Key of the column in JSON output: `name`, with " (column L)" added when another column has the same name. */
  key: string;
  /** The plan input field the column gives, or null. */
  field: string | null;
}

export interface Table {
  file: string;
  format: 'csv' | 'xlsx';
  /** The sheet read (.xlsx): name, 1-based position among the workbook's sheets, their number, and the visible sheets before it that have no header. */
  sheet: { name: string; position: number; count: number; skipped: string[] } | null;
  /** CSV only: the encoding read and the delimiter found. */
  encoding: string | null;
  delimiter: string | null;
  /** Rows above the header (title rows), as read. */
  above: SourceRow[];
  header: SourceRow;
  /** Rows below the header: blank rows kept, trailing blank rows (and the total row of an earlier plan) dropped. */
  rows: SourceRow[];
  /** Columns 0…width-1, the used width of the table. */
  columns: TableColumn[];
  /** First column of the output columns of an earlier plan (they are replaced in place), or null. */
  earlier: number | null;
  /** Notes about what was read (encoding guessed, …), one line each. */
  notes: string[];
  /** .xlsx only: the workbook counts dates from 1904 (a Mac convention). */
  date1904: boolean;
}

/** True when a cell is empty. */
export function blankValue(v: FieldValue): boolean {
  return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
}

/** True when every cell of a row is empty. */
export function blankRow(r: SourceRow): boolean {
  return r.values.every(blankValue) && !r.noResult?.size;
}

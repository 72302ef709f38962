/**
 * Where things go in a written plan (CSV and the xlsx "plan" sheet): the
 * table's own columns in their places, the plan's output columns where an
 * earlier plan had them or after the last column; rows above the header,
 * the header and the rows below in their places.
 */
import { OUTPUT_COLUMNS } from '../fields';
import type { PlanCell } from '../index';
import { outputHeaders, type OutputHeaders } from './header';
import type { SourceRow, Table, TableColumn } from './model';
import type { StudyFigures } from './summary';

/** A column of the written plan: one of the table's, or output column `output` (OUTPUT_COLUMNS index). */
export type Slot = { column: TableColumn; output?: undefined } | { column?: undefined; output: number };

export interface PlannedRow {
  /** The row as read. */
  row: SourceRow;
  /** Output values in OUTPUT_COLUMNS order; null for a blank row. */
  outputs: PlanCell[] | null;
  failed: boolean;
  /** The study's figures for the summary; null for a blank or failed row. */
  figures: StudyFigures | null;
}

export interface Layout {
  slots: Slot[];
  headers: OutputHeaders;
}

export function planLayout(table: Table): Layout {
  const headers = outputHeaders(table);
  const outputs: Slot[] = OUTPUT_COLUMNS.map((_, j) => ({ output: j }));
  const e = table.earlier;
  const cols = table.columns;
  const slots: Slot[] =
    e === null
      ? [...cols.map((column) => ({ column })), ...outputs]
      : [...cols.slice(0, e).map((column) => ({ column })), ...outputs, ...cols.slice(e + OUTPUT_COLUMNS.length).map((column) => ({ column }))];
  return { slots, headers };
}

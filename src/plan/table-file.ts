/**
 * Project tables on disk (Node only): reading a CSV or a sheet of an .xlsx
 * (src/plan/table/read.ts), planning its rows (plan-table.ts), and writing
 * the plan as CSV, JSON or .xlsx (write-file.ts). Not part of the plan
 * barrel, so the add-in bundle never pulls these in; exceljs is loaded only
 * when an .xlsx plan is written.
 */
export { readTable, tableReadWork, tableFormat, detectDelimiter, type ReadOptions, type ReadStats, type TableFormat } from './table/read';
export { MAX_TABLE_BYTES, MAX_TABLE_CELLS, MAX_TABLE_COLUMNS, MAX_TABLE_ROWS, HEADER_SEARCH_ROWS, MAX_FIELD_CHARS } from './table/limits';
export type { SourceRow, Table, TableColumn } from './table/model';
export type { PlannedRow } from './table/layout';
export { planTable, rowLabel, type TablePlan } from './table/plan-table';
export { prepareOutput, removeStaleTemps, writeTable } from './table/write-file';
export { ESTIMATE_NOTE } from './table/write-json';
export { keptColumnNames, outputHeaders, renameNote, userColumns } from './table/header';
export { repeatedFieldNotes, fieldColumns, planStudy } from './table/rows';
export { planTotals, share, studyFigures, totalsRecord, type PlanTotals, type StudyFigures } from './table/summary';
export { jsonTerminalSafe, quoteInput, terminalSafe } from './table/text';
export { describeRead } from './table/describe';

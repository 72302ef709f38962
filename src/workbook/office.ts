/**
 * Office.js workbook: the selected row of a project table in Excel.
 *
 * A project table is either an Excel table (ListObject) or a plain block of
 * cells (the selection's surrounding region) whose first row holds the field
 * names; in both the header row must name every plan input. The row is read by
 * header name; a write touches only the output columns of that one row, in one
 * batch (one `context.sync()` for all cells), after checking that the header
 * and the row's inputs are still what was read.
 *
 * API sets used: ExcelApi 1.7 (getSurroundingRegion, getRangeByIndexes) and
 * 1.9 (Range.getTables, TableScopedCollection.getCount/getFirst).
 */
import {
  WorkbookError,
  cellAddress,
  checkOutputFields,
  columnOf,
  missingInputs,
  normaliser,
  type CellValue,
  type RowValues,
  type SelectedRow,
  type TableSchema,
  type Workbook,
  type WriteReport,
} from './types';
import { rowLabel } from './memory';

/** Where the row is, in worksheet coordinates (0-based). */
interface OfficeHandle {
  sheet: string;
  headerRow: number;
  row: number;
  firstColumn: number;
  header: string[];
  values: CellValue[];
}

/** The part of the Excel namespace this module uses (so tests can pass a mock). */
export interface ExcelHost {
  run<T>(batch: (context: Excel.RequestContext) => Promise<T>): Promise<T>;
}

function cellText(v: unknown): CellValue {
  if (typeof v === 'number' || typeof v === 'boolean') return v;
  return v === null || v === undefined ? '' : String(v);
}

export class OfficeWorkbook implements Workbook {
  readonly kind = 'excel' as const;

  constructor(
    private readonly schema: TableSchema,
    private readonly excel: ExcelHost = Excel,
  ) {}

  async readSelectedRow(): Promise<SelectedRow> {
    return this.excel.run(async (context) => {
      const selection = context.workbook.getSelectedRange();
      selection.load('address,rowIndex,columnIndex,rowCount');
      // The selection is always on the active sheet.
      const sheet = context.workbook.worksheets.getActiveWorksheet();
      sheet.load('name');
      const tables = selection.getTables(false);
      const tableCount = tables.getCount();
      await context.sync();
      if (selection.rowCount !== 1) {
        throw new WorkbookError(
          `select one study row (a single cell of it is enough); the selection ${selection.address} spans ${selection.rowCount} rows`,
        );
      }
      // tableCount is a ClientResult, read after the sync above (the rule takes it for a proxy object).
      // eslint-disable-next-line office-addins/load-object-before-read
      const inTable = tableCount.value > 0;
      const block = inTable ? tables.getFirst().getRange() : selection.getSurroundingRegion();
      block.load('address,rowIndex,columnIndex,rowCount,values');
      await context.sync();
      const header = (block.values[0] ?? []).map((v) => String(v ?? '').trim());
      const missing = missingInputs(header, this.schema);
      if (missing.length) {
        const what = inTable ? `the Excel table around ${selection.address}` : `the block of cells around ${selection.address} (${block.address})`;
        throw new WorkbookError(
          `${selection.address} is not in a project table: the header row of ${what} lacks ${missing.join(', ')}. ` +
            `Select a cell in a study row of an Excel table, or of a block whose first row names the inputs (at least ${this.schema.required.join(', ')}).`,
        );
      }
      const r = selection.rowIndex - block.rowIndex;
      if (r < 1) {
        throw new WorkbookError(`${selection.address} is the header row; select a cell in a study row below it`);
      }
      const rowValues = block.values[r].map(cellText);
      const values: RowValues = {};
      header.forEach((h, c) => {
        if (h !== '') values[h] = rowValues[c];
      });
      const handle: OfficeHandle = {
        sheet: sheet.name,
        headerRow: block.rowIndex,
        row: selection.rowIndex,
        firstColumn: block.columnIndex,
        header,
        values: rowValues,
      };
      const last = block.columnIndex + header.length - 1;
      const where = `${cellAddress(sheet.name, selection.rowIndex, block.columnIndex)}:${cellAddress(sheet.name, selection.rowIndex, last).split('!')[1]}`;
      return { header, values, where, label: rowLabel(values, r - 1), handle };
    });
  }

  async writeOutputs(row: SelectedRow, outputs: RowValues): Promise<WriteReport> {
    const h = row.handle as OfficeHandle;
    if (!h || typeof h.sheet !== 'string' || !Array.isArray(h.header)) {
      throw new WorkbookError('this row was not read from Excel; read the selection again');
    }
    checkOutputFields(outputs, this.schema);
    const norm = normaliser(this.schema);
    const inputKeys = new Set(this.schema.inputs.map(norm));
    return this.excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem(h.sheet);
      const width = h.header.length;
      const headerNow = sheet.getRangeByIndexes(h.headerRow, h.firstColumn, 1, width);
      const rowNow = sheet.getRangeByIndexes(h.row, h.firstColumn, 1, width);
      headerNow.load('values');
      rowNow.load('values');
      await context.sync();
      const names = (headerNow.values[0] ?? []).map((v) => String(v ?? '').trim());
      if (names.length !== width || names.some((n, c) => n !== h.header[c])) {
        throw new WorkbookError('the table header changed since the row was read; read the selection again before applying');
      }
      const current = (rowNow.values[0] ?? []).map(cellText);
      for (let c = 0; c < width; c++) {
        if (inputKeys.has(norm(names[c])) && current[c] !== h.values[c]) {
          throw new WorkbookError(`input "${names[c]}" of this row changed since it was read; read the selection again before applying`);
        }
      }
      const writes: Array<[number, CellValue]> = [];
      const missing: string[] = [];
      for (const [field, value] of Object.entries(outputs)) {
        const c = columnOf(names, field, this.schema);
        if (c < 0) missing.push(field);
        else writes.push([c, value]);
      }
      writes.sort((a, b) => a[0] - b[0]);
      for (const [c, value] of writes) {
        sheet.getRangeByIndexes(h.row, h.firstColumn + c, 1, 1).values = [[value]];
      }
      if (writes.length) await context.sync();
      return { cells: writes.map(([c]) => cellAddress(h.sheet, h.row, h.firstColumn + c)), row: h.row + 1, missing };
    });
  }
}

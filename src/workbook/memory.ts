/**
 * In-page workbook: a project table held in memory (the embedded demo outside
 * Excel). Same contract as the Office.js implementation: the selected row is
 * read by header name, only output columns are written, in one step.
 */
import {
  WorkbookError,
  checkOutputFields,
  columnOf,
  missingInputs,
  normaliseHeader,
  type CellValue,
  type RowValues,
  type SelectedRow,
  type TableSchema,
  type Workbook,
  type WriteReport,
} from './types';

interface MemoryHandle {
  table: MemoryWorkbook;
  row: number;
}

export class MemoryWorkbook implements Workbook {
  readonly kind = 'demo' as const;
  readonly header: string[];
  /** Data rows (without the header), each as long as the header. */
  readonly rows: CellValue[][];
  private selected = 0;
  private readonly listeners = new Set<(cells: Array<[number, number]>) => void>();

  constructor(header: string[], rows: CellValue[][], private readonly schema: TableSchema, private readonly name = 'demo') {
    if (header.length === 0) throw new WorkbookError('the table has no header row');
    const missing = missingInputs(header, schema);
    if (missing.length) throw new WorkbookError(`the table is not a project table: its header lacks ${missing.join(', ')}`);
    this.header = [...header];
    this.rows = rows.map((r) => header.map((_, c) => r[c] ?? ''));
  }

  /** 0-based data row shown as selected. */
  get selectedRow(): number {
    return this.selected;
  }

  select(row: number): void {
    if (!Number.isInteger(row) || row < 0 || row >= this.rows.length) {
      throw new WorkbookError(`row must be a whole number from 1 to ${this.rows.length} (got ${row + 1})`);
    }
    this.selected = row;
  }

  /** Called after every write with the [row, column] pairs written. */
  onChange(listener: (cells: Array<[number, number]>) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** The value of one cell by 0-based data row and header name. */
  cell(row: number, field: string): CellValue {
    const c = this.columnOf(field);
    if (c < 0) throw new WorkbookError(`no column "${field}"`);
    return this.rows[row][c];
  }

  async readSelectedRow(): Promise<SelectedRow> {
    const r = this.selected;
    if (r < 0 || r >= this.rows.length) throw new WorkbookError('select one data row of the project table');
    const values: RowValues = {};
    this.header.forEach((h, c) => (values[h] = this.rows[r][c]));
    const handle: MemoryHandle = { table: this, row: r };
    return { header: [...this.header], values, where: `${this.name} row ${r + 1}`, label: rowLabel(values, r), handle };
  }

  async writeOutputs(row: SelectedRow, outputs: RowValues): Promise<WriteReport> {
    const h = row.handle as MemoryHandle;
    if (!h || h.table !== this) throw new WorkbookError('this row was read from another table; read the selection again');
    checkOutputFields(outputs, this.schema);
    const writes: Array<[number, number, CellValue]> = [];
    const missing: string[] = [];
    for (const [field, value] of Object.entries(outputs)) {
      const c = this.columnOf(field);
      if (c < 0) missing.push(field);
      else writes.push([h.row, c, value]);
    }
    writes.sort((a, b) => a[1] - b[1]);
    for (const [r, c, v] of writes) this.rows[r][c] = v;
    const cells = writes.map(([r, c]) => `${this.name} row ${r + 1}, ${this.header[c]}`);
    const changed = writes.map(([r, c]) => [r, c] as [number, number]);
    this.listeners.forEach((l) => l(changed));
    return { cells, row: h.row + 1, missing };
  }

  private columnOf(field: string): number {
    return columnOf(this.header, field, this.schema);
  }
}

/** The row's name for labels: a "name"/"study"/"label" column when present, else its number. */
export function rowLabel(values: RowValues, rowIndex: number): string {
  for (const [k, v] of Object.entries(values)) {
    const n = normaliseHeader(k);
    if ((n === 'name' || n === 'study' || n === 'label' || n === 'id') && String(v).trim() !== '') return String(v);
  }
  return `row ${rowIndex + 1}`;
}

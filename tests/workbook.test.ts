/**
 * The workbook interface: the Office.js implementation against office-addin-mock
 * (which enforces load-before-read and sync), and the in-page implementation.
 * Expected values are the fixtures' own cells (independent of any physics).
 */
import { describe, expect, it } from 'vitest';
import { OfficeMockObject } from 'office-addin-mock';
import { OfficeWorkbook, type ExcelHost } from '../src/workbook/office';
import { MemoryWorkbook } from '../src/workbook/memory';
import { WorkbookError, cellAddress, columnLetters, type CellValue, type TableSchema } from '../src/workbook/types';

const schema: TableSchema = { inputs: ['name', 'tolerance', 'ppw'], required: ['tolerance', 'ppw'], outputs: ['layers', 'cost', 'absent output'] };

type Grid = CellValue[][];

interface Fixture {
  grid: Grid; // the sheet from A1
  selection: { row: number; column: number; rowCount?: number };
  block: { row: number; column: number; rows: number; columns: number };
  asTable?: boolean;
}

/** A mock Excel whose sheet is `grid`; records every range written and counts syncs. */
function mockExcel(fx: Fixture) {
  const live: OfficeMockObject[] = [];
  const writes: Array<{ row: number; column: number; values: CellValue[][]; syncsBefore: number }> = [];
  const created: Array<{ mock: any; row: number; column: number; values: CellValue[][] }> = [];
  let syncs = 0;
  const make = (data: object) => {
    const m = new OfficeMockObject(data as any);
    live.push(m);
    return m as any;
  };
  const slice = (r: number, c: number, h: number, w: number): Grid =>
    Array.from({ length: h }, (_, i) => Array.from({ length: w }, (_, j) => fx.grid[r + i]?.[c + j] ?? ''));
  const addr = (r: number, c: number, h: number, w: number) =>
    `Sheet1!${columnLetters(c)}${r + 1}` + (h * w > 1 ? `:${columnLetters(c + w - 1)}${r + h}` : '');
  const b = fx.block;
  const blockMock = () =>
    make({ address: addr(b.row, b.column, b.rows, b.columns), rowIndex: b.row, columnIndex: b.column, rowCount: b.rows, values: slice(b.row, b.column, b.rows, b.columns) });
  const s = fx.selection;
  const selection = make({
    address: addr(s.row, s.column, s.rowCount ?? 1, 1),
    rowIndex: s.row,
    columnIndex: s.column,
    rowCount: s.rowCount ?? 1,
    getTables: () => ({ getCount: () => ({ value: fx.asTable ? 1 : 0 }), getFirst: () => ({ getRange: blockMock }) }),
    getSurroundingRegion: blockMock,
  });
  const sheet = {
    getRangeByIndexes: (row: number, column: number, h: number, w: number) => {
      const values = slice(row, column, h, w);
      const mock = make({ values });
      created.push({ mock, row, column, values });
      return mock;
    },
  };
  const context = {
    workbook: { getSelectedRange: () => selection, worksheets: { getItem: (n: string) => (n === 'Sheet1' ? sheet : undefined), getActiveWorksheet: () => make({ name: 'Sheet1' }) } },
    sync: async () => {
      // A write is a `values` assignment made since the last sync (the mock keeps the loaded array otherwise).
      for (const c of created) {
        if (c.mock.values !== c.values && Array.isArray(c.mock.values) && !writes.some((w) => w.values === c.mock.values)) {
          writes.push({ row: c.row, column: c.column, values: c.mock.values, syncsBefore: syncs });
          fx.grid[c.row][c.column] = c.mock.values[0][0];
        }
      }
      for (const m of live) await m.sync();
      syncs++;
    },
  };
  const host: ExcelHost = { run: async (batch) => batch(context as unknown as Excel.RequestContext) };
  return { host, writes, syncs: () => syncs };
}

/** Sheet: a title in A1, the project block from B3 (header) with three studies; columns in an order unlike the schema's. */
function sheet(): Grid {
  return [
    ['Project', '', '', '', '', ''],
    ['', '', '', '', '', ''],
    ['', 'name', 'ppw', 'layers', 'tolerance', 'cost'],
    ['', 'alpha', 20, '', 0.01, ''],
    ['', 'beta', 12, '', 0.001, ''],
    ['', 'gamma', 30, 7, 0.02, 99],
  ];
}
const block = { row: 2, column: 1, rows: 4, columns: 5 };

describe('Office.js workbook', () => {
  it('reads the selected row by header names (plain block of cells)', async () => {
    const { host } = mockExcel({ grid: sheet(), selection: { row: 4, column: 3 }, block });
    const row = await new OfficeWorkbook(schema, host).readSelectedRow();
    // Expected: row 5 of the fixture (beta).
    expect(row.values).toEqual({ name: 'beta', ppw: 12, layers: '', tolerance: 0.001, cost: '' });
    expect(row.header).toEqual(['name', 'ppw', 'layers', 'tolerance', 'cost']);
    expect(row.label).toBe('beta');
    expect(row.where).toBe('Sheet1!B5:F5');
  });

  it('reads from an Excel table the same way', async () => {
    const { host } = mockExcel({ grid: sheet(), selection: { row: 3, column: 5 }, block, asTable: true });
    const row = await new OfficeWorkbook(schema, host).readSelectedRow();
    expect(row.values.tolerance).toBe(0.01);
    expect(row.label).toBe('alpha');
  });

  it('writes only output columns of that row, in one batch, and names the cells', async () => {
    const fx = { grid: sheet(), selection: { row: 4, column: 1 }, block };
    const { host, writes, syncs } = mockExcel(fx);
    const wb = new OfficeWorkbook(schema, host);
    const row = await wb.readSelectedRow();
    const before = syncs();
    const report = await wb.writeOutputs(row, { cost: 12.5, layers: 9, 'absent output': 1 });
    // Columns D (layers) and F (cost) of sheet row 5; "absent output" has no column.
    expect(report.cells).toEqual(['Sheet1!D5', 'Sheet1!F5']);
    expect(report.row).toBe(5);
    expect(report.missing).toEqual(['absent output']);
    expect(writes.map((w) => [w.row, w.column, w.values])).toEqual([
      [4, 3, [[9]]],
      [4, 5, [[12.5]]],
    ]);
    // One sync to re-check header and inputs, one for all writes (derived: the batch contract).
    expect(syncs() - before).toBe(2);
    expect(new Set(writes.map((w) => w.syncsBefore)).size).toBe(1);
    const expected = sheet();
    expected[4][3] = 9;
    expected[4][5] = 12.5;
    expect(fx.grid).toEqual(expected);
  });

  it('refuses to write an input column, and writes nothing', async () => {
    const fx = { grid: sheet(), selection: { row: 4, column: 1 }, block };
    const { host, writes } = mockExcel(fx);
    const wb = new OfficeWorkbook(schema, host);
    const row = await wb.readSelectedRow();
    await expect(wb.writeOutputs(row, { layers: 3, tolerance: 0.5 })).rejects.toThrow(/"tolerance" is not an output column/);
    expect(writes).toEqual([]);
    expect(fx.grid).toEqual(sheet());
  });

  it('refuses to write when the row inputs changed since they were read', async () => {
    const fx = { grid: sheet(), selection: { row: 4, column: 1 }, block };
    const { host, writes } = mockExcel(fx);
    const wb = new OfficeWorkbook(schema, host);
    const row = await wb.readSelectedRow();
    fx.grid[4][2] = 16;
    await expect(wb.writeOutputs(row, { layers: 3 })).rejects.toThrow(/input "ppw" of this row changed/);
    expect(writes).toEqual([]);
  });

  it('says clearly when the selection is not in a project table', async () => {
    const grid: Grid = [
      ['item', 'price'],
      ['tea', 3],
    ];
    const { host } = mockExcel({ grid, selection: { row: 1, column: 0 }, block: { row: 0, column: 0, rows: 2, columns: 2 } });
    const err = await new OfficeWorkbook(schema, host).readSelectedRow().catch((e) => e);
    expect(err).toBeInstanceOf(WorkbookError);
    expect(err.message).toBe(
      'Sheet1!A2 is not in a project table: the header row of the block of cells around Sheet1!A2 (Sheet1!A1:B2) lacks tolerance, ppw. ' +
        'Select a cell in a study row of an Excel table, or of a block whose first row names the inputs (at least tolerance, ppw).',
    );
  });

  it('says so when the header row or several rows are selected', async () => {
    const a = mockExcel({ grid: sheet(), selection: { row: 2, column: 2 }, block });
    await expect(new OfficeWorkbook(schema, a.host).readSelectedRow()).rejects.toThrow('Sheet1!C3 is the header row; select a cell in a study row below it');
    const b = mockExcel({ grid: sheet(), selection: { row: 3, column: 2, rowCount: 2 }, block });
    await expect(new OfficeWorkbook(schema, b.host).readSelectedRow()).rejects.toThrow(/spans 2 rows/);
  });
});

describe('in-page workbook', () => {
  const header = ['name', 'ppw', 'layers', 'tolerance', 'cost'];
  const rows = (): CellValue[][] => sheet().slice(3).map((r) => r.slice(1));

  it('reads the selected row and writes only its output cells', async () => {
    const wb = new MemoryWorkbook(header, rows(), schema);
    wb.select(1);
    const row = await wb.readSelectedRow();
    expect(row.values.ppw).toBe(12);
    const seen: Array<[number, number]>[] = [];
    wb.onChange((c) => seen.push(c));
    const report = await wb.writeOutputs(row, { layers: 4, cost: 1 });
    expect(report.cells).toEqual(['demo row 2, layers', 'demo row 2, cost']);
    expect(report.row).toBe(2);
    expect(seen).toEqual([[[1, 2], [1, 4]]]);
    const expected = rows();
    expected[1][2] = 4;
    expected[1][4] = 1;
    expect(wb.rows).toEqual(expected);
    await expect(wb.writeOutputs(row, { ppw: 1 })).rejects.toThrow(/not an output column/);
  });

  it('refuses a table without the input columns', () => {
    expect(() => new MemoryWorkbook(['name', 'ppw'], [], schema)).toThrow('the table is not a project table: its header lacks tolerance');
  });
});

describe('addresses', () => {
  it('turns indexes into A1 addresses', () => {
    // Common practice (Excel's A1 notation): 26 → AA, 701 → ZZ, 702 → AAA.
    expect([0, 25, 26, 701, 702].map(columnLetters)).toEqual(['A', 'Z', 'AA', 'ZZ', 'AAA']);
    expect(cellAddress('Sheet1', 4, 3)).toBe('Sheet1!D5');
    expect(cellAddress("Bob's plan", 0, 0)).toBe("'Bob''s plan'!A1");
  });
});

describe('Office.js workbook with the plan schema', () => {
  it('matches header names as the plan does (units in brackets, case) and writes only outputs', async () => {
    const { TABLE_SCHEMA } = await import('../taskpane/plan-adapter');
    const grid: Grid = [
      ['study', 'band_short', 'Cell', 'intensity_error', 'layers [cells]', 'runtime [h]'],
      ['a', '1550 nm', '20 nm', '1%', '', ''],
    ];
    const fx = { grid, selection: { row: 1, column: 0 }, block: { row: 0, column: 0, rows: 2, columns: 6 } };
    const { host } = mockExcel(fx);
    const wb = new OfficeWorkbook(TABLE_SCHEMA, host);
    const row = await wb.readSelectedRow();
    const report = await wb.writeOutputs(row, { layers: 6, runtime: 1.5 });
    expect(report.cells).toEqual(['Sheet1!E2', 'Sheet1!F2']);
    expect(fx.grid[1]).toEqual(['a', '1550 nm', '20 nm', '1%', 6, 1.5]);
    await expect(wb.writeOutputs(row, { cell: '10 nm' })).rejects.toThrow(/"cell" is not an output column/);
  });
});

/**
 * `hush init`: the starter project table. Checked against the field registry
 * (every input field is a column), against the plan it makes (`hush init
 * t.xlsx && hush plan t.xlsx --out p.xlsx`: the summary sheet's totals are the
 * sums of the plan rows), and with exceljs reading what was written (header
 * notes, data validation, the HUSH.PLAN array formula and its cached results).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import { join } from 'path';
import ExcelJS from 'exceljs';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { OUTPUT_COLUMNS, outputHeaderText, TABLE_FIELDS } from '../src/plan/fields';
import { parseCsv } from '../src/plan/csv';
import { starterTable } from '../src/plan/starter';
import { starterFormula, starterOutputs, STARTER_VALIDATED_ROWS } from '../src/plan/table/write-starter';

const dir = mkdtempSync(join(tmpdir(), 'hush-init-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(argv: string[]) {
  const o: string[] = [];
  const e: string[] = [];
  const io: CommandIO = { out: (t) => o.push(t), err: (t) => e.push(t), isTTY: false };
  const code = await main(argv, io);
  return { code, out: o, err: e };
}

describe('the starter table', () => {
  it('has every input field of the table as a column, in the registry order, each with a note stating its default', () => {
    const t = starterTable();
    expect(t.inputs.map((c) => c.name)).toEqual(TABLE_FIELDS.map((f) => f.name));
    for (const c of t.inputs) expect(c.note).toMatch(new RegExp(`^${c.name}: .*Default: `));
    expect(t.inputs.filter((c) => c.choices).map((c) => c.name)).toEqual(expect.arrayContaining(['phase', 'monitor', 'precision', 'decomposition', 'sampling', 'resonance']));
    expect(t.outputs.map((o) => o.header)).toEqual(OUTPUT_COLUMNS.map(outputHeaderText));
    expect(t.note).toMatch(/invented example/);
  });
  it("the example row plans (it is the plan API's row), and its formula covers the input header and the row", () => {
    const o = starterOutputs();
    expect(o).toHaveLength(OUTPUT_COLUMNS.length);
    expect(o[OUTPUT_COLUMNS.findIndex((c) => c.name === 'layers')]).toBeGreaterThanOrEqual(1);
    const n = TABLE_FIELDS.length;
    const last = (k: number) => (k < 26 ? String.fromCharCode(65 + k) : String.fromCharCode(64 + Math.floor(k / 26)) + String.fromCharCode(65 + (k % 26)));
    expect(starterFormula()).toEqual({ formula: `HUSH.PLAN($A$1:$${last(n - 1)}$1,$A2:$${last(n - 1)}2)`, ref: `${last(n)}2:${last(n + OUTPUT_COLUMNS.length - 1)}2` });
  });
});

describe('hush init', () => {
  it('hush init t.xlsx && hush plan t.xlsx --out p.xlsx: the plan has a summary sheet whose totals are the sums of the rows', async () => {
    const t = join(dir, 't.xlsx');
    const p = join(dir, 'p.xlsx');
    const init = await run(['init', t]);
    expect(init).toMatchObject({ code: 0, err: [] });
    expect(init.out[0]).toMatch(/^wrote .*t\.xlsx: a starter project table/);
    const planned = await run(['plan', t, '--out', p]);
    expect(planned.code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(p);
    const s = wb.getWorksheet('summary')!;
    const first = s.getRow(5);
    const total = s.getRow(6);
    expect(total.getCell(1).value).toBe('total (1 study)');
    expect(total.getCell(3).value).toEqual({ formula: 'SUM(C5:C5)', result: first.getCell(3).value });
    expect((total.getCell(12).value as { result: number }).result).toBeCloseTo(first.getCell(12).value as number, 12);
  });
  it('the workbook: header notes, choice lists on rows 2..201, the example row, and one HUSH.PLAN array formula with the plan as cached results', async () => {
    const t = join(dir, 'v.xlsx');
    expect((await run(['init', t])).code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(t);
    const ws = wb.getWorksheet('studies')!;
    const st = starterTable();
    const head = ws.getRow(1);
    st.inputs.forEach((c, k) => {
      expect(head.getCell(k + 1).value).toBe(c.name);
      expect(String(head.getCell(k + 1).note)).toContain(`${c.name}: `);
    });
    const phase = st.inputs.findIndex((c) => c.name === 'phase') + 1;
    for (const r of [2, STARTER_VALIDATED_ROWS + 1]) expect(ws.getCell(r, phase).dataValidation).toMatchObject({ type: 'list', formulae: ['"worst,random"'] });
    expect(ws.getCell(STARTER_VALIDATED_ROWS + 2, phase).dataValidation?.type).toBeUndefined();
    const study = ws.getCell(2, 1).value;
    expect(study).toMatch(/invented example/);
    const f = ws.getCell(2, st.inputs.length + 1).value as { formula?: string; sharedFormula?: string; result?: unknown };
    expect(f.formula).toBe(starterFormula().formula);
    const results = starterOutputs();
    expect(f.result).toBe(results[0]);
    const layers = OUTPUT_COLUMNS.findIndex((c) => c.name === 'layers');
    expect(ws.getCell(2, st.inputs.length + 1 + layers).value).toBe(results[layers]);
  });
  it('hush init t.csv writes the header and the example row; the CSV plans', async () => {
    const t = join(dir, 't.csv');
    expect((await run(['init', t])).code).toBe(0);
    const rows = parseCsv(readFileSync(t, 'utf8'));
    expect(rows[0]).toEqual(TABLE_FIELDS.map((f) => f.name));
    expect(rows).toHaveLength(2);
    const r = await run(['plan', t]);
    expect(r.code).toBe(0);
    expect(r.out.at(-1)).toMatch(/^1 planned, 0 failed/);
  });
  it('never replaces a file, refuses other formats and extra arguments (exit 2, a message)', async () => {
    const t = join(dir, 'mine.xlsx');
    writeFileSync(t, 'my own work');
    expect(await run(['init', t])).toEqual({ code: 2, out: [], err: [`hush init: ${t} already exists; Hush does not replace it: choose another name`] });
    expect(readFileSync(t, 'utf8')).toBe('my own work');
    expect(await run(['init', join(dir, 'x.ods')])).toMatchObject({ code: 2, err: [expect.stringMatching(/written as \.xlsx or \.csv$/)] });
    expect(existsSync(join(dir, 'x.ods'))).toBe(false);
    expect(await run(['init', 'a.csv', 'b.csv'])).toMatchObject({ code: 2, err: ['hush init: give at most one file name, got 2'] });
    expect(await run(['init', join(dir, 'no-such-dir', 't.csv')])).toMatchObject({ code: 2, err: [expect.stringMatching(/does not exist/)] });
  });
});

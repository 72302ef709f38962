/**
 * Determinism: the demo plan (assets/demo-project.csv) is bit-identical across
 * runs and across front ends. Every output value of every row is compared with
 * Object.is (so 0 and -0 differ, and a last-bit difference fails) between:
 *  - the plan API itself (planRow → planToRow), the reference;
 *  - `hush plan … --out x.json` and `--out x.csv`, twice each, in-process;
 *  - `hush plan … --out x.xlsx`, read back with exceljs;
 *  - `hush plan … --out x.json` in a separate Node process (nothing warm);
 *  - the worksheet function HUSH.PLAN (stubbed CustomFunctions global, as in
 *    tests/functions.test.ts) called with the demo header and each row;
 *  - the task pane's adapter (taskpane/plan-adapter.ts: studyPlan, outputValues,
 *    and optionPlans' recommended option);
 * and the same again after clearing the plan and design caches (and the
 * worksheet memo), so no cached value hides a difference.
 *
 * Source of the expected values: an independent computation (the plan API
 * called directly); the property checked is equality, not a value.
 */
import { execFileSync } from 'child_process';
import { mkdtempSync, readFileSync, rmSync } from 'fs';
import { tmpdir } from 'os';
import path from 'path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { OUTPUT_NAMES, clearPlanCache, planRow, planToRow, rowFromTable, type PlanCell } from '../src/plan';
import { parseCsv } from '../src/plan/csv';
import { clearDesignCache } from '../src/physics/design';
import * as functions from '../src/functions/functions';
import { clearWorksheetMemo } from '../src/functions/plans';
import { optionPlans, outputValues, studyPlan } from '../taskpane/plan-adapter';
import { installCustomFunctionsStub } from './support/custom-functions-stub';

beforeAll(() => {
  installCustomFunctionsStub();
});

const root = path.join(__dirname, '..');
const demoFile = path.join(root, 'assets', 'demo-project.csv');
const demo = parseCsv(readFileSync(demoFile, 'utf8'));
const header = demo[0];
const rows = demo.slice(1);
const dir = mkdtempSync(path.join(tmpdir(), 'hush-determinism-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** One row's outputs by column; null where the plan has no value. */
type Outputs = PlanCell[];

function clearCaches(): void {
  clearPlanCache();
  clearDesignCache();
  clearWorksheetMemo();
}

/** The reference: the plan API called directly. */
function reference(): Outputs[] {
  return rows.map((values) => planToRow(planRow(rowFromTable(header, values))));
}

async function cli(argv: string[]): Promise<void> {
  const err: string[] = [];
  const io: CommandIO = { out: () => undefined, err: (t) => err.push(t), isTTY: false };
  const code = await main(argv, io);
  expect(err, `hush ${argv.join(' ')}`).toEqual([]);
  expect(code).toBe(0);
}

function fromJson(file: string): Outputs[] {
  const j = JSON.parse(readFileSync(file, 'utf8')) as { rows: { failed: boolean; outputs: Record<string, PlanCell> }[] };
  expect(j.rows.length).toBe(rows.length);
  return j.rows.map((r) => {
    expect(r.failed).toBe(false);
    return OUTPUT_NAMES.map((n) => r.outputs[n]);
  });
}

/** CSV holds text: a number cell is read back with Number (JS writes the shortest text that round-trips exactly). */
function fromCsv(file: string, like: Outputs[]): Outputs[] {
  const t = parseCsv(readFileSync(file, 'utf8'));
  const first = t[0].length - OUTPUT_NAMES.length;
  // The plan's last row is its total row (src/plan/table/write-csv.ts), not a study.
  expect(t[t.length - 1][first + OUTPUT_NAMES.indexOf('notes')]).toMatch(/^total of /);
  return t.slice(1, -1).map((r, i) =>
    r.slice(first).map((text, k): PlanCell => (text === '' ? null : typeof like[i][k] === 'number' ? Number(text) : text)),
  );
}

async function fromXlsx(file: string): Promise<Outputs[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  const ws = wb.getWorksheet('plan')!;
  const width = ws.getRow(1).cellCount;
  const first = width - OUTPUT_NAMES.length + 1;
  const out: Outputs[] = [];
  for (let r = 2; r <= rows.length + 1; r++) {
    const row = ws.getRow(r);
    const cells: PlanCell[] = [];
    for (let c = first; c <= width; c++) {
      const v = row.getCell(c).value;
      cells.push(v === null || v === undefined ? null : (v as number | string));
    }
    out.push(cells);
  }
  return out;
}

/** HUSH.PLAN spills "" where the plan has no value. */
async function fromWorksheet(): Promise<Outputs[]> {
  const spilled = await Promise.all(rows.map((values) => functions.plan([header], [values]) as Promise<(number | string)[][]>));
  return spilled.map((s) => {
    expect(s.length).toBe(1);
    return s[0].map((v) => (v === '' ? null : v));
  });
}

/** The task pane reads a row as header name → value and writes outputValues ('' where the plan has no value). */
function fromTaskPane(): Outputs[] {
  return rows.map((values) => {
    const rowValues = Object.fromEntries(header.map((h, k) => [h, values[k]]));
    const plan = studyPlan(rowValues);
    const recommended = optionPlans(plan).filter((o) => o.recommended);
    expect(recommended.length).toBe(1);
    expect(recommended[0].plan).toBe(plan);
    const written = outputValues(plan);
    return OUTPUT_NAMES.map((n) => (written[n] === '' ? null : (written[n] as number | string)));
  });
}

/** An empty cell: the API's null and an empty text (no notes; a worksheet's or a CSV's blank) are the same cell. */
const cell = (v: PlanCell): PlanCell => (v === '' ? null : v);

/** Every value identical (Object.is), with the first difference named. */
function expectIdentical(name: string, actual: Outputs[], expected: Outputs[]): void {
  expect(actual.length, name).toBe(expected.length);
  actual.forEach((row, i) => {
    expect(row.length, `${name}, row ${i + 2}`).toBe(OUTPUT_NAMES.length);
    row.forEach((value, k) => {
      const v = cell(value);
      const e = cell(expected[i][k]);
      if (!Object.is(v, e)) throw new Error(`${name}, row ${i + 2}, ${OUTPUT_NAMES[k]}: ${String(v)} is not ${String(e)}`);
    });
  });
}

/** Every front end, in this process. */
async function allInProcess(tag: string): Promise<Record<string, Outputs[]>> {
  const got: Record<string, Outputs[]> = {};
  for (const run of [1, 2]) {
    const json = path.join(dir, `${tag}-${run}.json`);
    const csv = path.join(dir, `${tag}-${run}.csv`);
    await cli(['plan', demoFile, '--out', json, '--replace']);
    await cli(['plan', demoFile, '--out', csv, '--replace']);
    got[`hush plan --out .json (run ${run})`] = fromJson(json);
    got[`hush plan --out .csv (run ${run})`] = fromCsv(csv, got[`hush plan --out .json (run ${run})`]);
  }
  const xlsx = path.join(dir, `${tag}.xlsx`);
  await cli(['plan', demoFile, '--out', xlsx, '--replace']);
  got['hush plan --out .xlsx'] = await fromXlsx(xlsx);
  got['HUSH.PLAN'] = await fromWorksheet();
  got['task pane adapter'] = fromTaskPane();
  return got;
}

describe('determinism: the demo plan is bit-identical across runs and front ends', () => {
  let expected: Outputs[];

  beforeAll(() => {
    clearCaches();
    expected = reference();
  });

  it('every demo row is planned, with numbers in every column that always has one', () => {
    expect(expected.length).toBe(9);
    for (const row of expected) {
      for (const n of ['required_reflection', 'layers', 'order', 'worst_reflection', 'cells_total', 'memory']) {
        expect(typeof row[OUTPUT_NAMES.indexOf(n)]).toBe('number');
      }
    }
  });

  it('the plan API twice, with the caches cleared in between', () => {
    clearCaches();
    expectIdentical('plan API after clearing the caches', reference(), expected);
    expectIdentical('plan API from the cache', reference(), expected);
  });

  it('hush plan (.json twice, .csv twice, .xlsx), HUSH.PLAN and the task pane adapter, warm caches', async () => {
    for (const [name, got] of Object.entries(await allInProcess('warm'))) expectIdentical(name, got, expected);
  });

  it('the same with the plan, design and worksheet caches cleared before each front end', async () => {
    clearCaches();
    const got: Record<string, Outputs[]> = {};
    const json = path.join(dir, 'cold.json');
    await cli(['plan', demoFile, '--out', json, '--replace']);
    got['hush plan --out .json (cold)'] = fromJson(json);
    clearCaches();
    got['HUSH.PLAN (cold)'] = await fromWorksheet();
    clearCaches();
    got['task pane adapter (cold)'] = fromTaskPane();
    clearCaches();
    got['plan API (cold)'] = reference();
    for (const [name, g] of Object.entries(got)) expectIdentical(name, g, expected);
    // And everything once more, after the cold runs refilled the caches.
    for (const [name, g] of Object.entries(await allInProcess('refilled'))) expectIdentical(`${name} (refilled)`, g, expected);
  });

  it('hush plan in a separate Node process (nothing warm) writes the same plan', () => {
    const json = path.join(dir, 'process.json');
    execFileSync(process.execPath, [path.join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), path.join(root, 'src', 'cli', 'index.ts'), 'plan', demoFile, '--out', json, '--replace'], {
      cwd: root,
      stdio: 'pipe',
    });
    expectIdentical('hush plan in another process', fromJson(json), expected);
  });
});

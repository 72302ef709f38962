/**
 * Writing plans: CSV (byte-order mark, formula guard, a marked total row),
 * JSON (totals object), .xlsx (numbers as numbers, formats and notes kept,
 * widths, the summary sheet, fixed dates), output columns renamed when a
 * user column has their name, and the file faults (missing or read-only
 * directory, stale temporary files). Expected totals are recomputed here
 * from the rows written (an independent sum); the workbook is also opened
 * with openpyxl, a spreadsheet reader that shares no code with exceljs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import { join } from 'path';
import ExcelJS from 'exceljs';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { OUTPUT_NAMES, planHeaderText } from '../src/plan';
import { parseCsv } from '../src/plan/csv';
import { csvText } from '../src/plan/table/write-csv';
import { zipEntries } from '../src/plan/table/zip';
import { zipQueueLength } from '../src/plan/table/write-xlsx';
import { buildXlsx, rowXml } from './support/xlsx-build';
import { bundle } from './support/bundle';

const dir = mkdtempSync(join(tmpdir(), 'hush-write-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const demo = join(__dirname, '..', 'assets', 'demo-project.csv');
/** The demo's study count (its non-empty rows below the header) and the summary sheet's last study row (studies start on row 5). */
const N = readFileSync(demo, 'utf8').split(/\r?\n/).slice(1).filter((l) => l.trim() !== '').length;
const L = 4 + N;

let n = 0;
function file(name: string, content: string | Buffer): string {
  const f = join(dir, `${n++}-${name}`);
  writeFileSync(f, content);
  return f;
}
function out(name: string): string {
  return join(dir, `${n++}-${name}`);
}

async function run(argv: string[]) {
  const o: string[] = [];
  const e: string[] = [];
  const io: CommandIO = { out: (t) => o.push(t), err: (t) => e.push(t), isTTY: false };
  const code = await main(argv, io);
  return { code, out: o, err: e };
}

const HEAD = ['study', 'dimensions', 'band_short', 'cell', 'cells_x', 'intensity_error'];
const ROW = ['s1', '1', '1550 nm', '50 nm', '100', '1%'];

describe('CSV output', () => {
  it('text that a spreadsheet would evaluate gets a leading apostrophe (common practice against CSV injection); plain numbers do not', async () => {
    // The examples of the issue, and the first characters OWASP's CSV-injection advice lists: = + - @ tab, carriage return.
    const typed = ['=HYPERLINK("http://example.invalid","x")', '@SUM(1)', "+cmd|' /C calc'!A0", '-2+3', '\tx', '\rx', '-2', '+3', '-1e5', '.5', 'plain'];
    expect(typed.map(csvText)).toEqual([
      '\'=HYPERLINK("http://example.invalid","x")',
      "'@SUM(1)",
      "'+cmd|' /C calc'!A0",
      "'-2+3",
      "'\tx",
      "'\rx",
      '-2',
      '+3',
      '-1e5',
      '.5',
      'plain',
    ]);
    const rows = typed.map((t, k) => [`s${k}`, ...ROW.slice(1), t]);
    const lines = [[...HEAD, 'remark'], ...rows].map((r) => r.map((v) => `"${v.replace(/"/g, '""')}"`).join(','));
    const f = file('inject.csv', lines.join('\r\n') + '\r\n');
    const o = out('inject-plan.csv');
    expect((await run(['plan', f, '--out', o])).code).toBe(0);
    const written = parseCsv(readFileSync(o, 'utf8'));
    expect(written.slice(1, 1 + typed.length).map((r) => r[6])).toEqual(typed.map(csvText));
  });
  it("an .xlsx input's text cell that looks like a formula is guarded in the CSV, and stays text in the workbook", async () => {
    const f = file('inject.xlsx', buildXlsx({ sheets: [{ name: 'S', data: rowXml(1, [...HEAD, 'remark']) + rowXml(2, ['=1+1', 1, '1550 nm', '50 nm', 100, 0.01, '@SUM(1)']) }] }));
    const csv = out('x-inject.csv');
    const xlsx = out('x-inject.xlsx');
    expect((await run(['plan', f, '--out', csv])).code).toBe(0);
    expect(parseCsv(readFileSync(csv, 'utf8'))[1].slice(0, 7)).toEqual(["'=1+1", '1', '1550 nm', '50 nm', '100', '0.01', "'@SUM(1)"]);
    expect((await run(['plan', f, '--out', xlsx])).code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(xlsx);
    expect(wb.getWorksheet('plan')!.getCell('A2').value).toBe('=1+1');
  });
  it('is UTF-8 with a byte-order mark, so σ, λ and × read right in a spreadsheet program', async () => {
    const o = out('bom.csv');
    expect((await run(['plan', file('bom-in.csv', `${HEAD.join(',')},remark\r\n${ROW.join(',')},σ λ ×\r\n`), '--out', o])).code).toBe(0);
    const bytes = readFileSync(o);
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(bytes.includes(Buffer.from('σ λ ×', 'utf8'))).toBe(true);
    expect(bytes.includes(Buffer.from('strength [σmax/σopt]', 'utf8'))).toBe(true);
  });
});

describe('totals: the same figures under the table, in the CSV total row, the JSON totals and the summary sheet', () => {
  let csvRows: string[][];
  let header: string[];
  let json: { rows: { outputs: Record<string, number | null> | null; failed: boolean }[]; totals: Record<string, unknown> };
  let stdout: string[];
  const xlsx = join(dir, 'demo-plan.xlsx');
  beforeAll(async () => {
    const csv = join(dir, 'demo-plan.csv');
    const js = join(dir, 'demo-plan.json');
    const r = await run(['plan', demo, '--out', csv]);
    expect(r.code).toBe(0);
    stdout = r.out;
    csvRows = parseCsv(readFileSync(csv, 'utf8'));
    header = csvRows[0];
    expect((await run(['plan', demo, '--out', js])).code).toBe(0);
    json = JSON.parse(readFileSync(js, 'utf8'));
    expect((await run(['plan', demo, '--out', xlsx])).code).toBe(0);
  });
  const sum = (xs: (number | null)[]) => xs.reduce<number>((a, x) => a + (x ?? 0), 0);
  const col = (name: string) => header.findIndex((h) => h.replace(/ \[.*\]$/, '') === name);

  it('the CSV ends with one total row, marked in its study and notes cells, whose cells are the sums of the rows above (memory: the largest)', () => {
    const body = csvRows.slice(1, -1);
    const total = csvRows[csvRows.length - 1];
    expect(body.length).toBe(N);
    expect(total[col('study')]).toBe('total');
    expect(total[col('notes')]).toMatch(new RegExp(`^total of ${N} planned studies; cells absorber share \\d+\\.\\d %; memory is the largest study's \\(Jetty symmetric waveguide \\(half domain\\)\\), .*; not a study row$`));
    for (const name of ['cells_total', 'cells_absorber', 'steps', 'runtime', 'runtime_absorber', 'cost']) {
      const expected = sum(body.map((r) => (r[col(name)] === '' ? null : Number(r[col(name)]))));
      expect(Number(total[col(name)]), name).toBeCloseTo(expected, 9);
    }
    expect(Number(total[col('memory')])).toBe(Math.max(...body.map((r) => Number(r[col('memory')]))));
  });
  it('reading the CSV plan back drops its total row like its output columns: planning it again gives the same file', async () => {
    const again = out('again.csv');
    expect((await run(['plan', join(dir, 'demo-plan.csv'), '--out', again])).code).toBe(0);
    expect(readFileSync(again, 'utf8')).toBe(readFileSync(join(dir, 'demo-plan.csv'), 'utf8'));
  });
  it('the JSON carries a totals object with the same sums and shares', () => {
    const rows = json.rows.filter((r) => !r.failed && r.outputs);
    const o = (k: string) => rows.map((r) => r.outputs![k]);
    const t = json.totals;
    expect(t.studies).toBe(N);
    expect(t.failed).toBe(0);
    expect(t.cells_total).toBe(sum(o('cells_total')));
    expect(t.cells_absorber_share).toBeCloseTo(sum(o('cells_absorber')) / sum(o('cells_total')), 12);
    expect(t.peak_memory_gb).toBe(Math.max(...o('memory').map(Number)));
    expect(t.steps).toBe(sum(o('steps')));
    expect(t.runtime_hours as number).toBeCloseTo(sum(o('runtime')), 9);
    expect(t.runtime_absorber_share as number).toBeCloseTo(sum(o('runtime_absorber')) / sum(o('runtime')), 9);
    expect(t.cost as number).toBeCloseTo(sum(o('cost')), 9);
    expect(t.currencies).toEqual(['$']);
    expect(t.note).toMatch(/planning estimates/);
  });
  it('`hush plan` prints the totals under its table, before the planned/failed line', () => {
    const t = json.totals;
    const line = stdout[stdout.length - 3];
    expect(line.replace(`total: ${N} studies, `, 'total: N studies, ')).toMatch(/^total: N studies, [\d,]+ cells \(absorber \d+\.\d %\), peak memory 1\.061 GB \(Jetty symmetric waveguide \(half domain\); absorber \d+\.\d %\), [\d,]+ steps, .* node-hours \(absorber \d+\.\d %\), runtime .* h \(absorber \d+\.\d %\), cost \$[\d.]+ \(absorber \d+\.\d %\)$/);
    expect(line).toContain(`${(t.cells_total as number).toLocaleString('en-US')} cells`);
    expect(line).toContain(`${(t.steps as number).toLocaleString('en-US')} steps`);
    expect(stdout[stdout.length - 2]).toMatch(new RegExp(`^${N} planned, 0 failed`));
  });
  it('the workbook has a summary sheet: per study and in total, formulas with their values, assumptions beside them, one printed page', async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(xlsx);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['plan', 'summary', 'about']);
    const s = wb.getWorksheet('summary')!;
    const headerRow = (s.getRow(4).values as unknown[]).slice(1);
    expect(headerRow.slice(0, 3)).toEqual(['study', 'table row', 'cells']);
    expect(headerRow.slice(13)).toEqual(['nodes', 'throughput [cell updates/s per node]', 'price per node-hour (as typed)', 'precision']);
    const rows = json.rows.filter((r) => !r.failed && r.outputs);
    for (let k = 0; k < N; k++) {
      const r = s.getRow(5 + k);
      expect(r.getCell(3).value).toBe(rows[k].outputs!.cells_total);
      expect(r.getCell(10).value).toBe(rows[k].outputs!.runtime);
    }
    expect(s.getRow(5).getCell(16).value).toBe('$0.40/h');
    const total = s.getRow(5 + N);
    expect(total.getCell(1).value).toBe(`total (${N} studies)`);
    expect(total.getCell(3).value).toEqual({ formula: `SUM(C5:C${L})`, result: json.totals.cells_total });
    expect((total.getCell(5).value as { formula: string }).formula).toBe(`MAX(E5:E${L})`);
    expect((total.getCell(10).value as { result: number }).result).toBeCloseTo(json.totals.runtime_hours as number, 9);
    expect((total.getCell(12).value as { result: number }).result).toBeCloseTo(json.totals.cost as number, 9);
    expect(s.pageSetup).toMatchObject({ fitToPage: true, fitToWidth: 1, fitToHeight: 1, orientation: 'landscape' });
  });
});

describe('.xlsx output', () => {
  const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
  const styles =
    `<?xml version="1.0" encoding="UTF-8"?><styleSheet xmlns="${NS}"><numFmts count="1"><numFmt numFmtId="164" formatCode="#,##0.00&quot; EUR&quot;"/></numFmts>` +
    '<cellXfs count="3"><xf numFmtId="0"/><xf numFmtId="164"/><xf numFmtId="10"/></cellXfs></styleSheet>';
  const longName = 'Beacon ring resonator, second coupling gap (invented)';
  const input = () =>
    file(
      'formats.xlsx',
      buildXlsx({
        sheets: [
          {
            name: 'studies',
            data:
              rowXml(1, [...HEAD, 'budget']) +
              `<row r="2"><c r="A2" t="inlineStr"><is><t>${longName}</t></is></c><c r="B2"><v>1</v></c><c r="C2" t="inlineStr"><is><t>1550 nm</t></is></c>` +
              '<c r="D2" t="inlineStr"><is><t>50 nm</t></is></c><c r="E2"><v>100</v></c><c r="F2" s="2"><v>0.01</v></c><c r="G2" s="1"><v>1234.5</v></c></row>',
            comments: '<comment ref="F1" authorId="0"><text><r><t>tolerated relative intensity error</t></r></text></comment>',
          },
        ],
        styles,
      }),
    );
  it("numbers are number cells (a CSV's plain numbers too), an .xlsx input keeps its number formats and notes, the study column fits its names", async () => {
    const xin = input();
    const o = out('formats-plan.xlsx');
    expect((await run(['plan', xin, '--out', o])).code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(o);
    const ws = wb.getWorksheet('plan')!;
    expect(ws.getCell('F2').value).toBe(0.01);
    expect(ws.getCell('F2').numFmt).toBe('0.00%');
    expect(ws.getCell('G2').value).toBe(1234.5);
    expect(ws.getCell('G2').numFmt).toBe('#,##0.00" EUR"');
    expect(ws.getCell('F1').note).toBe('tolerated relative intensity error');
    expect(ws.getColumn(1).width).toBeGreaterThanOrEqual(longName.length);
    // Output columns: their header notes, number formats and number cells.
    const layers = HEAD.length + 2 + OUTPUT_NAMES.indexOf('layers');
    expect(typeof ws.getRow(2).getCell(layers).value).toBe('number');
    expect(ws.getRow(1).getCell(layers).note).toBe('absorber thickness');
    expect(ws.getRow(1).getCell(HEAD.length + 2 + OUTPUT_NAMES.indexOf('cost')).note).toMatch(/Planning estimate: see the "about" sheet/);

    const csv = file('numbers.csv', `${HEAD.join(',')},remark,code\r\ns1,1,1550 nm,50 nm,100,0.01,1.50,007\r\n`);
    const o2 = out('numbers-plan.xlsx');
    expect((await run(['plan', csv, '--out', o2])).code).toBe(0);
    const wb2 = new ExcelJS.Workbook();
    await wb2.xlsx.readFile(o2);
    expect((wb2.getWorksheet('plan')!.getRow(2).values as unknown[]).slice(1, 9)).toEqual(['s1', 1, '1550 nm', '50 nm', 100, 0.01, 1.5, '007']);
  });
  it("finds exceljs's queue of sheet XML for the zip, so a long sheet waits for the zip instead of being queued whole (the 100,000-row memory bound, BENCHMARKS.md)", async () => {
    const target = out('queue.xlsx');
    const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: target, useStyles: true, useSharedStrings: true });
    const ws = wb.addWorksheet('plan');
    for (let r = 1; r <= 50; r++) {
      ws.getRow(r).getCell(1).value = `row ${r}`;
      ws.getRow(r).commit();
    }
    const queued = zipQueueLength(ws);
    expect(typeof queued).toBe('number');
    expect(queued as number).toBeGreaterThanOrEqual(0);
    ws.commit();
    await wb.commit();
    expect(existsSync(target)).toBe(true);
  });

  it('is byte-identical between runs: fixed document dates and zip timestamps', async () => {
    const xin = input();
    const a = out('a.xlsx');
    const b = out('b.xlsx');
    expect((await run(['plan', xin, '--out', a])).code).toBe(0);
    expect((await run(['plan', xin, '--out', b])).code).toBe(0);
    const A = readFileSync(a);
    expect(A.equals(readFileSync(b))).toBe(true);
    // Every part's MS-DOS time is 1980-01-01 00:00 (APPNOTE 4.4.6), so runs far apart agree too.
    for (const e of zipEntries(A).values()) {
      expect(A.readUInt16LE(e.offset + 10)).toBe(0);
      expect(A.readUInt16LE(e.offset + 12)).toBe(0x21);
    }
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(a);
    expect(wb.created.toISOString()).toBe('1980-01-01T00:00:00.000Z');
    expect(wb.modified.toISOString()).toBe('1980-01-01T00:00:00.000Z');
  });
});

describe('output columns never take a user column\'s name', () => {
  const user = ['notes', 'Cost (EUR)', 'steps', 'memory', 'grid', 'layers'];
  const f = () => file('collide.csv', `${[...HEAD, ...user].join(',')}\r\n${[...ROW, 'mine', '12', 'three', 'lots', 'fine', 'two'].join(',')}\r\n`);
  it('the user columns are kept as typed, the outputs are named plan_*, and a note says so', async () => {
    const o = out('collide-plan.csv');
    const r = await run(['plan', f(), '--out', o]);
    expect(r.code).toBe(0);
    expect(r.err).toEqual([
      'hush plan: columns kept as they are (not plan fields): "notes", "Cost (EUR)", "steps", "memory", "grid", "layers"',
      'hush plan: output columns renamed because the table has columns of the same name: layers → plan_layers, grid → plan_grid, memory → plan_memory, steps → plan_steps, cost → plan_cost, notes → plan_notes',
    ]);
    const rows = parseCsv(readFileSync(o, 'utf8'));
    expect(rows[0].slice(0, 12)).toEqual([...HEAD, ...user]);
    expect(rows[1].slice(0, 12)).toEqual([...ROW, 'mine', '12', 'three', 'lots', 'fine', 'two']);
    expect(rows[0]).toContain('plan_layers [cells]');
    expect(rows[0]).toContain('plan_cost [currency]');
    expect(rows[0]).toContain('plan_notes');
    // Planned again, the renamed output columns are recognised as the earlier plan's and replaced, the user's kept.
    const again = out('collide-again.csv');
    expect((await run(['plan', o, '--out', again])).code).toBe(0);
    expect(readFileSync(again, 'utf8')).toBe(readFileSync(o, 'utf8'));
  });
  it('the workbook header note of a renamed output says why', async () => {
    const o = out('collide-plan.xlsx');
    expect((await run(['plan', f(), '--out', o])).code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(o);
    const head = wb.getWorksheet('plan')!.getRow(1);
    const k = (head.values as unknown[]).indexOf('plan_notes');
    expect(head.getCell(k).note).toMatch(/Hush's "notes" output, named plan_notes because the table has a column of that name/);
    const outputs = (head.values as unknown[]).slice(1 + HEAD.length + user.length);
    expect(outputs.length).toBe(planHeaderText().length);
    expect(outputs.filter((v) => String(v).startsWith('plan_')).length).toBe(user.length);
  });
});

describe('an independent spreadsheet reader (openpyxl) opens the plan workbook with every value, formula and note', () => {
  const python = ['/usr/bin/python3', 'python3'].find((p) => spawnSync(p, ['-c', 'import openpyxl'], { encoding: 'utf8' }).status === 0);
  const reason = 'openpyxl is not installed (Debian: apt-get install -y python3-openpyxl); CI installs it';
  it.skipIf(!python && process.env.CI !== 'true')(`openpyxl reads the plan, summary and about sheets${python ? '' : ` (skipped: ${reason})`}`, async () => {
    expect(python, reason).toBeTruthy();
    const o = out('openpyxl.xlsx');
    expect((await run(['plan', demo, '--out', o])).code).toBe(0);
    const script = `
import json, sys, openpyxl
f = sys.argv[1]
wb = openpyxl.load_workbook(f)
wv = openpyxl.load_workbook(f, data_only=True)
p, s = wb['plan'], wb['summary']
out = {
  'sheets': wb.sheetnames,
  'header': [c.value for c in p[1]],
  'notes': [c.comment.text if c.comment else None for c in p[1]],
  'rows': [[c.value for c in r] for r in p.iter_rows(min_row=2)],
  'formats': [[c.number_format for c in r] for r in p.iter_rows(min_row=2, max_row=2)][0],
  'summary_formulas': [c.value for c in s[${L + 1}]],
  'summary_values': [c.value for c in wv['summary'][${L + 1}]],
  'fit': [s.sheet_properties.pageSetUpPr.fitToPage, s.page_setup.fitToWidth, s.page_setup.fitToHeight, s.page_setup.orientation],
  'freeze': p.freeze_panes,
  'about': [[c.value for c in r] for r in wb['about'].iter_rows(max_row=3)],
}
print(json.dumps(out))
`;
    const r = spawnSync(python!, ['-c', script, o], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const x = JSON.parse(r.stdout);
    const source = parseCsv(readFileSync(demo, 'utf8'));
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(o);
    const ws = wb.getWorksheet('plan')!;
    expect(x.sheets).toEqual(['plan', 'summary', 'about']);
    expect(x.header).toEqual([...source[0], ...planHeaderText()]);
    // Every value exceljs reads is what openpyxl reads.
    x.rows.forEach((row: unknown[], i: number) => {
      const mine = (ws.getRow(i + 2).values as unknown[]).slice(1);
      row.forEach((v, c) => expect(v ?? null, `row ${i + 2}, column ${c + 1}`).toEqual(mine[c] ?? null));
    });
    // Every output header has its note; the input headers of a CSV table have none.
    expect(x.notes.slice(0, source[0].length).every((v: unknown) => v === null)).toBe(true);
    expect(x.notes.slice(source[0].length).every((v: unknown) => typeof v === 'string' && v.length > 0)).toBe(true);
    expect(x.summary_formulas.slice(2, 7)).toEqual([`=SUM(C5:C${L})`, `=SUMPRODUCT(C5:C${L},D5:D${L})/SUM(C5:C${L})`, `=MAX(E5:E${L})`, `=INDEX(F5:F${L},MATCH(MAX(E5:E${L}),E5:E${L},0))`, `=SUM(G5:G${L})`]);
    const sumCells = x.rows.reduce((a: number, r: number[]) => a + r[source[0].length + OUTPUT_NAMES.indexOf('cells_total')], 0);
    expect(x.summary_values[2]).toBe(sumCells);
    expect(x.fit).toEqual([true, 1, 1, 'landscape']);
    expect(x.freeze).toBe('B2');
    expect(x.about[1]).toEqual(['model version', expect.any(String), null]);
  });
});

describe('file faults', () => {
  it('a missing output directory is found before the table is read or planned', async () => {
    const r = await run(['plan', join(dir, 'no-table.csv'), '--out', join(dir, 'no-such-dir', 'p.csv')]);
    expect(r.code).toBe(2);
    expect(r.err).toEqual([`hush plan: cannot write ${join(dir, 'no-such-dir', 'p.csv')}: the directory ${join(dir, 'no-such-dir')} does not exist; create it or choose another --out`]);
    const asFile = file('plain-file', 'x');
    expect((await run(['plan', demo, '--out', join(asFile, 'p.csv')])).err[0]).toMatch(/is not a directory$/);
  });
  it('a read-only output directory is found before planning', async (ctx) => {
    const ro = join(dir, 'read-only');
    mkdirSync(ro);
    const root = process.getuid?.() === 0;
    // As root, permission bits do not stop a write; the immutable attribute (chattr +i, ext2/3/4 and others) does.
    const locked = root ? spawnSync('chattr', ['+i', ro]).status === 0 : (chmodSync(ro, 0o555), true);
    if (!locked) {
      ctx.skip();
      return;
    }
    try {
      const r = await run(['plan', join(dir, 'no-table.csv'), '--out', join(ro, 'p.csv')]);
      expect(r.code).toBe(2);
      expect(r.err).toEqual([`hush plan: cannot write ${join(ro, 'p.csv')}: the directory ${ro} is read-only for you; choose another --out`]);
    } finally {
      if (root) spawnSync('chattr', ['-i', ro]);
      else chmodSync(ro, 0o755);
    }
  });
  it('temporary files a killed write left beside the same target are removed on the next run; a running write\'s are kept', async () => {
    const target = out('target.csv');
    const base = target.slice(dir.length + 1);
    const dead = spawnSync(process.execPath, ['-e', '']).pid!; // a process that has ended
    const running = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)'], { stdio: 'ignore' }); // one that runs
    const live = running.pid!;
    const stale = [`.${base}.hush-${dead}-1700000000000.tmp`, `.${base}.${dead}.1700000000000.tmp`];
    const kept = [`.${base}.hush-${live}-1700000000001.tmp`, `.other.csv.hush-${dead}-1.tmp`];
    for (const f of [...stale, ...kept]) writeFileSync(join(dir, f), 'partial');
    // A day-old file of a process id that is in use again is stale too.
    const old = `.${base}.hush-1-1600000000000.tmp`;
    writeFileSync(join(dir, old), 'partial');
    utimesSync(join(dir, old), new Date(Date.now() - 2 * 86400e3), new Date(Date.now() - 2 * 86400e3));
    expect((await run(['plan', file('t.csv', `${HEAD.join(',')}\r\n${ROW.join(',')}\r\n`), '--out', target])).code).toBe(0);
    const left = readdirSync(dir);
    for (const f of [...stale, old]) expect(left, f).not.toContain(f);
    for (const f of kept) expect(left, f).toContain(f);
    expect(left.filter((f) => f.includes('.hush-') && f.includes('probe'))).toEqual([]);
    expect(existsSync(target)).toBe(true);
    running.kill();
  });
});

describe('exceljs is loaded only when an .xlsx plan is written', () => {
  it('an .xlsx read and a CSV written do not load it; an .xlsx written does', () => {
    const child = bundle(join(__dirname, 'support', 'plan-child.ts'));
    const t = file('lazy.csv', `${HEAD.join(',')}\r\n${ROW.join(',')}\r\n`);
    const x = file('lazy.xlsx', buildXlsx({ sheets: [{ name: 'S', data: rowXml(1, HEAD) + rowXml(2, ['s', 1, '1550 nm', '50 nm', 100, 0.01]) }] }));
    const go = (args: string[]) => JSON.parse(spawnSync(process.execPath, [child, ...args], { encoding: 'utf8' }).stdout);
    expect(go(['plan', x, '--out', out('lazy.csv')])).toMatchObject({ code: 0, exceljs: false });
    expect(go(['plan', t, '--out', out('lazy.xlsx')])).toMatchObject({ code: 0, exceljs: true });
  });
});

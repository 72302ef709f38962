import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import { join } from 'path';
import ExcelJS from 'exceljs';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { OUTPUT_NAMES, planHeaderText } from '../src/plan';
import { parseCsv } from '../src/plan/csv';
import { plainNumber } from '../src/plan/table/text';
import { MAX_SHOWN_ROWS, rateText } from '../src/cli/plan';

const dir = mkdtempSync(join(tmpdir(), 'hush-plan-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const demo = join(__dirname, '..', 'assets', 'demo-project.csv');

async function run(argv: string[], isTTY = false) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CommandIO = { out: (t) => out.push(t), err: (t) => err.push(t), isTTY };
  const code = await main(argv, io);
  return { code, out: out.join('\n'), err: err.join('\n') };
}

describe('hush cost', () => {
  it('--json keys and the hand count of a 10³ cube with 2 layers', async () => {
    const r = await run(['cost', '--cells', '10,10,10', '--layers', '2', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const k of ['cells_total', 'cells_absorber', 'psi_total', 'overhead_percent']) expect(j).toHaveProperty(k);
    // Hand count (tests/cost.test.ts): 14³ cells, 1744 in the absorber, 9408 ψ.
    expect(j.cells_total).toBe(2744);
    expect(j.cells_absorber).toBe(1744);
    expect(j.psi_total).toBe(9408);
    expect(j.overhead_percent).toBe(174.4);
    expect(j).not.toHaveProperty('steps');
  });

  it('steps with --cell, --courant and --duration; faces limit the absorber', async () => {
    const r = await run(['cost', '--cells', '100,50', '--layers', '8', '--faces', 'x-,x+', '--cell', '20 nm', '--courant', '0.5', '--duration', '1 ps', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.cells_total).toBe(5800); // 116 × 50
    // T/Δt = 1e-12·c/(0.5·20e-9) = 29979.2458 → 29980 (derived).
    expect(j.steps).toBe(29980);
  });

  it('per-face layer counts (x-,x+,y-,y+ order) give each face its own absorber (hand count)', async () => {
    const r = await run(['cost', '--cells', '10,10', '--layers', '2,4,0,1', '--json']);
    expect(r.code).toBe(0);
    // Grid (10+2+4) × (10+0+1) = 16 × 11 = 176 cells, 100 of them interior.
    const j = JSON.parse(r.out);
    expect(j.cells_total).toBe(176);
    expect(j.cells_absorber).toBe(76);
    const bad = await run(['cost', '--cells', '10,10', '--layers', '2,2,3,3', '--faces', 'x-,x+']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--layers gives 3 layers to y-, which --faces leaves without an absorber/);
    expect((await run(['cost', '--cells', '10,10', '--layers', '2,2,3'])).err).toMatch(/--layers must be one whole number or 4/);
  });

  it('bad arguments exit with 2', async () => {
    expect((await run(['cost', '--layers', '2'])).code).toBe(2);
    expect((await run(['cost', '--cells', '10', '--layers', '2', '--cell', '1e-9'])).code).toBe(2);
    expect((await run(['cost', '--cells', '10,10', '--layers', '2', '--faces', 'z-'])).code).toBe(2);
    const r = await run(['cost', '--cells', 'ten', '--layers', '2']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/cells must be whole numbers separated by commas/);
  });
});

describe('hush plan', () => {
  it('plans the demo into an .xlsx that exceljs opens, one plan per row, inputs unchanged', async () => {
    const out = join(dir, 'demo-plan.xlsx');
    const r = await run(['plan', demo, '--out', out]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/9 planned, 0 failed/);
    expect(r.out).toMatch(/planning estimates/);
    const source = parseCsv(readFileSync(demo, 'utf8'));
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    const ws = wb.getWorksheet('plan')!;
    expect(ws.rowCount).toBe(source.length);
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    expect(header).toEqual([...source[0], ...planHeaderText()]);
    const layersCol = source[0].length + 1 + OUTPUT_NAMES.indexOf('layers');
    for (let r0 = 2; r0 <= source.length; r0++) {
      const row = ws.getRow(r0);
      for (let c = 0; c < source[0].length; c++) {
        const v = row.getCell(c + 1).value;
        // A plain number becomes a number cell; anything else stays text exactly as typed.
        const typed = source[r0 - 1][c];
        expect(v === null ? '' : v).toBe(plainNumber(typed) ?? typed);
      }
      expect(typeof row.getCell(layersCol).value).toBe('number');
    }
    expect(ws.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
    const about = wb.getWorksheet('about')!;
    const text = JSON.stringify(about.getSheetValues());
    expect(text).toMatch(/planning estimates/);
    expect(text).toMatch(/convergence check/);
  });

  it('`npm run demo` is this command, and run as its own process it writes a workbook exceljs opens with one plan per study', async () => {
    const root = join(__dirname, '..');
    const script = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')).scripts.demo as string;
    expect(script).toBe('npm run build:cli --silent && node bin/hush.js plan assets/demo-project.csv --out demo-plan.xlsx --replace');
    // The same command after the build, writing into the temp dir instead of the checkout (.ci/run runs the script itself).
    const out = join(dir, 'demo-plan-process.xlsx');
    if (!existsSync(join(root, 'dist/node/cli/index.js'))) execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json'], { cwd: root });
    const p = spawnSync(process.execPath, ['bin/hush.js', 'plan', 'assets/demo-project.csv', '--out', out, '--replace'], { cwd: root, encoding: 'utf8' });
    expect(p.status, p.stderr).toBe(0);
    expect(p.stdout).toMatch(/9 planned, 0 failed/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    const ws = wb.getWorksheet('plan')!;
    const source = parseCsv(readFileSync(demo, 'utf8'));
    expect(ws.rowCount).toBe(source.length);
    const layersCol = source[0].length + 1 + OUTPUT_NAMES.indexOf('layers');
    for (let r0 = 2; r0 <= source.length; r0++) expect(typeof ws.getRow(r0).getCell(layersCol).value).toBe('number');
  });

  it('writes CSV with the inputs exactly as typed and outputs in added columns', async () => {
    const out = join(dir, 'demo-plan.csv');
    expect((await run(['plan', demo, '--out', out])).code).toBe(0);
    const source = parseCsv(readFileSync(demo, 'utf8'));
    const text = readFileSync(out, 'utf8');
    expect(text.startsWith('\uFEFF')).toBe(true); // byte-order mark: spreadsheet programs then read σ, λ, × as UTF-8
    const written = parseCsv(text);
    // Every row as typed, and a last row of totals marked in its notes cell.
    expect(written.length).toBe(source.length + 1);
    source.forEach((row, i) => expect(written[i].slice(0, source[0].length)).toEqual(row));
    const total = written[written.length - 1];
    expect(total[source[0].indexOf('study')]).toBe('total');
    expect(total[written[0].indexOf('notes')]).toMatch(/^total of 9 planned studies; .*not a study row$/);
    // Planning the written plan again gives the same file (old output columns are replaced).
    const again = join(dir, 'again.csv');
    expect((await run(['plan', out, '--out', again])).code).toBe(0);
    expect(readFileSync(again, 'utf8')).toBe(readFileSync(out, 'utf8'));
  });

  it('a bad row gets its error in notes, the others still plan, exit code 1', async () => {
    const file = join(dir, 'mixed.csv');
    writeFileSync(
      file,
      'study,band_short,cell,cells_x,dimensions,intensity_error\r\ngood,1550 nm,50 nm,100,1,1%\r\nbad,5 kg,50 nm,100,1,1%\r\nalso good,1310,40,80,1,0.5%\r\n',
    );
    const out = join(dir, 'mixed.json');
    const r = await run(['plan', file, '--out', out]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/row 3: band_short must be a wavelength or a frequency such as 1550 nm or 193 THz \(got "5 kg"\)/);
    const j = JSON.parse(readFileSync(out, 'utf8'));
    expect(j.rows.map((x: { failed: boolean }) => x.failed)).toEqual([false, true, false]);
    expect(j.rows[1].outputs.notes).toBe('error: band_short must be a wavelength or a frequency such as 1550 nm or 193 THz (got "5 kg")');
    expect(typeof j.rows[2].outputs.layers).toBe('number');
    expect(j.rows[1].inputs.band_short).toBe('5 kg');
    // The per-cell constants of the cost model travel with the plan (xlsx: its "about" sheet).
    expect(j.cost_constants.map((c: { name: string }) => c.name)).toContain('field values per cell');
  });

  it('never writes over the project table, and replaces an existing --out file only with --replace', async () => {
    const table = join(dir, 'keep.csv');
    const typed = readFileSync(demo, 'utf8');
    writeFileSync(table, typed);
    const self = await run(['plan', table, '--out', table, '--replace']);
    expect(self.code).toBe(2);
    expect(self.err.split('\n')[0]).toBe(`hush plan: --out ${table} is the project table itself; write the plan to another file so the table stays as typed`);
    expect(readFileSync(table, 'utf8')).toBe(typed);
    const other = join(dir, 'theirs.csv');
    writeFileSync(other, 'a,b\r\n1,2\r\n');
    const refused = await run(['plan', table, '--out', other]);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/^hush plan: --out .*theirs\.csv already exists; give --replace to overwrite it, or choose another name/);
    expect(refused.out).toBe('');
    expect(readFileSync(other, 'utf8')).toBe('a,b\r\n1,2\r\n');
    expect((await run(['plan', table, '--out', other, '--replace'])).code).toBe(0);
    expect(readFileSync(other, 'utf8')).toMatch(/^\uFEFFstudy,remark,/);
    expect((await run(['plan', table, '--replace'])).err).toMatch(/--replace only applies with --out/);
    // No temporary file is left beside the plan.
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('bad arguments or an unreadable file exit with 2', async () => {
    expect((await run(['plan'])).code).toBe(2);
    expect((await run(['plan', join(dir, 'missing.csv')])).code).toBe(2);
    expect((await run(['plan', demo, '--out', join(dir, 'plan.txt')])).code).toBe(2);
    expect((await run(['plan', join(dir, 'table.ods')])).code).toBe(2);
    const broken = join(dir, 'broken.csv');
    writeFileSync(broken, 'study,band_short\r\n"unclosed,1550\r\n');
    const r = await run(['plan', broken]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/cannot read .*quoted field is not closed/);
  });

  it('reads an .xlsx project table; progress bar only on a terminal', async () => {
    const xin = join(dir, 'project.xlsx');
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('studies');
    ws.addRow(['study', 'dimensions', 'band_short', 'cell', 'cells_x', 'cells_y', 'intensity_error', 'passes', 'throughput']);
    ws.addRow(['sheet study', 2, '1550 nm', 40, 120, 80, 0.01, 3, 1e8]);
    await wb.xlsx.writeFile(xin);
    const quiet = await run(['plan', xin, '--json']);
    expect(quiet.code).toBe(0);
    expect(quiet.err).toBe('');
    const j = JSON.parse(quiet.out);
    expect(j[0].outputs.steps).toBeGreaterThan(0);
    const tty = await run(['plan', xin], true);
    expect(tty.err).toMatch(/\[#+\] 1\/1/);
  });
  it(`a long table prints its first ${MAX_SHOWN_ROWS} studies and says how many it left out; the totals count every row, --json carries all`, async () => {
    const rows = ['study,dimensions,band_short,cell,cells_x,intensity_error'];
    // 150 studies that differ only in their names: one plan, reused (bounded work).
    for (let k = 1; k <= 150; k++) rows.push(`s${k},1,1550 nm,50 nm,100,1%`);
    rows.push('bad,1,1550 nm,,100,1%');
    const f = join(dir, 'long.csv');
    writeFileSync(f, rows.join('\n'));
    const r = await run(['plan', f]);
    expect(r.code).toBe(1);
    const lines = r.out.split('\n');
    expect(lines.filter((l) => /^s\d+ /.test(l))).toHaveLength(MAX_SHOWN_ROWS);
    expect(lines).toContain('… and 51 more studies (with their notes) not shown here: the totals count every row, and --out writes each one');
    expect(lines.some((l) => l.startsWith('total: 150 studies,'))).toBe(true);
    expect(r.err).toMatch(/row 152: cell is required/);
    expect(JSON.parse((await run(['plan', f, '--json'])).out)).toHaveLength(151);
  });
  it('the progress line shows the rate and the time left once it can be measured', () => {
    expect(rateText(0, 100, 5)).toBe('');
    expect(rateText(10, 100, 2)).toBe(' · 5 rows/s · 18 s left');
    expect(rateText(10, 1000, 2)).toBe(' · 5 rows/s · 3 min 18 s left');
    expect(rateText(100, 100, 20)).toBe(' · 5 rows/s · 20 s in all');
  });
});

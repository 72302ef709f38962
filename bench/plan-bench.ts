/**
 * Benchmark: `hush plan` on a generated 1,000-row project table, end to end
 * (read CSV, plan every row, write the plan workbook), wall time and peak
 * memory of the process. Goal (BENCHMARKS.md): the whole sweep ≤ 5 s on 2 cores.
 */
import { spawnSync } from 'child_process';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'fs';
import { join } from 'path';
import { tmpdir } from 'os';
import { parseCsv, writeCsv } from '../src/plan/csv';

/** 1,000 rows made from the demo rows, each with its tolerance scaled 0.3–3× so no two rows share a plan. */
export function generatedTable(rows: number): string {
  const demo = parseCsv(readFileSync(join(process.cwd(), 'assets', 'demo-project.csv'), 'utf8'));
  const header = demo[0];
  const body = demo.slice(1);
  const col = header.indexOf('intensity_error');
  const studyCol = header.indexOf('study');
  const out: string[][] = [header];
  for (let k = 0; k < rows; k++) {
    const r = [...body[k % body.length]];
    const base = parseFloat(r[col]) / (r[col].includes('%') ? 100 : 1);
    r[col] = String(base * (0.3 + (2.7 * ((k * 7919) % 1000)) / 1000));
    r[studyCol] = `${r[studyCol]} #${k + 1}`;
    out.push(r);
  }
  return writeCsv(out);
}

export function planBench(): string[] {
  const entry = join(process.cwd(), 'dist', 'node', 'cli', 'main.js');
  if (!existsSync(entry)) return ["hush plan, 1,000 rows: skipped, run 'npm run build' first"];
  const dir = mkdtempSync(join(tmpdir(), 'hush-bench-'));
  const table = join(dir, 'table.csv');
  writeFileSync(table, generatedTable(1000));
  const lines: string[] = [];
  for (const out of ['plan.csv', 'plan.xlsx']) {
    const script = `const t0=Date.now();require(${JSON.stringify(entry)}).main(['plan',${JSON.stringify(table)},'--out',${JSON.stringify(join(dir, out))}],{out(){},err(){},isTTY:false}).then(c=>{console.log(JSON.stringify({code:c,ms:Date.now()-t0,maxRssKiB:process.resourceUsage().maxRSS}))})`;
    const t0 = performance.now();
    const r = spawnSync(process.execPath, ['-e', script], { encoding: 'utf8' });
    const wall = (performance.now() - t0) / 1000;
    const j = JSON.parse(r.stdout.trim().split('\n').pop() as string);
    lines.push(
      `hush plan, 1,000 generated rows → ${out}: wall ${wall.toFixed(2)} s (process start included; planning and writing ${(j.ms / 1000).toFixed(2)} s), peak memory ${(j.maxRssKiB / 1024).toFixed(0)} MiB, exit code ${j.code}`,
    );
  }
  return lines;
}

/**
 * Benchmark: `hush plan` on generated project tables, end to end (start the
 * command, read the CSV, plan every row, write the plan), as a child process:
 * its CPU time and peak memory (bench/measure.ts). Goals (BENCHMARKS.md,
 * issue 13): 1,000 rows to CSV ≤ 2 s of CPU; 100,000 rows to xlsx ≤ 5× the
 * same to CSV in CPU time and ≤ 1 GB peak memory.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'fs';
import { join } from 'path';
import { tmpdir } from 'os';
import { parseCsv, writeCsv } from '../src/plan/csv';
import { fmt, interleaved, ratios, runNode, summary, type ChildRun, type Row } from './measure';

/** Rows made from the demo rows, each with its tolerance scaled 1–3× (1,000 distinct scalings; below 1× the demo's interferometer row cannot meet its tolerance at its finest cell) and its own study name. */
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
    r[col] = String(base * (1 + (2 * ((k * 7919) % 1000)) / 1000));
    r[studyCol] = `${r[studyCol]} #${k + 1}`;
    out.push(r);
  }
  return writeCsv(out);
}

const HUSH = join(process.cwd(), 'bin', 'hush.js');
/** 1 GB, as the goal states it (10⁹ bytes). */
const GB_KIB = 1e9 / 1024;

function plan(table: string, out: string, mayFail = false): ChildRun {
  const r = runNode([HUSH, 'plan', table, '--out', out, '--replace']);
  if (r.status !== 0 && !mayFail) throw new Error(`hush plan ${table} → ${out} exited ${r.status}: ${r.stderr.slice(0, 400)}`);
  return r;
}

/** Why a run failed, in a few words: V8's heap limit, or the exit status. */
function failure(r: ChildRun): string {
  return /heap out of memory|allocation failure/i.test(r.stderr) ? `out of memory at the V8 heap limit (exit ${r.status})` : `exit ${r.status}`;
}

export function planBench(runs: number, largePairs: number, largeRows: number): { lines: string[]; rows: Row[] } {
  if (!existsSync(join(process.cwd(), 'dist', 'node', 'cli', 'index.js'))) {
    return { lines: ["hush plan: skipped, run 'npm run build:cli' first"], rows: [] };
  }
  const dir = mkdtempSync(join(tmpdir(), 'hush-bench-'));
  const lines: string[] = [];
  const rows: Row[] = [];
  try {
    const small = join(dir, 'table-1000.csv');
    writeFileSync(small, generatedTable(1000));
    const csv = Array.from({ length: runs }, () => plan(small, join(dir, 'plan-1000.csv')));
    const xlsx = plan(small, join(dir, 'plan-1000.xlsx'));
    const c = summary(csv.map((r) => r.cpu));
    lines.push(
      `hush plan, 1,000 generated rows → CSV: ${fmt.s(c.median)} CPU (${fmt.range(c, fmt.s, 'runs')}), peak ${fmt.mib(Math.max(...csv.map((r) => r.maxRssKiB)))}; → xlsx: ${fmt.s(xlsx.cpu)} CPU, peak ${fmt.mib(xlsx.maxRssKiB)} (1 run)`,
    );
    rows.push({ goal: 'hush plan, 1,000 rows → CSV ≤ 2 s CPU', figure: `${fmt.s(c.median)} CPU`, spread: fmt.range(c, fmt.s, 'runs'), ratio: '—', pass: c.median <= 2 });

    if (largePairs > 0) {
      const large = join(dir, `table-${largeRows}.csv`);
      writeFileSync(large, generatedTable(largeRows));
      const runsOf: { csv: ChildRun[]; xlsx: ChildRun[] } = { csv: [], xlsx: [] };
      const m = interleaved(
        largePairs,
        () => {
          const r = plan(large, join(dir, 'plan-large.xlsx'), true);
          runsOf.xlsx.push(r);
          return r.cpu;
        },
        () => {
          const r = plan(large, join(dir, 'plan-large.csv'));
          runsOf.csv.push(r);
          return r.cpu;
        },
      );
      const failed = runsOf.xlsx.filter((x) => x.status !== 0);
      const r = summary(ratios(m));
      const xc = summary(m.a);
      const cc = summary(m.b);
      const xPeak = Math.max(...runsOf.xlsx.map((x) => x.maxRssKiB));
      const cPeak = Math.max(...runsOf.csv.map((x) => x.maxRssKiB));
      const n = largeRows.toLocaleString('en-US');
      // A run that failed did not finish: its CPU time and memory are lower bounds.
      const atLeast = failed.length ? '> ' : '';
      const why = failed.length ? ` (${failed.length} of ${runsOf.xlsx.length} xlsx runs failed: ${failure(failed[0])})` : '';
      lines.push(
        `hush plan, ${n} generated rows: → xlsx ${atLeast}${fmt.s(xc.median)} CPU, peak ${atLeast}${fmt.mib(xPeak)}${why}; → CSV ${fmt.s(cc.median)} CPU, peak ${fmt.mib(cPeak)}; ratio xlsx / CSV ${atLeast}${fmt.ratio(r.median)}, spread ${fmt.range(r, fmt.ratio)}`,
      );
      rows.push({
        goal: `hush plan, ${n} rows → xlsx ≤ 5× CSV (CPU)`,
        figure: `xlsx ${atLeast}${fmt.s(xc.median)}${failed.length ? ' (failed)' : ''}, CSV ${fmt.s(cc.median)}`,
        spread: fmt.range(r, fmt.ratio),
        ratio: `${atLeast}${fmt.ratio(r.median)}`,
        pass: failed.length === 0 && r.median <= 5,
      });
      rows.push({
        goal: `hush plan, ${n} rows → xlsx ≤ 1 GB peak memory`,
        figure: `${atLeast}${(xPeak * 1.024e-3).toFixed(0)} MB (CSV ${(cPeak * 1.024e-3).toFixed(0)} MB)`,
        spread: fmt.range(summary(runsOf.xlsx.map((x) => x.maxRssKiB * 1.024e-3)), (x) => `${x.toFixed(0)} MB`, 'runs'),
        ratio: `${atLeast}${(xPeak / GB_KIB).toFixed(2)} GB`,
        pass: failed.length === 0 && xPeak <= GB_KIB,
      });
    } else {
      lines.push(`hush plan, ${largeRows.toLocaleString('en-US')} rows: skipped (--large-pairs 0)`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return { lines, rows };
}

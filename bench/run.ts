/**
 * `npm run bench`: every figure of BENCHMARKS.md measured in one run, then one
 * row per goal: goal, figure, spread, ratio, pass/fail. CPU time throughout,
 * ratios from interleaved pairs (bench/measure.ts). Not a test: nothing here
 * fails the build.
 *
 *   npm run bench [-- SECTION...] [--pairs N] [--large-pairs N] [--large-rows N]
 *
 * Sections: startup, kernel, tmz, design, plan, web (default: all). --pairs:
 * interleaved pairs per ratio, and runs per absolute figure (default 7, at
 * least 5 for a ratio the goals rely on). --large-pairs: pairs of the
 * 100,000-row plan to CSV and to xlsx (default 1, each pair takes minutes; 0
 * skips it). --large-rows: that table's rows (default 100,000).
 */
import { cpus, loadavg } from 'os';
import { kernelBench } from './kernel-bench';
import { designBench } from './design-bench';
import { tmzBench } from './tmz-bench';
import { planBench } from './plan-bench';
import { startupBench } from './startup-bench';
import { webBench } from './web-bench';
import { childMethod, type Row } from './measure';

function option(name: string, fallback: number, args: string[]): number {
  const i = args.indexOf(name);
  if (i < 0) return fallback;
  const v = Number(args[i + 1]);
  if (!Number.isInteger(v) || v < 0) throw new Error(`${name} needs a whole number (got ${JSON.stringify(args[i + 1])})`);
  args.splice(i, 2);
  return v;
}

function table(rows: Row[]): string[] {
  const cells = rows.map((r) => [r.goal, r.figure, r.spread, r.ratio, r.pass === null ? '—' : r.pass ? 'pass' : 'FAIL']);
  const head = ['goal', 'figure', 'spread', 'ratio', 'result'];
  const width = head.map((h, k) => Math.max(h.length, ...cells.map((c) => c[k].length)));
  const line = (c: string[]) => c.map((x, k) => x.padEnd(width[k])).join('  ').trimEnd();
  return [line(head), line(width.map((w) => '-'.repeat(w))), ...cells.map(line)];
}

async function main() {
  const args = process.argv.slice(2);
  const pairs = option('--pairs', 7, args);
  const largePairs = option('--large-pairs', 1, args);
  const largeRows = option('--large-rows', 100_000, args);
  const sections: [string, () => { lines: string[]; rows: Row[] }][] = [
    ['startup', () => startupBench(pairs)],
    ['kernel', () => kernelBench(pairs)],
    ['tmz', () => tmzBench(pairs)],
    ['design', () => designBench(Math.max(3, Math.min(pairs, 5)))],
    ['plan', () => planBench(Math.max(5, pairs), largePairs, largeRows)],
    ['web', () => webBench()],
  ];
  const unknown = args.filter((a) => !sections.some(([n]) => n === a));
  if (unknown.length) throw new Error(`unknown section ${unknown.join(', ')}; sections: ${sections.map(([n]) => n).join(', ')}`);
  console.log(
    `Hush benchmarks — ${new Date().toISOString().slice(0, 10)}, node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, load average ${loadavg()[0].toFixed(2)} at the start`,
  );
  console.log(`CPU time throughout: this process by process.cpuUsage(), children by ${childMethod()}; ratios are medians of ${pairs} interleaved pairs`);
  const rows: Row[] = [];
  for (const [name, f] of sections) {
    if (args.length && !args.includes(name)) continue;
    const r = f();
    for (const line of r.lines) console.log(line);
    rows.push(...r.rows);
  }
  console.log(`\nload average ${loadavg()[0].toFixed(2)} at the end\n`);
  for (const line of table(rows)) console.log(line);
}
main().catch((e) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exitCode = 1;
});

/**
 * Benchmark: start-up of the `hush` commands, each run once with small
 * arguments, against a bare `node -e ''`, in CPU time of the child process
 * (bench/measure.ts), interleaved. Goal (BENCHMARKS.md, issue 13): each ≤ 3×
 * the bare start.
 */
import { existsSync } from 'fs';
import { join } from 'path';
import { fmt, interleaved, ratios, runNode, summary, type Row } from './measure';

const HUSH = join(process.cwd(), 'bin', 'hush.js');

/** What each start-up row runs: a command with arguments that make it do a little work (cost parses quantities with units). */
export const STARTUP_COMMANDS: [string, string[]][] = [
  ['--help', ['--help']],
  ['reflect', ['reflect', '--layers', '10', '--order', '3', '--ppw', '20']],
  ['budget', ['budget', '--intensity-error', '0.01']],
  ['design', ['design', '--target', '1e-3', '--ppw-min', '20']],
  ['ripple', ['ripple', '--amplitude', '1e-3', '--distance', '2e-3']],
  ['cost', ['cost', '--cells', '200,200,200', '--layers', '10', '--cell', '20nm', '--courant', '0.5', '--duration', '3ps']],
];

export function startupBench(pairs: number): { lines: string[]; rows: Row[] } {
  if (!existsSync(join(process.cwd(), 'dist', 'node', 'cli', 'index.js'))) return { lines: ["start-up: skipped, run 'npm run build:cli' first"], rows: [] };
  const lines: string[] = [];
  const rows: Row[] = [];
  const bare = () => runNode(['-e', '']).cpu;
  for (const [name, args] of STARTUP_COMMANDS) {
    const run = () => {
      const r = runNode([HUSH, ...args]);
      if (r.status !== 0) throw new Error(`hush ${args.join(' ')} exited ${r.status}: ${r.stderr.slice(0, 300)}`);
      return r.cpu;
    };
    const m = interleaved(pairs, run, bare);
    const r = summary(ratios(m));
    const h = summary(m.a);
    const b = summary(m.b);
    lines.push(`start-up, hush ${args.join(' ')}: ${fmt.s(h.median)} CPU, bare node ${fmt.s(b.median)}; ratio ${fmt.ratio(r.median)}, spread ${fmt.range(r, fmt.ratio)}`);
    rows.push({ goal: `start-up: hush ${name} ≤ 3× node -e ''`, figure: `${fmt.s(h.median)} vs ${fmt.s(b.median)} CPU`, spread: fmt.range(r, fmt.ratio), ratio: fmt.ratio(r.median), pass: r.median <= 3 });
  }
  return { lines, rows };
}

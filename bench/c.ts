import { execFileSync, spawnSync } from 'child_process';
import { readFileSync } from 'fs';
import { join } from 'path';
import { tmpdir } from 'os';

/** The bench/ folder of the checkout (benchmarks run from the project root, compiled or not). */
export const BENCH_DIR = join(process.cwd(), 'bench');

/** The two builds of each C baseline: the reference (cc -O2) and the vectorised one (-O3 -march=native). */
export const O2 = ['-O2'];
export const O3_NATIVE = ['-O3', '-march=native'];

function haveCompiler(): boolean {
  return spawnSync('sh', ['-c', 'command -v cc'], { encoding: 'utf8' }).status === 0;
}

/** Compiles bench/SOURCE with cc and `flags`; returns the executable's path, or null when there is no C compiler. */
export function compileC(source: string, name: string, flags: string[] = O2): string | null {
  if (!haveCompiler()) return null;
  const exe = join(tmpdir(), `${name}${flags.join('').replace(/[^\w]+/g, '_')}`);
  execFileSync('cc', [...flags, '-o', exe, join(BENCH_DIR, source), '-lm']);
  return exe;
}

/**
 * What gcc vectorised in bench/SOURCE at -O3 -march=native (-fopt-info-vec-optimized):
 * one line per loop, with its source line; and the loops it did not (the
 * `for` lines with no report), or null when cc is not gcc.
 */
export function vectorReport(source: string): { vectorised: string[]; scalar: string[] } | null {
  if (!haveCompiler()) return null;
  const r = spawnSync('cc', [...O3_NATIVE, '-fopt-info-vec-optimized', '-o', join(tmpdir(), 'hush-bench-vec'), join(BENCH_DIR, source), '-lm'], { encoding: 'utf8' });
  if (r.status !== 0 || !/optimized:|^$/m.test(r.stderr)) return null;
  const text = readFileSync(join(BENCH_DIR, source), 'utf8').split('\n');
  const widths = new Map<number, Set<string>>();
  for (const m of r.stderr.matchAll(/:(\d+):\d+: optimized: loop vectorized using (\d+) byte vectors/g)) {
    const line = Number(m[1]);
    if (!widths.has(line)) widths.set(line, new Set());
    widths.get(line)!.add(`${m[2]}-byte`);
  }
  const show = (line: number) => `line ${line}: ${text[line - 1].trim().slice(0, 90)}`;
  const vectorised = [...widths.keys()].sort((a, b) => a - b).map((l) => `${show(l)}  [${[...widths.get(l)!].join(', ')}]`);
  const scalar: string[] = [];
  text.forEach((t, i) => {
    if (/\bfor\s*\(/.test(t) && !widths.has(i + 1)) scalar.push(show(i + 1));
  });
  return { vectorised, scalar };
}

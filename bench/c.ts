import { execFileSync, spawnSync } from 'child_process';
import { join } from 'path';
import { tmpdir } from 'os';

/** The bench/ folder of the checkout (benchmarks run from the project root, compiled or not). */
export const BENCH_DIR = join(process.cwd(), 'bench');

/** Compiles bench/NAME.c with cc -O2; returns the executable path, or null when no compiler is available. */
export function compileC(source: string, name: string): string | null {
  const which = spawnSync('sh', ['-c', 'command -v cc'], { encoding: 'utf8' });
  if (which.status !== 0) return null;
  const exe = join(tmpdir(), name);
  execFileSync('cc', ['-O2', '-o', exe, join(BENCH_DIR, source), '-lm']);
  return exe;
}

/** Runs a C benchmark that prints numbers on one line. */
export function runC(exe: string, args: string[]): number[] {
  const out = execFileSync(exe, args, { encoding: 'utf8' });
  return out.trim().split(/\s+/).map(Number);
}

/**
 * How `npm run bench` measures: CPU time, not wall time (a shared machine's
 * other work inflates wall time but not the CPU time a process is given), in
 * interleaved pairs (A, B, then B, A, …) so that a change of machine load
 * between measurements falls on both sides; a ratio is the median of the
 * pairs' ratios, printed with their spread (min–max).
 *
 * - In this process: process.cpuUsage() (user + system time of the process,
 *   all its threads), read around the measured work.
 * - A child process: bench/rusage.c runs it and reports what the kernel
 *   accounted to it when it ended (wait4: user + system time of the process
 *   and all its threads, and its peak resident set size). Without a C
 *   compiler, the child reports process.cpuUsage() and process.resourceUsage()
 *   itself from an exit hook (node -r), which misses only its teardown.
 */
import { execFileSync, spawnSync } from 'child_process';
import { mkdtempSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import { join } from 'path';
import { compileC } from './c';

/** CPU seconds (user + system) this process has used so far. */
export function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** CPU seconds `work` takes in this process. */
export function cpuOf(work: () => void): number {
  const t0 = cpuSeconds();
  work();
  return cpuSeconds() - t0;
}

export interface ChildRun {
  /** User + system CPU seconds of the child. */
  cpu: number;
  /** Peak resident set size, KiB. */
  maxRssKiB: number;
  status: number;
  stdout: string;
  stderr: string;
}

let runner: { kind: 'rusage'; exe: string } | { kind: 'hook'; file: string } | undefined;

/** The way child processes are measured here: "wait4 (bench/rusage.c)" or "exit hook". */
export function childMethod(): string {
  return childRunner().kind === 'rusage' ? 'wait4 rusage of the child (bench/rusage.c)' : "the child's own process.cpuUsage() at exit (no C compiler)";
}

function childRunner(): NonNullable<typeof runner> {
  if (runner) return runner;
  const exe = compileC('rusage.c', 'hush-bench-rusage', ['-O2']);
  if (exe) runner = { kind: 'rusage', exe };
  else {
    const file = join(mkdtempSync(join(tmpdir(), 'hush-bench-')), 'cpu-hook.js');
    writeFileSync(
      file,
      "process.on('exit',(c)=>{const u=process.cpuUsage();require('fs').writeSync(2,`\\nrusage: ${u.user/1e6} ${u.system/1e6} ${process.resourceUsage().maxRSS} ${c}\\n`)});",
    );
    runner = { kind: 'hook', file };
  }
  return runner;
}

/** Runs `node ARGS` as a child and returns its CPU time, peak memory and output. */
export function runNode(args: string[], options: { cwd?: string } = {}): ChildRun {
  const r = childRunner();
  const argv = r.kind === 'rusage' ? [r.exe, process.execPath, ...args] : [process.execPath, '-r', r.file, ...args];
  const p = spawnSync(argv[0], argv.slice(1), { cwd: options.cwd, encoding: 'utf8', maxBuffer: 1 << 28 });
  const m = /rusage: ([\d.]+) ([\d.]+) (\d+) (\d+)\s*$/.exec(p.stderr ?? '');
  if (!m) throw new Error(`could not measure node ${args.join(' ')}: ${p.error?.message ?? p.stderr}`);
  return { cpu: Number(m[1]) + Number(m[2]), maxRssKiB: Number(m[3]), status: Number(m[4]), stdout: p.stdout, stderr: p.stderr.slice(0, m.index) };
}

/** Runs a compiled benchmark that prints numbers on one line. */
export function runC(exe: string, args: string[]): number[] {
  const out = execFileSync(exe, args, { encoding: 'utf8' });
  return out.trim().split(/\s+/).map(Number);
}

export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** Median and range of a list of measurements. */
export interface Summary {
  median: number;
  min: number;
  max: number;
  count: number;
}

export function summary(xs: number[]): Summary {
  return { median: median(xs), min: Math.min(...xs), max: Math.max(...xs), count: xs.length };
}

/**
 * `pairs` interleaved measurements of two things: a(), b() in the first pair,
 * b(), a() in the second, and so on. Returns both lists of measurements.
 */
export function interleaved(pairs: number, a: () => number, b: () => number): { a: number[]; b: number[] } {
  const as: number[] = [];
  const bs: number[] = [];
  for (let i = 0; i < pairs; i++) {
    if (i % 2 === 0) {
      as.push(a());
      bs.push(b());
    } else {
      bs.push(b());
      as.push(a());
    }
  }
  return { a: as, b: bs };
}

/** The ratios a[i] / b[i] of interleaved pairs. */
export function ratios(m: { a: number[]; b: number[] }): number[] {
  return m.a.map((x, i) => x / m.b[i]);
}

/** One goal as `npm run bench` and BENCHMARKS.md show it. */
export interface Row {
  goal: string;
  figure: string;
  spread: string;
  ratio: string;
  /** true: met, false: missed, null: recorded only (no goal). */
  pass: boolean | null;
}

export const fmt = {
  s: (x: number) => `${x < 0.1 ? x.toFixed(3) : x < 10 ? x.toFixed(2) : x.toFixed(1)} s`,
  ratio: (x: number) => `${x.toFixed(2)}×`,
  rate: (x: number) => x.toExponential(3),
  mib: (kib: number) => `${(kib / 1024).toFixed(0)} MiB`,
  range: (s: Summary, unit: (x: number) => string, noun = 'pairs') => `${unit(s.min)}–${unit(s.max)} (${s.count} ${s.count === 1 ? noun.replace(/s$/, '') : noun})`,
};

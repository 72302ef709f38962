/**
 * Benchmark: the exact reflection evaluation (N = 12, one frequency and angle)
 * in the product's TypeScript versus the same recurrence in plain C (bench/kernel.c).
 * Goal (BENCHMARKS.md): TypeScript ≥ 0.5× the C speed.
 */
import { resolveDesign, DEFAULT_COURANT } from '../src/physics';
import { allocateCoefficients, allocateFactors, fillCoefficients, fillFactors, reflectionKernel } from '../src/physics/internal';
import { compileC, runC } from './c';

export function tsKernelRate(layers: number, seconds: number): { rate: number; check: number } {
  const sm = DEFAULT_COURANT;
  const coef = allocateCoefficients(256);
  const fac = allocateFactors(256);
  const out = new Float64Array(2);
  const d = resolveDesign({ layers, order: 3 });
  const wdt = (2 * Math.PI * sm) / 20;
  let count = 0;
  let sum = 0;
  const t0 = performance.now();
  let elapsed = 0;
  while (elapsed < seconds) {
    for (let k = 0; k < 1000; k++) {
      d.strength = 1 + 1e-9 * (count & 1023);
      fillCoefficients(d, sm, coef);
      fillFactors(coef, wdt, fac);
      reflectionKernel(fac, layers, sm, wdt, 0, out);
      sum += out[0] * out[0] + out[1] * out[1];
      count++;
    }
    elapsed = (performance.now() - t0) / 1000;
  }
  return { rate: count / elapsed, check: Math.sqrt(sum / count) };
}

export function kernelBench(seconds = 1): string[] {
  const lines: string[] = [];
  tsKernelRate(12, 1); // warm-up: let the JIT settle before timing
  // Best of three, as for the C baseline: throughput on a shared machine is noisy.
  const runs = [0, 1, 2].map(() => tsKernelRate(12, seconds));
  const ts = runs.reduce((a, b) => (b.rate > a.rate ? b : a));
  lines.push(`reflection kernel, N = 12: TypeScript ${ts.rate.toExponential(3)} evaluations/s (check |r| = ${ts.check.toExponential(6)})`);
  const exe = compileC('kernel.c', 'hush-bench-kernel');
  if (!exe) {
    lines.push('  C baseline skipped: no C compiler (cc) on this machine');
    return lines;
  }
  let rate = 0;
  let check = 0;
  for (let rep = 0; rep < 3; rep++) {
    const [r, c] = runC(exe, ['12', String(seconds)]);
    rate = Math.max(rate, r);
    check = c;
  }
  lines.push(`  C (cc -O2)            ${rate.toExponential(3)} evaluations/s (check |r| = ${check.toExponential(6)})`);
  lines.push(`  ratio TypeScript / C = ${(ts.rate / rate).toFixed(2)}  (goal ≥ 0.5)`);
  return lines;
}

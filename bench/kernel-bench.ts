/**
 * Benchmark: the exact reflection evaluation (N = 12, one frequency and angle:
 * coefficients, inverse node factors, the sample's constants, recurrence) in
 * the product's TypeScript versus plain C, evaluations per CPU second. Every
 * evaluation does all of it on both sides: nothing is carried from one
 * evaluation to the next. Goal (BENCHMARKS.md, issue 13): TypeScript ≥ 1× the
 * same evaluation in C compiled with cc -O2, the C as the issue measured it
 * (bench/kernel-reference.c). Beside it, without a goal: bench/kernel.c, the
 * same evaluation with every optimisation of the TypeScript kernel ported to
 * C too, at -O2 and -O3 -march=native.
 */
import { resolveDesign, DEFAULT_COURANT } from '../src/physics';
import { allocateCoefficients, allocateFactors, fillCoefficients, fillFactors, fillSample, sampledKernel, SAMPLE_STRIDE } from '../src/physics/internal';
import { compileC, O2, O3_NATIVE, vectorReport } from './c';
import { cpuSeconds, fmt, interleaved, ratios, runC, summary, type Row } from './measure';

const LAYERS = 12;

/** Evaluations per CPU second of the TypeScript kernel over `seconds` of CPU time, and a checksum. */
export function tsKernelRate(layers: number, seconds: number): { rate: number; check: number } {
  const sm = DEFAULT_COURANT;
  const coef = allocateCoefficients(256);
  const fac = allocateFactors(256);
  const out = new Float64Array(2);
  const sample = new Float64Array(SAMPLE_STRIDE);
  const d = resolveDesign({ layers, order: 3 });
  const wdt = (2 * Math.PI * sm) / 20;
  let count = 0;
  let sum = 0;
  const t0 = cpuSeconds();
  let elapsed = 0;
  while (elapsed < seconds) {
    for (let k = 0; k < 1000; k++) {
      d.strength = 1 + 1e-9 * (count & 1023);
      fillCoefficients(d, sm, coef);
      fillFactors(coef, wdt, fac);
      fillSample(sm, wdt, 0, sample, 0);
      sampledKernel(fac, layers, sample, 0, out, 0);
      sum += out[0] * out[0] + out[1] * out[1];
      count++;
    }
    elapsed = cpuSeconds() - t0;
  }
  return { rate: count / elapsed, check: Math.sqrt(sum / count) };
}

export function kernelBench(pairs: number, seconds = 0.3): { lines: string[]; rows: Row[] } {
  const lines: string[] = [];
  tsKernelRate(LAYERS, 1); // warm-up: let the JIT settle before timing
  const ref = compileC('kernel-reference.c', 'hush-bench-kernel-reference', O2);
  const o2 = compileC('kernel.c', 'hush-bench-kernel', O2);
  const o3 = compileC('kernel.c', 'hush-bench-kernel', O3_NATIVE);
  if (!ref || !o2 || !o3) {
    const ts = tsKernelRate(LAYERS, seconds);
    lines.push(`reflection kernel, N = ${LAYERS}: TypeScript ${fmt.rate(ts.rate)} evaluations per CPU second; C baseline skipped: no C compiler (cc)`);
    return { lines, rows: [{ goal: 'reflection kernel ≥ 1× C (cc -O2)', figure: `TypeScript ${fmt.rate(ts.rate)}/s`, spread: '—', ratio: 'no C compiler', pass: null }] };
  }
  const rows: Row[] = [];
  let tsCheck = 0;
  const ts = () => {
    const r = tsKernelRate(LAYERS, seconds);
    tsCheck = r.check;
    return r.rate;
  };
  // [C program, its label in the lines, its row (the first is the goal), whether it is the goal]
  for (const [exe, label, row, goal] of [
    [ref, 'reference (bench/kernel-reference.c) cc -O2', 'reflection kernel ≥ 1× C (cc -O2)', true],
    [o2, 'same arithmetic (bench/kernel.c) cc -O2', 'reflection kernel vs C, same arithmetic cc -O2 (no goal)', false],
    [o3, 'same arithmetic (bench/kernel.c) cc -O3 -march=native', 'reflection kernel vs C, same arithmetic cc -O3 -march=native (no goal)', false],
  ] as const) {
    let cCheck = 0;
    const c = () => {
      const [rate, check] = runC(exe, [String(LAYERS), String(seconds)]);
      cCheck = check;
      return rate;
    };
    const m = interleaved(pairs, ts, c);
    const r = summary(ratios(m));
    const tsRate = summary(m.a).median;
    const cRate = summary(m.b).median;
    lines.push(
      `reflection kernel, N = ${LAYERS}, evaluations per CPU second: TypeScript ${fmt.rate(tsRate)} (check |r| = ${tsCheck.toExponential(6)}), C ${label} ${fmt.rate(cRate)} (check ${cCheck.toExponential(6)}); ratio ${fmt.ratio(r.median)}, spread ${fmt.range(r, fmt.ratio)}`,
    );
    rows.push({
      goal: row,
      figure: `TS ${fmt.rate(tsRate)}/s, C ${fmt.rate(cRate)}/s`,
      spread: fmt.range(r, fmt.ratio),
      ratio: fmt.ratio(r.median),
      pass: goal ? r.median >= 1 : null,
    });
  }
  const vec = vectorReport('kernel.c');
  if (vec) {
    lines.push('  bench/kernel.c at -O3 -march=native, loops gcc vectorised (-fopt-info-vec-optimized):', ...vec.vectorised.map((l) => `    ${l}`));
    lines.push('  and loops it left scalar:', ...vec.scalar.map((l) => `    ${l}`));
  }
  return { lines, rows };
}

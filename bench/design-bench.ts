/**
 * Benchmark: design of one row (the absorber search with its dense check), median
 * and 95th percentile over a sweep of generated rows, with and without the cache,
 * in CPU time. Goals (BENCHMARKS.md): median ≤ 5 ms; 1,000 rows ≤ 5 s.
 */
import { clearDesignCache, designOptions, designWork, requiredAmplitude, type DesignSpec } from '../src/physics';
import { DESIGN_WORK_BOUND } from '../tests/support/work-bound';
import { cpuOf, cpuSeconds, fmt, summary, type Row } from './measure';

function rng(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 1,000 generated studies: tolerances 0.1–5 %, 10–30 cells/λ, bands up to 3:1, angles up to 70°. */
export function generatedSpecs(count: number, seed = 7): DesignSpec[] {
  const r = rng(seed);
  const out: DesignSpec[] = [];
  for (let k = 0; k < count; k++) {
    const eps = 0.001 + 0.049 * r();
    const ppwMin = 10 + 20 * r();
    out.push({
      target: requiredAmplitude({ intensityError: eps, faces: 1 + Math.floor(2 * r()) }),
      ppwMin,
      ppwMax: r() < 0.7 ? ppwMin * (1 + 2 * r()) : ppwMin,
      angleMaxDeg: r() < 0.7 ? Math.round(70 * r()) : 0,
      index: [1, 1.44, 3.48][Math.floor(3 * r())],
      alphaMaxNorm: r() < 0.2 ? 0.1 : undefined,
    });
  }
  return out;
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
}

/** One sweep of the generated rows: CPU ms per row (sorted) and the whole sweep's CPU seconds. */
function sweepOnce(specs: DesignSpec[], cold: boolean): { perRowMs: number[]; seconds: number; work: number } {
  if (cold) clearDesignCache();
  const perRowMs: number[] = [];
  const w0 = designWork();
  const t0 = cpuSeconds();
  for (const s of specs) {
    const a = cpuSeconds();
    designOptions(s);
    perRowMs.push((cpuSeconds() - a) * 1000);
  }
  const seconds = cpuSeconds() - t0;
  perRowMs.sort((a, b) => a - b);
  return { perRowMs, seconds, work: designWork() - w0 };
}

export function designBench(sweeps: number): { lines: string[]; rows: Row[] } {
  const specs = generatedSpecs(1000);
  const lines: string[] = [];
  sweepOnce(specs.slice(0, 100), true); // warm-up: let the JIT settle before timing
  const cold = Array.from({ length: sweeps }, () => sweepOnce(specs, true));
  const warm = sweepOnce(specs, false);
  const medians = summary(cold.map((c) => percentile(c.perRowMs, 0.5)));
  const totals = summary(cold.map((c) => c.seconds));
  const p95 = summary(cold.map((c) => percentile(c.perRowMs, 0.95)));
  lines.push(
    `design of one row, ${specs.length} generated rows, no cache, CPU time: median ${medians.median.toFixed(3)} ms (sweeps ${fmt.range(medians, (x) => x.toFixed(3), 'sweeps')}), p95 ${p95.median.toFixed(3)} ms; whole sweep ${fmt.s(totals.median)} (${fmt.range(totals, fmt.s, 'sweeps')})`,
    `design of one row, cached: median ${percentile(warm.perRowMs, 0.5).toFixed(3)} ms, whole sweep ${fmt.s(warm.seconds)}`,
  );
  // The hardening tests bound each search by its work, not its time
  // (tests/support/work-bound.ts); this converts that bound to time here.
  const rate = cold[0].work / (cold[0].seconds * 1000);
  clearDesignCache();
  const heavy: DesignSpec = { target: 1e-8, ppwMin: 52.5, ppwMax: 200, angleMaxDeg: 0, index: 3.48 };
  const w1 = designWork();
  const heavyMs = cpuOf(() => designOptions(heavy)) * 1000;
  const heavyWork = designWork() - w1;
  lines.push(
    `design search work (the tests bound each search by work, not time): the cold sweep ran ${rate.toFixed(0)} layer-evaluations per CPU ms; ` +
      `a heavy search (|r| ≤ 1e-8, 52.5–200 cells/λ, index 3.48) did ${heavyWork.toExponential(2)} in ${heavyMs.toFixed(1)} ms (${(heavyWork / heavyMs).toFixed(0)} per ms), ` +
      `so the bound of ${DESIGN_WORK_BOUND.toExponential(1)} per search is ≈ ${(DESIGN_WORK_BOUND / (heavyWork / heavyMs)).toFixed(0)} ms here`,
  );
  const rows: Row[] = [
    { goal: 'design of one row: median ≤ 5 ms', figure: `${medians.median.toFixed(3)} ms CPU`, spread: fmt.range(medians, (x) => `${x.toFixed(3)} ms`, 'sweeps'), ratio: '—', pass: medians.median <= 5 },
    { goal: 'design of 1,000 generated rows ≤ 5 s', figure: `${fmt.s(totals.median)} CPU`, spread: fmt.range(totals, fmt.s, 'sweeps'), ratio: '—', pass: totals.median <= 5 },
  ];
  return { lines, rows };
}

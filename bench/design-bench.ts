/**
 * Benchmark: design of one row (the absorber search with its dense check), median
 * and 95th percentile over a sweep of generated rows, with and without the cache.
 * Goals (BENCHMARKS.md): median ≤ 5 ms; 1,000 rows ≤ 5 s.
 */
import { clearDesignCache, designOptions, requiredAmplitude, type DesignSpec } from '../src/physics';

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

export function designBench(): string[] {
  const specs = generatedSpecs(1000);
  const lines: string[] = [];
  for (const mode of ['cold (no cache)', 'warm (cached)'] as const) {
    if (mode.startsWith('cold')) clearDesignCache();
    const times: number[] = [];
    const t0 = performance.now();
    for (const s of specs) {
      const a = performance.now();
      designOptions(s);
      times.push(performance.now() - a);
    }
    const total = performance.now() - t0;
    times.sort((a, b) => a - b);
    lines.push(
      `design of one row, ${specs.length} generated rows, ${mode}: median ${percentile(times, 0.5).toFixed(3)} ms, p95 ${percentile(times, 0.95).toFixed(3)} ms, whole sweep ${(total / 1000).toFixed(2)} s (goals: median ≤ 5 ms, sweep ≤ 5 s)`,
    );
  }
  return lines;
}

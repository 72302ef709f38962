/**
 * Benchmark: the 2-D time-domain CPML engine (src/physics/fdtd/tmz.ts), cell
 * updates per CPU second, versus the same update in plain C (bench/tmz.c).
 * Goal (BENCHMARKS.md): the engine ≥ 0.5× the C compiled with -O3
 * -march=native, whose column loops gcc vectorises (issue 13); the cc -O2
 * build and the engine's TypeScript fallback are shown beside it.
 */
import { TmzGrid2D, cpmlCoefficients, resolveDesign } from '../src/physics';
import { wasmSwitch } from '../src/physics/fdtd/wasm/runtime';
import { compileC, O2, O3_NATIVE, vectorReport } from './c';
import { cpuOf, fmt, interleaved, ratios, runC, summary, type Row } from './measure';

const CELLS = 2000;
const NY = 64;
const LAYERS = 10;
const STEPS = 600;

/** A grid of the benchmark's size with one step implementation; `measure()` gives cell updates per CPU second of one run. */
function engine(webAssembly: boolean): { measure(): number; check(): number; usesWebAssembly: boolean } {
  wasmSwitch.enabled = webAssembly;
  const dt = (0.99 / Math.sqrt(2)) * 0.99;
  // Same grading as the C loop: m = 3, σ_opt (σ_norm = 3.2·u³), κ = 1, α = 0.
  const coef = cpmlCoefficients(resolveDesign({ layers: LAYERS, order: 3 }), dt);
  const grid = new TmzGrid2D({ cells: CELLS, transverseCells: NY, courantMedium: dt, left: coef, right: coef });
  wasmSwitch.enabled = true;
  const src = (grid.leftInterface + 10) * NY;
  const run = (steps: number) => {
    for (let n = 0; n < steps; n++) {
      grid.step();
      const t = n - 60;
      for (let j = 0; j < NY; j++) grid.ez[src + j] += Math.sin(0.2 * t) * Math.exp(-((t / 20) ** 2)) * Math.cos((2 * Math.PI * j) / NY);
    }
  };
  run(200); // warm-up: let the JIT settle before timing
  return {
    usesWebAssembly: grid.usesWebAssembly,
    measure() {
      grid.reset();
      return (grid.nodes * STEPS) / cpuOf(() => run(STEPS));
    },
    check() {
      let sum = 0;
      for (let k = 0; k < grid.ez.length; k++) sum += grid.ez[k] * grid.ez[k];
      return Math.sqrt(sum);
    },
  };
}

export function tmzBench(pairs: number): { lines: string[]; rows: Row[] } {
  const wasm = engine(true);
  const ts = engine(false);
  const size = `${CELLS + 2 * LAYERS + 1}×${NY} nodes, ${STEPS} steps`;
  const lines: string[] = [];
  const o3 = compileC('tmz.c', 'hush-bench-tmz', O3_NATIVE);
  const o2 = compileC('tmz.c', 'hush-bench-tmz', O2);
  if (!o3 || !o2) {
    lines.push(`2-D CPML engine, ${size}: WebAssembly step ${fmt.rate(wasm.measure())}, TypeScript step ${fmt.rate(ts.measure())} cell updates per CPU second; C baseline skipped: no C compiler (cc)`);
    return { lines, rows: [{ goal: '2-D engine ≥ 0.5× C (-O3 -march=native)', figure: '—', spread: '—', ratio: 'no C compiler', pass: null }] };
  }
  const rows: Row[] = [];
  const cases = [
    [wasm, `engine${wasm.usesWebAssembly ? '' : ' (WebAssembly unavailable: TypeScript step)'}, WebAssembly step`, o3, '-O3 -march=native', '2-D engine ≥ 0.5× C (-O3 -march=native)', true],
    [ts, 'engine, TypeScript step (the fallback)', o3, '-O3 -march=native', '2-D engine, TypeScript fallback step vs C -O3 (no goal)', false],
    [wasm, 'engine, WebAssembly step', o2, 'cc -O2', '2-D engine vs C cc -O2 (no goal)', false],
  ] as const;
  for (const [e, label, exe, cLabel, goal, isGoal] of cases) {
    let cCheck = 0;
    const c = () => {
      const [rate, check] = runC(exe, [String(CELLS), String(NY), String(LAYERS), String(STEPS)]);
      cCheck = check;
      return rate;
    };
    const m = interleaved(pairs, () => e.measure(), c);
    const r = summary(ratios(m));
    const eRate = summary(m.a).median;
    const cRate = summary(m.b).median;
    lines.push(
      `2-D CPML engine, ${size}, cell updates per CPU second: ${label} ${fmt.rate(eRate)} (check ${e.check().toExponential(6)}), C ${cLabel} ${fmt.rate(cRate)} (check ${cCheck.toExponential(6)}); ratio ${fmt.ratio(r.median)}, spread ${fmt.range(r, fmt.ratio)}`,
    );
    rows.push({ goal, figure: `engine ${fmt.rate(eRate)}/s, C ${fmt.rate(cRate)}/s`, spread: fmt.range(r, fmt.ratio), ratio: fmt.ratio(r.median), pass: isGoal ? r.median >= 0.5 : null });
  }
  const vec = vectorReport('tmz.c');
  if (vec) {
    lines.push('  bench/tmz.c at -O3 -march=native, loops gcc vectorised (-fopt-info-vec-optimized):', ...vec.vectorised.map((l) => `    ${l}`));
    lines.push('  and loops it left scalar:', ...vec.scalar.map((l) => `    ${l}`));
  }
  return { lines, rows };
}

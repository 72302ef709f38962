/**
 * Benchmark: the 2-D time-domain CPML engine (src/physics/fdtd/tmz.ts), cell
 * updates per second, versus the same update written in plain C (bench/tmz.c).
 * Goal (BENCHMARKS.md): TypeScript ≥ 0.5× the C speed.
 */
import { TmzGrid2D, cpmlCoefficients, resolveDesign } from '../src/physics';
import { compileC, runC } from './c';
import { wasmSwitch } from '../src/physics/fdtd/wasm/runtime';

const CELLS = 2000;
const NY = 64;
const LAYERS = 10;
const STEPS = 600;

function engineRate(webAssembly: boolean): { rate: number; check: number; used: boolean } {
  wasmSwitch.enabled = webAssembly;
  const dt = (0.99 / Math.sqrt(2)) * 0.99;
  // Same grading as the C loop: m = 3, σ_opt (σ_norm = 3.2·u³), κ = 1, α = 0.
  const coef = cpmlCoefficients(resolveDesign({ layers: LAYERS, order: 3 }), dt);
  const grid = new TmzGrid2D({ cells: CELLS, transverseCells: NY, courantMedium: dt, left: coef, right: coef });
  const src = (grid.leftInterface + 10) * NY;
  const run = (steps: number) => {
    for (let n = 0; n < steps; n++) {
      grid.step();
      const t = n - 60;
      for (let j = 0; j < NY; j++) grid.ez[src + j] += Math.sin(0.2 * t) * Math.exp(-((t / 20) ** 2)) * Math.cos((2 * Math.PI * j) / NY);
    }
  };
  run(200); // warm-up: let the JIT settle before timing
  // Best of three timed runs, as for the C baseline: throughput on a shared machine is noisy.
  let el = Infinity;
  for (let rep = 0; rep < 3; rep++) {
    grid.reset();
    const t0 = performance.now();
    run(STEPS);
    el = Math.min(el, (performance.now() - t0) / 1000);
  }
  let sum = 0;
  for (let k = 0; k < grid.ez.length; k++) sum += grid.ez[k] * grid.ez[k];
  wasmSwitch.enabled = true;
  return { rate: (grid.nodes * STEPS) / el, check: Math.sqrt(sum), used: grid.usesWebAssembly };
}

export function tmzBench(): string[] {
  const wasm = engineRate(true);
  const ts = engineRate(false);
  const lines = [
    `2-D CPML engine, ${CELLS + 2 * LAYERS + 1}×${NY} nodes, ${STEPS} steps:`,
    `  engine, WebAssembly step ${wasm.used ? '' : '(unavailable here: TypeScript step ran) '}${wasm.rate.toExponential(3)} cell updates/s (check ${wasm.check.toExponential(6)})`,
    `  engine, TypeScript step  ${ts.rate.toExponential(3)} cell updates/s (check ${ts.check.toExponential(6)})`,
  ];
  const exe = compileC('tmz.c', 'hush-bench-tmz');
  if (!exe) {
    lines.push('  C baseline skipped: no C compiler (cc) on this machine');
    return lines;
  }
  let rate = 0;
  let check = 0;
  for (let rep = 0; rep < 3; rep++) {
    const [r, c] = runC(exe, [String(CELLS), String(NY), String(LAYERS), String(STEPS)]);
    rate = Math.max(rate, r);
    check = c;
  }
  lines.push(`  C (cc -O2)               ${rate.toExponential(3)} cell updates/s (check ${check.toExponential(6)})`);
  lines.push(`  ratio engine / C = ${(wasm.rate / rate).toFixed(2)} with the WebAssembly step, ${(ts.rate / rate).toFixed(2)} with the TypeScript step  (goal ≥ 0.5)`);
  return lines;
}

import { describe, expect, it } from 'vitest';
import {
  HushInputError,
  MAX_ABSORBER_SEARCHES,
  SPEED_OF_LIGHT,
  designAbsorber,
  designWork,
  dispersionError,
  intensityErrorFromAmplitude,
  requiredAmplitude,
  resonanceRunDuration,
  resonanceRunError,
  ringdownTime,
  runCost,
  splitAccuracy,
  type DesignResult,
  type PhaseModel,
  type RunModel,
  type SplitProblem,
} from '../src/physics';

/** Deterministic pseudo-random numbers (a linear congruential generator; Numerical Recipes' constants). */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(1664525, s) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

interface Synthetic {
  dims: number;
  tolerance: number;
  phase: PhaseModel;
  /** Vacuum wavelength, densest index, structure size per axis (m). */
  wavelength: number;
  indexMax: number;
  size: number;
  cellMax: number;
  cellMin: number;
  /** Quality factor of the slowest resonance (sets the run length). */
  q: number | null;
  pathWavelengths: number | null;
  /** Quality factor of a resonance whose frequency the study measures (its shift is a dispersion error). */
  lineQ: number | null;
  run: 'none' | 'fixed' | 'searched';
}

/**
 * Physically shaped callbacks: the real dispersion and ring-down models, a synthetic absorber whose worst reflection
 * after N layers is e^{−1.6N} (continuous theory at σ_opt, physics.md §2) plus a discretisation floor (4/(N·p))⁴ that falls
 * with the cells per wavelength p (the power law of Oskooi, Zhang & Johnson 2008), and cost = cells × steps.
 */
function syntheticProblem(s: Synthetic): SplitProblem<{ layers: number }> & { absorberCalls: () => number } {
  const courant = 0.99 / Math.sqrt(s.dims);
  const freq = SPEED_OF_LIGHT / s.wavelength;
  const ppwOf = (cell: number) => s.wavelength / (s.indexMax * cell);
  const reflectionOf = (layers: number, cell: number) => Math.exp(-1.6 * layers) + (4 / (layers * ppwOf(cell))) ** 4;
  let calls = 0;
  let run: RunModel;
  if (s.run === 'none' || s.q === null) run = { kind: 'none' };
  else if (s.run === 'fixed') {
    const T = ringdownTime(s.q, freq, 1e-2);
    run = { kind: 'fixed', duration: () => T, error: (_c, d) => resonanceRunError({ q: s.q as number, frequencyHz: freq, phase: s.phase }, d) };
  } else {
    run = {
      kind: 'searched',
      durationFor: (_c, e) => resonanceRunDuration({ q: s.q as number, frequencyHz: freq, phase: s.phase }, e),
      error: (_c, d) => resonanceRunError({ q: s.q as number, frequencyHz: freq, phase: s.phase }, d),
      baselineDuration: () => ringdownTime(s.q as number, freq, 1e-3),
    };
  }
  return {
    tolerance: s.tolerance,
    phase: s.phase,
    cellMax: s.cellMax,
    cellMin: s.cellMin,
    dispersionError: (cell) =>
      dispersionError({
        ppw: ppwOf(cell),
        courant,
        dimensions: s.dims,
        index: s.indexMax,
        pathWavelengths: s.pathWavelengths ?? undefined,
        q: s.lineQ ?? undefined,
        phase: s.phase,
      }).error,
    run,
    absorber: (cell, error) => {
      calls++;
      const target = requiredAmplitude({ intensityError: Math.min(error, 1), phase: s.phase });
      for (let layers = 1; layers <= 200; layers++) {
        const r = reflectionOf(layers, cell);
        if (r <= target) return { design: { layers }, error: intensityErrorFromAmplitude(r, { phase: s.phase }) };
      }
      return null;
    },
    cost: (cell, design, duration) => {
      const n = Math.ceil(s.size / cell) + 2 * (design ? design.layers : 0);
      const steps = duration === null ? 1 : Math.ceil(duration / ((courant * cell) / SPEED_OF_LIGHT));
      return n ** s.dims * steps;
    },
    absorberCalls: () => calls,
  };
}

function randomSynthetic(next: () => number): Synthetic {
  const dims = 1 + Math.floor(next() * 3);
  const wavelength = 1.55e-6;
  const indexMax = 1 + 2.5 * next();
  const ppw = 8 + 40 * next();
  const cellMax = wavelength / (indexMax * ppw);
  const kind = next();
  return {
    dims,
    tolerance: 10 ** (-4 + 3 * next()),
    phase: next() < 0.5 ? 'worst' : 'random',
    wavelength,
    indexMax,
    size: cellMax * (20 + Math.floor(200 * next())) * (dims === 1 ? 10 : 1),
    cellMax,
    cellMin: cellMax * [1, 0.5, 0.25][Math.floor(next() * 3)],
    q: next() < 0.8 ? 10 ** (1 + 3 * next()) : null,
    // An interferometric path of 0.05–5 wavelengths, or a measured line of Q 1–30, or neither.
    pathWavelengths: kind < 0.4 ? 0.05 * 10 ** (2 * next()) : null,
    lineQ: kind >= 0.4 && kind < 0.8 ? 30 ** next() : null,
    run: (['none', 'fixed', 'searched'] as const)[Math.floor(next() * 3)],
  };
}

describe('the split (src/physics/accuracy-split.ts)', () => {
  it('is never more expensive than the absorber-takes-all plan, and its parts combine to at most the tolerance (400 synthetic studies)', () => {
    const next = rng(11);
    let planned = 0;
    let withBaseline = 0;
    let cheaper = 0;
    let infeasible = 0;
    let maxSearches = 0;
    let totalSearches = 0;
    let bestSaving = 0;
    for (let k = 0; k < 400; k++) {
      const s = randomSynthetic(next);
      const p = syntheticProblem(s);
      let r;
      try {
        r = splitAccuracy(p);
      } catch (e) {
        expect(e).toBeInstanceOf(HushInputError);
        expect((e as Error).message).toMatch(/no split of the intensity error/);
        infeasible++;
        continue;
      }
      planned++;
      const { best } = r;
      const e = best.errors;
      const combined = s.phase === 'worst' ? e.absorber + e.dispersion + e.run : Math.hypot(e.absorber, e.dispersion, e.run);
      expect(combined).toBeLessThanOrEqual(s.tolerance);
      expect(e.combined).toBeCloseTo(combined, 15);
      expect(best.cell).toBeLessThanOrEqual(s.cellMax);
      expect(best.cell).toBeGreaterThanOrEqual(s.cellMin * (1 - 1e-12));
      expect(best.cost).toBe(p.cost(best.cell, best.design, best.duration));
      expect(r.evaluations.absorber).toBe(p.absorberCalls());
      expect(r.evaluations.absorber).toBeLessThanOrEqual(MAX_ABSORBER_SEARCHES);
      maxSearches = Math.max(maxSearches, r.evaluations.absorber);
      totalSearches += r.evaluations.absorber;
      if (r.baseline) {
        withBaseline++;
        expect(best.cost).toBeLessThanOrEqual(r.baseline.cost);
        expect(r.saving).toBe(r.baseline.cost - best.cost);
        if (best.cost < r.baseline.cost) cheaper++;
        bestSaving = Math.max(bestSaving, 1 - best.cost / r.baseline.cost);
      }
    }
    console.log(
      `synthetic splits: ${planned} planned (${withBaseline} with an absorber-takes-all plan, ${cheaper} strictly cheaper, largest saving ${(100 * bestSaving).toFixed(1)} %), ${infeasible} infeasible; design searches per split: mean ${(totalSearches / planned).toFixed(2)}, most ${maxSearches}`,
    );
    expect(planned).toBeGreaterThan(150);
    expect(cheaper).toBeGreaterThan(20);
  });

  it('matches a brute-force search over the run share at its own cells, and comes within 10 % of a 100-cell brute force', () => {
    const next = rng(5);
    let worstOwn = 0;
    let worstDense = 0;
    for (let k = 0; k < 25; k++) {
      const s = { ...randomSynthetic(next), run: 'searched' as const, q: 100 + 1e4 * next(), cellMin: 0 };
      s.cellMin = s.cellMax / 4;
      const p = syntheticProblem(s);
      let r;
      try {
        r = splitAccuracy(p);
      } catch {
        continue;
      }
      const worst = s.phase === 'worst';
      const brute = (cell: number) => {
        const ed = p.dispersionError(cell);
        const left = worst ? s.tolerance - ed : Math.sqrt(Math.max(0, s.tolerance ** 2 - ed ** 2));
        let best = Infinity;
        if (!(left > 0)) return best;
        for (let j = 1; j < 200; j++) {
          const runShare = 10 ** (-6 + (6 * j) / 200);
          const er = worst ? runShare * left : left * Math.sin((runShare * Math.PI) / 2);
          const ea = worst ? left - er : Math.sqrt(left * left - er * er);
          const a = p.absorber(cell, ea * (1 - 1e-9));
          if (!a) continue;
          const T = resonanceRunDuration({ q: s.q, frequencyHz: SPEED_OF_LIGHT / s.wavelength, phase: s.phase }, er * (1 - 1e-9));
          best = Math.min(best, p.cost(cell, a.design, T));
        }
        return best;
      };
      const own = Math.min(...r.cells.filter((c) => c.status !== 'dispersion exceeds the tolerance').map((c) => brute(c.cell)));
      let dense = Infinity;
      for (let j = 0; j <= 100; j++) dense = Math.min(dense, brute(s.cellMax * 0.25 ** (j / 100)));
      worstOwn = Math.max(worstOwn, r.best.cost / own - 1);
      worstDense = Math.max(worstDense, r.best.cost / dense - 1);
    }
    console.log(`against brute force: worst excess over the same cells ${(100 * worstOwn).toFixed(3)} %, over 100 cells ${(100 * worstDense).toFixed(2)} %`);
    expect(worstOwn).toBeLessThanOrEqual(1e-12);
    expect(worstDense).toBeLessThanOrEqual(0.1);
  });

  it('keeps a fixed cell and a fixed duration fixed', () => {
    const base: Synthetic = {
      dims: 2,
      tolerance: 0.05,
      phase: 'worst',
      wavelength: 1.55e-6,
      indexMax: 3.48,
      size: 5e-6,
      cellMax: 25e-9,
      cellMin: 25e-9,
      q: 500,
      pathWavelengths: 0.1,
      lineQ: null,
      run: 'fixed',
    };
    const r = splitAccuracy(syntheticProblem(base));
    expect(r.best.cell).toBe(25e-9);
    expect(r.best.duration).toBe(ringdownTime(500, SPEED_OF_LIGHT / 1.55e-6, 1e-2));
    expect(r.cells.length).toBe(1);
    const r2 = splitAccuracy(syntheticProblem({ ...base, cellMin: 5e-9 }));
    expect(r2.best.duration).toBe(ringdownTime(500, SPEED_OF_LIGHT / 1.55e-6, 1e-2));
    expect(r2.best.cost).toBeLessThanOrEqual(r.best.cost);
  });

  it('with neither a path nor q the dispersion costs nothing and the user cell is kept (finer cells only cost more)', () => {
    const s: Synthetic = { dims: 3, tolerance: 0.01, phase: 'worst', wavelength: 1.55e-6, indexMax: 1.44, size: 3e-6, cellMax: 40e-9, cellMin: 10e-9, q: null, pathWavelengths: null, lineQ: null, run: 'none' };
    const r = splitAccuracy(syntheticProblem(s));
    expect(r.best.errors.dispersion).toBe(0);
    expect(r.best.cell).toBe(40e-9);
    expect(r.saving).toBe(0);
  });

  it('is deterministic', () => {
    const next = rng(99);
    for (let k = 0; k < 20; k++) {
      const s = randomSynthetic(next);
      let a;
      try {
        a = splitAccuracy(syntheticProblem(s));
      } catch {
        continue;
      }
      const b = splitAccuracy(syntheticProblem(s));
      expect(JSON.stringify(b)).toBe(JSON.stringify(a));
    }
  });

  it('says why when nothing fits, and rejects bad problems', () => {
    const s: Synthetic = { dims: 2, tolerance: 1e-3, phase: 'worst', wavelength: 1.55e-6, indexMax: 3.48, size: 5e-6, cellMax: 25e-9, cellMin: 20e-9, q: 1e5, pathWavelengths: null, lineQ: 1000, run: 'searched' };
    expect(() => splitAccuracy(syntheticProblem(s))).toThrow(/dispersion error alone is .* at the finest cell allowed/);
    const p = syntheticProblem({ ...s, lineQ: null, pathWavelengths: 0.1 });
    expect(() => splitAccuracy({ ...p, tolerance: 0 })).toThrow(/intensity error must be greater than 0/);
    expect(() => splitAccuracy({ ...p, cellMin: 2 * s.cellMax })).toThrow(/cell_min must be greater than 0 and at most/);
    expect(() => splitAccuracy({ ...p, run: { kind: 'later' } as never })).toThrow(/run kind must be "none", "fixed" or "searched"/);
    expect(() => splitAccuracy({ ...p, phase: 'often' as never })).toThrow(/phase must be "worst" or "random"/);
  });
});

/** A study shaped like a row of the demo project (assets/demo-project.csv, an invented scenario), planned with the real design search and cost model. */
interface Study {
  name: string;
  dims: number;
  bandShort: number;
  bandLong: number;
  index: number;
  indexMax: number;
  cell: number;
  cellMin: number;
  size: number[];
  gap: number;
  angleMax: number;
  tolerance: number;
  coupling: number;
  faces: number;
  phase: PhaseModel;
  orders?: number[];
  pathWavelengths?: number;
  /** q of the slowest resonance (run length only), or a fixed duration. */
  q?: number;
  duration?: number;
}

function realProblem(st: Study): SplitProblem<DesignResult> {
  const courant = 0.99 / Math.sqrt(st.dims);
  const freq = SPEED_OF_LIGHT / ((st.bandShort + st.bandLong) / 2);
  const interior = (cell: number) => st.size.map((L) => Math.ceil(L / cell));
  const gapCells = (cell: number) => Math.ceil(st.gap / cell);
  const run: RunModel =
    st.duration !== undefined
      ? { kind: 'fixed', duration: () => st.duration as number, error: () => 0 }
      : st.q !== undefined
        ? {
            kind: 'searched',
            durationFor: (_c, e) => resonanceRunDuration({ q: st.q as number, frequencyHz: freq, phase: st.phase }, e),
            error: (_c, d) => resonanceRunError({ q: st.q as number, frequencyHz: freq, phase: st.phase }, d),
            baselineDuration: () => ringdownTime(st.q as number, freq, 1e-3),
          }
        : { kind: 'none' };
  return {
    tolerance: st.tolerance,
    phase: st.phase,
    cellMax: st.cell,
    cellMin: st.cellMin,
    dispersionError: (cell) =>
      st.pathWavelengths === undefined
        ? 0
        : dispersionError({ ppw: st.bandShort / (st.indexMax * cell), courant, dimensions: st.dims, index: st.indexMax, pathWavelengths: st.pathWavelengths, phase: st.phase }).error,
    run,
    absorber: (cell, error) => {
      const target = requiredAmplitude({ intensityError: Math.min(error, 1), coupling: st.coupling, faces: st.faces, phase: st.phase });
      const design = designAbsorber({
        target: Math.min(target, 0.5),
        ppwMin: st.bandShort / (st.index * cell),
        ppwMax: st.bandLong / (st.index * cell),
        angleMaxDeg: st.angleMax,
        courant,
        dimensions: st.dims,
        index: st.index,
        orders: st.orders,
      });
      return { design, error: intensityErrorFromAmplitude(design.worstAmplitude, { coupling: st.coupling, faces: st.faces, phase: st.phase }) };
    },
    cost: (cell, design, duration) => {
      const c = runCost({
        domain: { dimensions: st.dims, interior: interior(cell), layers: design ? design.layers : 0, gap: gapCells(cell) },
        time: duration === null ? undefined : { cellMetres: cell, courant, duration },
        throughput: 1e9,
      });
      return c.runtime ? c.runtime.work : c.domain.cellsTotal;
    },
  };
}

describe('the split on demo-shaped studies with the real design search (invented scenario)', () => {
  it('measures the design searches one split needs, and the saving against the absorber-takes-all plan', () => {
    const studies: Study[] = [
      // Grating-coupler-like: 2-D, an interferometric path of 0.6 µm through silicon (1.4 wavelengths at 1500 nm), duration fixed.
      { name: 'grating coupler, path 1.4 λ', dims: 2, bandShort: 1.5e-6, bandLong: 1.6e-6, index: 1.44, indexMax: 3.48, cell: 20e-9, cellMin: 5e-9, size: [24e-6, 6e-6], gap: 0.52e-6, angleMax: 40, tolerance: 0.01, coupling: 1, faces: 2, phase: 'worst', pathWavelengths: 1.4, duration: 3e-12 },
      // Ring-like: 3-D, q 20000 sets the run (searched), no path.
      { name: 'ring, q 20000', dims: 3, bandShort: 1.54e-6, bandLong: 1.56e-6, index: 1.44, indexMax: 3.48, cell: 30e-9, cellMin: 15e-9, size: [12e-6, 12e-6, 2.4e-6], gap: 0.6e-6, angleMax: 20, tolerance: 1e-3, coupling: 0.5, faces: 1, phase: 'worst', orders: [3, 4], q: 20000 },
      // Dispersion-limited: the same ring with a 1-wavelength interferometric path to the monitor.
      { name: 'ring, q 20000, path 1 λ', dims: 3, bandShort: 1.54e-6, bandLong: 1.56e-6, index: 1.44, indexMax: 3.48, cell: 30e-9, cellMin: 7.5e-9, size: [12e-6, 12e-6, 2.4e-6], gap: 0.6e-6, angleMax: 20, tolerance: 1e-2, coupling: 0.5, faces: 1, phase: 'worst', orders: [3, 4], q: 20000, pathWavelengths: 1 },
      // Photonic-crystal-cavity-like: 2-D, q 1e5 (run), random phase, large angle.
      { name: 'crystal cavity, q 1e5', dims: 2, bandShort: 1.545e-6, bandLong: 1.555e-6, index: 1, indexMax: 3.48, cell: 25e-9, cellMin: 12.5e-9, size: [16e-6, 10e-6], gap: 0.8e-6, angleMax: 70, tolerance: 0.01, coupling: 0.2, faces: 1, phase: 'random', orders: [3, 4], q: 1e5 },
    ];
    const lines: string[] = [];
    for (const st of studies) {
      const w0 = designWork();
      const r = splitAccuracy(realProblem(st));
      const work = designWork() - w0;
      const b = r.best;
      expect(b.errors.combined).toBeLessThanOrEqual(st.tolerance);
      if (r.baseline) expect(b.cost).toBeLessThanOrEqual(r.baseline.cost);
      // A path the user's cell cannot resolve within the tolerance is planned on a finer cell.
      if (st.pathWavelengths !== undefined) expect(b.cell).toBeLessThan(st.cell);
      expect(r.evaluations.absorber).toBeLessThanOrEqual(MAX_ABSORBER_SEARCHES);
      lines.push(
        `${st.name}: cell ${(b.cell * 1e9).toFixed(2)} nm, ${b.design.layers} layers, errors absorber ${b.errors.absorber.toExponential(2)} dispersion ${b.errors.dispersion.toExponential(2)} run ${b.errors.run.toExponential(2)}, ` +
          `work ${b.cost.toExponential(3)}${r.baseline ? `, absorber-takes-all ${r.baseline.cost.toExponential(3)} (saving ${(100 * (r.saving as number) / r.baseline.cost).toFixed(1)} %)` : `, no absorber-takes-all plan (${r.baselineNote})`}; ` +
          `${r.evaluations.absorber} design searches (${work.toExponential(2)} layer-evaluations), ${r.evaluations.cost} cost, ${r.evaluations.dispersion} dispersion evaluations`,
      );
    }
    console.log(`demo-shaped splits:\n  ${lines.join('\n  ')}`);
  });
});

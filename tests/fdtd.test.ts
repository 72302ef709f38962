import { describe, expect, it } from 'vitest';
import {
  CpmlLine,
  ModeLine,
  TmzGrid2D,
  createMeasurementMode,
  planMeasurementPieces,
  DEFAULT_COURANT,
  HushInputError,
  MeasurementCancelled,
  cpmlCoefficients,
  createMeasurement1D,
  measureReflection1D,
  measureReflection2D,
  resolveDesign,
} from '../src/physics';

describe('1-D CPML line', () => {
  it('at S = 1 moves a pulse one cell per step unchanged (Schneider, Understanding the FDTD Method, the "magic time step")', () => {
    const line = new CpmlLine({ cells: 400, courantMedium: 1 });
    const wf = new Float64Array(200);
    for (let n = 0; n < wf.length; n++) wf[n] = Math.exp(-(((n - 60) / 12) ** 2));
    const a = new Float64Array(300);
    const e = line.e;
    // record two probes 40 cells apart by stepping manually
    const b = new Float64Array(300);
    for (let n = 0; n < 300; n++) {
      line.step();
      if (n < wf.length) e[100] += wf[n];
      a[n] = e[120];
      b[n] = e[160];
    }
    for (let n = 0; n + 40 < 300; n++) expect(b[n + 40]).toBeCloseTo(a[n], 12);
  });
  it('keeps the perfect conductor at depth N at zero (physics.md §3 node convention)', () => {
    const c = cpmlCoefficients(resolveDesign({ layers: 6, order: 3, kappaMax: 2, alphaMaxNorm: 0.1 }), DEFAULT_COURANT);
    const line = new CpmlLine({ cells: 50, courantMedium: DEFAULT_COURANT, right: c, left: c });
    const wf = new Float64Array(80).map((_, n) => Math.exp(-(((n - 30) / 8) ** 2)));
    line.advance(300, 0, wf, 25, new Float64Array(300), 30);
    expect(line.e[0]).toBe(0);
    expect(line.e[line.last]).toBe(0);
    expect(line.rightInterface).toBe(6 + 50);
  });
  it('rejects a line of 0 cells with a typed error', () => {
    expect(() => new CpmlLine({ cells: 0, courantMedium: 0.5 })).toThrow(HushInputError);
  });
});

describe('2-D TMz grid', () => {
  it('with a y-uniform source reproduces the 1-D line exactly (derived: ∂/∂y = 0 reduces TMz to the 1-D pair)', () => {
    const c = cpmlCoefficients(resolveDesign({ layers: 8, order: 3, kappaMax: 3, alphaMaxNorm: 0.1 }), DEFAULT_COURANT);
    const line = new CpmlLine({ cells: 60, courantMedium: DEFAULT_COURANT, right: c, left: c });
    const grid = new TmzGrid2D({ cells: 60, transverseCells: 4, courantMedium: DEFAULT_COURANT, right: c, left: c });
    const wf = new Float64Array(120).map((_, n) => Math.exp(-(((n - 40) / 10) ** 2)) * Math.sin(0.3 * (n - 40)));
    const r1 = new Float64Array(400);
    const r2 = new Float64Array(400);
    line.advance(400, 0, wf, 30, r1, 50);
    grid.advance(400, 0, wf, 30, new Float64Array(4).fill(1), r2, 50, new Float64Array(4).fill(0.25));
    for (let n = 0; n < 400; n++) expect(r2[n]).toBeCloseTo(r1[n], 13);
  });
  it('rejects a Courant number above the 2-D limit 1/√2 (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    expect(() => new TmzGrid2D({ cells: 10, transverseCells: 4, courantMedium: 0.8 })).toThrow(HushInputError);
  });
});

describe('reflection measurement: progress, cancellation and inputs', () => {
  const design = { layers: 4, order: 3 };
  it('reports increasing progress fractions ending at 1 (common practice for long-running work)', async () => {
    const seen: number[] = [];
    await measureReflection1D(design, { ppwLow: 6, ppwHigh: 14 }, { onProgress: (f) => seen.push(f), chunkCellUpdates: 20_000 });
    expect(seen.length).toBeGreaterThan(3);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThan(seen[i - 1]);
    expect(seen[seen.length - 1]).toBe(1);
    expect(seen[0]).toBeGreaterThan(0);
  });
  it('throws MeasurementCancelled once the signal is aborted', async () => {
    const signal = { aborted: false };
    let calls = 0;
    const p = measureReflection2D(
      design,
      { angleDeg: 20, ppwLow: 8, ppwHigh: 13.5 },
      {
        signal,
        chunkCellUpdates: 100_000,
        onProgress: () => {
          calls++;
          if (calls === 2) signal.aborted = true;
        },
      },
    );
    await expect(p).rejects.toBeInstanceOf(MeasurementCancelled);
    expect(calls).toBe(2);
  });
  it('a prepared run refuses to give a result before it is complete', () => {
    const run = createMeasurement1D(design, { ppwLow: 6, ppwHigh: 14 });
    run.advance(10);
    expect(run.stepsDone).toBe(10);
    expect(() => run.result()).toThrow(/not complete/);
  });
  it('rejects N < 1, a band below the resolvable ppw, angles ≥ 90°, NaN and too-wide bands with HushInputError', async () => {
    await expect(measureReflection1D({ layers: 0, order: 3 }, { ppwLow: 6, ppwHigh: 14 })).rejects.toBeInstanceOf(HushInputError);
    // 1-D, S_m = 0.99/√3: the grid carries no wave below π·S_m/asin(S_m) ≈ 2.96 cells per wavelength (dispersion.ts)
    await expect(measureReflection1D(design, { ppwLow: 2.5, ppwHigh: 14 })).rejects.toBeInstanceOf(HushInputError);
    await expect(measureReflection2D(design, { angleDeg: 90, ppwLow: 8, ppwHigh: 12 })).rejects.toBeInstanceOf(HushInputError);
    await expect(measureReflection2D(design, { angleDeg: NaN, ppwLow: 8, ppwHigh: 12 })).rejects.toBeInstanceOf(HushInputError);
    await expect(measureReflection1D(design, { ppwLow: NaN, ppwHigh: 12 })).rejects.toBeInstanceOf(HushInputError);
    await expect(measureReflection1D(design, { ppwLow: 12, ppwHigh: 8 })).rejects.toBeInstanceOf(HushInputError);
    // a band of ratio 5 reaches too close to zero frequency for a clean Gaussian (pulse.ts)
    await expect(measureReflection1D(design, { ppwLow: 6, ppwHigh: 30 })).rejects.toThrow(/too wide/);
    // at 45° the grazing cut-off sits at ≈ 0.7 of the band centre: 9–14 cells per wavelength cannot be covered cleanly
    await expect(measureReflection2D(design, { angleDeg: 45, ppwLow: 9, ppwHigh: 14 })).rejects.toThrow(/grazing/);
  });
});

describe('one-mode chain (the exact reduction of the periodic 2-D grid, mode-line.ts)', () => {
  /** The 2-D grid with source profile cos(k_t·j) and the chain with K = 2 sin(k_t/2), recorded at the same column; largest difference relative to the largest value. */
  function compare(kt: number, ny: number, design: Parameters<typeof resolveDesign>[0], omega: number, width = 15): number {
    const c = cpmlCoefficients(resolveDesign(design), DEFAULT_COURANT);
    const grid = new TmzGrid2D({ cells: 40, transverseCells: ny, courantMedium: DEFAULT_COURANT, right: c, left: c });
    const chain = new ModeLine({ cells: 40, courantMedium: DEFAULT_COURANT, transverse: 2 * Math.sin(kt / 2), right: c, left: c });
    const delay = 4 * width;
    const wf = new Float64Array(2 * delay + 1).map((_, n) => Math.exp(-(((n - delay) / width) ** 2)) * Math.sin(omega * (n - delay)));
    const profile = new Float64Array(ny).map((_, j) => Math.cos(kt * j));
    const norm = profile.reduce((s, v) => s + v * v, 0);
    const weights = profile.map((v) => v / norm);
    const steps = 1500;
    const r2 = new Float64Array(steps);
    const r1 = new Float64Array(steps);
    grid.advance(steps, 0, wf, c.layers + 15, profile, r2, c.layers + 30, weights);
    chain.advance(steps, 0, wf, c.layers + 15, r1, c.layers + 30);
    let peak = 0;
    let diff = 0;
    for (let n = 0; n < steps; n++) {
      peak = Math.max(peak, Math.abs(r2[n]));
      diff = Math.max(diff, Math.abs(r2[n] - r1[n]));
    }
    return diff / peak;
  }
  const design = { layers: 8, order: 3, kappaMax: 3, alphaMaxNorm: 0.1, sampling: 'average' as const };
  it('gives the 2-D grid\'s field to rounding for a propagating mode (derived in mode-line.ts; measured: ≈ 1e-15 relative)', () => {
    expect(compare((2 * Math.PI) / 16, 16, design, 0.35)).toBeLessThan(1e-12);
  });
  it('… and for a mode evanescent along x at the pulse\'s frequencies (k_t = 2π/16, ωΔt = 0.1 below the grazing cut-off 0.22: decay ≈ 2.9 cells)', () => {
    // The grid's profile cos(k_t·j) is itself rounded (1e-16 of other, propagating modes), which the
    // field's decay over the 15 cells to the probe amplifies (e^{15/2.9} ≈ 180): hence 1e-12, not 1e-15.
    expect(compare((2 * Math.PI) / 16, 16, design, 0.1, 50)).toBeLessThan(1e-12);
  });
  it('is the 1-D line itself when K = 0 (derived: the transverse field stays zero)', () => {
    const c = cpmlCoefficients(resolveDesign({ layers: 6, order: 2 }), 0.5);
    const line = new CpmlLine({ cells: 30, courantMedium: 0.5, right: c });
    const chain = new ModeLine({ cells: 30, courantMedium: 0.5, transverse: 0, right: c });
    const wf = new Float64Array(60).map((_, n) => Math.exp(-(((n - 25) / 6) ** 2)));
    const a = new Float64Array(300);
    const b = new Float64Array(300);
    line.advance(300, 0, wf, 5, a, 12);
    chain.advance(300, 0, wf, 5, b, 12);
    expect(Array.from(b)).toEqual(Array.from(a));
  });
  it('rejects a transverse factor beyond a 2-D grid\'s and a Courant number above 1/√2', () => {
    expect(() => new ModeLine({ cells: 10, courantMedium: 0.5, transverse: 2.5 })).toThrow(HushInputError);
    expect(() => new ModeLine({ cells: 10, courantMedium: 0.8, transverse: 1 })).toThrow(HushInputError);
  });
});

describe('band pieces and one-mode measurements: inputs', () => {
  it('split a band near grazing into pieces that each stay clear of the cut-off, and widen a narrow band in the pulse', () => {
    const wide = planMeasurementPieces({ ppwMin: 115, ppwMax: 136, angleDeg: 60 });
    expect(wide.length).toBe(2);
    const narrow = planMeasurementPieces({ ppwMin: 61.8, ppwMax: 62.2, angleDeg: 70, courant: 0.7 });
    expect(narrow.length).toBe(1);
    expect(narrow[0].ppwLow).toBeLessThan(61.8);
    expect(narrow[0].ppwHigh).toBeGreaterThan(62.2);
    for (const p of [...wide, ...narrow]) for (const f of p.frequencies) expect(f >= p.ppwLow && f <= p.ppwHigh).toBe(true);
  });
  it('refuse a band that straddles the grazing cut-off, an angle with a decay length, and a decay no 2-D grid carries', () => {
    const d = { layers: 4, order: 3 };
    // k_t from a 4-cell decay at the centre of 10–40 cells per wavelength: the short end propagates.
    expect(() => createMeasurementMode(d, { ppwLow: 4, ppwHigh: 40, decayCells: 1 })).toThrow(HushInputError);
    expect(() => createMeasurementMode(d, { ppwLow: 10, ppwHigh: 12, decayCells: 3, angleDeg: 20 })).toThrow(/exactly one of angleDeg, decayCells and transverseWavenumber/);
    expect(() => createMeasurementMode(d, { ppwLow: 10, ppwHigh: 12, decayCells: 0.2 })).toThrow(/beyond a 2-D grid/);
    expect(() => planMeasurementPieces({ ppwMin: 20, ppwMax: 30, angleDeg: 20, decayCells: 3 })).toThrow(/an angle or a decay length, not both/);
  });
});

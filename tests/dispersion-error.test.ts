import { describe, expect, it } from 'vitest';
import {
  CpmlLine,
  HushInputError,
  dispersionError,
  dispersionPpwForError,
  intensityErrorFromAmplitude,
  lineShiftError,
  lineShiftForError,
  phaseVelocityRatio,
} from '../src/physics';
import { dtftAt, fixedWavenumberFrequencyRatio } from '../src/physics/internal';

const DEG = Math.PI / 180;

describe('which dispersion error applies', () => {
  const grid = { ppw: 20, courant: 0.5, dimensions: 1 };
  it('neither a path nor q: no dispersion error, nothing assumed', () => {
    const d = dispersionError(grid);
    expect(d.applies).toBe('none');
    expect(d.error).toBe(0);
    expect(d.phaseSlip).toBeNull();
    expect(d.frequencyShift).toBeNull();
    expect(d.phaseVelocityRatio).toBe(phaseVelocityRatio(grid));
  });
  it('a path only: the phase slip; q only: the resonance shift; both: they add (worst) or add in quadrature (random)', () => {
    const path = dispersionError({ ...grid, pathWavelengths: 3 });
    const res = dispersionError({ ...grid, q: 50 });
    const both = dispersionError({ ...grid, pathWavelengths: 3, q: 50 });
    expect(path.applies).toBe('path');
    expect(res.applies).toBe('resonance');
    expect(both.applies).toBe('path and resonance');
    expect(both.error).toBe((path.pathError as number) + (res.resonanceError as number));
    const r = dispersionError({ ...grid, pathWavelengths: 3, q: 50, phase: 'random' });
    expect(r.error).toBeCloseTo(Math.hypot(r.pathError as number, r.resonanceError as number), 15);
    // The resonance part has no unknown phase: the same in both models.
    expect(r.resonanceError).toBe(res.resonanceError);
  });
});

describe('path error (physics.md §7)', () => {
  it('Δφ = (k̃ − k)·L = 2π·W·(v/v_p − 1) at fixed frequency, ≈ 2π·W·(1 − v_p/v) to first order', () => {
    const vp = phaseVelocityRatio({ ppw: 20, courant: 0.5, dimensions: 1 });
    const d = dispersionError({ ppw: 20, courant: 0.5, dimensions: 1, pathWavelengths: 10 });
    // k̃ for the 1-D grid by its closed form 2·asin(sin(πS/p)/S) (Taflove & Hagness, 3rd ed., ch. 4); k = 2π/p.
    const kTilde = 2 * Math.asin(Math.sin(Math.PI * 0.5 / 20) / 0.5);
    expect(d.phaseSlip as number).toBeCloseTo((kTilde - (2 * Math.PI) / 20) * 10 * 20, 12);
    expect((d.phaseSlip as number) / (2 * Math.PI * 10 * (1 - vp))).toBeCloseTo(1 / vp, 12);
  });
  it('the error field E·(e^{iΔφ} − 1) has amplitude 2 sin(|Δφ|/2), entering like an echo (physics.md §1)', () => {
    for (const phase of ['worst', 'random'] as const) {
      const d = dispersionError({ ppw: 12, courant: 0.5, dimensions: 1, pathWavelengths: 4, phase });
      const slip = d.phaseSlip as number;
      const A = Math.hypot(Math.cos(slip) - 1, Math.sin(slip));
      expect(d.pathError as number).toBeCloseTo(intensityErrorFromAmplitude(A, { phase }), 13);
    }
  });
  it('worst case over the monitor phase: brute force over the phase ψ of the other fields gives (1 + A)² − 1 (independent computation)', () => {
    const d = dispersionError({ ppw: 15, courant: 0.5, dimensions: 1, pathWavelengths: 2 });
    const slip = d.phaseSlip as number;
    // Monitor field F (|F| = 1) plus the path field's error E·(e^{iΔφ} − 1) with |E| = |F|, at every relative phase ψ.
    let worst = 0;
    for (let k = 0; k < 100000; k++) {
      const psi = (2 * Math.PI * k) / 100000;
      const re = 1 + Math.cos(psi) * (Math.cos(slip) - 1) - Math.sin(psi) * Math.sin(slip);
      const im = Math.sin(psi) * (Math.cos(slip) - 1) + Math.cos(psi) * Math.sin(slip);
      worst = Math.max(worst, Math.abs(re * re + im * im - 1));
    }
    expect(d.pathError as number).toBeCloseTo(worst, 8);
  });
  it('a slip beyond π gives the largest error, A = 2 (documented cap)', () => {
    const d = dispersionError({ ppw: 6, courant: 0.5, dimensions: 1, pathWavelengths: 1000 });
    expect(Math.abs(d.phaseSlip as number)).toBeGreaterThan(Math.PI);
    expect(d.pathError).toBe(8);
  });
});

describe('resonance error: a shifted Lorentzian line (derived in src/physics/dispersion-error.ts)', () => {
  it('the worst relative intensity error over the line is 2s(s + √(1 + s²)), s = Q·|Δf/f| (brute force over the line)', () => {
    for (const s of [1e-3, 0.05, 0.5, 3.5]) {
      const x = 2 * s;
      let worst = 0;
      for (let k = -400000; k <= 400000; k++) {
        const u = k * 1e-4;
        const truth = 1 / (1 + u * u);
        const grid = 1 / (1 + (u - x) ** 2);
        worst = Math.max(worst, Math.abs(grid / truth - 1));
      }
      expect(lineShiftError(s) / worst).toBeCloseTo(1, 6);
      expect(lineShiftForError(lineShiftError(s))).toBeCloseTo(s, 13);
    }
  });
  it('Δf/f = 1 − ω̃/ω for a mode of fixed wavenumber, ≈ 1 − v_p/v to first order (physics.md §7)', () => {
    for (const p of [10, 20, 80]) {
      const d = dispersionError({ ppw: p, courant: 0.5, dimensions: 1, q: 10 });
      const vp = phaseVelocityRatio({ ppw: p, courant: 0.5, dimensions: 1 });
      expect((d.frequencyShift as number) / (1 - vp)).toBeCloseTo(1, 1);
      expect(d.shiftLinewidths).toBeCloseTo(10 * (d.frequencyShift as number), 15);
    }
  });
  it('time domain: the modes of a 1-D conducting cavity sit at the grid frequency ω̃ (measured to ≤ 1e-4 of the shift)', () => {
    // Cavity of L = 40 cells between conductors: modes sin(kx) with k = mπ/L exactly on the grid; mode m = 4 has 20 cells per wavelength.
    const S = 0.5;
    const L = 40;
    const line = new CpmlLine({ cells: L, courantMedium: S });
    const steps = 20000;
    const rec = new Float64Array(steps);
    const src = 7;
    const probe = 23;
    const tau = 3;
    for (let n = 0; n < steps; n++) {
      line.step();
      const t = n - 20;
      if (n < 40) line.e[src] += -2 * t / (tau * tau) * Math.exp(-((t / tau) ** 2));
      rec[n] = line.e[probe];
    }
    // Hann window, then the peak of |X(ω)| by golden-section search near the mode.
    for (let n = 0; n < steps; n++) rec[n] *= 0.5 - 0.5 * Math.cos((2 * Math.PI * n) / (steps - 1));
    const z = new Float64Array(2);
    const mag = (w: number) => {
      dtftAt(rec, steps, w, z);
      return Math.hypot(z[0], z[1]);
    };
    const figures: string[] = [];
    for (const m of [2, 4, 8]) {
      const k = (m * Math.PI) / L;
      const ppw = (2 * L) / m;
      const predicted = fixedWavenumberFrequencyRatio(ppw, S, 1, 0, 0) * k * S; // ω̃Δt
      let a = predicted - 2e-3;
      let b = predicted + 2e-3;
      const g = (Math.sqrt(5) - 1) / 2;
      for (let it = 0; it < 60; it++) {
        const c1 = b - g * (b - a);
        const c2 = a + g * (b - a);
        if (mag(c1) > mag(c2)) b = c2;
        else a = c1;
      }
      const measuredShift = 1 - (0.5 * (a + b)) / (k * S);
      const model = dispersionError({ ppw, courant: S, dimensions: 1, q: 1 }).frequencyShift as number;
      const rel = Math.abs(measuredShift - model) / model;
      figures.push(`${ppw} cells/λ: shift ${model.toExponential(4)}, relative difference ${rel.toExponential(2)}`);
      expect(rel).toBeLessThanOrEqual(1e-4);
    }
    console.log(`cavity modes: ${figures.join('; ')} (${(steps * line.nodes).toExponential(2)} cell updates)`);
  });
});

describe('worst direction: the axis (derived in src/physics/dispersion-error.ts by concavity)', () => {
  it('no direction or azimuth is slower than the axis, nor shifts a mode more (scan over directions, 2-D and 3-D)', () => {
    for (const [dims, s] of [
      [2, 0.7],
      [2, 0.3],
      [3, 0.57],
      [3, 0.2],
    ]) {
      for (const p of [4, 8, 20]) {
        const axis = phaseVelocityRatio({ ppw: p, courant: s, dimensions: dims });
        const axisShift = 1 - fixedWavenumberFrequencyRatio(p, s, 1, 0, 0);
        for (let th = 0; th <= 90; th += 2.5) {
          for (let ph = 0; ph <= (dims === 3 ? 90 : 0); ph += 7.5) {
            expect(phaseVelocityRatio({ ppw: p, courant: s, dimensions: dims, angleDeg: th, azimuthDeg: ph })).toBeGreaterThanOrEqual(axis * (1 - 1e-15));
            const t = th * DEG;
            const f = ph * DEG;
            const shift = 1 - fixedWavenumberFrequencyRatio(p, s, Math.abs(Math.cos(t)), Math.abs(Math.sin(t) * Math.cos(f)), Math.abs(Math.sin(t) * Math.sin(f)));
            expect(shift).toBeLessThanOrEqual(axisShift * (1 + 1e-12));
          }
        }
      }
    }
  });
});

describe('fewest cells per wavelength for a dispersion error', () => {
  it('inverts the error: at the answer the error is within the bound, just below it is not', () => {
    for (const spec of [
      { courant: 0.5, dimensions: 1, pathWavelengths: 10 },
      { dimensions: 3, index: 3.48, q: 1000 },
      { dimensions: 2, pathWavelengths: 30, q: 200, phase: 'random' as const },
    ]) {
      for (const eps of [1e-3, 1e-2, 0.1]) {
        const p = dispersionPpwForError(spec, eps);
        expect(dispersionError({ ...spec, ppw: p }).error).toBeLessThanOrEqual(eps);
        expect(dispersionError({ ...spec, ppw: p * (1 - 1e-9) }).error).toBeGreaterThan(eps);
      }
    }
  });
  it('needs a path or q, and refuses what no grid meets', () => {
    expect(() => dispersionPpwForError({ dimensions: 2 }, 0.01)).toThrow(/neither a path nor q/);
    expect(() => dispersionPpwForError({ dimensions: 2, pathWavelengths: 1e9 }, 1e-12)).toThrow(/even 1000000 cells per wavelength/);
  });
});

describe('bad input', () => {
  it('gets specific errors', () => {
    const cases: [() => unknown, RegExp][] = [
      [() => dispersionError({ ppw: 2, courant: 0.5, dimensions: 1, q: 10 }), /cells per wavelength must be more than 3/],
      [() => dispersionError({ ppw: 20, pathWavelengths: -1 }), /path must be at least 0/],
      [() => dispersionError({ ppw: 20, q: 0 }), /quality factor must be greater than 0/],
      [() => dispersionError({ ppw: 20, q: 10, resonancePpw: 1.5 }), /resonance cells per wavelength must be greater than 2/],
      [() => dispersionError({ ppw: 20, phase: 'often' as never }), /phase must be "worst" or "random"/],
    ];
    for (const [f, m] of cases) {
      expect(f).toThrow(HushInputError);
      expect(f).toThrow(m);
    }
  });
});

import { describe, expect, it } from 'vitest';
import { CpmlLine, HushInputError, TmzGrid2D, gridVelocity, groupVelocityRatio, phaseVelocityRatio, propagationLimitPpw } from '../src/physics';
import { dtftAt } from '../src/physics/internal';

const DEG = Math.PI / 180;

/** Direction cosines written out independently of the module's degree helpers. */
function cosines(angleDeg: number, azimuthDeg: number): number[] {
  const t = angleDeg * DEG;
  const f = azimuthDeg * DEG;
  return [Math.cos(t), Math.sin(t) * Math.cos(f), Math.sin(t) * Math.sin(f)];
}

/** Independent solution of (1/S²)sin²(ωΔt/2) = Σ sin²(k_i/2) for |k| by plain bisection on the first branch. */
function bisectWavenumber(ppw: number, s: number, d: number[]): number {
  const target = Math.sin((Math.PI * s) / ppw) ** 2 / (s * s);
  const g = (q: number) => d.reduce((acc, di) => acc + Math.sin((q * di) / 2) ** 2, 0);
  let lo = 0;
  let hi = Math.PI / Math.max(...d.map(Math.abs));
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (g(mid) < target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** ω(q) from the relation, ω = (2/S)·asin(S·√G(q)) in normalised units (Δ = 1, v = 1). */
function omegaOf(q: number, s: number, d: number[]): number {
  const g = d.reduce((acc, di) => acc + Math.sin((q * di) / 2) ** 2, 0);
  return (2 / s) * Math.asin(s * Math.sqrt(g));
}

describe('Yee phase and group velocity, published values', () => {
  it('1-D, S = 0.5: v_p/c ≈ 0.9969 at 20 cells/λ, ≈ 0.9873 at 10 (Schneider, Understanding the FDTD Method, ch. on dispersion)', () => {
    expect(phaseVelocityRatio({ ppw: 20, courant: 0.5, dimensions: 1 })).toBeCloseTo(0.9969, 4);
    expect(phaseVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 1 })).toBeCloseTo(0.9873, 4);
  });
  it('1-D, S = 1 is dispersion-free: v_p = v_g = c (Schneider, the "magic time step")', () => {
    for (const p of [2.5, 3, 5, 10, 40, 1e4]) {
      const v = gridVelocity({ ppw: p, courant: 1, dimensions: 1 });
      expect(v.phaseVelocityRatio).toBeCloseTo(1, 14);
      expect(v.groupVelocityRatio).toBeCloseTo(1, 13);
    }
  });
  it('2-D, S = 1/√2 along the diagonal is dispersion-free (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    for (const p of [2, 4, 10, 33]) {
      const v = gridVelocity({ ppw: p, courant: Math.SQRT1_2, dimensions: 2, angleDeg: 45 });
      expect(v.phaseVelocityRatio).toBeCloseTo(1, 14);
      expect(v.groupVelocityRatio).toBeCloseTo(1, 13);
    }
  });
  it('3-D, S = 1/√3 along the body diagonal is dispersion-free (derived: each of the three terms is the 1-D magic step)', () => {
    const theta = Math.acos(1 / Math.sqrt(3)) / DEG;
    const v = gridVelocity({ ppw: 8, courant: 1 / Math.sqrt(3), dimensions: 3, angleDeg: theta, azimuthDeg: 45 });
    expect(v.phaseVelocityRatio).toBeCloseTo(1, 13);
    expect(v.groupVelocityRatio).toBeCloseTo(1, 12);
  });
  it('1-D, S = 0.5 stops propagating below 3 cells/λ, and the error states the limit (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    expect(propagationLimitPpw({ courant: 0.5, dimensions: 1 })).toBeCloseTo(3, 14);
    expect(phaseVelocityRatio({ ppw: 3.001, courant: 0.5, dimensions: 1 })).toBeGreaterThan(0.6);
    const bad = () => phaseVelocityRatio({ ppw: 2.99, courant: 0.5, dimensions: 1 });
    expect(bad).toThrow(HushInputError);
    expect(bad).toThrow(/cells per wavelength must be more than 3 on this grid \(1-D, Courant number 0.5 in the medium, angle 0°\)/);
    expect(() => phaseVelocityRatio({ ppw: 3, courant: 0.5, dimensions: 1 })).toThrow(/more than 3 /);
  });
  it('the group velocity vanishes at the propagation limit (derived: sin k̃ = 0 at the zone edge)', () => {
    expect(groupVelocityRatio({ ppw: 3 * (1 + 1e-8), courant: 0.5, dimensions: 1 })).toBeLessThan(1e-3);
  });
  it('the axis is the slowest direction and the diagonal the fastest in 2-D (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    const at = (a: number) => phaseVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 2, angleDeg: a });
    expect(at(0)).toBeLessThan(at(20));
    expect(at(20)).toBeLessThan(at(45));
    expect(at(90)).toBeCloseTo(at(0), 15);
  });
  it('in a medium of index n the grid works at S/n (physics.md §3)', () => {
    expect(phaseVelocityRatio({ ppw: 15, courant: 0.5, dimensions: 2, angleDeg: 20, index: 2 })).toBeCloseTo(
      phaseVelocityRatio({ ppw: 15, courant: 0.25, dimensions: 2, angleDeg: 20 }),
      15,
    );
  });
  it('defaults: 3-D, Courant number 0.99/√3, along x, index 1', () => {
    expect(phaseVelocityRatio({ ppw: 12 })).toBe(phaseVelocityRatio({ ppw: 12, courant: 0.99 / Math.sqrt(3), dimensions: 3, angleDeg: 0, azimuthDeg: 0, index: 1 }));
    expect(phaseVelocityRatio({ ppw: 12, dimensions: 2 })).toBe(phaseVelocityRatio({ ppw: 12, courant: 0.99 * Math.SQRT1_2, dimensions: 2 }));
  });
});

describe('Yee velocities against an independent solution of the relation', () => {
  it('v_p = 2π/(p·|k̃|) with |k̃| from a bisection written here, over 2-D and 3-D directions (physics.md §7)', () => {
    for (const [dims, s, th, ph] of [
      [2, 0.5, 13, 0],
      [2, 0.7, 37, 0],
      [2, 0.3, 61, 0],
      [3, 0.5, 30, 20],
      [3, 0.57, 50, 40],
      [3, 0.2, 75, 70],
    ]) {
      for (const p of [4, 7.5, 12, 40, 200]) {
        const q = bisectWavenumber(p, s, cosines(th, ph));
        const v = phaseVelocityRatio({ ppw: p, courant: s, dimensions: dims, angleDeg: th, azimuthDeg: ph });
        expect(Math.abs(v - (2 * Math.PI) / p / q)).toBeLessThan(2e-15);
      }
    }
  });
  it('v_g = dω/d|k̃| matches a central difference of ω(|k̃|) from the relation (independent numerical derivative)', () => {
    for (const [dims, s, th, ph] of [
      [1, 0.5, 0, 0],
      [2, 0.5, 13, 0],
      [2, 0.7, 45, 0],
      [3, 0.5, 30, 20],
      [3, 0.4, 64, 33],
    ]) {
      for (const p of [4, 8, 20]) {
        const d = cosines(th, ph);
        const q = bisectWavenumber(p, s, d);
        const h = 1e-5 * q;
        const numeric = (omegaOf(q + h, s, d) - omegaOf(q - h, s, d)) / (2 * h);
        const v = groupVelocityRatio({ ppw: p, courant: s, dimensions: dims, angleDeg: th, azimuthDeg: ph });
        expect(Math.abs(v - numeric)).toBeLessThan(1e-8);
      }
    }
  });
});

describe('bad input gets a specific error', () => {
  it('names the field, what was given and what is allowed', () => {
    const cases: [() => unknown, RegExp][] = [
      [() => phaseVelocityRatio({ ppw: 10, dimensions: 1, angleDeg: 30 }), /1-D grid carries waves along its axis only: angle must be 0 or ±180 degrees \(got 30 degrees\)/],
      [() => phaseVelocityRatio({ ppw: 10, dimensions: 2, azimuthDeg: 10 }), /azimuth must be 0 on a 2-D grid \(got 10 degrees\)/],
      [() => phaseVelocityRatio({ ppw: 10, dimensions: 4 }), /dimensions must be a whole number from 1 to 3/],
      [() => phaseVelocityRatio({ ppw: 10, dimensions: 2, courant: 0.8 }), /above the 2-D stability limit/],
      [() => phaseVelocityRatio({ ppw: NaN }), /cells per wavelength must be a finite number/],
      [() => phaseVelocityRatio({ ppw: 2e6 }), /at most 1000000/],
      [() => phaseVelocityRatio({ ppw: 10, angleDeg: 400 }), /angle must be at least -360 and at most 360/],
      [() => phaseVelocityRatio({ ppw: 10, index: 0.5 }), /background index must be at least 1/],
      [() => phaseVelocityRatio(null as never), /must be an object/],
    ];
    for (const [f, m] of cases) {
      expect(f).toThrow(HushInputError);
      expect(f).toThrow(m);
    }
  });
});

/** Zero-mean modulated Gaussian: the first difference of e^{−((n−n₀)/τ)²}·sin(ω₀(n−n₀)), so no static field is left behind. */
function pulse(omega0: number, tau: number): Float64Array {
  const n0 = Math.ceil(6.2 * tau);
  const g = (n: number) => Math.exp(-(((n - n0) / tau) ** 2)) * Math.sin(omega0 * (n - n0));
  const out = new Float64Array(2 * n0 + 2);
  for (let n = 0; n < out.length; n++) out[n] = g(n) - g(n - 1);
  return out;
}

/** Wavenumber along x between two probes D apart from the ratio of their DTFTs, unwrapped near the continuum value. */
function measuredKx(r1: Float64Array, r2: Float64Array, omegaDt: number, distance: number, guess: number): number {
  const z1 = dtftAt(r1, r1.length, omegaDt, new Float64Array(2));
  const z2 = dtftAt(r2, r2.length, omegaDt, new Float64Array(2));
  // R2/R1 = e^{−j·k̃·D} for a wave travelling to +x.
  const re = z2[0] * z1[0] + z2[1] * z1[1];
  const im = z2[1] * z1[0] - z2[0] * z1[1];
  const wrapped = -Math.atan2(im, re);
  const m = Math.round((guess * distance - wrapped) / (2 * Math.PI));
  return (wrapped + 2 * Math.PI * m) / distance;
}

describe('time domain: phase velocity measured from two probes (independent computation)', () => {
  it('1-D lossless line, S = 0.5: v_p from the phase delay between probes 20 cells apart (and v_g from its slope) agree to ≤ 1e-4 relative', () => {
    const S = 0.5;
    const line = new CpmlLine({ cells: 1600, courantMedium: S });
    const src = 500;
    const p1 = src + 20;
    const p2 = p1 + 20;
    const w = pulse(0.34, 25);
    // Record until the pulse has passed both probes; the far walls' reflections arrive after 2·(500 − 20)/0.5 ≈ 1900 steps.
    const steps = 1200;
    const r1 = new Float64Array(steps);
    const r2 = new Float64Array(steps);
    for (let n = 0; n < steps; n++) {
      line.step();
      if (n < w.length) line.e[src] += w[n];
      r1[n] = line.e[p1];
      r2[n] = line.e[p2];
    }
    let worst = 0;
    const figures: string[] = [];
    for (const ppw of [6, 8, 10, 15, 20]) {
      const wdt = (2 * Math.PI * S) / ppw;
      const kx = measuredKx(r1, r2, wdt, p2 - p1, wdt / S);
      const measured = wdt / S / kx;
      const model = phaseVelocityRatio({ ppw, courant: S, dimensions: 1 });
      const rel = Math.abs(measured - model) / model;
      worst = Math.max(worst, rel);
      figures.push(`${ppw}: ${rel.toExponential(2)}`);
    }
    console.log(`1-D time-domain v_p relative differences by cells per wavelength: ${figures.join(', ')} (${(steps * line.nodes).toExponential(2)} cell updates)`);
    expect(worst).toBeLessThanOrEqual(1e-4);
    // Group velocity from the same record: v_g = dω/dk̃ by a central difference of the measured k̃(ω).
    let worstGroup = 0;
    for (const ppw of [8, 10, 15]) {
      const wdt = (2 * Math.PI * S) / ppw;
      const h = 1e-4 * wdt;
      const kPlus = measuredKx(r1, r2, wdt + h, p2 - p1, (wdt + h) / S);
      const kMinus = measuredKx(r1, r2, wdt - h, p2 - p1, (wdt - h) / S);
      const measured = (2 * h) / S / (kPlus - kMinus);
      const model = groupVelocityRatio({ ppw, courant: S, dimensions: 1 });
      worstGroup = Math.max(worstGroup, Math.abs(measured - model) / model);
    }
    console.log(`1-D time-domain v_g worst relative difference (8, 10, 15 cells/λ): ${worstGroup.toExponential(2)}`);
    expect(worstGroup).toBeLessThanOrEqual(1e-4);
    // Work bound: a few million cell updates.
    expect(steps * line.nodes).toBeLessThan(3e6);
  });

  it('2-D periodic grid, oblique wave (k_y = 2π/20): v_p along the measured direction agrees to ≤ 1e-4 relative', () => {
    const S = 0.5;
    const ny = 20;
    const ky = (2 * Math.PI) / ny;
    const grid = new TmzGrid2D({ cells: 1250, transverseCells: ny, courantMedium: S });
    const src = 400;
    const p1 = src + 30;
    const p2 = p1 + 20;
    // Centre 0.45 rad/step, width 60 steps: the spectrum is e^{−77} of its peak at the grazing cut-off (≈ 0.157) of this mode.
    const w = pulse(0.45, 60);
    const profile = new Float64Array(ny);
    let norm = 0;
    for (let j = 0; j < ny; j++) {
      profile[j] = Math.cos(ky * j);
      norm += profile[j] ** 2;
    }
    const steps = 1500;
    const r1 = new Float64Array(steps);
    const r2 = new Float64Array(steps);
    const ez = grid.ez;
    for (let n = 0; n < steps; n++) {
      grid.step();
      if (n < w.length) for (let j = 0; j < ny; j++) ez[src * ny + j] += w[n] * profile[j];
      let a = 0;
      let b = 0;
      for (let j = 0; j < ny; j++) {
        a += profile[j] * ez[p1 * ny + j];
        b += profile[j] * ez[p2 * ny + j];
      }
      r1[n] = a / norm;
      r2[n] = b / norm;
    }
    let worst = 0;
    const figures: string[] = [];
    for (const wdt of [0.38, 0.42, 0.45, 0.48, 0.52]) {
      const guess = Math.sqrt(Math.max(0, (wdt / S) ** 2 - ky * ky));
      const kx = measuredKx(r1, r2, wdt, p2 - p1, guess);
      const q = Math.hypot(kx, ky);
      const measured = wdt / S / q;
      const angleDeg = Math.atan2(ky, kx) / DEG;
      const ppw = (2 * Math.PI * S) / wdt;
      const model = phaseVelocityRatio({ ppw, courant: S, dimensions: 2, angleDeg });
      const rel = Math.abs(measured - model) / model;
      worst = Math.max(worst, rel);
      figures.push(`${ppw.toFixed(2)} cells/λ at ${angleDeg.toFixed(1)}°: ${rel.toExponential(2)}`);
    }
    console.log(`2-D time-domain v_p relative differences: ${figures.join(', ')} (${(steps * grid.nodes).toExponential(2)} cell updates)`);
    expect(worst).toBeLessThanOrEqual(1e-4);
    expect(steps * grid.nodes).toBeLessThan(5e7);
  });
});

describe('documented examples (the values quoted in src/physics/velocity.ts, run-error.ts, dispersion-error.ts, budget.ts)', () => {
  it('give the stated values to 15 significant digits', async () => {
    const P = await import('../src/physics');
    const at15 = (x: number) => Number(x.toPrecision(15));
    expect(at15(P.gridVelocity({ ppw: 10, courant: 0.5, dimensions: 1 }).phaseVelocityRatio)).toBe(0.987263701339977);
    expect(at15(P.phaseVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 2, angleDeg: 30 }))).toBe(0.99371296717977);
    expect(at15(P.phaseVelocityRatio({ ppw: 20, courant: 0.5, dimensions: 1 }))).toBe(0.996891686342981);
    expect(at15(P.groupVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 1 }))).toBe(0.96163564159678);
    expect(at15(P.pulseRunError({ pulseWidthSeconds: 1, pulseDelaySeconds: 0, transitSeconds: 0 }, 1))).toBe(0.324413069334789);
    expect(at15(P.transitTime({ cellMetres: 1e-8, cells: 1000, layers: 10, ppw: 10, courant: 0.5, dimensions: 1 }))).toBe(3.50340317659937e-14);
    const d = P.dispersionError({ ppw: 20, courant: 0.5, dimensions: 1, pathWavelengths: 10 });
    expect(Number((d.phaseSlip as number).toPrecision(6))).toBe(0.19591);
    expect(Number(d.error.toPrecision(6))).toBe(0.429452);
    expect(Number(P.dispersionPpwForError({ courant: 0.5, dimensions: 1, pathWavelengths: 10 }, 0.01).toPrecision(6))).toBe(124.684);
    expect(Number(P.maxResonantCoupling(1000).toPrecision(4))).toBe(35.74);
    expect(P.requiredAmplitude({ intensityError: 0.01, monitor: 'flux' })).toBeCloseTo(0.1, 16);
    expect(Number(P.resonanceRunDuration({ q: 1000, frequencyHz: 1e9 }, 2.001e-3).toPrecision(5))).toBe(2.1988e-6);
  });
});

import { describe, expect, it } from 'vitest';
import {
  CpmlLine,
  HushInputError,
  bandPulseWidth,
  cpmlCoefficients,
  groupVelocityRatio,
  passesDuration,
  pulseEnergyLeft,
  pulseRunDuration,
  pulseRunError,
  pulseSourceDuration,
  resonanceRunDuration,
  resonanceRunError,
  ringdownResidual,
  ringdownTime,
  transitTime,
} from '../src/physics';
import { dtftAt, erfc, erfcInverse } from '../src/physics/internal';

/** (2/√π)·∫_x^∞ e^{−t²} dt by composite Simpson on [x, x + 12] (independent of the series and continued fraction). */
function erfcBySimpson(x: number): number {
  if (x < 0) return 2 - erfcBySimpson(-x);
  const n = 200000;
  const h = 12 / n;
  let s = Math.exp(-x * x) + Math.exp(-((x + 12) ** 2));
  for (let k = 1; k < n; k++) s += (k % 2 ? 4 : 2) * Math.exp(-((x + k * h) ** 2));
  return ((s * h) / 3) * (2 / Math.sqrt(Math.PI));
}

describe('erfc and its inverse', () => {
  it('match a Simpson quadrature of the defining integral to 1e-12 relative', () => {
    for (const x of [-1.5, 0, 0.3, 1, 1.99, 2, 2.01, 3, 5, 8]) {
      const ref = erfcBySimpson(x);
      expect(Math.abs(erfc(x) - ref) / ref).toBeLessThan(1e-12);
    }
    // Abramowitz & Stegun table 7.1 (recalled from memory): erfc(1) = 0.157299207050285…
    expect(erfc(1)).toBeCloseTo(0.157299207050285, 14);
  });
  it('the inverse round-trips over (0, 2)', () => {
    for (const y of [1e-300, 1e-30, 1e-8, 0.01, 0.5, 1, 1.3, 1.999]) {
      expect(Math.abs(erfc(erfcInverse(y)) - y) / y).toBeLessThan(1e-13);
    }
  });
});

describe('resonance run-length error (src/physics/run-error.ts)', () => {
  it('a = e^{−ωt/2Q} (physics.md §5) and ε = (1 + a)² − 1, the inverse of ringdownTime', () => {
    const t = ringdownTime(1000, 1e9, 1e-3);
    expect(ringdownResidual(1000, 1e9, t)).toBeCloseTo(1e-3, 15);
    expect(resonanceRunError({ q: 1000, frequencyHz: 1e9 }, t)).toBeCloseTo(1e-3 * 2.001, 15);
    expect(resonanceRunDuration({ q: 1000, frequencyHz: 1e9 }, 2.001e-3) / t).toBeCloseTo(1, 12);
    const random = resonanceRunError({ q: 1000, frequencyHz: 1e9, phase: 'random' }, t);
    expect(random).toBeCloseTo(1e-3 * Math.sqrt(2 + 1e-6), 15);
    // Excitation time shifts the ring-down; before it nothing has decayed.
    expect(resonanceRunError({ q: 1000, frequencyHz: 1e9, excitationSeconds: 1e-7 }, t + 1e-7)).toBeCloseTo(2.001e-3, 12);
    expect(resonanceRunError({ q: 1000, frequencyHz: 1e9, excitationSeconds: 1e-7 }, 5e-8)).toBe(3);
  });

  it('time domain: a Bragg-mirror cavity rings down at the Q of its linewidth, and a record cut at T misses (1 + a)² − 1 of its spectrum', () => {
    // 1-D lossless Yee line written here: S = 1 in vacuum, ε per E node, and the exact one-step boundary
    // E₀ⁿ⁺¹ = E₁ⁿ of the 1-D grid at S = 1 (Schneider, Understanding the FDTD Method, ch. 3).
    // Cavity: 24 vacuum cells (half a wave at 48 cells/λ) between mirrors of two quarter-wave pairs (4 cells of ε = 9, 12 of vacuum).
    const eps: number[] = [];
    const push = (n: number, e: number) => {
      for (let i = 0; i < n; i++) eps.push(e);
    };
    push(20, 1);
    push(4, 9);
    push(12, 1);
    push(4, 9);
    const cavityStart = eps.length;
    push(24, 1);
    push(4, 9);
    push(12, 1);
    push(4, 9);
    push(20, 1);
    const N = eps.length;
    const e = new Float64Array(N + 1);
    const h = new Float64Array(N);
    const ce = new Float64Array(N + 1);
    for (let i = 0; i <= N; i++) ce[i] = 1 / eps[Math.min(i, N - 1)];
    const steps = 60000;
    const rec = new Float64Array(steps);
    const src = cavityStart + 5;
    const probe = cavityStart + 17;
    // Zero-mean modulated Gaussian near the mode; e^{−121} of its peak where the ε = 9 layers stop carrying waves (ωΔt > 2 asin(1/3)).
    const tau = 40;
    const n0 = 250;
    const g = (t: number) => Math.exp(-((t / tau) ** 2)) * Math.sin(0.1309 * t);
    for (let n = 0; n < steps; n++) {
      for (let i = 0; i < N; i++) h[i] += e[i + 1] - e[i];
      const e1 = e[1];
      const eN = e[N - 1];
      for (let i = 1; i < N; i++) e[i] += ce[i] * (h[i] - h[i - 1]);
      e[0] = e1;
      e[N] = eN;
      if (n < 2 * n0 + 2) e[src] += g(n - n0) - g(n - 1 - n0);
      rec[n] = e[probe];
    }
    const z = new Float64Array(2);
    const power = (x: Float64Array, len: number, w: number) => {
      dtftAt(x, len, w, z);
      return z[0] * z[0] + z[1] * z[1];
    };
    // Peak of the full record's spectrum (golden section), then its half-power points (bisection): Q = ω₀/FWHM.
    let a = 0.128;
    let b = 0.134;
    const gr = (Math.sqrt(5) - 1) / 2;
    for (let it = 0; it < 50; it++) {
      const c1 = b - gr * (b - a);
      const c2 = a + gr * (b - a);
      if (power(rec, steps, c1) > power(rec, steps, c2)) b = c2;
      else a = c1;
    }
    const w0 = 0.5 * (a + b);
    const half = power(rec, steps, w0) / 2;
    const edge = (dir: number) => {
      let inner = w0;
      let outer = w0 + dir * 0.01;
      for (let it = 0; it < 50; it++) {
        const m = 0.5 * (inner + outer);
        if (power(rec, steps, m) > half) inner = m;
        else outer = m;
      }
      return 0.5 * (inner + outer);
    };
    const qLinewidth = w0 / (edge(1) - edge(-1));
    // Envelope from the projection on e^{jω₀n} over ten periods: its ratio between two windows is exactly e^{−γΔt} for one mode.
    const envelope = (start: number) => {
      let re = 0;
      let im = 0;
      for (let n = start; n < start + 480; n++) {
        re += rec[n] * Math.cos(w0 * n);
        im += rec[n] * Math.sin(w0 * n);
      }
      return Math.hypot(re, im);
    };
    const qDecay = (w0 * (30000 - 5000)) / (2 * Math.log(envelope(5000) / envelope(30000)));
    const qRel = Math.abs(qDecay - qLinewidth) / qLinewidth;
    const lines = [`Q from the linewidth ${qLinewidth.toFixed(3)}, from the decay ${qDecay.toFixed(3)} (relative difference ${qRel.toExponential(2)})`];
    expect(qRel).toBeLessThan(1e-3);
    // A record cut at T: worst relative change of |X|² within ±¾ of the linewidth (where the mode dominates the
    // spectrum), against (1 + a)² − 1, a = e^{−ω₀(T − t_e)/(2Q)} with Q from the linewidth and t_e the source's
    // peak (the model's run-length error). Partial DTFTs accumulated in one pass per frequency.
    const fwhm = w0 / qLinewidth;
    const cuts = [6000, 8000, 10000];
    const worst = cuts.map(() => 0);
    const end = 40000;
    for (let k = 0; k <= 240; k++) {
      const w = w0 - 0.75 * fwhm + (1.5 * fwhm * k) / 240;
      let re = 0;
      let im = 0;
      let c = 1;
      let s = 0;
      const cw = Math.cos(w);
      const sw = Math.sin(w);
      const partial: number[] = [];
      for (let n = 0; n < end; n++) {
        re += rec[n] * c;
        im -= rec[n] * s;
        const c2 = c * cw - s * sw;
        s = s * cw + c * sw;
        c = c2;
        if (n + 1 === cuts[partial.length]) partial.push(re * re + im * im);
      }
      const full = re * re + im * im;
      for (let j = 0; j < cuts.length; j++) worst[j] = Math.max(worst[j], Math.abs(partial[j] / full - 1));
    }
    let worstRatio = 0;
    cuts.forEach((T, j) => {
      // One time step is taken as 1 fs (the model wants seconds).
      const model = resonanceRunError({ q: qLinewidth, frequencyHz: w0 / (2 * Math.PI * 1e-15), excitationSeconds: n0 * 1e-15 }, T * 1e-15);
      const ratio = worst[j] / model;
      worstRatio = Math.max(worstRatio, Math.abs(ratio - 1));
      lines.push(`T = ${T} steps: measured ${worst[j].toExponential(3)}, model ${model.toExponential(3)} (ratio ${ratio.toFixed(4)})`);
    });
    console.log(`ring-down cavity (${((steps * N) / 1e6).toFixed(1)}e6 cell updates): ${lines.join('; ')}`);
    expect(worstRatio).toBeLessThan(0.05);
  });
});

describe('pulse run-length error (src/physics/run-error.ts)', () => {
  it('η(T) = ½erfc(√2(T − t_transit − t₀)/τ); ε = (1 + √η)² − 1; the duration inverts it', () => {
    const spec = { pulseWidthSeconds: 1e-14, transitSeconds: 3e-13 };
    const t0 = 6.2e-14;
    expect(pulseEnergyLeft(spec, 3e-13 + t0)).toBeCloseTo(0.5, 14);
    const T = 4e-13;
    const eta = 0.5 * erfcBySimpson((Math.SQRT2 * (T - 3e-13 - t0)) / 1e-14);
    expect(pulseEnergyLeft(spec, T) / eta).toBeCloseTo(1, 10);
    expect(pulseRunError(spec, T)).toBeCloseTo((1 + Math.sqrt(eta)) ** 2 - 1, 12);
    for (const eps of [1e-2, 1e-5, 1e-12]) {
      for (const phase of ['worst', 'random'] as const) {
        const d = pulseRunDuration({ ...spec, phase }, eps);
        expect(pulseRunError({ ...spec, phase }, d) / eps).toBeCloseTo(1, 9);
      }
    }
    expect(pulseSourceDuration(1e-14)).toBeCloseTo(1.24e-13, 27);
  });

  it('a band pulse: spectrum e^{−(Δω·τ/2)²} at 1e-2 of its peak at the band edges (Fourier pair of the Gaussian)', () => {
    const tau = bandPulseWidth(190e12, 200e12);
    const dw = Math.PI * 10e12;
    expect(Math.exp(-(((dw * tau) / 2) ** 2))).toBeCloseTo(1e-2, 14);
    expect(() => bandPulseWidth(193e12, 193e12)).toThrow(/single frequency is a continuous wave/);
  });

  it('transit: interior plus one absorber at the grid group velocity; passes add to the source', () => {
    const t = transitTime({ cellMetres: 1e-8, cells: 1000, layers: 10, ppw: 10, courant: 0.5, dimensions: 1 });
    expect(t).toBeCloseTo((1010 * 1e-8) / (299792458 * groupVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 1 })), 25);
    expect(passesDuration(3, 1e-12, 2e-13)).toBeCloseTo(3.2e-12, 25);
  });

  it('time domain: the energy left in a 1-D line follows the transit at the group velocity, not at c/n', () => {
    // S = 0.5 (dispersive), CPML on both ends; a modulated Gaussian of width τ = 80 steps at 8 cells/λ,
    // launched 2 cells from the left absorber; its right-going half crosses d = 1198 cells to the right absorber.
    const S = 0.5;
    const layers = 40;
    const coeffs = cpmlCoefficients({ layers, order: 3 }, S);
    const cells = 1200;
    const line = new CpmlLine({ cells, courantMedium: S, left: coeffs, right: coeffs });
    const src = line.leftInterface + 2;
    const d = line.rightInterface - src;
    const tau = 80;
    const n0 = Math.ceil(6.2 * tau);
    const w0 = (2 * Math.PI * S) / 8;
    const g = (t: number) => Math.exp(-((t / tau) ** 2)) * Math.sin(w0 * t);
    const steps = 4000;
    const energy = new Float64Array(steps);
    const e = line.e;
    const hh = line.h;
    for (let n = 0; n < steps; n++) {
      line.step();
      if (n < 2 * n0 + 2) e[src] += g(n - n0) - g(n - 1 - n0);
      let w = 0;
      for (let i = line.leftInterface; i < line.rightInterface; i++) w += e[i] * e[i] + hh[i] * hh[i];
      energy[n] = w;
    }
    // All of the right-going pulse is inside once the source is done and the left-going half has left.
    const total = energy[2 * n0 + 200];
    const stepsOf = (vg: number) => d / (S * vg);
    const ppwShort = (2 * Math.PI * S) / (w0 + (2 * Math.sqrt(Math.log(100))) / tau);
    const vgCentre = groupVelocityRatio({ ppw: 8, courant: S, dimensions: 1 });
    const vgShort = groupVelocityRatio({ ppw: ppwShort, courant: S, dimensions: 1 });
    // One time step is taken as 1 fs (the model wants seconds).
    const model = (vg: number, T: number) => pulseEnergyLeft({ pulseWidthSeconds: tau * 1e-15, pulseDelaySeconds: n0 * 1e-15, transitSeconds: stepsOf(vg) * 1e-15 }, T * 1e-15);
    const firstBelow = (f: (T: number) => number, level: number) => {
      for (let T = 2 * n0 + 200; T < steps; T++) if (f(T) <= level) return T;
      return NaN;
    };
    const measured = (T: number) => energy[T] / total;
    const rows: string[] = [];
    for (const level of [1e-2, 1e-4, 1e-6]) {
      const tm = firstBelow(measured, level);
      const tShort = firstBelow((T) => model(vgShort, T), level);
      const tCentre = firstBelow((T) => model(vgCentre, T), level);
      const tLight = firstBelow((T) => model(1, T), level);
      rows.push(`η ≤ ${level}: measured ${tm}, model at v_g of the band edge ${tShort}, at v_g of the centre ${tCentre}, at c/n ${tLight}`);
      // The band edge's group velocity bounds the run; the centre's is within a few pulse widths; c/n is far too early.
      expect(tShort).toBeGreaterThanOrEqual(tm);
      expect(Math.abs(tCentre - tm)).toBeLessThan(0.5 * tau);
      expect(tm - tLight).toBeGreaterThan(2 * tau);
    }
    console.log(`pulse energy left (${((steps * line.nodes) / 1e6).toFixed(1)}e6 cell updates; v_g/v ${vgCentre.toFixed(5)} at the centre, ${vgShort.toFixed(5)} at the band edge): ${rows.join('; ')}`);
    expect(steps * line.nodes).toBeLessThan(1e7);
  });
});

describe('bad input', () => {
  it('gets specific errors', () => {
    const cases: [() => unknown, RegExp][] = [
      [() => resonanceRunError({ q: 0, frequencyHz: 1e9 }, 1e-6), /quality factor must be greater than 0/],
      [() => resonanceRunError({ q: 10, frequencyHz: 1e9 }, 0), /duration must be greater than 0/],
      [() => resonanceRunDuration({ q: 10, frequencyHz: 1e9 }, 2), /run-length error must be at least 1e-300 and at most 1/],
      [() => pulseRunError({ pulseWidthSeconds: -1, transitSeconds: 0 }, 1), /pulse width must be greater than 0/],
      [() => transitTime({ cellMetres: 1e-8, cells: 10, layers: 300, ppw: 10 }), /layers must be a whole number from 0 to 200/],
      [() => transitTime({ cellMetres: 1e-8, cells: 10, layers: 10, ppw: 1, dimensions: 1, courant: 0.5 }), /cells per wavelength must be more than 3/],
      [() => passesDuration(0, 1), /passes must be greater than 0/],
      [() => erfcInverse(2), /erfc value must be greater than 0 and less than 2/],
    ];
    for (const [f, m] of cases) {
      expect(f).toThrow(HushInputError);
      expect(f).toThrow(m);
    }
  });
});

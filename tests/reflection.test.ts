import { describe, expect, it } from 'vitest';
import {
  HushInputError,
  reflection,
  reflectionAtWavenumber,
  discreteWavenumber,
  sigmaOpt,
  sigmaOptNorm,
  cpmlCoefficients,
  resolveDesign,
  continuousReflection,
  ETA0,
} from '../src/physics';

describe('σ_opt', () => {
  it('is 0.8(m+1)/(η₀Δ√ε_r) (Taflove & Hagness, 3rd ed., ch. 7; Gedney 1996)', () => {
    // Δ = 10 nm, m = 3, n = 1.5: 0.8·4/(376.73·1e-8·1.5)
    expect(sigmaOpt(3, 1e-8, 1.5)).toBeCloseTo(3.2 / (ETA0 * 1e-8 * 1.5), 6);
    expect(sigmaOptNorm(3)).toBeCloseTo(3.2, 15);
  });
  it('≈ (m+1)/(150π·Δ·√ε_r), the form quoted alongside it (Taflove & Hagness, 3rd ed., ch. 7): within 0.1 %', () => {
    const d = 1e-3;
    expect(sigmaOpt(4, d, 2) / (5 / (150 * Math.PI * d * 2))).toBeCloseTo(1, 2);
  });
  it('gives R(0) = e^{−1.6·N} in continuous theory (derived, physics.md §2)', () => {
    for (const N of [4, 10, 17]) {
      const r = reflection({ layers: N, order: 3 }, { ppw: 30 });
      expect(r.continuous).toBeCloseTo(Math.exp(-1.6 * N), 12);
    }
  });
});

describe('continuous-theory formula', () => {
  it('R(θ) = exp(−2nη₀σ_max d cosθ/(m+1)) (Taflove & Hagness, 3rd ed., ch. 7)', () => {
    const d = resolveDesign({ layers: 8, order: 2, strength: 0.7 });
    const sigmaNorm = 0.7 * 0.8 * 3; // σ_max·η₀·Δ·n
    const expected = Math.exp((-2 * sigmaNorm * 8 * Math.cos(Math.PI / 6)) / 3);
    expect(continuousReflection(d, 20, 30)).toBeCloseTo(expected, 14);
  });
  it('geometric grading follows exp(−2nη₀σ₀Δ(g^N − 1)cosθ/ln g) (physics.md §2) and is normalised like σ_opt', () => {
    const d = resolveDesign({ layers: 10, order: 3, grading: 'geometric', geometricRatio: 1.5 });
    expect(continuousReflection(d, 20, 0)).toBeCloseTo(Math.exp(-16), 14);
  });
  it('with a CFS α the numeric integral reduces to the closed form as α → 0 (derived)', () => {
    const a = resolveDesign({ layers: 10, order: 3, alphaMaxNorm: 1e-9 });
    const b = resolveDesign({ layers: 10, order: 3 });
    expect(continuousReflection(a, 20, 10) / continuousReflection(b, 20, 10)).toBeCloseTo(1, 8);
  });
});

describe('exact discrete reflection', () => {
  it('worked example: 12 layers, m = 3, σ_opt, 20 cells/λ, default Courant', () => {
    const r = reflection({ layers: 12, order: 3 }, { ppw: 20 });
    expect(r.amplitude).toBeCloseTo(1.612019089787947e-5, 18);
  });
  it('at σ_opt and 20 cells/λ: about 10 % with 2 layers and about 1e-5 with 12 (common practice)', () => {
    const two = reflection({ layers: 2, order: 3 }, { ppw: 20 }).amplitude;
    const twelve = reflection({ layers: 12, order: 3 }, { ppw: 20 }).amplitude;
    expect(two).toBeGreaterThan(0.03);
    expect(two).toBeLessThan(0.3);
    expect(twelve).toBeGreaterThan(3e-6);
    expect(twelve).toBeLessThan(3e-5);
  });
  it('for 12 layers the reflection stays within a small factor (< 3) from 0° to 40° (common practice)', () => {
    const vals = [0, 10, 20, 30, 40].map((a) => reflection({ layers: 12, order: 3 }, { ppw: 20, angleDeg: a }).amplitude);
    expect(Math.max(...vals) / Math.min(...vals)).toBeLessThan(3);
  });
  it('is 10–1000× worse than the continuous formula at realistic thickness (physics.md §2)', () => {
    for (const N of [8, 10, 12]) {
      const r = reflection({ layers: N, order: 3 }, { ppw: 20 });
      const ratio = r.amplitude / r.continuous;
      expect(ratio).toBeGreaterThan(10);
    }
  });
  it('with weak, smooth grading approaches the continuous formula as N grows (Taflove & Hagness, 3rd ed., ch. 7; Oskooi et al. 2008)', () => {
    // Fixed continuous round trip R = 1e-2, so σ_max falls as 1/N and the grading gets smoother.
    const ratios = [16, 32, 64, 128].map((N) => {
      const r = reflection({ layers: N, order: 2, strength: Math.log(100) / (1.6 * N) }, { ppw: 40 });
      return r.amplitude / r.continuous;
    });
    for (let i = 1; i < ratios.length; i++) expect(Math.abs(1 - ratios[i])).toBeLessThan(Math.abs(1 - ratios[i - 1]));
    expect(ratios[3]).toBeGreaterThan(0.93);
    expect(ratios[3]).toBeLessThan(1.07);
  });
  it('at fixed round-trip attenuation falls as N^−(m+1) (Oskooi, Zhang & Johnson, Opt. Express 16, 11376 (2008))', () => {
    for (const m of [2, 3, 4]) {
      const amp = (N: number) => reflection({ layers: N, order: m, strength: Math.log(1e20) / (1.6 * N) }, { ppw: 20 }).amplitude;
      const slope = Math.log(amp(80) / amp(40)) / Math.log(2);
      expect(slope).toBeCloseTo(-(m + 1), 1);
    }
  });
  it('depends on the background only through S/n and the medium wavelength (derived, physics.md §3)', () => {
    const a = reflection({ layers: 8, order: 3 }, { ppw: 15, courant: 0.5, index: 2, angleDeg: 20 });
    const b = reflection({ layers: 8, order: 3 }, { ppw: 15, courant: 0.25, index: 1, angleDeg: 20 });
    expect(a.amplitude).toBeCloseTo(b.amplitude, 15);
  });
  it('angle form and wavenumber form agree (derived: k_t = |k̃| sin θ)', () => {
    const S = 0.5;
    const q = discreteWavenumber(18, S, 35);
    const kt = q * Math.sin((35 * Math.PI) / 180);
    const a = reflection({ layers: 6, order: 2, kappaMax: 3 }, { ppw: 18, courant: S, dimensions: 2, angleDeg: 35 });
    const b = reflectionAtWavenumber({ layers: 6, order: 2, kappaMax: 3 }, (2 * Math.PI * S) / 18, kt, S);
    expect(b.amplitude).toBeCloseTo(a.amplitude, 14);
  });
  it('has no grading reflection when σ = 0 and κ = 1: the bare conductor reflects fully (derived)', () => {
    const r = reflection({ layers: 5, order: 3, strength: 1e-12 }, { ppw: 20 });
    expect(r.amplitude).toBeCloseTo(1, 9);
  });
  it('stays finite for very thick, strong absorbers (rescaled shooting)', () => {
    const r = reflection({ layers: 200, order: 3, strength: 20 }, { ppw: 20 });
    expect(Number.isFinite(r.amplitude)).toBe(true);
    expect(r.amplitude).toBeLessThan(1);
  });
  it('CPML coefficients: b = exp(−(σ/κ+α)Δt/ε₀), a = σ(b−1)/(σκ+κ²α) (Roden & Gedney 2000)', () => {
    const d = resolveDesign({ layers: 4, order: 2, kappaMax: 3, alphaMaxNorm: 0.2 });
    const S = 0.5;
    const c = cpmlCoefficients(d, S);
    const u = 0.75; // E node at depth 3
    const sigma = 2.4 * u * u;
    const kappa = 1 + 2 * u * u;
    const alpha = 0.2 * (1 - u);
    const b = Math.exp(-(sigma / kappa + alpha) * S);
    expect(c.eB[3]).toBeCloseTo(b, 15);
    expect(c.eA[3]).toBeCloseTo((sigma * (b - 1)) / (sigma * kappa + kappa * kappa * alpha), 15);
    expect(c.eInvKappa[3]).toBeCloseTo(1 / kappa, 15);
    expect(c.eA[0]).toBe(0);
  });
});

describe('bad inputs throw typed errors with specific messages', () => {
  const ok = { layers: 8, order: 3 };
  const cases: [string, () => unknown, RegExp][] = [
    ['N < 1', () => reflection({ layers: 0, order: 3 }, { ppw: 20 }), /layers must be a whole number from 1 to 200 \(got 0\)/],
    ['fractional N', () => reflection({ layers: 2.5, order: 3 }, { ppw: 20 }), /layers must be a whole number/],
    ['NaN order', () => reflection({ layers: 4, order: NaN }, { ppw: 20 }), /grading order must be a finite number \(got NaN\)/],
    ['ppw below limit', () => reflection(ok, { ppw: 2.5 }), /cells per wavelength must be more than 2\.95/],
    ['Courant above limit', () => reflection(ok, { ppw: 20, courant: 0.6 }), /above the 3-D stability limit/],
    ['Courant above 2-D limit', () => reflection(ok, { ppw: 20, courant: 0.75, dimensions: 2 }), /2-D stability limit/],
    ['angle 90', () => reflection(ok, { ppw: 20, angleDeg: 90 }), /angle must be at least 0 and less than 90 degrees/],
    ['negative angle', () => reflection(ok, { ppw: 20, angleDeg: -5 }), /angle must be at least 0/],
    ['NaN ppw', () => reflection(ok, { ppw: NaN }), /cells per wavelength must be a finite number/],
    ['index < 1', () => reflection(ok, { ppw: 20, index: 0.5 }), /background index must be at least 1/],
    ['kappa < 1', () => reflection({ layers: 4, order: 3, kappaMax: 0.5 }, { ppw: 20 }), /kappa max must be at least 1/],
    ['strength 0', () => reflection({ layers: 4, order: 3, strength: 0 }, { ppw: 20 }), /strength must be greater than 0/],
    ['1-D oblique', () => reflection(ok, { ppw: 20, courant: 0.9, dimensions: 1, angleDeg: 10 }), /1-D grid has normal incidence only/],
    ['string layers', () => reflection({ layers: '8' as unknown as number, order: 3 }, { ppw: 20 }), /layers must be a finite number \(got "8"\)/],
  ];
  for (const [name, f, msg] of cases) {
    it(name, () => {
      expect(f).toThrow(HushInputError);
      expect(f).toThrow(msg);
    });
  }
});

import { describe, expect, it } from 'vitest';
import {
  HushInputError,
  reflection,
  reflectionAtWavenumber,
  discreteWavenumber,
  discreteWavenumber3D,
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
    // To 5e-16 absolute: r is the small difference of two order-1 waves at the interface, so a
    // last-place change of one node's σ moves it by about 1e-16 (issue 13's kernel moved it by
    // 9.8e-17 from the value of the straightforward evaluation, tests/kernel-reference.test.ts).
    expect(r.amplitude).toBeCloseTo(1.612019089787947e-5, 15);
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

describe('sampling conventions (issue 10 §1, physics.md §6)', () => {
  it('reproduce the independently measured check values at σ_opt and S = 0.99/√3 (physics.md §6): N=12, m=4, 40 cells/λ → node 9.9e-8, average 2.8e-7; N=12, m=3, 20 cells/λ, lagged → about 5 %', () => {
    const node = reflection({ layers: 12, order: 4 }, { ppw: 40 }).amplitude;
    const average = reflection({ layers: 12, order: 4, sampling: 'average' }, { ppw: 40 }).amplitude;
    const lagged = reflection({ layers: 12, order: 3, sampling: 'lagged' }, { ppw: 20 }).amplitude;
    // The check values are quoted to two digits.
    expect(node).toBeGreaterThan(9.85e-8);
    expect(node).toBeLessThan(9.95e-8);
    expect(average).toBeGreaterThan(2.75e-7);
    expect(average).toBeLessThan(2.85e-7);
    expect(lagged).toBeGreaterThan(0.045);
    expect(lagged).toBeLessThan(0.055);
    // 'node' is the default convention, bit for bit.
    expect(reflection({ layers: 12, order: 4, sampling: 'node' }, { ppw: 40 }).amplitude).toBe(node);
  });

  it('sample each node as the issue defines them (derived from the definitions, Roden & Gedney 2000 for b)', () => {
    const N = 4;
    const m = 2;
    const S = 0.5;
    const sigmaMax = 0.8 * (m + 1); // σ_opt, normalised
    const b = (sigma: number) => Math.exp(-sigma * S); // κ = 1, α = 0
    const node = cpmlCoefficients({ layers: N, order: m }, S);
    const offset = cpmlCoefficients({ layers: N, order: m, sampling: 'offset' }, S);
    const lagged = cpmlCoefficients({ layers: N, order: m, sampling: 'lagged' }, S);
    const average = cpmlCoefficients({ layers: N, order: m, sampling: 'average' }, S);
    for (let i = 0; i < N; i++) {
      expect(node.eB[i]).toBeCloseTo(b(sigmaMax * (i / N) ** m), 15);
      expect(node.hB[i]).toBeCloseTo(b(sigmaMax * ((i + 0.5) / N) ** m), 15);
      // offset: every node at depth d sampled at (d + ½)/N, capped at 1.
      expect(offset.eB[i]).toBeCloseTo(b(sigmaMax * Math.min((i + 0.5) / N, 1) ** m), 15);
      expect(offset.hB[i]).toBeCloseTo(b(sigmaMax * ((i + 1) / N) ** m), 15);
      // lagged: the H node at depth i + ½ takes the E node's value at depth i.
      expect(lagged.hB[i]).toBe(lagged.eB[i]);
      expect(lagged.eB[i]).toBe(node.eB[i]);
      // average: the H node's cell [i, i + 1] lies inside the absorber: ∫ σ_max (x/N)^m dx.
      const cell = (sigmaMax * N * (((i + 1) / N) ** (m + 1) - (i / N) ** (m + 1))) / (m + 1);
      expect(average.hB[i]).toBeCloseTo(b(cell), 15);
    }
    // average: the E node at depth 0 integrates over [0, ½] only (the part outside the absorber counts as zero), so it is lossy.
    expect(average.eB[0]).toBeCloseTo(b((sigmaMax * N * (0.5 / N) ** (m + 1)) / (m + 1)), 15);
    expect(average.eA[0]).toBeLessThan(0);
    expect(offset.eA[0]).toBeLessThan(0);
    expect(node.eA[0]).toBe(0);
  });

  it("'average' equals a numerical integral of every profile over each node's cell, for geometric grading with κ and α too (independent computation: composite Simpson rule, 2,000 panels)", () => {
    const design = { layers: 6, order: 3, grading: 'geometric' as const, geometricRatio: 1.7, kappaMax: 4, alphaMaxNorm: 0.3, alphaOrder: 2 };
    const d = resolveDesign(design);
    const N = d.layers;
    const g = d.geometricRatio;
    const sigma0 = (0.8 * N * Math.log(g)) / (g ** N - 1);
    const profiles = (x: number) => [sigma0 * g ** x, (d.kappaMax - 1) * (x / N), d.alphaMaxNorm * (1 - x / N) ** d.alphaOrder];
    const simpson = (k: number, a: number, b: number) => {
      const n = 2000;
      const h = (b - a) / n;
      let sum = profiles(a)[k] + profiles(b)[k];
      for (let j = 1; j < n; j++) sum += (j % 2 ? 4 : 2) * profiles(a + j * h)[k];
      return (sum * h) / 3;
    };
    const S = 0.4;
    const c = cpmlCoefficients({ ...design, sampling: 'average' }, S);
    for (let i = 0; i <= N; i++) {
      const a = Math.max(i - 0.5, 0);
      const b2 = Math.min(i + 0.5, N);
      const sigma = simpson(0, a, b2);
      const kappa = 1 + simpson(1, a, b2);
      const alpha = simpson(2, a, b2);
      expect(c.eInvKappa[i]).toBeCloseTo(1 / kappa, 12);
      expect(c.eB[i]).toBeCloseTo(Math.exp(-(sigma / kappa + alpha) * S), 12);
    }
  });

  it('rejects an unknown convention with the allowed names', () => {
    expect(() => reflection({ layers: 8, order: 3, sampling: 'cell' as never }, { ppw: 20 })).toThrow(/sampling must be one of "node", "average", "offset", "lagged" \(got "cell"\)/);
  });
});

describe('evanescent incidence (issue 10 §2, physics.md §6)', () => {
  const tiny = 1e-300; // σ → 0 (a strength must be positive)
  it('with σ = 0 the conductor at depth N gives |r| = e^{−2N/L} (physics.md §6): exactly, up to the rounding of the split (absolute 1e-15: the split subtracts terms of order 1)', () => {
    for (const [N, L] of [
      [8, 1],
      [8, 2.5],
      [12, 5],
      [5, 10],
    ]) {
      for (const dimensions of [2, 3]) {
        const r = reflection({ layers: N, order: 3, strength: tiny }, { ppw: 20, decayCells: L, dimensions });
        const exact = Math.exp((-2 * N) / L);
        expect(Math.abs(r.amplitude - exact)).toBeLessThan(1e-15 + 1e-13 * exact);
        // the perfect conductor reflects with a sign flip: r = −e^{−2N/L}
        expect(Math.abs(r.phaseDeg)).toBeCloseTo(180, 6);
        // continuous theory: exp(−(2/L)∫κ dx) = e^{−2N/L} at κ = 1 (derived in continuous.ts)
        expect(r.continuous).toBeCloseTo(Math.exp((-2 * N) / L), 14);
      }
    }
  });
  it('κ > 1 lowers it (physics.md §6) where the decay spans more than a cell or so; at L = 1 cell κ\'s own grading reflects more (seen: 8.0e-6 against 1.1e-7)', () => {
    for (const L of [2, 3, 5, 10]) {
      const plain = reflection({ layers: 8, order: 3, strength: tiny }, { ppw: 20, decayCells: L, dimensions: 2 }).amplitude;
      const stretched = reflection({ layers: 8, order: 3, strength: tiny, kappaMax: 3 }, { ppw: 20, decayCells: L, dimensions: 2 });
      expect(stretched.amplitude).toBeLessThan(plain);
      // continuous theory: e^{−(2/L)·N·(1 + (κ_max − 1)/(m + 1))} (derived from ∫κ dx)
      expect(stretched.continuous).toBeCloseTo(Math.exp((-2 * 8 * (1 + 2 / 4)) / L), 14);
    }
    const atOne = reflection({ layers: 8, order: 3, strength: tiny, kappaMax: 3 }, { ppw: 20, decayCells: 1, dimensions: 2 }).amplitude;
    expect(atOne).toBeGreaterThan(reflection({ layers: 8, order: 3, strength: tiny }, { ppw: 20, decayCells: 1, dimensions: 2 }).amplitude);
  });
  it('σ alone can raise it (physics.md §6): σ_opt at 20 cells/λ and L = 1', () => {
    const bare = reflection({ layers: 8, order: 3, strength: tiny }, { ppw: 20, decayCells: 1, dimensions: 2 }).amplitude;
    expect(reflection({ layers: 8, order: 3 }, { ppw: 20, decayCells: 1, dimensions: 2 }).amplitude).toBeGreaterThan(bare);
  });
  it('agrees with the wavenumber form at the same transverse factor (derived: K_t²/4 = sin²(ωΔt/2)/S_m² + sinh²(1/(2L)))', () => {
    const S = 0.5;
    const ppw = 18;
    const L = 3;
    const omegaDt = (2 * Math.PI * S) / ppw;
    const f = (Math.sin(omegaDt / 2) / S) ** 2 + Math.sinh(1 / (2 * L)) ** 2;
    const kt = 2 * Math.asin(Math.sqrt(f));
    const design = { layers: 6, order: 2, kappaMax: 3, alphaMaxNorm: 0.1 };
    const a = reflection(design, { ppw, courant: S, dimensions: 2, decayCells: L });
    expect(reflectionAtWavenumber(design, omegaDt, kt, S).amplitude).toBeCloseTo(a.amplitude, 14);
  });
  it('refuses what it cannot be, with a specific message', () => {
    const d = { layers: 8, order: 3 };
    expect(() => reflection(d, { ppw: 20, decayCells: 3, angleDeg: 10 })).toThrow(/give either a decay length .* or an angle of incidence .*, not both/);
    expect(() => reflection(d, { ppw: 20, decayCells: 3, dimensions: 1, courant: 0.9 })).toThrow(/a 1-D grid has no transverse direction, so no evanescent field/);
    // 2-D: K_t²/4 ≤ 1; a decay of 0.3 cells needs sinh²(1/0.6) ≈ 6.3.
    expect(() => reflection(d, { ppw: 20, decayCells: 0.3, dimensions: 2 })).toThrow(/needs a transverse wavenumber no 2-D grid carries .* the shortest decay this grid carries at that frequency is 0\.5/);
    expect(() => reflection(d, { ppw: 20, decayCells: 0 })).toThrow(/decay length must be greater than 0/);
  });
});

describe('3-D directions (issue 10 §4)', () => {
  it('azimuth 0 is the in-plane value, bit for bit, and the grid symmetry φ → 90° − φ holds (derived from the Yee relation, physics.md §4)', () => {
    const d = { layers: 8, order: 3, kappaMax: 2 };
    const inPlane = reflection(d, { ppw: 12, angleDeg: 40 }).amplitude;
    expect(reflection(d, { ppw: 12, angleDeg: 40, azimuthDeg: 0 }).amplitude).toBe(inPlane);
    expect(reflection(d, { ppw: 12, angleDeg: 40, azimuthDeg: 90 }).amplitude).toBeCloseTo(inPlane, 14);
    expect(reflection(d, { ppw: 12, angleDeg: 40, azimuthDeg: 30 }).amplitude).toBeCloseTo(reflection(d, { ppw: 12, angleDeg: 40, azimuthDeg: 60 }).amplitude, 14);
  });
  it('the direction solver meets the Yee relation and is dispersion-free along the body diagonal at S = 1/√3 (derived from physics.md §4, as the 2-D diagonal at 1/√2)', () => {
    const S = 1 / Math.sqrt(3);
    const theta = (Math.acos(1 / Math.sqrt(3)) * 180) / Math.PI;
    for (const ppw of [5, 10, 40]) expect(discreteWavenumber3D(ppw, S, theta, 45)).toBeCloseTo((2 * Math.PI) / ppw, 12);
    const [ppw, sm, th, ph] = [7, 0.45, 33, 17];
    const q = discreteWavenumber3D(ppw, sm, th, ph);
    const c = [Math.cos((th * Math.PI) / 180), Math.sin((th * Math.PI) / 180) * Math.cos((ph * Math.PI) / 180), Math.sin((th * Math.PI) / 180) * Math.sin((ph * Math.PI) / 180)];
    const lhs = c.reduce((s, ci) => s + Math.sin((q * ci) / 2) ** 2, 0);
    expect(lhs).toBeCloseTo((Math.sin((Math.PI * sm) / ppw) / sm) ** 2, 14);
  });
  it('refuses an azimuth on a 2-D grid', () => {
    expect(() => reflection({ layers: 8, order: 3 }, { ppw: 20, angleDeg: 30, azimuthDeg: 10, dimensions: 2 })).toThrow(/a 2-D grid has one plane of incidence only/);
  });
  it('takes the default Courant number 0.99/√D of the grid it is given (common practice: a small margin below the limit)', () => {
    const d = { layers: 8, order: 3 };
    expect(reflection(d, { ppw: 20, dimensions: 2 }).amplitude).toBe(reflection(d, { ppw: 20, dimensions: 2, courant: 0.99 / Math.SQRT2 }).amplitude);
    expect(reflection(d, { ppw: 20, dimensions: 1 }).amplitude).toBe(reflection(d, { ppw: 20, dimensions: 1, courant: 0.99 }).amplitude);
    expect(reflection(d, { ppw: 20 }).amplitude).toBe(reflection(d, { ppw: 20, courant: 0.99 / Math.sqrt(3) }).amplitude);
  });
});

import { describe, expect, it } from 'vitest';
import {
  courantLimit,
  discreteAngle,
  discreteWavenumber,
  minimumResolvablePpw,
  numericalPhaseVelocity,
  HushInputError,
} from '../src/physics';

describe('Courant limit', () => {
  it('is 1/√D on a uniform cubic grid (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    expect(courantLimit(1)).toBe(1);
    expect(courantLimit(2)).toBeCloseTo(Math.SQRT1_2, 15);
    expect(courantLimit(3)).toBeCloseTo(1 / Math.sqrt(3), 15);
  });
  it('rejects 0, 4 and 2.5 dimensions with a typed error', () => {
    for (const d of [0, 4, 2.5, NaN]) expect(() => courantLimit(d)).toThrow(HushInputError);
  });
});

describe('numerical phase velocity', () => {
  it('1-D, S = 0.5: v_p/c ≈ 0.9969 at 20 cells/λ and ≈ 0.9873 at 10 (Schneider, Understanding the FDTD Method, chapter on dispersion)', () => {
    expect(numericalPhaseVelocity(20, 0.5)).toBeCloseTo(0.9969, 4);
    expect(numericalPhaseVelocity(10, 0.5)).toBeCloseTo(0.9873, 4);
  });
  it('1-D, S = 1 is dispersion-free (Schneider, Understanding the FDTD Method, the "magic time step")', () => {
    for (const p of [3, 5, 10, 40]) expect(numericalPhaseVelocity(p, 1)).toBeCloseTo(1, 12);
  });
  it('is slowest along the axis and fastest along the diagonal in 2-D (Taflove & Hagness, 3rd ed., ch. 4)', () => {
    const axis = numericalPhaseVelocity(10, 0.5, 0);
    const diag = numericalPhaseVelocity(10, 0.5, 45);
    expect(diag).toBeGreaterThan(axis);
    expect(numericalPhaseVelocity(10, 0.5, 30)).toBeGreaterThan(axis);
    expect(numericalPhaseVelocity(10, 0.5, 30)).toBeLessThan(diag);
  });
  it('in a medium of index n depends only on S/n (derived: the medium is a vacuum with speed c/n)', () => {
    expect(numericalPhaseVelocity(15, 0.5, 20, 2)).toBeCloseTo(numericalPhaseVelocity(15, 0.25, 20, 1), 14);
  });
  it('the discrete wavevector along θ satisfies the Yee dispersion relation (physics.md §4)', () => {
    const S = 0.55;
    for (const th of [0, 13, 37, 45, 61, 80]) {
      const q = discreteWavenumber(12, S, th);
      const t = (th * Math.PI) / 180;
      const lhs = Math.sin((Math.PI * S) / 12) ** 2 / S ** 2;
      const rhs = Math.sin((q * Math.cos(t)) / 2) ** 2 + Math.sin((q * Math.sin(t)) / 2) ** 2;
      expect(rhs).toBeCloseTo(lhs, 14);
    }
  });
  it('discreteAngle inverts the wavevector construction (derived)', () => {
    const S = 0.5;
    const q = discreteWavenumber(16, S, 33);
    const kt = q * Math.sin((33 * Math.PI) / 180);
    const { angleDeg } = discreteAngle((2 * Math.PI * S) / 16, kt, S);
    expect(angleDeg).toBeCloseTo(33, 10);
  });
  it('has a resolvable limit: 2 cells per wavelength at S = 1 (Nyquist), more at smaller S (derived)', () => {
    expect(minimumResolvablePpw(1, 0)).toBeCloseTo(2, 12);
    const lim = minimumResolvablePpw(0.5, 0);
    expect(lim).toBeCloseTo((Math.PI * 0.5) / Math.asin(0.5), 12);
    expect(() => numericalPhaseVelocity(lim * 0.99, 0.5)).toThrow(/cells per wavelength must be more than/);
    expect(() => numericalPhaseVelocity(NaN, 0.5)).toThrow(HushInputError);
  });
});

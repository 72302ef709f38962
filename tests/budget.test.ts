import { describe, expect, it } from 'vitest';
import { HushInputError, intensityErrorFromAmplitude, requiredAmplitude, rippleFromReflection, reflectionFromRipple } from '../src/physics';

describe('accuracy budget (physics.md §1)', () => {
  it('1 % worst-case intensity error → |r| = √1.01 − 1 ≈ 4.988e-3 (derived)', () => {
    expect(requiredAmplitude({ intensityError: 0.01 })).toBeCloseTo(Math.sqrt(1.01) - 1, 15);
    expect(requiredAmplitude({ intensityError: 0.01 })).toBeCloseTo(4.988e-3, 6);
  });
  it('the amplitude, not the power, sets the error: 1 % needs ≈ 5e-3, not 1e-2 (physics.md §1)', () => {
    expect(requiredAmplitude({ intensityError: 0.01 })).toBeLessThan(0.0051);
  });
  it('round trips in both directions for every option (derived)', () => {
    for (const phase of ['worst', 'random'] as const) {
      for (const o of [{}, { coupling: 0.3 }, { faces: 4 }, { share: 0.5 }, { coupling: 0.5, faces: 2, share: 0.25 }]) {
        for (const eps of [1e-4, 1e-2, 0.3]) {
          const r = requiredAmplitude({ intensityError: eps, phase, ...o });
          expect(intensityErrorFromAmplitude(r, { phase, ...o })).toBeCloseTo(eps, 12);
        }
      }
    }
  });
  it('random phases: RMS error √2·c|r| for small echoes, so |r| may be √2 larger than worst case (derived)', () => {
    const worst = requiredAmplitude({ intensityError: 1e-4 });
    const rms = requiredAmplitude({ intensityError: 1e-4, phase: 'random' });
    expect(rms / worst).toBeCloseTo(Math.SQRT2, 3);
    // RMS of 2A·cosφ + A² over φ, by direct averaging (independent computation).
    const A = 0.05;
    let s = 0;
    const n = 100000;
    for (let k = 0; k < n; k++) {
      const v = 2 * A * Math.cos((2 * Math.PI * (k + 0.5)) / n) + A * A;
      s += v * v;
    }
    expect(intensityErrorFromAmplitude(A, { phase: 'random' })).toBeCloseTo(Math.sqrt(s / n), 12);
  });
  it('K faces add amplitudes in the worst case and in quadrature with random phases (physics.md §1)', () => {
    expect(requiredAmplitude({ intensityError: 0.01, faces: 4 })).toBeCloseTo(requiredAmplitude({ intensityError: 0.01 }) / 4, 15);
    expect(requiredAmplitude({ intensityError: 0.01, faces: 4, phase: 'random' })).toBeCloseTo(
      requiredAmplitude({ intensityError: 0.01, phase: 'random' }) / 2,
      15,
    );
  });
  it('a coupling c ≤ 1 relaxes the requirement by 1/c; a share F tightens it (derived)', () => {
    expect(requiredAmplitude({ intensityError: 0.01, coupling: 0.5 })).toBeCloseTo(2 * (Math.sqrt(1.01) - 1), 15);
    expect(requiredAmplitude({ intensityError: 0.01, share: 0.5 })).toBeCloseTo(Math.sqrt(1.005) - 1, 15);
  });
  it('rejects bad inputs with specific messages', () => {
    const bad: [() => unknown, RegExp][] = [
      [() => requiredAmplitude({ intensityError: 0 }), /intensity error must be at least 1e-12/],
      [() => requiredAmplitude({ intensityError: -1 }), /intensity error must be at least 1e-12/],
      [() => requiredAmplitude({ intensityError: NaN }), /finite number/],
      [() => requiredAmplitude({ intensityError: 0.01, faces: 0 }), /faces must be a whole number from 1 to 6/],
      [() => requiredAmplitude({ intensityError: 0.01, share: 0 }), /share must be at least 0.000001 and at most 1/],
      [() => requiredAmplitude({ intensityError: 0.01, share: 1.5 }), /share must be at least 0.000001 and at most 1/],
      [() => requiredAmplitude({ intensityError: 0.01, coupling: 2e6 }), /coupling must be at least 0.000001 and at most 1128379.167/],
      [() => requiredAmplitude({ intensityError: 0.01, phase: 'sometimes' as 'worst' }), /phase must be "worst" or "random"/],
      [() => intensityErrorFromAmplitude(1), /amplitude reflection must be at least 0 and less than 1/],
    ];
    for (const [f, m] of bad) {
      expect(f).toThrow(HushInputError);
      expect(f).toThrow(m);
    }
  });
});

describe('ripple diagnostics (physics.md §1)', () => {
  it('peak-to-peak = 4c|r| exactly, from (1+A)² − (1−A)² (derived)', () => {
    expect(rippleFromReflection(0.01, 1e-3).peakToPeak).toBeCloseTo(0.04, 15);
    expect(rippleFromReflection(0.01, 1e-3, 1, 0.5).peakToPeak).toBeCloseTo(0.02, 15);
  });
  it('period c/(2 n_g L) (Fabry–Perot free spectral range; Saleh & Teich, Fundamentals of Photonics, Fabry–Perot resonator)', () => {
    // L = 10 µm in n_g = 4.2: FSR = 299792458/(2·4.2·1e-5) ≈ 3.569 THz
    expect(rippleFromReflection(1e-3, 1e-5, 4.2).periodHz).toBeCloseTo(299792458 / (2 * 4.2 * 1e-5), 3);
  });
  it('the inverse recovers |r| and the distance (derived)', () => {
    const fwd = rippleFromReflection(3e-3, 2.5e-6, 2, 0.8);
    const inv = reflectionFromRipple(fwd.peakToPeak, fwd.periodHz, 2, 0.8);
    expect(inv.amplitude).toBeCloseTo(3e-3, 15);
    expect(inv.distanceMetres).toBeCloseTo(2.5e-6, 18);
    expect(() => reflectionFromRipple(0, 1e12)).toThrow(/ripple peak-to-peak must be greater than 0/);
    expect(() => reflectionFromRipple(0.02, -1)).toThrow(/ripple period must be at least 0.001/);
    expect(() => reflectionFromRipple(3.9, 1e12, 1, 0.5)).toThrow(/implies \|r\| ≥ 1/);
  });
});

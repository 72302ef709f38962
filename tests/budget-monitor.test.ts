import { describe, expect, it } from 'vitest';
import { HushInputError, MAX_COUPLING, intensityErrorFromAmplitude, maxResonantCoupling, requiredAmplitude } from '../src/physics';

describe('monitor kind (physics.md §7)', () => {
  it("'intensity' is today's model, bit for bit (the default)", () => {
    for (const o of [{}, { coupling: 0.3 }, { faces: 4, phase: 'random' as const }, { share: 0.5 }]) {
      for (const eps of [1e-6, 1e-2, 0.5]) {
        expect(requiredAmplitude({ intensityError: eps, monitor: 'intensity', ...o })).toBe(requiredAmplitude({ intensityError: eps, ...o }));
      }
    }
    // The value before the monitor kind was added (same double): 0.01/(√1.01 + 1), √1.01 − 1 without cancellation.
    expect(requiredAmplitude({ intensityError: 0.01 })).toBe(0.01 / (Math.sqrt(1.01) + 1));
    expect(requiredAmplitude({ intensityError: 0.01 })).toBe(0.0049875621120890265);
  });
  it("'flux': counter-propagating waves carry flux |E|²(1 − A²), so ε = c²|r|² (brute force over the echo phase)", () => {
    // Flux of E = 1 + A·e^{iφ} forward-and-back: S ∝ |forward|² − |backward|², independent of φ (the cross term cancels).
    const A = 0.07;
    for (const phi of [0, 1, 2, 3]) {
      const forward = 1;
      const backward = A * A * (Math.cos(phi) ** 2 + Math.sin(phi) ** 2);
      expect(Math.abs(forward - backward - 1)).toBeCloseTo(A * A, 15);
    }
    expect(requiredAmplitude({ intensityError: 0.01, monitor: 'flux' })).toBeCloseTo(0.1, 15);
    expect(requiredAmplitude({ intensityError: 0.01, monitor: 'flux', coupling: 0.5, faces: 2 })).toBeCloseTo(0.1, 15);
    expect(intensityErrorFromAmplitude(0.1, { monitor: 'flux' })).toBeCloseTo(0.01, 15);
    // Random phases: the mean of |Σ r_i e^{iφ_i}|² is K·|r|² (derived), so |r| may be √K larger than worst case's 1/K.
    expect(requiredAmplitude({ intensityError: 0.01, monitor: 'flux', faces: 4, phase: 'random' })).toBeCloseTo(0.05, 15);
    // 1 % needs |r| = 0.1 at a flux monitor, 20 times the 5e-3 a field probe needs.
    expect(requiredAmplitude({ intensityError: 0.01, monitor: 'flux' }) / requiredAmplitude({ intensityError: 0.01 })).toBeCloseTo(20.05, 2);
  });
  it('round trips for flux monitors', () => {
    for (const o of [{}, { coupling: 3, faces: 2 }, { phase: 'random' as const, faces: 3, share: 0.2 }]) {
      for (const eps of [1e-8, 1e-3, 0.2]) {
        const r = requiredAmplitude({ intensityError: eps, monitor: 'flux', ...o });
        expect(intensityErrorFromAmplitude(r, { monitor: 'flux', ...o }) / eps).toBeCloseTo(1, 12);
      }
    }
  });
  it('rejects an unknown monitor', () => {
    expect(() => requiredAmplitude({ intensityError: 0.01, monitor: 'probe' as never })).toThrow(HushInputError);
    expect(() => requiredAmplitude({ intensityError: 0.01, monitor: 'probe' as never })).toThrow(/monitor must be "intensity" or "flux" \(got "probe"\)/);
  });
});

describe('coupling above 1: an echo built up by a resonance', () => {
  it('tightens the requirement by 1/c', () => {
    expect(requiredAmplitude({ intensityError: 0.01, coupling: 10 })).toBeCloseTo((Math.sqrt(1.01) - 1) / 10, 16);
  });
  it('is bounded by the Fabry–Perot build-up 2/t ≤ 2√(1 + Q/π) (Saleh & Teich, Fundamentals of Photonics; derived in budget.ts)', () => {
    // Lossless symmetric Fabry–Perot, mirror reflectance R: on resonance the standing wave peaks at 2/t, t = √(1 − R).
    // Finesse F = π√R/(1 − R); the fundamental mode (m = 1) has Q = F, the most build-up for a given Q.
    for (const R of [0.01, 0.3, 0.9, 0.99, 0.999]) {
      const t = Math.sqrt(1 - R);
      const F = (Math.PI * Math.sqrt(R)) / (1 - R);
      expect(2 / t).toBeLessThanOrEqual(maxResonantCoupling(F) * (1 + 1e-12));
      if (R >= 0.99) expect(2 / t / maxResonantCoupling(F)).toBeGreaterThan(0.99);
    }
    expect(maxResonantCoupling(1000)).toBeCloseTo(2 * Math.sqrt(1 + 1000 / Math.PI), 14);
    expect(MAX_COUPLING).toBeCloseTo(2 * Math.sqrt(1 + 1e12 / Math.PI), 6);
    expect(() => requiredAmplitude({ intensityError: 0.01, coupling: 2e6 })).toThrow(/coupling must be at least 0.000001 and at most 1128379.167/);
    expect(intensityErrorFromAmplitude(1e-4, { coupling: 1e5 })).toBeCloseTo(10 * 12, 10);
  });
});

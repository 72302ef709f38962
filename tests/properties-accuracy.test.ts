/**
 * Hardening of the accuracy-budget functions (issue 11): random calls, each of
 * which returns finite numbers or throws a HushInputError with a message; none
 * throws anything else or returns NaN/Infinity. No design search is involved,
 * so no work bound applies (tests/support/work-bound.ts).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  HushInputError,
  bandPulseWidth,
  dispersionError,
  dispersionPpwForError,
  gridVelocity,
  intensityErrorFromAmplitude,
  lineShiftError,
  lineShiftForError,
  maxResonantCoupling,
  passesDuration,
  propagationLimitPpw,
  pulseEnergyLeft,
  pulseRunDuration,
  pulseRunError,
  requiredAmplitude,
  resonanceRunDuration,
  resonanceRunError,
  transitTime,
} from '../src/physics';

/** Fixed seed: the same calls on every run. */
const SEED = Number(process.env.HUSH_PROPERTY_SEED ?? 11_2025);
const RUNS = 2000;

const anyValue = fc.oneof(
  fc.double(),
  fc.integer({ min: -1000, max: 1000 }),
  fc.constantFrom(0, -1, 1, 2, 3, 1e308, -1e308, 5e-324, 1e-300, NaN, Infinity, -Infinity, 0.5, 45, 90, 180, 1e6, 1e12),
  fc.string({ maxLength: 6 }),
  fc.constant(null),
  fc.constant(undefined),
);
const plausible = (lo: number, hi: number) => fc.oneof(fc.double({ min: lo, max: hi, noNaN: true }), anyValue);

function allFinite(x: unknown): boolean {
  if (typeof x === 'number') return Number.isFinite(x);
  if (typeof x === 'boolean' || x === null || typeof x === 'string') return true;
  if (Array.isArray(x)) return x.every(allFinite);
  if (x && typeof x === 'object') return Object.values(x).every(allFinite);
  return false;
}

function check(call: () => unknown) {
  try {
    expect(allFinite(call())).toBe(true);
  } catch (e) {
    if (!(e instanceof HushInputError)) throw e;
    expect(e.message.length).toBeGreaterThan(10);
  }
}

const n = (v: unknown) => v as number;

describe('property: accuracy-budget functions never crash, never return NaN', () => {
  it(`grid velocity and propagation limit (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(1, 100), plausible(0, 1), fc.constantFrom(1, 2, 3, 0, 2.5, undefined), plausible(-360, 360), plausible(-360, 360), plausible(1, 5), (p, s, d, a, z, i) => {
        check(() => gridVelocity({ ppw: n(p), courant: n(s), dimensions: n(d), angleDeg: n(a), azimuthDeg: n(z), index: n(i) }));
        check(() => propagationLimitPpw({ courant: n(s), dimensions: n(d), angleDeg: n(a), azimuthDeg: n(z), index: n(i) }));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`dispersion error and its inverse (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(2, 1000), plausible(0, 1e4), plausible(0, 1e12), plausible(1, 5), fc.constantFrom(1, 2, 3), plausible(1e-9, 10), plausible(2, 100), (p, path, q, i, d, e, rp) => {
        check(() => dispersionError({ ppw: n(p), pathWavelengths: n(path), q: n(q), index: n(i), dimensions: n(d), resonancePpw: n(rp) }));
        check(() => dispersionError({ ppw: n(p), q: n(q), dimensions: n(d), phase: 'random' }));
        check(() => dispersionPpwForError({ pathWavelengths: n(path), q: n(q), dimensions: n(d) }, n(e)));
        check(() => lineShiftError(n(q)));
        check(() => lineShiftForError(n(e)));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`run-length errors and durations (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(0, 1e12), plausible(1e6, 1e16), plausible(0, 1e-6), plausible(1e-16, 1), plausible(0, 1e-9), plausible(1e-15, 1e-9), (q, f, t, e, tau, tr) => {
        check(() => resonanceRunError({ q: n(q), frequencyHz: n(f), excitationSeconds: n(tau) }, n(t)));
        check(() => resonanceRunDuration({ q: n(q), frequencyHz: n(f), phase: 'random' }, n(e)));
        check(() => pulseEnergyLeft({ pulseWidthSeconds: n(tau), transitSeconds: n(tr) }, n(t)));
        check(() => pulseRunError({ pulseWidthSeconds: n(tau), transitSeconds: n(tr) }, n(t)));
        check(() => pulseRunDuration({ pulseWidthSeconds: n(tau), transitSeconds: n(tr), phase: 'random' }, n(e)));
        check(() => bandPulseWidth(n(f), n(q), n(e)));
        check(() => passesDuration(n(q), n(tr), n(tau)));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`transit time (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(1e-9, 1e-3), plausible(1, 1e6), plausible(0, 200), plausible(2, 100), plausible(1, 4), fc.constantFrom(1, 2, 3, 4), (c, cells, l, p, i, d) => {
        check(() => transitTime({ cellMetres: n(c), cells: Math.round(n(cells)), layers: Math.round(n(l)), ppw: n(p), index: n(i), dimensions: n(d) }));
        check(() => transitTime({ cellMetres: n(c), cells: n(cells), layers: n(l), ppw: n(p) }));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`budget with monitor kind and coupling above 1 (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(1e-12, 1), plausible(1e-6, 2e6), fc.constantFrom('intensity', 'flux', 'other', undefined), fc.constantFrom('worst', 'random'), plausible(0, 1), plausible(0, 1e12), (e, c, m, ph, r, q) => {
        check(() => requiredAmplitude({ intensityError: n(e), coupling: n(c), monitor: m as 'flux', phase: ph as 'worst' }));
        check(() => intensityErrorFromAmplitude(n(r), { coupling: n(c), monitor: m as 'flux', phase: ph as 'worst', faces: 6 }));
        check(() => maxResonantCoupling(n(q)));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
});

/**
 * Hardening: random calls to every public core function. Each call either
 * returns finite numbers or throws a HushInputError with a message; none throws
 * anything else, returns NaN/Infinity, or does more work than the stated bound
 * (tests/support/work-bound.ts: a count of kernel evaluations, not a time).
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  HushInputError,
  designOptions,
  intensityErrorFromAmplitude,
  numericalPhaseVelocity,
  reflection,
  reflectionFromRipple,
  requiredAmplitude,
  rippleFromReflection,
} from '../src/physics';
import { propertyRuns } from './support/property-runs';
import { DESIGN_WORK_BOUND, workMeter } from './support/work-bound';

/** Fixed seed: the same calls on every run. */
const SEED = Number(process.env.HUSH_PROPERTY_SEED ?? 3_2025);

const anyValue = fc.oneof(
  fc.double(),
  fc.integer({ min: -1000, max: 1000 }),
  fc.constantFrom(0, -1, 1, 2, 1e308, -1e308, 5e-324, 1e-300, NaN, Infinity, -Infinity, 0.5, 90, 89.9, 85, 200, 201),
  fc.string({ maxLength: 8 }),
  fc.constant(null),
  fc.constant(undefined),
);
/** Values that are often valid, so the random calls also reach the computations. */
const plausible = (lo: number, hi: number) => fc.oneof(fc.double({ min: lo, max: hi, noNaN: true }), anyValue);

function allFinite(x: unknown): boolean {
  if (typeof x === 'number') return Number.isFinite(x);
  // Flags and "not computed" (null) carry no number.
  if (typeof x === 'boolean' || x === null) return true;
  if (Array.isArray(x)) return x.every(allFinite);
  if (x && typeof x === 'object') return Object.values(x).every((v) => typeof v === 'string' || allFinite(v));
  return typeof x === 'string';
}

/**
 * One call: finite values or a HushInputError with a message, and a bounded
 * amount of design work (none at all for the functions without a search).
 */
let largestWork = 0;
afterAll(() => console.log(`largest design work of one call: ${largestWork.toExponential(3)} layer-evaluations (bound ${DESIGN_WORK_BOUND.toExponential(1)})`));

function check(call: () => unknown, workBound = 0) {
  const meter = workMeter();
  try {
    const v = call();
    expect(allFinite(v)).toBe(true);
  } catch (e) {
    if (!(e instanceof HushInputError)) throw e;
    expect(e.message.length).toBeGreaterThan(10);
  }
  const used = meter.used();
  largestWork = Math.max(largestWork, used);
  expect(used).toBeLessThanOrEqual(workBound);
}

/**
 * Random calls per property: 10,000 in the full run (tests/support/property-runs.ts;
 * a default run checks the full run's first cases). The cheap properties keep
 * all 10,000 by default (about 1-3 s each on a quiet 2-core machine); the design
 * search takes 30 s per 10,000 there, so a default run does 1,000 of them.
 */
const RUNS = propertyRuns(10_000);
const DESIGN_RUNS = propertyRuns(1_000);

describe('property: core functions never crash, never return NaN', () => {
  it(`reflection (${RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(1, 40), plausible(0, 6), plausible(2, 60), plausible(0, 89), plausible(0.1, 5), plausible(1, 10), plausible(0, 1), plausible(0.1, 0.58), plausible(1, 4), (N, m, ppw, ang, s, k, a, c, n) =>
        check(() => reflection({ layers: N as number, order: m as number, strength: s as number, kappaMax: k as number, alphaMaxNorm: a as number }, { ppw: ppw as number, angleDeg: ang as number, courant: c as number, index: n as number })),
      ),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`designOptions (${DESIGN_RUNS} calls)`, () => {
    fc.assert(
      fc.property(plausible(1e-8, 0.5), plausible(3, 60), plausible(3, 200), plausible(0, 89), plausible(1, 4), (t, p1, p2, ang, n) =>
        check(() => designOptions({ target: t as number, ppwMin: p1 as number, ppwMax: p2 as number, angleMaxDeg: ang as number, index: n as number }), DESIGN_WORK_BOUND),
      ),
      { numRuns: DESIGN_RUNS, seed: SEED },
    );
  });
  it(`budget both ways (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(plausible(1e-6, 1), plausible(0, 1), plausible(1, 6), fc.constantFrom('worst', 'random', 'x', undefined), plausible(0, 1), (e, c, f, ph, sh) => {
        check(() => requiredAmplitude({ intensityError: e as number, coupling: c as number, faces: f as number, phase: ph as 'worst', share: sh as number }));
        check(() => intensityErrorFromAmplitude(e as number, { coupling: c as number, faces: f as number, phase: ph as 'worst', share: sh as number }));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
  it(`ripple both ways and phase velocity (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(plausible(0, 1), plausible(1e-9, 1), plausible(1, 5), plausible(0, 1), plausible(1e6, 1e15), plausible(2, 40), (r, L, ng, c, f, ppw) => {
        check(() => rippleFromReflection(r as number, L as number, ng as number, c as number));
        check(() => reflectionFromRipple(r as number, f as number, ng as number, c as number));
        check(() => numericalPhaseVelocity(ppw as number, c as number, (L as number) * 80, ng as number));
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });
});

/**
 * Contract checks, not physics: every function of the public barrel
 * (src/physics/index.ts) keeps the contract of DEVELOPERS.md ("Errors"): finite
 * values or a HushInputError, whatever it is given. No expected value has a
 * source here because none is checked, only the contract.
 */
/** Random calls per public function: 2,000 in the full run (a fifth of the others), 500 by default (about 40 functions, 8 s per 2,000 each on a quiet 2-core machine). */
const PUBLIC_CALLS = propertyRuns(500, 0.2);
/** Functions with their own tests: caches, counters, and the measurement runs (async or step by step). */
const OWN_TESTS = new Set(['clearDesignCache', 'designWork', 'runInChunks']);
/** The functions that run a design search, bounded by the design-work bound; every other one may do none. */
const SEARCHES = new Set(['designOptions', 'designAbsorber']);

function isClass(name: string, fn: (...args: unknown[]) => unknown): boolean {
  if (/^[A-Z]/.test(name)) return true;
  const proto = fn.prototype as object | undefined;
  return proto !== undefined && Object.getOwnPropertyNames(proto).some((k) => k !== 'constructor');
}

function skipped(name: string, fn: (...args: unknown[]) => unknown): boolean {
  const isAsync = fn.constructor.name === 'AsyncFunction';
  return isClass(name, fn) || OWN_TESTS.has(name) || name.startsWith('createMeasurement') || (name.startsWith('measure') && isAsync);
}

/** Numbers in the ranges the core accepts (Courant numbers, cells per wavelength, layers, angles, orders, …). */
const plausibleNumber = fc.oneof(
  fc.double({ min: 0, max: 1, noNaN: true }),
  fc.double({ min: 1, max: 100, noNaN: true }),
  fc.integer({ min: 0, max: 12 }),
  fc.constantFrom(0.3, 0.5, 0.9, 1e-3, 1e-9, 20, 30, 45, 1e9),
);
/** Objects and words the core takes (fresh copies: no call sees another's changes). None starts a time-domain run. */
const plausibleObject = fc
  .constantFrom<unknown>(
    { layers: 8, order: 3 },
    { layers: 6, order: 2, kappaMax: 3, alphaMaxNorm: 0.1, grading: 'geometric' },
    { ppw: 20 },
    { ppw: 15, angleDeg: 30, courant: 0.5, dimensions: 2 },
    { target: 1e-3, ppwMin: 20 },
    { intensityError: 0.01 },
    { coupling: 0.5, faces: 2, phase: 'random' },
    { dimensions: 1, interior: [100], layers: 10 },
    { domain: { dimensions: 2, interior: [50, 40], layers: 8 }, time: { cellMetres: 1e-8, courant: 0.5, passes: 2 }, throughput: 1e9, pricePerHour: 2 },
    { cellMetres: 1e-3, courant: 0.5, passes: 2 },
    'worst',
    'random',
    'single',
    'double',
  )
  .map((v) => structuredClone(v));
const publicArg = fc.oneof({ arbitrary: anyValue, weight: 2 }, { arbitrary: plausibleNumber, weight: 3 }, { arbitrary: plausibleObject, weight: 2 });

describe('property: every public core function keeps the error contract (contract checks, not physics)', () => {
  it(`finite values or HushInputError, ${PUBLIC_CALLS} random calls per function`, async () => {
    const core = (await import('../src/physics')) as Record<string, unknown>;
    const tested: string[] = [];
    for (const [name, value] of Object.entries(core)) {
      if (typeof value !== 'function') continue;
      const fn = value as (...args: unknown[]) => unknown;
      if (skipped(name, fn)) continue;
      tested.push(name);
      const bound = SEARCHES.has(name) ? DESIGN_WORK_BOUND : 0;
      // fn.length stops at the first defaulted parameter, so up to 3 more arguments reach the optional ones.
      const args = fc.array(publicArg, { maxLength: fn.length + 3 });
      try {
        fc.assert(
          fc.property(args, (a) => check(() => fn(...a), bound)),
          { numRuns: PUBLIC_CALLS, seed: SEED },
        );
      } catch (e) {
        throw new Error(`${name}: ${(e as Error).message}`);
      }
    }
    // The enumeration must reach the barrel (a broken import would test nothing).
    expect(tested).toContain('reflection');
    expect(tested).toContain('numericalPhaseVelocity');
    expect(tested.length).toBeGreaterThan(30);
  });
});

/**
 * HUSH.* worksheet functions called the way Excel calls them: numbers, numeric
 * text, null/undefined/"" for omitted or empty arguments, 0 from an empty cell,
 * 1×1 and larger ranges as 2-D arrays, TRUE/FALSE. A stub of the global
 * CustomFunctions records every worksheet error the functions raise.
 */
import { readFileSync } from 'fs';
import path from 'path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import {
  MODEL_VERSION,
  SPEED_OF_LIGHT,
  HushInputError,
  reflection,
  reflectionFromRipple,
  requiredAmplitude,
} from '../src/physics';
import {
  errorFromReflection,
  modelVersion,
  neededReflection,
  reflectionContinuous,
  reflectionExact,
  reflectionTable,
  ripple,
  rippleSource,
} from '../src/functions/functions';
import { arg, isBlank, listArg, requiredArg, singleValue } from '../src/functions/args';
import { toWorksheetError } from '../src/functions/errors';
import { REFLECTION_TABLE_MAX_WORK, checkTableSize, tableWork } from '../src/functions/worker-tasks';
import { readInput } from '../src/plan/fields';
import pkg from '../package.json';

class StubWorksheetError extends Error {
  constructor(
    public readonly code: string,
    message?: string,
  ) {
    super(message);
  }
}

const raised: StubWorksheetError[] = [];

beforeAll(() => {
  (globalThis as Record<string, unknown>).CustomFunctions = {
    Error: class extends StubWorksheetError {
      constructor(code: string, message?: string) {
        super(code, message);
        raised.push(this);
      }
    },
    ErrorCode: { invalidValue: '#VALUE!', invalidNumber: '#NUM!', notAvailable: '#N/A', divisionByZero: '#DIV/0!', invalidName: '#NAME?', nullReference: '#NULL!' },
  };
});

afterEach(() => {
  raised.length = 0;
});

type Loose = (...args: unknown[]) => unknown;

const source = readFileSync(path.join(__dirname, '../src/functions/functions.ts'), 'utf8');

/** Calls a worksheet function with anything Excel might pass. */
function call(fn: unknown, ...args: unknown[]): unknown {
  return (fn as Loose)(...args);
}

/** Relative closeness: the shell must return what the core computes, to rounding. */
function expectRelative(actual: number, expected: number, tolerance = 1e-13): void {
  expect(Math.abs(actual / expected - 1)).toBeLessThan(tolerance);
}

/** What the field registry says about the same value: the worksheet, the table and the command line all show its message. */
function registryRefusal(field: string, value: unknown): { code: string; message: string } {
  return coreRefusal(() => readInput(field, value));
}

/** What the core says about an input that passed the registry (a cross-field check): the worksheet shows the core's message. */
function coreRefusal(compute: () => unknown): { code: string; message: string } {
  try {
    compute();
  } catch (e) {
    expect(e).toBeInstanceOf(HushInputError);
    const h = e as HushInputError;
    return { code: h.kind === 'value' ? '#VALUE!' : '#NUM!', message: h.message };
  }
  throw new Error('expected the core to refuse this input');
}

/** The worksheet error a call raises, as Excel would show it. */
function errorOf(fn: unknown, ...args: unknown[]): { code: string; message?: string } {
  try {
    call(fn, ...args);
  } catch (e) {
    expect(e).toBeInstanceOf(StubWorksheetError);
    expect(raised).toContain(e);
    const w = e as StubWorksheetError;
    return { code: w.code, message: w.message };
  }
  throw new Error('expected a worksheet error');
}

describe('HUSH.NEEDED_REFLECTION', () => {
  const worst1 = Math.sqrt(1.01) - 1; // physics.md §1: |r| = (√(1+ε) − 1)/c (derived)

  it('1 % worst case → √1.01 − 1 (physics.md §1, derived)', () => {
    expectRelative(neededReflection(0.01), worst1);
  });

  it('omitted optional arguments arrive as null, undefined or "" and all mean the default', () => {
    for (const blank of [null, undefined, '', '  ']) {
      expect(call(neededReflection, 0.01, blank, blank, blank, blank)).toBe(neededReflection(0.01));
    }
  });

  it('numbers typed as text and 1×1 ranges are read as numbers', () => {
    expect(call(neededReflection, '0.01')).toBe(neededReflection(0.01));
    expect(call(neededReflection, ' 1e-2 ')).toBe(neededReflection(0.01));
    expect(call(neededReflection, [[0.01]])).toBe(neededReflection(0.01));
    expect(call(neededReflection, 0.01, [['0.5']])).toBe(neededReflection(0.01, 0.5));
  });

  it('worst case: K faces share the budget linearly, coupling c divides (physics.md §1, derived)', () => {
    expectRelative(neededReflection(0.01, 1, 2), worst1 / 2);
    expectRelative(neededReflection(0.01, 0.5), worst1 / 0.5);
  });

  it('phase is matched without regard to case and gives the core random-phase answer (independent call of the core)', () => {
    const expected = requiredAmplitude({ intensityError: 0.01, faces: 2, phase: 'random' });
    expect(neededReflection(0.01, 1, 2, 'random')).toBe(expected);
    expect(neededReflection(0.01, 1, 2, ' RANDOM ')).toBe(expected);
  });

  it('a share F of the budget: the absorber gets ε·F (physics.md §1, derived)', () => {
    expectRelative(neededReflection(0.01, 1, 1, 'worst', 0.5), Math.sqrt(1.005) - 1);
  });

  it('a missing required argument is #VALUE! naming it', () => {
    for (const blank of [null, undefined, '']) {
      expect(errorOf(neededReflection, blank)).toEqual({ code: '#VALUE!', message: 'intensity_error is required (tolerated relative intensity error at the monitor)' });
    }
  });

  it('text, TRUE and ranges where one value belongs are #VALUE!', () => {
    expect(errorOf(neededReflection, 'one percent')).toEqual({ code: '#VALUE!', message: 'intensity_error must be a number or a percentage such as 0.01 or 1% (got "one percent")' });
    expect(errorOf(neededReflection, '0x10').code).toBe('#VALUE!');
    expect(errorOf(neededReflection, true)).toEqual({ code: '#VALUE!', message: 'intensity_error must be a number or text (got TRUE)' });
    expect(errorOf(neededReflection, [[0.01, 0.02]])).toEqual({
      code: '#VALUE!',
      message: 'intensity_error must be a single value, not a range of 1×2 cells',
    });
    expect(errorOf(neededReflection, 0.01, 1, 1, 'best')).toEqual({ code: '#VALUE!', message: 'phase must be one of worst, random (got "best")' });
    expect(errorOf(neededReflection, 0.01, 1, 1, 3).code).toBe('#VALUE!');
  });

  it('numbers outside the model are #NUM! with the core message (an empty cell passed as 0 included)', () => {
    const cases: [unknown[], () => unknown][] = [
      [[0], () => readInput('intensity_error', 0)],
      [[2], () => readInput('intensity_error', 2)],
      [[0.01, 0], () => readInput('coupling', 0)],
      [[0.01, 1, 1.5], () => readInput('faces_seen', 1.5)],
    ];
    for (const [args, core] of cases) {
      const expected = coreRefusal(core);
      expect(expected.code).toBe('#NUM!');
      expect(errorOf(neededReflection, ...args)).toEqual(expected);
    }
    expect(errorOf(neededReflection, 0.01, 1, 1.5).message).toMatch(/^faces_seen /);
  });
});

describe('HUSH.ERROR_FROM_REFLECTION', () => {
  it('|r| = 0.005 → (1.005)² − 1 = 0.010025 (physics.md §1, derived)', () => {
    expect(errorFromReflection(0.005)).toBeCloseTo(0.010025, 15);
  });

  it('inverts HUSH.NEEDED_REFLECTION for every phase model (derived)', () => {
    for (const phase of ['worst', 'random']) {
      const r = neededReflection(0.02, 0.7, 3, phase, 0.4);
      expect(errorFromReflection(r, 0.7, 3, phase, 0.4)).toBeCloseTo(0.02, 14);
    }
  });

  it('|r| ≥ 1 is #NUM!; |r| = "" is #VALUE! (required)', () => {
    expect(errorOf(errorFromReflection, 1)).toEqual(registryRefusal('amplitude', 1));
    expect(errorOf(errorFromReflection, 1).code).toBe('#NUM!');
    expect(errorOf(errorFromReflection, '')).toEqual({ code: '#VALUE!', message: 'amplitude is required (amplitude reflection |r| of one face (not the power |r|²))' });
  });
});

describe('HUSH.REFLECTION and HUSH.REFLECTION_CONTINUOUS', () => {
  it('equal the core reflection for the same design and wave (independent call of the core)', () => {
    expect(reflectionExact(10, 3, 20)).toBe(reflection({ layers: 10, order: 3 }, { ppw: 20 }).amplitude);
    const d = { layers: 8, order: 3, strength: 1.2, kappaMax: 5, alphaMaxNorm: 0.05, alphaOrder: 1 };
    const w = { ppw: 40, angleDeg: 45, courant: 0.5, index: 1.5, dimensions: 3 };
    const r = reflection(d, w);
    expect(reflectionExact(8, 3, 40, 45, 1.2, 5, 0.05, 1, 0.5, 1.5, 3)).toBe(r.amplitude);
    expect(reflectionContinuous(8, 3, 40, 45, 1.2, 5, 0.05, 1, 0.5, 1.5, 3)).toBe(r.continuous);
  });

  it('continuous theory at σ_opt, normal incidence: R = e^{−1.6·N} (physics.md §2, derived)', () => {
    expect(reflectionContinuous(10, 3, 20)).toBeCloseTo(Math.exp(-16), 20);
    expect(reflectionContinuous(5, 4, 15) / Math.exp(-8)).toBeCloseTo(1, 12);
  });

  it('the discrete reflection exceeds the continuous promise at N = 10 (physics.md §2: 10⁻⁷ promised, 10⁻⁵–10⁻⁶ on the grid)', () => {
    const exact = reflectionExact(10, 3, 20);
    expect(exact).toBeGreaterThan(1e-6);
    expect(exact).toBeLessThan(1e-4);
    expect(exact).toBeGreaterThan(100 * reflectionContinuous(10, 3, 20));
  });

  it('arguments as text, empty optionals as "" or null, and 1×1 ranges', () => {
    const expected = reflectionExact(12, 4, 25, 30);
    expect(call(reflectionExact, '12', '4', '25', '30')).toBe(expected);
    expect(call(reflectionExact, [[12]], 4, 25, 30, '', null, undefined, '', null, '', '')).toBe(expected);
  });

  it('out-of-range designs and waves are #NUM! with the core message', () => {
    expect(errorOf(reflectionExact, 0, 3, 20)).toEqual({ code: '#NUM!', message: 'layers must be a whole number from 1 to 200 (got 0)' });
    expect(errorOf(reflectionExact, 2.5, 3, 20)).toEqual({ code: '#NUM!', message: 'layers must be a whole number from 1 to 200 (got 2.5)' });
    expect(errorOf(reflectionExact, 10, 3, 20, 90).code).toBe('#NUM!');
    const aboveLimit = coreRefusal(() => reflection({ layers: 10, order: 3 }, { ppw: 20, courant: 0.9 }));
    expect(aboveLimit.code).toBe('#NUM!');
    expect(errorOf(reflectionExact, 10, 3, 20, 0, 1, 1, 0, 1, 0.9)).toEqual(aboveLimit);
    const oblique1d = coreRefusal(() => reflection({ layers: 10, order: 3 }, { ppw: 20, angleDeg: 10, courant: 0.5, dimensions: 1 }));
    expect(oblique1d.code).toBe('#NUM!');
    expect(errorOf(reflectionExact, 10, 3, 20, 10, 1, 1, 0, 1, 0.5, 1, 1)).toEqual(oblique1d);
  });

  it('missing or non-numeric required arguments are #VALUE!', () => {
    expect(errorOf(reflectionExact, 10, 3, null)).toEqual({ code: '#VALUE!', message: 'ppw is required (cells per wavelength in the background medium at this frequency)' });
    expect(errorOf(reflectionExact, 'ten', 3, 20)).toEqual({ code: '#VALUE!', message: 'layers must be a whole number (got "ten")' });
    expect(errorOf(reflectionContinuous, 10, [[3], [4]], 20)).toEqual({
      code: '#VALUE!',
      message: 'order must be a single value, not a range of 2×1 cells',
    });
  });
});

describe('unit strings and percentages where a quantity has a unit', () => {
  it('give the same results as the bare numbers in the argument\'s own unit', () => {
    expect(neededReflection('1%')).toBe(neededReflection(0.01));
    expect(neededReflection('1 %', '50%', 2, 'random', '80%')).toBe(neededReflection(0.01, 0.5, 2, 'random', 0.8));
    expect(errorFromReflection('0.5%')).toBe(errorFromReflection(0.005));
    expect(reflectionExact(8, 3, 40, '45 deg')).toBe(reflectionExact(8, 3, 40, 45));
    expect(reflectionExact(8, 3, 40, `${Math.PI / 4} rad`)).toBeCloseTo(reflectionExact(8, 3, 40, 45), 15);
    expect(ripple('0.1%', '10 cm')).toEqual(ripple(0.001, 0.1));
    expect(ripple(0.001, '25 um', 1.5)).toEqual(ripple(0.001, 25e-6, 1.5));
    expect(rippleSource('0.4%', '1.5 GHz')).toEqual(rippleSource(0.004, 1.5e9));
  });

  it('wrong units are #VALUE! naming the argument and what it takes', () => {
    expect(errorOf(ripple, 0.001, '5 kg')).toEqual({ code: '#VALUE!', message: expect.stringMatching(/^distance must be a length/) });
    expect(errorOf(rippleSource, 0.004, '3 m')).toEqual({ code: '#VALUE!', message: expect.stringMatching(/^period must be a frequency/) });
    expect(errorOf(reflectionExact, 8, 3, 40, '3 m')).toEqual({ code: '#VALUE!', message: expect.stringMatching(/^angle must be an angle/) });
    expect(errorOf(neededReflection, 'one percent')).toEqual({ code: '#VALUE!', message: expect.stringMatching(/^intensity_error must be a number or a percentage such as 0.01 or 1%/) });
  });
});

describe('HUSH.REFLECTION_TABLE', () => {
  /** The worksheet error a Promise-returning call settles with. */
  async function asyncErrorOf(fn: unknown, ...args: unknown[]): Promise<{ code: string; message?: string }> {
    try {
      await call(fn, ...args);
    } catch (e) {
      expect(e).toBeInstanceOf(StubWorksheetError);
      const w = e as StubWorksheetError;
      return { code: w.code, message: w.message };
    }
    throw new Error('expected a worksheet error');
  }

  it('is HUSH.REFLECTION at every ppw (rows) and angle (columns) of the ranges (independent call per cell)', async () => {
    const t = await reflectionTable(10, 3, [[20], [40], [80]], [[0, '30 deg', 60]], 1.2, 2);
    expect(t.length).toBe(3);
    [20, 40, 80].forEach((ppw, i) => [0, 30, 60].forEach((a, j) => expect(t[i][j]).toBe(reflectionExact(10, 3, ppw, a, 1.2, 2))));
    // A row of ppw values reads the same as a column; blank cells are skipped; no angles means normal incidence.
    expect(await reflectionTable(10, 3, [[20, '', 40]])).toEqual([[reflectionExact(10, 3, 20)], [reflectionExact(10, 3, 40)]]);
    expect(await reflectionTable(10, 3, [[20]], null as unknown as undefined)).toEqual([[reflectionExact(10, 3, 20)]]);
  });

  it('refuses bad values and oversized ranges with the argument named', async () => {
    expect(await asyncErrorOf(reflectionTable, 10, 3, [['x']])).toEqual({ code: '#VALUE!', message: 'ppw must be a number (got "x")' });
    expect(await asyncErrorOf(reflectionTable, 10, 3, [[]])).toEqual({ code: '#VALUE!', message: 'ppw_list needs at least one value' });
    expect(await asyncErrorOf(reflectionTable, 10, 3, [Array(501).fill(20)])).toEqual({ code: '#VALUE!', message: 'ppw_list takes at most 500 values (got 501)' });
    expect((await asyncErrorOf(reflectionTable, 10, 3, [[20]], [[0, 95]])).code).toBe('#NUM!');
  });

  it(`refuses more than REFLECTION_TABLE_MAX_WORK = ${REFLECTION_TABLE_MAX_WORK} cells × layers with #NUM! stating the bound, before computing anything`, async () => {
    const w0 = tableWork();
    const ppws = [Array.from({ length: 500 }, (_, i) => 10 + i)];
    const angles = [Array.from({ length: 500 }, (_, i) => (i * 89) / 500)];
    expect(await asyncErrorOf(reflectionTable, 200, 3, ppws, angles)).toEqual({
      code: '#NUM!',
      message:
        'REFLECTION_TABLE computes at most 2,000,000 cells × layers (values of ppw_list × angles × layers); 500 × 500 × 200 = 50,000,000 asked: give fewer values or fewer layers',
    });
    expect(await asyncErrorOf(reflectionTable, 81, 3, [ppws[0].slice(0, 100)], [angles[0].slice(0, 250)])).toMatchObject({ code: '#NUM!' });
    expect(tableWork()).toBe(w0);
    // At the bound exactly it is accepted (checked without computing it): 100 × 100 × 200 and 500 × 500 × 8 (derived: both 2·10⁶).
    const job = (n: number, m: number, layers: number) => ({ kind: 'table' as const, design: { layers, order: 3 }, wave: { courant: 0.5, dimensions: 3 }, ppws: Array(n).fill(20), angles: Array(m).fill(0) });
    expect(() => checkTableSize(job(100, 100, 200))).not.toThrow();
    expect(() => checkTableSize(job(500, 500, 8))).not.toThrow();
    expect(() => checkTableSize(job(100, 101, 200))).toThrow(HushInputError);
    // The description Excel shows states the same bound.
    expect(source).toContain(`at most ${REFLECTION_TABLE_MAX_WORK.toLocaleString('en-US')} cells × layers.`);
  });
});

describe('HUSH.RIPPLE and HUSH.RIPPLE_SOURCE', () => {
  it('spill one row: swing 4c|r| and period c₀/(2·n_g·L) (physics.md §1, derived)', () => {
    const row = ripple(0.001, 0.1);
    expect(row).toHaveLength(1);
    expect(row[0]).toHaveLength(2);
    expect(row[0][0]).toBeCloseTo(0.004, 16);
    expect(row[0][1]).toBe(SPEED_OF_LIGHT / 0.2);
    const scaled = ripple(0.001, 0.1, 1.5, 0.5);
    expect(scaled[0][0]).toBeCloseTo(0.002, 16);
    expect(scaled[0][1]).toBeCloseTo(SPEED_OF_LIGHT / 0.3, 6);
  });

  it('RIPPLE_SOURCE inverts RIPPLE (derived)', () => {
    const [[swing, period]] = ripple(0.003, 0.25, 2, 0.8);
    const [[amplitude, distance]] = rippleSource(swing, period, 2, 0.8);
    expect(amplitude).toBeCloseTo(0.003, 15);
    expect(distance).toBeCloseTo(0.25, 14);
  });

  it('optional arguments omitted in any form give group index 1 and coupling 1', () => {
    for (const blank of [null, undefined, '']) {
      expect(call(ripple, 0.001, 0.1, blank, blank)).toEqual(ripple(0.001, 0.1, 1, 1));
      expect(call(rippleSource, '0.004', '1.5e9', blank, blank)).toEqual(rippleSource(0.004, 1.5e9, 1, 1));
    }
  });

  it('impossible inputs are #NUM!, missing ones #VALUE!', () => {
    expect(errorOf(ripple, 0.001, 0)).toEqual(registryRefusal('distance', 0));
    expect(errorOf(ripple, 0.001, 0).code).toBe('#NUM!');
    expect(errorOf(rippleSource, 4, 1e9)).toEqual(registryRefusal('peak_to_peak', 4));
    expect(errorOf(rippleSource, 2, 1e9, 1, 0.25)).toEqual(coreRefusal(() => reflectionFromRipple(2, 1e9, 1, 0.25)));
    expect(errorOf(rippleSource, 2, 1e9, 1, 0.25).code).toBe('#NUM!');
    expect(errorOf(ripple, 0.001, '')).toEqual({ code: '#VALUE!', message: 'distance is required (distance between the boundary and the other reflector)' });
  });
});

describe('HUSH.MODEL_VERSION', () => {
  it('names the add-in version (package.json) and the model version (constants.ts)', () => {
    expect(modelVersion()).toBe(`Hush ${pkg.version}, model ${MODEL_VERSION}`);
  });
});

describe('worksheet errors', () => {
  it('HushInputError kind "value" → #VALUE!, "number" → #NUM!, with the message', () => {
    expect(toWorksheetError(new HushInputError('x', 'x must be a number', 'value'))).toMatchObject({ code: '#VALUE!', message: 'x must be a number' });
    expect(toWorksheetError(new HushInputError('x', 'x must be at most 1', 'number'))).toMatchObject({ code: '#NUM!', message: 'x must be at most 1' });
  });

  it('anything else is #VALUE! marked as an internal error, never a silent value', () => {
    expect(toWorksheetError(new Error('boom'))).toMatchObject({ code: '#VALUE!', message: 'internal error: boom' });
    expect(toWorksheetError('odd')).toMatchObject({ code: '#VALUE!', message: 'internal error: odd' });
  });
});

describe('argument normalisation (src/functions/args.ts)', () => {
  it('blank means null, undefined, "" or blank text, and nothing else (0 is a number)', () => {
    expect([null, undefined, '', ' \t'].every(isBlank)).toBe(true);
    expect([0, '0', false, [[]]].some(isBlank)).toBe(false);
  });

  it('single values unwrap 1×1 ranges in both row and flat form', () => {
    expect(singleValue('x', [[7]])).toBe(7);
    expect(singleValue('x', [7])).toBe(7);
    expect(singleValue('x', 7)).toBe(7);
    expect(() => singleValue('x', [[1], [2]])).toThrow('x must be a single value, not a range of 2×1 cells');
  });

  it('numbers: decimal text only, blanks are omitted (the registry reads the rest)', () => {
    expect(requiredArg('strength', '.5e+0')).toBe(0.5);
    expect(arg('strength', null)).toBeUndefined();
    expect(arg('strength', '')).toBeUndefined();
    expect(arg('strength', [['  ']])).toBeUndefined();
    expect(() => arg('strength', 0)).toThrow('strength must be greater than 0 and at most 20 (got 0)');
    expect(() => requiredArg('strength', '1,5')).toThrow('strength must be a number (got "1,5")');
    expect(() => requiredArg('strength', 'Infinity')).toThrow(HushInputError);
    expect(() => requiredArg('strength', { type: 'Error' })).toThrow('strength must be a number or text (got an error or object value)');
    expect(() => requiredArg('strength', null)).toThrow(/strength is required/);
  });

  it('choices match case-insensitively; blank is omitted', () => {
    expect(arg('phase', 'Worst')).toBe('worst');
    expect(arg('phase', 'RANDOM')).toBe('random');
    expect(arg('phase', null)).toBeUndefined();
    expect(() => arg('phase', 'both')).toThrow('phase must be one of worst, random (got "both")');
  });

  it('lists read ranges row by row, skip empty cells, and accept text or a single value', () => {
    expect(listArg('orders', [[2, 3], [null, '4']])).toEqual([2, 3, 4]);
    expect(listArg('orders', [[2], [''], [4]])).toEqual([2, 4]);
    expect(listArg('orders', 3)).toEqual([3]);
    expect(listArg('orders', '2, 3 4')).toEqual([2, 3, 4]);
    expect(listArg('orders', [['', null]])).toBeUndefined();
    expect(() => listArg('orders', [[2, 'x']])).toThrow('orders must be a list of numbers such as 2, 3, 4 (got "2,x")');
  });
});

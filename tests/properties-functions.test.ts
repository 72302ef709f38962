/**
 * Hardening: random calls to every HUSH.* worksheet function, with what Excel
 * and careless users can hand over — numbers (0, negative, 1e308, 5e-324),
 * NaN/Infinity, numeric text, text with and without units, wrong units
 * ("5 kg"), "", null, undefined, TRUE/FALSE, error objects and 2-D ranges of
 * the wrong shape — mixed with plausible values so that a good fraction of
 * the calls get through to the computations.
 *
 * Contract checked for every call: it returns finite values in the expected
 * shape (a number, a string, or rows of numbers/strings), or it raises (throws,
 * or rejects its Promise with) a CustomFunctions.Error of the #VALUE!/#NUM!
 * kind with a non-empty message that is not an internal error; nothing else is
 * thrown, and no call does more work than the stated bound
 * (tests/support/work-bound.ts: the synchronous functions do no design search
 * at all; a batch of Promise-returning calls does at most one bounded search
 * per call). Times are logged, not asserted: they belong to `npm run bench`.
 *
 * PLAN, CELLS, MEMORY, STEPS, RUNTIME and COST are called together on each
 * random row (one call each per row), as a worksheet does; besides
 * the contract, each figure must equal the matching PLAN column, and LAYERS
 * must equal DESIGN's first column.
 */
import { readFileSync } from 'fs';
import path from 'path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUTPUT_NAMES } from '../src/plan';
import { parseCsv } from '../src/plan/csv';
import * as functions from '../src/functions/functions';
import { scheduler } from '../src/functions/scheduler';
import { installCustomFunctionsStub, StubWorksheetError } from './support/custom-functions-stub';
import { propertyRuns } from './support/property-runs';
import { DESIGN_WORK_BOUND, workMeter } from './support/work-bound';

beforeAll(() => {
  installCustomFunctionsStub();
  scheduler.resetStats();
});

/**
 * Random calls per function (rows for PLAN and the figures): 10,000 in the
 * full run, 1,000 by default (tests/support/property-runs.ts; the default
 * cases are the full run's first ones). Costs per 10,000 measured on a quiet
 * 2-core machine: 4-14 s per synchronous property, 8 s for LAYERS and DESIGN,
 * 21 s for PLAN and the figures.
 */
const RUNS = propertyRuns(1_000);
/** Calls in flight together for the Promise-returning functions (as in a recalculation). */
const BATCH = 100;
const SEED = Number(process.env.HUSH_PROPERTY_SEED ?? 5_2025);

type Loose = (...args: unknown[]) => unknown;
const fn = (name: keyof typeof functions) => functions[name] as unknown as Loose;

// ---------------------------------------------------------------- values

const extremes = fc.constantFrom(0, -0, -1, 1, 2, 3, 1e308, -1e308, 5e-324, -5e-324, 1e-300, NaN, Infinity, -Infinity, 0.5, 85, 90, 200, 201, 1e6, 2 ** 53);
const text = fc.oneof(
  fc.string({ maxLength: 8 }),
  fc.constantFrom('', '  ', '0', '1e-3', ' 20 ', '-5', '1e400', 'NaN', 'Infinity', '0x10', '1,5', '1%', '5 %', '1550 nm', '193 THz', '30 deg', '0.5 rad', '5 kg', '3 ps', '$2/h', 'worst', 'random', 'RANDOM', 'best', '2,3,4', '3 4', 'x-, x+', 'all', 'single', 'double', 'slab', 'block', '10 GB/s'),
);
const junkScalar = fc.oneof(
  fc.double(),
  fc.integer({ min: -1000, max: 1000 }),
  extremes,
  text,
  fc.constantFrom(null, undefined, true, false, { type: 'Error', code: '#N/A' }),
);
/** Ranges of every shape, including ragged and empty ones. */
const junkRange = fc.oneof(
  fc.constantFrom([], [[]], [[], []], [[1, 2], [3]], [[null]], [['']]),
  fc.array(fc.array(junkScalar, { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 3 }),
  fc.array(junkScalar, { maxLength: 3 }),
);
const junk = fc.oneof({ weight: 4, arbitrary: junkScalar }, { weight: 1, arbitrary: junkRange });

/**
 * A number in [min, max]: mostly spread evenly (fc.double alone is spread over
 * the floating-point values, so it gives mostly tiny numbers), sometimes any double in range.
 */
const num = (min: number, max: number) =>
  fc.oneof(
    { weight: 3, arbitrary: fc.integer({ min: 0, max: 10_000 }).map((i) => min + ((max - min) * i) / 10_000) },
    { weight: 1, arbitrary: fc.double({ min, max, noNaN: true }) },
  );
/** Plausible arguments with 0, 1 or 2 of them replaced by junk (so about a third of the calls are fully plausible). */
const corrupt = <T extends unknown[]>(good: fc.Arbitrary<T>): fc.Arbitrary<unknown[]> =>
  fc.tuple(good, fc.array(fc.tuple(fc.nat(), junk), { maxLength: 2 })).map(([args, subs]) => {
    const out: unknown[] = args.slice();
    for (const [i, v] of subs) out[i % out.length] = v;
    return out;
  });
const blank = fc.constantFrom(null, undefined, '');

// ---------------------------------------------------------------- checks

interface Tally {
  values: number;
  refusals: number;
}
const tallies: Record<string, Tally> = {};
/** Rows whose plan had a column out of range (the plan API returned a non-finite number): reported, refused by the shell. */
const overflows = new Set<string>();
const tally = (name: string): Tally => (tallies[name] ??= { values: 0, refusals: 0 });

afterAll(() => {
  const st = scheduler.stats();
  const lines = Object.entries(tallies).map(([k, t]) => `${k}: ${t.values} values, ${t.refusals} refusals`);
  if (overflows.size) console.log(`plan columns out of range (${overflows.size} rows), first ones:\n${[...overflows].slice(0, 5).join('\n')}`);
  console.log(`${lines.join('\n')}\nscheduler: ${st.tasks} tasks, longest task ${st.longestTaskMs.toFixed(1)} ms, longest slice ${st.longestSliceMs.toFixed(1)} ms`);
});

type Shape = 'number' | 'string' | 'grid' | { rows: 1; cols: number; cells: 'number' | 'mixed' | 'string' };

function expectShape(name: string, v: unknown, shape: Shape, args: unknown): void {
  const where = `${name}(${safeJson(args)}) → ${safeJson(v)}`;
  if (shape === 'number') {
    expect(typeof v === 'number' && Number.isFinite(v), where).toBe(true);
    return;
  }
  if (shape === 'string') {
    expect(typeof v === 'string' && v.length > 0, where).toBe(true);
    return;
  }
  if (shape === 'grid') {
    // A non-empty rectangle of finite numbers.
    expect(Array.isArray(v) && v.length > 0 && Array.isArray(v[0]) && v[0].length > 0, where).toBe(true);
    const rows = v as unknown[][];
    for (const row of rows) {
      expect(Array.isArray(row) && row.length === rows[0].length, where).toBe(true);
      for (const cell of row) expect(typeof cell === 'number' && Number.isFinite(cell), where).toBe(true);
    }
    return;
  }
  expect(Array.isArray(v) && v.length === 1 && Array.isArray(v[0]) && v[0].length === shape.cols, where).toBe(true);
  for (const cell of (v as unknown[][])[0]) {
    const ok =
      shape.cells === 'number'
        ? typeof cell === 'number' && Number.isFinite(cell)
        : shape.cells === 'string'
          ? typeof cell === 'string' && cell.length > 0
          : (typeof cell === 'number' && Number.isFinite(cell)) || typeof cell === 'string';
    expect(ok, where).toBe(true);
  }
}

function safeJson(x: unknown): string {
  return JSON.stringify(x, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v === undefined ? 'undefined' : v))?.slice(0, 600) ?? 'undefined';
}

function expectRefusal(name: string, e: unknown, args: unknown): void {
  const where = `${name}(${safeJson(args)}) threw ${e instanceof Error ? `${e.constructor.name}: ${e.message}` : String(e)}`;
  expect(e instanceof StubWorksheetError, where).toBe(true);
  const w = e as StubWorksheetError;
  expect(['#VALUE!', '#NUM!'], where).toContain(w.code);
  expect(w.message.length, where).toBeGreaterThan(0);
  expect(w.message, where).not.toMatch(/^internal error/);
}

function checkSync(name: keyof typeof functions, shape: Shape, args: unknown[]): void {
  const meter = workMeter();
  try {
    const v = fn(name)(...args);
    expect(v instanceof Promise, `${name} is synchronous`).toBe(false);
    expectShape(name, v, shape, args);
    tally(name).values++;
  } catch (e) {
    expectRefusal(name, e, args);
    tally(name).refusals++;
  }
  expect(meter.used(), `${name}(${safeJson(args)}) ran a design search`).toBe(0);
}

type Outcome = { ok: true; value: unknown } | { ok: false; error: unknown };

/** Calls a Promise-returning function; nothing may be thrown synchronously. */
function start(name: keyof typeof functions, args: unknown[]): Promise<Outcome> {
  let p: unknown;
  try {
    p = fn(name)(...args);
  } catch (e) {
    return Promise.resolve({ ok: false, error: new Error(`${name} threw synchronously: ${String(e)}`) });
  }
  expect(p instanceof Promise, `${name} returns a Promise`).toBe(true);
  return (p as Promise<unknown>).then(
    (value): Outcome => ({ ok: true, value }),
    (error): Outcome => ({ ok: false, error }),
  );
}

function checkOutcome(name: string, o: Outcome, shape: Shape, args: unknown[]): void {
  if (o.ok) {
    expectShape(name, o.value, shape, args);
    tally(name).values++;
  } else {
    expectRefusal(name, o.error, args);
    tally(name).refusals++;
  }
}

/** A batch of `calls` Promise-returning calls did at most one bounded design search per call. */
function expectBatchBounded(meter: { used(): number }, calls: number): void {
  expect(meter.used(), `design work of a batch of ${calls} calls`).toBeLessThanOrEqual(calls * DESIGN_WORK_BOUND);
}

/** Reports a failure by its error (which names the call) and the seed, not the whole batch that contained it. */
function reporter<T>(out: fc.RunDetails<T>): void {
  if (!out.failed) return;
  const e = out.errorInstance;
  throw new Error(`property failed (seed ${out.seed}, path ${out.counterexamplePath}): ${e instanceof Error ? e.message : String(e)}`);
}
const asyncReporter = async <T>(out: fc.RunDetails<T>): Promise<void> => reporter(out);
const params = { numRuns: RUNS, seed: SEED, reporter };

// ---------------------------------------------------------------- synchronous functions

const good = <T>(a: fc.Arbitrary<T>) => fc.oneof({ weight: 4, arbitrary: a }, { weight: 1, arbitrary: blank });
const budgetArgs = corrupt(
  fc.tuple(num(0, 1), good(num(0, 1)), good(fc.integer({ min: 1, max: 6 })), good(fc.constantFrom('worst', 'random', ' Random ')), good(num(0, 1))),
);
const reflectionArgs = corrupt(
  fc.tuple(
    fc.integer({ min: 1, max: 200 }),
    fc.integer({ min: 0, max: 10 }),
    num(2, 200),
    good(num(0, 89.9)),
    good(num(0.05, 20)),
    good(num(1, 100)),
    good(num(0, 10)),
    good(num(0, 10)),
    good(num(0.05, 0.58)),
    good(num(1, 4)),
    good(fc.integer({ min: 1, max: 3 })),
  ),
);
const rippleArgs = corrupt(fc.tuple(num(0, 1), num(0, 10), good(num(1, 100)), good(num(0, 1))));
const rippleSourceArgs = corrupt(fc.tuple(num(0, 1), num(0, 1e12), good(num(1, 100)), good(num(0, 1))));

describe('property: synchronous worksheet functions return finite values or #VALUE!/#NUM!', () => {
  it(`HUSH.NEEDED_REFLECTION and HUSH.ERROR_FROM_REFLECTION (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(budgetArgs, (args) => {
        checkSync('neededReflection', 'number', args);
        checkSync('errorFromReflection', 'number', args);
      }),
      params,
    );
  });

  it(`HUSH.REFLECTION and HUSH.REFLECTION_CONTINUOUS (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(reflectionArgs, (args) => {
        checkSync('reflectionExact', 'number', args);
        checkSync('reflectionContinuous', 'number', args);
      }),
      params,
    );
  });

  it(`HUSH.REFLECTION_TABLE over random ranges (${RUNS} calls, ${BATCH} in flight at a time; it returns a Promise)`, async () => {
    // Ranges of 1–4 × 1–4 cells (mixed with junk), in the ppw_list and angles slots of the REFLECTION arguments.
    const range = (a: fc.Arbitrary<unknown>) => fc.array(fc.array(a, { minLength: 1, maxLength: 4 }), { minLength: 1, maxLength: 4 });
    const mostly = (a: fc.Arbitrary<unknown>) => fc.oneof({ weight: 30, arbitrary: a }, { weight: 1, arbitrary: junkScalar });
    const lists = fc.tuple(range(mostly(num(2, 200))), fc.oneof(blank, range(mostly(num(0, 89.9)))));
    const tableArgs = fc.tuple(reflectionArgs, lists).map(([args, [ppws, angles]]) => {
      const a = args.slice();
      a[2] = ppws;
      a[3] = angles;
      return a;
    });
    await fc.assert(
      fc.asyncProperty(fc.array(tableArgs, { minLength: BATCH, maxLength: BATCH }), async (batch) => {
        const meter = workMeter();
        const outcomes = await Promise.all(batch.map((a) => start('reflectionTable', a)));
        outcomes.forEach((o, k) => checkOutcome('reflectionTable', o, 'grid', batch[k]));
        expect(meter.used(), 'REFLECTION_TABLE ran a design search').toBe(0);
      }),
      { numRuns: Math.max(1, Math.round(RUNS / BATCH)), seed: SEED, asyncReporter, endOnFailure: true },
    );
    // A good share of the calls get through to the computation.
    expect(tally('reflectionTable').values).toBeGreaterThan(RUNS * 0.1);
  });

  it(`HUSH.RIPPLE and HUSH.RIPPLE_SOURCE (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(rippleArgs, rippleSourceArgs, (args, inverse) => {
        checkSync('ripple', { rows: 1, cols: 2, cells: 'number' }, args);
        checkSync('rippleSource', { rows: 1, cols: 2, cells: 'number' }, inverse);
      }),
      params,
    );
  });

  it(`HUSH.MODEL_VERSION, HUSH.DESIGN_HEADER and HUSH.PLAN_HEADER, with stray arguments (${RUNS} calls each)`, () => {
    fc.assert(
      fc.property(fc.array(junk, { maxLength: 3 }), (stray) => {
        checkSync('modelVersion', 'string', stray);
        checkSync('designHeader', { rows: 1, cols: 10, cells: 'string' }, stray);
        checkSync('planHeader', { rows: 1, cols: OUTPUT_NAMES.length, cells: 'string' }, stray);
      }),
      params,
    );
  });
});

// ---------------------------------------------------------------- LAYERS and DESIGN

/**
 * Design arguments: a dozen plausible specs (few enough that repeated specs
 * exercise the memo and the runs stay fast), 0–2 arguments replaced by junk.
 */
const designSpecs: unknown[][] = [
  [1e-3, 20],
  [1e-2, 10, 30],
  [1e-4, 15, 30, 45, '3,4'],
  [1e-6, 40, null, 30, [[2], [3]], 0.5],
  [1e-3, 20, 40, '0.5 rad', null, null, 1.5],
  [1e-3, 12, null, null, 3, null, null, 2],
  [0.05, 6, 12, 60],
  [1e-5, 30, 60, null, '2 3 4', null, 3.5, 3, 5, 0.05],
  [1e-9, 20, null, null, [[4, null]]],
  [1e-3, 8, 8, 85],
  [1e-3, 20, null, null, null, 0.9, null, 1],
  [1e-12, 4, null, 85],
];
const designArgs = corrupt(fc.constantFrom(...designSpecs).map((a) => [...a, ...Array(10 - a.length).fill(null)]));

describe('property: HUSH.LAYERS and HUSH.DESIGN settle with finite values or #VALUE!/#NUM!', () => {
  it(`${RUNS} calls each, ${BATCH} in flight at a time; LAYERS = DESIGN's layers`, async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(designArgs, { minLength: BATCH, maxLength: BATCH }), async (batch) => {
        const meter = workMeter();
        const outcomes = await Promise.all(batch.map((args) => Promise.all([start('layers', args), start('design', args)])));
        outcomes.forEach(([l, d], k) => {
          checkOutcome('layers', l, 'number', batch[k]);
          checkOutcome('design', d, { rows: 1, cols: 10, cells: 'number' }, batch[k]);
          expect(l.ok, `LAYERS and DESIGN agree on ${safeJson(batch[k])}`).toBe(d.ok);
          if (l.ok && d.ok) expect(l.value).toBe((d.value as number[][])[0][0]);
        });
        expectBatchBounded(meter, 2 * BATCH);
      }),
      { numRuns: Math.max(1, Math.round(RUNS / BATCH)), seed: SEED, asyncReporter, endOnFailure: true },
    );
  });
});

// ---------------------------------------------------------------- PLAN and the figures

const demo = parseCsv(readFileSync(path.join(__dirname, '../assets/demo-project.csv'), 'utf8'));
const demoHeader = demo[0];
const example: [string[], unknown[]] = [
  ['band_short', 'cell', 'size_x', 'size_y', 'size_z', 'gap', 'intensity_error', 'passes', 'throughput', 'price_per_hour'],
  ['1550 nm', '25 nm', '8 um', '8 um', '3 um', '0.5 wavelengths', '1%', 20, 1e9, '$2.50/h'],
];
const bases: [string[], unknown[]][] = [...demo.slice(1).map((r): [string[], unknown[]] => [demoHeader, r]), example];

/** Plausible replacements per field, few enough that rows repeat (as the rows of a real table do). */
const alternatives: Record<string, unknown[]> = {
  dimensions: [1, 2, 3, '3'],
  band_short: ['1310 nm', '1.55 um', '193 THz', 1550, '2.4 GHz', '5 kg', '-1 nm'],
  band_long: ['1600 nm', '', '200 THz'],
  index: [1, 1.44, '3.48', 0.5],
  index_max: [3.48, 1],
  cell: ['20 nm', '10 nm', 40, '1 mm', '0 nm', '1e400 m'],
  courant: [0.5, 0.3, 0.7, ''],
  size_x: ['2 um', '10 um', 500, '1 km'],
  size_y: ['2 um', '', '100 m'],
  size_z: ['1 um', ''],
  cells_x: [40, 100, 1e6, 1e7],
  faces: ['x-, x+', 'z+', 'all', 'q+', ''],
  periodic: ['x', 'x y', 'none', 'w'],
  gap: [0, 10, '1 wavelength', '0.3 um', '5 cells', '-3'],
  angle_max: [0, 30, 60, 85, 89, '0.5 rad'],
  intensity_error: ['1%', '0.1%', 0.02, 0.5, 0, 2],
  coupling: [0.5, 1, 0],
  faces_seen: [1, 2, 6, 7],
  phase: ['worst', 'random', 'both'],
  share: [0.5, 1, 0],
  duration: ['1 ps', '400 fs', 1e6, '1e300 s', ''],
  passes: [1, 10, 1e9],
  q: [1000, 1e6, 0],
  ring_target: [1e-3, 1e-6, 2],
  ring_frequency: ['194 THz', 1e-9],
  throughput: [1e8, 1e9, 0, 1e-300],
  price_per_hour: ['$2/h', 3, '2.40 EUR/h', 'free'],
  precision: ['single', 'double', 'half'],
  nodes: [1, 4, 64, 100000],
  efficiency: [0.8, 1, 0],
  decomposition: ['slab', 'block', 'cube'],
  bandwidth: ['10 GB/s', 1, '1e-300 GB/s'],
  latency: ['2 us', 0, '1 s'],
  orders: ['3,4', '2', '11', 3],
  kappa_max: [1, 5, 200],
  alpha_max: [0, 100, 1e4],
};
const fieldNames = Object.keys(alternatives);

interface TableCall {
  header: unknown;
  row: unknown;
}

const substitution = fc.tuple(
  fc.constantFrom(...fieldNames),
  fc.oneof({ weight: 4, arbitrary: fc.nat() }, { weight: 1, arbitrary: fc.constant(-1) }),
  junkScalar,
);

/** A table call built from a demo row with 0–2 field substitutions, sometimes with a broken header or row range. */
const tableCall: fc.Arbitrary<TableCall> = fc
  .tuple(
    fc.nat({ max: bases.length - 1 }),
    fc.array(substitution, { maxLength: 2 }),
    fc.oneof(
      { weight: 12, arbitrary: fc.constant('row') },
      { weight: 2, arbitrary: fc.constant('column') },
      { weight: 1, arbitrary: fc.constantFrom('two rows', 'short', 'scalar', 'junk header', 'junk row') },
    ),
    junkRange,
  )
  .map(([b, subs, form, stray]): TableCall => {
    const header = bases[b][0].slice();
    const values = bases[b][1].slice();
    for (const [field, pick, wild] of subs) {
      const alts = alternatives[field];
      const value = pick < 0 ? wild : alts[pick % alts.length];
      const k = header.indexOf(field);
      if (k < 0) {
        header.push(field);
        values.push(value);
      } else values[k] = value;
    }
    switch (form) {
      case 'column':
        return { header: header.map((h) => [h]), row: values.map((v) => [v]) };
      case 'two rows':
        return { header: [header, header], row: [values] };
      case 'short':
        return { header: [header], row: [values.slice(1)] };
      case 'scalar':
        return { header: header[0], row: values[0] };
      case 'junk header':
        return { header: stray, row: [values] };
      case 'junk row':
        return { header: [header], row: stray };
      default:
        return { header: [header], row: [values] };
    }
  });

const FIGURES: [keyof typeof functions, string][] = [
  ['cells', 'cells_total'],
  ['memory', 'memory'],
  ['steps', 'steps'],
  ['runtime', 'runtime'],
  ['cost', 'cost'],
];

describe('property: HUSH.PLAN and the figures settle with finite values or #VALUE!/#NUM!', () => {
  it(`${RUNS} rows, PLAN, CELLS, MEMORY, STEPS, RUNTIME and COST on each (${RUNS} calls each); each figure = its PLAN column`, async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(tableCall, { minLength: BATCH, maxLength: BATCH }), async (batch) => {
        const meter = workMeter();
        const outcomes = await Promise.all(
          batch.map((c) => Promise.all([start('plan', [c.header, c.row]), ...FIGURES.map(([name]) => start(name, [c.header, c.row]))])),
        );
        outcomes.forEach(([p, ...figures], k) => {
          const args = [batch[k].header, batch[k].row];
          checkOutcome('plan', p, { rows: 1, cols: OUTPUT_NAMES.length, cells: 'mixed' }, args);
          figures.forEach((f, j) => {
            const [name, column] = FIGURES[j];
            checkOutcome(name, f, 'number', args);
            const planMessage = p.ok ? '' : (p.error as StubWorksheetError).message;
            const overflow = /^(\w+) is out of range/.exec(planMessage);
            if (overflow) {
              // PLAN refuses a row with a column out of range; the figures of the other columns stand.
              overflows.add(`${overflow[1]}: ${safeJson(args[1])}`);
              if (overflow[1] === column) expect(f.ok, `${name} of a row whose ${column} is out of range`).toBe(false);
            } else if (!p.ok) {
              // The same row refused the same way.
              expect(f.ok, `${name} of a row PLAN refuses (${planMessage})`).toBe(false);
              expect((f as { error: StubWorksheetError }).error.message).toBe(planMessage);
            } else if (f.ok) {
              expect(f.value, `${name} = PLAN's ${column}`).toBe((p.value as unknown[][])[0][OUTPUT_NAMES.indexOf(column)]);
            } else {
              expect((p.value as unknown[][])[0][OUTPUT_NAMES.indexOf(column)], `${name} refused only where PLAN has no ${column}`).toBe('');
            }
          });
        });
        expectBatchBounded(meter, (1 + FIGURES.length) * BATCH);
      }),
      { numRuns: Math.max(1, Math.round(RUNS / BATCH)), seed: SEED, asyncReporter, endOnFailure: true },
    );
    // A good fraction of the rows are planned, not refused.
    expect(tally('plan').values).toBeGreaterThan(RUNS * 0.25);
  });
});

/**
 * The heavy worksheet functions: HUSH.LAYERS, HUSH.DESIGN (+ header),
 * HUSH.PLAN (+ header), HUSH.CELLS, HUSH.MEMORY, HUSH.STEPS, HUSH.RUNTIME and
 * HUSH.COST, called the way Excel calls them (ranges as 2-D arrays, omitted
 * arguments as null, blank cells as "" or null), against independent calls of
 * the core and of the plan API; then the scheduler that keeps a 200-row
 * recalculation from blocking the shared runtime where the functions compute
 * on the main thread (in Node, and on hosts without a Web Worker; the worker
 * route and cancellation are in tests/functions-worker.test.ts).
 */
import { readFileSync } from 'fs';
import path from 'path';
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { clearDesignCache, designAbsorber, HushInputError } from '../src/physics';
import { clearPlanCache, planHeaderText, planRow, planToRow, rowFromTable, OUTPUT_NAMES } from '../src/plan';
import { parseCsv } from '../src/plan/csv';
import { readInput } from '../src/plan/fields';
import { cells, cost, design, designHeader, layers, memory, plan, planHeader, runtime, steps } from '../src/functions/functions';
import { clearWorksheetMemo, tableRow, worksheetMemoSize } from '../src/functions/plans';
import { createScheduler, scheduler } from '../src/functions/scheduler';
import { installCustomFunctionsStub, StubWorksheetError } from './support/custom-functions-stub';

beforeAll(() => {
  installCustomFunctionsStub();
});

beforeEach(() => clearWorksheetMemo());
afterEach(() => scheduler.resetStats());

type Loose = (...args: unknown[]) => unknown;
const call = (fn: unknown, ...args: unknown[]): Promise<unknown> => Promise.resolve((fn as Loose)(...args));

/** The worksheet error a call settles with, as Excel would show it. */
async function errorOf(fn: unknown, ...args: unknown[]): Promise<{ code: string; message: string }> {
  try {
    await call(fn, ...args);
  } catch (e) {
    expect(e).toBeInstanceOf(StubWorksheetError);
    const w = e as StubWorksheetError;
    return { code: w.code, message: w.message };
  }
  throw new Error('expected a worksheet error');
}

/** What the core or the plan API says about the same input. */
function refusal(compute: () => unknown): { code: string; message: string } {
  try {
    compute();
  } catch (e) {
    expect(e).toBeInstanceOf(HushInputError);
    const h = e as HushInputError;
    return { code: h.kind === 'value' ? '#VALUE!' : '#NUM!', message: h.message };
  }
  throw new Error('expected a refusal');
}

const demo = parseCsv(readFileSync(path.join(__dirname, '../assets/demo-project.csv'), 'utf8'));
const demoHeader = demo[0];
const demoRows = demo.slice(1);

/** The compact 3-D study of the JSDoc examples. */
const H = ['band_short', 'cell', 'size_x', 'size_y', 'size_z', 'gap', 'intensity_error', 'passes', 'throughput', 'price_per_hour'];
const R: (string | number)[] = ['1550 nm', '25 nm', '8 um', '8 um', '3 um', '0.5 wavelengths', '1%', 20, 1e9, '$2.50/h'];

/** The plan API's row for the same table cells, null shown as "" (independent call of the plan API). */
function expectedPlanRow(header: readonly string[], values: readonly (string | number | null)[]): (string | number)[] {
  return planToRow(planRow(rowFromTable(header, values))).map((v) => (v === null ? '' : v));
}

describe('HUSH.LAYERS and HUSH.DESIGN', () => {
  it('return the core design for the same spec (independent call of designAbsorber)', async () => {
    const d = designAbsorber({ target: 1e-4, ppwMin: 15, ppwMax: 30, angleMaxDeg: 45, orders: [3, 4] });
    expect(await layers(1e-4, 15, 30, 45, [[3, 4]])).toBe(d.layers);
    expect(await design(1e-4, 15, 30, 45, [[3, 4]])).toEqual([
      [d.layers, d.order, d.strength, d.kappaMax, d.alphaMaxNorm, d.alphaOrder, d.worstAmplitude, d.worstPpw, d.worstAngleDeg, d.continuousAmplitude],
    ]);
    const all = designAbsorber({ target: 1e-3, ppwMin: 20, courant: 0.5, index: 1.5, dimensions: 2, kappaMax: 3, alphaMaxNorm: 0.1 });
    expect(await call(design, 1e-3, 20, null, null, null, 0.5, 1.5, 2, 3, 0.1)).toEqual([
      [all.layers, all.order, all.strength, all.kappaMax, all.alphaMaxNorm, all.alphaOrder, all.worstAmplitude, all.worstPpw, all.worstAngleDeg, all.continuousAmplitude],
    ]);
  });

  it('orders as a range (row or column, blanks skipped), as text "3,4" or "3 4", or as one number', async () => {
    const expected = designAbsorber({ target: 1e-4, ppwMin: 15, orders: [3, 4] }).layers;
    for (const orders of [[[3, 4]], [[3], [4]], [[3, ''], [null, 4]], [['3,4']], '3,4', ' 3 4 ', [['3'], ['4']]]) {
      expect(await call(layers, 1e-4, 15, null, null, orders)).toBe(expected);
    }
    expect(await call(layers, 1e-4, 15, null, null, [[4]])).toBe(designAbsorber({ target: 1e-4, ppwMin: 15, orders: [4] }).layers);
  });

  it('omitted arguments (null, undefined, "", a blank range) take the core defaults', async () => {
    const expected = designAbsorber({ target: 1e-3, ppwMin: 20 }).layers;
    for (const blank of [null, undefined, '', [['']]]) {
      expect(await call(layers, 1e-3, 20, blank, blank, blank, blank, blank, blank, blank, blank)).toBe(expected);
    }
    expect(await call(layers, 1e-3, 20, null, null, [[null, ''], ['', null]])).toBe(expected);
  });

  it('the angle takes degrees or text with an angle unit (0.5 rad = 28.6478897565° to the 12 digits the units parser keeps, derived)', async () => {
    const deg = Number(((0.5 * 180) / Math.PI).toPrecision(12));
    const d = designAbsorber({ target: 1e-3, ppwMin: 20, ppwMax: 40, angleMaxDeg: deg });
    expect(await call(design, 1e-3, 20, 40, '0.5 rad')).toEqual(await call(design, 1e-3, 20, 40, deg));
    expect(await call(layers, 1e-3, 20, 40, '0.5 rad')).toBe(d.layers);
    expect(await call(layers, 1e-3, 20, 40, '30')).toBe(await layers(1e-3, 20, 40, 30));
  });

  it('input the core refuses is #NUM! with its message; wrong types are #VALUE!', async () => {
    expect(await errorOf(layers, 0, 20)).toEqual(refusal(() => readInput('target', 0)));
    expect(await errorOf(layers, 1e-3, 2)).toEqual(refusal(() => designAbsorber({ target: 1e-3, ppwMin: 2 })));
    expect(await errorOf(layers, 1e-3, 20, 10)).toEqual(refusal(() => designAbsorber({ target: 1e-3, ppwMin: 20, ppwMax: 10 })));
    expect((await errorOf(design, 1e-3, 20, null, 89)).code).toBe('#NUM!');
    expect(await errorOf(layers, 1e-3, 20, null, null, [[11]])).toEqual(refusal(() => readInput('orders', 11)));
    const infeasible = refusal(() => designAbsorber({ target: 1e-12, ppwMin: 4, angleMaxDeg: 85 }));
    expect(infeasible.message).toMatch(/^no design up to 200 layers/);
    expect(await errorOf(layers, 1e-12, 4, null, 85)).toEqual(infeasible);
    expect(await errorOf(layers, 1e-3, 20, null, '5 kg')).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^angle_max must be an angle/) });
    expect(await errorOf(layers, 1e-3, 20, null, null, '2,x')).toEqual({
      code: '#VALUE!',
      message: 'orders must be a list of numbers such as 2, 3, 4 (got "2,x")',
    });
    expect(await errorOf(layers, null, 20)).toEqual({ code: '#VALUE!', message: 'target is required (required amplitude reflection |r| per face)' });
    expect(await errorOf(design, [[1e-3, 1e-4]], 20)).toEqual({ code: '#VALUE!', message: 'target must be a single value, not a range of 1×2 cells' });
  });

  it('HUSH.DESIGN_HEADER names every column of HUSH.DESIGN, sharing the plan header text where the columns are the same', async () => {
    const [header] = designHeader();
    const [row] = await design(1e-3, 20);
    expect(header).toHaveLength(row.length);
    for (const name of ['layers [cells]', 'order', 'strength [σmax/σopt]', 'worst_reflection [|r|]', 'continuous_reflection [|r|]']) {
      expect(header).toContain(name);
      expect(planHeaderText()).toContain(name);
    }
  });
});

describe('HUSH.PLAN and the figures read from a plan', () => {
  it('HUSH.PLAN spills the plan API row of the same table cells, empty values as ""; HUSH.PLAN_HEADER matches it', async () => {
    const row = await plan([H], [R]);
    expect(row).toEqual([expectedPlanRow(H, R)]);
    expect(planHeader()).toEqual([planHeaderText()]);
    expect(planHeader()[0]).toHaveLength(row[0].length);
    for (const values of demoRows) {
      let expected: unknown;
      try {
        expected = [expectedPlanRow(demoHeader, values)];
      } catch (e) {
        expected = refusal(() => {
          throw e;
        });
      }
      const got = await plan([demoHeader], [values]).catch((e: StubWorksheetError) => ({ code: e.code, message: e.message }));
      expect(got).toEqual(expected);
    }
  });

  it('CELLS, MEMORY, STEPS, RUNTIME and COST are the plan row’s columns', async () => {
    const [row] = await plan([H], [R]);
    const col = (name: string) => row[OUTPUT_NAMES.indexOf(name)];
    expect(await cells([H], [R])).toBe(col('cells_total'));
    expect(await memory([H], [R])).toBe(col('memory'));
    expect(await steps([H], [R])).toBe(col('steps'));
    expect(await runtime([H], [R])).toBe(col('runtime'));
    expect(await cost([H], [R])).toBe(col('cost'));
    // Planning estimate: cost = runtime × nodes × price (physics.md §5, derived), 1 node at 2.50 per hour.
    expect(await cost([H], [R])).toBeCloseTo((await runtime([H], [R])) * 2.5, 12);
  });

  it('all functions of one row share one plan: one scheduled task, one memo entry', async () => {
    clearPlanCache();
    scheduler.resetStats();
    await Promise.all([plan([H], [R]), cells([H], [R]), memory([H], [R]), steps([H], [R]), runtime([H], [R]), cost([H], [R])]);
    expect(scheduler.stats().tasks).toBe(1);
    expect(worksheetMemoSize().plans).toBe(1);
    // A later recalculation of the same row is served without queuing again.
    await Promise.all([plan([H], [R]), cells([H], [R])]);
    expect(scheduler.stats().tasks).toBe(1);
  });

  it('a header with units in brackets, other columns, and column-shaped ranges read the same row', async () => {
    const withUnits = ['band_short [nm]', 'Cell', 'size_x', 'size_y', 'size_z', 'gap', 'intensity_error', 'passes', 'throughput', 'price_per_hour', 'remark'];
    const expected = await plan([H], [R]);
    expect(await plan([withUnits], [[...R, 'colleague’s note']])).toEqual(expected);
    expect(await plan(H.map((h) => [h]), R.map((v) => [v]))).toEqual(expected);
  });

  it('blank cells as "", null or undefined all mean "not given"', async () => {
    const header = [...H, 'courant', 'orders', 'kappa_max'];
    const expected = await plan([H], [R]);
    for (const blank of ['', null, undefined, '  ']) {
      expect(await plan([header], [[...R, blank, blank, blank]])).toEqual(expected);
    }
  });

  it('a missing figure is #VALUE! saying what to add to the row', async () => {
    const noRun = H.slice(0, 7);
    const noRunValues = R.slice(0, 7);
    expect(await errorOf(steps, [noRun], [noRunValues])).toEqual({ code: '#VALUE!', message: 'steps need a run length: give duration, passes or q in the row' });
    expect(await errorOf(runtime, [noRun], [noRunValues])).toEqual({ code: '#VALUE!', message: 'runtime needs a run length: give duration, passes or q in the row' });
    expect(await errorOf(cost, [noRun], [noRunValues])).toEqual({ code: '#VALUE!', message: 'cost needs a run length: give duration, passes or q in the row' });
    const noThroughput = H.slice(0, 8);
    expect(await errorOf(runtime, [noThroughput], [R.slice(0, 8)])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^runtime needs throughput/) });
    expect(await errorOf(cost, [noThroughput], [R.slice(0, 8)])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^cost needs throughput/) });
    expect(await errorOf(cost, [H.slice(0, 9)], [R.slice(0, 9)])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^cost needs price_per_hour/) });
    expect(await cells([noRun], [noRunValues])).toBe(await cells([H], [R]));
  });

  it('a row the plan API refuses is #VALUE!/#NUM! with its message', async () => {
    const noCell = R.map((v, k) => (H[k] === 'cell' ? '' : v));
    expect(await errorOf(plan, [H], [noCell])).toEqual(refusal(() => planRow(rowFromTable(H, noCell))));
    const zeroError = R.map((v, k) => (H[k] === 'intensity_error' ? 0 : v));
    const zero = refusal(() => planRow(rowFromTable(H, zeroError)));
    expect(zero.code).toBe('#NUM!');
    expect(await errorOf(cells, [H], [zeroError])).toEqual(zero);
    const kg = R.map((v, k) => (H[k] === 'cell' ? '5 kg' : v));
    expect(await errorOf(memory, [H], [kg])).toEqual(refusal(() => planRow(rowFromTable(H, kg))));
    expect((await errorOf(memory, [H], [kg])).code).toBe('#VALUE!');
  });

  it('ranges of the wrong shape or content are #VALUE! saying what is allowed', async () => {
    expect(await errorOf(plan, [H, H], [R])).toEqual({ code: '#VALUE!', message: 'header must be one row (or one column) of the project table, not a range of 2×10 cells' });
    expect(await errorOf(plan, [H], [R.slice(1)])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^row has 9 cells but the header has 10/) });
    expect(await errorOf(plan, [['a', 'b']], [[1, 2]])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^header names no project field/) });
    expect(await errorOf(plan, [[]], [[]])).toEqual({ code: '#VALUE!', message: 'header must be a rectangular range of cells' });
    expect(await errorOf(plan, [H], [[...R.slice(0, 9), { type: 'Error' }]])).toMatchObject({ code: '#VALUE!', message: expect.stringMatching(/^the cell under "price_per_hour" must be a number or text/) });
    expect(() => tableRow([[1, 2], [3]], [[1, 2]])).toThrow('header must be a rectangular range of cells');
  });
});

describe('scheduler (src/functions/scheduler.ts)', () => {
  const busy = (ms: number) => {
    const end = performance.now() + ms;
    while (performance.now() < end);
  };

  it('runs tasks in order, settles each with its result or exception, and ends a slice once the budget is spent', async () => {
    const s = createScheduler(20);
    const order: number[] = [];
    const results = await Promise.allSettled(
      Array.from({ length: 20 }, (_, i) =>
        s.schedule(() => {
          busy(5);
          order.push(i);
          if (i === 7) throw new Error('seven');
          return i * i;
        }),
      ),
    );
    expect(order).toEqual(Array.from({ length: 20 }, (_, i) => i));
    expect(results[3]).toEqual({ status: 'fulfilled', value: 9 });
    expect(results[7]).toMatchObject({ status: 'rejected', reason: new Error('seven') });
    const st = s.stats();
    expect(st.tasks).toBe(20);
    // 5 ms tasks and a 20 ms budget: at most 4 tasks per slice (the fourth crosses it), so at least 5 slices (derived).
    expect(st.mostTasksPerSlice).toBeLessThanOrEqual(4);
    expect(st.slices).toBeGreaterThanOrEqual(5);
    expect(s.pending()).toBe(0);
  });

  it('a queued task can be withdrawn: it never runs, the tasks around it do; a task that ran cannot be', async () => {
    const s = createScheduler(20);
    const ran: string[] = [];
    const a = s.scheduleTask(() => ran.push('a'));
    const b = s.scheduleTask(() => ran.push('b'));
    const c = s.scheduleTask(() => ran.push('c'));
    expect(s.pending()).toBe(3);
    expect(b.cancel()).toBe(true);
    expect(b.cancel()).toBe(false);
    expect(s.pending()).toBe(2);
    await Promise.all([a.promise, c.promise]);
    expect(ran).toEqual(['a', 'c']);
    expect(a.cancel()).toBe(false);
    expect(s.stats()).toMatchObject({ tasks: 2, withdrawn: 1 });
    expect(s.pending()).toBe(0);
  });

  it('a 200-row recalculation (demo rows, perturbed tolerances) resolves correctly without holding the runtime for long', async () => {
    clearPlanCache();
    clearDesignCache();
    scheduler.resetStats();
    const k = demoHeader.indexOf('intensity_error');
    // 200 studies: the demo rows with the tolerance scaled by 0.2 … 5 (deterministic, log-spaced).
    const rows = Array.from({ length: 200 }, (_, i) => {
      const values = demoRows[i % demoRows.length].slice();
      const base = parseFloat(values[k]) / (values[k].trim().endsWith('%') ? 100 : 1);
      values[k] = String(Number((base * Math.pow(25, (i * 0.618034) % 1) * 0.2).toPrecision(6)));
      return values;
    });
    // A probe macrotask chain: how long the runtime went without serving other work.
    let probing = true;
    let ticks = 0;
    let longestGap = 0;
    let last = performance.now();
    const probe = () => {
      const t = performance.now();
      longestGap = Math.max(longestGap, t - last);
      last = t;
      ticks++;
      if (probing) setTimeout(probe, 0);
    };
    setTimeout(probe, 0);
    const t0 = performance.now();
    const settled = await Promise.all(rows.map((values) => plan([demoHeader], [values]).catch((e: StubWorksheetError) => ({ code: e.code, message: e.message }))));
    const wall = performance.now() - t0;
    probing = false;
    const st = scheduler.stats();
    // Independent: the plan API called directly, caches cleared.
    clearPlanCache();
    clearDesignCache();
    const expected = rows.map((values) => {
      try {
        return [expectedPlanRow(demoHeader, values)];
      } catch (e) {
        return refusal(() => {
          throw e;
        });
      }
    });
    expect(settled).toEqual(expected);
    const failed = settled.filter((s) => !Array.isArray(s)).length;
    console.log(
      `200-row recalculation: ${wall.toFixed(0)} ms wall, ${st.slices} slices, ${st.tasks} tasks, longest slice ${st.longestSliceMs.toFixed(1)} ms, ` +
        `longest task ${st.longestTaskMs.toFixed(1)} ms, most tasks per slice ${st.mostTasksPerSlice}, probe ${ticks} ticks, longest probe gap ${longestGap.toFixed(1)} ms, ${failed} rows refused`,
    );
    expect(st.tasks).toBe(200);
    // It yielded: several slices, and other macrotasks ran in between.
    expect(st.slices).toBeGreaterThan(1);
    expect(ticks).toBeGreaterThan(1);
    // How long each slice held the runtime is a time, so it is logged above and
    // measured by `npm run bench`, not asserted here.
  });
});

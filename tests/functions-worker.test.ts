/**
 * Excel stays responsive (issue 13): the heavy worksheet functions (LAYERS,
 * DESIGN, PLAN and the figures, REFLECTION_TABLE) compute in a Web Worker of
 * the shared runtime (src/functions/worker-client.ts), fall back to the
 * main-thread scheduler where no worker can be had, and are @cancelable: a
 * cancelled call settles at once, a computation nobody waits for any more
 * stops, and a cancelled computation never enters the memo (plans.ts).
 *
 * Three kinds of worker: an in-process fake whose every step the test drives
 * (the executor's and the memo's semantics, deterministic), a real
 * worker_threads thread running src/functions/worker.ts unchanged
 * (tests/support/node-worker.ts: same results as the main thread, a running
 * job stopped by terminating it, and the probe below), and none (fallback).
 *
 * The probe measures how long the main thread was held in counted work, not
 * time: the design search's designWork() plus the tables' tableWork(), both in
 * layer-evaluations (one layer of one exact reflection evaluation), read at
 * each tick of a setTimeout(0) chain; the largest increase between two ticks
 * is the largest single synchronous task the thread ran.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { clearDesignCache, designAbsorber, designWork, HushInputError } from '../src/physics';
import { clearPlanCache, planRecord, planRow, planToRow, rowFromTable } from '../src/plan';
import { cells, design, layers, memory, plan, reflectionExact, reflectionTable } from '../src/functions/functions';
import { CANCEL_GRACE_MS, clearWorksheetMemo, setWorksheetExecutor, worksheetMemoSize } from '../src/functions/plans';
import { createScheduler } from '../src/functions/scheduler';
import {
  JobCancelled,
  MainThreadExecutor,
  WorkerExecutor,
  WorkerFailed,
  createExecutor,
  type Executor,
  type WorkerLike,
} from '../src/functions/worker-client';
import type { FromWorker, Job, ToWorker } from '../src/functions/worker-protocol';
import { runJob, serializeError, tableWork } from '../src/functions/worker-tasks';
import { installCustomFunctionsStub, StubWorksheetError } from './support/custom-functions-stub';
import { nodeWorkers } from './support/node-worker';

beforeAll(() => installCustomFunctionsStub());
afterEach(() => setWorksheetExecutor(null));

const macrotask = () => new Promise<void>((r) => setTimeout(r, 0));
/** Resolves after every timer of CANCEL_GRACE_MS set before it (Node runs timers of one duration in the order they were set). */
const afterGrace = () => new Promise<void>((r) => setTimeout(r, CANCEL_GRACE_MS));

/** How a call settled, as a cell would show it. */
async function settled(p: Promise<unknown>): Promise<{ value: unknown } | { code: string; message: string }> {
  try {
    return { value: await p };
  } catch (e) {
    if (e instanceof StubWorksheetError) return { code: e.code, message: e.message };
    throw e;
  }
}

/** Excel's CancelableInvocation, as far as the functions use it. */
type Invocation = { onCanceled?: () => void };
const invocation = (): Invocation => ({});
const cancel = (inv: Invocation) => inv.onCanceled!();
/** The worksheet function's arguments padded with nulls to its own count, then the invocation (it is always the last parameter). */
const call = <F extends (...a: any[]) => any>(f: F, args: unknown[], inv: Invocation): ReturnType<F> =>
  f(...[...args, ...Array(f.length - 1 - args.length).fill(null)], inv);
const CANCELLED = { code: '#VALUE!', message: new JobCancelled().message };

/**
 * An in-process worker that does each step when the test says so: it loads
 * (posts 'ready') on the next macrotask, or fails to load; with `hold` a job
 * it receives runs only when finish() is called; crash() is an error event.
 */
class FakeWorker implements WorkerLike {
  onmessage: ((ev: { data: FromWorker }) => void) | null = null;
  onerror: ((ev: { message?: string }) => void) | null = null;
  readonly posted: ToWorker[] = [];
  terminated = false;
  private running: ToWorker | null = null;

  constructor(private readonly opts: { hold?: boolean; failToLoad?: boolean }) {
    setTimeout(() => (opts.failToLoad ? this.onerror?.({ message: 'script did not load' }) : this.emit({ type: 'ready' })), 0);
  }

  private emit(m: FromWorker): void {
    if (!this.terminated) this.onmessage?.({ data: m });
  }

  postMessage(m: ToWorker): void {
    this.posted.push(m);
    this.running = m;
    setTimeout(() => {
      this.emit({ type: 'started', id: m.id });
      if (!this.opts.hold) this.finish();
    }, 0);
  }

  /** Runs the job it holds and posts its outcome (through a structured clone, as postMessage does). */
  finish(): void {
    const m = this.running;
    if (!m || this.terminated) return;
    this.running = null;
    try {
      this.emit({ type: 'done', id: m.id, value: structuredClone(runJob(m.job)) });
    } catch (e) {
      this.emit({ type: 'failed', id: m.id, error: serializeError(e) });
    }
  }

  crash(): void {
    this.onerror?.({ message: 'out of memory' });
  }

  terminate(): void {
    this.terminated = true;
  }
}

function fakeWorkers(opts: { hold?: boolean; failToLoad?: boolean } = {}) {
  const made: FakeWorker[] = [];
  return {
    made,
    factory: () => {
      const w = new FakeWorker(opts);
      made.push(w);
      return w;
    },
    last: () => made[made.length - 1],
  };
}

/** Waits until `cond` holds, one macrotask at a time (a bound on steps, not on time). */
async function until(cond: () => boolean, what: string, steps = 10_000): Promise<void> {
  for (let i = 0; i < steps; i++) {
    if (cond()) return;
    await macrotask();
  }
  throw new Error(`never happened: ${what}`);
}

const SPEC = { target: 1e-3, ppwMin: 20 };
const INFEASIBLE = { target: 1e-12, ppwMin: 4, angleMaxDeg: 85 };
const TABLE: Extract<Job, { kind: 'table' }> = { kind: 'table', design: { layers: 10, order: 3 }, wave: { courant: 0.5, dimensions: 3 }, ppws: [20, 40], angles: [0, 45] };

/** The compact 3-D study of the JSDoc examples. */
const H = ['band_short', 'cell', 'size_x', 'size_y', 'size_z', 'gap', 'intensity_error', 'passes', 'throughput', 'price_per_hour'];
const R: (string | number)[] = ['1550 nm', '25 nm', '8 um', '8 um', '3 um', '0.5 wavelengths', '1%', 20, 1e9, '$2.50/h'];
const planCells = () => planToRow(planRow(rowFromTable(H, R))).map((v) => (v === null ? '' : v));

describe('WorkerExecutor (in-process fake worker)', () => {
  it('runs jobs one at a time in the order submitted; values and HushInputErrors cross as data', async () => {
    const w = fakeWorkers();
    const ex = new WorkerExecutor(w.factory);
    const a = ex.submit({ kind: 'design', spec: SPEC });
    const b = ex.submit({ kind: 'design', spec: INFEASIBLE });
    const c = ex.submit(TABLE);
    expect(w.made).toHaveLength(1);
    expect(w.last().posted).toHaveLength(1);
    expect(await a.promise).toEqual(designAbsorber(SPEC));
    // The refusal keeps its field, kind and message (independent call of the core).
    let direct: HushInputError | undefined;
    try {
      designAbsorber(INFEASIBLE);
    } catch (e) {
      direct = e as HushInputError;
    }
    const refused = await b.promise.catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(HushInputError);
    expect(refused).toMatchObject({ field: direct!.field, kind: direct!.kind, message: direct!.message });
    expect(await c.promise).toEqual([20, 40].map((ppw) => [0, 45].map((a) => reflectionExact(10, 3, ppw, a, null, null, null, null, 0.5, null, 3))));
    expect(w.last().posted.map((m) => m.job.kind)).toEqual(['design', 'design', 'table']);
    expect(ex.stats()).toMatchObject({ submitted: 3, workersStarted: 1, fellBack: false });
    expect(ex.route).toBe('worker');
  });

  it('a waiting job cancelled is never posted; the running job cancelled terminates its worker, and the next job runs on a fresh one', async () => {
    const w = fakeWorkers({ hold: true });
    const ex = new WorkerExecutor(w.factory);
    const a = ex.submit({ kind: 'design', spec: SPEC });
    const b = ex.submit({ kind: 'design', spec: { target: 1e-4, ppwMin: 20 } });
    const c = ex.submit({ kind: 'design', spec: { target: 1e-2, ppwMin: 10 } });
    const first = w.last();
    b.cancel();
    await expect(b.promise).rejects.toBeInstanceOf(JobCancelled);
    a.cancel();
    await expect(a.promise).rejects.toBeInstanceOf(JobCancelled);
    expect(first.terminated).toBe(true);
    expect(w.made).toHaveLength(2);
    const second = w.last();
    expect(second.posted.map((m) => m.job)).toEqual([{ kind: 'design', spec: { target: 1e-2, ppwMin: 10 } }]);
    await until(() => second.posted.length === 1, 'c posted');
    second.finish();
    expect(await c.promise).toEqual(designAbsorber({ target: 1e-2, ppwMin: 10 }));
    // Nothing the first worker might still post counts; b never reached a worker.
    expect(first.posted.map((m) => m.job)).toEqual([{ kind: 'design', spec: SPEC }]);
    expect(ex.stats()).toMatchObject({ submitted: 3, cancelledWaiting: 1, cancelledRunning: 1, workersStarted: 2 });
  });

  it('a worker that dies while running a job fails that job with WorkerFailed; the next job gets a fresh worker', async () => {
    const w = fakeWorkers({ hold: true });
    const ex = new WorkerExecutor(w.factory);
    const a = ex.submit({ kind: 'design', spec: SPEC });
    const b = ex.submit({ kind: 'design', spec: { target: 1e-2, ppwMin: 10 } });
    await until(() => w.made.length === 1 && w.last().posted.length === 1, 'a posted');
    await macrotask(); // the worker said 'ready'
    w.last().crash();
    await expect(a.promise).rejects.toBeInstanceOf(WorkerFailed);
    expect(w.made).toHaveLength(2);
    await until(() => w.last().posted.length === 1, 'b posted');
    w.last().finish();
    expect(await b.promise).toEqual(designAbsorber({ target: 1e-2, ppwMin: 10 }));
    expect(ex.stats()).toMatchObject({ workerFailures: 1, fellBack: false });
  });

  it('falls back to the main thread for good: no Worker, a Worker constructor that throws, or a worker that fails before it is ready', async () => {
    expect(createExecutor(null)).toBeInstanceOf(MainThreadExecutor);
    expect(typeof Worker).toBe('undefined'); // Node: the default executor is the main thread's
    expect(createExecutor().route).toBe('main thread');

    const throwing = new WorkerExecutor(() => {
      throw new Error('SecurityError');
    });
    expect(await throwing.submit({ kind: 'design', spec: SPEC }).promise).toEqual(designAbsorber(SPEC));
    expect(throwing.route).toBe('main thread');

    const w = fakeWorkers({ failToLoad: true, hold: true });
    const ex = new WorkerExecutor(w.factory);
    const jobs = [ex.submit({ kind: 'design', spec: SPEC }), ex.submit(TABLE), ex.submit({ kind: 'design', spec: INFEASIBLE })];
    const [d, t, bad] = await Promise.allSettled(jobs.map((j) => j.promise));
    expect(d).toEqual({ status: 'fulfilled', value: designAbsorber(SPEC) });
    expect(t).toEqual({ status: 'fulfilled', value: runJob(TABLE) });
    expect(bad).toMatchObject({ status: 'rejected', reason: expect.any(HushInputError) });
    expect(ex.stats()).toMatchObject({ fellBack: true, workersStarted: 1 });
    expect(ex.route).toBe('main thread');
    // Later jobs go straight to the main thread; no new worker is tried.
    expect(await ex.submit({ kind: 'design', spec: SPEC }).promise).toEqual(designAbsorber(SPEC));
    expect(w.made).toHaveLength(1);
  });
});

describe('cancellation through the worksheet functions (memo semantics, plans.ts)', () => {
  function install(opts: { hold?: boolean } = { hold: true }) {
    const w = fakeWorkers(opts);
    const ex: Executor = new WorkerExecutor(w.factory);
    setWorksheetExecutor(ex);
    return { w, ex };
  }

  it('one row read by several functions is one job; cancelling one call settles it at once and leaves the others computing', async () => {
    const { w, ex } = install();
    const a = invocation();
    const b = invocation();
    const p = settled(plan([H], [R], a));
    const c = settled(cells([H], [R], b));
    const m = settled(memory([H], [R]));
    cancel(a);
    expect(await p).toEqual(CANCELLED);
    await afterGrace();
    expect(w.last().terminated).toBe(false);
    await until(() => w.last().posted.length === 1, 'plan posted');
    w.last().finish();
    const record = planRecord(planRow(rowFromTable(H, R)));
    expect(await c).toEqual({ value: record.cells_total });
    expect(await m).toEqual({ value: record.memory });
    expect(ex.stats().submitted).toBe(1);
    expect(worksheetMemoSize().plans).toBe(1);
  });

  it('when every call waiting for a job is cancelled, the job stops after CANCEL_GRACE_MS and leaves the memo; the next call computes afresh', async () => {
    const { w, ex } = install();
    const a = invocation();
    const b = invocation();
    const p = settled(plan([H], [R], a));
    const c = settled(cells([H], [R], b));
    await until(() => w.last().posted.length === 1, 'plan posted');
    cancel(a);
    cancel(b);
    expect(await p).toEqual(CANCELLED);
    expect(await c).toEqual(CANCELLED);
    expect(w.last().terminated).toBe(false); // not yet: a recalculation may still ask for the same row
    await afterGrace();
    expect(w.made[0].terminated).toBe(true);
    expect(ex.stats().cancelledRunning).toBe(1);
    expect(worksheetMemoSize().plans).toBe(0);
    // Not poisoned: the next call plans the row and gets the plan API's row (independent call).
    const again = plan([H], [R]);
    await until(() => w.made.length === 2 && w.last().posted.length === 1, 'plan posted again');
    w.last().finish();
    expect(await again).toEqual([planCells()]);
    expect(ex.stats().submitted).toBe(2);
  });

  it('a cancelled call followed by the same call within the grace (a forced recalculation) keeps the running job', async () => {
    const { w, ex } = install();
    const a = invocation();
    const first = settled(call(layers, [1e-3, 20, null, null, undefined], a));
    await until(() => w.last().posted.length === 1, 'design posted');
    cancel(a);
    const second = call(layers, [1e-3, 20, null, null, undefined], invocation());
    await afterGrace();
    expect(w.last().terminated).toBe(false);
    w.last().finish();
    expect(await first).toEqual(CANCELLED);
    expect(await second).toBe(designAbsorber(SPEC).layers);
    expect(ex.stats()).toMatchObject({ submitted: 1, cancelledRunning: 0, cancelledWaiting: 0 });
  });

  it('a waiting job whose calls are all cancelled is withdrawn without reaching the worker', async () => {
    const { w, ex } = install();
    const a = invocation();
    const running = layers(1e-3, 20);
    const waiting = settled(call(design, [1e-4, 15, 30, 45, [[3, 4]]], a));
    cancel(a);
    await afterGrace();
    expect(ex.stats()).toMatchObject({ cancelledWaiting: 1, cancelledRunning: 0 });
    expect(worksheetMemoSize().designs).toBe(1);
    await until(() => w.last().posted.length === 1, 'first posted');
    w.last().finish();
    expect(await running).toBe(designAbsorber(SPEC).layers);
    expect(await waiting).toEqual(CANCELLED);
    expect(w.made.flatMap((x) => x.posted).map((m) => m.job)).toEqual([{ kind: 'design', spec: expect.objectContaining({ target: 1e-3, ppwMin: 20 }) }]);
  });

  it('failures are memoised, cancellations are not', async () => {
    const { ex } = install({ hold: false });
    const refused = await settled(layers(1e-12, 4, null, 85));
    expect(refused).toMatchObject({ code: '#NUM!', message: expect.stringMatching(/^no design up to 200 layers/) });
    expect(await settled(design(1e-12, 4, null, 85))).toEqual(refused);
    expect(ex.stats().submitted).toBe(1);
  });

  it('REFLECTION_TABLE on the main thread computes one row per macrotask and stops at the row where it is cancelled', async () => {
    const s = createScheduler();
    setWorksheetExecutor(new MainThreadExecutor(s));
    const inv = invocation();
    const ppws = [[10, 20, 30, 40, 50, 60, 70, 80]];
    const w0 = tableWork();
    const t = settled(call(reflectionTable, [40, 3, ppws, [[0, 30, 60]]], inv));
    await macrotask(); // the first slice: row 1 (its next row is queued only after it, by a microtask)
    expect(tableWork() - w0).toBe(3 * 40);
    cancel(inv);
    expect(await t).toEqual(CANCELLED);
    for (let i = 0; i < 10; i++) await macrotask();
    expect(tableWork() - w0).toBe(3 * 40);
    expect(s.stats()).toMatchObject({ tasks: 1, withdrawn: 1 });
    // Uncancelled, the same table is REFLECTION at every cell.
    const full = await reflectionTable(40, 3, ppws, [[0, 30, 60]]);
    expect(full).toEqual(ppws[0].map((ppw) => [0, 30, 60].map((a) => reflectionExact(40, 3, ppw, a))));
  });
});

describe('the real worker (src/functions/worker.ts in a worker_threads thread)', () => {
  const threads = nodeWorkers();
  afterAll(() => threads.terminateAll());

  it('computes what the main thread computes: a plan, a design, a refusal, a table', async () => {
    const ex = new WorkerExecutor(threads.factory);
    const spec = { target: 1e-4, ppwMin: 15, ppwMax: 30, angleMaxDeg: 45, orders: [3, 4] };
    const [p, d, bad, t] = await Promise.allSettled([
      ex.submit({ kind: 'plan', row: rowFromTable(H, R) }).promise,
      ex.submit({ kind: 'design', spec }).promise,
      ex.submit({ kind: 'design', spec: INFEASIBLE }).promise,
      ex.submit(TABLE).promise,
    ]);
    expect(p.status === 'fulfilled' && planRecord(p.value)).toEqual(planRecord(planRow(rowFromTable(H, R))));
    expect(d).toEqual({ status: 'fulfilled', value: designAbsorber(spec) });
    expect(bad).toMatchObject({ status: 'rejected', reason: { name: 'HushInputError', message: expect.stringMatching(/^no design up to 200 layers/) } });
    expect(t).toEqual({ status: 'fulfilled', value: runJob(TABLE) });
    expect(ex.stats()).toMatchObject({ workersStarted: 1, fellBack: false });
  });

  it('a running job is stopped by terminating its worker; the next job runs on a fresh worker', async () => {
    const before = threads.made.length;
    const ex = new WorkerExecutor(threads.factory);
    // 100 × 100 values at 200 layers: 2·10⁶ layer-evaluations, the largest table allowed (most of a second of the worker's time).
    const big: Extract<Job, { kind: 'table' }> = { ...TABLE, design: { layers: 200, order: 3 }, ppws: Array.from({ length: 100 }, (_, i) => 10 + i), angles: Array.from({ length: 100 }, (_, j) => (j * 80) / 100) };
    const job = ex.submit(big);
    const w = threads.made[before];
    await until(() => w.received.some((m) => m.type === 'started'), 'the table started');
    job.cancel();
    await expect(job.promise).rejects.toBeInstanceOf(JobCancelled);
    expect(w.terminated).toBe(true);
    expect(w.received.map((m) => m.type)).toEqual(['ready', 'started']);
    expect(await ex.submit({ kind: 'design', spec: SPEC }).promise).toEqual(designAbsorber(SPEC));
    expect(threads.made.length).toBe(before + 2);
    expect(ex.stats()).toMatchObject({ cancelledRunning: 1, workersStarted: 2 });
  });

  it('probe: the largest synchronous task of the main thread, in counted work, before (main-thread scheduler) and after (worker)', async () => {
    // A recalculation: the example study's row read by three functions, a wide design search and a reflection table.
    const wide = [1e-8, 5, 200, 80];
    const recalculation = () =>
      Promise.all([
        plan([H], [R]),
        cells([H], [R]),
        memory([H], [R]),
        layers(...(wide as [number, number, number, number])),
        design(...(wide as [number, number, number, number])),
        reflectionTable(40, 3, [Array.from({ length: 50 }, (_, i) => 10 + 2 * i)], [[0, 15, 30, 45, 60, 75]]),
      ]);
    const mainThreadWork = () => designWork() + tableWork();
    async function probe(run: () => Promise<unknown>): Promise<{ largest: number; total: number; value: unknown }> {
      let last = mainThreadWork();
      const start = last;
      let largest = 0;
      let probing = true;
      const tick = () => {
        const now = mainThreadWork();
        largest = Math.max(largest, now - last);
        last = now;
        if (probing) setTimeout(tick, 0);
      };
      setTimeout(tick, 0);
      const value = await run();
      probing = false;
      await macrotask();
      await macrotask();
      return { largest, total: mainThreadWork() - start, value };
    }

    clearPlanCache();
    clearDesignCache();
    clearWorksheetMemo();
    setWorksheetExecutor(new MainThreadExecutor(createScheduler()));
    const w0 = designWork();
    designAbsorber({ target: 1e-8, ppwMin: 5, ppwMax: 200, angleMaxDeg: 80 });
    const wideSearch = designWork() - w0;
    clearDesignCache();
    const before = await probe(recalculation);

    setWorksheetExecutor(new WorkerExecutor(threads.factory));
    const after = await probe(recalculation);

    console.log(
      `largest synchronous task of the main thread, in layer-evaluations: before (main-thread scheduler) ${before.largest} ` +
        `(of ${before.total} done on the main thread; the wide search alone ${wideSearch}), after (worker) ${after.largest} (of ${after.total})`,
    );
    expect(after.value).toEqual(before.value);
    expect(after.total).toBe(0);
    expect(after.largest).toBe(0);
    // Before, one macrotask held at least the whole wide search: the search is one synchronous call.
    expect(before.largest).toBeGreaterThanOrEqual(wideSearch);
  });
});

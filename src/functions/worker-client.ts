/**
 * Where the heavy worksheet functions compute: in a Web Worker of the shared
 * runtime (worker.ts) when the host gives one, else on the main thread through
 * the cooperative scheduler (scheduler.ts). Both are an Executor: submit a job
 * (worker-protocol.ts), get a Promise and a cancel().
 *
 * Why a worker: a design search is one synchronous call of the physics core
 * (up to ~10⁶–10⁷ layer-evaluations, a second or more), which no slicing of
 * the caller can split; in a worker it holds no thread that Excel or the task
 * pane needs. Cancelling a queued job withdraws it; cancelling the running job
 * terminates the worker (the only way to stop a synchronous call there) and
 * the next job starts a fresh one.
 *
 * Fallback: where `Worker` does not exist (Node, a JavaScript-only custom
 * functions runtime), where constructing one throws, or where the worker fails
 * before it has said it is ready (its script did not load), every job — the
 * ones waiting included — goes to the main-thread executor instead, for good.
 * A worker that dies while running a job (after it was ready) rejects that job
 * with WorkerFailed, and the next job starts a new worker.
 */
import { scheduler as sharedScheduler, type Scheduler, type ScheduledTask } from './scheduler';
import type { FromWorker, Job, JobValues, ToWorker } from './worker-protocol';
import { checkTableSize, deserializeError, runJob, tableRow } from './worker-tasks';
import { JobCancelled, WorkerFailed } from './errors';

export { JobCancelled, WorkerFailed, isTransient } from './errors';

export interface Submitted<T> {
  promise: Promise<T>;
  /** Stops the job if it has not settled; its promise then rejects with JobCancelled. */
  cancel(): void;
}

export interface ExecutorStats {
  /** Jobs submitted. */
  submitted: number;
  /** Jobs cancelled while waiting. */
  cancelledWaiting: number;
  /** Jobs cancelled while running (the worker terminated). */
  cancelledRunning: number;
  /** Workers constructed. */
  workersStarted: number;
  /** Workers that died while running a job. */
  workerFailures: number;
  /** True once the worker route was given up for the main thread. */
  fellBack: boolean;
}

export interface Executor {
  /** 'worker' or 'main thread': where the next job will run. */
  readonly route: 'worker' | 'main thread';
  submit<K extends Job['kind']>(job: Extract<Job, { kind: K }>): Submitted<JobValues[K]>;
  stats(): ExecutorStats;
}

/** The part of a DOM Worker the executor uses (a test can supply its own). */
export interface WorkerLike {
  postMessage(message: ToWorker): void;
  terminate(): void;
  onmessage: ((ev: { data: FromWorker }) => void) | null;
  onerror: ((ev: { message?: string; preventDefault?: () => void }) => void) | null;
}

export type WorkerFactory = () => WorkerLike;

const zeroStats = (): ExecutorStats => ({ submitted: 0, cancelledWaiting: 0, cancelledRunning: 0, workersStarted: 0, workerFailures: 0, fellBack: false });

/**
 * Jobs on the main thread, through a scheduler: a plan or a design is one
 * task; a reflection table is one task per row (at most 500 angles × 200
 * layers = 10⁵ layer-evaluations each), each row queued after the one before.
 */
export class MainThreadExecutor implements Executor {
  readonly route = 'main thread' as const;
  private counts = zeroStats();

  constructor(private readonly scheduler: Scheduler = sharedScheduler) {}

  stats(): ExecutorStats {
    return { ...this.counts };
  }

  submit<K extends Job['kind']>(job: Extract<Job, { kind: K }>): Submitted<JobValues[K]> {
    this.counts.submitted++;
    let task: ScheduledTask<unknown> | null = null;
    let settled = false;
    let resolveOuter!: (v: JobValues[K]) => void;
    let rejectOuter!: (e: unknown) => void;
    const promise = new Promise<JobValues[K]>((resolve, reject) => {
      resolveOuter = resolve;
      rejectOuter = reject;
    });
    const done = (v: unknown): void => {
      if (settled) return;
      settled = true;
      resolveOuter(v as JobValues[K]);
    };
    const fail = (e: unknown): void => {
      if (settled) return;
      settled = true;
      rejectOuter(e);
    };
    if (job.kind !== 'table') {
      task = this.scheduler.scheduleTask(() => runJob(job));
      task.promise.then(done, fail);
    } else {
      const table = job as Extract<Job, { kind: 'table' }>;
      const rows: number[][] = [];
      const next = (): void => {
        if (settled) return;
        task = this.scheduler.scheduleTask(() => {
          if (rows.length === 0) checkTableSize(table);
          rows.push(tableRow(table, rows.length));
        });
        task.promise.then(() => (rows.length < table.ppws.length ? next() : done(rows)), fail);
      };
      next();
    }
    return {
      promise,
      cancel: () => {
        if (settled) return;
        // Withdrawn if still queued; a task that has run already is not recalled, but its result is ignored.
        if (task?.cancel()) this.counts.cancelledWaiting++;
        fail(new JobCancelled());
      },
    };
  }
}

interface Pending {
  id: number;
  job: Job;
  resolve: (v: unknown) => void;
  reject: (e: unknown) => void;
  state: 'waiting' | 'running' | 'settled';
  forwarded: Submitted<unknown> | null;
}

/** Jobs in a Web Worker, one at a time, in the order submitted; see the module comment for cancellation and fallback. */
export class WorkerExecutor implements Executor {
  private worker: WorkerLike | null = null;
  /** The current worker has posted 'ready'. */
  private loaded = false;
  private broken = false;
  private queue: Pending[] = [];
  private current: Pending | null = null;
  private nextId = 1;
  private counts = zeroStats();
  private fallbackExecutor: Executor | null = null;

  constructor(
    private readonly make: WorkerFactory,
    private readonly fallback: () => Executor = () => new MainThreadExecutor(),
  ) {}

  get route(): 'worker' | 'main thread' {
    return this.broken ? 'main thread' : 'worker';
  }

  stats(): ExecutorStats {
    return { ...this.counts, fellBack: this.broken };
  }

  submit<K extends Job['kind']>(job: Extract<Job, { kind: K }>): Submitted<JobValues[K]> {
    this.counts.submitted++;
    if (this.broken) return this.backup().submit(job);
    let p!: Pending;
    const promise = new Promise<JobValues[K]>((resolve, reject) => {
      p = { id: this.nextId++, job, resolve: resolve as (v: unknown) => void, reject, state: 'waiting', forwarded: null };
    });
    this.queue.push(p);
    this.pump();
    return { promise, cancel: () => this.cancel(p) };
  }

  private backup(): Executor {
    this.fallbackExecutor ??= this.fallback();
    return this.fallbackExecutor;
  }

  private cancel(p: Pending): void {
    if (p.forwarded) {
      p.forwarded.cancel();
      return;
    }
    if (p.state === 'waiting') {
      this.queue.splice(this.queue.indexOf(p), 1);
      this.counts.cancelledWaiting++;
    } else if (p.state === 'running') {
      // The worker is inside one synchronous call: only terminating it stops that.
      this.dropWorker();
      this.current = null;
      this.counts.cancelledRunning++;
    } else return;
    p.state = 'settled';
    p.reject(new JobCancelled());
    this.pump();
  }

  private dropWorker(): void {
    const w = this.worker;
    this.worker = null;
    this.loaded = false;
    if (w) {
      w.onmessage = null;
      w.onerror = null;
      w.terminate();
    }
  }

  private pump(): void {
    if (this.current || this.broken) return;
    const p = this.queue.shift();
    if (!p) return;
    const w = this.ensureWorker();
    if (!w) {
      this.queue.unshift(p);
      this.giveUp();
      return;
    }
    this.current = p;
    p.state = 'running';
    w.postMessage({ type: 'run', id: p.id, job: p.job });
  }

  private ensureWorker(): WorkerLike | null {
    if (this.worker) return this.worker;
    let w: WorkerLike;
    try {
      w = this.make();
    } catch {
      return null;
    }
    this.counts.workersStarted++;
    w.onmessage = (ev) => this.onMessage(w, ev.data);
    w.onerror = (ev) => this.onError(w, ev);
    this.worker = w;
    return w;
  }

  private onMessage(w: WorkerLike, m: FromWorker): void {
    if (w !== this.worker) return;
    if (m.type === 'ready') {
      this.loaded = true;
      return;
    }
    if (m.type === 'started') return;
    const p = this.current;
    if (!p || p.id !== m.id) return;
    this.current = null;
    p.state = 'settled';
    if (m.type === 'done') p.resolve(m.value);
    else p.reject(deserializeError(m.error));
    this.pump();
  }

  private onError(w: WorkerLike, ev: { message?: string; preventDefault?: () => void }): void {
    if (w !== this.worker) return;
    ev.preventDefault?.();
    const loaded = this.loaded;
    this.dropWorker();
    if (!loaded) {
      // The worker never came up (its script failed to load or to run): compute on the main thread from now on.
      if (this.current) this.queue.unshift(this.current);
      this.current = null;
      this.giveUp();
      return;
    }
    const p = this.current;
    this.current = null;
    this.counts.workerFailures++;
    if (p) {
      p.state = 'settled';
      p.reject(new WorkerFailed(ev.message || 'unknown error'));
    }
    this.pump();
  }

  /** Hands every waiting job to the main-thread executor and sends later ones there too. */
  private giveUp(): void {
    this.broken = true;
    const waiting = this.queue;
    this.queue = [];
    for (const p of waiting) {
      p.state = 'waiting';
      const s = this.backup().submit(p.job);
      p.forwarded = s;
      s.promise.then(p.resolve, p.reject);
    }
  }
}

/** A factory for the add-in's worker (worker.ts, bundled by webpack as functions-worker.js), or null where this host has no Worker. */
export function browserWorkerFactory(): WorkerFactory | null {
  if (typeof Worker !== 'function') return null;
  // webpack 5 bundles the worker from this exact expression (an entry of its own, named by `name`);
  // tsconfig's CommonJS module setting does not know import.meta, which the browser build (ES modules) has.
  // @ts-expect-error TS1343: import.meta is only typed for ES module targets
  return () => new Worker(new URL('./worker.ts', import.meta.url), { name: 'functions-worker' }) as unknown as WorkerLike;
}

/** The executor for this host: a worker where one can be had, else the main thread. */
export function createExecutor(factory: WorkerFactory | null = browserWorkerFactory()): Executor {
  return factory ? new WorkerExecutor(factory) : new MainThreadExecutor();
}


/**
 * A small cooperative scheduler: the main-thread fallback of the heavy
 * worksheet functions (HUSH.LAYERS, HUSH.DESIGN, HUSH.PLAN, HUSH.CELLS, …,
 * HUSH.REFLECTION_TABLE) where no Web Worker can be had (worker-client.ts).
 * Excel's shared runtime runs the custom functions and the task pane on one
 * thread: a recalculation of a 200-row table that planned every row in one go
 * would freeze both. Instead each call queues its work and gets a Promise; the
 * queue is drained in slices of about `sliceMs` milliseconds, each slice a
 * macrotask (setTimeout 0), so the runtime handles other events between slices.
 *
 * A task is not split: a slice ends after the task that crosses the budget, so
 * the longest slice is the budget plus the longest single task (a design search
 * is one synchronous call of the physics core; REFLECTION_TABLE is queued as
 * tasks of bounded work, worker-tasks.ts). Tasks run in the order they were
 * queued; a queued task can be withdrawn (`scheduleTask(…).cancel()`) and then
 * never runs.
 */

/** Figures the tests and the report read: how long the runtime was held at a time. */
export interface SchedulerStats {
  /** Slices run (macrotasks). */
  slices: number;
  /** Tasks run. */
  tasks: number;
  /** Tasks withdrawn before they ran. */
  withdrawn: number;
  /** Longest slice, ms. */
  longestSliceMs: number;
  /** Longest single task, ms. */
  longestTaskMs: number;
  /** Most tasks run in one slice. */
  mostTasksPerSlice: number;
}

/** A queued task: its settlement, and a way to withdraw it while it waits. */
export interface ScheduledTask<T> {
  promise: Promise<T>;
  /** Withdraws the task if it has not run yet (its promise then never settles); true when it was withdrawn. */
  cancel(): boolean;
}

export interface Scheduler {
  /** Queues `work`; the Promise settles with its result or its exception. */
  schedule<T>(work: () => T): Promise<T>;
  /** Queues `work`, withdrawable until it runs. */
  scheduleTask<T>(work: () => T): ScheduledTask<T>;
  /** Tasks waiting. */
  pending(): number;
  stats(): SchedulerStats;
  resetStats(): void;
}

/** Default slice budget: long enough to amortise the timer, short enough that typing in the task pane stays fluid. */
export const DEFAULT_SLICE_MS = 20;

interface Task {
  work: () => unknown;
  resolve: (value: unknown) => void;
  reject: (reason: unknown) => void;
  state: 'queued' | 'ran' | 'withdrawn';
}

const now: () => number =
  typeof performance !== 'undefined' && typeof performance.now === 'function' ? () => performance.now() : () => Date.now();

const zeroStats = (): SchedulerStats => ({ slices: 0, tasks: 0, withdrawn: 0, longestSliceMs: 0, longestTaskMs: 0, mostTasksPerSlice: 0 });

export function createScheduler(sliceMs = DEFAULT_SLICE_MS): Scheduler {
  const queue: (Task | undefined)[] = [];
  let head = 0;
  let waiting = 0;
  let armed = false;
  let stats = zeroStats();

  const runSlice = (): void => {
    armed = false;
    const start = now();
    let ran = 0;
    while (head < queue.length) {
      const task = queue[head];
      queue[head++] = undefined;
      if (!task || task.state !== 'queued') continue;
      task.state = 'ran';
      waiting--;
      const t0 = now();
      try {
        task.resolve(task.work());
      } catch (e) {
        task.reject(e);
      }
      const t1 = now();
      ran++;
      if (t1 - t0 > stats.longestTaskMs) stats.longestTaskMs = t1 - t0;
      if (t1 - start >= sliceMs) break;
    }
    const elapsed = now() - start;
    stats.slices++;
    stats.tasks += ran;
    if (elapsed > stats.longestSliceMs) stats.longestSliceMs = elapsed;
    if (ran > stats.mostTasksPerSlice) stats.mostTasksPerSlice = ran;
    if (head === queue.length) {
      queue.length = 0;
      head = 0;
    } else arm();
  };

  const arm = (): void => {
    if (armed) return;
    armed = true;
    setTimeout(runSlice, 0);
  };

  const scheduleTask = <T>(work: () => T): ScheduledTask<T> => {
    let task!: Task;
    const promise = new Promise<T>((resolve, reject) => {
      task = { work, resolve: resolve as (value: unknown) => void, reject, state: 'queued' };
    });
    queue.push(task);
    waiting++;
    arm();
    return {
      promise,
      cancel: () => {
        if (task.state !== 'queued') return false;
        task.state = 'withdrawn';
        waiting--;
        stats.withdrawn++;
        return true;
      },
    };
  };

  return {
    scheduleTask,
    schedule: <T>(work: () => T): Promise<T> => scheduleTask(work).promise,
    pending: () => waiting,
    stats: () => ({ ...stats }),
    resetStats: () => {
      stats = zeroStats();
    },
  };
}

/** The scheduler every worksheet function shares (one runtime, one queue). */
export const scheduler: Scheduler = createScheduler();

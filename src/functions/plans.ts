/**
 * The heavy worksheet functions' work: project table rows → plans (the plan
 * API, planRow via rowFromTable), design specs → designs (designAbsorber) and
 * reflection tables, each run by the worksheet executor (worker-client.ts: a
 * Web Worker of the shared runtime, or the main-thread scheduler where the
 * host has none), plans and designs memoised by their canonical key.
 *
 * Sharing: HUSH.PLAN, HUSH.CELLS, HUSH.MEMORY, HUSH.STEPS, HUSH.RUNTIME and
 * HUSH.COST of one row ask for the same key and get the same computation, so a
 * row is planned once however many functions read it, even while the first
 * call is still waiting. Failures are memoised too (a row with no feasible
 * design would otherwise run the whole search again for every function that
 * reads it). The plan API keeps its own cache of plans by parsed inputs.
 *
 * Cancellation (the functions are @cancelable): each call that passes Excel's
 * CancelableInvocation holds the computation; when Excel cancels it
 * (onCanceled: the cell was edited or deleted, an argument changed, or a
 * recalculation was forced), that call settles at once with JobCancelled and
 * lets go. When nobody holds an unsettled computation any more it is stopped
 * (withdrawn, or its worker terminated) after CANCEL_GRACE_MS, and its entry
 * leaves the memo: a cancelled computation is never served as a result. A call
 * without an invocation (tests, the task pane) holds its computation to the end.
 */
import { HushInputError, type DesignResult, type DesignSpec } from '../plan/steps';
import { INPUT_NAMES, headerName, rowFromTable, type FieldValue, type Plan, type ProjectRow } from '../plan';
import { JobCancelled, isTransient, toWorksheetError } from './errors';
import { createExecutor, type Executor, type Submitted } from './worker-client';
import type { Job, JobValues } from './worker-protocol';
import { checkTableSize } from './worker-tasks';

type Settled<T> = { ok: true; value: T } | { ok: false; error: unknown };

/** Entries kept per memo (oldest dropped first); more than a 200-row table needs. */
export const MEMO_LIMIT = 1000;

/**
 * How long a computation nobody holds any more keeps running before it is
 * stopped. Excel cancels a running call and then calls again when the user
 * forces a recalculation (learn.microsoft.com/office/dev/add-ins/excel/custom-functions-web-reqs,
 * "Make a streaming function": cancellation), so a call with the same inputs
 * arriving within this time takes over the computation instead of restarting it.
 */
export const CANCEL_GRACE_MS = 100;

let executor: Executor | null = null;

/** The executor the worksheet functions use (created on first use: a worker where the host has one). */
export function worksheetExecutor(): Executor {
  executor ??= createExecutor();
  return executor;
}

/** Replaces the executor (tests: a worker in Node, a fake worker); null goes back to the host's default. Clears the memo. */
export function setWorksheetExecutor(e: Executor | null): void {
  executor = e;
  clearWorksheetMemo();
}

/** What Excel passes as the last argument of a @cancelable function (only its onCanceled is used). */
export interface Cancelable {
  onCanceled?: () => void;
}

/** The invocation argument if it is one (an object), else undefined: tests and the examples call without it. */
export function invocationOf(v: unknown): Cancelable | undefined {
  return typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Cancelable) : undefined;
}

interface Entry<T> {
  settled: Promise<Settled<T>>;
  done: boolean;
  /** Calls waiting for it that could still be cancelled or that never will be. */
  holders: number;
  job: Submitted<T>;
}

/** Settles with `result`, or with JobCancelled as soon as Excel cancels `invocation` (then calls `release`). */
function held<T>(result: Promise<T>, invocation: Cancelable, release: () => void): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    let open = true;
    invocation.onCanceled = () => {
      if (!open) return;
      open = false;
      reject(new JobCancelled());
      release();
    };
    result.then(
      (v) => {
        if (!open) return;
        open = false;
        resolve(v);
      },
      (e: unknown) => {
        if (!open) return;
        open = false;
        reject(e);
      },
    );
  });
}

class Memo<K extends 'plan' | 'design'> {
  private readonly entries = new Map<string, Entry<JobValues[K]>>();

  get(key: string, job: () => Extract<Job, { kind: K }>, invocation?: Cancelable): Promise<JobValues[K]> {
    let entry = this.entries.get(key);
    if (entry) {
      // Refresh: the most recently used stay.
      this.entries.delete(key);
    } else {
      entry = this.start(key, job());
      if (this.entries.size >= MEMO_LIMIT) this.entries.delete(this.entries.keys().next().value as string);
    }
    this.entries.set(key, entry);
    entry.holders++;
    const result = entry.settled.then((s) => {
      if (s.ok) return s.value;
      throw s.error;
    });
    if (!invocation) return result;
    const e = entry;
    return held(result, invocation, () => this.release(key, e));
  }

  private start(key: string, job: Extract<Job, { kind: K }>): Entry<JobValues[K]> {
    const submitted = worksheetExecutor().submit<K>(job);
    const entry: Entry<JobValues[K]> = { done: false, holders: 0, job: submitted, settled: undefined as unknown as Promise<Settled<JobValues[K]>> };
    entry.settled = submitted.promise.then(
      (value): Settled<JobValues[K]> => {
        entry.done = true;
        return { ok: true, value };
      },
      (error: unknown): Settled<JobValues[K]> => {
        entry.done = true;
        // Cancelled or lost with its worker: nothing learnt about the inputs, so not memoised.
        if (isTransient(error) && this.entries.get(key) === entry) this.entries.delete(key);
        return { ok: false, error };
      },
    );
    return entry;
  }

  private release(key: string, entry: Entry<JobValues[K]>): void {
    entry.holders--;
    if (entry.holders > 0 || entry.done) return;
    setTimeout(() => {
      if (entry.holders > 0 || entry.done) return;
      if (this.entries.get(key) === entry) this.entries.delete(key);
      entry.job.cancel();
    }, CANCEL_GRACE_MS);
  }

  clear(): void {
    this.entries.clear();
  }

  get size(): number {
    return this.entries.size;
  }
}

const plans = new Memo<'plan'>();
const designs = new Memo<'design'>();

/** Forgets memoised plans and designs (tests and benchmarks). */
export function clearWorksheetMemo(): void {
  plans.clear();
  designs.clear();
}

/** Memoised entries (tests). */
export function worksheetMemoSize(): { plans: number; designs: number } {
  return { plans: plans.size, designs: designs.size };
}

/** True when `e` is already the error Excel should show. */
function isWorksheetError(e: unknown): boolean {
  return typeof CustomFunctions !== 'undefined' && e instanceof CustomFunctions.Error;
}

/**
 * Runs `shape` on the settled value and turns any exception (from the work or
 * from the shaping) into the worksheet error Excel should show.
 */
export function asWorksheet<T, U>(work: () => Promise<T>, shape: (value: T) => U): Promise<U> {
  let pending: Promise<T>;
  try {
    pending = work();
  } catch (e) {
    return Promise.reject(toWorksheetError(e));
  }
  return pending.then(shape).catch((e: unknown) => {
    throw isWorksheetError(e) ? e : toWorksheetError(e);
  });
}

/** Cells of a one-row or one-column range (a lone value counts as one cell). */
function lineOfCells(field: string, value: unknown): unknown[] {
  if (!Array.isArray(value)) return [value];
  if (value.length === 0) throw new HushInputError(field, `${field} is an empty range`, 'value');
  if (!value.every(Array.isArray)) {
    if (value.some(Array.isArray)) throw new HushInputError(field, `${field} must be a rectangular range of cells`, 'value');
    return value;
  }
  const rows = value as unknown[][];
  const cols = rows[0].length;
  if (cols === 0 || rows.some((r) => r.length !== cols)) throw new HushInputError(field, `${field} must be a rectangular range of cells`, 'value');
  if (rows.length === 1) return rows[0];
  if (cols === 1) return rows.map((r) => r[0]);
  throw new HushInputError(
    field,
    `${field} must be one row (or one column) of the project table, not a range of ${rows.length}×${cols} cells`,
    'value',
  );
}

function plainCell(header: unknown, v: unknown): FieldValue {
  if (v === null || v === undefined || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return v;
  throw new HushInputError(headerName(header), `the cell under ${JSON.stringify(String(header))} must be a number or text (got ${Array.isArray(v) ? 'a range' : 'an object'})`, 'value');
}

const INPUTS = new Set(INPUT_NAMES);

/**
 * A project row from the header row and one study's row of the same table
 * (same number of cells; header cells compared by name, units in brackets
 * ignored; columns that are not input fields ignored).
 */
export function tableRow(header: unknown, values: unknown): ProjectRow {
  const names = lineOfCells('header', header);
  const cells = lineOfCells('row', values);
  if (names.length !== cells.length) {
    throw new HushInputError(
      'row',
      `row has ${cells.length} cells but the header has ${names.length}: give the header row and this study's row over the same columns (e.g. $A$1:$AM$1 and A2:AM2)`,
      'value',
    );
  }
  if (!names.some((h) => typeof h === 'string' && INPUTS.has(headerName(h)))) {
    throw new HushInputError('header', 'header names no project field (such as band_short, cell, intensity_error): give the table’s header row first, then the study’s row', 'value');
  }
  return rowFromTable(
    names,
    cells.map((v, k) => plainCell(names[k], v)),
  );
}

/** A key that tells every value apart (type and text), unlike JSON, which writes NaN and Infinity as null. */
function rowKey(row: ProjectRow): string {
  return Object.keys(row)
    .sort()
    .map((k) => `${k}\u0000${typeof row[k]}\u0000${String(row[k])}`)
    .join('\u0001');
}

/** The plan of one table row, shared by every function that reads that row. */
export function planOf(header: unknown, values: unknown, invocation?: Cancelable): Promise<Plan> {
  const row = tableRow(header, values);
  return plans.get(rowKey(row), () => ({ kind: 'plan', row }), invocation);
}

function specKey(spec: DesignSpec): string {
  return JSON.stringify(spec, (_k, v: unknown) => (typeof v === 'number' ? (Object.is(v, -0) ? '-0' : String(v)) : v));
}

/** The thinnest design for a spec, shared by HUSH.LAYERS and HUSH.DESIGN with the same arguments. */
export function designOf(spec: DesignSpec, invocation?: Cancelable): Promise<DesignResult> {
  return designs.get(specKey(spec), () => ({ kind: 'design', spec }), invocation);
}

/**
 * A reflection table (not memoised: each call computes its own; a cancelled
 * call stops it at once). Above REFLECTION_TABLE_MAX_WORK it throws at once
 * (#NUM!), before anything is queued.
 */
export function tableOf(job: Extract<Job, { kind: 'table' }>, invocation?: Cancelable): Promise<number[][]> {
  checkTableSize(job);
  const submitted = worksheetExecutor().submit<'table'>(job);
  if (!invocation) return submitted.promise;
  return held(submitted.promise, invocation, () => submitted.cancel());
}

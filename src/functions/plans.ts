/**
 * The heavy worksheet functions' work: project table rows → plans (the plan
 * API, planRow via rowFromTable) and design specs → designs (designAbsorber),
 * each run in the shared scheduler and memoised by its canonical key.
 *
 * Sharing: HUSH.PLAN, HUSH.CELLS, HUSH.MEMORY, HUSH.STEPS, HUSH.RUNTIME and
 * HUSH.COST of one row ask for the same key and get the same Promise, so a
 * row is planned once however many functions read it, even while the first
 * call is still queued. Failures are memoised too (a row with no feasible
 * design would otherwise run the whole search again for every function that
 * reads it). The plan API keeps its own cache of plans by parsed inputs.
 */
import { designAbsorber, HushInputError, type DesignResult, type DesignSpec } from '../plan/steps';
import { INPUT_NAMES, headerName, planRow, rowFromTable, type FieldValue, type Plan, type ProjectRow } from '../plan';
import { toWorksheetError } from './errors';
import { scheduler } from './scheduler';

type Settled<T> = { ok: true; value: T } | { ok: false; error: unknown };

/** Entries kept per memo (oldest dropped first); more than a 200-row table needs. */
export const MEMO_LIMIT = 1000;

class Memo<T> {
  private readonly entries = new Map<string, Promise<Settled<T>>>();

  get(key: string, work: () => T): Promise<T> {
    let entry = this.entries.get(key);
    if (entry) {
      // Refresh: the most recently used stay.
      this.entries.delete(key);
    } else {
      entry = scheduler.schedule(work).then(
        (value): Settled<T> => ({ ok: true, value }),
        (error): Settled<T> => ({ ok: false, error }),
      );
      if (this.entries.size >= MEMO_LIMIT) this.entries.delete(this.entries.keys().next().value as string);
    }
    this.entries.set(key, entry);
    return entry.then((s) => {
      if (s.ok) return s.value;
      throw s.error;
    });
  }

  clear(): void {
    this.entries.clear();
  }

  get size(): number {
    return this.entries.size;
  }
}

const plans = new Memo<Plan>();
const designs = new Memo<DesignResult>();

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
export function planOf(header: unknown, values: unknown): Promise<Plan> {
  const row = tableRow(header, values);
  return plans.get(rowKey(row), () => planRow(row));
}

function specKey(spec: DesignSpec): string {
  return JSON.stringify(spec, (_k, v: unknown) => (typeof v === 'number' ? (Object.is(v, -0) ? '-0' : String(v)) : v));
}

/** The thinnest design for a spec, shared by HUSH.LAYERS and HUSH.DESIGN with the same arguments. */
export function designOf(spec: DesignSpec): Promise<DesignResult> {
  return designs.get(specKey(spec), () => designAbsorber(spec));
}

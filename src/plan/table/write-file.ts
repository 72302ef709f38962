/**
 * Writing a plan file safely: the output directory is checked before any
 * planning (missing, not a directory, or not writable); the plan is written
 * to a temporary file beside the target and renamed over it, so a failed or
 * killed write leaves the target as it was; temporary files that a killed
 * run of an earlier write to the same target left behind are removed.
 */
import { promises as fs, constants as fsConstants } from 'fs';
import * as path from 'path';
import { HushInputError } from '../../physics/errors';
import type { PlannedRow } from './layout';
import type { Table } from './model';
import { tableFormat } from './read';
import type { PlanTotals } from './summary';
import { writePlanCsv } from './write-csv';
import { writePlanJson } from './write-json';
import { writePlanXlsx } from './write-xlsx';

/** The temporary file of a write to `file` (hidden beside it; removeStaleTemps finds those of ended processes). */
export function tempName(file: string, tag: string): string {
  return path.join(path.dirname(file), `.${path.basename(file)}.hush-${process.pid}-${tag}.tmp`);
}

/** Temporary files of writes to `file`: `.NAME.hush-PID-TAG.tmp` (and `.NAME.PID.TIME.tmp` of earlier versions). */
function tempPattern(file: string): RegExp {
  const base = path.basename(file).replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  return new RegExp(`^\\.${base}\\.(?:hush-(\\d+)-[\\w-]+|(\\d+)\\.\\d+)\\.tmp$`);
}

/** True when a process with this id is running (a signal 0 reaches it, or it belongs to another user). */
function running(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** A day: a temporary file this old is stale even if its process id is in use again. */
const STALE_MS = 24 * 3600 * 1000;

/** Removes temporary files of earlier writes to `file` whose process has ended (or that are a day old). Returns their names. */
export async function removeStaleTemps(file: string): Promise<string[]> {
  const dir = path.dirname(file);
  const pattern = tempPattern(file);
  let names: string[];
  try {
    names = await fs.readdir(dir);
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const name of names) {
    const m = pattern.exec(name);
    if (!m) continue;
    const pid = Number(m[1] ?? m[2]);
    const full = path.join(dir, name);
    let old = false;
    try {
      old = Date.now() - (await fs.stat(full)).mtimeMs > STALE_MS;
    } catch {
      continue;
    }
    if (pid !== process.pid && (old || !running(pid))) {
      await fs.rm(full, { force: true }).catch(() => undefined);
      removed.push(name);
    }
  }
  return removed;
}

/**
 * Checks that a plan can be written to `file`, before any planning: its
 * directory exists, is a directory and takes a new file (a probe file is
 * made and removed). Also removes stale temporary files of `file`.
 */
export async function prepareOutput(file: string): Promise<void> {
  const dir = path.dirname(path.resolve(file));
  let stat;
  try {
    stat = await fs.stat(dir);
  } catch {
    throw new HushInputError('out', `cannot write ${file}: the directory ${dir} does not exist; create it or choose another --out`, 'value');
  }
  if (!stat.isDirectory()) throw new HushInputError('out', `cannot write ${file}: ${dir} is not a directory`, 'value');
  const probe = tempName(file, 'probe');
  try {
    await fs.access(dir, fsConstants.W_OK);
    const h = await fs.open(probe, 'wx');
    await h.close();
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'EROFS' ? 'is on a read-only file system' : code === 'EACCES' || code === 'EPERM' ? 'is read-only for you' : `cannot take a new file (${code ?? String(e)})`;
    throw new HushInputError('out', `cannot write ${file}: the directory ${dir} ${why}; choose another --out`, 'value');
  } finally {
    await fs.rm(probe, { force: true }).catch(() => undefined);
  }
  await removeStaleTemps(file);
}

export interface WriteContext {
  /** The one line that says what was read, kept in the workbook's "about" sheet. */
  read?: string;
}

/** Writes the plan to `file` (.csv, .xlsx or .json) through a temporary file renamed into place. */
export async function writeTable(file: string, table: Table, planned: readonly PlannedRow[], totals: PlanTotals, context: WriteContext = {}): Promise<void> {
  const format = tableFormat(file);
  if (format === null) throw new HushInputError('out', `${file}: the plan can be written as .xlsx, .csv or .json`, 'value');
  await removeStaleTemps(file);
  const temp = tempName(file, String(Date.now()));
  try {
    if (format === 'xlsx') await writePlanXlsx(temp, table, planned, totals, context.read ?? null);
    else {
      const out = await fs.open(temp, 'wx');
      try {
        if (format === 'csv') await writePlanCsv(out, table, planned, totals);
        else await writePlanJson(out, table, planned, totals);
      } finally {
        await out.close();
      }
    }
    await fs.rename(temp, file);
  } catch (e) {
    await fs.rm(temp, { force: true }).catch(() => undefined);
    throw e;
  }
}

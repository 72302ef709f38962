import { statSync } from 'fs';
import * as path from 'path';
import { isHushInputError } from '../plan/steps';
import { INPUT_NAMES, OUTPUT_NAMES, errorToRow, headerName, planRow, planToRow, rowFromTable, type PlanCell } from '../plan';
import { isBlank } from '../plan/units';
import { readTable, tableFormat, writeTable, type PlannedRow, type Table } from '../plan/table-file';
import { parseArgs, stringOption, UsageError } from './args';
import { fmt, oneLine, processIO, type CommandIO } from './io';

export const planUsage =
  'hush plan TABLE.csv|TABLE.xlsx [--out PLAN.xlsx|PLAN.csv|PLAN.json [--replace]] [--json]  (one study per row; header names are the plan fields, see src/plan/fields.ts; the table itself is never written; an existing --out file is replaced only with --replace)';

/** Device and inode of an existing file, or null. */
function identity(file: string): string | null {
  try {
    const s = statSync(file);
    return `${s.dev}:${s.ino}`;
  } catch {
    return null;
  }
}

/**
 * Refuses an --out that would overwrite what the user typed: the project table
 * itself (by path or by being the same file), or any existing file unless
 * --replace is given.
 */
function checkOut(table: string, out: string, replace: boolean): void {
  const same = path.resolve(table) === path.resolve(out) || (identity(out) !== null && identity(out) === identity(table));
  if (same) throw new UsageError(`--out ${out} is the project table itself; write the plan to another file so the table stays as typed`);
  if (!replace && identity(out) !== null) throw new UsageError(`--out ${out} already exists; give --replace to overwrite it, or choose another name`);
}

function progress(io: CommandIO): ((done: number, total: number) => void) | null {
  const tty = io === processIO ? Boolean(process.stderr.isTTY) : io.isTTY;
  if (!tty) return null;
  const write = io === processIO ? (t: string) => process.stderr.write(t) : (t: string) => io.err(t);
  return (done, total) => {
    const width = 30;
    const filled = Math.round((width * done) / total);
    write(`\r[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${done}/${total}${done === total ? '\n' : ''}`);
  };
}

function pick(outputs: PlanCell[], name: string): PlanCell {
  return outputs[OUTPUT_NAMES.indexOf(name)];
}

function num(v: PlanCell, scale = 1): string {
  return typeof v === 'number' ? fmt(v * scale) : '—';
}

/** `hush plan`: plans every row of a project table and writes the table back with the outputs added. */
export async function planCommand(argv: string[], io: CommandIO): Promise<number> {
  const args = parseArgs(argv, { out: {}, json: { flag: true }, replace: { flag: true } });
  if (args.positional.length !== 1) throw new UsageError(`give one project table (.csv or .xlsx)${args.positional.length ? `, got ${args.positional.length} arguments` : ''}`);
  const file = args.positional[0];
  const fmtIn = tableFormat(file);
  if (fmtIn !== 'csv' && fmtIn !== 'xlsx') throw new UsageError(`${file}: the project table must be a .csv or .xlsx file`);
  const out = stringOption(args, 'out');
  if (out !== undefined && tableFormat(out) === null) throw new UsageError(`--out ${out}: write the plan as .xlsx, .csv or .json`);
  if (out === undefined && args.options.has('replace')) throw new UsageError('--replace only applies with --out');
  if (out !== undefined) checkOut(file, out, args.options.has('replace'));

  let table: Table;
  try {
    table = await readTable(file);
  } catch (e) {
    io.err(`hush plan: cannot read ${file}: ${oneLine(e instanceof Error ? e.message : String(e))}`);
    return 2;
  }
  const names = table.header.map(headerName);
  const known = new Set([...INPUT_NAMES, ...OUTPUT_NAMES, 'remark']);
  const unknown = table.header.filter((h, k) => !isBlank(h) && !known.has(names[k]));
  // Notes are printed once the plan is written, so a run that ends in an error (exit 2) prints that error alone.
  const notes: string[] = [];
  if (unknown.length) notes.push(`hush plan: columns kept as they are (not plan fields): ${unknown.map((h) => JSON.stringify(String(h))).join(', ')}`);
  if (!names.includes('band_short')) notes.push('hush plan: the table has no band_short column; every row will fail');

  const bar = progress(io);
  const planned: PlannedRow[] = [];
  const summary: string[][] = [];
  let failures = 0;
  const total = table.rows.length;
  table.rows.forEach((values, i) => {
    const row = rowFromTable(table.header, values);
    const label = typeof row.study !== "string" && typeof row.study !== "number" || isBlank(row.study) ? `row ${i + 2}` : String(row.study).trim().replace(/\s+/g, ' ');
    if (values.every(isBlank)) {
      planned.push({ values, outputs: null, failed: false });
    } else {
      try {
        const plan = planRow(row);
        const o = planToRow(plan);
        planned.push({ values, outputs: o, failed: false });
        summary.push([
          label,
          String(plan.design.layers),
          String(plan.design.order),
          fmt(plan.design.worstAmplitude, 3),
          String(pick(o, 'grid')),
          num(pick(o, 'overhead_percent')),
          num(pick(o, 'memory')),
          num(pick(o, 'steps')),
          num(pick(o, 'runtime')),
          num(pick(o, 'cost')),
          plan.warnings.length ? `${plan.warnings.length} note${plan.warnings.length > 1 ? 's' : ''}` : '',
        ]);
      } catch (e) {
        failures++;
        const msg = isHushInputError(e) ? e.message : `internal error: ${e instanceof Error ? e.message : String(e)}`;
        planned.push({ values, outputs: errorToRow(msg), failed: true });
        summary.push([label, 'ERROR', '', '', '', '', '', '', '', '', oneLine(msg)]);
      }
    }
    if (bar) bar(i + 1, total);
  });

  if (out !== undefined) {
    try {
      await writeTable(out, table.header, planned);
    } catch (e) {
      io.err(`hush plan: cannot write ${out}: ${oneLine(e instanceof Error ? e.message : String(e))}`);
      return 2;
    }
  }
  for (const n of notes) io.err(n);

  if (args.options.has('json')) {
    io.out(
      JSON.stringify(
        planned.map((r, i) => ({
          row: i + 2,
          failed: r.failed,
          outputs: r.outputs ? Object.fromEntries(OUTPUT_NAMES.map((n, j) => [n, (r.outputs as PlanCell[])[j]])) : null,
        })),
      ),
    );
  } else {
    const head = ['study', 'layers', 'order', 'worst |r|', 'grid', 'overhead %', 'memory GB', 'steps', 'runtime h', 'cost', 'notes'];
    const widths = head.map((h, c) => Math.min(c === 0 ? 40 : 16, Math.max(h.length, ...summary.map((r) => r[c].length))));
    const line = (cells: string[]) =>
      cells.map((t, c) => (c === cells.length - 1 ? t : c === 0 ? t.slice(0, widths[c]).padEnd(widths[c]) : t.padStart(widths[c]))).join('  ');
    io.out(line(head));
    for (const r of summary) io.out(line(r));
    io.out(`${summary.length - failures} planned, ${failures} failed; runtime and cost are planning estimates (check convergence with a thicker absorber)`);
  }

  if (out !== undefined && !args.options.has('json')) io.out(`wrote ${out}`);
  for (const [i, r] of planned.entries()) {
    if (r.failed && r.outputs) io.err(`hush plan: row ${i + 2}: ${oneLine(String(r.outputs[OUTPUT_NAMES.indexOf('notes')]).replace(/^error: /, ''))}`);
  }
  return failures ? 1 : 0;
}

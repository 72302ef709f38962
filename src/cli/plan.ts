import { statSync } from 'fs';
import * as path from 'path';
import { OUTPUT_NAMES, releasePlanningCaches, type PlanCell } from '../plan';
import {
  describeRead,
  jsonTerminalSafe,
  keptColumnNames,
  outputHeaders,
  planTable,
  prepareOutput,
  readTable,
  renameNote,
  repeatedFieldNotes,
  fieldColumns,
  rowLabel,
  share,
  tableFormat,
  terminalSafe,
  writeTable,
  type PlanTotals,
  type Table,
} from '../plan/table-file';
import { parseArgs, stringOption, UsageError } from './args';
import { fmt, type CommandIO } from './io';
import { progressBar } from './progress';
import type { CommandSpec } from './options';

/**
 * Rows printed in the terminal table (and failed rows reported on stderr):
 * a table of 100,000 studies prints its first rows, the totals of all, and
 * says how many it left out; --out and --json carry every row.
 */
export const MAX_SHOWN_ROWS = 100;

/** `hush plan --help` (the options are parsed by parseArgs below; this states them). */
export const planSpec: CommandSpec = {
  name: 'plan',
  summary:
    'Plans every study (row) of a project table: the required reflection, the thinnest absorber on the grid, the accuracy split and the cells, memory, steps, runtime and cost it adds (runtime and cost are planning estimates). Header names are the input fields (hush init writes a starter table; a header may state its unit, "cell [um]"); other columns are kept. The table itself is never written.',
  fields: [],
  positional: 'TABLE.csv|TABLE.xlsx',
  switches: {
    sheet: { value: 'NAME|N', help: 'the sheet of an .xlsx, by name or position; default: the first visible sheet with a header' },
    out: { value: 'PLAN.xlsx|PLAN.csv|PLAN.json', help: 'write the table with the plan in added columns (.xlsx: with a summary sheet for a proposal); default: print only' },
    replace: { help: 'with --out: replace an existing file (never the table itself)' },
    json: { help: 'print the rows as JSON instead of the table' },
  },
  notes: ['Exit code 0 when every row planned, 1 when a row failed (its error is in its own row; the others still plan), 2 on bad arguments or an unreadable table.'],
};


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

/** Progress on a terminal: a bar, rows done, rate and time left (from the rows done so far). */
function progress(io: CommandIO, now: () => number = () => Date.now()): ((done: number, total: number) => void) | null {
  const start = now();
  return progressBar(io, (done, total) => `${done}/${total}${rateText(done, total, (now() - start) / 1000)}`);
}

/** " · 12.3 rows/s · 40 s left" once a rate can be measured, else "". */
export function rateText(done: number, total: number, seconds: number): string {
  if (done <= 0 || seconds <= 0.05) return '';
  const rate = done / seconds;
  const left = (total - done) / rate;
  const leftText = done >= total ? `${duration(seconds)} in all` : `${duration(left)} left`;
  return ` · ${fmt(rate, 3)} rows/s · ${leftText}`;
}

function duration(seconds: number): string {
  if (seconds < 60) return `${Math.ceil(seconds)} s`;
  if (seconds < 3600) return `${Math.floor(seconds / 60)} min ${Math.round(seconds % 60)} s`;
  return `${Math.floor(seconds / 3600)} h ${Math.round((seconds % 3600) / 60)} min`;
}

function pick(outputs: PlanCell[], name: string): PlanCell {
  return outputs[OUTPUT_NAMES.indexOf(name)];
}

function num(v: PlanCell, scale = 1): string {
  return typeof v === 'number' ? fmt(v * scale) : '—';
}

/** An integer output with all its digits (grouped by thousands), or "—". */
function integer(v: PlanCell): string {
  return typeof v === 'number' ? whole(v) : '—';
}

/** A whole number with all its digits, grouped by thousands. */
function whole(x: number): string {
  return Math.round(x).toLocaleString('en-US');
}

function pct(part: number, whole: number): string {
  const s = share(part, whole);
  return s === null ? '—' : `${(100 * s).toFixed(1)} %`;
}

/** The totals printed under the table (the same figures as the workbook's summary sheet and the JSON totals). */
export function totalsLine(t: PlanTotals): string {
  if (!t.studies) return 'total: no study planned';
  const parts = [
    `${t.studies} ${t.studies === 1 ? 'study' : 'studies'}`,
    `${whole(t.cells)} cells (absorber ${pct(t.cellsAbsorber, t.cells)})`,
    `peak memory ${fmt(t.peakMemoryBytes / 1e9)} GB (${t.peakMemoryStudy}; absorber ${pct(t.peakMemoryAbsorberBytes, t.peakMemoryBytes)})`,
  ];
  if (t.withSteps) parts.push(`${whole(t.steps)} steps`);
  if (t.withRuntime) {
    parts.push(`${fmt(t.nodeHours)} node-hours (absorber ${pct(t.nodeHoursAbsorber, t.nodeHours)})`);
    parts.push(`runtime ${fmt(t.runtimeHours)} h (absorber ${pct(t.runtimeAbsorberHours, t.runtimeHours)})`);
  }
  if (t.cost === null) parts.push(`no cost total (prices in ${t.currencies.join(', ')})`);
  else if (t.withCost) {
    const c = t.currencies.length === 1 ? t.currencies[0] : '';
    const amount = /^\p{Sc}+$/u.test(c) ? `${c}${fmt(t.cost)}` : `${fmt(t.cost)}${c ? ` ${c}` : ''}`;
    parts.push(`cost ${amount} (absorber ${pct(t.costAbsorber ?? 0, t.cost)})`);
  }
  const partial = t.withRuntime && t.withRuntime < t.studies ? `; runtime and cost of the ${t.withRuntime} studies that have them` : '';
  return `total: ${parts.join(', ')}${partial}`;
}

/** Notes on what was read, printed once the plan is written. */
function readingNotes(table: Table): string[] {
  const notes = [...table.notes];
  const kept = keptColumnNames(table).filter((n) => n !== '"remark"');
  if (kept.length) notes.push(`columns kept as they are (not plan fields): ${kept.join(', ')}`);
  const renamed = renameNote(outputHeaders(table).renamed);
  if (renamed) notes.push(renamed);
  const columns = fieldColumns(table);
  for (const r of repeatedFieldNotes(columns)) notes.push(`${r}: rows that give it fail; keep one of those columns`);
  if (!columns.has('band_short')) notes.push('the table has no band_short column; every row will fail');
  return notes;
}

/** `hush plan`: plans every row of a project table and writes the table back with the outputs added. */
export async function planCommand(argv: string[], io: CommandIO): Promise<number> {
  const args = parseArgs(argv, { out: {}, json: { flag: true }, replace: { flag: true }, sheet: {} });
  if (args.positional.length !== 1) throw new UsageError(`give one project table (.csv or .xlsx)${args.positional.length ? `, got ${args.positional.length} arguments` : ''}`);
  const file = args.positional[0];
  const fmtIn = tableFormat(file);
  if (fmtIn !== 'csv' && fmtIn !== 'xlsx') throw new UsageError(`${file}: the project table must be a .csv or .xlsx file`);
  const sheet = stringOption(args, 'sheet');
  if (sheet !== undefined && fmtIn !== 'xlsx') throw new UsageError('--sheet applies to .xlsx tables (a CSV file has one table)');
  const out = stringOption(args, 'out');
  if (out !== undefined && tableFormat(out) === null) throw new UsageError(`--out ${out}: write the plan as .xlsx, .csv or .json`);
  if (out === undefined && args.options.has('replace')) throw new UsageError('--replace only applies with --out');
  if (out !== undefined) {
    checkOut(file, out, args.options.has('replace'));
    // A missing or read-only directory is found before the table is read and planned.
    await prepareOutput(out);
  }
  // Text from the table is shown with its control characters escaped.
  const say = (t: string) => io.out(terminalSafe(t));
  const warn = (t: string) => io.err(terminalSafe(t));

  let table: Table;
  try {
    table = await readTable(file, { sheet });
  } catch (e) {
    // Reader messages start with the file's name; it is said once.
    const message = e instanceof Error ? e.message : String(e);
    const rest = message.startsWith(file) ? message.slice(file.length).replace(/^[:,]?\s*/, '') : message;
    warn(`hush plan: cannot read ${file}: ${rest}`);
    return 2;
  }
  const read = describeRead(table);
  // Notes are printed once the plan is written, so a run that ends in an error (exit 2) prints that error alone.
  const notes = readingNotes(table);
  const { planned, totals, plans, errors } = planTable(table, progress(io) ?? undefined);
  releasePlanningCaches();

  if (out !== undefined) {
    try {
      await writeTable(out, table, planned, totals, { read });
    } catch (e) {
      warn(`hush plan: cannot write ${out}: ${e instanceof Error ? e.message : String(e)}`);
      return 2;
    }
  }
  for (const n of notes) warn(`hush plan: ${n}`);

  if (args.options.has('json')) {
    io.out(
      jsonTerminalSafe(
        JSON.stringify(
          planned.map((r) => ({
            row: r.row.number,
            failed: r.failed,
            outputs: r.outputs ? Object.fromEntries(OUTPUT_NAMES.map((n, j) => [n, (r.outputs as PlanCell[])[j]])) : null,
          })),
        ),
      ),
    );
  } else {
    const summary: string[][] = [];
    const rowNotes: string[] = [];
    const studyColumns = fieldColumns(table).get('study');
    const head = ['study', 'layers', 'order', 'worst |r|', 'dB', 'grid', 'overhead %', 'error % (absorber+dispersion+run)', 'memory GB', 'steps', 'runtime h', 'cost', 'notes'];
    let hidden = 0;
    planned.forEach((r, i) => {
      if (!r.outputs) return;
      if (summary.length >= MAX_SHOWN_ROWS) {
        hidden++;
        return;
      }
      const label = rowLabel(studyColumns && studyColumns.length === 1 ? r.row.values[studyColumns[0]] : undefined, r.row.number);
      const plan = plans[i];
      if (!plan) {
        summary.push([label, 'ERROR', ...head.slice(2, -1).map(() => ''), 'see below']);
        rowNotes.push(`${label} (row ${r.row.number}): error: ${errors[i] ?? ''}`);
        return;
      }
      const o = r.outputs;
      const db = pick(o, 'worst_reflection_db');
      const errs = ['error_absorber', 'error_dispersion', 'error_run'].map((n) => pick(o, n));
      summary.push([
        label,
        String(plan.design.layers),
        String(plan.design.order),
        fmt(plan.design.worstAmplitude, 3),
        typeof db === 'number' ? db.toFixed(1) : '—',
        String(pick(o, 'grid')),
        num(pick(o, 'overhead_percent')),
        errs.every((e) => typeof e === 'number') ? errs.map((e) => fmt(100 * (e as number), 2)).join('+') : '—',
        num(pick(o, 'memory')),
        integer(pick(o, 'steps')),
        num(pick(o, 'runtime')),
        num(pick(o, 'cost')),
        plan.warnings.length ? `${plan.warnings.length} (below)` : '',
      ]);
      for (const w of plan.warnings) rowNotes.push(`${label} (row ${r.row.number}): ${w}`);
    });
    const shown = summary.map((r) => r.map(terminalSafe));
    const widths = head.map((h, c) => Math.min(c === 0 ? 40 : 16, Math.max(c === 7 ? 14 : h.length, ...shown.map((r) => r[c].length))));
    const line = (cells: string[]) =>
      cells.map((t, c) => (c === cells.length - 1 ? t : c === 0 ? t.slice(0, widths[c]).padEnd(widths[c]) : t.padStart(widths[c]))).join('  ');
    say(read);
    io.out(line(head.map((h, c) => (c === 7 ? 'error %' : h))));
    for (const r of shown) io.out(line(r));
    if (hidden) io.out(`… and ${whole(hidden)} more ${hidden === 1 ? 'study' : 'studies'} (with their notes) not shown here: the totals count every row, and --out writes each one`);
    if (rowNotes.length) {
      io.out('');
      io.out('error % is the error split: absorber + dispersion + run length, in % of intensity. Notes:');
      for (const n of rowNotes) say(`  ${n}`);
      io.out('');
    }
    say(totalsLine(totals));
    io.out(`${totals.studies} planned, ${totals.failed} failed; runtime and cost are planning estimates (check convergence with a thicker absorber)`);
  }

  if (out !== undefined && !args.options.has('json')) say(`wrote ${out}`);
  let reported = 0;
  planned.forEach((r, i) => {
    if (r.failed && reported++ < MAX_SHOWN_ROWS) warn(`hush plan: row ${r.row.number}: ${errors[i] ?? ''}`);
  });
  if (reported > MAX_SHOWN_ROWS) warn(`hush plan: … and ${whole(reported - MAX_SHOWN_ROWS)} more rows failed; --out writes each error in its row's notes`);
  return totals.failed ? 1 : 0;
}

/**
 * The plan as CSV: UTF-8 with a byte-order mark (so spreadsheet programs
 * read σ, λ and × right), RFC 4180 quoting, CRLF line ends; the table's cells
 * as read, the outputs in added columns, and a last row of totals marked in
 * its notes cell ("total of N planned studies: …"; hush drops it when it
 * reads the plan back). A text cell that begins with =, +, -, @, tab or
 * carriage return and is not a plain number is written with a leading
 * apostrophe, so no spreadsheet program evaluates it as a formula (the
 * common practice recommended against CSV injection).
 */
import type { FileHandle } from 'fs/promises';
import { MODEL_VERSION } from '../../physics/constants';
import { OUTPUT_COLUMNS } from '../fields';
import type { PlanCell } from '../index';
import type { FieldValue } from '../units';
import { isDateFormat, serialDateText } from './formats';
import { TOTAL_ROW_MARK } from './header';
import { planLayout, type PlannedRow } from './layout';
import type { SourceRow, Table } from './model';
import { share, type PlanTotals } from './summary';
import { DECIMAL } from './text';

/** A text that a spreadsheet program would take for a formula when it opens a CSV. */
const FORMULA_START = /^[=+\-@\t\r]/;

/** Text of a cell in CSV output, guarded against formula evaluation (see the module comment). */
export function csvText(t: string): string {
  return FORMULA_START.test(t) && !DECIMAL.test(t) ? `'${t}` : t;
}

/** One CSV field: numbers as numbers, text guarded and quoted when it holds a comma, quote, line break or surrounding spaces. */
export function csvCell(v: FieldValue | PlanCell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  const t = csvText(String(v));
  return /[",\r\n]|^\s|\s$/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
}

/** A cell of the table as written to CSV or JSON: a date-formatted number as its ISO date. */
export function cellValue(table: Table, row: SourceRow, c: number): FieldValue {
  const v = row.values[c];
  if (typeof v === 'number' && row.formats?.[c] !== undefined && isDateFormat(row.formats[c] as string)) return serialDateText(v, table.date1904);
  return v ?? '';
}

function fmtShare(x: number | null): string {
  return x === null ? '—' : `${(100 * x).toFixed(1)} %`;
}

/** Notes cell of the total row. */
export function totalRowNote(t: PlanTotals): string {
  const parts = [
    `${TOTAL_ROW_MARK}${t.studies} planned ${t.studies === 1 ? 'study' : 'studies'}${t.failed ? ` (${t.failed} failed, not summed)` : ''}`,
    `cells absorber share ${fmtShare(share(t.cellsAbsorber, t.cells))}`,
    `memory is the largest study's (${t.peakMemoryStudy || '—'}), absorber share ${fmtShare(share(t.peakMemoryAbsorberBytes, t.peakMemoryBytes))}`,
  ];
  if (t.withRuntime) {
    parts.push(`node-hours ${Number(t.nodeHours.toPrecision(6))} (absorber share ${fmtShare(share(t.nodeHoursAbsorber, t.nodeHours))})`);
    parts.push(`runtime and cost are planning estimates summed over ${t.withRuntime} ${t.withRuntime === 1 ? 'study' : 'studies'} with a runtime`);
  }
  if (t.cost === null) parts.push(`no cost total: the studies price in different currencies (${t.currencies.join(', ')})`);
  else if (t.withCost) parts.push(`cost absorber share ${fmtShare(share(t.costAbsorber ?? 0, t.cost))}`);
  return `${parts.join('; ')}; not a study row`;
}

/** Output cells of the total row (OUTPUT_COLUMNS order). */
export function totalRowOutputs(t: PlanTotals): PlanCell[] {
  const v: Record<string, PlanCell> = {
    cells_total: t.cells,
    cells_absorber: t.cellsAbsorber,
    overhead_percent: t.cells > t.cellsAbsorber ? (100 * t.cellsAbsorber) / (t.cells - t.cellsAbsorber) : null,
    memory: t.peakMemoryBytes / 1e9,
    steps: t.withSteps ? t.steps : null,
    runtime: t.withRuntime ? t.runtimeHours : null,
    runtime_absorber: t.withRuntime ? t.runtimeAbsorberHours : null,
    absorber_share: t.withRuntime && t.runtimeHours > 0 ? (100 * t.runtimeAbsorberHours) / t.runtimeHours : null,
    cost: t.withCost && t.cost !== null ? t.cost : null,
    notes: totalRowNote(t),
    model_version: MODEL_VERSION,
  };
  return OUTPUT_COLUMNS.map((c) => v[c.name] ?? null);
}

/** Writes the plan as CSV to an open file, in chunks. */
export async function writePlanCsv(out: FileHandle, table: Table, planned: readonly PlannedRow[], totals: PlanTotals): Promise<void> {
  const { slots, headers } = planLayout(table);
  let buffer = '\uFEFF';
  const flush = async (force: boolean) => {
    if (force || buffer.length > 1 << 20) {
      await out.write(buffer, null, 'utf8');
      buffer = '';
    }
  };
  const line = async (cells: string[]) => {
    buffer += cells.join(',') + '\r\n';
    await flush(false);
  };
  const inputLine = (row: SourceRow, outputs: readonly PlanCell[] | null) =>
    slots.map((s) => (s.column ? csvCell(cellValue(table, row, s.column.index)) : csvCell(outputs ? outputs[s.output] : null)));
  for (const r of table.above) await line(inputLine(r, null));
  await line(slots.map((s) => csvCell(s.column ? s.column.name : headers.texts[s.output])));
  for (const p of planned) await line(inputLine(p.row, p.outputs));
  if (totals.studies > 0) {
    const study = table.columns.find((c) => c.field === 'study');
    const outputs = totalRowOutputs(totals);
    await line(slots.map((s) => (s.column ? (s.column === study ? 'total' : '') : csvCell(outputs[s.output]))));
  }
  await flush(true);
}

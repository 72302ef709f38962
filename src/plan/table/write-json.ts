/**
 * The plan as JSON: every column of the table under its key (its header; a
 * column without one under its generated name; a name two columns share
 * with " (column L)" added), the outputs by name, the totals, and what was
 * read. Objects have no prototype, so a column headed "__proto__" is a key
 * like any other. Written row by row, one row per line.
 */
import type { FileHandle } from 'fs/promises';
import { MODEL_VERSION } from '../../physics/constants';
import { COST_CONSTANTS, OUTPUT_NAMES } from '../fields';
import type { PlanCell } from '../index';
import type { FieldValue } from '../units';
import { userColumns } from './header';
import type { PlannedRow } from './layout';
import type { Table } from './model';
import { totalsRecord, type PlanTotals } from './summary';
import { cellValue } from './write-csv';

export const ESTIMATE_NOTE =
  'Runtime and cost are planning estimates from the throughput and price you give for your hardware, not measurements. ' +
  'Before relying on a design, run a convergence check: repeat one study with the absorber a few layers thicker (or the gap larger) and confirm the monitored result does not change beyond your tolerance.';

function record(): Record<string, unknown> {
  return Object.create(null) as Record<string, unknown>;
}

/** The outputs of a row by name (no prototype). */
export function outputsRecord(outputs: readonly PlanCell[]): Record<string, PlanCell> {
  const o = record() as Record<string, PlanCell>;
  OUTPUT_NAMES.forEach((n, j) => (o[n] = outputs[j]));
  return o;
}

export async function writePlanJson(out: FileHandle, table: Table, planned: readonly PlannedRow[], totals: PlanTotals): Promise<void> {
  const columns = userColumns(table).filter((c) => c.name !== '');
  const head = {
    model_version: MODEL_VERSION,
    note: ESTIMATE_NOTE,
    cost_constants: COST_CONSTANTS,
    source: {
      file: table.file,
      sheet: table.sheet ? table.sheet.name : null,
      encoding: table.encoding,
      header_row: table.header.number,
      rows_above_header: table.above.map((r) => r.values.map((v) => v ?? '')),
    },
    columns: columns.map((c) => ({ key: c.key, header: c.header, column: c.index + 1, field: c.field, generated: c.generated })),
  };
  const opening = JSON.stringify(head, null, 2);
  await out.write(`${opening.slice(0, -2)},\n  "rows": [\n`, null, 'utf8');
  let buffer = '';
  for (let i = 0; i < planned.length; i++) {
    const p = planned[i];
    const inputs = record() as Record<string, FieldValue>;
    for (const c of columns) inputs[c.key] = cellValue(table, p.row, c.index);
    const row = { row: p.row.number, inputs, outputs: p.outputs ? outputsRecord(p.outputs) : null, failed: p.failed };
    buffer += `    ${JSON.stringify(row)}${i + 1 < planned.length ? ',' : ''}\n`;
    if (buffer.length > 1 << 20) {
      await out.write(buffer, null, 'utf8');
      buffer = '';
    }
  }
  const totalsText = JSON.stringify(totalsRecord(totals), null, 2).replace(/\n/g, '\n  ');
  await out.write(`${buffer}  ],\n  "totals": ${totalsText}\n}\n`, null, 'utf8');
}

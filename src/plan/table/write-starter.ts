/**
 * Writes the starter project table (src/plan/starter.ts) as a file for
 * `hush init`: .xlsx with a header note per column, data validation on the
 * choice columns, the example row and, in its output columns, one HUSH.PLAN
 * array formula (so the same file plans itself in Excel with the add-in; the
 * cached results are the plan API's, so the file reads right without it);
 * or .csv with the header and the example row. The file is made new ('wx'
 * through a temporary name): an existing file is never replaced here.
 */
import { promises as fs } from 'fs';
import type * as ExcelJSModule from 'exceljs';
import { planToRow, planRow } from '../index';
import { rowFromTable } from '../row';
import { starterTable, type StarterTable } from '../starter';
import type { PlanCell } from '../index';
import { cellName, columnLetters } from './text';
import { csvCell } from './write-csv';
import { tempName } from './write-file';
import { DOCUMENT_DATE } from './write-xlsx';
import { fixZipTimes } from './zip';

/** Rows below the header that carry the choice columns' data validation (the example row and room for more studies). */
export const STARTER_VALIDATED_ROWS = 200;

/** The worksheet's name in a starter workbook. */
export const STARTER_SHEET = 'studies';

/** The example row's plan as the worksheet function gives it (a blank for a missing value). */
export function starterOutputs(t: StarterTable = starterTable()): PlanCell[] {
  const header = t.inputs.map((c) => c.name);
  const values = t.inputs.map((c) => c.example ?? null);
  return planToRow(planRow(rowFromTable(header, values)));
}

/** The HUSH.PLAN formula of the example row (row 2): the input header and the row's input cells, absolute columns. */
export function starterFormula(t: StarterTable = starterTable()): { formula: string; ref: string } {
  const lastInput = columnLetters(t.inputs.length - 1);
  const first = cellName(t.inputs.length, 2);
  const last = cellName(t.inputs.length + t.outputs.length - 1, 2);
  return { formula: `HUSH.PLAN($A$1:$${lastInput}$1,$A2:$${lastInput}2)`, ref: `${first}:${last}` };
}

async function writeXlsx(temp: string, t: StarterTable): Promise<void> {
  const ExcelJS = await import('exceljs');
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Hush';
  wb.created = DOCUMENT_DATE;
  wb.modified = DOCUMENT_DATE;
  const ws = wb.addWorksheet(STARTER_SHEET, { views: [{ state: 'frozen', xSplit: 1, ySplit: 1 }] });
  const head = ws.getRow(1);
  head.font = { bold: true };
  const inputFill: ExcelJSModule.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFEDEDED' } };
  const outputFill: ExcelJSModule.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFDCE8F5' } };
  t.inputs.forEach((c, k) => {
    const cell = head.getCell(k + 1);
    cell.value = c.name;
    cell.note = c.required ? `${c.note} (required)` : c.note;
    cell.fill = inputFill;
    ws.getColumn(k + 1).width = c.name === 'study' ? 44 : Math.max(12, c.name.length + 3);
    if (c.example !== null) ws.getCell(2, k + 1).value = c.example;
    if (c.choices) {
      const list = `"${c.choices.join(',')}"`;
      for (let r = 2; r <= STARTER_VALIDATED_ROWS + 1; r++) {
        ws.getCell(r, k + 1).dataValidation = {
          type: 'list',
          allowBlank: true,
          formulae: [list],
          showErrorMessage: true,
          errorStyle: 'stop',
          errorTitle: c.name,
          error: `${c.name} is one of ${c.choices.join(', ')}`,
        };
      }
    }
  });
  t.outputs.forEach((o, j) => {
    const cell = head.getCell(t.inputs.length + j + 1);
    cell.value = o.header;
    cell.note = `${o.note}. Output: HUSH.PLAN fills it (Excel with the add-in), or hush plan.`;
    cell.fill = outputFill;
    ws.getColumn(t.inputs.length + j + 1).width = Math.max(11, Math.min(24, o.header.length + 2));
  });
  const results = starterOutputs(t);
  const { formula, ref } = starterFormula(t);
  const result = (v: PlanCell) => (v === null || v === undefined ? '' : v);
  ws.getCell(2, t.inputs.length + 1).value = { formula, result: result(results[0]), shareType: 'array', ref } as ExcelJSModule.CellValue;
  for (let j = 1; j < t.outputs.length; j++) ws.getCell(2, t.inputs.length + j + 1).value = result(results[j]) as ExcelJSModule.CellValue;
  const about = wb.addWorksheet('about');
  about.getColumn(1).width = 110;
  about.getCell('A1').value = t.note;
  about.getCell('A2').value =
    'Plan it with "hush plan FILE.xlsx --out PLAN.xlsx" (no Excel needed), or open it in Excel with the Hush add-in: row 2 holds a HUSH.PLAN formula over its input cells; copy it down for more studies.';
  about.getCell('A3').value = 'Runtime and cost figures are planning estimates; check convergence (a thicker absorber, a finer cell) before results are relied on.';
  const bytes = Buffer.from(await wb.xlsx.writeBuffer());
  fixZipTimes(bytes);
  await fs.writeFile(temp, bytes, { flag: 'wx' });
}

function csvText(t: StarterTable): string {
  const header = t.inputs.map((c) => csvCell(c.name)).join(',');
  const row = t.inputs.map((c) => csvCell(c.example)).join(',');
  return `\ufeff${header}\r\n${row}\r\n`;
}

/** Writes the starter table to `file` (.xlsx or .csv); refuses an existing file. */
export async function writeStarter(file: string, format: 'xlsx' | 'csv'): Promise<void> {
  const t = starterTable();
  const temp = tempName(file, String(Date.now()));
  try {
    if (format === 'xlsx') await writeXlsx(temp, t);
    else await fs.writeFile(temp, csvText(t), { flag: 'wx' });
    // A link fails where the name exists, so a file made meanwhile is not replaced.
    await fs.link(temp, file);
  } finally {
    await fs.rm(temp, { force: true }).catch(() => undefined);
  }
}

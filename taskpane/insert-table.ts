/**
 * "Insert project table" (in Excel): the starter table of src/plan/starter.ts
 * written into the active sheet at A1 — the header row (inputs, then the
 * plan's outputs), the invented example row, a list validation on each choice
 * column, a note on each header cell where the host has notes (ExcelApi 1.18),
 * and in the example row's first output cell a HUSH.PLAN formula over the
 * input header and the row, which spills the outputs beside it.
 *
 * `starterSheet` is the pure part (what goes where); `insertStarterTable` the
 * thin Office.js part. It never writes over a non-empty cell without asking:
 * it first reads whether the target area holds anything, and only when it
 * does asks `confirm` (a question in the pane: Office has no window.confirm)
 * before writing, in one batch that checks again that the area is as it was.
 *
 * API sets: ExcelApi 1.4 (getUsedRangeOrNullObject), 1.8 (dataValidation),
 * 1.18 (notes, skipped where unsupported).
 */
import { columnLetters } from '../src/workbook/types';
import { starterTable, type StarterTable } from './plan-adapter';

/** Rows below the header that get the choice columns' validation (rows 2..201). */
export const VALIDATED_ROWS = 200;

export interface StarterSheet {
  /** Columns of the table: the inputs, then the outputs. */
  width: number;
  inputCount: number;
  /** Header row (inputs, then output headers with units). */
  header: string[];
  /** The example row's input cells (blank where the example gives no value). */
  example: Array<string | number>;
  /** The example row's first output cell and its formula (A1 style, English function names). */
  formula: { address: string; formula: string };
  /** List validations: a column's rows 2..VALIDATED_ROWS+1 and the list source ("a,b,c"). */
  validations: Array<{ address: string; source: string }>;
  /** One note per header cell. */
  notes: Array<{ address: string; text: string }>;
  /** Everything the insert may touch (header, example, spill and validated rows), e.g. "A1:CZ201". */
  area: string;
}

/** Where each part of the starter table goes on a sheet whose table starts at A1. */
export function starterSheet(table: StarterTable = starterTable(), rows = VALIDATED_ROWS): StarterSheet {
  const inputCount = table.inputs.length;
  const width = inputCount + table.outputs.length;
  const col = (c: number) => columnLetters(c);
  const lastInput = col(inputCount - 1);
  const header = [...table.inputs.map((c) => c.name), ...table.outputs.map((o) => o.header)];
  const example = table.inputs.map((c) => c.example ?? '');
  const validations = table.inputs.flatMap((c, k) => {
    if (!c.choices) return [];
    const source = c.choices.join(',');
    // Excel's list source is at most 255 characters and splits on commas.
    if (source.length > 255 || c.choices.some((v) => v.includes(','))) {
      throw new RangeError(`the choices of ${c.name} do not fit a spreadsheet list validation`);
    }
    return [{ address: `${col(k)}2:${col(k)}${rows + 1}`, source }];
  });
  const notes = [...table.inputs.map((c) => c.note), ...table.outputs.map((o) => o.note)].map((text, k) => ({ address: `${col(k)}1`, text }));
  return {
    width,
    inputCount,
    header,
    example,
    formula: { address: `${col(inputCount)}2`, formula: `=HUSH.PLAN($A$1:$${lastInput}$1,A2:${lastInput}2)` },
    validations,
    notes,
    area: `A1:${col(width - 1)}${rows + 1}`,
  };
}

/** The part of the Excel namespace used here (a mock in tests). */
export interface ExcelRunner {
  run<T>(batch: (context: Excel.RequestContext) => Promise<T>): Promise<T>;
}

export interface InsertOutcome {
  written: boolean;
  sheet: string;
  area: string;
  /** Whether header notes were written (false where the host lacks ExcelApi 1.18). */
  notes: boolean;
  /** Address of what was in the area before (null when it was empty). */
  replaced: string | null;
}

/** Address of the used cells (values only) of `area` on the active sheet, or null when none. */
async function usedPart(context: Excel.RequestContext, area: string): Promise<{ sheet: string; used: string | null }> {
  const sheet = context.workbook.worksheets.getActiveWorksheet();
  sheet.load('name');
  const used = sheet.getRange(area).getUsedRangeOrNullObject(true);
  used.load('address');
  await context.sync();
  return { sheet: sheet.name, used: used.isNullObject ? null : used.address };
}

/**
 * Writes the starter table at A1 of the active sheet. `confirm(question)` is
 * asked only when the area is not empty; answering false writes nothing.
 * `notesSupported` says whether the host has ExcelApi 1.18.
 */
export async function insertStarterTable(
  excel: ExcelRunner,
  confirm: (question: string) => Promise<boolean>,
  notesSupported: boolean,
  s: StarterSheet = starterSheet(),
): Promise<InsertOutcome> {
  const before = await excel.run((context) => usedPart(context, s.area));
  if (before.used !== null) {
    const ok = await confirm(
      `${before.used} is not empty. The project table needs ${before.sheet}!${s.area} (header, example row, room for its outputs and ` +
        `${VALIDATED_ROWS} rows of choice lists). Write over what is there?`,
    );
    if (!ok) return { written: false, sheet: before.sheet, area: s.area, notes: false, replaced: before.used };
  }
  return excel.run(async (context) => {
    const sheet = context.workbook.worksheets.getActiveWorksheet();
    // Notes already on header cells are replaced (NoteCollection.add refuses a cell that has one).
    const oldNotes = notesSupported ? s.notes.map((n) => sheet.notes.getItemOrNullObject(n.address)) : [];
    oldNotes.forEach((n) => n.load('content'));
    // The area must still be what the user saw (empty, or what they agreed to replace); this sync reads the notes too.
    const now = await usedPart(context, s.area);
    if (now.sheet !== before.sheet || now.used !== before.used) {
      throw new Error(`the active sheet changed while the pane was asking (${now.sheet}, used ${now.used ?? 'nothing'}); press Insert project table again`);
    }
    if (before.used !== null) sheet.getRange(s.area).clear('Contents');
    for (const n of oldNotes) if (!n.isNullObject) n.delete();
    sheet.getRangeByIndexes(0, 0, 1, s.width).values = [s.header];
    sheet.getRangeByIndexes(1, 0, 1, s.inputCount).values = [s.example];
    sheet.getRange(s.formula.address).formulas = [[s.formula.formula]];
    for (const v of s.validations) {
      const cells = sheet.getRange(v.address);
      cells.dataValidation.clear();
      cells.dataValidation.rule = { list: { inCellDropDown: true, source: v.source } };
    }
    if (notesSupported) for (const n of s.notes) sheet.notes.add(sheet.getRange(n.address), n.text);
    sheet.getRangeByIndexes(0, 0, 1, s.width).format.font.bold = true;
    await context.sync();
    return { written: true, sheet: before.sheet, area: s.area, notes: notesSupported, replaced: before.used };
  });
}

/**
 * Plans every row of a table: blank rows stay blank, a row that cannot be
 * planned gets its error in the notes column, and the planned rows' figures
 * make the totals.
 */
import { isHushInputError } from '../steps';
import { errorToRow, type Plan } from '../index';
import { blankRow, type Table } from './model';
import { fieldColumns, projectRow, TablePlanner } from './rows';
import { studyFigures, planTotals, type PlanTotals, type StudyFigures } from './summary';
import type { PlannedRow } from './layout';

export interface TablePlan {
  planned: PlannedRow[];
  totals: PlanTotals;
  /** Plans of the planned rows (null for blank and failed rows), in row order; planned without the study name, so rows that differ only in it share one. */
  plans: (Plan | null)[];
  /** Error message of each failed row (undefined for the others). */
  errors: (string | undefined)[];
  /** Rows planned, and rows whose plan came from an earlier row with the same typed values (study name aside). */
  work: { planned: number; reused: number };
}

/** Label of a row: its study name (spaces collapsed), or "row N". */
export function rowLabel(study: unknown, row: number): string {
  const s = study === undefined || study === null ? '' : String(study).trim().replace(/\s+/g, ' ');
  return s === '' ? `row ${row}` : s;
}

export function planTable(table: Table, onRow?: (done: number, total: number) => void): TablePlan {
  const columns = fieldColumns(table);
  const price = columns.get('price_per_hour');
  const studyCol = columns.get('study');
  const planned: PlannedRow[] = [];
  const plans: (Plan | null)[] = [];
  const errors: (string | undefined)[] = [];
  const figures: StudyFigures[] = [];
  let failed = 0;
  const planner = new TablePlanner();
  const total = table.rows.length;
  table.rows.forEach((row, i) => {
    if (blankRow(row)) {
      planned.push({ row, outputs: null, failed: false, figures: null });
      plans.push(null);
      errors.push(undefined);
    } else {
      try {
        const project = projectRow(table, row, columns);
        const plan = planner.plan(project);
        const label = rowLabel(studyCol && studyCol.length === 1 ? row.values[studyCol[0]] : undefined, row.number);
        const f = studyFigures(plan, row.number, label, price && price.length === 1 ? row.values[price[0]] : undefined);
        figures.push(f);
        planned.push({ row, outputs: planner.outputs(plan), failed: false, figures: f });
        plans.push(plan);
        errors.push(undefined);
      } catch (e) {
        failed++;
        const msg = isHushInputError(e) ? e.message : `internal error: ${e instanceof Error ? e.message : String(e)}`;
        planned.push({ row, outputs: errorToRow(msg), failed: true, figures: null });
        plans.push(null);
        errors.push(msg);
      }
    }
    if (onRow) onRow(i + 1, total);
  });
  return { planned, totals: planTotals(figures, failed), plans, errors, work: { planned: planner.planned, reused: planner.reused } };
}

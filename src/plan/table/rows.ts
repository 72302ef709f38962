/**
 * A table row → the project row the planner reads, with the checks that
 * belong to the table rather than to a field: a field given in two columns,
 * a formula without a saved result, a date where a quantity belongs, a value
 * too long to be one. And the plan of a row, computed once for rows that
 * differ only in their study name.
 */
import { setBounded } from '../../physics/bounded-map';
import { HushInputError } from '../../physics/errors';
import { columnValue, inputColumn, planFromInputs, planInputs, planToRow, type FieldValue, type Plan, type PlanCell, type ProjectRow } from '../index';
import { isDateFormat, serialDateText } from './formats';
import { userColumns } from './header';
import { MAX_FIELD_CHARS } from './limits';
import { blankValue, type SourceRow, type Table } from './model';
import { cellName, columnLetters, quoteInput } from './text';

/** The columns of each plan field, in column order. */
export function fieldColumns(table: Table): Map<string, number[]> {
  const out = new Map<string, number[]>();
  for (const c of userColumns(table)) {
    if (c.field === null) continue;
    const list = out.get(c.field);
    if (list) list.push(c.index);
    else out.set(c.field, [c.index]);
  }
  return out;
}

/** Fields given in more than one column: "intensity_error appears in columns F and K". */
export function repeatedFieldNotes(columns: Map<string, number[]>): string[] {
  const notes: string[] = [];
  for (const [field, cols] of columns) {
    if (cols.length > 1) notes.push(`${field} appears in columns ${cols.slice(0, -1).map(columnLetters).join(', ')} and ${columnLetters(cols[cols.length - 1])}`);
  }
  return notes;
}

/** The project row of a table row. Throws HushInputError for what makes the row unplannable as a table row. */
export function projectRow(table: Table, row: SourceRow, columns: Map<string, number[]>): ProjectRow {
  const out: ProjectRow = {};
  for (const [field, cols] of columns) {
    if (cols.length > 1) {
      const given = cols.filter((c) => !blankValue(row.values[c]) || row.noResult?.has(c));
      if (given.length) {
        const cells = cols.map((c) => `${cellName(c, row.number)} ${blankValue(row.values[c]) ? '(empty)' : quoteInput(row.values[c])}`);
        throw new HushInputError(
          field,
          `${field} appears in columns ${cols.slice(0, -1).map(columnLetters).join(', ')} and ${columnLetters(cols[cols.length - 1])} (${cells.join(', ')}): keep one of those columns`,
          'value',
        );
      }
      continue;
    }
    const c = cols[0];
    if (row.noResult?.has(c)) {
      throw new HushInputError(
        field,
        `${field} in ${cellName(c, row.number)} is a formula (=${row.formulas?.[c] ?? ''}) without a saved result: open the workbook in a spreadsheet program and save it, so the result is stored with the formula`,
        'value',
      );
    }
    const v = row.values[c];
    const column = inputColumn(table.columns.find((t) => t.index === c)?.header ?? field);
    if (typeof v === 'number' && row.formats?.[c] !== undefined && isDateFormat(row.formats[c] as string)) {
      throw new HushInputError(field, `${field} in ${cellName(c, row.number)} is a date (${serialDateText(v, table.date1904)}), not a ${field} value; format the cell as a number or text`, 'value');
    }
    if (typeof v === 'string' && field !== 'study' && v.length > MAX_FIELD_CHARS && Array.from(v.trim()).length > MAX_FIELD_CHARS) {
      throw new HushInputError(field, `${field} in ${cellName(c, row.number)} is ${Array.from(v.trim()).length} characters long (${quoteInput(v.trim())}): a value of a plan field has at most ${MAX_FIELD_CHARS}`, 'value');
    }
    // A header unit applies to the column's bare numbers; a header unit that contradicts the field fails the rows that give it.
    out[field] = column ? columnValue(column, v as FieldValue) : v;
  }
  return out;
}

/**
 * Plans a row. Rows that differ only in their study name share one plan:
 * the planner is asked for the row without its name (its cache keys on the
 * inputs, name included), and the name is put back on the plan returned.
 */
export function planStudy(row: ProjectRow): Plan {
  const inputs = planInputs(row);
  const plan = planFromInputs(inputs.study === '' ? inputs : { ...inputs, study: '' });
  return named(plan, inputs.study);
}

function named(plan: Plan, study: string): Plan {
  return plan.inputs.study === study ? plan : { ...plan, inputs: { ...plan.inputs, study } };
}

/** Most typed rows whose plan (or error) a TablePlanner keeps. */
export const TYPED_CACHE_LIMIT = 10_000;

/**
 * Plans the rows of one table, each distinct set of typed values (study
 * name left out) once: a table of many studies that differ only in their
 * names reads and plans each distinct row once (a cache in front of the
 * planner's own, which keys on parsed inputs).
 */
export class TablePlanner {
  private readonly cache = new Map<string, Plan | HushInputError>();
  /** Rows planned and rows answered from the cache (counted work). */
  planned = 0;
  reused = 0;

  /**
   * The plan of a row, computed without its study name (plan.inputs.study
   * is ''), shared by every row of the table with the same typed values.
   */
  plan(row: ProjectRow): Plan {
    const key = JSON.stringify(Object.keys(row).filter((k) => k !== 'study').sort().map((k) => [k, row[k] ?? null]));
    const hit = this.cache.get(key);
    if (hit !== undefined) {
      this.reused++;
      if (hit instanceof HushInputError) throw hit;
      return hit;
    }
    this.planned++;
    let result: Plan | HushInputError;
    try {
      result = planStudy({ ...row, study: undefined });
    } catch (e) {
      if (!(e instanceof HushInputError)) throw e;
      result = e;
    }
    setBounded(this.cache, key, result, TYPED_CACHE_LIMIT);
    if (result instanceof HushInputError) throw result;
    return result;
  }

  private readonly rows = new WeakMap<Plan, PlanCell[]>();

  /** The output row of a plan, made once per plan (rows that share a plan share it; writers never change it). */
  outputs(plan: Plan): PlanCell[] {
    let o = this.rows.get(plan);
    if (!o) this.rows.set(plan, (o = planToRow(plan)));
    return o;
  }
}

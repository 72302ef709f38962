/**
 * Worksheet arguments → checked values, through the same field registry as
 * the project table and the command line (src/plan/fields): an argument named
 * after a field is read exactly as that field's table cell or option is.
 *
 * What is particular to Excel is handled here, before the registry reads the
 * value: an omitted optional argument arrives as null (or undefined), an empty
 * cell as null, "" or 0, a number typed as text as a string, and a 1×1 range
 * as a nested array. null, undefined, "" and blank text count as omitted (the
 * default applies; a required argument is reported missing); a 1×1 range is
 * its one value; a larger range is refused where one value is expected and
 * read cell by cell (row by row, blanks skipped) where a list is natural.
 * A 0 that came from an empty cell cannot be told from a typed 0: it goes to
 * the range check like any number, which reports it.
 */
import { inputField, isBlank, readInput, readRequired, type KindValue } from '../plan/fields';
import { HushInputError } from '../plan/steps';

export { isBlank };

function describe(value: unknown): string {
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  if (Array.isArray(value)) return 'a range';
  return 'an error or object value';
}

/** The one value of a single cell: unwraps 1×1 ranges, refuses larger ones. */
export function singleValue(field: string, value: unknown): unknown {
  if (!Array.isArray(value)) return value;
  const rows = value.length;
  const cols = rows > 0 && Array.isArray(value[0]) ? value[0].length : 1;
  if (rows === 1 && cols === 1) return Array.isArray(value[0]) ? value[0][0] : value[0];
  throw new HushInputError(field, `${field} must be a single value, not a range of ${rows}×${cols} cells`, 'value');
}

function plainValue(field: string, v: unknown): unknown {
  if (v === null || v === undefined || typeof v === 'string' || typeof v === 'number') return v;
  throw new HushInputError(field, `${field} must be a number or text (got ${describe(v)})`, 'value');
}

/** An optional argument named after field `name`: undefined when omitted or blank. */
export function arg<K extends keyof KindValue>(name: string, value: unknown): KindValue[K] | undefined {
  const f = inputField(name);
  return readInput<K>(f, plainValue(f.param, singleValue(f.param, value)));
}

/** A required argument named after field `name`. */
export function requiredArg<K extends keyof KindValue>(name: string, value: unknown): KindValue[K] {
  const f = inputField(name);
  return readRequired<K>(f, plainValue(f.param, singleValue(f.param, value)));
}

/** The cells of a range (row by row, blanks skipped) or a single value. */
function cellsOf(value: unknown): unknown[] {
  const cells: unknown[] = [];
  const walk = (v: unknown): void => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (!isBlank(v)) cells.push(v);
  };
  walk(value);
  return cells;
}

/** True when an optional range argument was left out (null/undefined) or holds only blank cells. */
export function isOmitted(v: unknown): boolean {
  return cellsOf(v).length === 0;
}

/**
 * A list field (grading orders) from a range of cells or from text such as
 * "2,3,4" (in one cell or several): undefined when nothing is given.
 */
export function listArg<K extends keyof KindValue>(name: string, value: unknown): KindValue[K] | undefined {
  const f = inputField(name);
  const cells = cellsOf(value).map((c) => plainValue(f.param, c));
  if (cells.length === 0) return undefined;
  return readInput<K>(f, cells.map(String).join(','));
}

/**
 * Every value of a range (row by row, blanks skipped) or a single value, each
 * read as field `name` (cells per wavelength, angles); at most `max` values.
 */
export function valuesArg<K extends keyof KindValue>(param: string, name: string, value: unknown, max: number): KindValue[K][] {
  const cells = cellsOf(value);
  if (cells.length === 0) throw new HushInputError(param, `${param} needs at least one value`, 'value');
  if (cells.length > max) throw new HushInputError(param, `${param} takes at most ${max} values (got ${cells.length})`, 'value');
  return cells.map((c) => requiredArg<K>(name, c));
}

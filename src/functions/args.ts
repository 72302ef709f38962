/**
 * Normalises worksheet arguments before they reach the core.
 *
 * Excel hands a custom function different things for "nothing" depending on
 * host and on how the argument was left out: an omitted optional argument
 * arrives as null (or undefined), an empty cell as null, "" or 0, and a
 * number typed as text as a string. These helpers accept all of them:
 *   - null, undefined, "" and blank text count as omitted: the default applies
 *     to an optional argument, a required one is reported missing;
 *   - numeric text ("0.01", " 1e-3 ") is read as the number it spells;
 *   - a 1×1 range is its one value; a larger range is refused where one value
 *     is expected, and flattened (row by row, blanks skipped) where a list is
 *     natural;
 *   - TRUE/FALSE, error values and other text are refused with #VALUE!.
 * A 0 that came from an empty cell cannot be told from a typed 0: it goes to
 * the core's range checks like any number, which report it.
 * Every refusal is a HushInputError of kind 'value' naming the argument.
 */
import { HushInputError, quote } from '../plan/steps';
import { parseAngle, parseFrequency, parseLength, parseNumber } from '../plan/units';

/** Decimal notation only: Number("") is 0 and Number("0x10") is 16. */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** True for the ways Excel says "no value": null, undefined, "" and blank text. */
export function isBlank(value: unknown): boolean {
  return value === null || value === undefined || (typeof value === 'string' && value.trim() === '');
}

function describe(value: unknown): string {
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  if (Array.isArray(value)) return 'a range';
  if (typeof value === 'object' && value !== null) return 'an error or object value';
  return quote(value);
}

/** The one value of a single cell: unwraps 1×1 ranges, refuses larger ones. */
export function singleValue(field: string, value: unknown): unknown {
  if (!Array.isArray(value)) return value;
  const rows = value.length;
  const cols = rows > 0 && Array.isArray(value[0]) ? value[0].length : 1;
  if (rows === 1 && cols === 1) return Array.isArray(value[0]) ? value[0][0] : value[0];
  throw new HushInputError(field, `${field} must be a single value, not a range of ${rows}×${cols} cells`, 'value');
}

/** A number from a number or numeric text; refuses everything else with #VALUE!. */
function toNumber(field: string, value: unknown): number {
  if (typeof value === 'number') return value;
  if (typeof value === 'string') {
    const text = value.trim();
    // Number("") is 0 and Number("0x10") is 16: accept decimal notation only.
    if (DECIMAL.test(text)) return Number(text);
  }
  throw new HushInputError(field, `${field} must be a number (got ${describe(value)})`, 'value');
}

/** A required number. */
export function requiredNumber(field: string, value: unknown): number {
  const v = singleValue(field, value);
  if (isBlank(v)) throw new HushInputError(field, `${field} is required`, 'value');
  return toNumber(field, v);
}

/** An optional number: `fallback` when omitted or blank (undefined lets the core apply its own default). */
export function optionalNumber(field: string, value: unknown, fallback?: number): number | undefined {
  const v = singleValue(field, value);
  if (isBlank(v)) return fallback;
  return toNumber(field, v);
}

/** An optional word from a fixed list, matched without regard to case or surrounding blanks. */
export function optionalChoice<T extends string>(field: string, value: unknown, choices: readonly T[], fallback: T): T {
  const v = singleValue(field, value);
  if (isBlank(v)) return fallback;
  if (typeof v === 'string') {
    const word = v.trim().toLowerCase();
    const found = choices.find((c) => c.toLowerCase() === word);
    if (found) return found;
  }
  const list = choices.map((c) => `"${c}"`).join(' or ');
  throw new HushInputError(field, `${field} must be ${list} (got ${describe(v)})`, 'value');
}

/**
 * A list of numbers from a value or a range of any shape, read row by row with
 * blank cells skipped; `fallback` when nothing at all is given.
 */
export function numberList(field: string, value: unknown, fallback?: number[]): number[] {
  const cells: unknown[] = [];
  const walk = (v: unknown): void => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (!isBlank(v)) cells.push(v);
  };
  walk(value);
  if (cells.length === 0) {
    if (fallback) return fallback.slice();
    throw new HushInputError(field, `${field} needs at least one number`, 'value');
  }
  return cells.map((c) => toNumber(field, c));
}

/**
 * A list of numbers from a range (cells read row by row, blanks skipped) or
 * from text such as "2,3,4" or "2 3 4" (in one cell or several); `fallback`
 * when nothing at all is given.
 */
export function numberListOrText(field: string, value: unknown, fallback?: number[]): number[] {
  const cells: unknown[] = [];
  const walk = (v: unknown): void => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (typeof v === 'string') cells.push(...v.split(/[\s,;]+/).filter(Boolean));
    else if (!isBlank(v)) cells.push(v);
  };
  walk(value);
  if (cells.length === 0) {
    if (fallback) return fallback.slice();
    throw new HushInputError(field, `${field} needs at least one number`, 'value');
  }
  return cells.map((c) => {
    try {
      return toNumber(field, c);
    } catch {
      throw new HushInputError(field, `${field} must be numbers, as a range or as text such as "2,3,4" (got ${describe(c)})`, 'value');
    }
  });
}

/**
 * An optional angle in degrees: a number (degrees), numeric text, or text with
 * an angle unit ("30 deg", "0.5 rad"), read by the plan API's unit parser;
 * `fallback` when omitted or blank.
 */
export function optionalAngle(field: string, value: unknown, fallback?: number): number | undefined {
  return quantity(field, value, parseAngle, false, fallback);
}


/**
 * A quantity from a number (in the argument's own unit) or from text with a
 * unit, read by the plan API's unit parser (`parse`, whose bare unit is the
 * argument's unit); `fallback` when omitted or blank, an error when required.
 */
function quantity(field: string, value: unknown, parse: (field: string, v: string | number) => number, required: boolean, fallback?: number): number | undefined {
  const v = singleValue(field, value);
  if (isBlank(v)) {
    if (required) throw new HushInputError(field, `${field} is required`, 'value');
    return fallback;
  }
  if (typeof v === 'string' && !DECIMAL.test(v.trim())) return parse(field, v);
  return toNumber(field, v);
}

/** A required length in metres: a number (metres) or text with a unit ("10 cm", "5 um"). */
export function requiredLength(field: string, value: unknown): number {
  return quantity(field, value, (f, v) => parseLength(f, v, 'm'), true) as number;
}

/** A required frequency in Hz: a number (Hz) or text with a unit ("1.5 GHz"). */
export function requiredFrequency(field: string, value: unknown): number {
  return quantity(field, value, (f, v) => parseFrequency(f, v, 'Hz'), true) as number;
}

/** A number or a percentage as text, read by the plan API's parser; refusals say both forms are allowed. */
function fraction(field: string, v: string | number): number {
  try {
    return parseNumber(field, v);
  } catch {
    throw new HushInputError(field, `${field} must be a number or a percentage such as "1%" (got ${describe(v)})`, 'value');
  }
}

/** A required plain number, or a percentage as text ("1%" is 0.01). */
export function requiredFraction(field: string, value: unknown): number {
  return quantity(field, value, fraction, true) as number;
}

/** An optional plain number, or a percentage as text ("50%" is 0.5); `fallback` when omitted or blank. */
export function optionalFraction(field: string, value: unknown, fallback?: number): number | undefined {
  return quantity(field, value, fraction, false, fallback);
}

/**
 * Every value of a range (row by row, blanks skipped) or a single value, each
 * read by `one`; for arguments where a list is natural (angles, cells per
 * wavelength). At most `max` values.
 */
export function valueList<T>(field: string, value: unknown, one: (field: string, v: unknown) => T, max: number): T[] {
  const cells: unknown[] = [];
  const walk = (v: unknown): void => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (!isBlank(v)) cells.push(v);
  };
  walk(value);
  if (cells.length === 0) throw new HushInputError(field, `${field} needs at least one value`, 'value');
  if (cells.length > max) throw new HushInputError(field, `${field} takes at most ${max} values (got ${cells.length})`, 'value');
  return cells.map((c) => one(field, c));
}

/**
 * Quantities with units, as typed in a project table or on the command line:
 * "1550 nm", "193 THz", "0.8 um", "30 GHz", "2.5 h", "500 fs", "10 GB/s".
 * A bare number takes the field's default unit (fields.ts lists them). Units
 * are parsed by a limited mathjs instance (units only, created once); each
 * distinct text is parsed once and cached. Values come back in SI, rounded to
 * 12 significant digits so that "1550 nm" and "1.55 um" give the same number
 * (the 16th digit of a unit conversion is noise, not input).
 */
import { create, unitDependencies, type Unit } from 'mathjs';
import { SPEED_OF_LIGHT } from '../physics/constants';
import { HushInputError } from '../physics/errors';

const math = create({ unitDependencies });

type MathUnit = Unit;

/** Significant digits kept from a parsed value (see the module comment). */
export const UNIT_DIGITS = 12;

export function canonical(x: number): number {
  return x === 0 ? 0 : Number(x.toPrecision(UNIT_DIGITS));
}

const BARE_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** What a cell holds: a number, text, or nothing. */
export type FieldValue = string | number | boolean | null | undefined;

/** True when a cell is empty (nothing, or only spaces). */
export function isBlank(v: FieldValue): boolean {
  return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
}

function describe(v: FieldValue): string {
  return typeof v === 'string' ? v.trim() : String(v);
}

/** `x` when finite; a value typed as "1e400" or "1e308 km" overflows to ±Infinity and is refused with what was typed. */
function finite(field: string, x: number, shown: FieldValue): number {
  if (!Number.isFinite(x)) throw new HushInputError(field, `${field} is out of range (got ${JSON.stringify(describe(shown))})`, 'value');
  return x;
}

/** A bare number, or null when the text carries a unit. Throws on booleans. */
function bareNumber(field: string, v: FieldValue): number | null {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) throw new HushInputError(field, `${field} must be a finite number (got ${v})`, 'value');
    return v;
  }
  if (typeof v !== 'string') throw new HushInputError(field, `${field} must be a number or a quantity with a unit (got ${String(v)})`, 'value');
  const t = v.trim();
  return BARE_NUMBER.test(t) ? finite(field, Number(t), v) : null;
}

const parsed = new Map<string, MathUnit | Error>();
const PARSE_CACHE_LIMIT = 2000;

function parseUnit(field: string, text: string, expected: string): MathUnit {
  const t = text.trim().replace(/[µμ]/g, 'u');
  let u = parsed.get(t);
  if (u === undefined) {
    try {
      u = math.unit(t) as MathUnit;
    } catch (e) {
      u = e instanceof Error ? e : new Error(String(e));
    }
    if (parsed.size >= PARSE_CACHE_LIMIT) parsed.delete(parsed.keys().next().value as string);
    parsed.set(t, u);
  }
  if (u instanceof Error) {
    // mathjs quotes the text as typed; a line break in it would split the message.
    const why = u.message.replace(/\r/g, '\\r').replace(/\n/g, '\\n');
    throw new HushInputError(field, `${field} must be ${expected} (got ${JSON.stringify(text.trim())}: ${why})`, 'value');
  }
  return u;
}

const reference = {
  length: math.unit('1 m'),
  frequency: math.unit('1 Hz'),
  time: math.unit('1 s'),
  angle: math.unit('1 rad'),
  bandwidth: math.unit('1 B/s'),
};

function quantity(field: string, v: FieldValue, kind: keyof typeof reference, siUnit: string, defaultUnit: string, expected: string): number {
  const bare = bareNumber(field, v);
  if (bare !== null) return canonical(finite(field, math.unit(bare, defaultUnit).toNumber(siUnit), v));
  const u = parseUnit(field, v as string, expected);
  if (!u.equalBase(reference[kind])) throw new HushInputError(field, `${field} must be ${expected} (got ${describe(v)})`, 'value');
  return canonical(finite(field, u.toNumber(siUnit), v));
}

function positive(field: string, x: number, shown: FieldValue): number {
  if (!(x > 0)) throw new HushInputError(field, `${field} must be greater than 0 (got ${describe(shown)})`);
  return x;
}

/** A length in metres; bare numbers are in `defaultUnit`. */
export function parseLength(field: string, v: FieldValue, defaultUnit = 'nm'): number {
  return positive(field, quantity(field, v, 'length', 'm', defaultUnit, 'a length'), v);
}

/** A time in seconds. */
export function parseTime(field: string, v: FieldValue, defaultUnit = 'fs'): number {
  return positive(field, quantity(field, v, 'time', 's', defaultUnit, 'a time'), v);
}

/** A frequency in Hz. */
export function parseFrequency(field: string, v: FieldValue, defaultUnit = 'THz'): number {
  return positive(field, quantity(field, v, 'frequency', 'Hz', defaultUnit, 'a frequency'), v);
}

/** An angle in degrees (0 allowed); bare numbers are degrees. */
export function parseAngle(field: string, v: FieldValue): number {
  return canonical(quantity(field, v, 'angle', 'deg', 'deg', 'an angle'));
}

/** A network bandwidth in bytes per second; bare numbers are GB/s. */
export function parseBandwidth(field: string, v: FieldValue): number {
  return positive(field, quantity(field, v, 'bandwidth', 'B/s', 'GB/s', 'a data rate such as 10 GB/s'), v);
}

/**
 * A vacuum wavelength in metres from a length or a frequency (λ = c/f).
 * Example: parseWavelength('band_short', '193.414489032 THz') = 1.55e-6.
 */
export function parseWavelength(field: string, v: FieldValue, defaultUnit = 'nm'): number {
  const expected = 'a length or a frequency';
  const bare = bareNumber(field, v);
  if (bare !== null) return positive(field, canonical(finite(field, math.unit(bare, defaultUnit).toNumber('m'), v)), v);
  const u = parseUnit(field, v as string, expected);
  if (u.equalBase(reference.length)) return positive(field, canonical(finite(field, u.toNumber('m'), v)), v);
  if (u.equalBase(reference.frequency)) {
    const f = positive(field, finite(field, u.toNumber('Hz'), v), v);
    return canonical(finite(field, SPEED_OF_LIGHT / f, v));
  }
  throw new HushInputError(field, `${field} must be ${expected} (got ${describe(v)})`, 'value');
}

/** A plain number; "5 %" is 0.05. */
export function parseNumber(field: string, v: FieldValue): number {
  const bare = bareNumber(field, v);
  if (bare !== null) return bare;
  const t = (v as string).trim();
  const m = /^(.*?)\s*%$/.exec(t);
  if (m && BARE_NUMBER.test(m[1])) return canonical(finite(field, Number(m[1]) / 100, v));
  throw new HushInputError(field, `${field} must be a plain number (got ${JSON.stringify(t)})`, 'value');
}

/** Currency words accepted in lower case (ISO 4217 codes are upper case; these are often typed in lower case). */
const LOWER_CASE_CODES = new Set(['usd', 'eur', 'gbp', 'chf', 'jpy', 'cny', 'cad', 'aud', 'nzd', 'sek', 'nok', 'dkk', 'pln', 'czk', 'huf', 'inr', 'sgd', 'hkd', 'krw', 'brl', 'mxn', 'zar']);
/** Currency words that are not three-letter codes (krona/krone, franc, rupee, forint). */
const CURRENCY_WORDS = new Set(['kr', 'Kr', 'Fr', 'fr', 'Rs', 'Ft']);

/** A currency as typed beside a price: a symbol ($, €, US$), an ISO 4217 code (EUR), or a common currency word (kr). */
function currencyWord(w: string): boolean {
  return /^\p{Sc}{1,2}$/u.test(w) || /^[A-Za-z]{1,3}\p{Sc}$/u.test(w) || /^[A-Z]{3}$/.test(w) || LOWER_CASE_CODES.has(w) || CURRENCY_WORDS.has(w);
}

/** A price and the currency typed with it ('' when none). See parsePrice. */
export function priceParts(field: string, v: FieldValue): { value: number; currency: string } {
  const bare = bareNumber(field, v);
  if (bare !== null) return { value: bare, currency: '' };
  const t = (v as string).trim();
  const refuse = (): never => {
    throw new HushInputError(
      field,
      `${field} must be a price per hour such as 3, 3/h, $3/h, 2.40 EUR/h or $2.5k/h (k = ×1000, M = ×1000000) (got ${JSON.stringify(t.length > 80 ? `${t.slice(0, 80)}…` : t)})`,
      'value',
    );
  };
  const body = t.replace(/\s*(?:\/|\bper\b)\s*(?:node[- ]?)?(?:h|hr|hour)\s*$/i, '');
  const m = /^([^\d+\-.\s]{0,4})\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/u.exec(body);
  if (!m) return refuse();
  const prefix = m[1];
  let rest = m[3].trim();
  let scale = 1;
  const mult = /^([kKM])(.*)$/u.exec(rest);
  if (mult) {
    const after = mult[2];
    if (after === '' || /^\s/.test(after) || /^\p{Sc}/u.test(after) || /^[A-Z]{3}$/.test(after)) {
      scale = mult[1] === 'M' ? 1e6 : 1e3;
      rest = after.trim();
    }
  }
  if (prefix && !currencyWord(prefix)) return refuse();
  if (rest && !currencyWord(rest)) return refuse();
  if (prefix && rest) return refuse();
  const currency = prefix || rest;
  return { value: finite(field, Number(m[2]) * scale, v), currency: /^[a-z]{3}$/.test(currency) ? currency.toUpperCase() : currency };
}

/**
 * A price per hour in any currency: "3", "3/h", "$3/h", "2.40 EUR/h",
 * "3 per hour", "$2.5k/h", "2.5 kEUR/h" (k or K = ×10³, M = ×10⁶, after the
 * number). Anything else after the number than a currency is refused, so a
 * multiplier is never ignored ("2.5 mio", "2.5m"). The currency is not kept;
 * the cost column is in the same one.
 */
export function parsePrice(field: string, v: FieldValue): number {
  return priceParts(field, v).value;
}

/** A gap: "5" or "5 cells" (cells), "0.5 wavelengths" / "0.5 λ" (in the medium), or a length. */
export type Gap = { cells: number } | { wavelengths: number } | { metres: number };

export function parseGap(field: string, v: FieldValue): Gap {
  const bare = bareNumber(field, v);
  if (bare !== null) return { cells: bare };
  const t = (v as string).trim();
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(cells?|wavelengths?|λ|lambda)$/i.exec(t);
  if (m) return /^cell/i.test(m[2]) ? { cells: finite(field, Number(m[1]), v) } : { wavelengths: finite(field, Number(m[1]), v) };
  const u = parseUnit(field, t, 'a number of cells, of wavelengths, or a length');
  if (!u.equalBase(reference.length)) throw new HushInputError(field, `${field} must be a number of cells, of wavelengths (λ), or a length (got ${t})`, 'value');
  return { metres: canonical(finite(field, u.toNumber('m'), v)) };
}

/** A word from a fixed list (case-insensitive). */
export function parseChoice<T extends string>(field: string, v: FieldValue, choices: readonly T[]): T {
  const t = describe(v).toLowerCase();
  const hit = choices.find((c) => c === t);
  if (!hit) throw new HushInputError(field, `${field} must be one of ${choices.join(', ')} (got ${JSON.stringify(describe(v))})`, 'value');
  return hit;
}

/** Whole numbers separated by commas or spaces: "2, 3, 4". */
export function parseNumberList(field: string, v: FieldValue): number[] {
  if (typeof v === 'number') return [v];
  const parts = describe(v).split(/[\s,;]+/).filter(Boolean);
  if (!parts.length || parts.some((p) => !BARE_NUMBER.test(p))) {
    throw new HushInputError(field, `${field} must be a list of numbers such as 2, 3, 4 (got ${JSON.stringify(describe(v))})`, 'value');
  }
  return parts.map((p) => finite(field, Number(p), p));
}

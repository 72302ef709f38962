/**
 * Kinds of input value and their readers. Every input field of the registry
 * (inputs.ts) has one kind; the kind's reader turns what was typed — a number
 * or text, from a table cell, a worksheet argument or a command-line option —
 * into a checked, typed value, and says what it must be when it cannot.
 */
import { HushInputError } from '../../physics/errors';
import { parseGap, parsePrice, type Gap } from '../units';

/** A propagation path: a number of wavelengths (a bare number) or a length. */
export type PathLength = { wavelengths: number } | { metres: number };
import { bareNumber, decibels, DECIMAL, EXAMPLES, percentage, readQuantity, typed, type Dimension } from './quantity';

export type Kind =
  | 'text'
  | 'count'
  | 'number'
  | 'fraction'
  | 'reflection'
  | Dimension
  | 'choice'
  | 'numbers'
  | 'counts'
  | 'faces'
  | 'axes'
  | 'price'
  | 'gap'
  | 'path';

/** Typed value of each kind. */
export interface KindValue {
  text: string;
  count: number;
  number: number;
  fraction: number;
  reflection: number;
  length: number;
  time: number;
  frequency: number;
  wavelength: number;
  angle: number;
  bandwidth: number;
  conductivity: number;
  choice: string;
  numbers: number[];
  counts: number[];
  faces: string[];
  axes: string[];
  price: number;
  gap: Gap;
  path: PathLength;
}

export const DIMENSIONS: readonly Kind[] = ['length', 'time', 'frequency', 'wavelength', 'angle', 'bandwidth', 'conductivity'];

export function isDimension(kind: Kind): kind is Dimension {
  return DIMENSIONS.includes(kind);
}

/** An interval of allowed values; bounds are in the value's SI unit (degrees for angles). */
export interface Range {
  min?: number;
  max?: number;
  /** min itself is not allowed. */
  minOpen?: boolean;
  /** max itself is not allowed. */
  maxOpen?: boolean;
}

/** What a reader needs to know of its field. */
export interface FieldShape {
  name: string;
  kind: Kind;
  /** Unit of a bare number ('' when none). */
  unit: string;
  range?: Range;
  choices?: readonly string[];
  /** Why the range is what it is, added to a range error (e.g. why no design goes beyond 85°). */
  rangeHint?: string;
  /** How the value is shown in range messages when it has a unit: SI factor and unit name (e.g. 1e-9, "nm"). */
  show?: { factor: number; unit: string };
}

/** A number as messages show it: 12 significant digits, an exponent when very small or large ("1e-6", "1e+9"). */
export function plain(x: number): string {
  const y = Number(x.toPrecision(12));
  const a = Math.abs(y);
  return a !== 0 && (a < 1e-4 || a >= 1e7) ? y.toExponential() : String(y);
}

function shown(f: FieldShape, x: number): string {
  if (f.show) return `${plain(x / f.show.factor)} ${f.show.unit}`;
  if (f.kind === 'angle') return `${plain(x)}°`;
  return plain(x);
}

/** Checks `x` against the field's range; the message states the range in the field's own unit. */
export function checkRange(f: FieldShape, x: number, raw: unknown): number {
  const r = f.range;
  if (!r) return x;
  const loOk = r.min === undefined || (r.minOpen ? x > r.min : x >= r.min);
  const hiOk = r.max === undefined || (r.maxOpen ? x < r.max : x <= r.max);
  if (loOk && hiOk) return x;
  const hint = f.rangeHint ? `: ${f.rangeHint}` : '';
  if (r.min !== undefined && r.max !== undefined && !r.minOpen && !r.maxOpen) {
    const what = f.kind === 'count' || f.kind === 'counts' ? 'a whole number' : 'a number';
    throw new HushInputError(f.name, `${f.name} must be ${what} from ${shown(f, r.min)} to ${shown(f, r.max)} (got ${typed(raw)})${hint}`);
  }
  const parts: string[] = [];
  if (r.min !== undefined) parts.push(`${r.minOpen ? 'greater than' : 'at least'} ${shown(f, r.min)}`);
  if (r.max !== undefined) parts.push(`${r.maxOpen ? 'less than' : 'at most'} ${shown(f, r.max)}`);
  const whole = f.kind === 'count' || f.kind === 'counts' ? 'a whole number ' : '';
  throw new HushInputError(f.name, `${f.name} must be ${whole}${parts.join(' and ')} (got ${typed(raw)})${hint}`);
}

function plainNumber(f: FieldShape, raw: string | number, what: string): number {
  const x = bareNumber(raw);
  if (x === null) throw new HushInputError(f.name, `${f.name} must be ${what} (got ${typed(raw)})`, 'value');
  if (!Number.isFinite(x)) throw new HushInputError(f.name, `${f.name} is out of range (got ${typed(raw)})`, 'value');
  return x;
}

function whole(f: FieldShape, x: number, raw: unknown): number {
  if (!Number.isInteger(x)) {
    const r = f.range;
    const span = r && r.min !== undefined && r.max !== undefined ? ` from ${r.min} to ${r.max}` : '';
    throw new HushInputError(f.name, `${f.name} must be a whole number${span} (got ${typed(raw)})`);
  }
  return checkRange(f, x, raw);
}

function words(raw: string | number): string[] {
  return String(raw)
    .split(/[\s,;]+/)
    .map((w) => w.trim())
    .filter(Boolean);
}

/** "≥ 2 and ≤ 4" style description of a fraction's forms for messages. */
const FRACTION_FORMS = 'a number or a percentage such as 0.01 or 1%';
const REFLECTION_FORMS = 'an amplitude reflection |r| such as 0.001, 0.1% or -60 dB';

type Reader<K extends Kind> = (f: FieldShape, raw: string | number, unit: string) => KindValue[K];

/** Readers by kind. `unit` is the unit of a bare number (the field's, or the table header's). */
export const READERS: { [K in Kind]: Reader<K> } = {
  text: (_f, raw) => String(raw).trim(),
  count: (f, raw) => whole(f, plainNumber(f, raw, 'a whole number'), raw),
  number: (f, raw) => checkRange(f, plainNumber(f, raw, 'a number'), raw),
  fraction: (f, raw, unit) => {
    if (typeof raw === 'string') {
      const p = percentage(raw);
      if (p !== null) return checkRange(f, p, raw);
    }
    const x = plainNumber(f, raw, FRACTION_FORMS);
    return checkRange(f, unit === '%' ? x / 100 : x, raw);
  },
  reflection: (f, raw, unit) => {
    if (typeof raw === 'string') {
      const p = percentage(raw) ?? decibels(f.name, raw);
      if (p !== null) return checkRange(f, p, raw);
    }
    const x = plainNumber(f, raw, REFLECTION_FORMS);
    if (unit === 'dB') return checkRange(f, decibels(f.name, `${x} dB`) as number, raw);
    return checkRange(f, unit === '%' ? x / 100 : x, raw);
  },
  length: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'length', raw, unit), raw),
  time: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'time', raw, unit), raw),
  frequency: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'frequency', raw, unit), raw),
  wavelength: (f, raw, unit) => {
    const x = readQuantity(f.name, 'wavelength', raw, unit);
    if (!(x > 0)) throw new HushInputError(f.name, `${f.name} must be ${EXAMPLES.wavelength} greater than 0 (got ${typed(raw)})`);
    return checkRange(f, x, raw);
  },
  angle: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'angle', raw, unit), raw),
  bandwidth: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'bandwidth', raw, unit), raw),
  conductivity: (f, raw, unit) => checkRange(f, readQuantity(f.name, 'conductivity', raw, unit), raw),
  choice: (f, raw) => {
    const w = String(raw).trim().toLowerCase();
    const hit = (f.choices ?? []).find((c) => c.toLowerCase() === w);
    if (hit === undefined) throw new HushInputError(f.name, `${f.name} must be one of ${(f.choices ?? []).join(', ')} (got ${typed(raw)})`, 'value');
    return hit;
  },
  numbers: (f, raw) => {
    const parts = typeof raw === 'number' ? [String(raw)] : words(raw);
    if (!parts.length || parts.some((p) => !DECIMAL.test(p))) {
      throw new HushInputError(f.name, `${f.name} must be a list of numbers such as 2, 3, 4 (got ${typed(raw)})`, 'value');
    }
    return parts.map((p) => checkRange(f, Number(p), p));
  },
  counts: (f, raw) => {
    const parts = typeof raw === 'number' ? [String(raw)] : String(raw).split(/[\s,;x×]+/).filter(Boolean);
    if (!parts.length || parts.some((p) => !/^\d+$/.test(p))) {
      throw new HushInputError(f.name, `${f.name} must be whole numbers separated by commas such as 200,200,100 (got ${typed(raw)})`, 'value');
    }
    return parts.map((p) => whole(f, Number(p), p));
  },
  faces: (_f, raw) => words(raw).map((w) => w.toLowerCase()),
  axes: (_f, raw) => words(raw).map((w) => w.toLowerCase()),
  price: (f, raw) => checkRange(f, parsePrice(f.name, raw), raw),
  gap: (f, raw) => parseGap(f.name, raw),
  path: (f, raw) => {
    const g = parseGap(f.name, typeof raw === 'number' || DECIMAL.test(String(raw).trim()) ? `${String(raw).trim()} wavelengths` : raw);
    if ('cells' in g) throw new HushInputError(f.name, `${f.name} must be a number of wavelengths or a length such as 12 um (got ${typed(raw)})`, 'value');
    const x = 'wavelengths' in g ? g.wavelengths : g.metres;
    if (!(x >= 0) || !Number.isFinite(x)) throw new HushInputError(f.name, `${f.name} must be at least 0 (got ${typed(raw)})`);
    return g;
  },
};

/**
 * Quantities as people type them, the same in every front end: a number and
 * a unit ("20 nm", "0.02 µm", "193 THz", "3 ps", "30°", "1.5 GHz"), a bare
 * number in the field's own unit, percentages ("1%") and reflections in
 * decibels ("-60 dB" = 20·log₁₀|r|, common practice in the absorber
 * literature). Unit names are matched in any letter case ("20 NM", "1.5 ghz")
 * where that is unambiguous for the quantity asked for; the conversion itself
 * is the unit engine's (src/plan/units.ts, mathjs). Errors name the field,
 * what it must be and what was typed, never the parser's internals.
 */
import { HushInputError } from '../../physics/errors';
import { SPEED_OF_LIGHT } from '../../physics/constants';
import { canonical, parseAngle, parseBandwidth, parseFrequency, parseLength, parseTime } from '../units';

/** Physical dimensions a field can have. */
export type Dimension = 'length' | 'time' | 'frequency' | 'wavelength' | 'angle' | 'bandwidth' | 'conductivity';

/** Decimal notation only (Number("") is 0 and Number("0x10") is 16). */
export const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const NUMBER_AND_UNIT = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;

/** Most characters of what the user typed quoted back in a message. */
export const QUOTE_LIMIT = 80;

/** What was typed, quoted for a message: at most QUOTE_LIMIT characters, line breaks and control characters escaped. */
export function typed(v: unknown): string {
  if (typeof v === 'number') return String(v);
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (v === null || v === undefined) return 'nothing';
  if (typeof v !== 'string') return Array.isArray(v) ? 'a range' : 'an object';
  const t = v.trim();
  // A number typed as text is shown as the number, as a typed number is (the same message from every front end).
  if (DECIMAL.test(t)) return t;
  const cut = t.length > QUOTE_LIMIT ? `${t.slice(0, QUOTE_LIMIT)}…` : t;
  return JSON.stringify(cut);
}

/**
 * Units accepted by name for each dimension: the unit engine's name of each,
 * then the other spellings people use. Matching tries the exact spelling
 * first, then the spelling in lower case ("NM", "Ghz"), which is unambiguous
 * within one dimension (a length in "MM" is millimetres: no grid is measured
 * in megametres).
 */
const UNITS: Record<Exclude<Dimension, 'wavelength'>, Record<string, { factor: number; aliases: readonly string[] }>> = {
  length: {
    pm: { factor: 1e-12, aliases: ['picometre', 'picometres', 'picometer', 'picometers'] },
    nm: { factor: 1e-9, aliases: ['nanometre', 'nanometres', 'nanometer', 'nanometers'] },
    um: { factor: 1e-6, aliases: ['µm', 'μm', 'micron', 'microns', 'micrometre', 'micrometres', 'micrometer', 'micrometers'] },
    mm: { factor: 1e-3, aliases: ['millimetre', 'millimetres', 'millimeter', 'millimeters'] },
    cm: { factor: 1e-2, aliases: ['centimetre', 'centimetres', 'centimeter', 'centimeters'] },
    m: { factor: 1, aliases: ['metre', 'metres', 'meter', 'meters'] },
    km: { factor: 1e3, aliases: ['kilometre', 'kilometres', 'kilometer', 'kilometers'] },
    angstrom: { factor: 1e-10, aliases: ['Å', 'Å', 'angstroms', 'ångström'] },
  },
  time: {
    as: { factor: 1e-18, aliases: ['attosecond', 'attoseconds'] },
    fs: { factor: 1e-15, aliases: ['femtosecond', 'femtoseconds'] },
    ps: { factor: 1e-12, aliases: ['picosecond', 'picoseconds'] },
    ns: { factor: 1e-9, aliases: ['nanosecond', 'nanoseconds'] },
    us: { factor: 1e-6, aliases: ['µs', 'μs', 'microsecond', 'microseconds'] },
    ms: { factor: 1e-3, aliases: ['millisecond', 'milliseconds'] },
    s: { factor: 1, aliases: ['sec', 'second', 'seconds'] },
    min: { factor: 60, aliases: ['minute', 'minutes'] },
    h: { factor: 3600, aliases: ['hr', 'hour', 'hours'] },
  },
  frequency: {
    Hz: { factor: 1, aliases: ['hertz'] },
    kHz: { factor: 1e3, aliases: [] },
    MHz: { factor: 1e6, aliases: [] },
    GHz: { factor: 1e9, aliases: [] },
    THz: { factor: 1e12, aliases: [] },
    PHz: { factor: 1e15, aliases: [] },
  },
  // Angles are kept in degrees.
  angle: {
    deg: { factor: 1, aliases: ['°', 'degree', 'degrees'] },
    rad: { factor: 180 / Math.PI, aliases: ['radian', 'radians'] },
    mrad: { factor: 0.18 / Math.PI, aliases: ['milliradian', 'milliradians'] },
  },
  bandwidth: {
    'B/s': { factor: 1, aliases: [] },
    'kB/s': { factor: 1e3, aliases: [] },
    'MB/s': { factor: 1e6, aliases: [] },
    'GB/s': { factor: 1e9, aliases: ['GBps'] },
    'TB/s': { factor: 1e12, aliases: [] },
    'b/s': { factor: 1 / 8, aliases: ['bit/s'] },
    'kb/s': { factor: 1e3 / 8, aliases: ['kbit/s'] },
    'Mb/s': { factor: 1e6 / 8, aliases: ['Mbit/s'] },
    'Gb/s': { factor: 1e9 / 8, aliases: ['Gbit/s', 'Gbps'] },
  },
  conductivity: {
    'S/m': { factor: 1, aliases: ['siemens/m'] },
    'mS/m': { factor: 1e-3, aliases: [] },
    'kS/m': { factor: 1e3, aliases: [] },
  },
};

type Lookup = { exact: Map<string, string>; folded: Map<string, string> };
const lookups = new Map<string, Lookup>();

function lookup(dim: Exclude<Dimension, 'wavelength'>): Lookup {
  let l = lookups.get(dim);
  if (!l) {
    const exact = new Map<string, string>();
    const folded = new Map<string, string>();
    for (const [name, { aliases }] of Object.entries(UNITS[dim])) {
      for (const a of [name, ...aliases]) {
        exact.set(a, name);
        // The first spelling to claim a lower-case form keeps it (bytes before bits for data rates).
        if (!folded.has(a.toLowerCase())) folded.set(a.toLowerCase(), name);
      }
    }
    l = { exact, folded };
    lookups.set(dim, l);
  }
  return l;
}

/** The unit engine's name for `unit` in dimension `dim`, or the text itself when it is not a known spelling. */
export function unitName(dim: Exclude<Dimension, 'wavelength'>, unit: string): string {
  const l = lookup(dim);
  return l.exact.get(unit) ?? l.folded.get(unit.toLowerCase()) ?? unit;
}

/** True when `unit` is a spelling of a unit of dimension `dim` (for header units such as "cell [um]"). */
export function isUnitOf(dim: Dimension, unit: string): boolean {
  const dims: Exclude<Dimension, 'wavelength'>[] = dim === 'wavelength' ? ['length', 'frequency'] : [dim];
  return dims.some((d) => {
    try {
      factor(d, unit);
      return true;
    } catch {
      return false;
    }
  });
}

/** Examples of each dimension for messages and help. */
export const EXAMPLES: Record<Dimension, string> = {
  length: 'a length such as 20 nm or 0.02 um',
  time: 'a time such as 500 fs or 3 ps',
  frequency: 'a frequency such as 193 THz or 1.5 GHz',
  wavelength: 'a wavelength or a frequency such as 1550 nm or 193 THz',
  angle: 'an angle such as 30 deg, 30° or 0.5 rad',
  bandwidth: 'a data rate such as 10 GB/s',
  conductivity: 'a conductivity such as 0.05 S/m',
};

/** SI value of `x` in the unit engine's unit `unit` of dimension `dim` (rounded to 12 digits by the engine); throws (any error) when the unit does not fit. */
function convert(dim: Exclude<Dimension, 'wavelength'>, x: number, unit: string): number {
  const text = `${x} ${unit}`;
  switch (dim) {
    case 'length':
      return parseLength('x', text, 'm');
    case 'time':
      return parseTime('x', text, 's');
    case 'frequency':
      return parseFrequency('x', text, 'Hz');
    case 'angle':
      return parseAngle('x', text);
    case 'bandwidth':
      return parseBandwidth('x', text);
    case 'conductivity':
      throw new Error('not a conductivity');
  }
}

const factors = new Map<string, number>();

/** SI value of one `unit` of dimension `dim` (cached); throws when the unit does not fit the dimension. */
function factor(dim: Exclude<Dimension, 'wavelength'>, unit: string): number {
  const key = `${dim}\u0000${unit}`;
  const known = UNITS[dim][unitName(dim, unit)];
  if (known) return known.factor;
  let f = factors.get(key);
  if (f === undefined) {
    // Other spellings go to the unit engine (mathjs): one conversion of 1 unit, then x·factor like the table.
    f = convert(dim, 1, unit);
    if (factors.size < 1000) factors.set(key, f);
  }
  return f;
}

/** x in `unit` → SI (sign kept; the caller checks ranges); a frequency asked as a wavelength becomes λ = c/f. */
function si(field: string, dim: Dimension, x: number, unit: string, shown: unknown): number {
  let out: number;
  try {
    if (dim === 'wavelength') {
      let f: number | null = null;
      try {
        out = canonical(x * factor('length', unit));
      } catch {
        f = x * factor('frequency', unit);
        out = f > 0 ? canonical(SPEED_OF_LIGHT / f) : -1;
      }
    } else out = canonical(x * factor(dim, unit));
  } catch {
    throw new HushInputError(field, `${field} must be ${EXAMPLES[dim]} (got ${typed(shown)})`, 'value');
  }
  if (!Number.isFinite(out)) throw new HushInputError(field, `${field} is out of range (got ${typed(shown)})`, 'value');
  return out;
}

/** A number and a unit split from text, or null when the text is not of that form. */
export function splitQuantity(text: string): { x: number; unit: string } | null {
  const m = NUMBER_AND_UNIT.exec(text.trim());
  if (!m) return null;
  return { x: Number(m[1]), unit: m[2].trim() };
}

/**
 * A quantity in SI units (m, s, Hz, degrees for angles, B/s, S/m; a vacuum
 * wavelength in m for `wavelength`). A bare number is in `bareUnit`.
 * The sign is kept: ranges are the caller's.
 */
export function readQuantity(field: string, dim: Dimension, raw: string | number, bareUnit: string): number {
  if (typeof raw === 'number') return si(field, dim, raw, bareUnit, raw);
  const text = raw.trim();
  if (DECIMAL.test(text)) {
    if (!Number.isFinite(Number(text))) throw new HushInputError(field, `${field} is out of range (got ${typed(raw)})`, 'value');
    return si(field, dim, Number(text), bareUnit, raw);
  }
  const q = splitQuantity(text.replace(/(\d)\s*°/, '$1 deg'));
  if (q && !Number.isFinite(q.x)) throw new HushInputError(field, `${field} is out of range (got ${typed(raw)})`, 'value');
  if (!q || q.unit === '') throw new HushInputError(field, `${field} must be ${EXAMPLES[dim]} (got ${typed(raw)})`, 'value');
  return si(field, dim, q.x, q.unit, raw);
}

/** A plain number from a number or decimal text, or null when the text is something else. */
export function bareNumber(raw: string | number): number | null {
  if (typeof raw === 'number') return raw;
  const t = raw.trim();
  return DECIMAL.test(t) ? Number(t) : null;
}

/** "1%" / "1 %" → 0.01; null when the text is not a percentage. */
export function percentage(text: string): number | null {
  const m = /^(.*?)\s*%$/.exec(text.trim());
  return m && DECIMAL.test(m[1].trim()) ? Number(m[1].trim()) / 100 : null;
}

/** "-60 dB" → 10^(−60/20) = 0.001; null when the text is not in dB. Throws for a positive dB figure (a reflection is at most 0 dB). */
export function decibels(field: string, text: string): number | null {
  const m = /^(.*?)\s*db$/i.exec(text.trim());
  if (!m || !DECIMAL.test(m[1].trim())) return null;
  const db = Number(m[1].trim());
  if (db > 0) {
    throw new HushInputError(field, `${field} in dB is at most 0 dB (−60 dB is |r| = 0.001); got ${typed(text)} — did you mean −${db} dB?`);
  }
  return 10 ** (db / 20);
}

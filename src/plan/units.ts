/**
 * Quantities with units, as typed in a project table or on the command line:
 * "1550 nm", "193 THz", "0.8 um", "30 GHz", "2.5 h", "500 fs", "10 GB/s".
 * A bare number takes the field's default unit (fields.ts lists them). Units
 * are parsed by a limited mathjs instance (units only, created once); each
 * distinct text is parsed once and cached. Values come back in SI, rounded to
 * 12 significant digits so that "1550 nm" and "1.55 um" give the same number
 * (the 16th digit of a unit conversion is noise, not input).
 */
import type { FactoryFunctionMap, MathJsInstance, Unit } from 'mathjs';
import { SPEED_OF_LIGHT } from '../physics/constants';
import { HushInputError } from '../physics/errors';

type MathUnit = Unit;

/** Defined only inside a webpack bundle (webpack replaces `typeof __webpack_require__` by "function"). */
declare const __webpack_require__: unknown;

/** What this module takes from mathjs: `create`, `factory` and the factory functions named in unitEngine. */
type MathjsModule = Record<string, unknown>;

/** Loads mathjs's entry in the add-in bundle, and in Node only the modules the unit engine is built from (see unitEngine). */
function mathjsModules(): MathjsModule {
  if (typeof __webpack_require__ === 'function') {
    // Destructured where it is required, so webpack sees which exports are used and drops the rest.
    const {
      create, factory, createUnitClass, createUnitFunction, createTyped, createComplexClass, createFractionClass, createFraction, createNumber,
      createNumeric, createIsNumeric, createFormat, createAbs, createAddScalar, createSubtractScalar, createMultiplyScalar, createDivideScalar, createPow,
    } = require('mathjs');
    return {
      create, factory, createUnitClass, createUnitFunction, createTyped, createComplexClass, createFractionClass, createFraction, createNumber,
      createNumeric, createIsNumeric, createFormat, createAbs, createAddScalar, createSubtractScalar, createMultiplyScalar, createDivideScalar, createPow,
    };
  }
  const path = require('path') as typeof import('path');
  const lib = path.dirname(require.resolve('mathjs'));
  const files = [
    'type/unit/Unit.js', 'type/unit/function/unit.js', 'core/function/typed.js',
    'type/complex/Complex.js', 'type/fraction/Fraction.js', 'type/fraction/function/fraction.js', 'type/number.js',
    'function/utils/numeric.js', 'function/utils/isNumeric.js', 'function/string/format.js', 'function/arithmetic/abs.js',
    'function/arithmetic/addScalar.js', 'function/arithmetic/subtractScalar.js', 'function/arithmetic/multiplyScalar.js',
    'function/arithmetic/divideScalar.js', 'function/arithmetic/pow.js',
  ];
  const load = (file: string): MathjsModule => require(path.join(lib, file));
  // Each factory module exports its create* function; utils/factory.js also has a `create` of its own, so the two helpers are taken by name.
  return { ...Object.assign({}, ...files.map(load)), create: load('core/create.js').create, factory: load('utils/factory.js').factory };
}

/**
 * The unit engine: a mathjs instance made by `create` from mathjs's own
 * factory functions ("Custom bundling", mathjs documentation), created on
 * the first quantity parsed: the Unit class and the unit function,
 * typed-function, the Complex and Fraction types (unit definitions use both:
 * VAR is Complex.I, degF is Fraction(5, 9)), and the scalar functions Unit
 * calls (add, subtract, multiply, divide, pow, abs, number, fraction, format,
 * isNumeric). mathjs's `unitDependencies` would also bring matrices,
 * determinants and BigNumber (decimal.js), for pow's matrix powers and the
 * matrix forms of round, fix and equal; Unit reaches those only from
 * splitUnit, equals and config.number = 'BigNumber', which this module never
 * calls or sets, so here they are placeholders that throw if reached.
 *
 * In the add-in bundle webpack keeps only these factories of mathjs's ES
 * module entry (webpack.config.js points `mathjs` at it; each member read
 * below is what it keeps). In Node, mathjs's package "exports" offer only the
 * full entry, which builds every mathjs function when loaded (0.8 s of CPU),
 * so the same factory modules are read from its CommonJS folder by path.
 */
function unitEngine(): MathJsInstance {
  const m = mathjsModules();
  type Factory = FactoryFunctionMap[string];
  const factory = m.factory as (name: string, dependencies: string[], make: () => unknown) => Factory;
  const absent = (name: string) =>
    factory(name, [], () => () => {
      throw new Error(`mathjs ${name} is not part of the unit-only instance of src/plan/units.ts`);
    });
  const factories: FactoryFunctionMap = {
    createUnitClass: m.createUnitClass as Factory,
    createUnitFunction: m.createUnitFunction as Factory,
    createTyped: m.createTyped as Factory,
    createComplexClass: m.createComplexClass as Factory,
    createFractionClass: m.createFractionClass as Factory,
    createFraction: m.createFraction as Factory,
    createNumber: m.createNumber as Factory,
    createNumeric: m.createNumeric as Factory,
    createIsNumeric: m.createIsNumeric as Factory,
    createFormat: m.createFormat as Factory,
    createAbs: m.createAbs as Factory,
    createAddScalar: m.createAddScalar as Factory,
    createSubtractScalar: m.createSubtractScalar as Factory,
    createMultiplyScalar: m.createMultiplyScalar as Factory,
    createDivideScalar: m.createDivideScalar as Factory,
    createPow: m.createPow as Factory,
  };
  for (const name of ['BigNumber', 'round', 'fix', 'equal', 'matrix', 'identity', 'multiply', 'inv']) factories[`absent ${name}`] = absent(name);
  return (m.create as (factories: FactoryFunctionMap) => MathJsInstance)(factories);
}

let engine: MathJsInstance | undefined;

/** The unit engine's `unit` function (the engine is made on first use). */
const math = {
  unit(...args: [string] | [number, string]): MathUnit {
    engine ??= unitEngine();
    return (engine.unit as (...a: unknown[]) => MathUnit)(...args);
  },
};

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

type Kind = 'length' | 'frequency' | 'time' | 'angle' | 'bandwidth';
let references: Record<Kind, MathUnit> | undefined;

/** One unit of each kind of quantity, to compare dimensions with (made on first use, like the engine). */
function reference(): Record<Kind, MathUnit> {
  references ??= {
    length: math.unit('1 m'),
    frequency: math.unit('1 Hz'),
    time: math.unit('1 s'),
    angle: math.unit('1 rad'),
    bandwidth: math.unit('1 B/s'),
  };
  return references;
}

function quantity(field: string, v: FieldValue, kind: Kind, siUnit: string, defaultUnit: string, expected: string): number {
  const bare = bareNumber(field, v);
  if (bare !== null) return canonical(finite(field, math.unit(bare, defaultUnit).toNumber(siUnit), v));
  const u = parseUnit(field, v as string, expected);
  if (!u.equalBase(reference()[kind])) throw new HushInputError(field, `${field} must be ${expected} (got ${describe(v)})`, 'value');
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
  if (u.equalBase(reference().length)) return positive(field, canonical(finite(field, u.toNumber('m'), v)), v);
  if (u.equalBase(reference().frequency)) {
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

/**
 * A price per hour in any currency: "3", "3/h", "$3/h", "2.40 EUR/h",
 * "3 per hour". The currency is not kept; the cost column is in the same one.
 */
export function parsePrice(field: string, v: FieldValue): number {
  const bare = bareNumber(field, v);
  if (bare !== null) return bare;
  const t = (v as string).trim();
  const m = /^([^\d+\-.\s]{0,4})\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z]{0,4}|[^\d\s/]{0,2})?\s*(?:(?:\/|per)\s*(h|hr|hour|node-hour|node-h|node hour))?$/i.exec(t);
  if (!m) throw new HushInputError(field, `${field} must be a price per hour such as 3, 3/h or $3/h (got ${JSON.stringify(t)})`, 'value');
  return finite(field, Number(m[2]), v);
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
  if (!u.equalBase(reference().length)) throw new HushInputError(field, `${field} must be a number of cells, of wavelengths (λ), or a length (got ${t})`, 'value');
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

/**
 * Quantities with units, as typed in a project table or on the command line:
 * "1550 nm", "193 THz", "0.8 um", "30 GHz", "2.5 h", "500 fs", "10 GB/s".
 * A bare number takes the field's default unit (fields.ts lists them). Units
 * are parsed by mathjs's Unit class alone (made on first use); each
 * distinct text is parsed once and cached. Values come back in SI, rounded to
 * 12 significant digits so that "1550 nm" and "1.55 um" give the same number
 * (the 16th digit of a unit conversion is noise, not input).
 */
import type { Unit } from 'mathjs';
import { SPEED_OF_LIGHT } from '../physics/constants';
import { setBounded } from '../physics/bounded-map';
import { HushInputError } from '../physics/errors';

type MathUnit = Unit;

/** Defined only inside a webpack bundle (webpack replaces `typeof __webpack_require__` by "function"). */
declare const __webpack_require__: unknown;

/** A mathjs factory function: called with its dependencies by name, returns what it makes. */
type Factory = (dependencies: Record<string, unknown>) => unknown;

/** What the unit engine takes from mathjs (see unitEngine). */
interface MathjsParts {
  createUnitClass: Factory;
  format: (value: unknown, options?: object) => string;
}

/**
 * The four mathjs modules the unit engine is made of. mathjs's package
 * "exports" offer only its whole entry, which in Node builds every mathjs
 * function when loaded (0.8 s of CPU), so the modules are read by path: in
 * Node from its CommonJS folder, in the add-in bundle from its ES module
 * folder (webpack.config.js resolves `mathjs/lib/esm`; destructured where
 * required, so webpack keeps only what is read).
 */
/* eslint-disable @typescript-eslint/no-require-imports -- the parts are required by path (above): no import form reaches them */
function mathjsParts(): MathjsParts {
  if (typeof __webpack_require__ === 'function') {
    const { createUnitClass } = require('mathjs/lib/esm/type/unit/Unit.js');
    const { format } = require('mathjs/lib/esm/utils/string.js');
    return { createUnitClass, format };
  }
  const path = require('path') as typeof import('path');
  const lib = path.dirname(require.resolve('mathjs'));
  const from = (file: string) => require(path.join(lib, file));
  return {
    createUnitClass: from('type/unit/Unit.js').createUnitClass,
    format: from('utils/string.js').format,
  };
}
/* eslint-enable @typescript-eslint/no-require-imports */

/** A mathjs Complex number or Fraction, as far as the engine's arithmetic uses them. */
interface Arithmetic<T> {
  add(b: T): T;
  sub(b: T): T;
  mul(b: T): T;
  div(b: T): T;
  abs(): T | number;
  valueOf(): number;
}
interface ComplexNumber extends Arithmetic<ComplexNumber> {
  pow(b: ComplexNumber | number, im?: number): ComplexNumber;
}
interface FractionNumber extends Arithmetic<FractionNumber> {
  pow(b: FractionNumber): FractionNumber | null;
}
type Scalar = number | ComplexNumber | FractionNumber;

/** mathjs's type tests (mathjs src/utils/is.js): by the prototype's flag. */
const hasFlag = (x: unknown, flag: 'isComplex' | 'isFraction' | 'isBigNumber'): boolean =>
  typeof x === 'object' && x !== null && (Object.getPrototypeOf(x) as Record<string, unknown>)[flag] === true;

function notInEngine(what: string): never {
  throw new TypeError(`${what} is not part of the unit engine of src/plan/units.ts`);
}

/**
 * The two value types mathjs's unit table holds besides numbers, reduced to
 * what the fields here can reach: VAR's value Complex.I (reactive power, a
 * dimension no field has: any arithmetic on it is refused) and the 5/9 of
 * degF and degR (temperature, no field has it either: held as a double, so
 * such a text is parsed and then refused for its dimension like any other
 * unit of the wrong kind). mathjs's own Complex and Fraction classes (the
 * complex.js and fraction.js libraries, a third of the unit engine's size in
 * the add-in bundle) are not loaded. The flags are mathjs's type tests
 * (src/utils/is.js).
 */
class VarComplex implements ComplexNumber {
  static readonly I = new VarComplex(0, 1);
  constructor(
    readonly re: number,
    readonly im: number,
  ) {}
  private refuse(): never {
    return notInEngine('arithmetic on a complex-valued unit (VAR)');
  }
  add(): ComplexNumber {
    return this.refuse();
  }
  sub(): ComplexNumber {
    return this.refuse();
  }
  mul(): ComplexNumber {
    return this.refuse();
  }
  div(): ComplexNumber {
    return this.refuse();
  }
  abs(): number {
    return this.refuse();
  }
  pow(): ComplexNumber {
    return this.refuse();
  }
  valueOf(): number {
    return this.refuse();
  }
}
Object.defineProperty(VarComplex.prototype, 'isComplex', { value: true });

class RealFraction implements FractionNumber {
  readonly x: number;
  constructor(a: number | RealFraction, b = 1) {
    this.x = a.valueOf() / b;
  }
  add(b: RealFraction): RealFraction {
    return new RealFraction(this.x + b.x);
  }
  sub(b: RealFraction): RealFraction {
    return new RealFraction(this.x - b.x);
  }
  mul(b: RealFraction): RealFraction {
    return new RealFraction(this.x * b.x);
  }
  div(b: RealFraction): RealFraction {
    return new RealFraction(this.x / b.x);
  }
  abs(): RealFraction {
    return new RealFraction(Math.abs(this.x));
  }
  pow(b: RealFraction): RealFraction {
    return new RealFraction(Math.pow(this.x, b.x));
  }
  valueOf(): number {
    return this.x;
  }
  toString(): string {
    return String(this.x);
  }
}
Object.defineProperty(RealFraction.prototype, 'isFraction', { value: true });

/**
 * The unit engine: mathjs's Unit class (its parser, its unit and prefix
 * tables, its conversions and formatting), made on the first quantity parsed
 * by mathjs's own factory functions (createUnitClass, createComplexClass,
 * createFractionClass), with the scalar arithmetic it depends on written out
 * for the three value types a unit can hold here instead of mathjs's typed
 * functions, so that only the unit parsing parts load: in Node 4 modules of
 * mathjs (and what they import: 20 files) instead of its whole entry, which
 * builds every function when loaded (0.8 s of CPU); in the add-in bundle 22 KB
 * of gzipped JavaScript instead of `create({ unitDependencies })`'s 66 KB.
 *
 * Values are numbers (config.number = 'number', mathjs's default), the VAR
 * unit's value is Complex.I and degF's and degR's are Fraction(5, 9). The
 * arithmetic is mathjs's for those types: src/plain/number/arithmetic.js for
 * two numbers and pow's _pow (src/function/arithmetic/pow.js, with the default
 * config.predictable = false); otherwise its 'Fraction, Fraction' signatures
 * when no operand is Complex, else its 'Complex, Complex' ones, after the
 * conversions of its typed functions (src/core/function/typed.js: number ->
 * Fraction only when exact, number or Fraction -> Complex(x, 0)). What Unit
 * uses only to split a unit, to compare two units' values or with
 * config.number = 'BigNumber' (fix, round, equal, BigNumber) is left out and
 * throws if reached: none of the parsers here reaches it.
 */
function unitEngine(): { unit(...args: [string] | [number, string]): MathUnit } {
  const { createUnitClass, format } = mathjsParts();
  const Complex = VarComplex;
  const Fraction = RealFraction;
  const complex = (x: unknown): ComplexNumber =>
    hasFlag(x, 'isComplex')
      ? (x as ComplexNumber)
      : typeof x === 'number' || hasFlag(x, 'isFraction')
        ? new Complex((x as number | FractionNumber).valueOf(), 0)
        : notInEngine(`arithmetic on ${typeof x}`);
  const fraction = (x: number | FractionNumber): RealFraction => (typeof x === 'number' ? new Fraction(x) : (x as RealFraction));
  const real = (x: unknown): x is number | FractionNumber => typeof x === 'number' || hasFlag(x, 'isFraction');
  const scalar =
    (
      onNumbers: (a: number, b: number) => Scalar,
      onFractions: (a: FractionNumber, b: FractionNumber) => Scalar,
      onComplex: (a: ComplexNumber, b: ComplexNumber) => ComplexNumber,
    ) =>
    (a: unknown, b: unknown): Scalar =>
      typeof a === 'number' && typeof b === 'number'
        ? onNumbers(a, b)
        : real(a) && real(b)
          ? onFractions(fraction(a), fraction(b))
          : onComplex(complex(a), complex(b));
  // powNumber of mathjs src/plain/number/arithmetic.js
  const powNumber = (x: number, y: number): number => ((x * x < 1 && y === Infinity) || (x * x > 1 && y === -Infinity) ? 0 : Math.pow(x, y));
  // _pow of mathjs src/function/arithmetic/pow.js, config.predictable = false
  const powNumbers = (x: number, y: number): Scalar => {
    if (Number.isInteger(y) || x >= 0) return powNumber(x, y);
    if ((x * x < 1 && y === Infinity) || (x * x > 1 && y === -Infinity)) return 0;
    return notInEngine('a negative value to a fractional power (a complex result)');
  };
  const absent = (name: string) => () => notInEngine(`mathjs ${name}`);
  const Unit = createUnitClass({
    config: { number: 'number', predictable: false }, // mathjs's defaults, the only settings Unit reads
    addScalar: scalar((a, b) => a + b, (a, b) => a.add(b), (a, b) => a.add(b)),
    subtractScalar: scalar((a, b) => a - b, (a, b) => a.sub(b), (a, b) => a.sub(b)),
    multiplyScalar: scalar((a, b) => a * b, (a, b) => a.mul(b), (a, b) => a.mul(b)),
    divideScalar: scalar((a, b) => a / b, (a, b) => a.div(b), (a, b) => a.div(b)),
    pow: scalar(powNumbers, (a, b) => a.pow(b) ?? powNumbers(a.valueOf(), b.valueOf()), (a, b) => a.pow(b)),
    abs: (x: unknown) => (typeof x === 'number' ? Math.abs(x) : hasFlag(x, 'isFraction') ? (x as FractionNumber).abs() : complex(x).abs()),
    // mathjs's number of a number or a Fraction (src/type/number.js)
    number: (x: unknown) => (real(x) ? x.valueOf() : notInEngine(`number of ${typeof x}`)),
    // isNumeric of mathjs src/function/utils/isNumeric.js for the values a Unit can hold
    isNumeric: (x: unknown) =>
      typeof x === 'number' || typeof x === 'boolean' || typeof x === 'bigint' || hasFlag(x, 'isFraction') || hasFlag(x, 'isBigNumber')
        ? true
        : x === null || x === undefined || typeof x === 'string' || hasFlag(x, 'isComplex') || (x as { isUnit?: boolean }).isUnit === true
          ? false
          : notInEngine(`isNumeric of ${typeof x}`),
    format, // mathjs's format function is this one for every argument (src/function/string/format.js)
    Complex,
    Fraction,
    fix: absent('fix'),
    round: absent('round'),
    equal: absent('equal'),
    BigNumber: absent('BigNumber'),
  }) as { new (value: unknown, unit?: string | null): MathUnit; parse(text: string, options?: { allowNoUnits?: boolean }): MathUnit; isValuelessUnit(text: string): boolean };
  return {
    // mathjs's unit function (src/type/unit/function/unit.js) for a text, or a number and a unit
    unit: (...args: [string] | [number, string]): MathUnit =>
      args.length === 2
        ? new Unit(args[0], args[1])
        : Unit.isValuelessUnit(args[0])
          ? new Unit(null, args[0])
          : Unit.parse(args[0], { allowNoUnits: true }),
  };
}

let engine: ReturnType<typeof unitEngine> | undefined;

/** The unit engine's `unit` function (the engine is made on first use). */
const math = {
  unit(...args: [string] | [number, string]): MathUnit {
    engine ??= unitEngine();
    return engine.unit(...args);
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
    setBounded(parsed, t, u, PARSE_CACHE_LIMIT);
  }
  if (u instanceof Error) {
    // mathjs quotes the text as typed; a line break in it would split the message.
    const why = u.message.replace(/\r/g, '\\r').replace(/\n/g, '\\n');
    throw new HushInputError(field, `${field} must be ${expected} (got ${JSON.stringify(text.trim())}: ${why})`, 'value');
  }
  return u;
}

/** Conversions already made, by parsed unit (the parse cache hands out the same object for the same text) and target unit. */
const converted = new WeakMap<MathUnit, Map<string, number>>();

/** u.toNumber(to), remembered per parsed unit (mathjs builds and converts units slowly; a table repeats its values). */
function numberIn(u: MathUnit, to: string): number {
  let m = converted.get(u);
  if (!m) {
    m = new Map();
    converted.set(u, m);
  }
  let x = m.get(to);
  if (x === undefined) {
    x = u.toNumber(to);
    m.set(to, x);
  }
  return x;
}

/** A bare number in unit `from` converted to `to` (math.unit(x, from).toNumber(to)), remembered by value. */
const bareConverted = new Map<string, number>();
function bareIn(x: number, from: string, to: string): number {
  const key = `${Object.is(x, -0) ? '-0' : x}|${from}|${to}`;
  let y = bareConverted.get(key);
  if (y === undefined) {
    y = math.unit(x, from).toNumber(to);
    setBounded(bareConverted, key, y, PARSE_CACHE_LIMIT);
  }
  return y;
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
  if (bare !== null) return canonical(finite(field, bareIn(bare, defaultUnit, siUnit), v));
  const u = parseUnit(field, v as string, expected);
  if (!u.equalBase(reference()[kind])) throw new HushInputError(field, `${field} must be ${expected} (got ${describe(v)})`, 'value');
  return canonical(finite(field, numberIn(u, siUnit), v));
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
  if (bare !== null) return positive(field, canonical(finite(field, bareIn(bare, defaultUnit, 'm'), v)), v);
  const u = parseUnit(field, v as string, expected);
  if (u.equalBase(reference().length)) return positive(field, canonical(finite(field, numberIn(u, 'm'), v)), v);
  if (u.equalBase(reference().frequency)) {
    const f = positive(field, finite(field, numberIn(u, 'Hz'), v), v);
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
  if (!u.equalBase(reference().length)) throw new HushInputError(field, `${field} must be a number of cells, of wavelengths (λ), or a length (got ${t})`, 'value');
  return { metres: canonical(finite(field, numberIn(u, 'm'), v)) };
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

/**
 * Reading one input value through the registry: the single place where what
 * was typed becomes a checked value, for the project table, the worksheet
 * functions and the command line alike.
 */
import { HushInputError } from '../../physics/errors';
import { inputField, type InputField } from './inputs';
import { READERS, type KindValue } from './kinds';
import { bareNumber, typed } from './quantity';

/** What a cell, an argument or an option holds. */
export type RawValue = string | number | boolean | null | undefined;

/** True when nothing was given (nothing, or only spaces). */
export function isBlank(v: unknown): boolean {
  return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
}

/** How a value is read. */
export interface ReadOptions {
  /** Unit of a bare number in place of the field's own (a table header "cell [um]"). */
  unit?: string;
  /** Collects notes on likely slips and on bare numbers read in a unit (never dropped silently). */
  notes?: string[];
  /** Note every bare number with a unit, saying which unit it was read in (the command line does: "--cell 20 read as 20 nm"). */
  noteBareUnits?: boolean;
}

/**
 * The checked value of field `name` from `raw`, or undefined when `raw` is
 * blank (the caller applies the default or reports the field missing).
 * Throws HushInputError naming the field, what it must be and what was typed.
 */
export function readInput<K extends keyof KindValue = keyof KindValue>(name: string | InputField, raw: unknown, options: ReadOptions = {}): KindValue[K] | undefined {
  const f = typeof name === 'string' ? inputField(name) : name;
  if (isBlank(raw)) return undefined;
  if (typeof raw === 'boolean') throw new HushInputError(f.name, `${f.name} must be a number or text, not ${typed(raw)}`, 'value');
  if (typeof raw !== 'string' && typeof raw !== 'number') throw new HushInputError(f.name, `${f.name} must be a number or text (got ${typed(raw)})`, 'value');
  if (typeof raw === 'number' && !Number.isFinite(raw)) throw new HushInputError(f.name, `${f.name} must be a finite number (got ${raw})`, 'value');
  const unit = options.unit ?? f.unit;
  const bare = bareNumber(raw);
  // A bare number under a header unit reads as if it carried that unit.
  const text: string | number = bare !== null && options.unit !== undefined && options.unit !== '' ? `${bare} ${options.unit}` : raw;
  const value = (READERS[f.kind] as (f: InputField, raw: string | number, unit: string) => unknown)(f, text, unit) as KindValue[K];
  if (options.notes) {
    if (f.slip && typeof value === 'number' && options.unit === undefined) {
      const n = f.slip(value, bare !== null);
      if (n) options.notes.push(n);
    }
    if (options.noteBareUnits && bare !== null && f.unit && !['cells', 'deg'].includes(f.unit)) {
      options.notes.push(`--${f.flag} ${bare} read as ${bare} ${f.unit} (a bare number is in ${f.unit}; write the unit to be explicit)`);
    }
  }
  return value;
}

/** Like readInput, but a blank value is an error saying the field is required. */
export function readRequired<K extends keyof KindValue = keyof KindValue>(name: string | InputField, raw: unknown, options: ReadOptions = {}, hint = ''): KindValue[K] {
  const f = typeof name === 'string' ? inputField(name) : name;
  const v = readInput<K>(f, raw, options);
  if (v === undefined) throw new HushInputError(f.name, `${f.name} is required${hint ? `: ${hint}` : ` (${f.description})`}`, 'value');
  return v;
}

import { HushInputError, quote } from './errors';

/** A finite number, or a typed error naming the field. */
export function finite(field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new HushInputError(field, `${field} must be a finite number (got ${quote(value)})`, 'value');
  }
  return value;
}

/** A whole number in [min, max]. */
export function wholeInRange(field: string, value: unknown, min: number, max: number): number {
  const v = finite(field, value);
  if (!Number.isInteger(v) || v < min || v > max) {
    throw new HushInputError(field, `${field} must be a whole number from ${min} to ${max} (got ${quote(value)})`);
  }
  return v;
}

/** A number with lo < v (open) or lo ≤ v (closed), and v ≤ hi or v < hi. */
export function inRange(
  field: string,
  value: unknown,
  lo: number,
  hi: number,
  opts: { loOpen?: boolean; hiOpen?: boolean; unit?: string } = {},
): number {
  const v = finite(field, value);
  const loOk = opts.loOpen ? v > lo : v >= lo;
  const hiOk = opts.hiOpen ? v < hi : v <= hi;
  if (!loOk || !hiOk) {
    const u = opts.unit ? ` ${opts.unit}` : '';
    const left = opts.loOpen ? `greater than ${lo}` : `at least ${lo}`;
    const right = hi === Infinity ? '' : opts.hiOpen ? ` and less than ${hi}` : ` and at most ${hi}`;
    throw new HushInputError(field, `${field} must be ${left}${right}${u} (got ${quote(value)}${u})`);
  }
  return v;
}

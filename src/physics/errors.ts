/**
 * Typed input errors. Every public function of the core throws `HushInputError`
 * for input it cannot accept; front ends map `kind` to a worksheet error
 * (`"value"` → #VALUE!, `"number"` → #NUM!), a CLI exit code, or a message.
 */
export type HushErrorKind = 'value' | 'number';

export class HushInputError extends Error {
  readonly kind: HushErrorKind;
  readonly field: string;
  constructor(field: string, message: string, kind: HushErrorKind = 'number') {
    super(message);
    this.name = 'HushInputError';
    this.kind = kind;
    this.field = field;
  }
}

export function isHushInputError(e: unknown): e is HushInputError {
  return e instanceof HushInputError;
}

/** Formats a number the way error messages quote what the user gave. */
export function quote(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === null) return 'nothing';
  if (value === undefined) return 'nothing';
  return typeof value;
}

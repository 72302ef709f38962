/**
 * Help texts generated from the field registry: one line per field for the
 * command line's --help, the plan workbook's notes sheet and the README's
 * field table, so they cannot drift from what the readers accept.
 */
import type { InputField } from './inputs';
import { isDimension } from './kinds';
import { EXAMPLES } from './quantity';
import { plain } from './kinds';

/** The forms a field accepts, in a few words ("a length such as 20 nm or 0.02 um; a bare number is in nm"). */
export function acceptedForms(f: InputField): string {
  const k = f.kind;
  if (isDimension(k)) return `${EXAMPLES[k]}; a bare number is in ${f.unit}`;
  switch (k) {
    case 'fraction':
      return 'a number or a percentage (0.01 or 1%)';
    case 'reflection':
      return 'an amplitude |r|, a percentage or dB (0.001, 0.1%, -60 dB)';
    case 'count':
      return 'a whole number';
    case 'counts':
      return 'whole numbers separated by commas';
    case 'numbers':
      return 'numbers separated by commas or spaces';
    case 'choice':
      return `one of ${(f.choices ?? []).join(', ')} (any letter case)`;
    case 'faces':
      return 'faces such as x-, x+, z+';
    case 'axes':
      return 'axes such as x y';
    case 'price':
      return 'a number with an optional currency and /h ($2.50/h)';
    case 'path':
      return 'wavelengths in the densest material (a bare number) or a length';
    case 'gap':
      return 'cells (a bare number), wavelengths ("0.5 wavelengths") or a length';
    case 'text':
      return 'text';
    default:
      return 'a number';
  }
}

/** Allowed range as text, or ''. */
export function rangeText(f: InputField): string {
  const r = f.range;
  if (!r || (r.min === undefined && r.max === undefined)) return '';
  const show = (x: number) => (f.show ? `${plain(x / f.show.factor)} ${f.show.unit}` : f.kind === 'angle' ? `${x}°` : plain(x));
  const lo = r.min === undefined ? '' : `${r.minOpen ? '>' : '≥'} ${show(r.min)}`;
  const hi = r.max === undefined ? '' : `${r.maxOpen ? '<' : '≤'} ${show(r.max)}`;
  return [lo, hi].filter(Boolean).join(', ');
}

/** One help line for a command-line option. */
export function optionHelp(f: InputField): string {
  const range = rangeText(f);
  return `--${f.flag} ${f.placeholder}`.padEnd(34) + `${f.description}; ${acceptedForms(f)}${range ? `; ${range}` : ''}; default: ${f.defaultText}`;
}

/** The unit of a bare number as the README and notes sheet state it. */
export function bareUnitText(f: InputField): string {
  return f.unit || (f.kind === 'fraction' || f.kind === 'reflection' ? 'fraction' : '—');
}

/**
 * Header cells of a project table: "cell [um]" names the field `cell` and
 * says that bare numbers in its column are in µm. Names compare without
 * case, surrounding spaces or the bracketed unit; a unit that contradicts the
 * field's dimension ("cell [kg]") makes that column an error, and the other
 * columns are still read.
 */
import { inputField, TABLE_FIELDS, type InputField } from './inputs';
import { isDimension } from './kinds';
import { EXAMPLES, isUnitOf, unitName, type Dimension } from './quantity';

/** "runtime [h]" → "runtime": header cells compare without units, case or surrounding spaces. */
export function headerName(text: unknown): string {
  return String(text ?? '')
    .replace(/\s*[[(][^\])]*[\])]\s*$/, '')
    .trim()
    .toLowerCase();
}

/** The bracketed unit of a header cell ("cell [um]" → "um"), or undefined. */
export function headerUnit(text: unknown): string | undefined {
  const m = /[[(]([^\])]*)[\])]\s*$/.exec(String(text ?? ''));
  return m ? m[1].trim() : undefined;
}

/** How one input column of a table is read. */
export interface InputColumn {
  field: InputField;
  /** Unit of bare numbers in this column, when the header states one that differs from the field's. */
  unit?: string;
  /** Why the column cannot be read (its header's unit contradicts the field), or undefined. */
  problem?: string;
}

const NO_UNIT = new Set(['', '-', '1', '—']);
const PHYSICAL: readonly Dimension[] = ['length', 'time', 'frequency', 'angle', 'bandwidth', 'conductivity'];
const TABLE_NAMES = new Set(TABLE_FIELDS.map((f) => f.name));

/** The input column a header cell names, or null when it names no input field of the table. */
export function inputColumn(header: unknown): InputColumn | null {
  const name = headerName(header);
  if (!TABLE_NAMES.has(name)) return null;
  const field = inputField(name);
  const unit = headerUnit(header);
  if (unit === undefined || NO_UNIT.has(unit) || unit === field.unit) return { field };
  const bad = (what: string) => ({ field, problem: `column ${JSON.stringify(String(header).trim())}: [${unit}] is not ${what}; head it ${field.name}${field.unit ? ` [${field.unit}]` : ''} or give units in the cells` });
  const k = field.kind;
  if (isDimension(k)) {
    return isUnitOf(k, unit) ? { field, unit: k === 'wavelength' ? unit : unitName(k, unit) } : bad(`a unit of ${EXAMPLES[k].replace(/ such as.*/, '')}`);
  }
  if (k === 'fraction') return unit === '%' ? { field, unit } : bad('a unit of a fraction (use % or none)');
  if (k === 'reflection') return unit === '%' || /^db$/i.test(unit) ? { field, unit: unit === '%' ? '%' : 'dB' } : bad('a unit of a reflection (use %, dB or none)');
  if (k === 'gap') {
    if (/^(cells?|wavelengths?|λ|lambda)$/i.test(unit)) return { field, unit };
    return isUnitOf('length', unit) ? { field, unit: unitName('length', unit) } : bad('cells, wavelengths or a length unit');
  }
  // Dimensionless fields: descriptive text in brackets is fine ("throughput [cell updates/s]"), a physical unit is not.
  const clash = PHYSICAL.find((d) => isUnitOf(d, unit)) ?? (unit === '%' ? 'percentage' : undefined);
  return clash ? bad(`a unit of ${field.name}, which is a plain ${k === 'count' ? 'whole number' : k === 'choice' ? 'word' : 'number'}`) : { field };
}

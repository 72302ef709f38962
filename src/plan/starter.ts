/**
 * The starter project table: every input field of the table as a column
 * (from the field registry, in its order), a note per column with its
 * meaning, unit, default and range, the fixed choices of a choice field (for
 * a spreadsheet's data validation), and one filled example row in an
 * invented scenario. `hush init` writes it as .xlsx or .csv; the task pane's
 * "Insert project table" writes it into the active sheet. Pure: no file or
 * Office access here.
 */
import { OUTPUT_COLUMNS, outputHeaderText, TABLE_FIELDS, type InputField } from './fields';
import { acceptedForms, rangeText } from './fields/help';

/** The example row: an invented study of an invented lab, not a measurement. Values by field name; other columns stay blank. */
export const STARTER_EXAMPLE: Readonly<Record<string, string | number>> = {
  study: 'Saltmarsh patch antenna (invented example)',
  dimensions: 3,
  band_short: '2.2 GHz',
  band_long: '2.6 GHz',
  index: 1,
  index_max: 2.1,
  cell: '0.5 mm',
  size_x: '80 mm',
  size_y: '80 mm',
  size_z: '30 mm',
  gap: '0.5 wavelengths',
  angle_max: 60,
  intensity_error: '1%',
  duration: '60 ns',
  throughput: 5e8,
  price_per_hour: '$1.20/h',
};

/** Where the example row comes from, said beside it (the sheet's title note and the CSV's remark). */
export const STARTER_NOTE =
  'Starter table written by Hush: one column per input field (hover a header for its meaning, unit and default). ' +
  'The first row is an invented example (Saltmarsh Radio Workshop, a fictional lab), not a measurement: replace it with your own studies.';

export interface StarterColumn {
  /** Column header: the field's name. */
  name: string;
  /** Header note: meaning, accepted forms (with the unit of a bare number), default and range. */
  note: string;
  /** The fixed choices of a choice field (data validation), else null. */
  choices: readonly string[] | null;
  /** The example row's value, or null (blank). */
  example: string | number | null;
  /** Whether the field must be given (its default is "required"). */
  required: boolean;
}

export interface StarterTable {
  inputs: readonly StarterColumn[];
  /** The plan's output columns, as headed in a plan (HUSH.PLAN spills one value under each). */
  outputs: readonly { header: string; note: string }[];
  note: string;
}

function columnNote(f: InputField): string {
  const range = rangeText(f);
  return [
    `${f.name}: ${f.description}.`,
    `Accepts ${acceptedForms(f)}.`,
    range ? `Range: ${range}.` : '',
    `Default: ${f.defaultText}.`,
  ]
    .filter(Boolean)
    .join(' ');
}

/** The starter table, built from the field registry. */
export function starterTable(): StarterTable {
  const inputs = TABLE_FIELDS.map((f) => ({
    name: f.name,
    note: columnNote(f),
    choices: f.kind === 'choice' && f.choices ? f.choices : null,
    example: STARTER_EXAMPLE[f.name] ?? null,
    required: f.defaultText === 'required',
  }));
  const outputs = OUTPUT_COLUMNS.map((c) => ({ header: outputHeaderText(c), note: c.description }));
  return { inputs, outputs, note: STARTER_NOTE };
}

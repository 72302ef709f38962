/**
 * The field registry: every input field and every output column of a plan,
 * each defined once (inputs.ts, outputs.ts), with the readers that turn what
 * was typed into checked values (read.ts, kinds.ts, quantity.ts), table
 * headers with units (header.ts) and the help texts made from them (help.ts).
 */
import { TABLE_FIELDS } from './inputs';
import { OUTPUTS } from './outputs';

export * from './inputs';
export * from './outputs';
export * from './read';
export * from './header';
export * from './help';
export * from './cost-constants';
export { type Kind, type KindValue, type Range } from './kinds';
export { type Gap } from '../units';
export { reflectionDb as amplitudeToDb } from './outputs';

/** The project table's input fields (name, unit of a bare number, meaning), in order. */
export const INPUT_FIELDS = TABLE_FIELDS;
/** Their names: the project table's input columns. */
export const INPUT_NAMES: readonly string[] = TABLE_FIELDS.map((f) => f.name);
/** Output columns in order (the worksheet's spilled row, the added table columns). */
export const OUTPUT_COLUMNS = OUTPUTS;

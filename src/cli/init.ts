/**
 * `hush init [FILE.xlsx|FILE.csv]`: writes a starter project table (every
 * input field as a column, notes, validation, an invented example row and,
 * in the .xlsx, HUSH.PLAN formulas). Never replaces an existing file.
 */
import { existsSync } from 'fs';
import { tableFormat } from '../plan/table-file';
import { parseArgs, UsageError } from './args';
import type { CommandIO } from './io';
import type { CommandSpec } from './options';

/** `hush init --help`. */
export const initSpec: CommandSpec = {
  name: 'init',
  summary:
    "Writes a starter project table: one column per input field with its meaning, unit and default in the header note, choice lists on the fixed-choice columns, one invented example row and, in an .xlsx, a HUSH.PLAN formula in the example row's output columns (the same file plans itself in Excel with the add-in). An existing file is never replaced.",
  fields: [],
  positional: '[FILE.xlsx|FILE.csv]',
  notes: ['FILE defaults to hush-project.xlsx. Then: hush plan FILE --out PLAN.xlsx'],
};


export async function initCommand(argv: string[], io: CommandIO): Promise<number> {
  const args = parseArgs(argv, {});
  if (args.positional.length > 1) throw new UsageError(`give at most one file name, got ${args.positional.length}`);
  const file = args.positional[0] ?? 'hush-project.xlsx';
  const format = tableFormat(file);
  if (format !== 'xlsx' && format !== 'csv') throw new UsageError(`${file}: the starter table is written as .xlsx or .csv`);
  if (existsSync(file)) throw new UsageError(`${file} already exists; Hush does not replace it: choose another name`);
  const { prepareOutput } = await import('../plan/table-file');
  await prepareOutput(file);
  const { writeStarter } = await import('../plan/table/write-starter');
  try {
    await writeStarter(file, format);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') throw new UsageError(`${file} already exists; Hush does not replace it: choose another name`);
    throw e;
  }
  io.out(`wrote ${file}: a starter project table with one invented example row; replace it with your studies, then run: hush plan ${file} --out plan.${format === 'xlsx' ? 'xlsx' : 'csv'}`);
  return 0;
}

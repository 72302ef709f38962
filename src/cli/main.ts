/**
 * `hush` command line: a thin shell over the plan API. Each command's module
 * is loaded only when that command runs, so start-up pays for one command.
 * Exit codes: 0 success, 1 a row or file failed, 2 bad arguments or input.
 */
import { isHushInputError } from '../plan/steps';
import { UsageError } from './args';
import { oneLine, processIO, type CommandIO } from './io';
import { helpText, type CommandSpec } from './options';
import { APP_VERSION } from '../plan/version';

type Command = (argv: string[], io: CommandIO) => number | Promise<number>;

interface Entry {
  summary: string;
  load: () => Promise<{ run: Command; spec?: CommandSpec; usage?: string }>;
}

export const commands: Record<string, Entry> = {
  reflect: { summary: 'exact discrete reflection of one absorber design', load: async () => { const m = await import('./reflect'); return { run: m.reflectCommand, spec: m.reflectSpec }; } },
  budget: { summary: 'tolerated intensity error <-> required amplitude reflection', load: async () => { const m = await import('./budget'); return { run: m.budgetCommand, spec: m.budgetSpec }; } },
  design: { summary: 'thinnest absorber that meets a target over a band and angles', load: async () => { const m = await import('./design'); return { run: m.designCommand, spec: m.designSpec }; } },
  ripple: { summary: 'spectral ripple of a reflection, or the reflection behind a ripple', load: async () => { const m = await import('./ripple'); return { run: m.rippleCommand, spec: m.rippleSpec }; } },
  cost: { summary: 'cells, ψ, memory, steps, runtime and cost of a domain (planning estimate)', load: async () => { const m = await import('./cost'); return { run: m.costCommand, spec: m.costSpec }; } },
  dispersion: { summary: 'numerical phase and group velocity of the Yee grid along a direction', load: async () => { const m = await import('./dispersion'); return { run: m.dispersionCommand, spec: m.dispersionSpec }; } },
  sweep: { summary: 'exact |r| (and dB) of one design over cells per wavelength × angle, as CSV', load: async () => { const m = await import('./sweep'); return { run: m.sweepCommand, spec: m.sweepSpec }; } },
  verify: { summary: 'time-domain check of a design against its exact predicted reflection', load: async () => { const m = await import('./verify'); return { run: m.verifyCommand, spec: m.verifySpec }; } },
  init: { summary: 'write a starter project table (.xlsx or .csv) with an invented example row', load: async () => { const m = await import('./init'); return { run: m.initCommand, spec: m.initSpec }; } },
  plan: { summary: 'plan every study of a project table (.csv/.xlsx) and write the plan', load: async () => { const m = await import('./plan'); return { run: m.planCommand, spec: m.planSpec }; } },
};

function help(): string {
  const lines = [`Hush ${APP_VERSION}: plans the absorbing boundaries (CPML) of FDTD simulations`, '', 'usage: hush <command> [options]', '', 'commands:'];
  for (const [name, e] of Object.entries(commands)) lines.push(`  ${name.padEnd(10)} ${e.summary}`);
  lines.push('', "run 'hush <command> --help' for its options; 'hush --version' prints the versions");
  lines.push('A bare number is in the field\'s own unit (the same as in a project table and the worksheet); text may carry any unit: 20nm, 0.02um, 3ps, 193THz, 30deg, 1%, -60dB.');
  return lines.join('\n');
}

/** Runs one command line; never throws. */
export async function main(argv: string[], io: CommandIO = processIO): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.out(help());
    return name ? 0 : 2;
  }
  if (name === '--version' || name === '-V' || name === 'version') {
    const { MODEL_VERSION } = await import('../plan/steps');
    io.out(`Hush ${APP_VERSION}, model ${MODEL_VERSION}`);
    return 0;
  }
  const entry = Object.prototype.hasOwnProperty.call(commands, name) ? commands[name] : undefined;
  if (!entry) {
    io.err(`hush: unknown command ${JSON.stringify(oneLine(name).slice(0, 80))}; commands: ${Object.keys(commands).join(', ')}`);
    return 2;
  }
  try {
    const command = await entry.load();
    if (rest.includes('--help') || rest.includes('-h')) {
      io.out(command.spec ? helpText(command.spec) : `usage: ${command.usage}`);
      return 0;
    }
    return await command.run(rest, io);
  } catch (e) {
    if (e instanceof UsageError || isHushInputError(e)) {
      io.err(`hush ${name}: ${oneLine(e.message)}`);
      return 2;
    }
    io.err(`hush ${name}: internal error: ${oneLine(e instanceof Error ? e.message : String(e))}`);
    return 1;
  }
}

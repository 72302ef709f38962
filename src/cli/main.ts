/**
 * `hush` command line: a thin shell over the physics core and the plan API.
 * Exit codes: 0 success, 1 a row or file failed, 2 bad arguments or input.
 */
import { isHushInputError } from '../plan/steps';
import { UsageError } from './args';
import { oneLine, processIO, type CommandIO } from './io';
import { reflectCommand, reflectUsage } from './reflect';
import { budgetCommand, budgetUsage } from './budget';
import { designCommand, designUsage } from './design';
import { rippleCommand, rippleUsage } from './ripple';
import { costCommand, costUsage } from './cost';
import { planCommand, planUsage } from './plan';

type Command = (argv: string[], io: CommandIO) => number | Promise<number>;

interface Entry {
  run: Command;
  usage: string;
  summary: string;
}

export const commands: Record<string, Entry> = {
  reflect: { run: reflectCommand, usage: reflectUsage, summary: 'exact discrete reflection of one absorber design' },
  budget: { run: budgetCommand, usage: budgetUsage, summary: 'tolerated intensity error <-> required amplitude reflection' },
  design: { run: designCommand, usage: designUsage, summary: 'thinnest absorber that meets a target over a band and angles' },
  ripple: { run: rippleCommand, usage: rippleUsage, summary: 'spectral ripple of a reflection, or the reflection behind a ripple' },
  cost: { run: costCommand, usage: costUsage, summary: 'cells, ψ, memory and steps of a domain with absorbers (planning estimate)' },
  plan: { run: planCommand, usage: planUsage, summary: 'plan every study of a project table (.csv/.xlsx) and write the plan' },
};

export function registerCommand(name: string, entry: Entry): void {
  commands[name] = entry;
}

function help(): string {
  const lines = ['usage: hush <command> [options]', '', 'commands:'];
  for (const [name, e] of Object.entries(commands)) lines.push(`  ${name.padEnd(8)} ${e.summary}`);
  lines.push('', "run 'hush <command> --help' for its options");
  return lines.join('\n');
}

/** Runs one command line; never throws. */
export async function main(argv: string[], io: CommandIO = processIO): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.out(help());
    return name ? 0 : 2;
  }
  const entry = commands[name];
  if (!entry) {
    io.err(`hush: unknown command ${JSON.stringify(name)}; commands: ${Object.keys(commands).join(', ')}`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(`usage: ${entry.usage}`);
    return 0;
  }
  try {
    return await entry.run(rest, io);
  } catch (e) {
    if (e instanceof UsageError || isHushInputError(e)) {
      io.err(`hush ${name}: ${oneLine(e.message)}`);
      return 2;
    }
    io.err(`hush ${name}: internal error: ${oneLine(e instanceof Error ? e.message : String(e))}`);
    return 1;
  }
}

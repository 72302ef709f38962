/**
 * Command options from the field registry: a command names the input fields
 * it takes (src/plan/fields) and its own switches (--json, --all…); the
 * option names, the usage line, the help and the reading of every value come
 * from the registry, so a value means the same on the command line as in a
 * project table or a worksheet function. Unknown options are errors, with the
 * nearest known option suggested.
 */
import { inputField, optionHelp, readInput, type InputField, type KindValue } from '../plan/fields';
import { HushInputError } from '../plan/steps';
import { parseArgs, UsageError, type OptionSpec } from './args';

/** A switch of one command: a flag (no value) or an option with a value that is not an input field (--out FILE). */
export interface Switch {
  help: string;
  /** Placeholder of its value; absent for a flag. */
  value?: string;
}

export interface CommandSpec {
  name: string;
  summary: string;
  /** Input fields taken as options, in help order. */
  fields: readonly string[];
  /** Fields without which the command cannot run (stated in the usage line). */
  required?: readonly string[];
  switches?: Readonly<Record<string, Switch>>;
  /** Positional arguments, as shown in the usage line (e.g. "TABLE.csv|TABLE.xlsx"); none when absent. */
  positional?: string;
  /** Lines of help after the options (alternatives, examples). */
  notes?: readonly string[];
}

/** The usage line of a command. */
export function usageLine(spec: CommandSpec): string {
  const req = new Set(spec.required ?? []);
  const parts = [`hush ${spec.name}`];
  if (spec.positional) parts.push(spec.positional);
  for (const name of spec.fields) {
    const f = inputField(name);
    const t = `--${f.flag} ${f.placeholder}`;
    parts.push(req.has(name) ? t : `[${t}]`);
  }
  for (const [name, s] of Object.entries(spec.switches ?? {})) parts.push(`[--${name}${s.value ? ` ${s.value}` : ''}]`);
  return parts.join(' ');
}

/** The whole --help text of a command: usage, one line per option (meaning, forms, range, default), notes. */
export function helpText(spec: CommandSpec): string {
  const switches = Object.entries(spec.switches ?? {});
  const lines = [`usage: ${usageLine(spec)}`, '', spec.summary, '', spec.fields.length || switches.length ? 'options:' : 'options: none'];
  for (const name of spec.fields) lines.push(`  ${optionHelp(inputField(name))}`);
  for (const [name, s] of switches) lines.push(`  ${`--${name}${s.value ? ` ${s.value}` : ''} `.padEnd(34)}${s.help}`);
  if (spec.notes?.length) lines.push('', ...spec.notes);
  return lines.join('\n');
}

function distance(a: string, b: string): number {
  const d = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  }
  return d[a.length][b.length];
}

/** The known option nearest to an unknown one ("faces" → "faces-seen"), or null. */
export function nearestOption(name: string, known: readonly string[]): string | null {
  const prefix = known.filter((k) => k.startsWith(name) || name.startsWith(k));
  if (prefix.length === 1) return prefix[0];
  let best: string | null = null;
  let bestD = 3;
  for (const k of known) {
    const d = distance(name, k);
    if (d < bestD) [best, bestD] = [k, d];
  }
  return best;
}

/** Parsed options of one command, read through the registry on demand. */
export class Options {
  readonly positional: string[];
  /** Notes for the user (bare numbers read in a unit, likely slips), printed on stderr when the command succeeds. */
  readonly notes: string[] = [];
  private readonly raw: Map<string, string | true>;
  private readonly byFlag: Map<string, InputField>;

  constructor(
    readonly spec: CommandSpec,
    argv: string[],
  ) {
    const optionSpec: Record<string, OptionSpec> = {};
    this.byFlag = new Map();
    for (const name of spec.fields) {
      const f = inputField(name);
      for (const flag of [f.flag, ...(f.aliases ?? [])]) {
        this.byFlag.set(flag, f);
        optionSpec[flag] = {};
      }
    }
    for (const [name, s] of Object.entries(spec.switches ?? {})) optionSpec[name] = { flag: s.value === undefined };
    try {
      const parsed = parseArgs(argv, optionSpec);
      this.positional = parsed.positional;
      this.raw = parsed.options;
    } catch (e) {
      const m = e instanceof UsageError ? /^unknown option --(.*)$/.exec(e.message) : null;
      if (m) {
        const near = nearestOption(m[1], Object.keys(optionSpec));
        throw new UsageError(`unknown option --${m[1]}${near ? `; did you mean --${near}?` : ''} (hush ${spec.name} --help lists the options)`);
      }
      throw e;
    }
    if (!spec.positional && this.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(this.positional[0])}`);
  }

  private field(name: string): InputField {
    const f = inputField(name);
    if (this.byFlag.get(f.flag) !== f) throw new Error(`hush ${this.spec.name} does not take --${f.flag}`);
    return f;
  }

  /** What was typed for field `name` (under its flag or an alias), or undefined. */
  private typedValue(f: InputField): string | true | undefined {
    const given = [f.flag, ...(f.aliases ?? [])].filter((k) => this.raw.has(k));
    if (given.length > 1) throw new UsageError(`option --${f.flag} given twice (as --${given.join(' and --')})`);
    return given.length ? this.raw.get(given[0]) : undefined;
  }

  /** True when the field's option was given. */
  has(name: string): boolean {
    return this.typedValue(this.field(name)) !== undefined;
  }

  /** The checked value of field `name`, or undefined when its option was not given. */
  get<K extends keyof KindValue>(name: string): KindValue[K] | undefined {
    const f = this.field(name);
    const v = this.typedValue(f);
    if (v === undefined) return undefined;
    if (v === true) throw new UsageError(`option --${f.flag} needs a value`);
    return readInput<K>(f, v, { notes: this.notes, noteBareUnits: true });
  }

  /** The checked value of a required field; a missing option is a usage error. */
  required<K extends keyof KindValue>(name: string): KindValue[K] {
    const v = this.get<K>(name);
    if (v === undefined) {
      const f = this.field(name);
      throw new UsageError(`option --${f.flag} is required (${f.description})`);
    }
    return v;
  }

  /** The text typed for field `name`, for a command that reads it in its own way (a list of per-face counts); undefined when absent. */
  typedText(name: string): string | undefined {
    const f = this.field(name);
    const v = this.typedValue(f);
    if (v === true) throw new UsageError(`option --${f.flag} needs a value`);
    return v;
  }

  /** True when a flag switch was given. */
  flag(name: string): boolean {
    return this.raw.get(name) === true;
  }

  /** The text of a switch that takes a value (--out FILE), or undefined. */
  text(name: string): string | undefined {
    const v = this.raw.get(name);
    if (v === true) throw new UsageError(`option --${name} needs a value`);
    return v;
  }

  /** Refuses two options given together ("give --decay or --angle, not both"). */
  exclusive(a: string, b: string): void {
    if (this.has(a) && this.has(b)) throw new UsageError(`give --${this.field(a).flag} or --${this.field(b).flag}, not both`);
  }
}

/** A field's value that a command must have before calling the core; a registry error otherwise. */
export function mustHave<T>(name: string, v: T | undefined, why: string): T {
  if (v === undefined) throw new HushInputError(name, why, 'value');
  return v;
}

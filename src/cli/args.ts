/**
 * A small, strict argument parser for the `hush` command line: `--name value`
 * or `--name=value` options and `--flag` switches; anything unknown is an
 * error (exit code 2), never silently ignored.
 */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

export interface OptionSpec {
  /** Option takes no value. */
  flag?: boolean;
}

export interface ParsedArgs {
  positional: string[];
  options: Map<string, string | true>;
}

export function parseArgs(argv: string[], spec: Record<string, OptionSpec>): ParsedArgs {
  const options = new Map<string, string | true>();
  const positional: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (!a.startsWith('--')) {
      positional.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = eq >= 0 ? a.slice(2, eq) : a.slice(2);
    const s = spec[name];
    if (!s) throw new UsageError(`unknown option --${name}`);
    if (options.has(name)) throw new UsageError(`option --${name} given twice`);
    if (s.flag) {
      if (eq >= 0) throw new UsageError(`option --${name} takes no value`);
      options.set(name, true);
      continue;
    }
    let value: string | undefined;
    if (eq >= 0) value = a.slice(eq + 1);
    else {
      value = argv[i + 1];
      i++;
    }
    if (value === undefined || value === '' || (value.startsWith('--') && !/^--?\d/.test(value))) {
      throw new UsageError(`option --${name} needs a value`);
    }
    options.set(name, value);
  }
  return { positional, options };
}

/** A number option: absent → fallback; present and not a finite number → UsageError. */
export function numberOption(args: ParsedArgs, name: string, fallback?: number): number | undefined {
  const v = args.options.get(name);
  if (v === undefined) return fallback;
  if (v === true) throw new UsageError(`option --${name} needs a value`);
  const t = v.trim();
  const x = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) ? Number(t) : NaN;
  if (!Number.isFinite(x)) throw new UsageError(`option --${name} must be a number (got ${JSON.stringify(v)})`);
  return x;
}

export function requiredNumber(args: ParsedArgs, name: string): number {
  const x = numberOption(args, name);
  if (x === undefined) throw new UsageError(`option --${name} is required`);
  return x;
}

export function stringOption(args: ParsedArgs, name: string): string | undefined {
  const v = args.options.get(name);
  if (v === true) throw new UsageError(`option --${name} needs a value`);
  return v;
}

/**
 * Hardening: random in-process calls to every `hush` command through `main()`
 * with a recording CommandIO. Argument lists mix plausible options with what a
 * careless user or script types: numbers, extremes (0, negative, 1e308,
 * 5e-324, 1e400), NaN, Infinity, "", quantities with and without units, wrong
 * units ("5 kg"), unknown options, missing values, repeated options, flags
 * given values, `--name=value` forms and stray positionals.
 *
 * Contract checked for every call:
 *  - exit code 0: stdout is non-empty and well formed (with --json: one line of
 *    JSON whose numbers are all finite, null only where the command documents
 *    "no value"); stderr holds only notes ("hush CMD: note: …": a bare number read in
 *    its unit, a likely slip) and, for `plan`, its notes on kept columns;
 *  - exit code 2 (or 1 for `plan` when a row failed): exactly one non-empty
 *    one-line error on stderr (`plan` with code 1: one line per failed row);
 *  - never an "internal error", never NaN/Infinity/undefined in any output
 *    unless the caller typed that word; never more work than the per-call
 *    bound (tests/support/work-bound.ts: no design search at all for reflect,
 *    budget, ripple and cost; one bounded search for design; one per row for
 *    plan). Times are logged, not asserted: they belong to `npm run bench`.
 *
 * `hush plan` reads small random project tables written into a temp dir
 * (demo rows with random field substitutions, blank and ragged rows, garbage
 * files, missing files, wrong extensions, earlier outputs read back) and
 * writes its outputs only there.
 */
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import path from 'path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { OUTPUT_NAMES } from '../src/plan';
import { parseCsv, writeCsv } from '../src/plan/csv';
import { propertyRuns } from './support/property-runs';
import { DESIGN_WORK_BOUND, workMeter } from './support/work-bound';

/**
 * Random calls per quick command (reflect, budget, ripple, cost), of `hush
 * design` and of `hush plan`: 10,000 each in the full run, fewer by default
 * (tests/support/property-runs.ts; the default cases are the full run's
 * first ones). Costs per 10,000 calls measured on a quiet 2-core machine:
 * 5-7 s per quick command, 37 s for design, 65 s for plan (a call reads and
 * writes files and plans up to four rows).
 */
const RUNS = propertyRuns(2_000);
const DESIGN_RUNS = propertyRuns(1_000);
const PLAN_RUNS = propertyRuns(1_000);
/** Calls of `hush verify`, each with at most VERIFY_WORK cell updates of time-domain work. */
const VERIFY_RUNS = propertyRuns(200, 0.02);
const VERIFY_WORK = 2e6;
/** Calls with unknown commands or bare help: a tenth of the quick commands' in the full run. */
const HELP_RUNS = propertyRuns(200, 0.1);
const SEED = Number(process.env.HUSH_PROPERTY_SEED ?? 7_2025);
/** Work bound for the commands without a design search (reflect, budget, ripple, cost): none. */
const NO_SEARCH = 0;
/** Work bound for `design`: one design search. */
const ONE_SEARCH = DESIGN_WORK_BOUND;
/** Most rows in a random project table, so `plan` does at most this many searches. */
const PLAN_ROWS_MAX = 4;
/** Output bound per call: no command writes more than this many characters. */
const OUTPUT_BOUND_CHARS = 200_000;

const dir = mkdtempSync(path.join(tmpdir(), 'hush-properties-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// ---------------------------------------------------------------- recording and checks

interface Call {
  code: number;
  out: string[];
  err: string[];
  ms: number;
  /** Design work done by the call (tests/support/work-bound.ts). */
  work: number;
}

async function run(argv: string[]): Promise<Call> {
  const out: string[] = [];
  const err: string[] = [];
  const io: CommandIO = { out: (t) => out.push(t), err: (t) => err.push(t), isTTY: false };
  const meter = workMeter();
  const t0 = performance.now();
  const code = await main(argv, io);
  return { code, out, err, ms: performance.now() - t0, work: meter.used() };
}

interface Tally {
  calls: number;
  codes: Record<number, number>;
  slowestMs: number;
  /** Refusal messages by their first words (the report shows the commonest). */
  reasons: Record<string, number>;
}
const tallies: Record<string, Tally> = {};
afterAll(() => {
  const lines = Object.entries(tallies).map(
    ([k, t]) =>
      `${k}: ${t.calls} calls, exit codes ${JSON.stringify(t.codes)}, slowest ${t.slowestMs.toFixed(1)} ms; commonest refusals: ` +
      Object.entries(t.reasons)
        .sort((a, b) => b[1] - a[1])
        .slice(0, 4)
        .map(([r, n]) => `${n}× ${r}`)
        .join(' | '),
  );
  console.log(lines.join('\n'));
});

/** Words that mean a number went wrong; allowed in output only when the caller typed them. */
const FORBIDDEN = ['NaN', 'Infinity', 'undefined', '[object'];

function show(argv: string[]): string {
  return JSON.stringify(argv).slice(0, 600);
}

function allFinite(x: unknown, allowNull: (key: string) => boolean, key = ''): boolean {
  if (typeof x === 'number') return Number.isFinite(x);
  if (x === null) return allowNull(key);
  if (typeof x === 'string' || typeof x === 'boolean') return true;
  if (Array.isArray(x)) return x.every((v) => allFinite(v, allowNull, key));
  if (typeof x === 'object') return Object.entries(x as object).every(([k, v]) => allFinite(v, allowNull, k));
  return false;
}

function expectOneLineMessage(where: string, line: string): void {
  expect(line.trim().length, `${where}: empty error line`).toBeGreaterThan(0);
  expect(line, `${where}: error spans lines`).not.toMatch(/[\r\n]/);
  expect(line, `${where}: internal error`).not.toMatch(/internal error/);
}

function expectNoForbidden(where: string, text: string, typed: string): void {
  for (const w of FORBIDDEN) {
    if (!typed.includes(w)) expect(text.includes(w), `${where}: output contains ${w}: ${text.slice(0, 400)}`).toBe(false);
  }
}

/**
 * The contract of one call of a command other than `plan`. `nullable` names
 * the --json keys that may be null (a value the command documents as absent).
 */
function record(command: string, c: Call): void {
  const t = (tallies[command] ??= { calls: 0, codes: {}, slowestMs: 0, reasons: {} });
  t.calls++;
  t.codes[c.code] = (t.codes[c.code] ?? 0) + 1;
  t.slowestMs = Math.max(t.slowestMs, c.ms);
  for (const e of c.err) {
    const r = e.replace(/^hush \w+: (row \d+: )?/, '').split(/[\s(]/).slice(0, 4).join(' ');
    t.reasons[r] = (t.reasons[r] ?? 0) + 1;
  }
}

function checkCall(command: string, argv: string[], c: Call, bound: number, nullable: readonly string[] = []): void {
  const where = `hush ${show(argv)} → ${c.code}, out ${JSON.stringify(c.out).slice(0, 300)}, err ${JSON.stringify(c.err).slice(0, 300)}`;
  record(command, c);
  expect(c.work, `${where}: design work`).toBeLessThanOrEqual(bound);
  const all = [...c.out, ...c.err].join('\n');
  expect(all.length, where).toBeLessThan(OUTPUT_BOUND_CHARS);
  expectNoForbidden(where, all, argv.join(' '));
  const help = argv.includes('--help') || argv.includes('-h');
  if (c.code === 0) {
    expect(c.err.filter((l) => !/^hush \w+: note: /.test(l)), where).toEqual([]);
    expect(c.out.length, where).toBeGreaterThan(0);
    for (const line of c.out) expect(line.trim().length, where).toBeGreaterThan(0);
    if (help) {
      expect(c.out.join('\n'), where).toMatch(/^usage: hush /);
    } else if (argv.includes('--json')) {
      expect(c.out.length, where).toBe(1);
      const j: unknown = JSON.parse(c.out[0]);
      expect(typeof j === 'object' && j !== null, where).toBe(true);
      expect(allFinite(j, (k) => nullable.includes(k)), `${where}: non-finite or unexpected null`).toBe(true);
    }
    return;
  }
  expect(c.code, where).toBe(2);
  expect(c.out, where).toEqual([]);
  expect(c.err.length, `${where}: exactly one error line`).toBe(1);
  expectOneLineMessage(where, c.err[0]);
  expect(c.err[0], where).toMatch(new RegExp(`^hush ${command}: `));
}

// ---------------------------------------------------------------- argument lists

/** Values a user or a script might type, valid or not. */
const junkText = fc.oneof(
  fc.constantFrom(
    '', ' ', '0', '-0', '-1', '1', '2', '3', '1e308', '-1e308', '5e-324', '1e-300', '1e400', '-1e400', 'NaN', 'Infinity', '-Infinity',
    'nan', 'inf', '0x10', '1,5', '1%', '5 %', '5 kg', '20 nm', '1e-8', '1 ps', '3 ps', '2.4 GHz', '$2/h', 'abc', '--', '-', '.', '1e', '+2',
    ' 7 ', '2,3,4', 'x-,x+', 'z-', 'worst', 'random', 'single', 'double', '1\n2', '"', '200', '201', '90', '89.9', '1e6', '9007199254740993',
  ),
  fc.double().map(String),
  fc.integer({ min: -1000, max: 1000 }).map(String),
  fc.string({ maxLength: 6 }),
);

/**
 * A number in [min, max] as text: mostly spread evenly, sometimes any double
 * in range, sometimes written with an exponent.
 */
const numText = (min: number, max: number) =>
  fc.oneof(
    { weight: 3, arbitrary: fc.integer({ min: 0, max: 1000 }).map((i) => String(min + ((max - min) * i) / 1000)) },
    { weight: 1, arbitrary: fc.double({ min, max, noNaN: true }).map(String) },
    { weight: 1, arbitrary: fc.double({ min, max, noNaN: true }).map((x) => x.toExponential(3)) },
  );
const intText = (min: number, max: number) => fc.integer({ min, max }).map(String);
const pool = (...values: string[]) => fc.constantFrom(...values);

interface OptionGen {
  name: string;
  /** Value generator; absent for a flag. */
  value?: fc.Arbitrary<string>;
  /** Chance the option is given, 0..1. */
  presence: number;
}

type Pair = [string, string | null];

/** A mutation of a plausible argument list. */
type Mutation =
  | { kind: 'junk value'; at: number; value: string }
  | { kind: 'unknown option'; name: string; at: number }
  | { kind: 'missing value'; at: number }
  | { kind: 'repeat'; at: number }
  | { kind: 'positional'; at: number; value: string }
  | { kind: 'equals form'; at: number }
  | { kind: 'flag with value'; at: number; value: string }
  | { kind: 'drop'; at: number }
  | { kind: 'help' };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 120, arbitrary: fc.record({ kind: fc.constant('junk value' as const), at: fc.nat(), value: junkText }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('unknown option' as const), name: fc.constantFrom('--bogus', '--Layers', '--json2', '-x', '--', '---', '--=3', '--ppw-'), at: fc.nat() }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('missing value' as const), at: fc.nat() }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('repeat' as const), at: fc.nat() }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('positional' as const), at: fc.nat(), value: junkText }) },
  { weight: 40, arbitrary: fc.record({ kind: fc.constant('equals form' as const), at: fc.nat() }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('flag with value' as const), at: fc.nat(), value: junkText }) },
  { weight: 20, arbitrary: fc.record({ kind: fc.constant('drop' as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.constant({ kind: 'help' as const }) },
);

/** Flattens option pairs into argv tokens, applying the mutations. */
function tokens(pairs: Pair[], mutations: Mutation[]): string[] {
  const p = pairs.map(([n, v]): Pair => [n, v]);
  const eq = new Set<number>();
  const extra: { at: number; tokens: string[] }[] = [];
  for (const m of mutations) {
    const k = p.length ? ('at' in m ? m.at % p.length : 0) : -1;
    switch (m.kind) {
      case 'junk value':
        if (k >= 0 && p[k][1] !== null) p[k][1] = m.value;
        else extra.push({ at: m.at, tokens: [m.value] });
        break;
      case 'unknown option':
        extra.push({ at: m.at, tokens: [m.name, '1'] });
        break;
      case 'missing value':
        if (k >= 0) extra.push({ at: m.at, tokens: [p[k][0]] });
        break;
      case 'repeat':
        if (k >= 0) p.push([p[k][0], p[k][1]]);
        break;
      case 'positional':
        extra.push({ at: m.at, tokens: [m.value] });
        break;
      case 'equals form':
        if (k >= 0) eq.add(k);
        break;
      case 'flag with value':
        if (k >= 0 && p[k][1] === null) p[k][1] = m.value;
        break;
      case 'drop':
        if (k >= 0) p.splice(k, 1);
        break;
      case 'help':
        extra.push({ at: 0, tokens: ['--help'] });
        break;
    }
  }
  const out: string[][] = p.map(([n, v], i) => (v === null ? [n] : eq.has(i) ? [`${n}=${v}`] : [n, v]));
  for (const e of extra) out.splice(e.at % (out.length + 1), 0, e.tokens);
  return out.flat();
}

/** Random argument lists for one command: each option given with its chance, then 0–2 mutations. */
function argLists(options: OptionGen[]): fc.Arbitrary<string[]> {
  const one = (o: OptionGen): fc.Arbitrary<Pair | null> =>
    fc.tuple(fc.noBias(fc.integer({ min: 0, max: 999 })), o.value ?? fc.constant(null)).map(([u, v]) => (u < 1000 * o.presence ? [`--${o.name}`, v] : null));
  return fc
    .tuple(fc.tuple(...options.map(one)), fc.array(mutation, { maxLength: 2 }))
    .map(([pairs, mutations]) => tokens(pairs.filter((x): x is Pair => x !== null), mutations));
}

const params = (numRuns: number) => ({ numRuns, seed: SEED, endOnFailure: true });

// ---------------------------------------------------------------- the quick commands

const reflectArgs = argLists([
  { name: 'layers', value: fc.oneof(intText(1, 200), pool('8', '12', '200')), presence: 0.95 },
  { name: 'order', value: fc.oneof(numText(0, 10), pool('2', '3', '4')), presence: 0.95 },
  { name: 'strength', value: numText(0.05, 20), presence: 0.3 },
  { name: 'kappa-max', value: numText(1, 20), presence: 0.2 },
  { name: 'alpha-max', value: numText(0, 1e4), presence: 0.2 },
  { name: 'cell', value: fc.oneof(numText(1e-9, 1e-2), pool('1e-8', '2e-8', '0')), presence: 0.25 },
  { name: 'alpha-order', value: numText(0, 5), presence: 0.15 },
  { name: 'ppw', value: numText(2, 200), presence: 0.95 },
  { name: 'courant', value: numText(0.05, 0.6), presence: 0.3 },
  { name: 'dimensions', value: intText(0, 4), presence: 0.3 },
  { name: 'angle', value: numText(0, 95), presence: 0.3 },
  { name: 'index', value: numText(0.5, 5), presence: 0.3 },
  { name: 'json', presence: 0.5 },
]);

/** The budget either way round (each list gives the other direction's option now and then). */
const budgetOptions = (forward: boolean): OptionGen[] => [
  { name: 'intensity-error', value: fc.oneof(numText(0, 1), pool('0.01', '1e-12', '1')), presence: forward ? 0.97 : 0.05 },
  { name: 'amplitude', value: fc.oneof(numText(0, 1), pool('0.005', '1e-300')), presence: forward ? 0.05 : 0.97 },
  { name: 'coupling', value: numText(0, 1), presence: 0.3 },
  { name: 'faces-seen', value: intText(0, 7), presence: 0.3 },
  { name: 'phase', value: pool('worst', 'worst', 'random', 'random', 'Random', 'best', ''), presence: 0.3 },
  { name: 'share', value: numText(0, 1), presence: 0.3 },
  { name: 'json', presence: 0.5 },
];
const budgetArgs = fc.oneof(argLists(budgetOptions(true)), argLists(budgetOptions(false)));

/** Ripple from a reflection, or the reflection behind a ripple (each list strays into the other now and then). */
const rippleOptions = (forward: boolean): OptionGen[] => [
  { name: 'amplitude', value: fc.oneof(numText(0, 1), pool('0.01', '1')), presence: forward ? 0.97 : 0.05 },
  { name: 'distance', value: fc.oneof(numText(0, 10), pool('1e-6', '1e300')), presence: forward ? 0.95 : 0.05 },
  { name: 'peak-to-peak', value: fc.oneof(numText(0, 2), pool('0.02', '4')), presence: forward ? 0.05 : 0.97 },
  { name: 'period', value: fc.oneof(numText(0, 1e13), pool('1e12', '5e-324')), presence: forward ? 0.05 : 0.95 },
  { name: 'group-index', value: numText(0.5, 100), presence: 0.3 },
  { name: 'coupling', value: numText(0, 1), presence: 0.3 },
  { name: 'json', presence: 0.5 },
];
const rippleArgs = fc.oneof(argLists(rippleOptions(true)), argLists(rippleOptions(false)));

const cellsText = fc.oneof(
  { weight: 4, arbitrary: fc.tuple(fc.array(intText(1, 400), { minLength: 1, maxLength: 3 }), pool(',', 'x', '×', ', ')).map(([n, sep]) => n.join(sep)) },
  { weight: 1, arbitrary: fc.array(fc.oneof(intText(1, 400), pool('0', '1000000', '10000000', '1e3', '-4', '')), { minLength: 1, maxLength: 4 }).map((n) => n.join(',')) },
);
const faceListText = fc
  .subarray(['x-', 'x+', 'y-', 'y+', 'z-', 'z+', 'z+', 'x-', 'q+', 'X-'], { minLength: 1, maxLength: 4 })
  .chain((f) => pool(',', ' ', ', ').map((sep) => f.join(sep)));
/** Cost with or without a run length (the cell, Courant number and duration go together; each list strays now and then). */
const costOptions = (timed: boolean): OptionGen[] => [
  { name: 'cells', value: cellsText, presence: 0.97 },
  { name: 'layers', value: fc.oneof(intText(1, 200), pool('0', '8', '201', '1e3')), presence: 0.97 },
  { name: 'faces', value: faceListText, presence: 0.2 },
  { name: 'gap', value: fc.oneof(intText(0, 100), pool('1e6', '2.5', '-1')), presence: 0.3 },
  { name: 'precision', value: pool('single', 'double', 'double', 'half'), presence: 0.3 },
  { name: 'cell', value: pool('20 nm', '1e-8', '1 mm', '0.5 um', '20 nm', '1e-8', '5 kg', '0 nm', '1e400 m', '1e-300'), presence: timed ? 0.97 : 0.03 },
  { name: 'courant', value: numText(0.05, 0.6), presence: timed ? 0.97 : 0.03 },
  { name: 'duration', value: pool('1 ps', '400 fs', '1e-12', '20 ns', '1 ps', '1e300 s', '3 kg', '0 s', '1 h'), presence: timed ? 0.97 : 0.03 },
  { name: 'throughput', value: fc.oneof(numText(1e6, 1e10), pool('0', '1e-300', '1e308')), presence: 0.5 },
  { name: 'price', value: fc.oneof(numText(0, 10), pool('1e308', '-1')), presence: 0.4 },
  { name: 'fields-per-cell', value: intText(0, 20), presence: 0.15 },
  { name: 'material-per-cell', value: intText(0, 20), presence: 0.15 },
  { name: 'absorber-factor', value: numText(0, 5), presence: 0.15 },
  { name: 'json', presence: 0.5 },
];
const costArgs = fc.oneof(argLists(costOptions(true)), argLists(costOptions(false)));

describe('property: quick commands exit 0 with finite output or 2 with one line', () => {
  it(`hush reflect (${RUNS} calls)`, async () => {
    await fc.assert(
      fc.asyncProperty(reflectArgs, async (a) => checkCall('reflect', ['reflect', ...a], await run(['reflect', ...a]), NO_SEARCH, ['amplitude_db'])),
      params(RUNS),
    );
    expect(tallies.reflect.codes[0]).toBeGreaterThan(RUNS * 0.1);
  });

  it(`hush budget (${RUNS} calls)`, async () => {
    await fc.assert(
      fc.asyncProperty(budgetArgs, async (a) => checkCall('budget', ['budget', ...a], await run(['budget', ...a]), NO_SEARCH, ['amplitude_db'])),
      params(RUNS),
    );
    expect(tallies.budget.codes[0]).toBeGreaterThan(RUNS * 0.1);
  });

  it(`hush ripple (${RUNS} calls)`, async () => {
    await fc.assert(
      fc.asyncProperty(rippleArgs, async (a) => checkCall('ripple', ['ripple', ...a], await run(['ripple', ...a]), NO_SEARCH)),
      params(RUNS),
    );
    expect(tallies.ripple.codes[0]).toBeGreaterThan(RUNS * 0.1);
  });

  it(`hush cost (${RUNS} calls)`, async () => {
    await fc.assert(
      // "cost" is null when no --price is given (documented: runtime only).
      fc.asyncProperty(costArgs, async (a) => checkCall('cost', ['cost', ...a], await run(['cost', ...a]), NO_SEARCH, ['cost'])),
      params(RUNS),
    );
    // Fewer get through than for the other commands: a cost call has more options, each of which can be wrong.
    expect(tallies.cost.codes[0]).toBeGreaterThan(RUNS * 0.05);
  });

  it(`unknown commands and bare help (${HELP_RUNS} calls)`, async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(junkText, pool('Reflect', 'plans', 'help', '--help', '-h')), fc.array(junkText, { maxLength: 2 }), async (name, rest) => {
        const c = await run([name, ...rest]);
        const where = `hush ${show([name, ...rest])} → ${c.code} ${JSON.stringify(c.err)}`;
        if (c.code === 0) expect(c.out.join('\n'), where).toMatch(/usage/);
        else {
          expect(c.code, where).toBe(2);
          if (name === '') expect(c.out.join('\n'), where).toMatch(/usage/);
          else {
            expect(c.err.length, where).toBe(1);
            expectOneLineMessage(where, c.err[0]);
          }
        }
      }),
      params(HELP_RUNS),
    );
  });
});

// ---------------------------------------------------------------- design

/**
 * Design options drawn from small pools, so that specs repeat (the design
 * cache then answers, as it does for a user re-running a command) and the
 * calls stay cheap; junk values come from the mutations.
 */
const designArgs = argLists([
  { name: 'target', value: pool('1e-2', '1e-3', '1e-4', '1e-6', '0.05', '1e-12'), presence: 0.95 },
  { name: 'ppw-min', value: pool('6', '10', '20', '40', '4', '2'), presence: 0.95 },
  { name: 'ppw-max', value: pool('30', '60', '10'), presence: 0.25 },
  { name: 'angle-max', value: pool('0', '30', '60', '85', '89.9'), presence: 0.3 },
  { name: 'courant', value: pool('0.3', '0.5', '0.57'), presence: 0.15 },
  { name: 'dimensions', value: pool('1', '2', '3'), presence: 0.15 },
  { name: 'index', value: pool('1', '1.5', '3.48'), presence: 0.15 },
  { name: 'orders', value: pool('2,3,4', '3', '3,4', '1,2', '2.5', '0', '11'), presence: 0.15 },
  { name: 'kappa-max', value: pool('1', '3', '10'), presence: 0.1 },
  { name: 'alpha-max-norm', value: pool('0', '0.05', '0.2'), presence: 0.1 },
  { name: 'alpha-order', value: pool('1', '2'), presence: 0.1 },
  { name: 'max-layers', value: pool('10', '50', '200', '201'), presence: 0.1 },
  { name: 'all', presence: 0.3 },
  { name: 'json', presence: 0.5 },
]);

describe('property: hush design exits 0 with finite output or 2 with one line', () => {
  it(`${DESIGN_RUNS} calls`, async () => {
    await fc.assert(
      fc.asyncProperty(designArgs, async (a) => checkCall('design', ['design', ...a], await run(['design', ...a]), ONE_SEARCH, ['worst_amplitude_db', 'worst_evanescent', 'worst_evanescent_bare', 'worst_evanescent_decay_cells'])),
      params(DESIGN_RUNS),
    );
    expect(tallies.design.codes[0]).toBeGreaterThan(DESIGN_RUNS * 0.1);
  });
});

// ---------------------------------------------------------------- verify

/**
 * `hush verify` with design or absorber options from small pools, every call
 * ending in `--max-work 2e6` (after the mutations, so no mutation removes it):
 * a call runs at most 2e6 cell updates, or is refused with exit 2 before a step.
 * Exit 1 (a disagreement) is allowed only with --grid-sampling, which runs the
 * grid under another convention than the prediction's.
 */
const verifyArgs = argLists([
  { name: 'target', value: pool('1e-2', '1e-3', '1e-4', '0.05'), presence: 0.8 },
  { name: 'layers', value: pool('4', '8', '201'), presence: 0.2 },
  { name: 'order', value: pool('3', '2.5', '11'), presence: 0.2 },
  { name: 'strength', value: pool('0.5', '1'), presence: 0.1 },
  { name: 'ppw-min', value: pool('6', '10', '20', '40', '2'), presence: 0.95 },
  { name: 'ppw-max', value: pool('30', '60', '10'), presence: 0.3 },
  { name: 'angle-max', value: pool('0', '30', '60', '85'), presence: 0.3 },
  { name: 'dimensions', value: pool('1', '2', '3'), presence: 0.5 },
  { name: 'courant', value: pool('0.3', '0.5', '0.57'), presence: 0.15 },
  { name: 'index', value: pool('1', '1.5'), presence: 0.15 },
  { name: 'sampling', value: pool('node', 'average', 'offset', 'lagged', 'all'), presence: 0.2 },
  { name: 'kappa-max', value: pool('1', '3'), presence: 0.1 },
  { name: 'alpha-max-norm', value: pool('0', '0.05'), presence: 0.1 },
  { name: 'grid-sampling', value: pool('node', 'lagged', 'Average', 'x'), presence: 0.1 },
  { name: 'json', presence: 0.6 },
]);

describe('property: hush verify exits 0 with finite output, 1 only for another grid convention, or 2 with one line', () => {
  it(`${VERIFY_RUNS} calls, each bounded by --max-work ${VERIFY_WORK}`, async () => {
    await fc.assert(
      fc.asyncProperty(verifyArgs, async (a) => {
        const argv = ['verify', ...a, '--max-work', String(VERIFY_WORK)];
        const c = await run(argv);
        if (c.code === 1) expect(argv, `${show(argv)}: a disagreement without --grid-sampling`).toContain('--grid-sampling');
        checkCall('verify', argv, { ...c, code: c.code === 1 ? 0 : c.code }, ONE_SEARCH, ['predicted', 'measured', 'worst_ppw', 'worst_angle_deg']);
        if (c.code !== 2 && argv.includes('--json') && !argv.includes('--help') && !argv.includes('-h')) expect(JSON.parse(c.out[0]).cell_updates).toBeLessThanOrEqual(VERIFY_WORK);
      }),
      params(VERIFY_RUNS),
    );
    expect(tallies.verify.codes[0]).toBeGreaterThan(VERIFY_RUNS * 0.05);
  });
});

// ---------------------------------------------------------------- plan

const demoText = readFileSync(path.join(__dirname, '../assets/demo-project.csv'), 'utf8');
const demo = parseCsv(demoText);
const demoHeader = demo[0];
const bases: string[][] = demo.slice(1);

/** Plausible replacements per field, few enough that rows repeat (as the rows of a real table do). */
const alternatives: Record<string, string[]> = {
  dimensions: ['1', '2', '3', '4', ''],
  band_short: ['1310 nm', '1.55 um', '193 THz', '1550', '2.4 GHz', '5 kg', '-1 nm', ''],
  band_long: ['1600 nm', '', '200 THz'],
  index: ['1', '1.44', '3.48', '0.5'],
  index_max: ['3.48', '1'],
  cell: ['20 nm', '10 nm', '40', '1 mm', '0 nm', '1e400 m', ''],
  courant: ['0.5', '0.3', '0.7', ''],
  size_x: ['2 um', '10 um', '500', '1 km'],
  size_y: ['2 um', '', '100 m'],
  size_z: ['1 um', ''],
  cells_x: ['40', '100', '1e6', '1e7'],
  faces: ['x-, x+', 'z+', 'all', 'q+', ''],
  periodic: ['x', 'x y', 'none', 'w'],
  gap: ['0', '10', '1 wavelength', '0.3 um', '5 cells', '-3'],
  angle_max: ['0', '30', '60', '85', '89', '0.5 rad', '90'],
  intensity_error: ['1%', '0.1%', '0.02', '0.5', '0', '2', ''],
  coupling: ['0.5', '1', '0'],
  faces_seen: ['1', '2', '6', '7'],
  phase: ['worst', 'random', 'both'],
  share: ['0.5', '1', '0'],
  duration: ['1 ps', '400 fs', '1e6', '1e300 s', ''],
  passes: ['1', '10', '1e9'],
  q: ['1000', '1e6', '0'],
  ring_target: ['1e-3', '1e-6', '2'],
  ring_frequency: ['194 THz', '1e-9'],
  throughput: ['1e8', '1e9', '0', '1e-300'],
  price_per_hour: ['$2/h', '3', '2.40 EUR/h', 'free', '1e308'],
  precision: ['single', 'double', 'half'],
  nodes: ['1', '4', '64', '100000'],
  efficiency: ['0.8', '1', '0'],
  decomposition: ['slab', 'block', 'cube'],
  bandwidth: ['10 GB/s', '1', '1e-300 GB/s'],
  latency: ['2 us', '0', '1 s'],
  orders: ['3,4', '2', '11', '3'],
  kappa_max: ['1', '5', '200'],
  alpha_max: ['0', '100', '1e4'],
  fields_per_cell: ['6', '0', '12'],
  material_per_cell: ['3', '0'],
  absorber_factor: ['1.5', '0', '3'],
};
const fieldNames = Object.keys(alternatives);

const substitution = fc.tuple(fc.constantFrom(...fieldNames), fc.oneof({ weight: 4, arbitrary: fc.nat() }, { weight: 1, arbitrary: fc.constant(-1) }), junkText);

/** One table row: a demo row with 0–2 field substitutions (a new column when the demo has none), or a blank or ragged row. */
const tableRowGen = fc.tuple(fc.nat({ max: bases.length - 1 }), fc.oneof({ weight: 1, arbitrary: fc.constant([]) }, { weight: 2, arbitrary: fc.array(substitution, { minLength: 1, maxLength: 2 }) }), fc.constantFrom('row', 'row', 'row', 'row', 'row', 'row', 'row', 'row', 'row', 'row', 'blank', 'short', 'long'));

type TableKind = 'csv' | 'garbage csv' | 'unclosed quote' | 'empty' | 'header only' | 'no band_short' | 'garbage xlsx' | 'wrong extension' | 'missing' | 'directory' | 'earlier output';

const tableGen = fc.record({
  kind: fc.oneof(
    { weight: 30, arbitrary: fc.constant<TableKind>('csv') },
    { weight: 1, arbitrary: fc.constantFrom<TableKind>('garbage csv', 'unclosed quote', 'empty', 'header only', 'no band_short', 'garbage xlsx', 'wrong extension', 'missing', 'directory') },
    { weight: 2, arbitrary: fc.constant<TableKind>('earlier output') },
  ),
  rows: fc.array(tableRowGen, { minLength: 1, maxLength: PLAN_ROWS_MAX }),
  extraColumn: fc.boolean(),
  bytes: fc.uint8Array({ maxLength: 64 }),
  outKind: fc.oneof(
    { weight: 10, arbitrary: fc.constantFrom('none', 'none', 'csv', 'csv', 'json', 'json', 'xlsx', 'txt', 'no dir', 'no value') },
    { weight: 1, arbitrary: fc.constantFrom('the table itself', 'existing file') },
  ),
  replace: fc.oneof({ weight: 4, arbitrary: fc.constant(false) }, { weight: 1, arbitrary: fc.constant(true) }),
  json: fc.boolean(),
  mutations: fc.oneof(
    { weight: 4, arbitrary: fc.constant<Mutation[]>([]) },
    { weight: 1, arbitrary: fc.tuple(mutation.filter((m) => m.kind === 'positional' || m.kind === 'unknown option' || m.kind === 'repeat' || m.kind === 'help')).map((m): Mutation[] => [...m]) },
  ),
});

/** .xlsx plans written by earlier calls, read back as project tables. */
const earlier: { file: string; typed: string }[] = [];
let fileCounter = 0;

/** Writes the table of one call; returns its path and the text a user could have typed (for the forbidden-word check). */
type TableCase = typeof tableGen extends fc.Arbitrary<infer T> ? T : never;

function writeTableFile(t: TableCase): { file: string; typed: string; header: string[] | null } {
  const n = fileCounter++;
  const base = path.join(dir, `t${n}`);
  switch (t.kind) {
    case 'garbage csv':
      writeFileSync(`${base}.csv`, Buffer.from(t.bytes));
      return { file: `${base}.csv`, typed: Buffer.from(t.bytes).toString('utf8'), header: null };
    case 'unclosed quote':
      writeFileSync(`${base}.csv`, `${demoHeader.join(',')}\n"Tidewater,2,1500 nm\n`);
      return { file: `${base}.csv`, typed: '', header: null };
    case 'empty':
      writeFileSync(`${base}.csv`, '');
      return { file: `${base}.csv`, typed: '', header: null };
    case 'garbage xlsx':
      writeFileSync(`${base}.xlsx`, Buffer.from(t.bytes));
      return { file: `${base}.xlsx`, typed: '', header: null };
    case 'wrong extension':
      writeFileSync(`${base}.txt`, demoText);
      return { file: `${base}.txt`, typed: '', header: null };
    case 'missing':
      return { file: `${base}-missing.csv`, typed: '', header: null };
    case 'directory':
      mkdirSync(`${base}.csv`);
      return { file: `${base}.csv`, typed: '', header: null };
    case 'earlier output':
      if (earlier.length) return { ...earlier[n % earlier.length], header: null };
      break;
    default:
      break;
  }
  const header = demoHeader.slice();
  if (t.extraColumn) header.push('owner');
  const rows: string[][] = [];
  for (const [b, subs, form] of t.rows) {
    if (form === 'blank') {
      rows.push(header.map(() => ''));
      continue;
    }
    const values = bases[b].slice();
    if (t.extraColumn) values.push('lab');
    for (const [field, pick, wild] of subs) {
      const alts = alternatives[field];
      const value = pick < 0 ? wild : alts[pick % alts.length];
      const k = header.indexOf(field);
      if (k < 0) {
        // A column the demo lacks: added to the header, blank in the other rows.
        header.push(field);
        rows.forEach((r) => r.push(''));
        values.push(value);
      } else values[k] = value;
    }
    rows.push(form === 'short' ? values.slice(0, 5) : form === 'long' ? [...values, 'stray'] : values);
  }
  for (const r of rows) while (r.length < header.length && r.length > 5) r.push('');
  if (t.kind === 'no band_short') {
    const k = header.indexOf('band_short');
    header.splice(k, 1);
    rows.forEach((r) => r.splice(k, 1));
  }
  const lines = t.kind === 'header only' ? [header] : [header, ...rows];
  const text = writeCsv(lines);
  writeFileSync(`${base}.csv`, text);
  return { file: `${base}.csv`, typed: text, header };
}

/**
 * Output columns that may be empty (null in JSON) in a planned row: the run, runtime, cost and halo figures,
 * the dispersion and resonance figures of studies without them, and the dB value of a continuous-theory |r| that underflows to 0.
 */
const OPTIONAL_OUTPUTS = new Set([
  'time_step', 'simulated_time', 'steps', 'runtime', 'runtime_interior', 'runtime_absorber', 'runtime_exchange', 'absorber_share', 'cost', 'halo_per_step',
  'ppw_min', 'resonance_shift', 'cost_absorber', 'cost_refinement', 'saving', 'continuous_reflection_db', 'worst_evanescent',
]);
/** Columns that are given together or not at all (a NaN turned into null by JSON would break a group). */
const GROUPS = [
  ['time_step', 'simulated_time', 'steps'],
  ['runtime', 'runtime_interior', 'runtime_absorber', 'runtime_exchange', 'absorber_share'],
];

/** Checks one row of the plan's JSON (stdout --json or the --out .json file). */
function checkPlannedRow(where: string, r: { failed: boolean; outputs: Record<string, unknown> | null }): void {
  if (r.outputs === null) {
    expect(r.failed, where).toBe(false);
    return;
  }
  expect(Object.keys(r.outputs), where).toEqual([...OUTPUT_NAMES]);
  for (const [k, v] of Object.entries(r.outputs)) {
    if (r.failed) {
      if (k === 'notes') expect(String(v), where).toMatch(/^error: \S/);
      else if (k !== 'model_version') expect(v, `${where}: ${k} of a failed row`).toBe(null);
      continue;
    }
    if (v === null) expect(OPTIONAL_OUTPUTS.has(k), `${where}: ${k} is null`).toBe(true);
    else if (typeof v === 'number') expect(Number.isFinite(v), `${where}: ${k} = ${v}`).toBe(true);
    else expect(typeof v, `${where}: ${k}`).toBe('string');
  }
  if (!r.failed) {
    for (const g of GROUPS) {
      const given = g.map((k) => r.outputs![k] !== null);
      expect(new Set(given).size, `${where}: ${g.join(', ')} not given together`).toBe(1);
    }
    if (r.outputs.cost !== null) expect(r.outputs.runtime, `${where}: cost without runtime`).not.toBe(null);
  }
}

/** Notes `hush plan` writes to stderr whatever the exit code. */
const PLAN_NOTE = /^hush plan: (columns kept as they are \(not plan fields\): |the table has no band_short column; every row will fail$)/;

function checkPlanCall(argv: string[], typed: string, out: string | null, c: Call): void {
  const where = `hush ${show(argv)} → ${c.code}, out ${JSON.stringify(c.out).slice(0, 400)}, err ${JSON.stringify(c.err).slice(0, 400)}`;
  record('plan', c);
  expect(c.work, `${where}: design work`).toBeLessThanOrEqual(PLAN_ROWS_MAX * DESIGN_WORK_BOUND);
  const all = [...c.out, ...c.err].join('\n');
  expect(all.length, where).toBeLessThan(OUTPUT_BOUND_CHARS);
  expectNoForbidden(where, all, argv.join(' ') + typed);
  for (const line of c.err) expectOneLineMessage(where, line);
  const errors = c.err.filter((l) => !PLAN_NOTE.test(l));
  if (argv.includes('--help') || argv.includes('-h')) {
    expect(c.code, where).toBe(0);
    return;
  }
  if (c.code === 2) {
    expect(errors.length, `${where}: exactly one error line`).toBe(1);
    expect(errors[0], where).toMatch(/^hush plan: /);
    return;
  }
  expect([0, 1], where).toContain(c.code);
  const rowErrors = errors.filter((l) => /^hush plan: row \d+: \S/.test(l));
  expect(rowErrors.length, `${where}: only row errors besides the notes`).toBe(errors.length);
  expect(rowErrors.length > 0, where).toBe(c.code === 1);
  let rows: { failed: boolean; outputs: Record<string, unknown> | null }[] | null = null;
  if (argv.includes('--json')) {
    expect(c.out.length, where).toBe(1);
    rows = JSON.parse(c.out[0]);
  } else {
    expect(c.out.length, where).toBeGreaterThan(1);
    expect(c.out.at(out === null ? -1 : -2), where).toMatch(/^\d+ planned, \d+ failed; runtime and cost are planning estimates/);
  }
  if (out !== null) {
    expect(existsSync(out), `${where}: ${out} written`).toBe(true);
    if (out.endsWith('.json')) {
      const j = JSON.parse(readFileSync(out, 'utf8'));
      rows ??= j.rows;
      expect(j.rows.length, where).toBe(rows!.length);
      j.rows.forEach((r: { failed: boolean; outputs: Record<string, unknown> | null }) => checkPlannedRow(`${where} (file)`, r));
    } else if (out.endsWith('.csv')) {
      const table = parseCsv(readFileSync(out, 'utf8'));
      expect(table[0].slice(-OUTPUT_NAMES.length).map((h) => h.replace(/ \[.*\]$/, '')), where).toEqual([...OUTPUT_NAMES]);
      expectNoForbidden(`${where} (file)`, table.flat().join('\n'), typed);
    } else if (out.endsWith('.xlsx')) earlier.push({ file: out, typed });
  }
  if (rows) {
    rows.forEach((r) => checkPlannedRow(where, r));
    expect(rows.filter((r) => r.failed).length, where).toBe(rowErrors.length);
  }
}

describe('property: hush plan exits 0, or 1 with one line per failed row, or 2 with one line', () => {
  it(`${PLAN_RUNS} calls on random project tables in a temp dir`, async () => {
    await fc.assert(
      fc.asyncProperty(tableGen, async (t) => {
        const { file, typed } = writeTableFile(t);
        const n = fileCounter++;
        const outFile =
          t.outKind === 'none' || t.outKind === 'no value'
            ? null
            : t.outKind === 'no dir'
              ? path.join(dir, 'no-such-dir', `o${n}.csv`)
              : t.outKind === 'the table itself'
                ? file
                : t.outKind === 'existing file'
                  ? path.join(dir, `o${n}.csv`)
                  : path.join(dir, `o${n}.${t.outKind}`);
        // A file the user wrote, which only --replace may overwrite.
        const sentinel = `kept,as typed\r\n${n},x\r\n`;
        if (t.outKind === 'existing file') writeFileSync(outFile!, sentinel);
        const before = existsSync(file) && !statSync(file).isDirectory() ? readFileSync(file) : null;
        const pairs: Pair[] = [];
        if (outFile !== null) pairs.push(['--out', outFile]);
        if (t.outKind === 'no value') pairs.push(['--out', null]);
        if (t.replace) pairs.push(['--replace', null]);
        if (t.json) pairs.push(['--json', null]);
        const argv = ['plan', file, ...tokens(pairs, t.mutations)];
        const c = await run(argv);
        const where = `hush ${show(argv)} → ${c.code}, err ${JSON.stringify(c.err).slice(0, 300)}`;
        // The project table is never written, whatever the arguments.
        if (before !== null) expect(readFileSync(file).equals(before), `${where}: the project table changed`).toBe(true);
        if (t.outKind === 'the table itself' && !argv.includes('--help') && !argv.includes('-h')) expect(c.code, where).toBe(2);
        if (t.outKind === 'existing file' && !argv.includes('--replace')) expect(readFileSync(outFile!, 'utf8'), `${where}: an existing file was overwritten without --replace`).toBe(sentinel);
        const written = c.code !== 2 && outFile !== null && !outFile.endsWith('.txt') && outFile !== file ? outFile : null;
        checkPlanCall(argv, typed, written, c);
      }),
      params(PLAN_RUNS),
    );
    expect(tallies.plan.codes[0]).toBeGreaterThan(PLAN_RUNS * 0.15);
    expect(tallies.plan.codes[1]).toBeGreaterThan(PLAN_RUNS * 0.05);
  });
});

// ---------------------------------------------------------------- regressions

/** Calls these properties found misbehaving (each fixed; the expected messages are the fixed ones). */
describe('regressions found by the CLI properties', () => {
  const refused = async (argv: string[], message: RegExp) => {
    const c = await run(argv);
    expect(c.code).toBe(2);
    expect(c.err.length).toBe(1);
    expect(c.err[0]).toMatch(message);
    expect(c.err[0]).not.toMatch(/Infinity|NaN|[\r\n]/);
  };
  it('a negative or overflowing --alpha-max is refused in S/m, not as a normalised -Infinity', async () => {
    await refused(['reflect', '--layers', '8', '--order', '3', '--ppw', '20', '--alpha-max', '-1e308', '--cell', '1e-8'], /alpha_max must be at least 0 S\/m \(got -1e308\)/);
    await refused(['reflect', '--layers', '8', '--order', '3', '--ppw', '20', '--alpha-max', '1e308', '--cell', '0.01', '--index', '4'], /alpha_max .* is out of range/);
  });
  it('a quantity that overflows ("1e400 m", "1e308 km", bare 1e400) is refused with the text typed', async () => {
    await refused(['cost', '--cells', '10', '--layers', '2', '--cell', '1e400 m', '--courant', '0.5', '--duration', '1 ps'], /cell is out of range \(got "1e400 m"\)/);
    await refused(['cost', '--cells', '10', '--layers', '2', '--cell', '1e308 km', '--courant', '0.5', '--duration', '1 ps'], /cell is out of range \(got "1e308 km"\)/);
  });
  it('a run of more than 2^53 - 1 steps is refused (a 1e-300 m cell gave 1.5e301 steps and an infinite runtime, shown as null)', async () => {
    // The cell itself is now refused below 1e-15 m; at that size 20 ns still needs more than 2^53 - 1 steps.
    await refused(
      ['cost', '--cells', '24,358', '--layers', '5', '--cell', '1e-300', '--courant', '0.4', '--duration', '20 ns', '--throughput', '2e7', '--json'],
      /cell must be a number from 1e-6 nm to 1e\+9 nm \(got 1e-300\)/,
    );
    await refused(
      ['cost', '--cells', '24,358', '--layers', '5', '--cell', '1e-15 m', '--courant', '0.4', '--duration', '20 ns', '--throughput', '2e7', '--json'],
      /the run needs 1\.499e\+16 time steps .* more than 9007199254740991/,
    );
  });
  it('a line break in a value stays on one line of stderr', async () => {
    await refused(['cost', '--cells', '10', '--layers', '2', '--cell', '1\n2', '--courant', '0.5', '--duration', '1 ps'], /cell must be a length such as 20 nm or 0\.02 um \(got "1\\n2"\)/);
  });
  it('an alpha_max whose normalised value overflows fails its row in S/m, not as a normalised Infinity', async () => {
    const file = path.join(dir, 'regression-alpha.csv');
    writeFileSync(file, writeCsv([demoHeader, bases[0].map((v, k) => (demoHeader[k] === 'alpha_max' ? '1e308' : v))]));
    const c = await run(['plan', file]);
    expect(c.code).toBe(1);
    expect(c.err).toEqual(['hush plan: row 2: alpha_max 1e+308 S/m is out of range for a 2e-8 m cell at index 1.44 (α·η₀·Δ·n overflows)']);
  });
  it('a table cell "-1e400" fails its row quoting the text, not as -Infinity', async () => {
    const file = path.join(dir, 'regression-1e400.csv');
    writeFileSync(file, writeCsv([demoHeader, bases[0].map((v, k) => (demoHeader[k] === 'index_max' ? '-1e400' : v))]));
    const c = await run(['plan', file]);
    expect(c.code).toBe(1);
    expect(c.err).toEqual(['hush plan: row 2: index_max is out of range (got -1e400)']);
  });
});

describe('regressions found by the CLI properties (ring-down)', () => {
  it('a ring_target of 5e-324 rings down in finite time (1/5e-324 overflowed to an infinite duration)', async () => {
    const file = path.join(dir, 'regression-ring-target.csv');
    const k = demoHeader.indexOf('ring_target');
    // Demo row 2 (high-Q ring) with the smallest positive double as its target: ln(1/δ) = −ln δ ≈ 744.4 (derived).
    writeFileSync(file, writeCsv([demoHeader, bases[1].map((v, j) => (j === k ? '5e-324' : v))]));
    const c = await run(['plan', file, '--json']);
    expect(c.err).toEqual([]);
    expect(c.code).toBe(0);
    const [row] = JSON.parse(c.out[0]);
    expect(row.failed).toBe(false);
    expect(Number.isFinite(row.outputs.steps)).toBe(true);
  });
});

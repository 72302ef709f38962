/**
 * The field registry (src/plan/fields) is the one definition of every input:
 * these tests walk it and check that the project table, the worksheet
 * functions and the command line read each field the same way (same value,
 * same error), that every front end's arguments are registry fields, and
 * that the generated documentation has not drifted.
 *
 * Unit conversions are checked against the SI definitions of the prefixes
 * and units (BIPM, The International System of Units, 9th ed., 2019), dB
 * against 20·log₁₀|r| for an amplitude (common practice in the absorber
 * literature).
 */
import { readFileSync } from 'fs';
import { describe, expect, it } from 'vitest';
import { INPUTS, TABLE_FIELDS, inputColumn, readInput, type InputField } from '../src/plan/fields';
import { planRow, rowFromTable } from '../src/plan';
import { arg } from '../src/functions/args';
import { Options } from '../src/cli/options';
import { reflectSpec } from '../src/cli/reflect';
import { budgetSpec } from '../src/cli/budget';
import { designSpec } from '../src/cli/design';
import { rippleSpec } from '../src/cli/ripple';
import { costSpec } from '../src/cli/cost';
import { nonRegistryParams, syncParams, syncReadme, FUNCTIONS_FILE, README_FILE } from '../scripts/docs';
import { installCustomFunctionsStub } from './support/custom-functions-stub';

installCustomFunctionsStub();

/** Typed values of each kind: accepted forms, slips and refusals, as people type them. */
const SAMPLES: Record<string, unknown[]> = {
  text: ['Ring A', '  spaced  '],
  count: [3, '3', ' 2 ', 2.5, 'x', 0, 1e9],
  number: [1.44, '1.44', '1e-3', 'x', '1,5', '1e400', -1],
  fraction: [0.01, '1%', '1 %', '0.5', 'half', 0, 2, '150%'],
  reflection: [0.001, '0.1%', '-60 dB', '-60dB', '60 dB', 'x', 1, 0],
  length: ['20 nm', '0.02 um', '0.02 µm', '20NM', '200 Å', '0.02 micron', 20, '20 kg', '-3 nm', '3 parsecs', '1e400 m'],
  wavelength: ['1550 nm', '193 THz', '193 thz', '1.55 um', 1550, '5 kg', '0 nm'],
  time: ['3 ps', '500 fs', 500, '3 nm', '2.5 h', '-1 ps'],
  frequency: ['1.5 GHz', '1.5 ghz', '194 THz', 194, '3 m'],
  angle: ['30°', '30 °', '30 deg', '0.5 rad', 30, '30 kg', '-5 deg', 89],
  bandwidth: ['10 GB/s', '10 Gb/s', 12.5, '10 GB'],
  conductivity: ['0.05 S/m', 0.05, '5 kg', -1],
  choice: ['WORST', 'Random', 'single', 'Double', 'slab', 'BLOCK', 'neither'],
  numbers: ['2,3,4', '2 3', 3, '2,x'],
  counts: ['200,200,100', '10x20', '1.5,2'],
  faces: ['x-, X+', 'z+'],
  axes: ['x y', 'Z'],
  price: ['$2.50/h', 3, '2.40 EUR/h', 'cheap'],
  gap: [5, '5 cells', '0.5 wavelengths', '300 nm', '2 s'],
  path: [3, '3 wavelengths', '12 um', '5 cells', '2 s', -1],
};

type Outcome = { value: unknown } | { error: string };

function outcome(f: () => unknown): Outcome {
  try {
    return { value: f() };
  } catch (e) {
    return { error: e instanceof Error ? e.message : String(e) };
  }
}

/** The three front ends' readings of one typed value of field `f`. */
function throughEveryFrontEnd(f: InputField, v: unknown): { table: Outcome; worksheet: Outcome; cli: Outcome } {
  // Step arguments (one reflection, one design) are not table columns: their reference is the registry's own reading.
  const table = outcome(() => (f.table ? readInput(f.name, rowFromTable([f.name], [v as string | number])[f.name]) : readInput(f.name, v)));
  const worksheet = outcome(() => arg(f.name, v));
  const cli = outcome(() => new Options({ name: 'walk', summary: '', fields: [f.name] }, [`--${f.flag}`, String(v)]).get(f.name));
  return { table, worksheet, cli };
}

describe('one definition per field: the table, the worksheet and the command line agree', () => {
  for (const f of INPUTS) {
    it(`${f.name} (${f.kind})`, () => {
      const samples = (SAMPLES[f.kind] ?? []).filter((v) => f.kind !== 'choice' || (f.choices ?? []).some((c) => String(v).toLowerCase() === c) || v === 'neither');
      expect(samples.length, `samples for kind ${f.kind}`).toBeGreaterThan(0);
      for (const v of samples) {
        const r = throughEveryFrontEnd(f, v);
        expect(r.worksheet, `${f.name} = ${JSON.stringify(v)} in a worksheet`).toEqual(r.table);
        expect(r.cli, `${f.name} = ${JSON.stringify(v)} on the command line`).toEqual(r.table);
        // Never NaN, never a silent non-finite value.
        if ('value' in r.table && typeof r.table.value === 'number') expect(Number.isFinite(r.table.value)).toBe(true);
        // An error names the field.
        if ('error' in r.table) expect(r.table.error.startsWith(f.name), r.table.error).toBe(true);
      }
    });
  }
});

describe('units the same everywhere (SI definitions)', () => {
  it('lengths: nm, um, µm, micron, Å and any letter case', () => {
    for (const t of ['20 nm', '0.02 um', '0.02 µm', '0.02 micron', '200 Å', '20 NM', 20]) expect(readInput('cell', t)).toBe(2e-8);
  });
  it('angles: °, deg, rad', () => {
    expect(readInput('angle', '30°')).toBe(30);
    expect(readInput('angle', '30 deg')).toBe(30);
    // Quantities keep 12 significant digits (src/plan/units.ts).
    expect(readInput('angle', '0.5 rad')).toBe(Number(((0.5 * 180) / Math.PI).toPrecision(12)));
  });
  it('reflections in dB: -60 dB = 10^(−60/20) = 0.001; a positive dB figure is refused with a hint', () => {
    expect(readInput('target', '-60 dB')).toBeCloseTo(1e-3, 15);
    expect(readInput('amplitude', '-40dB')).toBeCloseTo(1e-2, 15);
    expect(() => readInput('target', '60 dB')).toThrow(/did you mean −60 dB/);
  });
  it('percentages: 1% = 0.01', () => {
    expect(readInput('intensity_error', '1%')).toBe(0.01);
    expect(readInput('target', '0.1%')).toBe(0.001);
  });
  it('messages name the field, the unit expected and what was typed, never the parser', () => {
    expect(() => readInput('cell', '20 kg')).toThrow('cell must be a length such as 20 nm or 0.02 um (got "20 kg")');
    expect(() => readInput('cell', '3 parsecs')).toThrow('cell must be a length such as 20 nm or 0.02 um (got "3 parsecs")');
    expect(() => readInput('duration', '3 nm')).toThrow('duration must be a time such as 500 fs or 3 ps (got "3 nm")');
  });
  it('a bare tolerance above 0.1 is read as it is but noted (0.5 is 50 %)', () => {
    const notes: string[] = [];
    expect(readInput('intensity_error', 0.5, { notes })).toBe(0.5);
    expect(notes).toEqual(['intensity_error 0.5 read as 50 %; write 0.5% for 0.5 percent']);
    const none: string[] = [];
    readInput('intensity_error', '50%', { notes: none });
    expect(none).toEqual([]);
  });
});

describe('table headers with units', () => {
  const base = {
    study: 'header units',
    dimensions: 1,
    band_short: '1550 nm',
    cells_x: 200,
    intensity_error: '1%',
    duration: '1 ps',
  };
  it('cell [um] with 0.02 plans exactly as 20 nm (the same steps)', () => {
    const header = [...Object.keys(base), 'cell [um]'];
    const fromHeader = planRow(rowFromTable(header, [...Object.values(base), 0.02] as (string | number)[]));
    const typed = planRow({ ...base, cell: '20 nm' });
    expect(fromHeader.cost.time?.steps).toBe(typed.cost.time?.steps);
    expect(fromHeader.inputs.cell).toBe(2e-8);
  });
  it('a header unit that contradicts the field fails that column only, naming it', () => {
    expect(inputColumn('cell [kg]')?.problem).toMatch(/column "cell \[kg\]": \[kg\] is not a unit of a length/);
    const row = rowFromTable([...Object.keys(base), 'cell [kg]'], [...Object.values(base), 20] as (string | number)[]);
    expect(() => planRow(row)).toThrow(/\[kg\] is not a unit of a length/);
    // The other fields are still read: with the cell typed in its own cell the same header fails only there.
    expect(row.band_short).toBe('1550 nm');
  });
  it('descriptive brackets on plain fields are fine; a physical unit on them is not', () => {
    expect(inputColumn('throughput [cell updates/s]')?.problem).toBeUndefined();
    expect(inputColumn('index [-]')?.problem).toBeUndefined();
    expect(inputColumn('passes [fs]')?.problem).toMatch(/plain number/);
    expect(inputColumn('intensity_error [%]')?.unit).toBe('%');
  });
  it('a field named by two columns is an error naming both', () => {
    const row = rowFromTable(['intensity_error', 'cell', 'Intensity_Error [%]'], ['1%', '20 nm', 10]);
    expect(() => readInput('intensity_error', row.intensity_error)).toThrow();
    expect(row.intensity_error).toEqual({ problem: 'intensity_error appears in columns A and C; keep one of them' });
  });
});

describe('every front end takes its arguments from the registry', () => {
  const names = new Set(INPUTS.map((f) => f.name));
  it('command options are registry fields, and each --help line states the default', () => {
    for (const spec of [reflectSpec, budgetSpec, designSpec, rippleSpec, costSpec]) {
      for (const f of spec.fields) expect(names.has(f), `hush ${spec.name} --${f}`).toBe(true);
    }
  });
  it('worksheet parameters are registry fields, except the ranges and rows that hold several values', () => {
    const source = readFileSync(FUNCTIONS_FILE, 'utf8');
    expect(nonRegistryParams(source).sort()).toEqual(['angles', 'header', 'ppw_list', 'row']);
  });
  it('the functions’ @param lines and the README field table match the registry (npx tsx scripts/docs.ts regenerates them)', () => {
    const source = readFileSync(FUNCTIONS_FILE, 'utf8');
    expect(syncParams(source)).toBe(source);
    const readme = readFileSync(README_FILE, 'utf8');
    expect(syncReadme(readme)).toBe(readme);
  });
  it('every table field is documented once, with a default', () => {
    for (const f of TABLE_FIELDS) expect(f.defaultText.length, f.name).toBeGreaterThan(0);
    expect(new Set(TABLE_FIELDS.map((f) => f.name)).size).toBe(TABLE_FIELDS.length);
  });
});


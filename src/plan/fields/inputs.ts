/**
 * The input fields: each one defined once — its name (the project table's
 * column, the worksheet parameter and, with hyphens, the command-line flag),
 * its kind and unit, its default, its allowed range and what it means. The
 * table reader, every worksheet function's argument reading, every command's
 * options and help, the README's field table and the plan workbook's notes
 * sheet are generated from this list or checked against it
 * (tests/fields.test.ts).
 *
 * Units: a bare number is in the field's unit, the same in the table, the
 * worksheet and on the command line; text may carry any unit of the field's
 * dimension ("20 nm", "0.02 um", "193 THz", "3 ps", "30°"); a table header may
 * state the unit of its column's bare numbers ("cell [um]").
 */
import { MAX_ALPHA_NORM, MAX_KAPPA, MAX_LAYERS, MAX_ORDER, MAX_STRENGTH, MIN_CELL_METRES } from '../../physics/constants';
import { MIN_COURANT } from '../../physics/courant';
import { MAX_COUPLING, MAX_INTENSITY_ERROR, MIN_FRACTION, MIN_INTENSITY_ERROR } from '../../physics/budget';
import { MAX_DESIGN_ANGLE_DEG } from '../../physics/design';
import { MAX_PPW } from '../../physics/dispersion';
import { MAX_PATH_WAVELENGTHS } from '../../physics/dispersion-error';
import { MAX_AXIS_CELLS } from '../../physics/domain';
import { DEFAULT_ABSORBER_FACTOR, DEFAULT_RING_TARGET, MAX_NODES } from '../../physics/cost';
import { MAX_QUALITY_FACTOR } from '../../physics/ringdown';
import {
  DEFAULT_COURANT_FRACTION,
  DEFAULT_ORDERS,
  MAX_ABSORBER_FACTOR,
  MAX_BANDWIDTH,
  MAX_FACES_SEEN,
  MAX_INDEX,
  MAX_LATENCY_SECONDS,
  MAX_PASSES,
  MAX_PRICE_PER_HOUR,
  MAX_RIPPLE_DISTANCE,
  MAX_RIPPLE_PEAK_TO_PEAK,
  MAX_RIPPLE_PERIOD,
  MAX_THROUGHPUT,
  MAX_VALUES_PER_CELL,
  MIN_ABSORBER_FACTOR,
  MIN_BANDWIDTH,
  MIN_DESIGN_ORDER,
  MIN_EFFICIENCY,
  MIN_RIPPLE_DISTANCE,
  MIN_RIPPLE_PERIOD,
  MIN_THROUGHPUT,
} from '../../physics/limits';
import type { FieldShape, Kind, Range } from './kinds';

/** One input field. */
export interface InputField extends FieldShape {
  /** What the field is, in one line (help texts, the notes sheet, the README). */
  description: string;
  /** The default as stated to users: "required", a value, or how it is derived ("band_short"). */
  defaultText: string;
  /** A column of the project table (other fields are arguments of single steps: one reflection, one design, a ripple). */
  table: boolean;
  /** Command-line option, without the leading "--". */
  flag: string;
  /** Worksheet parameter name. */
  param: string;
  /** Other command-line spellings accepted for the same field (kept from earlier versions). */
  aliases?: readonly string[];
  /** Placeholder in usage lines (LENGTH, R, N…). */
  placeholder: string;
  /** A note for a likely slip (a bare 0.5 read as 50 %, say), or null. */
  slip?: (value: number, bare: boolean) => string | null;
}

type Spec = Omit<InputField, 'flag' | 'param' | 'placeholder' | 'unit' | 'table'> & {
  unit?: string;
  table?: boolean;
  flag?: string;
  param?: string;
  placeholder?: string;
};

const PLACEHOLDERS: Partial<Record<Kind, string>> = {
  length: 'LENGTH',
  time: 'TIME',
  frequency: 'FREQUENCY',
  wavelength: 'WAVELENGTH',
  angle: 'ANGLE',
  bandwidth: 'RATE',
  conductivity: 'S/m',
  fraction: 'F',
  reflection: 'R',
  count: 'N',
  counts: 'N,N,N',
  numbers: 'LIST',
  faces: 'FACES',
  axes: 'AXES',
  price: 'PRICE',
  gap: 'GAP',
  text: 'TEXT',
};

function field(s: Spec): InputField {
  return {
    ...s,
    unit: s.unit ?? '',
    table: s.table ?? false,
    flag: s.flag ?? s.name.replace(/_/g, '-'),
    param: s.param ?? s.name,
    placeholder: s.placeholder ?? (s.choices ? s.choices.join('|') : (PLACEHOLDERS[s.kind] ?? 'X')),
  };
}

const NM = { factor: 1e-9, unit: 'nm' };

/** Why a design stops at MAX_DESIGN_ANGLE_DEG (the core's reason, physics.md §2: the attenuation scales with cos θ). */
const GRAZING_HINT = `near grazing incidence every PML reflects almost fully (its attenuation scales with cos θ), so no layer count helps; move the absorber farther from sources of grazing waves or limit the angle to ${MAX_DESIGN_ANGLE_DEG}°`;
const positive: Range = { min: 0, minOpen: true };
const fractionRange: Range = { min: MIN_FRACTION, max: 1 };
const indexRange: Range = { min: 1, max: MAX_INDEX };

/** Most values along one side of a sweep (hush sweep): a 500 × 500 table of exact reflections is a few seconds of work. */
export const MAX_SWEEP_POINTS = 500;

/** Bare tolerances above this are read as they are but noted: 0.5 is 50 %, and half a percent is more often meant. */
export const TOLERANCE_SLIP = 0.1;

function toleranceSlip(name: string) {
  return (x: number, bare: boolean): string | null =>
    bare && x > TOLERANCE_SLIP ? `${name} ${x} read as ${Number((x * 100).toPrecision(12))} %; write ${x}% for ${x} percent` : null;
}

const axisSize = (a: string) =>
  field({ name: `size_${a}`, kind: 'length', unit: 'nm', range: positive, show: NM, defaultText: `required unless cells_${a} is given (in ${a === 'x' ? '1' : a === 'y' ? '2' : '3'}-D and up)`, description: `structure size along ${a} (the region inside the absorbers)`, table: true });
const axisCells = (a: string) =>
  field({ name: `cells_${a}`, kind: 'count', range: { min: 1, max: MAX_AXIS_CELLS }, defaultText: `instead of size_${a}`, description: `structure size along ${a} in cells`, table: true });

/** Every input field, in the order of the project table. */
export const INPUTS: readonly InputField[] = [
  field({ name: 'study', kind: 'text', defaultText: 'the row number', description: 'name of the study', table: true }),
  field({ name: 'dimensions', kind: 'count', range: { min: 1, max: 3 }, defaultText: '3', description: 'grid dimensions (1, 2 or 3)', table: true }),
  field({ name: 'band_short', kind: 'wavelength', unit: 'nm', show: NM, defaultText: 'required', description: 'one end of the band: vacuum wavelength or frequency', table: true }),
  field({ name: 'band_long', kind: 'wavelength', unit: 'nm', show: NM, defaultText: 'band_short (one frequency)', description: 'the other end of the band (order does not matter)', table: true }),
  field({ name: 'index', kind: 'number', range: indexRange, defaultText: '1', description: 'background refractive index at the absorber', table: true }),
  field({ name: 'index_max', kind: 'number', range: indexRange, defaultText: 'index', description: 'index of the densest material (resolution check)', table: true }),
  field({ name: 'cell', kind: 'length', unit: 'nm', range: { min: MIN_CELL_METRES, max: 1 }, show: NM, defaultText: 'required', description: 'cell size Δ', table: true }),
  field({ name: 'courant', kind: 'number', range: { min: MIN_COURANT, max: 1 }, defaultText: `${DEFAULT_COURANT_FRACTION}/√dimensions`, description: 'vacuum Courant number S = cΔt/Δ (at most 1/√dimensions)', table: true }),
  axisSize('x'),
  axisSize('y'),
  axisSize('z'),
  axisCells('x'),
  axisCells('y'),
  axisCells('z'),
  field({ name: 'faces', kind: 'faces', defaultText: 'all faces not periodic', description: 'absorbing faces, e.g. "x-, x+, z+" (others carry no absorber)', table: true }),
  field({ name: 'periodic', kind: 'axes', defaultText: 'none', description: 'periodic axes, e.g. "x y" (no absorber there)', table: true }),
  field({ name: 'gap', kind: 'gap', unit: 'cells', defaultText: 'blank: the structure size includes its clearance', description: 'structure-to-absorber gap: cells, "0.5 wavelengths" or a length', table: true }),
  field({ name: 'angle_max', kind: 'angle', unit: 'deg', range: { min: 0, max: MAX_DESIGN_ANGLE_DEG }, rangeHint: GRAZING_HINT, defaultText: '0', description: 'largest angle of incidence on the absorber', table: true }),
  field({
    name: 'intensity_error',
    kind: 'fraction',
    range: { min: MIN_INTENSITY_ERROR, max: MAX_INTENSITY_ERROR },
    defaultText: 'required',
    description: 'tolerated relative intensity error at the monitor',
    table: true,
    slip: toleranceSlip('intensity_error'),
  }),
  field({ name: 'coupling', kind: 'fraction', range: { min: MIN_FRACTION, max: MAX_COUPLING }, defaultText: '1', description: 'echo amplitude at the monitor relative to the echo leaving the face (above 1 only where a resonance builds it up)', table: true }),
  field({ name: 'faces_seen', kind: 'count', range: { min: 1, max: MAX_FACES_SEEN }, defaultText: '1', description: 'number of absorbing faces whose echoes reach the monitor', table: true }),
  field({ name: 'phase', kind: 'choice', choices: ['worst', 'random'], defaultText: 'worst', description: 'how echo phases combine: worst means in phase, random an RMS error', table: true }),
  field({ name: 'monitor', kind: 'choice', choices: ['intensity', 'flux'], defaultText: 'intensity', description: 'what the monitor records: a field intensity (the echo interferes) or the power flux through a plane (the cross term cancels)', table: true }),
  field({ name: 'share', kind: 'fraction', range: fractionRange, defaultText: '1 for a single budget; in a plan, the searched split', description: 'share of the error budget given to the absorber (in a plan, it overrides the searched split)', table: true }),
  field({ name: 'path', kind: 'path', range: { min: 0, max: MAX_PATH_WAVELENGTHS }, defaultText: 'none (no phase error)', description: 'propagation path to an interferometric monitor, whose phase slip on the grid counts as error', table: true }),
  field({ name: 'resonance', kind: 'choice', choices: ['ringdown', 'line'], defaultText: 'ringdown', description: 'with q: ringdown (q sets the run length only) or line (the study measures the line, so its shift on the grid counts as error)', table: true }),
  field({ name: 'cell_min', kind: 'length', unit: 'nm', range: { min: MIN_CELL_METRES, max: 1 }, show: NM, defaultText: 'cell/4 (cell to fix it)', description: 'finest cell the planner may choose to meet the dispersion budget', table: true }),
  field({ name: 'duration', kind: 'time', unit: 'fs', range: positive, show: { factor: 1e-15, unit: 'fs' }, defaultText: 'one of duration, passes or q', description: 'simulated time', table: true }),
  field({ name: 'passes', kind: 'number', range: { min: 0, minOpen: true, max: MAX_PASSES }, defaultText: 'one of duration, passes or q', description: 'transits of the longest side of the domain', table: true }),
  field({ name: 'q', kind: 'number', range: { min: 0, minOpen: true, max: MAX_QUALITY_FACTOR }, defaultText: 'one of duration, passes or q', description: 'quality factor of the slowest resonance (ring-down run)', table: true }),
  field({ name: 'ring_target', kind: 'reflection', range: { min: 0, minOpen: true, max: 1, maxOpen: true }, defaultText: String(DEFAULT_RING_TARGET), description: 'amplitude the resonance must ring down to', table: true }),
  field({ name: 'ring_frequency', kind: 'frequency', unit: 'THz', range: positive, show: { factor: 1e12, unit: 'THz' }, defaultText: 'the band centre', description: 'frequency of the resonance', table: true }),
  field({ name: 'throughput', kind: 'number', range: { min: MIN_THROUGHPUT, max: MAX_THROUGHPUT }, defaultText: 'none (no runtime)', description: 'interior cell updates per second on one node (your hardware)', table: true, placeholder: 'UPDATES_PER_S' }),
  field({ name: 'price_per_hour', kind: 'price', range: { min: 0, max: MAX_PRICE_PER_HOUR }, defaultText: 'none (no cost)', description: 'price of one node-hour in any currency ("$2.50/h")', table: true, aliases: ['price'] }),
  field({ name: 'precision', kind: 'choice', choices: ['single', 'double'], defaultText: 'single', description: 'floating-point precision of the stored values', table: true }),
  field({ name: 'nodes', kind: 'count', range: { min: 1, max: MAX_NODES }, defaultText: '1', description: 'number of compute nodes', table: true }),
  field({ name: 'efficiency', kind: 'fraction', range: { min: MIN_EFFICIENCY, max: 1 }, defaultText: 'derived from bandwidth and latency', description: 'parallel efficiency on those nodes', table: true }),
  field({ name: 'decomposition', kind: 'choice', choices: ['slab', 'block'], defaultText: 'slab', description: 'domain decomposition for the halo exchange', table: true }),
  field({ name: 'bandwidth', kind: 'bandwidth', unit: 'GB/s', range: { min: MIN_BANDWIDTH, max: MAX_BANDWIDTH }, show: { factor: 1e9, unit: 'GB/s' }, defaultText: 'none', description: 'network bandwidth per node', table: true }),
  field({ name: 'latency', kind: 'time', unit: 'us', range: { min: 0, max: MAX_LATENCY_SECONDS }, show: { factor: 1e-6, unit: 'us' }, defaultText: '0', description: 'network latency per message', table: true }),
  field({
    name: 'sampling',
    kind: 'choice',
    choices: ['node', 'average', 'offset', 'lagged', 'all'],
    defaultText: 'node',
    description:
      "your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset)",
    table: true,
  }),
  field({ name: 'index_absorber', kind: 'numbers', range: indexRange, defaultText: 'index', description: 'indices of every medium that crosses the absorber (a guide or substrate as well as the background)', table: true }),
  field({ name: 'decay_min', kind: 'gap', unit: 'cells', defaultText: "from index_max and index: λ_short/(2π√(index_max² − index²)); none without a denser material; 'none' to switch the check off", description: "shortest decay length of the structure's evanescent near fields at the band's short end: cells, wavelengths or a length", table: true }),
  field({ name: 'azimuth_max', kind: 'angle', unit: 'deg', range: { min: 0, max: 45 }, defaultText: '45 in 3-D, 0 in 2-D', description: 'largest azimuth of the plane of incidence about the face normal (3-D; 0–45° covers every direction by symmetry)', table: true }),
  field({ name: 'min_layers', kind: 'count', range: { min: 1, max: MAX_LAYERS }, defaultText: '1', description: 'fewest absorber layers a design may have (a floor set by policy)', table: true }),
  field({ name: 'orders', kind: 'numbers', range: { min: MIN_DESIGN_ORDER, max: MAX_ORDER }, defaultText: DEFAULT_ORDERS.join(', '), description: 'allowed polynomial grading orders', table: true }),
  field({ name: 'kappa_max', kind: 'number', range: { min: 1, max: MAX_KAPPA }, defaultText: '1', description: 'κ at the back of the absorber', table: true, placeholder: 'K' }),
  field({ name: 'alpha_max', kind: 'conductivity', unit: 'S/m', range: { min: 0 }, show: { factor: 1, unit: 'S/m' }, defaultText: '0', description: 'CFS shift α_max', table: true }),
  field({ name: 'absorber_factor', kind: 'number', range: { min: MIN_ABSORBER_FACTOR, max: MAX_ABSORBER_FACTOR }, defaultText: String(DEFAULT_ABSORBER_FACTOR), description: 'cost of an absorber cell update relative to an interior one', table: true }),
  field({ name: 'fields_per_cell', kind: 'count', range: { min: 1, max: MAX_VALUES_PER_CELL }, defaultText: '6 (3-D), 3 (2-D), 2 (1-D)', description: 'field values stored per cell', table: true }),
  field({ name: 'material_per_cell', kind: 'count', range: { min: 0, max: MAX_VALUES_PER_CELL }, defaultText: '3 (3-D), 1 (2-D, 1-D)', description: 'material values stored per cell', table: true }),

  // Arguments of single steps (one reflection, one design, a budget, a ripple, a cost).
  field({ name: 'layers', kind: 'count', range: { min: 1, max: MAX_LAYERS }, defaultText: 'required', description: 'absorber thickness N in cells' }),
  field({ name: 'order', kind: 'number', range: { min: 0, max: MAX_ORDER }, defaultText: 'required', description: 'polynomial grading order m of σ and κ (3 or 4 is usual)', placeholder: 'M' }),
  field({ name: 'strength', kind: 'number', range: { min: 0, minOpen: true, max: MAX_STRENGTH }, defaultText: '1', description: 'σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn)', placeholder: 'S' }),
  field({ name: 'alpha_max_norm', kind: 'number', range: { min: 0, max: MAX_ALPHA_NORM }, defaultText: '0', description: 'CFS shift α_max·η₀·Δ·n (dimensionless)', placeholder: 'A' }),
  field({ name: 'alpha_order', kind: 'number', range: { min: 0, max: MAX_ORDER }, defaultText: '1', description: 'order of the reversed α grading', placeholder: 'MA' }),
  field({ name: 'ppw', kind: 'number', range: { min: 0, minOpen: true, max: MAX_PPW }, defaultText: 'required', description: 'cells per wavelength in the background medium at this frequency', placeholder: 'P' }),
  field({ name: 'ppw_min', kind: 'number', range: { min: 0, minOpen: true, max: MAX_PPW }, defaultText: 'required', description: 'cells per wavelength in the background at the short-wavelength end of the band', placeholder: 'P' }),
  field({ name: 'ppw_max', kind: 'number', range: { min: 0, minOpen: true, max: MAX_PPW }, defaultText: 'ppw_min (one frequency)', description: 'cells per wavelength at the long-wavelength end of the band', placeholder: 'P' }),
  field({ name: 'angle', kind: 'angle', unit: 'deg', range: { min: 0, max: 90, maxOpen: true }, defaultText: '0', description: 'angle of incidence (from the face normal, the x axis)' }),
  field({ name: 'decay', kind: 'number', range: { min: 0, minOpen: true, max: 1e6 }, defaultText: 'none (a propagating wave)', description: 'decay length L in cells of an evanescent incident field e^(−d/L) normal to the face (instead of an angle)', placeholder: 'L' }),
  field({ name: 'azimuth', kind: 'angle', unit: 'deg', range: { min: -360, max: 360 }, defaultText: '0', description: 'azimuth of the direction about the x axis (3-D grids)' }),
  field({ name: 'target', kind: 'reflection', range: { min: 0, minOpen: true, max: 1, maxOpen: true }, defaultText: 'required', description: 'required amplitude reflection |r| per face' }),
  field({ name: 'amplitude', kind: 'reflection', range: { min: 0, max: 1, maxOpen: true }, defaultText: 'required', description: 'amplitude reflection |r| of one face (not the power |r|²)' }),
  field({ name: 'max_layers', kind: 'count', range: { min: 1, max: MAX_LAYERS }, defaultText: String(MAX_LAYERS), description: 'most layers the design search may use' }),
  field({ name: 'distance', kind: 'length', unit: 'm', range: { min: MIN_RIPPLE_DISTANCE, max: MAX_RIPPLE_DISTANCE }, show: { factor: 1, unit: 'm' }, defaultText: 'required', description: 'distance between the boundary and the other reflector' }),
  field({ name: 'period', kind: 'frequency', unit: 'Hz', range: { min: MIN_RIPPLE_PERIOD, max: MAX_RIPPLE_PERIOD }, show: { factor: 1, unit: 'Hz' }, defaultText: 'required', description: 'observed ripple period in frequency' }),
  field({ name: 'peak_to_peak', kind: 'fraction', range: { min: 0, minOpen: true, max: MAX_RIPPLE_PEAK_TO_PEAK, maxOpen: true }, defaultText: 'required', description: 'observed peak-to-peak relative intensity swing' }),
  field({ name: 'group_index', kind: 'number', range: indexRange, defaultText: '1', description: 'group index of the medium between the reflecting pair', placeholder: 'NG' }),
  field({ name: 'ppw_points', kind: 'count', range: { min: 1, max: MAX_SWEEP_POINTS }, defaultText: '25', description: 'cells-per-wavelength values of a sweep, evenly spaced in frequency from ppw_max to ppw_min' }),
  field({ name: 'angle_points', kind: 'count', range: { min: 1, max: MAX_SWEEP_POINTS }, defaultText: '10', description: 'angles of a sweep, evenly spaced from 0 to angle_max' }),
  field({ name: 'cells', kind: 'counts', range: { min: 1, max: MAX_AXIS_CELLS }, defaultText: 'required', description: 'interior cells per axis, 1 to 3 numbers (their count sets the dimensions)' }),
];

const byName = new Map(INPUTS.map((f) => [f.name, f]));

/** The input field called `name`; throws for a name the registry does not define (a programming error). */
export function inputField(name: string): InputField {
  const f = byName.get(name);
  if (!f) throw new Error(`no input field ${JSON.stringify(name)}`);
  return f;
}

/** The project table's input fields, in order. */
export const TABLE_FIELDS: readonly InputField[] = INPUTS.filter((f) => f.table);

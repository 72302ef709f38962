/**
 * A project row → checked plan inputs. Every value goes through the field
 * registry (src/plan/fields): read once, checked once, in SI units, with the
 * defaults filled in; cross-field checks (index_max ≥ index, faces against
 * periodic axes, one run length) are made here. Notes on likely slips are
 * kept with the inputs and reach the plan's notes.
 */
import { SPEED_OF_LIGHT } from '../physics/constants';
import { checkCourant, courantLimit } from '../physics/courant';
import { maxResonantCoupling, type PhaseModel } from '../physics/budget';
import type { Decomposition, Precision } from '../physics/cost';
import { DEFAULT_ABSORBER_FACTOR, DEFAULT_RING_TARGET } from '../physics/cost';
import { FACE_NAMES, type FaceKind } from '../physics/domain';
import { HushInputError } from '../physics/errors';
import { DEFAULT_COURANT_FRACTION, DEFAULT_ORDERS } from '../physics/limits';
import { canonical, type Gap } from './units';
import type { MonitorKind } from '../physics/budget';
import type { PathLength } from './fields/kinds';
import type { SamplingConvention } from '../physics/grading';
import { inputColumn, isBlank, readInput, type InputColumn, type KindValue, type ReadOptions } from './fields';

/** What a table cell holds. */
export type FieldValue = string | number | boolean | null | undefined;

/** A column whose header cannot be read (its unit contradicts the field, or the field's column is repeated). */
export interface ColumnProblem {
  problem: string;
}

/** A project row: field name → value as typed (text or number), or the problem of its column. Unknown names are ignored. */
export type ProjectRow = Record<string, FieldValue | ColumnProblem>;

function isProblem(v: unknown): v is ColumnProblem {
  return typeof v === 'object' && v !== null && typeof (v as ColumnProblem).problem === 'string';
}

/** Inputs after parsing: SI units (m, s, Hz, bytes/s), defaults filled in. */
export interface PlanInputs {
  study: string;
  dimensions: number;
  /** Vacuum wavelengths of the band ends, m (short ≤ long). */
  wavelengthShort: number;
  wavelengthLong: number;
  index: number;
  indexMax: number;
  cell: number;
  courant: number;
  /** Structure region in cells per axis. */
  interiorCells: number[];
  /** FACE_NAMES order, 2·dimensions entries. */
  faces: FaceKind[];
  gapCells: number;
  /** Notes naming inputs that the row's other inputs leave unused, and likely slips (never dropped silently). */
  unusedNotes: string[];
  /** False when the gap cell was blank: the structure size is taken to include its clearance, and no gap warning is given. */
  gapGiven: boolean;
  angleMaxDeg: number;
  intensityError: number;
  coupling: number;
  facesSeen: number;
  phase: PhaseModel;
  monitor: MonitorKind;
  /** Share of the tolerance given to the absorber when the user overrides the planned split; null: the split is searched. */
  share: number | null;
  /** Propagation path to an interferometric monitor (its phase slip counts as error), or null. */
  path: PathLength | null;
  /** With q: 'ringdown' (q sets the run only) or 'line' (the line's shift on the grid counts as error). */
  resonance: 'ringdown' | 'line';
  /** Finest cell the planner may choose, m; null: the default (cell/4). */
  cellMin: number | null;
  /** True when ring_target was typed (the run is then fixed by it). */
  ringTargetGiven: boolean;
  /** The user's solver's grid convention, or 'all' (a design that holds under node, average and offset). */
  sampling: SamplingConvention | 'all';
  /** Indices of the media crossing the absorber (default [index]). */
  absorberIndices: number[];
  /** Shortest decay length of the structure's near fields at the band's short end, m; null: no near-field check. */
  decayMin: number | null;
  /** True when decay_min was derived from index_max and index rather than typed. */
  decayMinDerived: boolean;
  /** Largest azimuth checked (3-D), degrees; null: the design's default (45 in 3-D). */
  azimuthMaxDeg: number | null;
  minLayers: number;
  duration: number | null;
  passes: number | null;
  q: number | null;
  ringTarget: number | null;
  ringFrequency: number | null;
  throughput: number | null;
  pricePerHour: number | null;
  precision: Precision;
  nodes: number;
  efficiency: number | null;
  decomposition: Decomposition;
  bandwidth: number | null;
  latency: number;
  orders: number[];
  kappaMax: number;
  alphaMax: number;
  /** True when kappa_max / alpha_max were typed: they stay fixed; otherwise the design may choose them for a near field. */
  kappaMaxGiven: boolean;
  alphaMaxGiven: boolean;
  absorberFactor: number;
  fieldsPerCell: number | null;
  materialPerCell: number | null;
}

/** Column letters of a 0-based column index (0 → A, 26 → AA), as spreadsheets name them. */
export function columnLetters(k: number): string {
  let s = '';
  for (let n = k + 1; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
  return s;
}

/**
 * Builds a ProjectRow from a header and the values of one table row. Header
 * cells are compared by name (case, spaces and a bracketed unit ignored); a
 * bracketed unit applies to the column's bare numbers ("cell [um]": 0.02 is
 * 20 nm); a unit that contradicts the field, or a field named by two columns,
 * makes that field an error for the row (other fields are still read).
 */
/**
 * The value a project row holds for one cell of an input column: the cell as
 * typed, a bare number with the column header's unit attached ("cell [um]":
 * 0.02 → "0.02 um"), or the column's problem when its header unit contradicts
 * the field (a blank cell there is simply blank).
 */
export function columnValue(c: InputColumn, v: FieldValue): FieldValue | ColumnProblem {
  if (c.problem) return isBlank(v) ? undefined : { problem: c.problem };
  if (c.unit !== undefined && (typeof v === 'number' || (typeof v === 'string' && /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/.test(v)))) {
    return `${String(v).trim()} ${c.unit}`;
  }
  return v;
}

export function rowFromTable(header: readonly unknown[], values: readonly FieldValue[]): ProjectRow {
  const row: ProjectRow = {};
  const seen = new Map<string, number>();
  header.forEach((h, k) => {
    const c = inputColumn(h);
    if (!c) return;
    const name = c.field.name;
    const first = seen.get(name);
    if (first !== undefined) {
      row[name] = { problem: `${name} appears in columns ${columnLetters(first)} and ${columnLetters(k)}; keep one of them` };
      return;
    }
    seen.set(name, k);
    row[name] = columnValue(c, values[k]);
  });
  return row;
}

/** Reads field `name` of a row through the registry (undefined when blank). */
function reader(row: ProjectRow, notes: string[]) {
  const options: ReadOptions = { notes };
  return <K extends keyof KindValue>(name: string): KindValue[K] | undefined => {
    const v = row[name];
    if (isProblem(v)) throw new HushInputError(name, v.problem, 'value');
    return readInput<K>(name, v, options);
  };
}

/** Physical size → cells: ⌈size/Δ⌉, a ratio within 10⁻⁹ of a whole number counting as it. */
export function cellsFor(size: number, cell: number): number {
  const x = size / cell;
  const r = Math.round(x);
  return Math.max(1, Math.abs(x - r) <= 1e-9 * x ? r : Math.ceil(x));
}

function parseFaces(faceWords: string[] | undefined, periodicWords: string[] | undefined, dims: number): FaceKind[] {
  const axes = 'xyz'.slice(0, dims);
  const periodic = new Set<string>();
  for (const t of periodicWords ?? []) {
    if (t === 'none') continue;
    if (t.length !== 1 || !axes.includes(t)) {
      throw new HushInputError('periodic', `periodic must list axes of a ${dims}-D grid (${axes.split('').join(', ')}; got ${JSON.stringify(t)})`, 'value');
    }
    periodic.add(t);
  }
  const names = FACE_NAMES.slice(0, 2 * dims) as readonly string[];
  let absorbing: Set<string>;
  if (faceWords === undefined || (faceWords.length === 1 && faceWords[0] === 'all')) {
    absorbing = new Set(names.filter((n) => !periodic.has(n[0])));
  } else {
    absorbing = new Set();
    for (const t of faceWords) {
      if (!names.includes(t)) throw new HushInputError('faces', `faces must list faces of a ${dims}-D grid (${names.join(', ')}; got ${JSON.stringify(t)})`, 'value');
      if (periodic.has(t[0])) throw new HushInputError('faces', `face ${t} is absorbing but axis ${t[0]} is periodic`, 'value');
      absorbing.add(t);
    }
  }
  if (absorbing.size === 0) throw new HushInputError('faces', 'no absorbing face: the plan needs at least one (faces lists them, e.g. "z-, z+")', 'value');
  return names.map((n) => (absorbing.has(n) ? 'absorbing' : periodic.has(n[0]) ? 'periodic' : 'symmetric'));
}

function gapInCells(gap: Gap, wavelengthLong: number, index: number, cell: number, raw: unknown): number {
  if ('cells' in gap) {
    if (!Number.isInteger(gap.cells) || gap.cells < 0 || gap.cells > 1_000_000) {
      throw new HushInputError('gap', `gap must be a whole number of cells from 0 to 1000000 (got ${String(raw).trim()})`);
    }
    return gap.cells;
  }
  if ('wavelengths' in gap) {
    if (!(gap.wavelengths >= 0 && gap.wavelengths <= 1000)) throw new HushInputError('gap', `gap must be from 0 to 1000 wavelengths (got ${gap.wavelengths})`);
    return Math.ceil(canonical((gap.wavelengths * wavelengthLong) / (index * cell)));
  }
  return cellsFor(gap.metres, cell);
}

/** Parses and checks a row into SI inputs with defaults filled in. */
export function planInputs(row: ProjectRow): PlanInputs {
  if (row === null || typeof row !== 'object') throw new HushInputError('row', 'a project row must be an object of named fields', 'value');
  const notes: string[] = [];
  const read = reader(row, notes);
  const required = <K extends keyof KindValue>(name: string, hint: string): KindValue[K] => {
    const v = read<K>(name);
    if (v === undefined) throw new HushInputError(name, `${name} is required: ${hint}`, 'value');
    return v;
  };
  const study = read<'text'>('study') ?? '';
  const dimensions = read<'count'>('dimensions') ?? 3;

  const a = required<'wavelength'>('band_short', 'a wavelength (1550 nm) or a frequency (193 THz)');
  const b = read<'wavelength'>('band_long') ?? a;
  const wavelengthShort = Math.min(a, b);
  const wavelengthLong = Math.max(a, b);

  const index = read<'number'>('index') ?? 1;
  const indexMax = read<'number'>('index_max') ?? index;
  if (!(indexMax >= index)) throw new HushInputError('index_max', `index_max must be at least index (${index}) (got ${indexMax})`);

  const cell = required<'length'>('cell', 'the cell size, e.g. 20 nm');
  const courant = canonical(checkCourant(read<'number'>('courant') ?? DEFAULT_COURANT_FRACTION * courantLimit(dimensions), dimensions));

  const interiorCells: number[] = [];
  for (const ax of 'xyz') {
    const inGrid = 'xyz'.indexOf(ax) < dimensions;
    const size = read<'length'>(`size_${ax}`);
    const cells = read<'count'>(`cells_${ax}`);
    if (!inGrid) {
      if (size !== undefined || cells !== undefined) {
        throw new HushInputError(`size_${ax}`, `${size !== undefined ? 'size' : 'cells'}_${ax} is given but the study is ${dimensions}-D`, 'value');
      }
      continue;
    }
    if (size !== undefined && cells !== undefined) throw new HushInputError(`size_${ax}`, `give size_${ax} or cells_${ax}, not both`, 'value');
    if (size === undefined && cells === undefined) throw new HushInputError(`size_${ax}`, `size_${ax} (or cells_${ax}) is required for a ${dimensions}-D study`, 'value');
    interiorCells.push(size !== undefined ? cellsFor(size, cell) : (cells as number));
  }
  const faces = parseFaces(read<'faces'>('faces'), read<'axes'>('periodic'), dimensions);

  const typedGap = read<'gap'>('gap');
  const gapGiven = typedGap !== undefined;
  const gapCells = gapInCells(typedGap ?? { cells: 0 }, wavelengthLong, index, cell, row.gap);

  const angleMaxDeg = read<'angle'>('angle_max') ?? 0;
  const intensityError = required<'fraction'>('intensity_error', 'the tolerated relative intensity error, e.g. 1% or 0.01');
  const coupling = read<'fraction'>('coupling') ?? 1;
  const absorbingCount = faces.filter((f) => f === 'absorbing').length;
  const facesSeen = read<'count'>('faces_seen') ?? 1;
  if (facesSeen > absorbingCount) {
    throw new HushInputError('faces_seen', `faces_seen must be at most the number of absorbing faces, ${absorbingCount} (got ${facesSeen})`);
  }
  const phase = (read<'choice'>('phase') ?? 'worst') as PhaseModel;
  const share = read<'fraction'>('share') ?? null;
  const monitor = (read<'choice'>('monitor') ?? 'intensity') as MonitorKind;
  const path = read<'path'>('path') ?? null;
  const resonance = (read<'choice'>('resonance') ?? 'ringdown') as 'ringdown' | 'line';
  const cellMin = read<'length'>('cell_min') ?? null;
  if (cellMin !== null && cellMin > cell) throw new HushInputError('cell_min', `cell_min must be at most cell (${cell} m) (got ${cellMin} m)`);

  const duration = read<'time'>('duration') ?? null;
  const passes = read<'number'>('passes') ?? null;
  const q = read<'number'>('q') ?? null;
  if ([duration, passes, q].filter((v) => v !== null).length > 1) throw new HushInputError('duration', 'give one of duration, passes or q, not several', 'value');
  const ringTargetTyped = read<'reflection'>('ring_target');
  const ringFrequencyTyped = read<'frequency'>('ring_frequency');
  const ringTarget = q === null ? null : (ringTargetTyped ?? DEFAULT_RING_TARGET);
  // Centre of the band in frequency.
  const ringFrequency = q === null ? null : (ringFrequencyTyped ?? canonical((SPEED_OF_LIGHT / wavelengthShort + SPEED_OF_LIGHT / wavelengthLong) / 2));

  const throughput = read<'number'>('throughput') ?? null;
  const pricePerHour = read<'price'>('price_per_hour') ?? null;
  const precision = (read<'choice'>('precision') ?? 'single') as Precision;
  const nodes = read<'count'>('nodes') ?? 1;
  const efficiency = read<'fraction'>('efficiency') ?? null;
  const decomposition = (read<'choice'>('decomposition') ?? 'slab') as Decomposition;
  const bandwidth = read<'bandwidth'>('bandwidth') ?? null;
  const latency = read<'time'>('latency') ?? 0;
  const orders = read<'numbers'>('orders') ?? [...DEFAULT_ORDERS];
  const sampling = (read<'choice'>('sampling') ?? 'node') as SamplingConvention | 'all';
  const absorberIndices = read<'numbers'>('index_absorber') ?? [index];
  const decayText = row.decay_min;
  const decayOff = typeof decayText === 'string' && decayText.trim().toLowerCase() === 'none';
  const decayTyped = decayOff ? undefined : read<'gap'>('decay_min');
  // Default: the evanescent tail outside a guide of index index_max in the background of index `index`, at the band's short end,
  // where the field decays fastest (n_eff → index_max): e^{−d/L}, L = λ/(2π·√(n_max² − n²)) (slab-waveguide evanescent field;
  // Saleh & Teich, Fundamentals of Photonics, planar dielectric waveguides).
  // A 1-D grid has no transverse wavenumber, so no evanescent field can meet its absorber.
  if (decayTyped !== undefined && dimensions === 1) throw new HushInputError('decay_min', 'decay_min needs a 2-D or 3-D study: a 1-D grid carries no evanescent field to its absorber', 'value');
  const decayDerived = indexMax > index && dimensions > 1 ? wavelengthShort / (2 * Math.PI * Math.sqrt(indexMax * indexMax - index * index)) : null;
  const decayMin = decayOff
    ? null
    : decayTyped === undefined
      ? decayDerived
      : 'cells' in decayTyped
        ? decayTyped.cells * cell
        : 'wavelengths' in decayTyped
          ? (decayTyped.wavelengths * wavelengthShort) / index
          : decayTyped.metres;
  if (decayMin !== null && !(decayMin > 0)) throw new HushInputError('decay_min', `decay_min must be greater than 0 (got ${String(decayText).trim()})`);
  const azimuthMaxDeg = read<'angle'>('azimuth_max') ?? null;
  if (azimuthMaxDeg !== null && dimensions !== 3 && azimuthMaxDeg !== 0) throw new HushInputError('azimuth_max', `azimuth_max applies to 3-D grids only (the study is ${dimensions}-D)`, 'value');
  const minLayers = read<'count'>('min_layers') ?? 1;
  const kappaTyped = read<'number'>('kappa_max');
  const alphaTyped = read<'conductivity'>('alpha_max');
  const kappaMax = kappaTyped ?? 1;
  const alphaMax = alphaTyped ?? 0;
  const absorberFactor = read<'number'>('absorber_factor') ?? DEFAULT_ABSORBER_FACTOR;
  const fieldsPerCell = read<'count'>('fields_per_cell') ?? null;
  const materialPerCell = read<'count'>('material_per_cell') ?? null;

  // Inputs that this row's other inputs make unused are named, never dropped silently.
  const given = (name: string) => !isBlank(row[name] as FieldValue);
  const unused = (names: string[], why: string) => {
    const n = names.filter(given);
    if (n.length) notes.push(`${n.length > 1 ? `${n.slice(0, -1).join(', ')} and ${n[n.length - 1]} are` : `${n[0]} is`} not used: ${why}`);
  };
  if (q === null) unused(['ring_target', 'ring_frequency', 'resonance'], 'they describe a resonance, which needs q');
  if (coupling > 1 && q === null) throw new HushInputError('coupling', `coupling above 1 needs a resonance to build the echo up: give q (got ${coupling})`);
  if (q !== null && coupling > maxResonantCoupling(q)) {
    throw new HushInputError('coupling', `coupling must be at most 2√(1 + Q/π) = ${maxResonantCoupling(q).toPrecision(4)} for q ${q}: no lossless resonance builds an echo up more (got ${coupling})`);
  }
  if (coupling > 1) notes.push(`coupling ${coupling}: the echo is taken as built up ${coupling}× by a resonance between the absorber and the monitor`);
  if (nodes === 1) unused(['efficiency', 'decomposition', 'bandwidth', 'latency'], 'they apply to runs on several nodes (nodes is 1)');
  else if (efficiency !== null) unused(['bandwidth', 'latency'], 'the stated efficiency sets the parallel runtime (halo_per_step is still reported); clear efficiency to model the halo exchange');
  return {
    study, dimensions, wavelengthShort, wavelengthLong, index, indexMax, cell, courant, interiorCells, faces, gapCells, gapGiven, unusedNotes: notes,
    angleMaxDeg, intensityError, coupling, facesSeen, phase, monitor, share, path, resonance, cellMin, ringTargetGiven: ringTargetTyped !== undefined, sampling, absorberIndices, decayMin, decayMinDerived: decayTyped === undefined && decayMin !== null, azimuthMaxDeg, minLayers, duration, passes, q, ringTarget, ringFrequency,
    throughput, pricePerHour, precision, nodes, efficiency, decomposition, bandwidth, latency, orders, kappaMax, alphaMax, kappaMaxGiven: kappaTyped !== undefined, alphaMaxGiven: alphaTyped !== undefined, absorberFactor,
    fieldsPerCell, materialPerCell,
  };
}


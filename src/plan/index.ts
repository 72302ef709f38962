/**
 * The plan API: one project row (named fields with units, fields.ts) → a plan.
 * Every front end (worksheet functions, task pane, `hush plan`) calls
 * `planRow`; data flows one way:
 *   inputs with units → normalised SI inputs → grid quantities (cells per
 *   wavelength, Courant number) → budget (required |r|) → design (thinnest
 *   absorber on this grid) → cost (cells, memory, steps, runtime, price)
 *   → warnings.
 * Runtime and cost are planning estimates from the user's own throughput and
 * price; a convergence check (absorber one notch thicker) remains advisable.
 * Deterministic: the same inputs give a bit-identical plan.
 */
import { ETA0, MODEL_VERSION, SPEED_OF_LIGHT } from '../physics/constants';
import { checkCourant, courantLimit } from '../physics/courant';
import { requiredAmplitude, type PhaseModel } from '../physics/budget';
import { designAbsorber, type DesignResult } from '../physics/design';
import { FACE_NAMES, type FaceKind } from '../physics/domain';
import { runCost, type CostResult, type Decomposition, type Precision } from '../physics/cost';
import { HushInputError } from '../physics/errors';
import { INPUT_NAMES, OUTPUT_COLUMNS, OUTPUT_NAMES, headerName, outputHeaderText, type OutputColumn } from './fields';
import {
  canonical,
  isBlank,
  parseAngle,
  parseBandwidth,
  parseChoice,
  parseFrequency,
  parseGap,
  parseLength,
  parseNumber,
  parseNumberList,
  parsePrice,
  parseTime,
  parseWavelength,
  type FieldValue,
} from './units';

export * from './fields';
export * from './steps';
export { type FieldValue } from './units';

/** A project row: field name → value as typed (text or number). Unknown names are ignored. */
export type ProjectRow = Record<string, FieldValue>;

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
  /** Notes naming inputs that the row's other inputs leave unused (never dropped silently). */
  unusedNotes: string[];
  /** False when the gap cell was blank: the structure size is taken to include its clearance, and no gap warning is given. */
  gapGiven: boolean;
  angleMaxDeg: number;
  intensityError: number;
  coupling: number;
  facesSeen: number;
  phase: PhaseModel;
  share: number;
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
  absorberFactor: number;
  fieldsPerCell: number | null;
  materialPerCell: number | null;
}

export interface PlanGrid {
  ppwShort: number;
  ppwLong: number;
  ppwDensest: number;
  courantLimit: number;
  alphaMaxNorm: number;
}

export interface Plan {
  modelVersion: string;
  inputs: PlanInputs;
  requiredReflection: number;
  grid: PlanGrid;
  design: DesignResult;
  cost: CostResult;
  warnings: string[];
}

/** Common practice (physics.md §4): at least 10 cells per shortest wavelength in the densest material. */
export const MIN_ADVISED_PPW = 10;
/** Common practice: keep the absorber at least half a (longest, in-medium) wavelength from the structure. */
export const MIN_ADVISED_GAP_WAVELENGTHS = 0.5;
/** Above this angle the absorber's attenuation (∝ cos θ) drops fast; warn. */
export const GRAZING_WARNING_DEG = 60;
/** Largest angle at which tests/verification.test.ts (and the audit runs) confirmed the exact model by a 2-D time-domain run. */
export const VERIFIED_ANGLE_DEG = 60;

function get(row: ProjectRow, name: string): FieldValue {
  const v = row[name];
  return isBlank(v) ? undefined : v;
}

function optional<T>(row: ProjectRow, name: string, parse: (field: string, v: FieldValue) => T): T | null {
  const v = get(row, name);
  return v === undefined ? null : parse(name, v);
}

function wholeCount(field: string, x: number, lo: number, hi: number, shown: FieldValue): number {
  if (!Number.isInteger(x) || x < lo || x > hi) {
    throw new HushInputError(field, `${field} must be a whole number from ${lo} to ${hi} (got ${String(shown).trim()})`);
  }
  return x;
}

/** Physical size → cells: ⌈size/Δ⌉, a ratio within 10⁻⁹ of a whole number counting as it. */
function cellsFor(size: number, cell: number): number {
  const x = size / cell;
  const r = Math.round(x);
  return Math.max(1, Math.abs(x - r) <= 1e-9 * x ? r : Math.ceil(x));
}

function parseFaces(row: ProjectRow, dims: number): FaceKind[] {
  const axes = 'xyz'.slice(0, dims);
  const periodic = new Set<string>();
  const pv = get(row, 'periodic');
  if (pv !== undefined) {
    for (const t of String(pv).toLowerCase().split(/[\s,;]+/).filter(Boolean)) {
      if (t === 'none') continue;
      if (t.length !== 1 || !axes.includes(t)) {
        throw new HushInputError('periodic', `periodic must list axes of a ${dims}-D grid (${axes.split('').join(', ')}; got ${JSON.stringify(t)})`, 'value');
      }
      periodic.add(t);
    }
  }
  const names = FACE_NAMES.slice(0, 2 * dims) as readonly string[];
  const fv = get(row, 'faces');
  let absorbing: Set<string>;
  if (fv === undefined || String(fv).trim().toLowerCase() === 'all') {
    absorbing = new Set(names.filter((n) => !periodic.has(n[0])));
  } else {
    absorbing = new Set();
    for (const t of String(fv).toLowerCase().split(/[\s,;]+/).filter(Boolean)) {
      if (!names.includes(t)) {
        throw new HushInputError('faces', `faces must list faces of a ${dims}-D grid (${names.join(', ')}; got ${JSON.stringify(t)})`, 'value');
      }
      if (periodic.has(t[0])) throw new HushInputError('faces', `face ${t} is absorbing but axis ${t[0]} is periodic`, 'value');
      absorbing.add(t);
    }
  }
  if (absorbing.size === 0) throw new HushInputError('faces', 'no absorbing face: the plan needs at least one (faces lists them, e.g. "z-, z+")', 'value');
  return names.map((n) => (absorbing.has(n) ? 'absorbing' : periodic.has(n[0]) ? 'periodic' : 'symmetric'));
}

/** Parses and checks a row into SI inputs with defaults filled in. */
export function planInputs(row: ProjectRow): PlanInputs {
  if (row === null || typeof row !== 'object') throw new HushInputError('row', 'a project row must be an object of named fields', 'value');
  const study = get(row, 'study') === undefined ? '' : String(row.study).trim();
  const dimsRaw = optional(row, 'dimensions', parseNumber) ?? 3;
  const dimensions = wholeCount('dimensions', dimsRaw, 1, 3, row.dimensions ?? dimsRaw);

  const shortV = get(row, 'band_short');
  if (shortV === undefined) throw new HushInputError('band_short', 'band_short is required: a wavelength (1550 nm) or a frequency (193 THz)', 'value');
  const a = parseWavelength('band_short', shortV);
  const b = optional(row, 'band_long', parseWavelength) ?? a;
  const wavelengthShort = Math.min(a, b);
  const wavelengthLong = Math.max(a, b);

  const index = optional(row, 'index', parseNumber) ?? 1;
  if (!(index >= 1 && index <= 100)) throw new HushInputError('index', `index must be at least 1 and at most 100 (got ${index})`);
  const indexMax = optional(row, 'index_max', parseNumber) ?? index;
  if (!(indexMax >= index && indexMax <= 100)) throw new HushInputError('index_max', `index_max must be at least index (${index}) and at most 100 (got ${indexMax})`);

  const cellV = get(row, 'cell');
  if (cellV === undefined) throw new HushInputError('cell', 'cell is required: the cell size, e.g. 20 nm', 'value');
  const cell = parseLength('cell', cellV);
  const courant = canonical(checkCourant(optional(row, 'courant', parseNumber) ?? 0.99 * courantLimit(dimensions), dimensions));

  const interiorCells: number[] = [];
  for (const ax of 'xyz'.slice(0, 3)) {
    const inGrid = 'xyz'.indexOf(ax) < dimensions;
    const size = optional(row, `size_${ax}`, parseLength);
    const cellsRaw = optional(row, `cells_${ax}`, parseNumber);
    if (!inGrid) {
      if (size !== null || cellsRaw !== null) {
        throw new HushInputError(`size_${ax}`, `${size !== null ? 'size' : 'cells'}_${ax} is given but the study is ${dimensions}-D`, 'value');
      }
      continue;
    }
    if (size !== null && cellsRaw !== null) throw new HushInputError(`size_${ax}`, `give size_${ax} or cells_${ax}, not both`, 'value');
    if (size === null && cellsRaw === null) throw new HushInputError(`size_${ax}`, `size_${ax} (or cells_${ax}) is required for a ${dimensions}-D study`, 'value');
    interiorCells.push(size !== null ? cellsFor(size, cell) : wholeCount(`cells_${ax}`, cellsRaw as number, 1, 1_000_000, row[`cells_${ax}`]));
  }
  const faces = parseFaces(row, dimensions);

  const typedGap = optional(row, 'gap', parseGap);
  const gapGiven = typedGap !== null;
  const gap = typedGap ?? { cells: 0 };
  let gapCells: number;
  if ('cells' in gap) gapCells = wholeCount('gap', gap.cells, 0, 1_000_000, row.gap);
  else if ('wavelengths' in gap) {
    if (!(gap.wavelengths >= 0 && gap.wavelengths <= 1000)) throw new HushInputError('gap', `gap must be from 0 to 1000 wavelengths (got ${gap.wavelengths})`);
    gapCells = Math.ceil(canonical((gap.wavelengths * wavelengthLong) / (index * cell)));
  } else gapCells = cellsFor(gap.metres, cell);

  const angleMaxDeg = optional(row, 'angle_max', parseAngle) ?? 0;
  const ieV = get(row, 'intensity_error');
  if (ieV === undefined) throw new HushInputError('intensity_error', 'intensity_error is required: the tolerated relative intensity error, e.g. 1% or 0.01', 'value');
  const intensityError = parseNumber('intensity_error', ieV);
  const coupling = optional(row, 'coupling', parseNumber) ?? 1;
  const absorbingCount = faces.filter((f) => f === 'absorbing').length;
  const facesSeenRaw = optional(row, 'faces_seen', parseNumber) ?? 1;
  const facesSeen = wholeCount('faces_seen', facesSeenRaw, 1, absorbingCount, row.faces_seen ?? facesSeenRaw);
  const phase = (optional(row, 'phase', (f, v) => parseChoice(f, v, ['worst', 'random'] as const)) ?? 'worst') as PhaseModel;
  const share = optional(row, 'share', parseNumber) ?? 1;

  const duration = optional(row, 'duration', parseTime);
  const passes = optional(row, 'passes', parseNumber);
  const q = optional(row, 'q', parseNumber);
  const runs = [duration, passes, q].filter((v) => v !== null).length;
  if (runs > 1) throw new HushInputError('duration', 'give one of duration, passes or q, not several', 'value');
  const ringTarget = q === null ? null : optional(row, 'ring_target', parseNumber) ?? 1e-3;
  // Centre of the band in frequency.
  const ringFrequency = q === null ? null : optional(row, 'ring_frequency', parseFrequency) ?? canonical((SPEED_OF_LIGHT / wavelengthShort + SPEED_OF_LIGHT / wavelengthLong) / 2);

  const throughput = optional(row, 'throughput', parseNumber);
  const pricePerHour = optional(row, 'price_per_hour', parsePrice);
  const precision = (optional(row, 'precision', (f, v) => parseChoice(f, v, ['single', 'double'] as const)) ?? 'single') as Precision;
  const nodesRaw = optional(row, 'nodes', parseNumber) ?? 1;
  const nodes = wholeCount('nodes', nodesRaw, 1, 100_000, row.nodes ?? nodesRaw);
  const efficiency = optional(row, 'efficiency', parseNumber);
  const decomposition = (optional(row, 'decomposition', (f, v) => parseChoice(f, v, ['slab', 'block'] as const)) ?? 'slab') as Decomposition;
  const bandwidth = optional(row, 'bandwidth', parseBandwidth);
  const latency = optional(row, 'latency', (f, v) => canonical(parseTimeOrZero(f, v))) ?? 0;
  const orders = optional(row, 'orders', parseNumberList) ?? [2, 3, 4];
  const kappaMax = optional(row, 'kappa_max', parseNumber) ?? 1;
  const alphaMax = optional(row, 'alpha_max', parseNumber) ?? 0;
  if (!(alphaMax >= 0)) throw new HushInputError('alpha_max', `alpha_max must be at least 0 S/m (got ${alphaMax})`);
  // α_norm = α·η₀·Δ·n (physics.md §3) must stay a finite number (alpha_max 1e308 S/m overflowed it).
  if (!Number.isFinite(alphaMax * ETA0 * cell * index)) {
    throw new HushInputError('alpha_max', `alpha_max ${alphaMax} S/m is out of range for a ${cell} m cell at index ${index} (α·η₀·Δ·n overflows)`);
  }
  const absorberFactor = optional(row, 'absorber_factor', parseNumber) ?? 1.5;
  const fieldsPerCell = optional(row, 'fields_per_cell', parseNumber);
  const materialPerCell = optional(row, 'material_per_cell', parseNumber);
  // Inputs that this row's other inputs make unused are named, never dropped silently.
  const given = (name: string) => get(row, name) !== undefined;
  const unusedNotes: string[] = [];
  const unused = (names: string[], why: string) => {
    const n = names.filter(given);
    if (n.length) unusedNotes.push(`${n.length > 1 ? `${n.slice(0, -1).join(', ')} and ${n[n.length - 1]} are` : `${n[0]} is`} not used: ${why}`);
  };
  if (q === null) unused(['ring_target', 'ring_frequency'], 'they set the ring-down length, which needs q');
  if (nodes === 1) unused(['efficiency', 'decomposition', 'bandwidth', 'latency'], 'they apply to runs on several nodes (nodes is 1)');
  else if (efficiency !== null) unused(['bandwidth', 'latency'], 'the stated efficiency sets the parallel runtime (halo_per_step is still reported); clear efficiency to model the halo exchange');
  return {
    study, dimensions, wavelengthShort, wavelengthLong, index, indexMax, cell, courant, interiorCells, faces, gapCells, gapGiven, unusedNotes,
    angleMaxDeg, intensityError, coupling, facesSeen, phase, share, duration, passes, q, ringTarget, ringFrequency,
    throughput, pricePerHour, precision, nodes, efficiency, decomposition, bandwidth, latency, orders, kappaMax, alphaMax, absorberFactor,
    fieldsPerCell, materialPerCell,
  };
}

function parseTimeOrZero(field: string, v: FieldValue): number {
  if (typeof v === 'number' && v === 0) return 0;
  if (typeof v === 'string' && /^\s*0+(\.0*)?\s*$/.test(v)) return 0;
  return parseTime(field, v, 'us');
}

const cache = new Map<string, Plan>();
/** Plans kept in the cache (oldest dropped first). */
export const PLAN_CACHE_LIMIT = 1000;

function deepFreeze<T>(o: T): T {
  if (o && typeof o === 'object' && !Object.isFrozen(o)) {
    Object.freeze(o);
    for (const v of Object.values(o as object)) deepFreeze(v);
  }
  return o;
}

/** Plans one row from already normalised inputs. */
export function planFromInputs(inputs: PlanInputs): Plan {
  const key = JSON.stringify(inputs);
  const hit = cache.get(key);
  if (hit) return hit;
  const i = inputs;
  const warnings: string[] = [];
  // Cells per wavelength in a medium of index n: λ_vacuum/(n·Δ) (physics.md §3).
  const ppwShort = i.wavelengthShort / (i.index * i.cell);
  const ppwLong = i.wavelengthLong / (i.index * i.cell);
  const ppwDensest = i.wavelengthShort / (i.indexMax * i.cell);
  // α_norm = α·η₀·Δ·n (physics.md §3).
  const alphaMaxNorm = i.alphaMax * ETA0 * i.cell * i.index;
  const required = requiredAmplitude({ intensityError: i.intensityError, coupling: i.coupling, faces: i.facesSeen, phase: i.phase, share: i.share });
  const design = designAbsorber({
    target: required,
    ppwMin: ppwShort,
    ppwMax: ppwLong,
    angleMaxDeg: i.angleMaxDeg,
    courant: i.courant,
    dimensions: i.dimensions,
    index: i.index,
    orders: i.orders,
    kappaMax: i.kappaMax,
    alphaMaxNorm,
  });
  const hasRun = i.duration !== null || i.passes !== null || i.q !== null;
  const cost = runCost({
    domain: { dimensions: i.dimensions, interior: i.interiorCells, layers: design.layers, faces: i.faces, gap: i.gapCells },
    precision: i.precision,
    fieldsPerCell: i.fieldsPerCell ?? undefined,
    materialPerCell: i.materialPerCell ?? undefined,
    time: hasRun
      ? {
          cellMetres: i.cell,
          courant: i.courant,
          duration: i.duration ?? undefined,
          passes: i.passes ?? undefined,
          q: i.q ?? undefined,
          ringFrequencyHz: i.ringFrequency ?? undefined,
          ringTarget: i.ringTarget ?? undefined,
          index: i.index,
        }
      : undefined,
    absorberFactor: i.absorberFactor,
    throughput: i.throughput ?? undefined,
    pricePerHour: i.pricePerHour ?? undefined,
    nodes: i.nodes,
    efficiency: i.efficiency ?? undefined,
    decomposition: i.decomposition,
    bandwidth: i.bandwidth ?? undefined,
    latency: i.latency,
  });

  // Values below a threshold are shown rounded down, so a shortfall never reads as the threshold itself.
  const down = (x: number, digits: number) => (Math.floor(x * 10 ** digits) / 10 ** digits).toFixed(digits);
  if (ppwDensest < MIN_ADVISED_PPW) {
    warnings.push(
      `resolution: ${down(ppwDensest, 1)} cells per wavelength in the densest material (index ${i.indexMax}) at the short end; common practice is at least ${MIN_ADVISED_PPW}`,
    );
  }
  const gapWavelengths = (i.gapCells * i.cell * i.index) / i.wavelengthLong;
  if (i.gapGiven && gapWavelengths < MIN_ADVISED_GAP_WAVELENGTHS) {
    warnings.push(
      `absorber close to the structure: gap ${i.gapCells} cells = ${down(gapWavelengths, 2)} wavelengths (longest, in the background); common practice keeps at least ${MIN_ADVISED_GAP_WAVELENGTHS} so near fields decay before the absorber`,
    );
  }
  if (i.angleMaxDeg > GRAZING_WARNING_DEG) {
    warnings.push(
      `grazing incidence: at ${i.angleMaxDeg}° the absorber's attenuation falls as cos θ; a larger gap or a smaller angle range is cheaper than more layers; ` +
        `the exact model is confirmed by time-domain runs up to ${VERIFIED_ANGLE_DEG}° only, so check this design with a run at the study's angle`,
    );
  }
  if (!hasRun) warnings.push('no run length: give duration, passes or q for steps, runtime and cost');
  else if (i.throughput === null) warnings.push('no throughput: give cell updates per second for runtime and cost');
  else if (i.pricePerHour === null) warnings.push('no price_per_hour: runtime only, no cost');
  warnings.push(...i.unusedNotes);
  if (cost.parallel.model === 'halo exchange' && cost.parallel.efficiency < 0.5) {
    warnings.push(`halo exchange dominates: parallel efficiency ${cost.parallel.efficiency.toFixed(2)} on ${i.nodes} nodes; fewer nodes or a block decomposition may be cheaper`);
  }
  const plan: Plan = {
    modelVersion: MODEL_VERSION,
    inputs,
    requiredReflection: required,
    grid: { ppwShort, ppwLong, ppwDensest, courantLimit: courantLimit(i.dimensions), alphaMaxNorm },
    design,
    cost,
    warnings,
  };
  deepFreeze(plan);
  if (cache.size >= PLAN_CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  cache.set(key, plan);
  return plan;
}

/**
 * Plans one project row. Throws `HushInputError` naming the field for bad input.
 * Example: planRow({ dimensions: 1, band_short: '1550 nm', cell: '50 nm', cells_x: 200, gap: '1 wavelength', intensity_error: '1%' })
 * → required_reflection 0.004987562112089…, layers and cells in tests/plan.test.ts.
 */
export function planRow(row: ProjectRow): Plan {
  return planFromInputs(planInputs(row));
}

/** Clears the plan cache (benchmarks). */
export function clearPlanCache(): void {
  cache.clear();
}

/** Output columns in order, with units (the worksheet's spilled row and the CLI's added columns). */
export function planHeader(): readonly OutputColumn[] {
  return OUTPUT_COLUMNS;
}

/** Header texts "name [unit]" of the output columns. */
export function planHeaderText(): string[] {
  return OUTPUT_COLUMNS.map(outputHeaderText);
}

export type PlanCell = number | string | null;

const GB = 1e9;
const HOUR = 3600;

/** Values of a plan in `planHeader()` order (null where the plan has no value). */
export function planToRow(plan: Plan): PlanCell[] {
  const c = plan.cost;
  const rt = c.runtime;
  const h = (s: number | undefined) => (s === undefined ? null : s / HOUR);
  const v: Record<string, PlanCell> = {
    required_reflection: plan.requiredReflection,
    layers: plan.design.layers,
    order: plan.design.order,
    strength: plan.design.strength,
    worst_reflection: plan.design.worstAmplitude,
    continuous_reflection: plan.design.continuousAmplitude,
    absorber_thickness: plan.design.layers * plan.inputs.cell,
    ppw_short: plan.grid.ppwShort,
    ppw_long: plan.grid.ppwLong,
    ppw_densest: plan.grid.ppwDensest,
    grid: c.domain.axisCells.join('×'),
    cells_total: c.domain.cellsTotal,
    cells_absorber: c.domain.cellsAbsorber,
    overhead_percent: c.domain.overheadPercent,
    psi_total: c.domain.psiTotal,
    memory: c.memory.totalBytes / GB,
    memory_psi: c.memory.psiBytes / GB,
    memory_fields: c.memory.fieldBytes / GB,
    memory_material: c.memory.materialBytes / GB,
    field_values_per_cell: c.memory.fieldsPerCell,
    material_values_per_cell: c.memory.materialPerCell,
    bytes_per_value: c.memory.bytesPerValue,
    time_step: c.time ? c.time.timeStep : null,
    simulated_time: c.time ? c.time.duration : null,
    steps: c.time ? c.time.steps : null,
    runtime: h(rt?.totalSeconds),
    runtime_interior: h(rt?.interiorSeconds),
    runtime_absorber: h(rt?.absorberSeconds),
    runtime_exchange: h(rt?.exchangeSeconds),
    absorber_share: rt ? rt.absorberSharePercent : null,
    cost: rt ? rt.cost : null,
    halo_per_step: c.parallel.nodes > 1 ? c.parallel.haloBytesPerStep / 1e6 : null,
    // Derived from the halo model only with a runtime; without one there is no efficiency to show.
    parallel_efficiency: c.parallel.model === 'halo exchange' && c.runtime === null ? null : c.parallel.efficiency,
    notes: plan.warnings.join('; '),
    model_version: plan.modelVersion,
  };
  return OUTPUT_NAMES.map((n) => v[n]);
}

/** The output row of a row that could not be planned: its error in the notes column. */
export function errorToRow(message: string): PlanCell[] {
  return OUTPUT_NAMES.map((n) => (n === 'notes' ? `error: ${message}` : n === 'model_version' ? MODEL_VERSION : null));
}

/** Builds a ProjectRow from a header and the values of one table row (header cells compared by `headerName`). */
export function rowFromTable(header: readonly unknown[], values: readonly FieldValue[]): ProjectRow {
  const row: ProjectRow = {};
  const inputs = new Set(INPUT_NAMES);
  header.forEach((h, k) => {
    const name = headerName(h);
    if (inputs.has(name)) row[name] = values[k];
  });
  return row;
}

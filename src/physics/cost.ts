/**
 * Cost of an FDTD run with a CPML absorber (physics.md §5): memory, time step
 * and step count, work, runtime, price, and the estimate for several nodes.
 * Every figure is a planning estimate built from stated per-cell constants that
 * the caller can override; none is a measurement of any code.
 *
 * Stated constants (defaults; all adjustable):
 * - field values per cell: 6 in 3-D (Ex, Ey, Ez, Hx, Hy, Hz), 3 in 2-D (one
 *   polarisation), 2 in 1-D (Yee 1966; Taflove & Hagness, 3rd ed.);
 * - material values per cell: one update coefficient per E component
 *   (3, 1, 1), non-magnetic media assumed;
 * - ψ per cell per stretched axis: 4 in 3-D, 2 in 2-D and 1-D (domain.ts);
 * - bytes per value: 4 (single) or 8 (double precision);
 * - absorber update factor 1.5: an absorber cell costs 1.5 interior cell
 *   updates. Derived from memory traffic, which bounds a Yee update: an
 *   interior 3-D cell reads and writes 6 field values and reads 3 material
 *   values (15 transfers); a face cell adds 4 ψ read and written (8 more):
 *   23/15 ≈ 1.5. An estimate, not a measurement; set it from a profile;
 * - halo exchange: per interface cell and step, the tangential fields of one
 *   plane cross the cut, 4 values in 3-D (2 E one way, 2 H the other), 2 in
 *   2-D and 1-D, in 2 messages per neighbour (one per half step).
 */
import { MIN_CELL_METRES, SPEED_OF_LIGHT } from './constants';
import { checkCourant } from './courant';
import { domainCounts, type DomainCounts, type DomainSpec } from './domain';
import { HushInputError } from './errors';
import { ringdownTime } from './ringdown';
import { inRange, wholeInRange } from './validate';

export type Precision = 'single' | 'double';
export type Decomposition = 'slab' | 'block';

/** Default absorber update factor (derived from memory traffic, see the module comment). */
export const DEFAULT_ABSORBER_FACTOR = 1.5;
/** Default ring-down target amplitude δ when only Q is given (common practice: 10⁻³ of the peak, 60 dB in energy). */
export const DEFAULT_RING_TARGET = 1e-3;
/** Largest node count accepted. */
export const MAX_NODES = 100_000;

export function defaultFieldsPerCell(dimensions: number): number {
  return dimensions === 3 ? 6 : dimensions === 2 ? 3 : 2;
}
export function defaultMaterialPerCell(dimensions: number): number {
  return dimensions === 3 ? 3 : 1;
}
export function haloValuesPerCell(dimensions: number): number {
  return dimensions === 3 ? 4 : 2;
}
export function bytesPerValue(precision: Precision): number {
  if (precision !== 'single' && precision !== 'double') {
    throw new HushInputError('precision', `precision must be "single" or "double" (got ${JSON.stringify(precision)})`, 'value');
  }
  return precision === 'single' ? 4 : 8;
}

/** Δt = S·Δ/c for vacuum Courant number S and cell Δ (m), checked against the D-dimensional limit. */
export function timeStep(cellMetres: number, courant: number, dimensions: number): number {
  const d = inRange('cell size', cellMetres, MIN_CELL_METRES, 1, { unit: 'm' });
  const s = checkCourant(courant, dimensions);
  return (s * d) / SPEED_OF_LIGHT;
}

/** Most time steps a run may take: beyond 2⁵³ − 1 a step count is no longer a whole number in double precision (and runtimes overflow). */
export const MAX_STEPS = Number.MAX_SAFE_INTEGER;

/** Steps = ⌈T/Δt⌉ (at least 1); a ratio within 10⁻⁹ of a whole number counts as it (floating-point noise). */
export function stepCount(durationSeconds: number, timeStepSeconds: number): number {
  const T = inRange('duration', durationSeconds, 0, Infinity, { loOpen: true, hiOpen: true, unit: 's' });
  const dt = inRange('time step', timeStepSeconds, 0, Infinity, { loOpen: true, hiOpen: true, unit: 's' });
  const x = T / dt;
  if (!(x <= MAX_STEPS)) {
    const needed = Number.isFinite(x) ? x.toExponential(3) : 'more than 1e308';
    throw new HushInputError('steps', `the run needs ${needed} time steps (duration ${T} s / time step ${dt} s), more than ${MAX_STEPS}: check the duration and the cell size`);
  }
  const r = Math.round(x);
  return Math.max(1, Math.abs(x - r) <= 1e-9 * x ? r : Math.ceil(x));
}

/** How long to run: exactly one of duration, passes, or q (with ringFrequencyHz). */
export interface RunTimeSpec {
  /** Cell size Δ in metres. */
  cellMetres: number;
  /** Vacuum Courant number cΔt/Δ. */
  courant: number;
  /** Simulated time in seconds. */
  duration?: number;
  /** Transits of a wave across the longest side of the whole domain, in the background medium. */
  passes?: number;
  /** Quality factor of the slowest resonance, with its frequency and the target amplitude. */
  q?: number;
  ringFrequencyHz?: number;
  ringTarget?: number;
  /** Background index for the transit speed c/n; default 1. */
  index?: number;
}

export interface CostSpec {
  domain: DomainSpec;
  precision?: Precision;
  fieldsPerCell?: number;
  materialPerCell?: number;
  time?: RunTimeSpec;
  absorberFactor?: number;
  /** Interior cell updates per second on one node. */
  throughput?: number;
  /** Price per node-hour (any currency). */
  pricePerHour?: number;
  nodes?: number;
  /** Parallel efficiency on `nodes` nodes (0, 1]. */
  efficiency?: number;
  decomposition?: Decomposition;
  /** Network bandwidth per node, bytes per second (halo model). */
  bandwidth?: number;
  /** Latency per message, seconds (halo model); default 0. */
  latency?: number;
}

export interface MemoryResult {
  bytesPerValue: number;
  fieldsPerCell: number;
  materialPerCell: number;
  fieldBytes: number;
  materialBytes: number;
  psiBytes: number;
  totalBytes: number;
}

export interface TimeResult {
  timeStep: number;
  duration: number;
  steps: number;
  source: 'duration' | 'passes' | 'ringdown';
}

export interface ParallelResult {
  nodes: number;
  decomposition: Decomposition | 'none';
  /** Subdomains per axis. */
  split: number[];
  /** Bytes crossing all cuts per step. */
  haloBytesPerStep: number;
  /** Bytes the busiest node sends per step. */
  haloBytesPerNodePerStep: number;
  messagesPerNodePerStep: number;
  /** Parallel efficiency used (given, or derived from the halo model). */
  efficiency: number;
  model: 'single node' | 'stated efficiency' | 'halo exchange';
}

export interface RuntimeResult {
  /** Interior cell updates (cells × steps) and absorber cell updates. */
  interiorUpdates: number;
  absorberUpdates: number;
  /** Interior-equivalent work: interior + factor × absorber updates. */
  work: number;
  absorberFactor: number;
  interiorSeconds: number;
  absorberSeconds: number;
  exchangeSeconds: number;
  totalSeconds: number;
  /** Cost on all nodes; null without a price. */
  cost: number | null;
  /** Share of the runtime spent on absorber work, %. */
  absorberSharePercent: number;
}

export interface CostResult {
  domain: DomainCounts;
  memory: MemoryResult;
  time: TimeResult | null;
  parallel: ParallelResult;
  runtime: RuntimeResult | null;
}

/** Time step, simulated time and step count of a run on a `dims`-D grid whose longest side has `longestSideCells` cells. */
export function runTime(spec: RunTimeSpec, dims: number, longestSideCells: number): TimeResult {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('run time', 'run time spec must be an object', 'value');
  const dt = timeStep(spec.cellMetres, spec.courant, dims);
  wholeInRange('longest side (cells)', longestSideCells, 1, Number.MAX_SAFE_INTEGER);
  const given = [spec.duration, spec.passes, spec.q].filter((v) => v !== undefined).length;
  if (given !== 1) {
    throw new HushInputError('run length', `give exactly one of duration, passes or q (got ${given})`, 'value');
  }
  let T: number;
  let source: TimeResult['source'];
  if (spec.duration !== undefined) {
    T = inRange('duration', spec.duration, 0, 1e3, { loOpen: true, unit: 's' });
    source = 'duration';
  } else if (spec.passes !== undefined) {
    const p = inRange('passes', spec.passes, 0, 1e6, { loOpen: true });
    const n = inRange('background index', spec.index ?? 1, 1, 100);
    T = (p * longestSideCells * spec.cellMetres * n) / SPEED_OF_LIGHT;
    source = 'passes';
  } else {
    if (spec.ringFrequencyHz === undefined) throw new HushInputError('ring-down frequency', 'q needs the frequency of the resonance', 'value');
    T = ringdownTime(spec.q as number, spec.ringFrequencyHz, spec.ringTarget ?? DEFAULT_RING_TARGET);
    source = 'ringdown';
  }
  return { timeStep: dt, duration: T, steps: stepCount(T, dt), source };
}

/** Divisor split of `nodes` over the axes minimising the total cut area; ties keep the earlier axes split more. */
export function blockSplit(axisCells: number[], nodes: number): number[] {
  const dims = axisCells.length;
  let best: number[] | null = null;
  let bestArea = Infinity;
  const p = new Array<number>(dims).fill(1);
  const cross = (a: number) => axisCells.reduce((prod, v, b) => (b === a ? prod : prod * v), 1);
  const rec = (a: number, left: number) => {
    if (a === dims - 1) {
      if (left > axisCells[a]) return;
      p[a] = left;
      let area = 0;
      for (let b = 0; b < dims; b++) area += (p[b] - 1) * cross(b);
      if (area < bestArea) {
        bestArea = area;
        best = p.slice();
      }
      return;
    }
    for (let d = 1; d <= left && d <= axisCells[a]; d++) {
      if (left % d === 0) {
        p[a] = d;
        rec(a + 1, left / d);
      }
    }
  };
  rec(0, nodes);
  if (!best) throw new HushInputError('nodes', `${nodes} nodes cannot split a ${axisCells.join('×')} grid into blocks of at least one cell`);
  return best;
}

function slabSplit(axisCells: number[], nodes: number): number[] {
  let a = 0;
  for (let b = 1; b < axisCells.length; b++) if (axisCells[b] > axisCells[a]) a = b;
  if (nodes > axisCells[a]) throw new HushInputError('nodes', `${nodes} slabs are more than the ${axisCells[a]} cells of the longest axis`);
  return axisCells.map((_, b) => (b === a ? nodes : 1));
}

/**
 * Memory, steps, runtime and price of a run.
 * Example: runCost({ domain: { dimensions: 1, interior: [100], layers: 10 } }).memory.totalBytes
 * = 120 cells × 3 values × 4 bytes + 20 × 2 ψ × 4 bytes = 1600.
 */
export function runCost(spec: CostSpec): CostResult {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('cost', 'cost spec must be an object', 'value');
  const dom = domainCounts(spec.domain);
  const dims = dom.dimensions;
  const bpv = bytesPerValue(spec.precision ?? 'single');
  const fieldsPerCell = wholeInRange('field values per cell', spec.fieldsPerCell ?? defaultFieldsPerCell(dims), 1, 64);
  const materialPerCell = inRange('material values per cell', spec.materialPerCell ?? defaultMaterialPerCell(dims), 0, 64);
  const fieldBytes = dom.cellsTotal * fieldsPerCell * bpv;
  const materialBytes = dom.cellsTotal * materialPerCell * bpv;
  const psiBytes = dom.psiTotal * bpv;
  const memory: MemoryResult = {
    bytesPerValue: bpv,
    fieldsPerCell,
    materialPerCell,
    fieldBytes,
    materialBytes,
    psiBytes,
    totalBytes: fieldBytes + materialBytes + psiBytes,
  };
  const longest = Math.max(...dom.axisCells);
  const time = spec.time ? runTime(spec.time, dims, longest) : null;

  const nodes = wholeInRange('nodes', spec.nodes ?? 1, 1, MAX_NODES);
  const absorberFactor = inRange('absorber update factor', spec.absorberFactor ?? DEFAULT_ABSORBER_FACTOR, 1, 100);
  const throughput =
    spec.throughput === undefined ? undefined : inRange('throughput', spec.throughput, 1, 1e16, { unit: 'cell updates per second' });
  const price = spec.pricePerHour === undefined ? undefined : inRange('price per hour', spec.pricePerHour, 0, 1e7);
  const latency = inRange('latency', spec.latency ?? 0, 0, 1, { unit: 's' });
  const bandwidth = spec.bandwidth === undefined ? undefined : inRange('bandwidth', spec.bandwidth, 1, 1e14, { unit: 'bytes per second' });
  const efficiencyIn = spec.efficiency === undefined ? undefined : inRange('parallel efficiency', spec.efficiency, 0.01, 1);

  let parallel: ParallelResult;
  if (nodes === 1) {
    parallel = { nodes, decomposition: 'none', split: dom.axisCells.map(() => 1), haloBytesPerStep: 0, haloBytesPerNodePerStep: 0, messagesPerNodePerStep: 0, efficiency: 1, model: 'single node' };
  } else {
    const decomposition = spec.decomposition ?? 'slab';
    if (decomposition !== 'slab' && decomposition !== 'block') {
      throw new HushInputError('decomposition', `decomposition must be "slab" or "block" (got ${JSON.stringify(decomposition)})`, 'value');
    }
    const split = decomposition === 'slab' ? slabSplit(dom.axisCells, nodes) : blockSplit(dom.axisCells, nodes);
    const hv = haloValuesPerCell(dims);
    let total = 0;
    let perNode = 0;
    let messages = 0;
    for (let a = 0; a < dims; a++) {
      if (split[a] === 1) continue;
      let crossFull = 1;
      let crossSub = 1;
      for (let b = 0; b < dims; b++) {
        if (b === a) continue;
        crossFull *= dom.axisCells[b];
        crossSub *= Math.ceil(dom.axisCells[b] / split[b]);
      }
      const neighbours = Math.min(2, split[a] - 1);
      total += (split[a] - 1) * crossFull * hv * bpv;
      perNode += neighbours * crossSub * (hv / 2) * bpv;
      messages += 2 * neighbours;
    }
    if (efficiencyIn === undefined && bandwidth === undefined) {
      throw new HushInputError('nodes', `${nodes} nodes need a parallel efficiency (for example 0.8) or a network bandwidth for the halo-exchange model`, 'value');
    }
    parallel = {
      nodes,
      decomposition,
      split,
      haloBytesPerStep: total,
      haloBytesPerNodePerStep: perNode,
      messagesPerNodePerStep: messages,
      efficiency: efficiencyIn ?? 1,
      model: bandwidth === undefined || efficiencyIn !== undefined ? 'stated efficiency' : 'halo exchange',
    };
  }

  let runtime: RuntimeResult | null = null;
  if (time && throughput !== undefined) {
    const interiorUpdates = dom.cellsInterior * time.steps;
    const absorberUpdates = dom.cellsAbsorber * time.steps;
    const work = interiorUpdates + absorberFactor * absorberUpdates;
    const rate = throughput * nodes;
    let interiorSeconds: number;
    let absorberSeconds: number;
    let exchangeSeconds = 0;
    if (parallel.model === 'halo exchange') {
      // No overlap of exchange and compute (conservative); work spread evenly over the nodes.
      interiorSeconds = interiorUpdates / rate;
      absorberSeconds = (absorberFactor * absorberUpdates) / rate;
      exchangeSeconds = time.steps * (parallel.messagesPerNodePerStep * latency + parallel.haloBytesPerNodePerStep / (bandwidth as number));
      parallel.efficiency = (interiorSeconds + absorberSeconds) / (interiorSeconds + absorberSeconds + exchangeSeconds);
    } else {
      interiorSeconds = interiorUpdates / (rate * parallel.efficiency);
      absorberSeconds = (absorberFactor * absorberUpdates) / (rate * parallel.efficiency);
    }
    const totalSeconds = interiorSeconds + absorberSeconds + exchangeSeconds;
    runtime = {
      interiorUpdates,
      absorberUpdates,
      work,
      absorberFactor,
      interiorSeconds,
      absorberSeconds,
      exchangeSeconds,
      totalSeconds,
      cost: price === undefined ? null : (totalSeconds / 3600) * price * nodes,
      absorberSharePercent: (100 * absorberSeconds) / totalSeconds,
    };
  }
  return { domain: dom, memory, time, parallel, runtime };
}

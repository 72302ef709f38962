/**
 * The whole accuracy budget of one study (issue: dispersion and run length
 * beside the absorber). The tolerated intensity error is shared between
 *  - the absorber's echo (the exact discrete reflection of its design,
 *    physics.md §1–§3),
 *  - the grid's numerical dispersion (a phase slip over `path`, or the shift
 *    of a measured resonance line, physics.md §7; src/physics/dispersion-error.ts),
 *  - the run length (the ring-down left by a run on a resonance, or the pulse
 *    energy left in the domain; src/physics/run-error.ts),
 * and the cheapest combination of cell, duration and absorber that meets it
 * is searched (src/physics/accuracy-split.ts). The plan layer supplies the
 * callbacks: the design search at a cell, the cost model, the error models.
 *
 * What the user fixes stays fixed: a typed duration or passes fix the run; q
 * with ring_target fixes it too; cell_min = cell fixes the cell. `share`
 * overrides the split: the absorber gets that share of the tolerance at the
 * user's cell, as in earlier versions, and the other parts are reported.
 */
import { SPEED_OF_LIGHT } from '../physics/constants';
import { intensityErrorFromAmplitude, requiredAmplitude, type BudgetOptions } from '../physics/budget';
import { DEFAULT_RING_TARGET, runCost, type CostResult } from '../physics/cost';
import { designAbsorber, type DesignResult } from '../physics/design';
import { dispersionError, dispersionPpwForError } from '../physics/dispersion-error';
import { HushInputError, isHushInputError } from '../physics/errors';
import { conductivityNorm } from '../physics/normalise';
import { ringdownTime } from '../physics/ringdown';
import { bandPulseWidth, passesDuration, pulseRunError, pulseSourceDuration, resonanceRunDuration, resonanceRunError, transitTime } from '../physics/run-error';
import { splitAccuracy, type CellCandidate, type RunModel, type SplitErrors } from '../physics/accuracy-split';
import { cellsFor, type PlanInputs } from './row';

/** Finest cell the split may choose by default, as a fraction of the user's cell (cell_min = cell/4). */
export const DEFAULT_CELL_REFINEMENT = 4;
/** Rounds of the run-length transit against the design's layer count (the transit crosses one absorber). */
const TRANSIT_ROUNDS = 3;

/** Grid quantities of the study at one cell size. */
export interface GridAt {
  cell: number;
  ppwShort: number;
  ppwLong: number;
  ppwDensest: number;
  alphaMaxNorm: number;
  interiorCells: number[];
  gapCells: number;
}

/** The study's grid at `cell`: the physical sizes kept, cell counts rounded up (a ratio within 10⁻⁹ of a whole number counting as it). */
export function gridAt(i: PlanInputs, cell: number): GridAt {
  const same = cell === i.cell;
  return {
    cell,
    // Cells per wavelength in a medium of index n: λ_vacuum/(n·Δ) (physics.md §3).
    ppwShort: i.wavelengthShort / (i.index * cell),
    ppwLong: i.wavelengthLong / (i.index * cell),
    ppwDensest: i.wavelengthShort / (i.indexMax * cell),
    alphaMaxNorm: conductivityNorm(i.alphaMax, cell, i.index),
    interiorCells: same ? i.interiorCells : i.interiorCells.map((n) => cellsFor(n * i.cell, cell)),
    gapCells: same || i.gapCells === 0 ? i.gapCells : cellsFor(i.gapCells * i.cell, cell),
  };
}

export function budgetOptions(i: PlanInputs): BudgetOptions {
  return { coupling: i.coupling, faces: i.facesSeen, phase: i.phase, monitor: i.monitor };
}

/** The thinnest design meeting `target` on the study's grid at `g`. */
export function designAt(i: PlanInputs, g: GridAt, target: number): DesignResult {
  return designAbsorber({
    target,
    ppwMin: g.ppwShort,
    ppwMax: g.ppwLong,
    angleMaxDeg: i.angleMaxDeg,
    courant: i.courant,
    dimensions: i.dimensions,
    index: i.index,
    orders: i.orders,
    // Fixed only when the user typed them; otherwise the design chooses κ_max and α_max where a near field asks for them.
    kappaMax: i.kappaMaxGiven ? i.kappaMax : undefined,
    alphaMaxNorm: i.alphaMaxGiven ? g.alphaMaxNorm : undefined,
    sampling: i.sampling,
    absorberIndices: i.absorberIndices,
    azimuthMaxDeg: i.azimuthMaxDeg ?? undefined,
    minLayers: i.minLayers,
    decayMinCells: i.decayMin === null ? undefined : i.decayMin / g.cell,
    gapCells: g.gapCells,
  });
}

/** The domain, memory, steps and runtime of the study at `g` with `layers` and a run of `duration` (s, or none). */
export function costAt(i: PlanInputs, g: GridAt, layers: number, duration: number | null): CostResult {
  return runCost({
    domain: { dimensions: i.dimensions, interior: g.interiorCells, layers, faces: i.faces, gap: g.gapCells },
    precision: i.precision,
    fieldsPerCell: i.fieldsPerCell ?? undefined,
    materialPerCell: i.materialPerCell ?? undefined,
    time: duration === null ? undefined : { cellMetres: g.cell, courant: i.courant, duration },
    absorberFactor: i.absorberFactor,
    throughput: i.throughput ?? undefined,
    pricePerHour: i.pricePerHour ?? undefined,
    nodes: i.nodes,
    efficiency: i.efficiency ?? undefined,
    decomposition: i.decomposition,
    bandwidth: i.bandwidth ?? undefined,
    latency: i.latency,
  });
}

/** What the split minimises, in the study's own terms: its price, else its runtime, else its cell updates, else its cells. */
export type CostMeasure = 'price' | 'runtime' | 'cell updates' | 'cells';

export function costMeasure(i: PlanInputs, hasRun: boolean): CostMeasure {
  if (!hasRun) return 'cells';
  if (i.throughput === null) return 'cell updates';
  return i.pricePerHour === null ? 'runtime' : 'price';
}

function measureOf(c: CostResult, m: CostMeasure): number {
  if (m === 'cells') return c.domain.cellsTotal;
  if (m === 'cell updates') return c.runtime ? c.runtime.work : (c.time ? c.time.steps : 1) * c.domain.cellsTotal;
  const rt = c.runtime;
  if (!rt) return Infinity;
  return m === 'runtime' ? rt.totalSeconds : (rt.cost ?? Infinity);
}

/** Wavelengths of the path in the densest medium at the band's short end (a length L is L·n_max/λ_short). */
function pathWavelengths(i: PlanInputs): number | undefined {
  if (i.path === null) return undefined;
  return 'wavelengths' in i.path ? i.path.wavelengths : (i.path.metres * i.indexMax) / i.wavelengthShort;
}

/** True when the study has a dispersion error to budget (a path, or a measured resonance line). */
export function hasDispersionError(i: PlanInputs): boolean {
  return i.path !== null || (i.q !== null && i.resonance === 'line');
}

function dispersionSpec(i: PlanInputs) {
  return {
    courant: i.courant,
    dimensions: i.dimensions,
    index: i.indexMax,
    pathWavelengths: pathWavelengths(i),
    q: i.q !== null && i.resonance === 'line' ? i.q : undefined,
    phase: i.phase,
  };
}

/** The dispersion error at a cell (0 without a path or a measured line; unbounded below the grid's propagation limit). */
export function dispersionAt(i: PlanInputs, cell: number): number {
  if (!hasDispersionError(i)) return 0;
  try {
    return dispersionError({ ppw: i.wavelengthShort / (i.indexMax * cell), ...dispersionSpec(i) }).error;
  } catch (e) {
    if (isHushInputError(e)) return Infinity;
    throw e;
  }
}

/** The resonance's shift on the grid in linewidths, Q·|Δf/f| (reported whether or not it is budgeted); null without q. */
export function resonanceShiftAt(i: PlanInputs, cell: number): number | null {
  if (i.q === null) return null;
  try {
    return dispersionError({ ppw: i.wavelengthShort / (i.indexMax * cell), courant: i.courant, dimensions: i.dimensions, index: i.indexMax, q: i.q, phase: i.phase }).shiftLinewidths;
  } catch (e) {
    if (isHushInputError(e)) return null;
    throw e;
  }
}

/** Fewest cells per wavelength (densest medium, band's short end) at which the dispersion error fits `error`; null when none applies. */
export function ppwForDispersion(i: PlanInputs, error: number): number | null {
  if (!hasDispersionError(i) || !(error > 0)) return null;
  try {
    return dispersionPpwForError(dispersionSpec(i), error);
  } catch (e) {
    if (isHushInputError(e)) return null;
    throw e;
  }
}

/** Width of the band's Gaussian source (s), or null for a single frequency (a continuous wave has no pulse to wait for). */
function pulseWidth(i: PlanInputs): number | null {
  if (i.wavelengthShort === i.wavelengthLong) return null;
  try {
    return bandPulseWidth(SPEED_OF_LIGHT / i.wavelengthLong, SPEED_OF_LIGHT / i.wavelengthShort);
  } catch (e) {
    if (isHushInputError(e)) return null;
    throw e;
  }
}

/** One transit of the longest side (inside the absorbers, plus one absorber of `layers`) at the grid's group velocity. */
function transitAt(i: PlanInputs, g: GridAt, layers: number): number {
  let longest = 0;
  g.interiorCells.forEach((n, a) => {
    const gaps = (i.faces[2 * a] === 'absorbing' ? 1 : 0) + (i.faces[2 * a + 1] === 'absorbing' ? 1 : 0);
    longest = Math.max(longest, n + gaps * g.gapCells);
  });
  return transitTime({ cellMetres: g.cell, cells: longest, layers, ppw: g.ppwShort, index: i.index, courant: i.courant, dimensions: i.dimensions });
}

/** How the run enters the split for this study, with `layers` for the transit. */
function runModel(i: PlanInputs, layers: number): { model: RunModel; ringFixed: boolean } {
  const tau = pulseWidth(i);
  const pulseError = (cell: number, T: number): number => {
    if (tau === null) return 0;
    return pulseRunError({ pulseWidthSeconds: tau, transitSeconds: transitAt(i, gridAt(i, cell), layers), phase: i.phase }, T);
  };
  if (i.duration !== null) {
    const T = i.duration;
    return { model: { kind: 'fixed', duration: () => T, error: pulseError }, ringFixed: false };
  }
  if (i.passes !== null) {
    const passes = i.passes;
    const source = tau === null ? 0 : pulseSourceDuration(tau);
    return { model: { kind: 'fixed', duration: (cell) => passesDuration(passes, transitAt(i, gridAt(i, cell), layers), source), error: pulseError }, ringFixed: false };
  }
  if (i.q !== null) {
    const spec = { q: i.q, frequencyHz: i.ringFrequency as number, phase: i.phase };
    if (i.ringTargetGiven) {
      const T = ringdownTime(i.q, spec.frequencyHz, i.ringTarget as number);
      return { model: { kind: 'fixed', duration: () => T, error: (_c, t) => resonanceRunError(spec, t) }, ringFixed: true };
    }
    const baseline = ringdownTime(i.q, spec.frequencyHz, DEFAULT_RING_TARGET);
    return {
      model: {
        kind: 'searched',
        durationFor: (_c, e) => resonanceRunDuration(spec, e),
        error: (_c, t) => resonanceRunError(spec, t),
        baselineDuration: () => baseline,
      },
      ringFixed: false,
    };
  }
  return { model: { kind: 'none' }, ringFixed: false };
}

/** The accuracy split chosen for a study. */
export interface AccuracyPlan {
  cell: number;
  duration: number | null;
  design: DesignResult;
  errors: SplitErrors;
  shares: { absorber: number; dispersion: number; run: number };
  /** What the costs are measured in. */
  measure: CostMeasure;
  /** Cost of this plan, and of the plan that gives the absorber all the rest at the user's cell and duration (null when that plan cannot meet the tolerance). */
  cost: number;
  baselineCost: number | null;
  baselineNote: string | null;
  /** baselineCost − cost (≥ 0), or null. */
  saving: number | null;
  /** What the absorber adds to the cost; what the finer cell adds (0 at the user's cell). */
  absorberCost: number;
  refinementCost: number;
  /** Fewest cells per wavelength (densest, short end) the dispersion share allows; null without a dispersion error. */
  ppwMin: number | null;
  /** The resonance's shift on the planned grid, in linewidths (null without q). */
  resonanceShift: number | null;
  /** True when `share` overrode the split. */
  shareOverride: boolean;
  /** Candidate cells the split looked at (for the breakdown chart). */
  cells: CellCandidate[];
  designSearches: number;
  truncated: boolean;
}

function combine(worst: boolean, a: number, d: number, r: number): number {
  return worst ? a + d + r : Math.sqrt(a * a + d * d + r * r);
}

function sharesOf(worst: boolean, e: SplitErrors, tol: number) {
  const s = (x: number) => (worst ? x / tol : (x * x) / (tol * tol));
  return { absorber: s(e.absorber), dispersion: s(e.dispersion), run: s(e.run) };
}

function seconds(t: number): string {
  const [f, u] = t < 1e-12 ? [1e15, 'fs'] : t < 1e-9 ? [1e12, 'ps'] : t < 1e-6 ? [1e9, 'ns'] : t < 1e-3 ? [1e6, 'us'] : [1, 's'];
  return `${Number((t * f).toPrecision(3))} ${u}`;
}

function nm(m: number): string {
  return `${Number((m * 1e9).toPrecision(4))} nm`;
}

/** The split when `share` overrides it: the absorber takes share·ε at the user's cell; the run (when searched) takes what is left. */
function overridePlan(i: PlanInputs, measure: CostMeasure): AccuracyPlan {
  const worst = i.phase === 'worst';
  const g = gridAt(i, i.cell);
  const opts = budgetOptions(i);
  const design = designAt(i, g, requiredAmplitude({ intensityError: i.intensityError, share: i.share as number, ...opts }));
  const absorber = intensityErrorFromAmplitude(design.worstAmplitude, opts);
  const dispersion = dispersionAt(i, i.cell);
  const { model } = runModel(i, design.layers);
  let duration: number | null = null;
  let run = 0;
  if (model.kind === 'fixed') {
    duration = model.duration(i.cell);
    run = model.error(i.cell, duration);
  } else if (model.kind === 'searched') {
    const used = combine(worst, absorber, dispersion, 0);
    const left = worst ? i.intensityError - used : Math.sqrt(Math.max(0, i.intensityError ** 2 - used ** 2));
    if (!(left > 0)) {
      throw new HushInputError('share', `share ${i.share} leaves nothing of the intensity error for the run's ring-down (absorber ${absorber.toPrecision(3)}, dispersion ${dispersion.toPrecision(3)}): lower share or clear it`);
    }
    duration = resonanceRunDuration({ q: i.q as number, frequencyHz: i.ringFrequency as number, phase: i.phase }, Math.min(left, 1) * (1 - 1e-9));
    run = model.error(i.cell, duration);
  }
  const errors: SplitErrors = { absorber, dispersion, run, combined: combine(worst, absorber, dispersion, run) };
  const c = costAt(i, g, design.layers, duration);
  const bare = costAt(i, g, 0, duration);
  return {
    cell: i.cell,
    duration,
    design,
    errors,
    shares: sharesOf(worst, errors, i.intensityError),
    measure,
    cost: measureOf(c, measure),
    baselineCost: null,
    baselineNote: null,
    saving: null,
    absorberCost: measureOf(c, measure) - measureOf(bare, measure),
    refinementCost: 0,
    ppwMin: ppwForDispersion(i, Math.max(dispersion, Number.MIN_VALUE)),
    resonanceShift: resonanceShiftAt(i, i.cell),
    shareOverride: true,
    cells: [],
    designSearches: 1,
    truncated: false,
  };
}

/** Plans the split of the study's tolerance: the cheapest cell, duration and absorber that meet it together. */
export function planAccuracy(i: PlanInputs): AccuracyPlan {
  const hasRun = i.duration !== null || i.passes !== null || i.q !== null;
  const measure = costMeasure(i, hasRun);
  if (i.share !== null) return overridePlan(i, measure);
  const worst = i.phase === 'worst';
  const opts = budgetOptions(i);
  const cellMin = hasDispersionError(i) ? (i.cellMin ?? i.cell / DEFAULT_CELL_REFINEMENT) : i.cell;
  let layers = 0;
  let result: ReturnType<typeof splitAccuracy<DesignResult>> | null = null;
  let designSearches = 0;
  // The pulse's transit crosses one absorber: plan with a layer count, then again with the design's own until it stays.
  for (let round = 0; round < TRANSIT_ROUNDS; round++) {
    const { model } = runModel(i, layers);
    try {
      result = splitAccuracy<DesignResult>({
        tolerance: i.intensityError,
        phase: i.phase,
        cellMax: i.cell,
        cellMin: Math.min(cellMin, i.cell),
        dispersionError: (cell) => dispersionAt(i, cell),
        run: model,
        absorber: (cell, e) => {
          const design = designAt(i, gridAt(i, cell), requiredAmplitude({ intensityError: e, ...opts }));
          return { design, error: intensityErrorFromAmplitude(design.worstAmplitude, opts) };
        },
        cost: (cell, d, T) => measureOf(costAt(i, gridAt(i, cell), d ? d.layers : 0, T), measure),
      });
    } catch (e) {
      if (!isHushInputError(e) || e.field !== 'intensity error') throw e;
      const need = ppwForDispersion(i, i.intensityError);
      const finest = cellMin;
      if (model.kind === 'fixed') {
        const T = model.duration(i.cell);
        const runError = model.error(i.cell, T);
        if (runError >= i.intensityError) {
          const tau = pulseWidth(i);
          throw new HushInputError(
            i.duration !== null ? 'duration' : 'intensity_error',
            `no plan meets intensity_error ${i.intensityError}: the run of ${seconds(T)} alone leaves ${Number((100 * runError).toPrecision(3))} % of intensity error` +
              (tau !== null && i.q === null ? ` (a pulse covering the band lasts about ${seconds(pulseSourceDuration(tau))} and must leave the domain before the run stops)` : '') +
              `: give a longer ${i.q !== null ? 'ring-down (a lower ring_target, or clear it to let the planner choose)' : 'duration or more passes'}`,
          );
        }
      }
      const why =
        dispersionAt(i, finest) >= i.intensityError
          ? `the grid's dispersion alone exceeds it at the finest cell allowed, ${nm(finest)} (cell_min)${need ? `; it needs at least ${Math.ceil(need)} cells per wavelength in the densest material, a cell of ${nm(i.wavelengthShort / (i.indexMax * need))} or less` : ''}: set cell_min lower, shorten the path or relax the tolerance`
          : `no absorber and run fit what the dispersion leaves at any cell from ${nm(i.cell)} down to ${nm(finest)}: relax the tolerance, allow a finer cell (cell_min) or a longer run`;
      throw new HushInputError('intensity_error', `no plan meets intensity_error ${i.intensityError}: ${why}`);
    }
    designSearches += result.evaluations.absorber;
    const used = result.best.design.layers;
    if (!hasRun || i.q !== null || used <= layers) break;
    layers = used;
  }
  const r = result as NonNullable<typeof result>;
  const best = r.best;
  // The run as the chosen design really has it (the transit crosses its own layers).
  if (hasRun && i.q === null) {
    const { model } = runModel(i, best.design.layers);
    if (model.kind === 'fixed') {
      const T = model.duration(best.cell);
      const run = model.error(best.cell, T);
      const errors = { ...best.errors, run, combined: combine(worst, best.errors.absorber, best.errors.dispersion, run) };
      Object.assign(best, { duration: T, errors, shares: sharesOf(worst, errors, i.intensityError) });
    }
  }
  const baseBare = costAt(i, gridAt(i, i.cell), 0, best.duration);
  const bestBare = costAt(i, gridAt(i, best.cell), 0, best.duration);
  return {
    cell: best.cell,
    duration: best.duration,
    design: best.design,
    errors: best.errors,
    shares: best.shares,
    measure,
    cost: best.cost,
    baselineCost: r.baseline ? r.baseline.cost : null,
    baselineNote: r.baselineNote,
    saving: r.saving,
    absorberCost: best.absorberCost,
    refinementCost: best.cell === i.cell ? 0 : measureOf(bestBare, measure) - measureOf(baseBare, measure),
    ppwMin: ppwForDispersion(i, best.errors.dispersion > 0 ? best.errors.dispersion : 0),
    resonanceShift: resonanceShiftAt(i, best.cell),
    shareOverride: false,
    cells: r.cells,
    designSearches,
    truncated: r.truncated,
  };
}

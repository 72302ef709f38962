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
import { MODEL_VERSION } from '../physics/constants';
import { conductivityNorm } from '../physics/normalise';
import { courantLimit } from '../physics/courant';
import { MIN_INTENSITY_ERROR, requiredAmplitude } from '../physics/budget';
import { clearDesignCache, type DesignResult } from '../physics/design';
import { type CostResult } from '../physics/cost';
import { budgetOptions, costAt, gridAt, planAccuracy, type AccuracyPlan } from './accuracy';
import { accuracyNotes, designNotes } from './accuracy-notes';
import { setBounded } from '../physics/bounded-map';
import { HushInputError } from '../physics/errors';
import { OUTPUT_COLUMNS, OUTPUT_NAMES, errorRecord, outputHeaderText, planRecord, type OutputColumn, type PlanCell, type PlanRecord } from './fields';
import { planInputs, type PlanInputs, type ProjectRow } from './row';

export * from './fields';
export { APP_VERSION } from './version';
export { parseCsv, writeCsv } from './csv';
export * from './steps';
export { planInputs, rowFromTable, columnLetters, columnValue, type FieldValue, type PlanInputs, type ProjectRow, type ColumnProblem } from './row';

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
  /** The split of the tolerance between the absorber, the dispersion and the run, and the cell and duration it chose. */
  accuracy: AccuracyPlan;
  design: DesignResult;
  cost: CostResult;
  warnings: string[];
}

/** Common practice (physics.md §4): at least 10 cells per shortest wavelength in the densest material. */
export const MIN_ADVISED_PPW = 10;
/** Common practice: keep the absorber at least half a (longest, in-medium) wavelength from the structure. */
export const MIN_ADVISED_GAP_WAVELENGTHS = 0.5;
/** Fewer cells per wavelength than this cannot be a grid for the band: a unit slip in the cell (refused, naming the cell). */
export const MIN_PLAUSIBLE_PPW = 2;
/** More cells per wavelength than this (in the densest material) are noted as a likely unit slip: 1000× the common 10–40 is 10⁴. */
export const MAX_PLAUSIBLE_PPW = 1e4;

/** A length in m for a message, in the unit people would write it (nm, um, mm or m). */
function plainLength(m: number): string {
  const [f, u] = m < 1e-6 ? [1e9, 'nm'] : m < 1e-3 ? [1e6, 'um'] : m < 1 ? [1e3, 'mm'] : [1, 'm'];
  return `${Number((m * f).toPrecision(6))} ${u}`;
}

/** Above this angle the absorber's attenuation (∝ cos θ) drops fast; warn. */
export const GRAZING_WARNING_DEG = 60;
/** Largest angle at which tests/verification.test.ts (and the audit runs) confirmed the exact model by a 2-D time-domain run. */
export const VERIFIED_ANGLE_DEG = 60;

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
  // The study's name does not change a plan: rows that differ only in it are planned once.
  const key = JSON.stringify({ ...inputs, study: '' });
  const hit = cache.get(key);
  if (hit) return hit.inputs.study === inputs.study ? hit : deepFreeze({ ...hit, inputs });
  const i = inputs;
  const warnings: string[] = [];
  // Cells per wavelength in a medium of index n: λ_vacuum/(n·Δ) (physics.md §3).
  const userPpwShort = i.wavelengthShort / (i.index * i.cell);
  // A cell 1000× off (a unit slip: 20 um for 20 nm, or 0.02 nm) shows as an absurd resolution; say so in the cell's terms.
  if (userPpwShort < MIN_PLAUSIBLE_PPW) {
    throw new HushInputError(
      'cell',
      `cell ${plainLength(i.cell)} gives ${userPpwShort.toPrecision(3)} cells per wavelength at the band's short end (${plainLength(i.wavelengthShort)} in index ${i.index}): no grid resolves that; check the cell's unit (a bare number is in nm)`,
    );
  }
  const alphaMaxNorm0 = conductivityNorm(i.alphaMax, i.cell, i.index);
  if (!Number.isFinite(alphaMaxNorm0)) {
    throw new HushInputError('alpha_max', `alpha_max ${i.alphaMax} S/m is out of range for a ${i.cell} m cell at index ${i.index} (α·η₀·Δ·n overflows)`);
  }
  const hasRun = i.duration !== null || i.passes !== null || i.q !== null;
  const accuracy = planAccuracy(i);
  const design = accuracy.design;
  const g = gridAt(i, accuracy.cell);
  const { ppwShort, ppwLong, ppwDensest, alphaMaxNorm } = g;
  const cost = costAt(i, g, design.layers, accuracy.duration);
  // The amplitude the absorber may reflect: its part of the tolerance, what the dispersion and the run leave.
  const worst = i.phase === 'worst';
  const rest = worst
    ? i.intensityError - accuracy.errors.dispersion - accuracy.errors.run
    : Math.sqrt(Math.max(0, i.intensityError ** 2 - accuracy.errors.dispersion ** 2 - accuracy.errors.run ** 2));
  const required = accuracy.shareOverride
    ? requiredAmplitude({ intensityError: i.intensityError, share: i.share as number, ...budgetOptions(i) })
    : requiredAmplitude({ intensityError: Math.max(rest, MIN_INTENSITY_ERROR), ...budgetOptions(i) });

  // Values below a threshold are shown rounded down, so a shortfall never reads as the threshold itself.
  const down = (x: number, digits: number) => (Math.floor(x * 10 ** digits) / 10 ** digits).toFixed(digits);
  if (ppwDensest < MIN_ADVISED_PPW) {
    warnings.push(
      `resolution: ${down(ppwDensest, 1)} cells per wavelength in the densest material (index ${i.indexMax}) at the short end; common practice is at least ${MIN_ADVISED_PPW}`,
    );
  }
  const gapWavelengths = (g.gapCells * g.cell * i.index) / i.wavelengthLong;
  if (i.gapGiven && gapWavelengths < MIN_ADVISED_GAP_WAVELENGTHS) {
    warnings.push(
      `absorber close to the structure: gap ${g.gapCells} cells = ${down(gapWavelengths, 2)} wavelengths (longest, in the background); common practice keeps at least ${MIN_ADVISED_GAP_WAVELENGTHS} so near fields decay before the absorber`,
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
  if (ppwDensest > MAX_PLAUSIBLE_PPW) {
    warnings.push(
      `resolution: ${Math.round(ppwDensest)} cells per wavelength in the densest material is far finer than any study needs (common practice: 10 to 40); check the cell's unit (cell ${plainLength(i.cell)})`,
    );
  }
  warnings.push(...i.unusedNotes);
  warnings.push(...accuracyNotes(i, accuracy));
  warnings.push(...designNotes(i, accuracy));
  if (cost.parallel.model === 'halo exchange' && cost.parallel.efficiency < 0.5) {
    warnings.push(`halo exchange dominates: parallel efficiency ${cost.parallel.efficiency.toFixed(2)} on ${i.nodes} nodes; fewer nodes or a block decomposition may be cheaper`);
  }
  const plan: Plan = {
    modelVersion: MODEL_VERSION,
    inputs,
    requiredReflection: required,
    grid: { ppwShort, ppwLong, ppwDensest, courantLimit: courantLimit(i.dimensions), alphaMaxNorm },
    accuracy,
    design,
    cost,
    warnings,
  };
  deepFreeze(plan);
  setBounded(cache, key, plan, PLAN_CACHE_LIMIT);
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

/**
 * Frees what planning keeps for later rows: the plan cache and the design
 * search's caches and shared work. `hush plan` calls it once every row is
 * planned, so writing a large table does not carry them too.
 */
export function releasePlanningCaches(): void {
  cache.clear();
  clearDesignCache();
}

/** Output columns in order, with units (the worksheet's spilled row and the CLI's added columns). */
export function planHeader(): readonly OutputColumn[] {
  return OUTPUT_COLUMNS;
}

/** Header texts "name [unit]" of the output columns. */
export function planHeaderText(): string[] {
  return OUTPUT_COLUMNS.map(outputHeaderText);
}

/** Values of a plan in `planHeader()` order (null where the plan has no value). */
export function planToRow(plan: Plan): PlanCell[] {
  const r = planRecord(plan);
  return OUTPUT_NAMES.map((n) => r[n]);
}

/** The output row of a row that could not be planned: its error in the notes column. */
export function errorToRow(message: string): PlanCell[] {
  const r = errorRecord(message);
  return OUTPUT_NAMES.map((n) => r[n]);
}

export type { PlanRecord };

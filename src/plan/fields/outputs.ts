/**
 * The output columns of a plan: each one defined once — name, unit, Excel
 * number format, meaning, and how it is read from a plan. A plan becomes a
 * record of these (planRecord); the worksheet's spilled row, the command
 * line's tables and JSON, the table writer and the task pane all take their
 * values from that record by name.
 */
import { MODEL_VERSION } from '../../physics/constants';
import { conductivityFromNorm } from '../../physics/normalise';
import type { Plan } from '../index';

/** A value of one output cell: a number, text, or nothing (the plan has no such figure). */
export type PlanCell = number | string | null;

export interface OutputColumn {
  name: string;
  unit: string;
  description: string;
  /** Excel number format (writers that have them). */
  format: string;
  read: (plan: Plan) => PlanCell;
}

const SCI = '0.00E+00';
const INT = '#,##0';
const FIX1 = '0.0';
const FIX2 = '0.00';
const GB = 1e9;
const HOUR = 3600;

/**
 * 20·log₁₀|r|: an amplitude reflection in decibels (common practice in the
 * absorber literature); null for |r| = 0 (a continuous-theory figure that
 * underflows has no finite dB value).
 */
export function reflectionDb(amplitude: number): number | null {
  return amplitude > 0 ? 20 * Math.log10(amplitude) : null;
}

const hours = (s: number | undefined): PlanCell => (s === undefined ? null : s / HOUR);

function col(name: string, unit: string, format: string, description: string, read: (p: Plan) => PlanCell): OutputColumn {
  return { name, unit, description, format, read };
}

/** Output columns in order. */
export const OUTPUTS: readonly OutputColumn[] = [
  col('required_reflection', '|r|', SCI, 'amplitude reflection allowed per absorbing face', (p) => p.requiredReflection),
  col('required_reflection_db', 'dB', FIX1, 'the same in dB (20·log₁₀|r|)', (p) => reflectionDb(p.requiredReflection)),
  col('error_absorber', '', SCI, "intensity error the absorber's echo causes (its part of the split)", (p) => p.accuracy.errors.absorber),
  col('error_dispersion', '', SCI, "intensity error of the grid's dispersion (path phase slip or measured line shift; 0 when neither applies)", (p) => p.accuracy.errors.dispersion),
  col('error_run', '', SCI, 'intensity error of the run length (ring-down residual or pulse energy left)', (p) => p.accuracy.errors.run),
  col('error_total', '', SCI, 'the three combined as phase says (added, or in quadrature); at most intensity_error', (p) => p.accuracy.errors.combined),
  col('cell_planned', 'm', SCI, 'cell size of the plan (cell, or finer where the dispersion budget needs it)', (p) => p.accuracy.cell),
  col('ppw_min', 'cells/λ', FIX1, "fewest cells per wavelength (densest material, short end) within the dispersion error's share; blank without a dispersion error", (p) => p.accuracy.ppwMin),
  col('resonance_shift', 'linewidths', '0.00', "the resonance's shift on the grid, Q·|Δf/f|; blank without q", (p) => p.accuracy.resonanceShift),
  col('layers', 'cells', '0', 'absorber thickness', (p) => p.design.layers),
  col('order', '', '0', 'polynomial grading order', (p) => p.design.order),
  col('strength', 'σmax/σopt', '0.000', 'conductivity relative to the usual optimum', (p) => p.design.strength),
  col('worst_reflection', '|r|', SCI, 'worst discrete reflection over band and angles', (p) => p.design.worstAmplitude),
  col('worst_reflection_db', 'dB', FIX1, 'the same in dB', (p) => reflectionDb(p.design.worstAmplitude)),
  col('continuous_reflection', '|r|', SCI, 'continuous-theory reflection of the same design', (p) => p.design.continuousAmplitude),
  col('continuous_reflection_db', 'dB', FIX1, 'the same in dB', (p) => reflectionDb(p.design.continuousAmplitude)),
  col('design_kappa_max', '', '0.00', 'κ_max of the design (typed, or chosen for the near field)', (p) => p.design.kappaMax),
  col('design_alpha_max', 'S/m', SCI, 'CFS α_max of the design (typed, or chosen for the near field and the band\'s long end)', (p) => conductivityFromNorm(p.design.alphaMaxNorm, p.accuracy.cell, p.inputs.index)),
  col('worst_evanescent', '|r|', SCI, 'worst near-field reflection seen back at the structure, |r_ev|·e^(−2·gap/L); blank without a near-field check', (p) => p.design.worstEvanescent),
  col('limiting_index', '', '0.00', 'index of the medium crossing the absorber that limits the design', (p) => p.design.limitingIndex),
  col('sampling_checked', '', '@', 'grid convention(s) the design holds for (exact for it)', (p) => p.design.samplingChecked),
  col('absorber_thickness', 'm', SCI, 'layers × cell', (p) => p.design.layers * p.accuracy.cell),
  col('ppw_short', 'cells/λ', FIX1, 'cells per wavelength in the background, short end', (p) => p.grid.ppwShort),
  col('ppw_long', 'cells/λ', FIX1, 'cells per wavelength in the background, long end', (p) => p.grid.ppwLong),
  col('ppw_densest', 'cells/λ', FIX1, 'cells per wavelength in the densest material, short end', (p) => p.grid.ppwDensest),
  col('grid', 'cells', '@', 'whole grid per axis, absorber included', (p) => p.cost.domain.axisCells.join('×')),
  col('cells_total', 'cells', INT, 'all cells', (p) => p.cost.domain.cellsTotal),
  col('cells_absorber', 'cells', INT, 'cells inside the absorber', (p) => p.cost.domain.cellsAbsorber),
  col('overhead_percent', '%', FIX1, 'absorber cells / interior cells', (p) => p.cost.domain.overheadPercent),
  col('psi_total', 'values', INT, 'CPML auxiliary ψ values', (p) => p.cost.domain.psiTotal),
  col('memory', 'GB', '0.000', 'fields + material + ψ', (p) => p.cost.memory.totalBytes / GB),
  col('memory_psi', 'GB', '0.000', 'ψ storage', (p) => p.cost.memory.psiBytes / GB),
  col('memory_fields', 'GB', '0.000', 'field arrays', (p) => p.cost.memory.fieldBytes / GB),
  col('memory_material', 'GB', '0.000', 'material storage', (p) => p.cost.memory.materialBytes / GB),
  col('field_values_per_cell', 'values', INT, 'field values stored per cell (adjust with the fields_per_cell input)', (p) => p.cost.memory.fieldsPerCell),
  col('material_values_per_cell', 'values', INT, 'material values stored per cell (adjust with the material_per_cell input)', (p) => p.cost.memory.materialPerCell),
  col('bytes_per_value', 'B', INT, 'bytes per stored value (4 single, 8 double; the precision input)', (p) => p.cost.memory.bytesPerValue),
  col('time_step', 's', SCI, 'Δt = S·Δ/c', (p) => (p.cost.time ? p.cost.time.timeStep : null)),
  col('simulated_time', 's', SCI, 'run length', (p) => (p.cost.time ? p.cost.time.duration : null)),
  col('steps', '', INT, 'time steps', (p) => (p.cost.time ? p.cost.time.steps : null)),
  col('runtime', 'h', FIX2, 'estimated wall time (planning estimate)', (p) => hours(p.cost.runtime?.totalSeconds)),
  col('runtime_interior', 'h', FIX2, 'of which interior work', (p) => hours(p.cost.runtime?.interiorSeconds)),
  col('runtime_absorber', 'h', FIX2, 'of which absorber work', (p) => hours(p.cost.runtime?.absorberSeconds)),
  col('runtime_exchange', 'h', FIX2, 'of which halo exchange', (p) => hours(p.cost.runtime?.exchangeSeconds)),
  col('absorber_share', '%', FIX1, 'share of runtime spent in the absorber', (p) => (p.cost.runtime ? p.cost.runtime.absorberSharePercent : null)),
  col('cost', 'currency', FIX2, 'runtime × nodes × price per node-hour (planning estimate)', (p) => (p.cost.runtime ? p.cost.runtime.cost : null)),
  col('cost_absorber', 'currency', FIX2, "what the absorber's cell updates add to the cost (planning estimate)", (p) => (p.cost.runtime && p.cost.runtime.cost !== null ? (p.cost.runtime.cost * p.cost.runtime.absorberSharePercent) / 100 : null)),
  col('cost_refinement', 'currency', FIX2, 'what the finer planned cell adds to the cost at the same run (0 at your cell)', (p) => (p.accuracy.measure === 'price' ? p.accuracy.refinementCost : null)),
  col('saving', 'currency', FIX2, 'how much cheaper the split is than giving the absorber all the rest at your cell and run; blank when that plan cannot meet the tolerance', (p) => (p.accuracy.measure === 'price' ? p.accuracy.saving : null)),
  col('halo_per_step', 'MB', '0.000', 'bytes crossing all cuts per step', (p) => (p.cost.parallel.nodes > 1 ? p.cost.parallel.haloBytesPerStep / 1e6 : null)),
  // Derived from the halo model only with a runtime; without one there is no efficiency to show.
  col('parallel_efficiency', '', FIX2, 'efficiency used or derived', (p) => (p.cost.parallel.model === 'halo exchange' && p.cost.runtime === null ? null : p.cost.parallel.efficiency)),
  col('notes', '', '@', 'warnings, or the error that stopped the row', (p) => p.warnings.join('; ')),
  col('model_version', '', '@', 'version of the physical model', (p) => p.modelVersion),
];

export const OUTPUT_NAMES: readonly string[] = OUTPUTS.map((c) => c.name);

const byName = new Map(OUTPUTS.map((c) => [c.name, c]));

/** The output column called `name`; throws for a name the registry does not define (a programming error). */
export function outputColumn(name: string): OutputColumn {
  const c = byName.get(name);
  if (!c) throw new Error(`no output column ${JSON.stringify(name)}`);
  return c;
}

/** Header text of an output column: its name with its unit in brackets. */
export function outputHeaderText(c: OutputColumn): string {
  return c.unit ? `${c.name} [${c.unit}]` : c.name;
}

/** A plan as a record of its output columns (null where the plan has no value). */
export type PlanRecord = Record<string, PlanCell>;

/** The record of a plan, in column order. */
export function planRecord(plan: Plan): PlanRecord {
  const r: PlanRecord = {};
  for (const c of OUTPUTS) r[c.name] = c.read(plan);
  return r;
}

/** The record of a row that could not be planned: its error in the notes column. */
export function errorRecord(message: string): PlanRecord {
  const r: PlanRecord = {};
  for (const c of OUTPUTS) r[c.name] = c.name === 'notes' ? `error: ${message}` : c.name === 'model_version' ? MODEL_VERSION : null;
  return r;
}

/**
 * The plan API's step functions: each stage of a plan on its own, for the
 * worksheet functions, the task pane and the command line that expose one step
 * (a budget, one reflection, one design, a ripple, a cost, a verification run).
 * Front ends import these from src/plan and nothing from src/physics, so the
 * plan API stays the one surface they depend on.
 */
export {
  // budget and diagnostics (physics.md §1)
  requiredAmplitude,
  intensityErrorFromAmplitude,
  rippleFromReflection,
  reflectionFromRipple,
  type PhaseModel,
  type MonitorKind,
  type BudgetOptions,
  // exact reflection and design (physics.md §2–§4)
  reflection,
  designAbsorber,
  designOptions,
  type AbsorberDesign,
  type DesignResult,
  type DesignSpec,
  type WaveSpec,
  type SamplingConvention,
  SAMPLING_CONVENTIONS,
  ALL_SAMPLINGS,
  // cost (physics.md §5)
  runCost,
  type Precision,
  type Decomposition,
  FACE_NAMES,
  type FaceKind,
  // errors, constants
  HushInputError,
  isHushInputError,
  quote,
  ETA0,
  MODEL_VERSION,
} from '../physics';
export {
  createMeasurement1D,
  createMeasurement2D,
  runInChunks,
  isMeasurementCancelled,
  type MeasureOptions1D,
  type MeasureOptions2D,
  type MeasurementRun,
  type ReflectionMeasurement,
} from '../physics/fdtd';

import { conductivityNorm } from '../physics/normalise';
import { HushInputError as InputError } from '../physics/errors';

export { conductivityNorm, conductivityFromNorm, phaseStep } from '../physics/normalise';
export { DEFAULT_COURANT_FRACTION, DEFAULT_ORDERS } from '../physics/limits';
export { defaultCourant, gridVelocity, phaseVelocityRatio, groupVelocityRatio } from '../physics/velocity';

/** What a figure of the exact model is exact for, in a few words ("the node convention: σ, κ, α sampled at each node's own depth"). */
export function exactFor(sampling: string): string {
  const what: Record<string, string> = {
    node: "σ, κ, α sampled at each node's own depth",
    average: "σ, κ, α averaged over each node's cell",
    offset: 'the profile started half a cell before the interface',
    lagged: 'one profile array for E and H',
    all: 'node, average and offset alike: the worst of the three',
  };
  return sampling === 'all' ? `every grid convention checked (${what.all})` : `the ${sampling} convention (${what[sampling] ?? sampling})`;
}

/** α_norm = α·η₀·Δ·n of a conductivity in S/m (physics.md §3), refused when it overflows. */
export function toNormalisedConductivity(field: string, sigma: number, cellMetres: number, index: number): number {
  const norm = conductivityNorm(sigma, cellMetres, index);
  if (!Number.isFinite(norm)) throw new InputError(field, `${field} ${sigma} S/m is out of range for a ${cellMetres} m cell at index ${index} (α·η₀·Δ·n overflows)`);
  return norm;
}

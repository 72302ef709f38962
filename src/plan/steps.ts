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
  type BudgetOptions,
  // exact reflection and design (physics.md §2–§4)
  reflection,
  designAbsorber,
  designOptions,
  type AbsorberDesign,
  type DesignResult,
  type DesignSpec,
  type WaveSpec,
  // cost (physics.md §5)
  runCost,
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

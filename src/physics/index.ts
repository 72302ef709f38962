/**
 * The physics core's public API: every function here checks its inputs and
 * throws HushInputError for what it cannot accept (never NaN, never a silent
 * clamp). All types are exported. The unchecked buffer-level building blocks
 * of the engines (coefficient and factor fills, the reflection kernel, sample
 * grids, pulse planning, …) live in `./internal`.
 */
export * from './errors';
export * from './constants';
export * from './courant';
export { MAX_PPW, minimumResolvablePpw, checkPpw, discreteWavenumber, discreteWavenumber3D, numericalPhaseVelocity, discreteAngle } from './dispersion';
export type * from './dispersion';
export { SAMPLING_CONVENTIONS, checkSampling, sigmaOptNorm, sigmaOpt, resolveDesign, polynomialProfile, reversedPolynomialProfile } from './grading';
export type * from './grading';
export { cpmlCoefficients } from './cpml';
export type * from './cpml';
export { continuousReflection } from './continuous';
export type * from './continuous';
export { MAX_DECAY_CELLS, reflection, reflectionAtWavenumber, reflectionAtTransverseFactor } from './reflection';
export type * from './reflection';
export * from './budget';
export * from './ripple';
export {
  MAX_DESIGN_ANGLE_DEG,
  MAX_AZIMUTH_DEG,
  ALL_SAMPLINGS,
  KAPPA_CANDIDATES,
  ALPHA_FRACTIONS,
  designWork,
  designOptions,
  designAbsorber,
  clearDesignCache,
  textbookStrength,
} from './design';
export type * from './design';
export { FACE_NAMES, MAX_AXIS_CELLS, domainCounts } from './domain';
export type * from './domain';
export * from './ringdown';
export { defaultCourant, gridVelocity, phaseVelocityRatio, groupVelocityRatio, propagationLimitPpw } from './velocity';
export type * from './velocity';
export { MAX_PATH_WAVELENGTHS, dispersionError, dispersionPpwForError, lineShiftError, lineShiftForError } from './dispersion-error';
export type * from './dispersion-error';
export {
  SOURCE_DELAY_WIDTHS,
  DEFAULT_PULSE_EDGE_LEVEL,
  MAX_RUN_SECONDS,
  MIN_RUN_ERROR,
  resonanceRunError,
  resonanceRunDuration,
  bandPulseWidth,
  pulseSourceDuration,
  transitTime,
  passesDuration,
  pulseEnergyLeft,
  pulseRunError,
  pulseRunDuration,
} from './run-error';
export type * from './run-error';
export { CELL_LADDER_STEPS, DISPERSION_SHARES, MAX_DESIGNS_PER_CELL, MAX_ABSORBER_SEARCHES, splitAccuracy } from './accuracy-split';
export type * from './accuracy-split';
export { DEFAULT_ABSORBER_FACTOR, DEFAULT_RING_TARGET, MAX_NODES, MAX_STEPS, timeStep, stepCount, runTime, runCost } from './cost';
export type * from './cost';
export { CpmlLine, MAX_LINE_NODES } from './fdtd/line';
export { TmzGrid2D, MAX_GRID_NODES } from './fdtd/tmz';
export { EDGE_LEVEL_TARGET, EDGE_LEVEL_MIN, CUTOFF_LEVEL, SLOW_LEVEL } from './fdtd/pulse';
export {
  MeasurementCancelled,
  isMeasurementCancelled,
  FAR_LEFT_TERMINATION,
  SPECTRUM_THRESHOLD,
  MAX_CELL_UPDATES,
  createMeasurement1D,
  createMeasurement2D,
  createMeasurementMode,
  MAX_PIECES,
  planMeasurementPieces,
  runInChunks,
  measureReflection1D,
  measureReflection2D,
  measureReflection1DSync,
  measureReflection2DSync,
  measureReflectionMode,
  measureReflectionModeSync,
} from './fdtd/measure';
export { ModeLine } from './fdtd/mode-line';
export type * from './fdtd';

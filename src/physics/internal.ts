/**
 * Unchecked building blocks of the physics core, for the time-domain engines,
 * the benchmarks and the tests: buffer-level coefficient and factor fills, the
 * reflection kernel and its workspaces, sample grids and the worst-case scan,
 * profiles, cost-model constants, pulse planning, DTFTs. They trust their
 * caller (resolved designs, checked grid quantities, buffers of the right
 * size) and check nothing or only what they themselves define, so that hot
 * loops pay for no checks; a bad input can give NaN or a wrong value. Front
 * ends use the validated public API (`./index`, through src/plan) instead;
 * the plan layer, which checks its inputs itself, may resolve a design spec
 * once (`resolveSpec`) and run the search on it (`designOptionsResolved`).
 * Types live in the public barrel.
 */
export { allocateCoefficients, nodeCoefficients, fillCoefficients } from './cpml';
export { allocateFactors, fillFactors, fillSample, sampledKernel, sampledKernels, SAMPLE_STRIDE, reflectionKernel, resolveWave, checkedEvanescentFactor, createWorkspace, reflectionResolved } from './reflection';
export { worstReflection, sampleGrid, designChecks } from './design-checks';
export { bestStrengthFor, resolveSpec, designOptionsResolved } from './design';
export { profileAt, profileIntegral, sigmaOptNormUnchecked } from './grading';
export { attenuationIntegral, continuousReflectionUnchecked, continuousEvanescentUnchecked } from './continuous';
export { discreteWavenumberUnchecked, discreteWavenumber3DUnchecked, transverseFactorUnchecked, evanescentFactorUnchecked } from './dispersion';
export {
  absCosDeg,
  absSinDeg,
  branchEndValue,
  propagationLimitUnchecked,
  yeeWavenumberUnchecked,
  phaseVelocityUnchecked,
  groupVelocityUnchecked,
  fixedWavenumberFrequencyRatio,
  resolveDirection,
  checkVelocityPpw,
} from './velocity';
export { erfc, erfcInverse } from './run-error';
export { psiPerStretchedAxis } from './domain';
export { haloValuesPerCell, bytesPerValue, blockSplit, defaultFieldsPerCell, defaultMaterialPerCell } from './cost';
export { gaussianLevel, planPulse, fillPulse } from './fdtd/pulse';
export { groupVelocityX, chooseTransverseMode, runToEnd } from './fdtd/measure';
export { ModeLine } from './fdtd/mode-line';
export { dtftAt } from './fdtd/dtft';

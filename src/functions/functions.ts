/**
 * HUSH.* worksheet functions: a thin shell over the core. Each one reads its
 * arguments (src/functions/args.ts), calls the core, and shapes the answer for
 * a cell or a spilled row; input the core refuses comes back as #VALUE! or #NUM!
 * with the core's message.
 *
 * Metadata (functions.json) is generated at build time from these JSDoc blocks
 * by custom-functions-metadata-plugin, which also appends the
 * CustomFunctions.associate calls to this file in the bundle: nothing here
 * registers functions by hand. Every block carries an `Example:` line with
 * the exact result; tests/functions-examples.test.ts runs each one.
 *
 * Parameter names are snake_case because Excel shows them as written.
 */
import {
  MODEL_VERSION,
  intensityErrorFromAmplitude,
  reflection,
  reflectionFromRipple,
  requiredAmplitude,
  rippleFromReflection,
  type AbsorberDesign,
  type BudgetOptions,
  type PhaseModel,
  type WaveSpec,
} from '../physics';
import { optionalChoice, optionalNumber, requiredNumber } from './args';
import { worksheet } from './errors';
import { APP_VERSION } from './version';

const PHASES: readonly PhaseModel[] = ['worst', 'random'];

function budgetOptions(coupling: unknown, faces: unknown, phase: unknown, share: unknown): BudgetOptions {
  return {
    coupling: optionalNumber('coupling', coupling),
    faces: optionalNumber('faces', faces),
    phase: optionalChoice('phase', phase, PHASES, 'worst'),
    share: optionalNumber('share', share),
  };
}

/**
 * Required amplitude reflection |r| per absorbing face so that the relative intensity error at a monitor stays within the tolerance (worst case: |r| = (√(1+ε) − 1)/c for one face).
 * Example: =HUSH.NEEDED_REFLECTION(0.01) → 0.00498756211208903
 * Example: =HUSH.NEEDED_REFLECTION(0.01, 1, 2, "random") → 0.00499993750273421
 * @customfunction NEEDED_REFLECTION
 * @param intensity_error Tolerated relative intensity error ε (0.01 for 1 %), greater than 0 and at most 1.
 * @param [coupling] Share c of the echo that reaches the monitor, 0 < c ≤ 1. Default 1.
 * @param [faces] Number of absorbing faces whose echoes reach the monitor, 1 to 6. Default 1.
 * @param [phase] "worst" (echoes add in phase) or "random" (RMS error, echoes add in quadrature). Default "worst".
 * @param [share] Share F of the error budget given to the absorber, 0 < F ≤ 1. Default 1.
 * @returns Amplitude reflection |r| each face may have.
 */
export function neededReflection(
  intensity_error: number,
  coupling?: number,
  faces?: number,
  phase?: string,
  share?: number,
): number {
  return worksheet(() =>
    requiredAmplitude({
      intensityError: requiredNumber('intensity error', intensity_error),
      ...budgetOptions(coupling, faces, phase, share),
    }),
  );
}

/**
 * Relative intensity error at a monitor caused by an amplitude reflection |r| per absorbing face (the inverse of HUSH.NEEDED_REFLECTION).
 * Example: =HUSH.ERROR_FROM_REFLECTION(0.005) → 0.010025
 * Example: =HUSH.ERROR_FROM_REFLECTION(0.001, , , "random") → 0.00141421391592644
 * @customfunction ERROR_FROM_REFLECTION
 * @param amplitude Amplitude reflection |r| of one face, 0 ≤ |r| < 1 (not the power reflection |r|²).
 * @param [coupling] Share c of the echo that reaches the monitor, 0 < c ≤ 1. Default 1.
 * @param [faces] Number of absorbing faces whose echoes reach the monitor, 1 to 6. Default 1.
 * @param [phase] "worst" (echoes add in phase) or "random" (RMS error, echoes add in quadrature). Default "worst".
 * @param [share] Share F of the error budget given to the absorber, 0 < F ≤ 1; the result is the whole budget this uses up. Default 1.
 * @returns Relative intensity error ε (0.01 means 1 %).
 */
export function errorFromReflection(
  amplitude: number,
  coupling?: number,
  faces?: number,
  phase?: string,
  share?: number,
): number {
  return worksheet(() =>
    intensityErrorFromAmplitude(requiredNumber('amplitude reflection', amplitude), budgetOptions(coupling, faces, phase, share)),
  );
}

function absorberAndWave(
  layers: unknown,
  order: unknown,
  ppw: unknown,
  angle_deg: unknown,
  strength: unknown,
  kappa_max: unknown,
  alpha_max_norm: unknown,
  alpha_order: unknown,
  courant: unknown,
  index: unknown,
  dimensions: unknown,
): { design: AbsorberDesign; wave: WaveSpec } {
  const design: AbsorberDesign = {
    layers: requiredNumber('layers', layers),
    order: requiredNumber('grading order', order),
    strength: optionalNumber('strength', strength),
    kappaMax: optionalNumber('kappa max', kappa_max),
    alphaMaxNorm: optionalNumber('alpha max (normalised)', alpha_max_norm),
    alphaOrder: optionalNumber('alpha order', alpha_order),
  };
  const wave: WaveSpec = {
    ppw: requiredNumber('cells per wavelength', ppw),
    angleDeg: optionalNumber('angle', angle_deg),
    courant: optionalNumber('Courant number', courant),
    index: optionalNumber('background index', index),
    dimensions: optionalNumber('dimensions', dimensions),
  };
  return { design, wave };
}

/**
 * Exact amplitude reflection |r| of a graded CPML absorber as the Yee grid sees it (discrete theory, backed by a perfect conductor), at one frequency and angle.
 * Example: =HUSH.REFLECTION(10, 3, 20) → 0.0000272370009192314
 * Example: =HUSH.REFLECTION(8, 3, 40, 45, 1, 5, 0.05) → 0.0000716646196867022
 * @customfunction REFLECTION
 * @param layers Absorber thickness N in cells, a whole number from 1 to 200.
 * @param order Polynomial grading order m of σ and κ, 0 to 10 (3 or 4 is usual).
 * @param ppw Cells per wavelength in the background medium at this frequency.
 * @param [angle_deg] Angle of incidence in degrees, 0 ≤ θ < 90. Default 0.
 * @param [strength] σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn). Default 1.
 * @param [kappa_max] κ at the back of the absorber, 1 to 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless), 0 to 10. Default 0.
 * @param [alpha_order] Order of the reversed α grading. Default 1.
 * @param [courant] Vacuum Courant number S = cΔt/Δ. Default 0.99/√3 = 0.571577.
 * @param [index] Background refractive index n, 1 to 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3) for the Courant limit; 1-D allows normal incidence only. Default 3.
 * @returns Amplitude reflection |r| (not the power reflection |r|²).
 */
export function reflectionExact(
  layers: number,
  order: number,
  ppw: number,
  angle_deg?: number,
  strength?: number,
  kappa_max?: number,
  alpha_max_norm?: number,
  alpha_order?: number,
  courant?: number,
  index?: number,
  dimensions?: number,
): number {
  return worksheet(() => {
    const { design, wave } = absorberAndWave(layers, order, ppw, angle_deg, strength, kappa_max, alpha_max_norm, alpha_order, courant, index, dimensions);
    return reflection(design, wave).amplitude;
  });
}

/**
 * Continuous-theory amplitude reflection of the same absorber (ignores the grid; compare with HUSH.REFLECTION to see the discretisation reflection).
 * Example: =HUSH.REFLECTION_CONTINUOUS(10, 3, 20) → 0.000000112535174719259
 * @customfunction REFLECTION_CONTINUOUS
 * @param layers Absorber thickness N in cells, a whole number from 1 to 200.
 * @param order Polynomial grading order m of σ and κ, 0 to 10 (3 or 4 is usual).
 * @param ppw Cells per wavelength in the background medium at this frequency.
 * @param [angle_deg] Angle of incidence in degrees, 0 ≤ θ < 90. Default 0.
 * @param [strength] σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn). Default 1.
 * @param [kappa_max] κ at the back of the absorber, 1 to 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless), 0 to 10. Default 0.
 * @param [alpha_order] Order of the reversed α grading. Default 1.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (checked, not used by the continuous model). Default 0.99/√3 = 0.571577.
 * @param [index] Background refractive index n, 1 to 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3) for the Courant limit. Default 3.
 * @returns Amplitude reflection |r| of continuous theory.
 */
export function reflectionContinuous(
  layers: number,
  order: number,
  ppw: number,
  angle_deg?: number,
  strength?: number,
  kappa_max?: number,
  alpha_max_norm?: number,
  alpha_order?: number,
  courant?: number,
  index?: number,
  dimensions?: number,
): number {
  return worksheet(() => {
    const { design, wave } = absorberAndWave(layers, order, ppw, angle_deg, strength, kappa_max, alpha_max_norm, alpha_order, courant, index, dimensions);
    return reflection(design, wave).continuous;
  });
}

/**
 * Spectral ripple caused by a reflection: spills a row {peak-to-peak relative intensity swing, ripple period in Hz} (swing 4c|r|, period c₀/(2·n_g·L)).
 * Example: =HUSH.RIPPLE(0.001, 0.1) → {0.004, 1498962290}
 * Example: =HUSH.RIPPLE(0.001, 0.1, 1.5, 0.5) → {0.002, 999308193.333333}
 * @customfunction RIPPLE
 * @param amplitude Amplitude reflection |r| of the boundary, 0 ≤ |r| < 1.
 * @param distance_m Distance L in metres between the boundary and the other reflector (for example the monitor or the device).
 * @param [group_index] Group index n_g of the medium in between, 1 to 100. Default 1.
 * @param [coupling] Share c of the echo that reaches the monitor, 0 < c ≤ 1. Default 1.
 * @returns One row: peak-to-peak swing (relative), period (Hz).
 */
export function ripple(amplitude: number, distance_m: number, group_index?: number, coupling?: number): number[][] {
  return worksheet(() => {
    const r = rippleFromReflection(
      requiredNumber('amplitude reflection', amplitude),
      requiredNumber('distance', distance_m),
      optionalNumber('group index', group_index, 1),
      optionalNumber('coupling', coupling, 1),
    );
    return [[r.peakToPeak, r.periodHz]];
  });
}

/**
 * The reflection behind an observed spectral ripple: spills a row {implied amplitude reflection |r|, implied distance in metres between the reflecting pair}.
 * Example: =HUSH.RIPPLE_SOURCE(0.004, 1.5E9) → {0.001, 0.0999308193333333}
 * @customfunction RIPPLE_SOURCE
 * @param peak_to_peak Observed peak-to-peak relative intensity swing, greater than 0 and less than 4.
 * @param period_hz Observed ripple period in frequency, Hz.
 * @param [group_index] Group index n_g of the medium in between, 1 to 100. Default 1.
 * @param [coupling] Share c of the echo that reaches the monitor, 0 < c ≤ 1. Default 1.
 * @returns One row: amplitude reflection |r|, distance (m).
 */
export function rippleSource(peak_to_peak: number, period_hz: number, group_index?: number, coupling?: number): number[][] {
  return worksheet(() => {
    const s = reflectionFromRipple(
      requiredNumber('ripple peak-to-peak', peak_to_peak),
      requiredNumber('ripple period', period_hz),
      optionalNumber('group index', group_index, 1),
      optionalNumber('coupling', coupling, 1),
    );
    return [[s.amplitude, s.distanceMetres]];
  });
}

/**
 * Versions of the add-in and of its physical model. Keep this in the workbook: results are stable within one model version, so colleagues can check they compute with the same one.
 * Example: =HUSH.MODEL_VERSION() → "Hush 0.1.0, model 1.0.0"
 * @customfunction MODEL_VERSION
 * @returns "Hush <add-in version>, model <model version>".
 */
export function modelVersion(): string {
  return `Hush ${APP_VERSION}, model ${MODEL_VERSION}`;
}

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
 *
 * The heavy functions (HUSH.LAYERS, HUSH.DESIGN, HUSH.PLAN and the figures
 * read from a plan) return a Promise: their work runs in a scheduler that
 * yields to the runtime between slices (scheduler.ts), and calls with the
 * same inputs share one computation (plans.ts).
 */
import {
  HushInputError,
  MODEL_VERSION,
  defaultCourant,
  gridVelocity,
  intensityErrorFromAmplitude,
  reflection,
  reflectionFromRipple,
  requiredAmplitude,
  rippleFromReflection,
  type AbsorberDesign,
  type BudgetOptions,
  type DesignResult,
  type DesignSpec,
  type PhaseModel,
  type MonitorKind,
  type WaveSpec,
  type SamplingConvention,
} from '../plan/steps';
import { OUTPUT_NAMES, planRecord, planHeaderText, type Plan } from '../plan';
import { arg, isOmitted, listArg, requiredArg, valuesArg } from './args';
import type { Gap } from '../plan/fields';
import { DESIGN_COLUMNS } from './columns';
import { worksheet } from './errors';
import { asWorksheet, designOf, invocationOf, planOf, tableOf } from './plans';
import { APP_VERSION } from './version';

function budgetOptions(coupling: unknown, faces_seen: unknown, phase: unknown, share: unknown, monitor: unknown): BudgetOptions {
  return {
    coupling: arg<'fraction'>('coupling', coupling),
    faces: arg<'count'>('faces_seen', faces_seen),
    phase: arg<'choice'>('phase', phase) as PhaseModel | undefined,
    share: arg<'fraction'>('share', share),
    monitor: arg<'choice'>('monitor', monitor) as MonitorKind | undefined,
  };
}

/**
 * Amplitude reflection |r| each absorbing face may have so that the relative intensity error at the monitor stays within the tolerance.
 * Example: =HUSH.NEEDED_REFLECTION(0.01) → 0.00498756211208903
 * Example: =HUSH.NEEDED_REFLECTION(0.01, 1, 2, "random") → 0.00499993750273421
 * Example: =HUSH.NEEDED_REFLECTION("1%", "100%") → 0.00498756211208903
 * Example: =HUSH.NEEDED_REFLECTION(0.01, , , , , "flux") → 0.1
 * @customfunction NEEDED_REFLECTION
 * @helpurl https://localhost:3000/help/NEEDED_REFLECTION.html
 * @param intensity_error Tolerated relative intensity error at the monitor: a number or a percentage (0.01 or 1%); ≥ 1e-12, ≤ 1.
 * @param [coupling] Echo amplitude at the monitor relative to the echo leaving the face (above 1 only where a resonance builds it up): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1128379.1671. Default 1.
 * @param [faces_seen] Number of absorbing faces whose echoes reach the monitor: a whole number; ≥ 1, ≤ 6. Default 1.
 * @param [phase] How echo phases combine: worst means in phase, random an RMS error: one of worst, random (any letter case). Default worst.
 * @param [share] Share of the error budget given to the absorber (in a plan, it overrides the searched split): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1. Default 1 for a single budget; in a plan, the searched split.
 * @param [monitor] What the monitor records: a field intensity (the echo interferes) or the power flux through a plane (the cross term cancels): one of intensity, flux (any letter case). Default intensity.
 * @returns Amplitude reflection |r| each face may have.
 */
export function neededReflection(
  intensity_error: any,
  coupling?: any,
  faces_seen?: any,
  phase?: any,
  share?: any,
  monitor?: any,
): number {
  return worksheet(() =>
    requiredAmplitude({
      intensityError: requiredArg<'fraction'>('intensity_error', intensity_error),
      ...budgetOptions(coupling, faces_seen, phase, share, monitor),
    }),
  );
}

/**
 * Relative intensity error at a monitor caused by an amplitude reflection |r| per absorbing face (the inverse of HUSH.NEEDED_REFLECTION).
 * Example: =HUSH.ERROR_FROM_REFLECTION(0.005) → 0.010025
 * Example: =HUSH.ERROR_FROM_REFLECTION(0.001, , , "random") → 0.00141421391592644
 * @customfunction ERROR_FROM_REFLECTION
 * @helpurl https://localhost:3000/help/ERROR_FROM_REFLECTION.html
 * @param amplitude Amplitude reflection |r| of one face (not the power |r|²): an amplitude |r|, a percentage or dB (0.001, 0.1%, -60 dB); ≥ 0, < 1.
 * @param [coupling] Echo amplitude at the monitor relative to the echo leaving the face (above 1 only where a resonance builds it up): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1128379.1671. Default 1.
 * @param [faces_seen] Number of absorbing faces whose echoes reach the monitor: a whole number; ≥ 1, ≤ 6. Default 1.
 * @param [phase] How echo phases combine: worst means in phase, random an RMS error: one of worst, random (any letter case). Default worst.
 * @param [share] Share of the error budget given to the absorber (in a plan, it overrides the searched split): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1. Default 1 for a single budget; in a plan, the searched split.
 * @param [monitor] What the monitor records: a field intensity (the echo interferes) or the power flux through a plane (the cross term cancels): one of intensity, flux (any letter case). Default intensity.
 * @returns Relative intensity error ε (0.01 means 1 %).
 */
export function errorFromReflection(
  amplitude: any,
  coupling?: any,
  faces_seen?: any,
  phase?: any,
  share?: any,
  monitor?: any,
): number {
  return worksheet(() =>
    intensityErrorFromAmplitude(requiredArg<'reflection'>('amplitude', amplitude), budgetOptions(coupling, faces_seen, phase, share, monitor)),
  );
}

function absorberAndWave(
  layers: unknown,
  order: unknown,
  ppw: unknown,
  angle: unknown,
  strength: unknown,
  kappa_max: unknown,
  alpha_max_norm: unknown,
  alpha_order: unknown,
  courant: unknown,
  index: unknown,
  dimensions: unknown,
  sampling: unknown,
  decay: unknown,
  azimuth: unknown,
): { design: AbsorberDesign; wave: WaveSpec } {
  const design: AbsorberDesign = {
    layers: requiredArg<'count'>('layers', layers),
    order: requiredArg<'number'>('order', order),
    strength: arg<'number'>('strength', strength),
    kappaMax: arg<'number'>('kappa_max', kappa_max),
    alphaMaxNorm: arg<'number'>('alpha_max_norm', alpha_max_norm),
    alphaOrder: arg<'number'>('alpha_order', alpha_order),
    sampling: oneConvention(arg<'choice'>('sampling', sampling)),
  };
  const dims = arg<'count'>('dimensions', dimensions) ?? 3;
  const wave: WaveSpec = {
    ppw: requiredArg<'number'>('ppw', ppw),
    angleDeg: arg<'angle'>('angle', angle),
    courant: arg<'number'>('courant', courant) ?? defaultCourant(dims),
    index: arg<'number'>('index', index),
    dimensions: dims,
    azimuthDeg: arg<'angle'>('azimuth', azimuth),
    decayCells: arg<'number'>('decay', decay),
  };
  if (wave.decayCells !== undefined && (wave.angleDeg ?? 0) !== 0) {
    throw new HushInputError('decay', 'give decay or a nonzero angle, not both: an evanescent field has no angle of incidence', 'value');
  }
  return { design, wave };
}

/** One grid convention for a reflection ('all' is for designs). */
function oneConvention(s: string | undefined): SamplingConvention | undefined {
  if (s === 'all') throw new HushInputError('sampling', "sampling all is for designs (HUSH.LAYERS, HUSH.DESIGN): one reflection is computed under one convention (node, average, offset or lagged)", 'value');
  return s as SamplingConvention | undefined;
}

/**
 * Exact amplitude reflection |r| of a graded CPML absorber as the Yee grid sees it (discrete theory), at one frequency and angle.
 * Example: =HUSH.REFLECTION(10, 3, 20) → 0.0000272370009191594
 * Example: =HUSH.REFLECTION(8, 3, 40, 45, 1, 5, 0.05) → 0.0000716646196862844
 * Example: =HUSH.REFLECTION(8, 3, 40, "45 deg", 1, 5, 0.05) → 0.0000716646196862844
 * @customfunction REFLECTION
 * @helpurl https://localhost:3000/help/REFLECTION.html
 * @param layers Absorber thickness N in cells: a whole number; ≥ 1, ≤ 200.
 * @param order Polynomial grading order m of σ and κ (3 or 4 is usual): a number; ≥ 0, ≤ 10.
 * @param ppw Cells per wavelength in the background medium at this frequency: a number; > 0, ≤ 1000000.
 * @param [angle] Angle of incidence (from the face normal, the x axis): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, < 90°. Default 0.
 * @param [strength] σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn): a number; > 0, ≤ 20. Default 1.
 * @param [kappa_max] κ at the back of the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless): a number; ≥ 0, ≤ 10. Default 0.
 * @param [alpha_order] Order of the reversed α grading: a number; ≥ 0, ≤ 10. Default 1.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [index] Background refractive index at the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [sampling] Your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset): one of node, average, offset, lagged, all (any letter case). Default node.
 * @param [decay] Decay length L in cells of an evanescent incident field e^(−d/L) normal to the face (instead of an angle): a number; > 0, ≤ 1000000. Default none (a propagating wave).
 * @param [azimuth] Azimuth of the direction about the x axis (3-D grids): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ -360°, ≤ 360°. Default 0.
 * @returns Amplitude reflection |r| (not the power reflection |r|²).
 */
export function reflectionExact(
  layers: any,
  order: any,
  ppw: any,
  angle?: any,
  strength?: any,
  kappa_max?: any,
  alpha_max_norm?: any,
  alpha_order?: any,
  courant?: any,
  index?: any,
  dimensions?: any,
  sampling?: any,
  decay?: any,
  azimuth?: any,
): number {
  return worksheet(() => {
    const { design, wave } = absorberAndWave(layers, order, ppw, angle, strength, kappa_max, alpha_max_norm, alpha_order, courant, index, dimensions, sampling, decay, azimuth);
    return reflection(design, wave).amplitude;
  });
}

/**
 * Continuous-theory amplitude reflection |r| of the same absorber, which ignores the grid (compare with HUSH.REFLECTION).
 * Example: =HUSH.REFLECTION_CONTINUOUS(10, 3, 20) → 1.12535174719259e-7
 * @customfunction REFLECTION_CONTINUOUS
 * @helpurl https://localhost:3000/help/REFLECTION_CONTINUOUS.html
 * @param layers Absorber thickness N in cells: a whole number; ≥ 1, ≤ 200.
 * @param order Polynomial grading order m of σ and κ (3 or 4 is usual): a number; ≥ 0, ≤ 10.
 * @param ppw Cells per wavelength in the background medium at this frequency: a number; > 0, ≤ 1000000.
 * @param [angle] Angle of incidence (from the face normal, the x axis): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, < 90°. Default 0.
 * @param [strength] σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn): a number; > 0, ≤ 20. Default 1.
 * @param [kappa_max] κ at the back of the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless): a number; ≥ 0, ≤ 10. Default 0.
 * @param [alpha_order] Order of the reversed α grading: a number; ≥ 0, ≤ 10. Default 1.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [index] Background refractive index at the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [sampling] Your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset): one of node, average, offset, lagged, all (any letter case). Default node.
 * @param [decay] Decay length L in cells of an evanescent incident field e^(−d/L) normal to the face (instead of an angle): a number; > 0, ≤ 1000000. Default none (a propagating wave).
 * @param [azimuth] Azimuth of the direction about the x axis (3-D grids): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ -360°, ≤ 360°. Default 0.
 * @returns Amplitude reflection |r| of continuous theory.
 */
export function reflectionContinuous(
  layers: any,
  order: any,
  ppw: any,
  angle?: any,
  strength?: any,
  kappa_max?: any,
  alpha_max_norm?: any,
  alpha_order?: any,
  courant?: any,
  index?: any,
  dimensions?: any,
  sampling?: any,
  decay?: any,
  azimuth?: any,
): number {
  return worksheet(() => {
    const { design, wave } = absorberAndWave(layers, order, ppw, angle, strength, kappa_max, alpha_max_norm, alpha_order, courant, index, dimensions, sampling, decay, azimuth);
    return reflection(design, wave).continuous;
  });
}

/** Most values along each side of HUSH.REFLECTION_TABLE, so one call stays a few milliseconds. */
const TABLE_SIDE_MAX = 500;

/**
 * Exact reflection |r| of one absorber spilled with a row per cells-per-wavelength value and a column per angle, at most 2,000,000 cells × layers.
 * Example: =HUSH.REFLECTION_TABLE(10, 3, {20; 40}, {0, 45}) → {0.0000272370009191594, 0.0000184095775466616; 0.0000258712214847077, 0.0000178816788954536}
 * @customfunction REFLECTION_TABLE
 * @helpurl https://localhost:3000/help/REFLECTION_TABLE.html
 * @cancelable
 * @param layers Absorber thickness N in cells: a whole number; ≥ 1, ≤ 200.
 * @param order Polynomial grading order m of σ and κ (3 or 4 is usual): a number; ≥ 0, ≤ 10.
 * @param ppw_list Cells per wavelength in the background medium: a range or a single value, at most 500 values; one result row each.
 * @param [angles] Angles of incidence, 0 ≤ θ < 90 degrees: a range or a single value, numbers (degrees) or text with a unit ("0.5 rad"), at most 500 values; one result column each. Default 0.
 * @param [strength] σ_max/σ_opt, with σ_opt = 0.8(m+1)/(η₀Δn): a number; > 0, ≤ 20. Default 1.
 * @param [kappa_max] κ at the back of the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless): a number; ≥ 0, ≤ 10. Default 0.
 * @param [alpha_order] Order of the reversed α grading: a number; ≥ 0, ≤ 10. Default 1.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [index] Background refractive index at the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [sampling] Your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset): one of node, average, offset, lagged, all (any letter case). Default node.
 * @param [decay] Decay length L in cells of an evanescent incident field e^(−d/L) normal to the face (instead of an angle): a number; > 0, ≤ 1000000. Default none (a propagating wave).
 * @param [azimuth] Azimuth of the direction about the x axis (3-D grids): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ -360°, ≤ 360°. Default 0.
 * @returns Amplitude reflection |r|, rows by cells per wavelength, columns by angle.
 */
export function reflectionTable(
  layers: any,
  order: any,
  ppw_list: any[][],
  angles?: any[][],
  strength?: any,
  kappa_max?: any,
  alpha_max_norm?: any,
  alpha_order?: any,
  courant?: any,
  index?: any,
  dimensions?: any,
  sampling?: any,
  decay?: any,
  azimuth?: any,
  invocation?: CustomFunctions.CancelableInvocation,
): Promise<number[][]> {
  return asWorksheet(
    () => {
      const ppws = valuesArg<'number'>('ppw_list', 'ppw', ppw_list, TABLE_SIDE_MAX);
      const angleList = isOmitted(angles) ? [0] : valuesArg<'angle'>('angles', 'angle', angles, TABLE_SIDE_MAX);
      // Every argument is read (and checked) with each angle, as each cell would read it; ppw_list was checked value by value.
      const perAngle = angleList.map((angle) =>
        absorberAndWave(layers, order, ppws[0], angle, strength, kappa_max, alpha_max_norm, alpha_order, courant, index, dimensions, sampling, decay, azimuth),
      );
      const { design, wave } = perAngle[0];
      const { ppw: _ppw, angleDeg: _angle, ...same } = wave;
      return tableOf({ kind: 'table', design, wave: same, ppws, angles: angleList }, invocationOf(invocation));
    },
    (t: number[][]) => t,
  );
}

/**
 * Spectral ripple caused by a reflection, spilled as {peak-to-peak relative intensity swing, ripple period in Hz}.
 * Example: =HUSH.RIPPLE(0.001, 0.1) → {0.004, 1498962290}
 * Example: =HUSH.RIPPLE(0.001, 0.1, 1.5, 0.5) → {0.002, 999308193.333333}
 * Example: =HUSH.RIPPLE("0.1%", "10 cm") → {0.004, 1498962290}
 * @customfunction RIPPLE
 * @helpurl https://localhost:3000/help/RIPPLE.html
 * @param amplitude Amplitude reflection |r| of one face (not the power |r|²): an amplitude |r|, a percentage or dB (0.001, 0.1%, -60 dB); ≥ 0, < 1.
 * @param distance Distance between the boundary and the other reflector: a length such as 20 nm or 0.02 um; a bare number is in m; ≥ 1e-12 m, ≤ 1000000 m.
 * @param [group_index] Group index of the medium between the reflecting pair: a number; ≥ 1, ≤ 100. Default 1.
 * @param [coupling] Echo amplitude at the monitor relative to the echo leaving the face (above 1 only where a resonance builds it up): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1128379.1671. Default 1.
 * @returns One row: peak-to-peak swing (relative), period (Hz).
 */
export function ripple(amplitude: any, distance: any, group_index?: any, coupling?: any): number[][] {
  return worksheet(() => {
    const r = rippleFromReflection(
      requiredArg<'reflection'>('amplitude', amplitude),
      requiredArg<'length'>('distance', distance),
      arg<'number'>('group_index', group_index) ?? 1,
      arg<'fraction'>('coupling', coupling) ?? 1,
    );
    return [[r.peakToPeak, r.periodHz]];
  });
}

/**
 * The reflection behind an observed spectral ripple, spilled as {amplitude reflection |r|, distance in metres between the reflecting pair}.
 * Example: =HUSH.RIPPLE_SOURCE(0.004, 1.5E9) → {0.001, 0.0999308193333333}
 * Example: =HUSH.RIPPLE_SOURCE("0.4%", "1.5 GHz") → {0.001, 0.0999308193333333}
 * @customfunction RIPPLE_SOURCE
 * @helpurl https://localhost:3000/help/RIPPLE_SOURCE.html
 * @param peak_to_peak Observed peak-to-peak relative intensity swing: a number or a percentage (0.01 or 1%); > 0, < 4.
 * @param period Observed ripple period in frequency: a frequency such as 193 THz or 1.5 GHz; a bare number is in Hz; ≥ 0.001 Hz, ≤ 1e+18 Hz.
 * @param [group_index] Group index of the medium between the reflecting pair: a number; ≥ 1, ≤ 100. Default 1.
 * @param [coupling] Echo amplitude at the monitor relative to the echo leaving the face (above 1 only where a resonance builds it up): a number or a percentage (0.01 or 1%); ≥ 1e-6, ≤ 1128379.1671. Default 1.
 * @returns One row: amplitude reflection |r|, distance (m).
 */
export function rippleSource(peak_to_peak: any, period: any, group_index?: any, coupling?: any): number[][] {
  return worksheet(() => {
    const s = reflectionFromRipple(
      requiredArg<'fraction'>('peak_to_peak', peak_to_peak),
      requiredArg<'frequency'>('period', period),
      arg<'number'>('group_index', group_index) ?? 1,
      arg<'fraction'>('coupling', coupling) ?? 1,
    );
    return [[s.amplitude, s.distanceMetres]];
  });
}

function velocityOf(ppw: unknown, courant: unknown, dimensions: unknown, angle: unknown, azimuth: unknown) {
  const dims = arg<'count'>('dimensions', dimensions) ?? 3;
  return gridVelocity({
    ppw: requiredArg<'number'>('ppw', ppw),
    courant: arg<'number'>('courant', courant) ?? defaultCourant(dims),
    dimensions: dims,
    angleDeg: arg<'angle'>('angle', angle) ?? 0,
    azimuthDeg: arg<'angle'>('azimuth', azimuth) ?? 0,
  });
}

/**
 * Numerical phase velocity of the Yee grid relative to the true wave speed (v_p/v) for a wave of ppw cells per wavelength along a direction.
 * Example: =HUSH.PHASE_VELOCITY(10, 0.5, 1) → 0.987263701339977
 * Example: =HUSH.PHASE_VELOCITY(10, 0.5, 2, 30) → 0.99371296717977
 * @customfunction PHASE_VELOCITY
 * @helpurl https://localhost:3000/help/PHASE_VELOCITY.html
 * @param ppw Cells per wavelength in the background medium at this frequency: a number; > 0, ≤ 1000000.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [angle] Angle of incidence (from the face normal, the x axis): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, < 90°. Default 0.
 * @param [azimuth] Azimuth of the direction about the x axis (3-D grids): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ -360°, ≤ 360°. Default 0.
 * @returns v_p/v (1 is dispersion-free).
 */
export function phaseVelocity(ppw: any, courant?: any, dimensions?: any, angle?: any, azimuth?: any): number {
  return worksheet(() => velocityOf(ppw, courant, dimensions, angle, azimuth).phaseVelocityRatio);
}

/**
 * Numerical group velocity of the Yee grid relative to the true wave speed (v_g/v) for a wave of ppw cells per wavelength along a direction.
 * Example: =HUSH.GROUP_VELOCITY(10, 0.5, 1) → 0.96163564159678
 * Example: =HUSH.GROUP_VELOCITY(10, 0.5, 2, 30) → 0.981058642023259
 * @customfunction GROUP_VELOCITY
 * @helpurl https://localhost:3000/help/GROUP_VELOCITY.html
 * @param ppw Cells per wavelength in the background medium at this frequency: a number; > 0, ≤ 1000000.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [angle] Angle of incidence (from the face normal, the x axis): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, < 90°. Default 0.
 * @param [azimuth] Azimuth of the direction about the x axis (3-D grids): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ -360°, ≤ 360°. Default 0.
 * @returns v_g/v.
 */
export function groupVelocity(ppw: any, courant?: any, dimensions?: any, angle?: any, azimuth?: any): number {
  return worksheet(() => velocityOf(ppw, courant, dimensions, angle, azimuth).groupVelocityRatio);
}

/**
 * Versions of the add-in and of its physical model, to keep in the workbook so that colleagues can check they compute with the same model.
 * Example: =HUSH.MODEL_VERSION() → "Hush 0.2.0, model 2.0.0"
 * @customfunction MODEL_VERSION
 * @helpurl https://localhost:3000/help/MODEL_VERSION.html
 * @returns "Hush <add-in version>, model <model version>".
 */
export function modelVersion(): string {
  return `Hush ${APP_VERSION}, model ${MODEL_VERSION}`;
}

/** Any number a spilled cell would show must be finite: a plan that overflows is refused, never shown as a number. */
function finiteCell(name: string, x: number | string): number | string {
  if (typeof x === 'number' && !Number.isFinite(x)) {
    throw new HushInputError(name, `${name} is out of range (${x}): an input is beyond what the model can count; check throughput, sizes, cell and run length`, 'number');
  }
  return x;
}

function designSpec(
  target: unknown,
  ppw_min: unknown,
  ppw_max: unknown,
  angle_max: unknown,
  orders: unknown,
  courant: unknown,
  index: unknown,
  dimensions: unknown,
  kappa_max: unknown,
  alpha_max_norm: unknown,
  sampling: unknown,
  decay_min: unknown,
  gap: unknown,
  min_layers: unknown,
  azimuth_max: unknown,
  index_absorber: unknown,
): DesignSpec {
  const ppwMin = requiredArg<'number'>('ppw_min', ppw_min);
  const ppwMax = arg<'number'>('ppw_max', ppw_max);
  return {
    target: requiredArg<'reflection'>('target', target),
    ppwMin,
    ppwMax,
    angleMaxDeg: arg<'angle'>('angle_max', angle_max),
    orders: listArg<'numbers'>('orders', orders),
    courant: arg<'number'>('courant', courant) ?? defaultCourant(arg<'count'>('dimensions', dimensions) ?? 3),
    index: arg<'number'>('index', index),
    dimensions: arg<'count'>('dimensions', dimensions),
    kappaMax: arg<'number'>('kappa_max', kappa_max),
    alphaMaxNorm: arg<'number'>('alpha_max_norm', alpha_max_norm),
    sampling: arg<'choice'>('sampling', sampling) as SamplingConvention | 'all' | undefined,
    decayMinCells: gapCells('decay_min', arg<'gap'>('decay_min', decay_min), ppwMin),
    gapCells: gapCells('gap', arg<'gap'>('gap', gap), ppwMax ?? ppwMin),
    minLayers: arg<'count'>('min_layers', min_layers),
    azimuthMaxDeg: arg<'angle'>('azimuth_max', azimuth_max),
    absorberIndices: listArg<'numbers'>('index_absorber', index_absorber),
  };
}

/** Cells of a gap-like argument: cells, or wavelengths at `ppw` cells per wavelength (a length needs a cell size a design spec has not). */
function gapCells(name: string, g: Gap | undefined, ppw: number): number | undefined {
  if (g === undefined) return undefined;
  if ('cells' in g) return g.cells;
  if ('wavelengths' in g) return g.wavelengths * ppw;
  throw new HushInputError(name, `${name} as a length needs a cell size: give it in cells or in wavelengths`, 'value');
}

/**
 * Thinnest absorber (layer count N) whose worst exact reflection on this grid over the band and angles meets the target, best of the allowed grading orders.
 * Example: =HUSH.LAYERS(0.001, 20) → 4
 * Example: =HUSH.LAYERS(0.0001, 15, 30, 45, "3,4") → 8
 * Example: =HUSH.LAYERS(0.001, 20, , "0.5 rad") → 4
 * @customfunction LAYERS
 * @helpurl https://localhost:3000/help/LAYERS.html
 * @cancelable
 * @param target Required amplitude reflection |r| per face: an amplitude |r|, a percentage or dB (0.001, 0.1%, -60 dB); > 0, < 1.
 * @param ppw_min Cells per wavelength in the background at the short-wavelength end of the band: a number; > 0, ≤ 1000000.
 * @param [ppw_max] Cells per wavelength at the long-wavelength end of the band: a number; > 0, ≤ 1000000. Default ppw_min (one frequency).
 * @param [angle_max] Largest angle of incidence on the absorber: an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, ≤ 85°. Default 0.
 * @param [orders] Allowed polynomial grading orders: numbers separated by commas or spaces; ≥ 1, ≤ 10. Default 2, 3, 4.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [index] Background refractive index at the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [kappa_max] κ at the back of the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless): a number; ≥ 0, ≤ 10. Default 0.
 * @param [sampling] Your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset): one of node, average, offset, lagged, all (any letter case). Default node.
 * @param [decay_min] Shortest decay length of the structure's evanescent near fields at the band's short end: cells, wavelengths or a length: cells (a bare number), wavelengths ("0.5 wavelengths") or a length. Default from index_max and index: λ_short/(2π√(index_max² − index²)); none without a denser material; 'none' to switch the check off.
 * @param [gap] Structure-to-absorber gap: cells, "0.5 wavelengths" or a length: cells (a bare number), wavelengths ("0.5 wavelengths") or a length. Default blank: the structure size includes its clearance.
 * @param [min_layers] Fewest absorber layers a design may have (a floor set by policy): a whole number; ≥ 1, ≤ 200. Default 1.
 * @param [azimuth_max] Largest azimuth of the plane of incidence about the face normal (3-D; 0–45° covers every direction by symmetry): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, ≤ 45°. Default 45 in 3-D, 0 in 2-D.
 * @param [index_absorber] Indices of every medium that crosses the absorber (a guide or substrate as well as the background): numbers separated by commas or spaces; ≥ 1, ≤ 100. Default index.
 * @returns Layer count N (cells).
 */
export function layers(
  target: any,
  ppw_min: any,
  ppw_max?: any,
  angle_max?: any,
  orders?: any[][],
  courant?: any,
  index?: any,
  dimensions?: any,
  kappa_max?: any,
  alpha_max_norm?: any,
  sampling?: any,
  decay_min?: any,
  gap?: any,
  min_layers?: any,
  azimuth_max?: any,
  index_absorber?: any,
  invocation?: CustomFunctions.CancelableInvocation,
): Promise<number> {
  return asWorksheet(
    () =>
      designOf(
        designSpec(target, ppw_min, ppw_max, angle_max, orders, courant, index, dimensions, kappa_max, alpha_max_norm, sampling, decay_min, gap, min_layers, azimuth_max, index_absorber),
        invocationOf(invocation),
      ),
    (d: DesignResult) => d.layers,
  );
}

/**
 * The thinnest absorber design spilled as one row (layers, order, strength, κ, α, worst |r| and where, continuous |r|) under HUSH.DESIGN_HEADER().
 * Example: =HUSH.DESIGN(0.001, 20) → {4, 2, 0.937639260920117, 1, 0, 1, 0.000608146415488992, 20, 0, 0.00247654392371049}
 * @customfunction DESIGN
 * @helpurl https://localhost:3000/help/DESIGN.html
 * @cancelable
 * @param target Required amplitude reflection |r| per face: an amplitude |r|, a percentage or dB (0.001, 0.1%, -60 dB); > 0, < 1.
 * @param ppw_min Cells per wavelength in the background at the short-wavelength end of the band: a number; > 0, ≤ 1000000.
 * @param [ppw_max] Cells per wavelength at the long-wavelength end of the band: a number; > 0, ≤ 1000000. Default ppw_min (one frequency).
 * @param [angle_max] Largest angle of incidence on the absorber: an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, ≤ 85°. Default 0.
 * @param [orders] Allowed polynomial grading orders: numbers separated by commas or spaces; ≥ 1, ≤ 10. Default 2, 3, 4.
 * @param [courant] Vacuum Courant number S = cΔt/Δ (at most 1/√dimensions): a number; ≥ 0.0001, ≤ 1. Default 0.99/√dimensions.
 * @param [index] Background refractive index at the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [dimensions] Grid dimensions (1, 2 or 3): a whole number; ≥ 1, ≤ 3. Default 3.
 * @param [kappa_max] κ at the back of the absorber: a number; ≥ 1, ≤ 100. Default 1.
 * @param [alpha_max_norm] CFS shift α_max·η₀·Δ·n (dimensionless): a number; ≥ 0, ≤ 10. Default 0.
 * @param [sampling] Your solver's grid convention for the absorber profiles: node (each node at its own depth), average (each node the mean over its cell), offset (the profile starts half a cell early), lagged (one array for E and H), all (a design that holds under node, average and offset): one of node, average, offset, lagged, all (any letter case). Default node.
 * @param [decay_min] Shortest decay length of the structure's evanescent near fields at the band's short end: cells, wavelengths or a length: cells (a bare number), wavelengths ("0.5 wavelengths") or a length. Default from index_max and index: λ_short/(2π√(index_max² − index²)); none without a denser material; 'none' to switch the check off.
 * @param [gap] Structure-to-absorber gap: cells, "0.5 wavelengths" or a length: cells (a bare number), wavelengths ("0.5 wavelengths") or a length. Default blank: the structure size includes its clearance.
 * @param [min_layers] Fewest absorber layers a design may have (a floor set by policy): a whole number; ≥ 1, ≤ 200. Default 1.
 * @param [azimuth_max] Largest azimuth of the plane of incidence about the face normal (3-D; 0–45° covers every direction by symmetry): an angle such as 30 deg, 30° or 0.5 rad; a bare number is in deg; ≥ 0°, ≤ 45°. Default 45 in 3-D, 0 in 2-D.
 * @param [index_absorber] Indices of every medium that crosses the absorber (a guide or substrate as well as the background): numbers separated by commas or spaces; ≥ 1, ≤ 100. Default index.
 * @returns One row in the order of HUSH.DESIGN_HEADER().
 */
export function design(
  target: any,
  ppw_min: any,
  ppw_max?: any,
  angle_max?: any,
  orders?: any[][],
  courant?: any,
  index?: any,
  dimensions?: any,
  kappa_max?: any,
  alpha_max_norm?: any,
  sampling?: any,
  decay_min?: any,
  gap?: any,
  min_layers?: any,
  azimuth_max?: any,
  index_absorber?: any,
  invocation?: CustomFunctions.CancelableInvocation,
): Promise<number[][]> {
  return asWorksheet(
    () =>
      designOf(
        designSpec(target, ppw_min, ppw_max, angle_max, orders, courant, index, dimensions, kappa_max, alpha_max_norm, sampling, decay_min, gap, min_layers, azimuth_max, index_absorber),
        invocationOf(invocation),
      ),
    (d: DesignResult) => [DESIGN_COLUMNS.map((c) => finiteCell(c.header, c.value(d)) as number)],
  );
}

/**
 * Header row for HUSH.DESIGN, with units in brackets.
 * Example: =HUSH.DESIGN_HEADER() → {"layers [cells]", "order", "strength [σmax/σopt]", "kappa_max", "alpha_max_norm [α·η₀·Δ·n]", "alpha_order", "worst_reflection [|r|]", "worst_ppw [cells/λ]", "worst_angle [deg]", "continuous_reflection [|r|]"}
 * @customfunction DESIGN_HEADER
 * @helpurl https://localhost:3000/help/DESIGN_HEADER.html
 * @returns One row of column names.
 */
export function designHeader(): string[][] {
  return [DESIGN_COLUMNS.map((c) => c.header)];
}

/** A plan's output row for a worksheet: numbers and text only (an empty value is ""), every number finite. */
function planCells(plan: Plan): (number | string)[] {
  const r = planRecord(plan);
  return OUTPUT_NAMES.map((n) => finiteCell(n, r[n] ?? ''));
}

/**
 * Plans one study of a project table (reflection, absorber, grid, cells, memory, steps, and runtime and cost as planning estimates) as one row under HUSH.PLAN_HEADER().
 * Example: =HUSH.PLAN({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → {0.00498756211208903, -46.0422336566019, 0.00272946276262912, 0, 0, 0.00272946276262912, 2.5e-8, "", "", 3, 4, 0.609875173686855, 0.00136380140417954, -57.3049773347699, 0.0535360064500616, -25.4270805678709, 1, 0, "", 1, "node", 7.5e-8, 62, 62, 62, "388×388×188", 28302272, 1744104, 6.56710959882474, 7114368, 1.047339264, 0.028457472, 0.679254528, 0.339627264, 6, 3, 4, 4.76643717382977e-17, 6.4266693059685e-13, 13484, 0.109274051337778, 0.0994750936977778, 0.00979895764, 0, 8.96732345880576, 0.273185128344444, 0.0244973941, 0, 0, "", 1, "accuracy split: absorber 0.273 %, dispersion 0 %, run 0 % (added: 0.273 % of 1 %); thin absorber: 3 layers, fewer than the 8–10 of common practice; on this grid it reflects at most 0.00136 (continuous theory would say 0.0535), which meets the target; keep a thicker one if your solver's convention is not node", "2.0.0"}
 * @customfunction PLAN
 * @helpurl https://localhost:3000/help/PLAN.html
 * @cancelable
 * @param header The project table's header row: field names such as band_short, cell, intensity_error (units in brackets and other columns are ignored), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, as many cells as the header, e.g. A2:AM2. Numbers take each field's default unit; text may carry units ("1550 nm", "3 ps", "$2/h").
 * @returns One row in the order of HUSH.PLAN_HEADER(); an empty cell where the plan has no value.
 */
export function plan(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return asWorksheet(
    () => planOf(header, row, invocationOf(invocation)),
    (p: Plan) => [planCells(p)],
  );
}

/**
 * Header row for HUSH.PLAN, with units in brackets.
 * Example: =HUSH.PLAN_HEADER() → {"required_reflection [|r|]", "required_reflection_db [dB]", "error_absorber", "error_dispersion", "error_run", "error_total", "cell_planned [m]", "ppw_min [cells/λ]", "resonance_shift [linewidths]", "layers [cells]", "order", "strength [σmax/σopt]", "worst_reflection [|r|]", "worst_reflection_db [dB]", "continuous_reflection [|r|]", "continuous_reflection_db [dB]", "design_kappa_max", "design_alpha_max [S/m]", "worst_evanescent [|r|]", "limiting_index", "sampling_checked", "absorber_thickness [m]", "ppw_short [cells/λ]", "ppw_long [cells/λ]", "ppw_densest [cells/λ]", "grid [cells]", "cells_total [cells]", "cells_absorber [cells]", "overhead_percent [%]", "psi_total [values]", "memory [GB]", "memory_psi [GB]", "memory_fields [GB]", "memory_material [GB]", "field_values_per_cell [values]", "material_values_per_cell [values]", "bytes_per_value [B]", "time_step [s]", "simulated_time [s]", "steps", "runtime [h]", "runtime_interior [h]", "runtime_absorber [h]", "runtime_exchange [h]", "absorber_share [%]", "cost [currency]", "cost_absorber [currency]", "cost_refinement [currency]", "saving [currency]", "halo_per_step [MB]", "parallel_efficiency", "notes", "model_version"}
 * @customfunction PLAN_HEADER
 * @helpurl https://localhost:3000/help/PLAN_HEADER.html
 * @returns One row of column names.
 */
export function planHeader(): string[][] {
  return [planHeaderText()];
}

/** One figure of a row's plan (the same cached plan HUSH.PLAN spills), with what to add when the row does not give it. */
function planFigure(header: unknown, row: unknown, column: string, missing: (p: Plan) => string, invocation: unknown): Promise<number> {
  return asWorksheet(
    () => planOf(header, row, invocationOf(invocation)),
    (p: Plan) => {
      const v = planRecord(p)[column];
      if (typeof v !== 'number') throw new HushInputError(column, missing(p), 'value');
      return finiteCell(column, v) as number;
    },
  );
}

const NO_RUN_LENGTH = 'give duration, passes or q in the row';

/**
 * Cells of the whole grid of a study (structure, gap and absorber), from the same plan as HUSH.PLAN.
 * Example: =HUSH.CELLS({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → 28302272
 * @customfunction CELLS
 * @helpurl https://localhost:3000/help/CELLS.html
 * @cancelable
 * @param header The project table's header row (field names), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, e.g. A2:AM2.
 * @returns Number of cells.
 */
export function cells(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return planFigure(header, row, 'cells_total', () => 'no cell count', invocation);
}

/**
 * Memory of a study's fields, material coefficients and CPML ψ values in GB (10⁹ bytes), a planning estimate from stated per-cell counts.
 * Example: =HUSH.MEMORY({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → 1.047339264
 * @customfunction MEMORY
 * @helpurl https://localhost:3000/help/MEMORY.html
 * @cancelable
 * @param header The project table's header row (field names), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, e.g. A2:AM2.
 * @returns Memory in GB.
 */
export function memory(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return planFigure(header, row, 'memory', () => 'no memory figure', invocation);
}

/**
 * Time steps of a study's run (its duration, passes or ring-down of q over Δt = S·Δ/c).
 * Example: =HUSH.STEPS({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → 13484
 * @customfunction STEPS
 * @helpurl https://localhost:3000/help/STEPS.html
 * @cancelable
 * @param header The project table's header row (field names), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, e.g. A2:AM2.
 * @returns Number of time steps.
 */
export function steps(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return planFigure(header, row, 'steps', () => `steps need a run length: ${NO_RUN_LENGTH}`, invocation);
}

/**
 * Estimated wall time of a study's run in hours, from the row's throughput (a planning estimate, not a measurement).
 * Example: =HUSH.RUNTIME({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → 0.109274051337778
 * @customfunction RUNTIME
 * @helpurl https://localhost:3000/help/RUNTIME.html
 * @cancelable
 * @param header The project table's header row (field names), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, e.g. A2:AM2.
 * @returns Runtime in hours.
 */
export function runtime(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return planFigure(
    header,
    row,
    'runtime',
    (p) => (p.cost.time ? 'runtime needs throughput (interior cell updates per second on one node) in the row' : `runtime needs a run length: ${NO_RUN_LENGTH}`),
    invocation,
  );
}

/**
 * Estimated cost of a study's run, runtime × nodes × price per node-hour in the row's currency (a planning estimate).
 * Example: =HUSH.COST({"band_short", "cell", "size_x", "size_y", "size_z", "gap", "intensity_error", "passes", "throughput", "price_per_hour"}, {"1550 nm", "25 nm", "8 um", "8 um", "3 um", "0.5 wavelengths", "1%", 20, 1000000000, "$2.50/h"}) → 0.273185128344444
 * @customfunction COST
 * @helpurl https://localhost:3000/help/COST.html
 * @cancelable
 * @param header The project table's header row (field names), e.g. $A$1:$AM$1.
 * @param row This study's row of the same table, e.g. A2:AM2.
 * @returns Cost in the currency of price_per_hour.
 */
export function cost(header: any[][], row: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return planFigure(
    header,
    row,
    'cost',
    (p) =>
      !p.cost.time
        ? `cost needs a run length: ${NO_RUN_LENGTH}`
        : !p.cost.runtime
          ? 'cost needs throughput (interior cell updates per second on one node) in the row'
          : 'cost needs price_per_hour (price of one node-hour, e.g. $2/h) in the row',
    invocation,
  );
}

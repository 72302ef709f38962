/**
 * Accuracy budget (physics.md §1): a tolerated relative intensity error ε at a
 * monitor ↔ the amplitude reflection |r| one absorbing face may have.
 *
 * A monitor records |E|²·|1 + A·e^{iφ}|² where A is the echo amplitude relative
 * to the field. With φ unknown:
 *   worst case:  ε = (1 + A)² − 1              ⇔ A = √(1 + ε) − 1          (derived)
 *   random φ:    ε_rms = A·√(2 + A²)           ⇔ A = √(√(1 + ε²) − 1)      (derived:
 *                mean over φ of (2A cos φ + A²)² is 2A² + A⁴; ≈ √2·A for small A)
 * A = c·Σ|r_i| over K faces in the worst case, c·√K·|r| with random phases
 * (amplitudes add, or add in quadrature), and only the share F of the total
 * error budget is given to the absorber.
 */
import { HushInputError } from './errors';
import { inRange, wholeInRange } from './validate';

export type PhaseModel = 'worst' | 'random';

export interface BudgetOptions {
  /** Coupling c ∈ (0, 1] of the echo back to the monitor. Default 1. */
  coupling?: number;
  /** Number K of absorbing faces whose echoes reach the monitor. Default 1. */
  faces?: number;
  /** How the phases combine. Default 'worst'. */
  phase?: PhaseModel;
  /** Share F ∈ (0, 1] of the total error budget given to the absorber. Default 1. */
  share?: number;
}

export interface BudgetSpec extends BudgetOptions {
  /** Tolerated relative intensity error ε (0.01 for 1 %). */
  intensityError: number;
}

interface Resolved {
  coupling: number;
  faces: number;
  phase: PhaseModel;
  share: number;
}

/** Largest relative intensity error accepted (a 100 % error is no budget at all). */
export const MAX_INTENSITY_ERROR = 1;
/** Smallest intensity error accepted: below 1e-12 double-precision field solvers cannot resolve the difference. */
export const MIN_INTENSITY_ERROR = 1e-12;
/** Smallest coupling or share accepted. */
export const MIN_FRACTION = 1e-6;
/** Most faces whose echoes are combined (the six faces of a 3-D domain). */
const MAX_FACES = 6;
/** Largest echo amplitude A accepted: at most six faces, each reflecting |r| < 1 with coupling c ≤ 1, give A < 6. */
export const MAX_ECHO_AMPLITUDE = MAX_FACES;

function checkPhase(phase: unknown): PhaseModel {
  if (phase !== 'worst' && phase !== 'random') {
    throw new HushInputError('phase', `phase must be "worst" or "random" (got ${JSON.stringify(phase) ?? 'nothing'})`, 'value');
  }
  return phase;
}

function resolve(o: BudgetOptions): Resolved {
  if (o === null || typeof o !== 'object') throw new HushInputError('budget options', 'budget options must be an object', 'value');
  const coupling = inRange('coupling', o.coupling ?? 1, MIN_FRACTION, 1);
  const faces = wholeInRange('faces', o.faces ?? 1, 1, MAX_FACES);
  const phase = checkPhase(o.phase ?? 'worst');
  const share = inRange('share', o.share ?? 1, MIN_FRACTION, 1);
  return { coupling, faces, phase, share };
}

/** Echo amplitude A for an intensity error 0 ≤ ε ≤ MAX_INTENSITY_ERROR under a phase model. */
export function echoAmplitudeForError(error: number, phase: PhaseModel): number {
  inRange('intensity error', error, 0, MAX_INTENSITY_ERROR);
  checkPhase(phase);
  // Written without cancellation: √(1+x) − 1 = x/(√(1+x) + 1).
  if (phase === 'worst') return error / (Math.sqrt(1 + error) + 1);
  const e2 = error * error;
  return Math.sqrt(e2 / (Math.sqrt(1 + e2) + 1));
}

/** Intensity error ε caused by an echo of amplitude 0 ≤ A ≤ MAX_ECHO_AMPLITUDE under a phase model. */
export function errorForEchoAmplitude(a: number, phase: PhaseModel): number {
  inRange('echo amplitude', a, 0, MAX_ECHO_AMPLITUDE);
  checkPhase(phase);
  // (1 + A)² − 1 = A·(2 + A), written without cancellation.
  return phase === 'worst' ? a * (2 + a) : a * Math.sqrt(2 + a * a);
}

/**
 * Required amplitude reflection per absorbing face.
 * Example: requiredAmplitude({ intensityError: 0.01 }) = √1.01 − 1 = 0.004987562112089027 (computed without cancellation)
 */
export function requiredAmplitude(spec: BudgetSpec): number {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('budget', 'budget must be an object', 'value');
  const eps = inRange('intensity error', spec.intensityError, MIN_INTENSITY_ERROR, MAX_INTENSITY_ERROR);
  const o = resolve(spec);
  const a = echoAmplitudeForError(eps * o.share, o.phase);
  const combine = o.phase === 'worst' ? o.faces : Math.sqrt(o.faces);
  return a / (o.coupling * combine);
}

/** Inverse of `requiredAmplitude`: the intensity error an amplitude reflection |r| per face causes. */
export function intensityErrorFromAmplitude(amplitude: number, options: BudgetOptions = {}): number {
  const r = inRange('amplitude reflection', amplitude, 0, 1, { hiOpen: true });
  const o = resolve(options);
  const combine = o.phase === 'worst' ? o.faces : Math.sqrt(o.faces);
  return errorForEchoAmplitude(o.coupling * combine * r, o.phase) / o.share;
}

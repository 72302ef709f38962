/**
 * Accuracy budget (physics.md §1): a tolerated relative intensity error ε at a
 * monitor ↔ the amplitude reflection |r| one absorbing face may have.
 *
 * A field (intensity) monitor records |E|²·|1 + A·e^{iφ}|² where A is the echo
 * amplitude relative to the field. With φ unknown:
 *   worst case:  ε = (1 + A)² − 1              ⇔ A = √(1 + ε) − 1          (derived)
 *   random φ:    ε_rms = A·√(2 + A²)           ⇔ A = √(√(1 + ε²) − 1)      (derived:
 *                mean over φ of (2A cos φ + A²)² is 2A² + A⁴; ≈ √2·A for small A)
 * A flux monitor (power through a plane) sees the echo travelling the other
 * way: the Poynting flux of counter-propagating waves has no cross term, so
 * the flux is |E|²·(1 − A²) and the error is ε = A² ⇔ A = √ε (physics.md §7,
 * derived); with random phases A² is the mean of |Σ c·r_i e^{iφ_i}|² = K·c²|r|².
 * A = c·Σ|r_i| over K faces in the worst case, c·√K·|r| with random phases
 * (amplitudes add, or add in quadrature), and only the share F of the total
 * error budget is given to the absorber.
 *
 * The coupling c is the echo's amplitude at the monitor relative to its
 * amplitude leaving the face. Without a resonance c ≤ 1. A resonance between
 * the face and the monitor can build the echo up: on resonance a lossless
 * two-mirror (Fabry–Perot) resonator of mirror reflectance R multiplies an
 * entering amplitude by 1/t, t = √(1 − R) (Saleh & Teich, Fundamentals of
 * Photonics, the Fabry–Perot resonator), and its standing wave peaks at 2/t.
 * With the finesse F = π√R/(1 − R) and x = √R, 1/t² = F/(πx) = F/π + 1/(1 + x)
 * ≤ F/π + 1, and Q = m·F ≥ F (m the mode order), so 2/t ≤ 2√(1 + Q/π)
 * (derived). Hence c ≤ 2√(1 + Q/π) for a resonance of quality factor Q
 * (`maxResonantCoupling`), and c ≤ MAX_COUPLING = 2√(1 + 10¹²/π) ≈ 1.13·10⁶
 * at the largest Q the planner accepts.
 */
import { HushInputError } from './errors';
import { MAX_QUALITY_FACTOR } from './ringdown';
import { inRange, wholeInRange } from './validate';

export type PhaseModel = 'worst' | 'random';
/** What the monitor records: a field's intensity (the echo's cross term counts) or the flux through a plane (it cancels). */
export type MonitorKind = 'intensity' | 'flux';

export interface BudgetOptions {
  /** Coupling c of the echo back to the monitor: (0, 1] without a resonance, up to 2√(1 + Q/π) with one (module comment). Default 1. */
  coupling?: number;
  /** Number K of absorbing faces whose echoes reach the monitor. Default 1. */
  faces?: number;
  /** How the phases combine. Default 'worst'. */
  phase?: PhaseModel;
  /** Share F ∈ (0, 1] of the total error budget given to the absorber. Default 1. */
  share?: number;
  /** What the monitor records. Default 'intensity'. */
  monitor?: MonitorKind;
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
  monitor: MonitorKind;
}

/** Largest relative intensity error accepted (a 100 % error is no budget at all). */
export const MAX_INTENSITY_ERROR = 1;
/** Smallest intensity error accepted: below 1e-12 double-precision field solvers cannot resolve the difference. */
export const MIN_INTENSITY_ERROR = 1e-12;
/** Smallest coupling or share accepted. */
export const MIN_FRACTION = 1e-6;
/** Most faces whose echoes are combined (the six faces of a 3-D domain). */
const MAX_FACES = 6;

/**
 * Largest build-up of an echo's amplitude by a resonance of quality factor Q: 2√(1 + Q/π) (module comment, derived).
 * Example: maxResonantCoupling(1000) = 2√(1 + 1000/π) = 35.74…
 */
export function maxResonantCoupling(q: number): number {
  const Q = inRange('quality factor', q, 0, MAX_QUALITY_FACTOR, { loOpen: true });
  return 2 * Math.sqrt(1 + Q / Math.PI);
}

/** Largest coupling accepted: the build-up 2√(1 + Q/π) at the largest quality factor accepted (10¹²), ≈ 1.128·10⁶. */
export const MAX_COUPLING = 2 * Math.sqrt(1 + MAX_QUALITY_FACTOR / Math.PI);
/** Largest echo amplitude A accepted: six faces, each reflecting |r| < 1 with coupling at most MAX_COUPLING. */
export const MAX_ECHO_AMPLITUDE = MAX_FACES * MAX_COUPLING;

function checkMonitor(monitor: unknown): MonitorKind {
  if (monitor !== 'intensity' && monitor !== 'flux') {
    throw new HushInputError('monitor', `monitor must be "intensity" or "flux" (got ${JSON.stringify(monitor) ?? 'nothing'})`, 'value');
  }
  return monitor;
}

function checkPhase(phase: unknown): PhaseModel {
  if (phase !== 'worst' && phase !== 'random') {
    throw new HushInputError('phase', `phase must be "worst" or "random" (got ${JSON.stringify(phase) ?? 'nothing'})`, 'value');
  }
  return phase;
}

function resolve(o: BudgetOptions): Resolved {
  if (o === null || typeof o !== 'object') throw new HushInputError('budget options', 'budget options must be an object', 'value');
  const coupling = inRange('coupling', o.coupling ?? 1, MIN_FRACTION, MAX_COUPLING);
  const faces = wholeInRange('faces', o.faces ?? 1, 1, MAX_FACES);
  const phase = checkPhase(o.phase ?? 'worst');
  const share = inRange('share', o.share ?? 1, MIN_FRACTION, 1);
  const monitor = checkMonitor(o.monitor ?? 'intensity');
  return { coupling, faces, phase, share, monitor };
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
 * Flux monitor: requiredAmplitude({ intensityError: 0.01, monitor: 'flux' }) = √0.01 = 0.1 (the cross term cancels).
 * Example: requiredAmplitude({ intensityError: 0.01 }) = √1.01 − 1 = 0.004987562112089027 (computed without cancellation)
 */
export function requiredAmplitude(spec: BudgetSpec): number {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('budget', 'budget must be an object', 'value');
  const eps = inRange('intensity error', spec.intensityError, MIN_INTENSITY_ERROR, MAX_INTENSITY_ERROR);
  const o = resolve(spec);
  const a = o.monitor === 'flux' ? Math.sqrt(eps * o.share) : echoAmplitudeForError(eps * o.share, o.phase);
  const combine = o.phase === 'worst' ? o.faces : Math.sqrt(o.faces);
  return a / (o.coupling * combine);
}

/** Inverse of `requiredAmplitude`: the intensity error an amplitude reflection |r| per face causes. */
export function intensityErrorFromAmplitude(amplitude: number, options: BudgetOptions = {}): number {
  const r = inRange('amplitude reflection', amplitude, 0, 1, { hiOpen: true });
  const o = resolve(options);
  const combine = o.phase === 'worst' ? o.faces : Math.sqrt(o.faces);
  const a = o.coupling * combine * r;
  return (o.monitor === 'flux' ? a * a : errorForEchoAmplitude(a, o.phase)) / o.share;
}

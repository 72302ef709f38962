/**
 * Run-length error: what a run stopped at time T leaves out of the monitor's
 * record, as a relative intensity error, and the inverse (the shortest run for
 * an error).
 *
 * Resonance (quality factor Q at angular frequency ω, excited at t_e):
 *   the record of a mode x(t) = e^{(−γ + iω₀)t}, γ = ω₀/(2Q), cut at T has the
 *   spectrum X_T(ω) = X_∞(ω)·(1 − a·e^{i(ω₀ − ω)T}), a = e^{−γ(T − t_e)}
 *   (derived: ∫₀^T of the exponential), so the truncation is an error field
 *   of relative amplitude a (physics.md §5) whose phase sweeps with ω, like an
 *   echo: ε = (1 + a)² − 1 worst, a·√(2 + a²) random (budget.ts, physics.md §1).
 *
 * Pulse without q (a Gaussian source g(t) = e^{−((t − t₀)/τ)²}, the shape of
 *   src/physics/fdtd/pulse.ts): energy emitted before T − t_transit has crossed
 *   the domain and reached an absorber; the energy left in the domain at T is
 *   at most the share emitted after it (derived: the energy rate ∝ g²):
 *     η(T) = ½·erfc(√2·(T − t_transit − t₀)/τ).
 *   The record misses a field of energy fraction η, an RMS relative amplitude
 *   √η over the pulse's spectrum (Parseval), which enters the intensity like
 *   an echo: ε = (1 + √η)² − 1 worst, √η·√(2 + η) random. (At the band edges,
 *   where the source spectrum is ℓ of its peak, a pointwise error can be up to
 *   1/ℓ larger; the transit at the band's slowest group velocity keeps η itself
 *   an upper bound.)
 *
 * Transit: one crossing of the longest side at the grid's group velocity v_g
 *   (velocity.ts, not c/n) of the band's shortest wavelength (the slowest, v_g
 *   falls with frequency), over the cells inside the absorbers plus ONE
 *   absorber's layers: a wave launched inside never crosses the absorber on the
 *   side it starts from, and once it has crossed the far absorber to its
 *   conductor its energy is down to |r| (half the round-trip attenuation in
 *   amplitude, √|r|); the way back out is the echo, which the absorber's share
 *   of the budget already pays for (derived). Today's `passes` in cost.ts
 *   counts both absorbers of the longest side at c/n.
 */
import { echoAmplitudeForError, errorForEchoAmplitude, type PhaseModel } from './budget';
import { MAX_LAYERS, MIN_CELL_METRES, SPEED_OF_LIGHT } from './constants';
import { HushInputError } from './errors';
import { MAX_QUALITY_FACTOR, ringdownResidual, ringdownTime } from './ringdown';
import { inRange, wholeInRange } from './validate';
import { gridVelocity } from './velocity';

/** Delay of a Gaussian source's peak in widths τ: e^{−6.2²} ≈ 2e-17, below double precision at the start (as in fdtd/pulse.ts). */
export const SOURCE_DELAY_WIDTHS = 6.2;
/** Spectral level of a band pulse at the band's edges, relative to its peak (as EDGE_LEVEL_TARGET in fdtd/pulse.ts). */
export const DEFAULT_PULSE_EDGE_LEVEL = 1e-2;
/** Longest run accepted, seconds (as `duration` in cost.ts). */
export const MAX_RUN_SECONDS = 1e3;
/** Smallest run-length error accepted by the inverses (smaller ones underflow the residual amplitude). */
export const MIN_RUN_ERROR = 1e-300;

const SQRT_PI = Math.sqrt(Math.PI);

function checkPhase(phase: unknown): PhaseModel {
  if (phase !== 'worst' && phase !== 'random') {
    throw new HushInputError('phase', `phase must be "worst" or "random" (got ${JSON.stringify(phase) ?? 'nothing'})`, 'value');
  }
  return phase;
}

/**
 * Complementary error function erfc(x) = (2/√π)∫_x^∞ e^{−t²} dt, to about 1e-14
 * relative: for |x| < 2 as 1 − erf(x) with the positive series
 * erf(x) = (2/√π)·e^{−x²}·Σ_n (2x²)ⁿ·x/(1·3·…·(2n+1)) (Abramowitz & Stegun 7.1.6),
 * for x ≥ 2 the continued fraction erfc(x) = e^{−x²}/√π · 1/(x + ½/(x + 1/(x + 3/2/(x + …))))
 * (A&S 7.1.14) by the modified Lentz method, and erfc(−x) = 2 − erfc(x).
 */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < 2) {
    const x2 = x * x;
    let term = x;
    let sum = x;
    for (let n = 1; n < 200; n++) {
      term *= (2 * x2) / (2 * n + 1);
      sum += term;
      if (term < 1e-17 * sum) break;
    }
    return 1 - (2 / SQRT_PI) * Math.exp(-x2) * sum;
  }
  if (x > 27.3) return 0; // e^{−x²} underflows; erfc(27.3) < 1e-324.
  const tiny = 1e-300;
  let f = x;
  let C = x;
  let D = 0;
  for (let n = 1; n < 5000; n++) {
    const a = n / 2;
    D = x + a * D;
    if (D === 0) D = tiny;
    D = 1 / D;
    C = x + a / C;
    if (C === 0) C = tiny;
    const delta = C * D;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / (SQRT_PI * f);
}

/** Inverse of erfc on (0, 2): Newton's method on ln erfc, safeguarded by bisection (about 1e-14 relative). */
export function erfcInverse(y: number): number {
  const v = inRange('erfc value', y, 0, 2, { loOpen: true, hiOpen: true });
  if (v === 1) return 0;
  if (v > 1) return -erfcInverse(2 - v);
  const target = Math.log(v);
  let lo = 0;
  let hi = 27.3;
  let x = Math.min(Math.sqrt(-target), hi / 2);
  for (let it = 0; it < 200; it++) {
    const e = erfc(x);
    const h = Math.log(e) - target;
    if (h > 0) lo = x;
    else hi = x;
    // d/dx ln erfc = −(2/√π)·e^{−x²}/erfc(x).
    const dh = (-(2 / SQRT_PI) * Math.exp(-x * x)) / e;
    let next = x - h / dh;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-15 * Math.max(1, x)) return next;
    x = next;
  }
  return x;
}

// ---------------------------------------------------------------- resonance

export interface ResonanceRunSpec {
  /** Quality factor of the slowest resonance. */
  q: number;
  /** Its frequency, Hz. */
  frequencyHz: number;
  /** When the mode is excited (the source's peak), s after the start; default 0. */
  excitationSeconds?: number;
  /** How the residual's phase enters; default 'worst'. */
  phase?: PhaseModel;
}

function checkExcitation(t: unknown): number {
  return inRange('excitation time', t ?? 0, 0, MAX_RUN_SECONDS, { unit: 's' });
}

function checkResonance(spec: ResonanceRunSpec): { q: number; f: number; te: number; phase: PhaseModel } {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('run', 'the run spec must be an object', 'value');
  const q = inRange('quality factor', spec.q, 0, MAX_QUALITY_FACTOR, { loOpen: true });
  const f = inRange('ring-down frequency', spec.frequencyHz, 0, Infinity, { loOpen: true, hiOpen: true, unit: 'Hz' });
  return { q, f, te: checkExcitation(spec.excitationSeconds), phase: checkPhase(spec.phase ?? 'worst') };
}

/**
 * Intensity error of a run of `durationSeconds` on a resonance: a = e^{−ω(T − t_e)/(2Q)},
 * ε = (1 + a)² − 1 worst (module comment).
 * Example: resonanceRunError({ q: 1000, frequencyHz: 1e9 }, ringdownTime(1000, 1e9, 1e-3)) = 1e-3·(2 + 1e-3) = 2.001e-3.
 */
export function resonanceRunError(spec: ResonanceRunSpec, durationSeconds: number): number {
  const r = checkResonance(spec);
  const T = inRange('duration', durationSeconds, 0, MAX_RUN_SECONDS, { loOpen: true, unit: 's' });
  const a = T <= r.te ? 1 : ringdownResidual(r.q, r.f, T - r.te);
  return errorForEchoAmplitude(a, r.phase);
}

/**
 * Shortest run on a resonance whose run-length error is at most `error`:
 * T = t_e + 2Q·ln(1/a)/ω with a = √(1 + ε) − 1 worst, √(√(1 + ε²) − 1) random.
 * Example: resonanceRunDuration({ q: 1000, frequencyHz: 1e9 }, 2.001e-3) = ringdownTime(1000, 1e9, 1e-3) = 2.1988e-6 s.
 */
export function resonanceRunDuration(spec: ResonanceRunSpec, error: number): number {
  const r = checkResonance(spec);
  const e = inRange('run-length error', error, MIN_RUN_ERROR, 1);
  const a = echoAmplitudeForError(e, r.phase);
  return r.te + ringdownTime(r.q, r.f, a);
}

// -------------------------------------------------------------------- pulse

/**
 * Width τ (s) of the Gaussian e^{−(t/τ)²} whose spectrum e^{−(Δω·τ/2)²} falls to
 * `edgeLevel` of its peak at the band's edges, for a band from `frequencyLowHz`
 * to `frequencyHighHz` centred on the source (Fourier pair of the Gaussian,
 * Bracewell, The Fourier Transform and Its Applications):
 * τ = 2√(ln(1/ℓ))/(π·(f_high − f_low)).
 */
export function bandPulseWidth(frequencyLowHz: number, frequencyHighHz: number, edgeLevel = DEFAULT_PULSE_EDGE_LEVEL): number {
  const lo = inRange('band low frequency', frequencyLowHz, 0, Infinity, { loOpen: true, hiOpen: true, unit: 'Hz' });
  const hi = inRange('band high frequency', frequencyHighHz, 0, Infinity, { loOpen: true, hiOpen: true, unit: 'Hz' });
  const l = inRange('band edge level', edgeLevel, 1e-300, 1, { hiOpen: true });
  const half = Math.PI * Math.abs(hi - lo);
  if (!(half > 0)) {
    throw new HushInputError('band', 'a single frequency is a continuous wave, not a pulse: give a band of two frequencies, or the source duration', 'value');
  }
  const tau = (2 * Math.sqrt(Math.log(1 / l))) / half;
  if (!(tau > 0)) throw new HushInputError('band', `a band of ${Math.abs(hi - lo)} Hz is too wide for a pulse the grid can sample`);
  if (!(tau <= MAX_RUN_SECONDS)) throw new HushInputError('band', `a band of ${Math.abs(hi - lo)} Hz needs a pulse longer than ${MAX_RUN_SECONDS} s`);
  return tau;
}

/** Full length of a Gaussian source of width τ: 2·SOURCE_DELAY_WIDTHS·τ (peak at SOURCE_DELAY_WIDTHS·τ). */
export function pulseSourceDuration(pulseWidthSeconds: number): number {
  return 2 * SOURCE_DELAY_WIDTHS * inRange('pulse width', pulseWidthSeconds, 0, MAX_RUN_SECONDS, { loOpen: true, unit: 's' });
}

export interface TransitSpec {
  /** Cell size Δ, m. */
  cellMetres: number;
  /** Cells along the longest side inside the absorbers (structure and gaps). */
  cells: number;
  /** Absorber layers on that side, counted once (module comment). */
  layers: number;
  /** Cells per wavelength in the background at the band's shortest wavelength, λ₀/(n·Δ). */
  ppw: number;
  /** Background index n; default 1. */
  index?: number;
  /** Vacuum Courant number; default 0.99/√D. */
  courant?: number;
  /** 1, 2 or 3; default 3. */
  dimensions?: number;
}

/**
 * One transit of the longest side: (cells + layers)·Δ·n/(c·v_g/v), v_g the grid's
 * group velocity along the axis at `ppw` (module comment).
 * Example: transitTime({ cellMetres: 1e-8, cells: 1000, layers: 10, ppw: 10, courant: 0.5, dimensions: 1 })
 * = 1010·1e-8/(299792458·0.961636) s = 3.50340317659937e-14 s.
 */
export function transitTime(spec: TransitSpec): number {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('transit', 'the transit spec must be an object', 'value');
  const d = inRange('cell size', spec.cellMetres, MIN_CELL_METRES, 1, { unit: 'm' });
  const cells = wholeInRange('cells along the longest side', spec.cells, 1, Number.MAX_SAFE_INTEGER);
  const layers = wholeInRange('layers', spec.layers, 0, MAX_LAYERS);
  const index = inRange('background index', spec.index ?? 1, 1, 100);
  const vg = gridVelocity({ ppw: spec.ppw, courant: spec.courant, dimensions: spec.dimensions, index }).groupVelocityRatio;
  return ((cells + layers) * d * index) / (SPEED_OF_LIGHT * vg);
}

/**
 * Duration of a run of `passes` transits after the source: source duration + passes·transit.
 * Example: passesDuration(3, 1e-12, 2e-13) = 3.2e-12 s.
 */
export function passesDuration(passes: number, transitSeconds: number, sourceSeconds = 0): number {
  const p = inRange('passes', passes, 0, 1e6, { loOpen: true });
  const t = inRange('transit time', transitSeconds, 0, MAX_RUN_SECONDS, { loOpen: true, unit: 's' });
  const s = inRange('source duration', sourceSeconds, 0, MAX_RUN_SECONDS, { unit: 's' });
  return s + p * t;
}

export interface PulseRunSpec {
  /** Gaussian width τ of the source, s (`bandPulseWidth`). */
  pulseWidthSeconds: number;
  /** Peak of the source t₀, s; default SOURCE_DELAY_WIDTHS·τ. */
  pulseDelaySeconds?: number;
  /** One transit of the longest side at the group velocity, s (`transitTime`). */
  transitSeconds: number;
  /** How the missing field's phase enters; default 'worst'. */
  phase?: PhaseModel;
}

function checkPulse(spec: PulseRunSpec): { tau: number; t0: number; transit: number; phase: PhaseModel } {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('run', 'the run spec must be an object', 'value');
  const tau = inRange('pulse width', spec.pulseWidthSeconds, 0, MAX_RUN_SECONDS, { loOpen: true, unit: 's' });
  const t0 = inRange('pulse delay', spec.pulseDelaySeconds ?? SOURCE_DELAY_WIDTHS * tau, 0, MAX_RUN_SECONDS, { unit: 's' });
  const transit = inRange('transit time', spec.transitSeconds, 0, MAX_RUN_SECONDS, { unit: 's' });
  return { tau, t0, transit, phase: checkPhase(spec.phase ?? 'worst') };
}

/**
 * Share η of the source's energy still in the domain when the run stops:
 * ½·erfc(√2·(T − t_transit − t₀)/τ) (module comment).
 */
export function pulseEnergyLeft(spec: PulseRunSpec, durationSeconds: number): number {
  const p = checkPulse(spec);
  const T = inRange('duration', durationSeconds, 0, MAX_RUN_SECONDS, { loOpen: true, unit: 's' });
  return 0.5 * erfc((Math.SQRT2 * (T - p.transit - p.t0)) / p.tau);
}

/**
 * Intensity error of a pulse run stopped at T: A = √η, ε = (1 + A)² − 1 worst (module comment).
 * Example: pulseRunError({ pulseWidthSeconds: 1, pulseDelaySeconds: 0, transitSeconds: 0 }, 1) = (1 + √(½erfc(√2)))² − 1 = 0.324413069334789
 */
export function pulseRunError(spec: PulseRunSpec, durationSeconds: number): number {
  const p = checkPulse(spec);
  return errorForEchoAmplitude(Math.sqrt(pulseEnergyLeft(spec, durationSeconds)), p.phase);
}

/**
 * Shortest pulse run whose run-length error is at most `error`:
 * T = t₀ + t_transit + τ·erfc⁻¹(2A²)/√2, A the echo amplitude for ε (module comment).
 */
export function pulseRunDuration(spec: PulseRunSpec, error: number): number {
  const p = checkPulse(spec);
  const e = inRange('run-length error', error, MIN_RUN_ERROR, 1);
  const a = echoAmplitudeForError(e, p.phase);
  const T = p.t0 + p.transit + (p.tau * erfcInverse(Math.max(2 * a * a, 1e-320))) / Math.SQRT2;
  return Math.max(T, Number.MIN_VALUE);
}

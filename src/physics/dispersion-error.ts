/**
 * The grid's numerical dispersion as an intensity error of a study
 * (physics.md §7), in the densest medium of the study (index_max), along the
 * worst direction.
 *
 * Worst direction: the axis. For a fixed |k|, G(d) = Σ_i sin²(|k| d_i/2) is a
 * sum of concave functions of u_i = d_i² (d/du sin²(|k|√u/2) = |k|²·sin w/(4w),
 * w = |k|√u, decreases for 0 < w ≤ π), so over the simplex Σu_i = 1 it is
 * smallest at a vertex, an axis; there the fixed-frequency wavenumber is
 * largest (slowest phase velocity) and the fixed-wavenumber frequency lowest
 * (largest shift) (derived). The axis (θ = 0) lies in every study's angle
 * range 0…angle_max, so the worst direction over the study's angles, and over
 * the azimuths in 3-D, is the axis whatever angle_max is; along it the 3-D
 * relation is the 1-D one at the grid's own Courant number.
 *
 * Which error applies:
 *  - a path (pathWavelengths) and no q: the phase slip along the path;
 *  - q and no path: the resonance shift against its linewidth;
 *  - both: both, combined as the budget's phase model combines its parts
 *    (worst: they add; random: in quadrature);
 *  - neither: no dispersion error (0). A study that names neither a path nor a
 *    resonance has no dispersion error in this model; nothing is assumed.
 *
 * Path (a wave driven at frequency ω travels L = W wavelengths of the medium
 * to an interferometric monitor):
 *   Δφ = (k̃ − k)·L = 2π·W·(v/v_p − 1)                                        (exact at fixed ω;
 *        physics.md §7 writes the first-order form 2π·W·(1 − v_p/v))
 *   error field E·(e^{iΔφ} − 1), relative amplitude A = 2·sin(|Δφ|/2)          (exact: |e^{iΔφ} − 1|)
 *   it meets the monitor's other fields at an unknown phase, like an echo:
 *   ε = (1 + A)² − 1 worst, A·√(2 + A²) random (budget.ts, physics.md §1).
 *   |Δφ| is capped at π (A = 2): over any band of finite width some frequency
 *   sees the largest slip, so a slip past π is no better.
 *
 * Resonance (a mode of quality factor Q whose wavenumber the geometry fixes):
 *   δ = Δf/f = 1 − ω̃/ω with sin(ω̃Δt/2) = S_m·sin(πΔ/λ)                       (exact on the axis;
 *        to first order 1 − v_p/v, physics.md §7)
 *   Lorentzian intensity line L(u) = 1/(1 + u²), u = 2Q(f − f₀)/f₀ (FWHM f₀/Q);
 *   the grid's line is L(u − x), x = 2Qδ. The relative error at u,
 *   L(u − x)/L(u) − 1 = x(2u − x)/(1 + (u − x)²), is largest at
 *   u − x = (√(x² + 4) − x)/2, where it is x(x + √(x² + 4))/2 (derived); with
 *   s = Q·|δ| (the shift in linewidths):
 *   ε = 2s·(s + √(1 + s²)) = (s + √(1 + s²))² − 1 ≈ 2s for s ≪ 1,
 *   and s = ε/(2√(1 + ε)) inverts it (derived).
 *   Deterministic (no unknown phase): the same in both phase models.
 */
import { errorForEchoAmplitude, type PhaseModel } from './budget';
import { HushInputError } from './errors';
import { MAX_QUALITY_FACTOR } from './ringdown';
import { checkVelocityPpw, fixedWavenumberFrequencyRatio, phaseVelocityUnchecked, groupVelocityUnchecked, resolveDirection, type ResolvedDirection } from './velocity';
import { MAX_PPW } from './dispersion';
import { inRange } from './validate';

/** Longest path accepted, in wavelengths (10⁹: far beyond any FDTD domain). */
export const MAX_PATH_WAVELENGTHS = 1e9;

export interface DispersionErrorSpec {
  /**
   * Cells per wavelength in the densest medium, λ₀/(n_max·Δ), at the wavelength
   * the path is studied at (the band's short end is the worst).
   */
  ppw: number;
  /** Cells per wavelength of the resonance in the densest medium; default `ppw`. */
  resonancePpw?: number;
  /** Vacuum Courant number; default 0.99/√D. */
  courant?: number;
  /** 1, 2 or 3; default 3. */
  dimensions?: number;
  /** Index of the densest medium (index_max); default 1. */
  index?: number;
  /** Propagation path to an interferometric monitor, in wavelengths of the densest medium. */
  pathWavelengths?: number;
  /** Quality factor of the resonance whose frequency the study measures. */
  q?: number;
  /** How unknown phases combine; default 'worst'. */
  phase?: PhaseModel;
}

export type DispersionErrorKind = 'none' | 'path' | 'resonance' | 'path and resonance';

export interface DispersionError {
  /** The study's dispersion intensity error (0 when neither a path nor q is given). */
  error: number;
  applies: DispersionErrorKind;
  /** v_p/v along the worst direction (the axis) at `ppw`. */
  phaseVelocityRatio: number;
  /** v_g/v along the axis at `ppw`. */
  groupVelocityRatio: number;
  /** Phase slip Δφ along the path, radians (null without a path). */
  phaseSlip: number | null;
  /** Error of the path part (null without a path). */
  pathError: number | null;
  /** Δf/f of the resonance (null without q). */
  frequencyShift: number | null;
  /** Shift in linewidths, Q·|Δf/f| (null without q). */
  shiftLinewidths: number | null;
  /** Error of the resonance part (null without q). */
  resonanceError: number | null;
}

interface Resolved {
  axis: ResolvedDirection;
  ppw: number;
  resonancePpw: number;
  path: number | null;
  q: number | null;
  phase: PhaseModel;
}

function checkPhase(phase: unknown): PhaseModel {
  if (phase !== 'worst' && phase !== 'random') {
    throw new HushInputError('phase', `phase must be "worst" or "random" (got ${JSON.stringify(phase) ?? 'nothing'})`, 'value');
  }
  return phase;
}

function resolve(spec: DispersionErrorSpec, needPpw: boolean): Resolved {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('dispersion error', 'the dispersion error spec must be an object', 'value');
  // The worst direction is the axis (module comment).
  const axis = resolveDirection({ courant: spec.courant, dimensions: spec.dimensions, index: spec.index });
  const ppw = needPpw ? checkVelocityPpw(spec.ppw, axis) : 0;
  const path = spec.pathWavelengths === undefined ? null : inRange('path', spec.pathWavelengths, 0, MAX_PATH_WAVELENGTHS, { unit: 'wavelengths' });
  const q = spec.q === undefined ? null : inRange('quality factor', spec.q, 0, MAX_QUALITY_FACTOR, { loOpen: true });
  const resonancePpw = spec.resonancePpw === undefined ? ppw : checkResonancePpw(spec.resonancePpw);
  return { axis, ppw, resonancePpw, path, q, phase: checkPhase(spec.phase ?? 'worst') };
}

/** A mode's cells per wavelength: its wavenumber must lie in the Brillouin zone (more than 2 along the axis), at most MAX_PPW. */
function checkResonancePpw(p: unknown): number {
  return inRange('resonance cells per wavelength', p, 2, MAX_PPW, { loOpen: true });
}

/** A = 2 sin(min(|Δφ|, π)/2). */
function slipAmplitude(slip: number): number {
  return 2 * Math.sin(Math.min(Math.abs(slip), Math.PI) / 2);
}

/** Intensity error of a resonance shifted by s linewidths on a Lorentzian line: 2s(s + √(1 + s²)) (module comment). */
export function lineShiftError(shiftLinewidths: number): number {
  const s = inRange('shift in linewidths', shiftLinewidths, 0, 1e100);
  return 2 * s * (s + Math.sqrt(1 + s * s));
}

/** Inverse of `lineShiftError`: the shift in linewidths s = ε/(2√(1 + ε)) that causes an intensity error ε. */
export function lineShiftForError(error: number): number {
  const e = inRange('intensity error', error, 0, 1e100);
  return e / (2 * Math.sqrt(1 + e));
}

function evaluate(r: Resolved, ppw: number, resonancePpw: number): DispersionError {
  const sm = r.axis.courantMedium;
  const vp = phaseVelocityUnchecked(ppw, sm, 1, 0, 0);
  const vg = groupVelocityUnchecked(ppw, sm, 1, 0, 0);
  let phaseSlip: number | null = null;
  let pathError: number | null = null;
  if (r.path !== null) {
    phaseSlip = 2 * Math.PI * r.path * (1 / vp - 1);
    pathError = errorForEchoAmplitude(slipAmplitude(phaseSlip), r.phase);
  }
  let frequencyShift: number | null = null;
  let shiftLinewidths: number | null = null;
  let resonanceError: number | null = null;
  if (r.q !== null) {
    frequencyShift = 1 - fixedWavenumberFrequencyRatio(resonancePpw, sm, 1, 0, 0);
    shiftLinewidths = r.q * Math.abs(frequencyShift);
    resonanceError = 2 * shiftLinewidths * (shiftLinewidths + Math.sqrt(1 + shiftLinewidths * shiftLinewidths));
  }
  let error = 0;
  let applies: DispersionErrorKind = 'none';
  if (pathError !== null && resonanceError !== null) {
    applies = 'path and resonance';
    error = r.phase === 'worst' ? pathError + resonanceError : Math.sqrt(pathError * pathError + resonanceError * resonanceError);
  } else if (pathError !== null) {
    applies = 'path';
    error = pathError;
  } else if (resonanceError !== null) {
    applies = 'resonance';
    error = resonanceError;
  }
  return { error, applies, phaseVelocityRatio: vp, groupVelocityRatio: vg, phaseSlip, pathError, frequencyShift, shiftLinewidths, resonanceError };
}

/**
 * The study's dispersion error (see the module comment for which error applies).
 * Example: dispersionError({ ppw: 20, courant: 0.5, dimensions: 1, pathWavelengths: 10 }):
 * v_p/v = 0.996892, Δφ = 2π·10·(1/0.996892 − 1) = 0.195910 rad, A = 2 sin(Δφ/2) = 0.195597, error = A(2 + A) = 0.429452.
 */
export function dispersionError(spec: DispersionErrorSpec): DispersionError {
  const r = resolve(spec, true);
  return evaluate(r, r.ppw, r.resonancePpw);
}

/**
 * Fewest cells per wavelength (in the densest medium; the path and the
 * resonance taken at the same wavelength, `ppw` and `resonancePpw` of the spec
 * ignored) for which the dispersion error is at most `error`. The error falls
 * monotonically as the grid is refined (v_p/v and ω̃/ω rise towards 1 on the
 * axis), so a bisection on log p finds it (at most 200 halvings, stopping at a
 * relative width of 1e-15). Returns the propagation limit's upper neighbour when
 * every resolvable grid meets the error; throws when even MAX_PPW cells per
 * wavelength does not, or when neither a path nor q is given (no dispersion
 * error to bound).
 * Example: dispersionPpwForError({ courant: 0.5, dimensions: 1, pathWavelengths: 10 }, 0.01) = 124.684…
 */
export function dispersionPpwForError(spec: Omit<DispersionErrorSpec, 'ppw'> & { ppw?: number }, error: number): number {
  const r = resolve({ ...spec, ppw: 0, resonancePpw: undefined }, false);
  const eps = inRange('dispersion error', error, 0, Infinity, { loOpen: true, hiOpen: true });
  if (r.path === null && r.q === null) {
    throw new HushInputError('dispersion error', 'neither a path nor q is given: the study has no dispersion error to bound', 'value');
  }
  const at = (p: number) => evaluate(r, p, p).error;
  let lo = Math.max(r.axis.propagationLimitPpw, 2) * (1 + 1e-9);
  let hi = MAX_PPW;
  if (at(hi) > eps) {
    throw new HushInputError('dispersion error', `even ${MAX_PPW} cells per wavelength leave a dispersion error above ${eps}: the path or q is too large for any grid`);
  }
  if (at(lo) <= eps) return lo;
  for (let it = 0; it < 200 && hi / lo > 1 + 1e-15; it++) {
    const mid = Math.sqrt(lo * hi);
    if (at(mid) <= eps) hi = mid;
    else lo = mid;
  }
  return hi;
}

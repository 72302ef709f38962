/**
 * Modulated Gaussian pulse for a reflection measurement over a band of phase
 * steps [ωLow, ωHigh] (radians per time step):
 *   g[n] = exp(−((n − n₀)/τ)²)·sin(ω₀·(n − n₀)),
 * whose spectrum is ∝ exp(−(ω − ω₀)²τ²/4) around ω₀ (Fourier pair of the
 * Gaussian, e.g. Bracewell, The Fourier Transform and Its Applications).
 * The width is chosen so the spectrum is at least EDGE_LEVEL_MIN of its peak at
 * both band edges and below CUTOFF_LEVEL at the grid's cut-offs (where the
 * group velocity along x vanishes) and at zero frequency, so a finite record
 * holds the whole echo.
 */
import { HushInputError } from '../errors';

/** Spectral level aimed at the band edges when nothing else constrains the width. */
export const EDGE_LEVEL_TARGET = 1e-2;
/** Lowest spectral level accepted at the band edges (the 1e-3 criterion, with margin for the source's own tilt). */
export const EDGE_LEVEL_MIN = 2e-3;
/** Highest spectral level accepted at a cut-off of the grid. */
export const CUTOFF_LEVEL = 1e-16;
/** Spectral level down to which the record must hold the slowest component. */
export const SLOW_LEVEL = 1e-13;
/** Half-length of the pulse in widths τ: exp(−6.2²) ≈ 2e-17. */
const HALF_LENGTH_WIDTHS = 6.2;

export interface PulsePlan {
  /** Centre phase step ω₀Δt, radians per step. */
  centreOmegaDt: number;
  /** Gaussian width τ in steps. */
  width: number;
  /** Step of the pulse peak n₀. */
  delay: number;
  /** Steps with a non-negligible value: 2·n₀ + 1. */
  length: number;
  /** Model level of the spectrum at the band edges (relative to its peak). */
  edgeLevel: number;
  /** Model level at the nearest cut-off, if any. */
  cutoffLevel: number;
  /** Half-width in ω of the range where the model spectrum is ≥ SLOW_LEVEL. */
  slowHalfWidth: number;
}

/** Gaussian spectral level exp(−(δω·τ/2)²). */
export function gaussianLevel(deltaOmega: number, width: number): number {
  const x = (deltaOmega * width) / 2;
  return Math.exp(-x * x);
}

/**
 * Plans the pulse for the band [omegaLow, omegaHigh] with grid cut-offs at
 * cutoffLow (0 if none) and cutoffHigh. Throws HushInputError when no Gaussian
 * can cover the band and stay clear of the cut-offs.
 */
export function planPulse(omegaLow: number, omegaHigh: number, cutoffLow: number, cutoffHigh: number): PulsePlan {
  const w0 = 0.5 * (omegaLow + omegaHigh);
  const half = 0.5 * (omegaHigh - omegaLow);
  const kEdgeTarget = Math.sqrt(Math.log(1 / EDGE_LEVEL_TARGET));
  const kEdgeMin = Math.sqrt(Math.log(1 / EDGE_LEVEL_MIN));
  const kCut = Math.sqrt(Math.log(1 / CUTOFF_LEVEL));
  // A single frequency (half = 0) still needs a finite pulse: use the cut-off constraint alone.
  let width = half > 0 ? (2 * kEdgeTarget) / half : 0;
  // Zero frequency counts as a cut-off too: an absorber with α > 0 reflects
  // almost fully near it, with a slow time response that a finite record would cut.
  const gapLow = w0 - Math.max(0, cutoffLow);
  const gapHigh = cutoffHigh - w0;
  const gap = Math.min(gapLow, gapHigh);
  if (!(gap > half)) {
    throw new HushInputError('band', 'the band reaches a cut-off of the grid: no propagating wave covers it');
  }
  width = Math.max(width, (2 * kCut) / gap);
  if (half > 0 && (width * half) / 2 > kEdgeMin * (1 + 1e-12)) {
    const which = gapLow > gapHigh ? 'the grid cut-off' : cutoffLow > 0 ? 'the grazing cut-off of this angle' : 'zero frequency';
    throw new HushInputError(
      'band',
      `the band is too wide to measure so close to ${which}: a pulse that stays below ${CUTOFF_LEVEL} there falls below ${EDGE_LEVEL_MIN} of its peak at the band edges; narrow the band (fewer distinct cells per wavelength) or lower the angle`,
    );
  }
  const delay = Math.ceil(HALF_LENGTH_WIDTHS * width);
  return {
    centreOmegaDt: w0,
    width,
    delay,
    length: 2 * delay + 1,
    edgeLevel: half > 0 ? gaussianLevel(half, width) : 1,
    cutoffLevel: gaussianLevel(gap, width),
    slowHalfWidth: (2 * Math.sqrt(Math.log(1 / SLOW_LEVEL))) / width,
  };
}

/** Fills `out` (length ≥ plan.length) with the pulse samples; returns it. */
export function fillPulse(plan: PulsePlan, out: Float64Array): Float64Array {
  const { delay, width, centreOmegaDt } = plan;
  for (let n = 0; n < out.length; n++) {
    const t = n - delay;
    out[n] = n < plan.length ? Math.exp(-(t / width) * (t / width)) * Math.sin(centreOmegaDt * t) : 0;
  }
  return out;
}

/**
 * Spectral ripple from a parasitic reflection (physics.md §1). An echo of
 * relative amplitude A = c·|r| beating with the wave makes the recorded intensity
 * swing between (1 − A)² and (1 + A)², a peak-to-peak swing of exactly 4A of the
 * unperturbed intensity (derived), with a period in frequency of
 * c₀/(2·n_g·L) for a reflecting pair a distance L apart (Fabry–Perot; Saleh &
 * Teich, Fundamentals of Photonics, the Fabry–Perot resonator).
 */
import { SPEED_OF_LIGHT } from './constants';
import { HushInputError } from './errors';
import { inRange } from './validate';

export interface RippleResult {
  /** Relative peak-to-peak intensity swing. */
  peakToPeak: number;
  /** Ripple period in frequency, Hz. */
  periodHz: number;
}

/** Ripple produced by amplitude reflection |r| with coupling c at distance L (m) in group index n_g. */
export function rippleFromReflection(amplitude: number, distanceMetres: number, groupIndex = 1, coupling = 1): RippleResult {
  const r = inRange('amplitude reflection', amplitude, 0, 1, { hiOpen: true });
  const L = inRange('distance', distanceMetres, 1e-12, 1e6, { unit: 'm' });
  const ng = inRange('group index', groupIndex, 1, 100);
  const c = inRange('coupling', coupling, 1e-6, 1);
  return { peakToPeak: 4 * c * r, periodHz: SPEED_OF_LIGHT / (2 * ng * L) };
}

export interface RippleSource {
  /** Implied amplitude reflection |r| of the culprit boundary. */
  amplitude: number;
  /** Implied distance between the reflecting pair, m. */
  distanceMetres: number;
}

/** Inverse: from an observed relative peak-to-peak ripple and its period (Hz), the implied |r| and distance. */
export function reflectionFromRipple(peakToPeak: number, periodHz: number, groupIndex = 1, coupling = 1): RippleSource {
  const p = inRange('ripple peak-to-peak', peakToPeak, 0, 4, { loOpen: true, hiOpen: true });
  const f = inRange('ripple period', periodHz, 1e-3, 1e18, { unit: 'Hz' });
  const ng = inRange('group index', groupIndex, 1, 100);
  const c = inRange('coupling', coupling, 1e-6, 1);
  const amplitude = p / 4 / c;
  if (!(amplitude < 1)) {
    throw new HushInputError('ripple peak-to-peak', `a ripple of ${p} with coupling ${c} implies |r| ≥ 1, which no passive boundary gives`);
  }
  return { amplitude, distanceMetres: SPEED_OF_LIGHT / (2 * ng * f) };
}


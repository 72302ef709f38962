/**
 * Ring-down time of a resonance (physics.md §5). A mode of quality factor Q at
 * angular frequency ω loses energy at the rate ω/Q, so its amplitude decays as
 * e^{−ωt/(2Q)}; reaching a relative amplitude δ takes
 *   t = 2Q·ln(1/δ)/ω                                                  (derived)
 * (Q = ω·stored energy / power lost; Jackson, Classical Electrodynamics, resonant cavities).
 */
import { HushInputError } from './errors';
import { inRange } from './validate';

/** Largest quality factor accepted (10¹²; beyond it no time-domain run is sensible). */
export const MAX_QUALITY_FACTOR = 1e12;

/**
 * Seconds for a resonance of quality factor `q` at frequency `frequencyHz` to
 * ring down to relative amplitude `target`.
 * Example: ringdownTime(1000, 1e9, 1e-3) = 2·1000·ln(1000)/(2π·10⁹) = 2.198806…e-6 s.
 */
export function ringdownTime(q: number, frequencyHz: number, target: number): number {
  const Q = inRange('quality factor', q, 0, MAX_QUALITY_FACTOR, { loOpen: true });
  const f = inRange('ring-down frequency', frequencyHz, 0, Infinity, { loOpen: true, hiOpen: true, unit: 'Hz' });
  const d = inRange('ring-down target', target, 0, 1, { loOpen: true, hiOpen: true });
  // 1/δ overflows for δ below 1/Number.MAX_VALUE (5e-324 gave an infinite ring-down); there ln(1/δ) = −ln δ.
  const inverse = 1 / d;
  const t = (2 * Q * (Number.isFinite(inverse) ? Math.log(inverse) : -Math.log(d))) / (2 * Math.PI * f);
  if (!Number.isFinite(t)) {
    throw new HushInputError('ring-down frequency', `ring-down at ${f} Hz with quality factor ${Q} takes longer than any run can (the time overflows): check the frequency`);
  }
  return t;
}

/**
 * Relative amplitude e^{−ωt/(2Q)} a resonance of quality factor `q` at
 * `frequencyHz` still has `durationSeconds` after its excitation (physics.md §5).
 * Example: ringdownResidual(1000, 1e9, ringdownTime(1000, 1e9, 1e-3)) = 1e-3 (to rounding).
 */
export function ringdownResidual(q: number, frequencyHz: number, durationSeconds: number): number {
  const Q = inRange('quality factor', q, 0, MAX_QUALITY_FACTOR, { loOpen: true });
  const f = inRange('ring-down frequency', frequencyHz, 0, Infinity, { loOpen: true, hiOpen: true, unit: 'Hz' });
  const t = inRange('duration', durationSeconds, 0, Infinity, { hiOpen: true, unit: 's' });
  // e^{−x} underflows to 0 for x > 745: the residual is then below any double, 0 is exact to the last bit.
  return Math.exp(-(2 * Math.PI * f * t) / (2 * Q));
}

import { HushInputError } from './errors';
import { finite, inRange, wholeInRange } from './validate';

/** Spatial dimensions of a Yee grid. */
export type Dimensions = 1 | 2 | 3;

/** Courant limit S = cΔt/Δ ≤ 1/√D on a uniform cubic grid in D dimensions (Taflove & Hagness, 3rd ed., ch. 4). */
export function courantLimit(dimensions: number): number {
  const d = wholeInRange('dimensions', dimensions, 1, 3);
  return 1 / Math.sqrt(d);
}

/** Smallest Courant number accepted (smaller steps only multiply the work). */
export const MIN_COURANT = 1e-4;

/** Default Courant number of a 3-D grid: 0.99 of the 3-D limit (common practice: a small margin below the limit). */
export const DEFAULT_COURANT = 0.99 / Math.sqrt(3);

/** Default Courant number of a D-dimensional grid, 0.99/√D (DEFAULT_COURANT in 3-D); D is checked (1, 2 or 3). */
export function defaultCourant(dimensions: number): number {
  const d = wholeInRange('dimensions', dimensions, 1, 3);
  return d === 3 ? DEFAULT_COURANT : 0.99 / Math.sqrt(d);
}

/** Checks a vacuum Courant number against the limit of a D-dimensional grid and returns it. */
export function checkCourant(courant: unknown, dimensions: number = 3): number {
  const s = finite('Courant number', courant);
  const limit = courantLimit(dimensions);
  if (!(s >= MIN_COURANT)) throw new HushInputError('Courant number', `Courant number must be at least ${MIN_COURANT} (got ${s})`);
  if (s > limit * (1 + 1e-12)) {
    throw new HushInputError(
      'Courant number',
      `Courant number ${s} is above the ${dimensions}-D stability limit 1/√${dimensions} = ${limit.toPrecision(6)}`,
    );
  }
  return s;
}

/** Smallest Courant number in the medium accepted: MIN_COURANT in the densest medium accepted (index 100). */
export const MIN_COURANT_MEDIUM = MIN_COURANT / 100;

/**
 * Checks a Courant number in the medium S_m = S/n (n ≥ 1) and returns it:
 * MIN_COURANT_MEDIUM ≤ S_m ≤ 1/√D, D = `dimensions` (default 1, the widest limit).
 */
export function checkCourantMedium(courantMedium: unknown, dimensions: number = 1): number {
  const limit = courantLimit(dimensions);
  const s = inRange('Courant number in the medium', courantMedium, MIN_COURANT_MEDIUM, Infinity);
  if (s > limit * (1 + 1e-12)) {
    throw new HushInputError(
      'Courant number in the medium',
      `Courant number in the medium ${s} is above the ${dimensions}-D stability limit 1/√${dimensions} = ${limit.toPrecision(6)}`,
    );
  }
  return s;
}

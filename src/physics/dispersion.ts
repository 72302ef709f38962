/**
 * Yee-grid numerical dispersion, in the units of the background medium:
 * lengths in cells, the wave speed of the medium set to 1, Courant number
 * S_m = vΔt/Δ = S/n (physics.md §3, §4).
 *
 * Dispersion relation on a uniform grid (Taflove & Hagness, 3rd ed., ch. 4):
 *   (sin(ωΔt/2)/(vΔt))² = Σ_i (sin(k_i·Δ/2)/Δ)².
 */
import { HushInputError } from './errors';
import { finite, inRange, wholeInRange } from './validate';
import { checkCourant, checkCourantMedium } from './courant';

const DEG = Math.PI / 180;

/** Longest wave accepted, in cells per wavelength (longer waves are quasi-static on any grid). */
export const MAX_PPW = 1e6;

/** Directions accepted by the dispersion functions, in degrees (any direction in the plane, one turn either way). */
function checkAngle(angleDeg: unknown): number {
  return inRange('angle', angleDeg, -360, 360, { unit: 'degrees' });
}

/** Right-hand side target T = sin²(ωΔt/2)/S_m² for a wave of `ppw` cells per wavelength. */
function dispersionTarget(ppw: number, courantMedium: number): number {
  const s = Math.sin((Math.PI * courantMedium) / ppw) / courantMedium;
  return s * s;
}

/** Largest q = |k̃|Δ on the monotonic branch along a direction, and the value of Σ sin² there. */
function branchEnd(cosT: number, sinT: number): { qMax: number; gMax: number } {
  const big = Math.max(cosT, sinT);
  const qMax = Math.PI / big;
  const a = Math.sin((qMax * cosT) / 2);
  const b = Math.sin((qMax * sinT) / 2);
  return { qMax, gMax: a * a + b * b };
}

/**
 * Smallest cells per wavelength (in the medium) that the grid can carry as a
 * propagating wave along `angleDeg` in the plane of a 2-D or 3-D grid. Below it
 * the discrete dispersion relation has no real wavenumber (derived from the
 * relation above).
 */
export function minimumResolvablePpw(courantMedium: number, angleDeg = 0): number {
  courantMedium = checkCourantMedium(courantMedium);
  const th = Math.abs(checkAngle(angleDeg)) * DEG;
  const { gMax } = branchEnd(Math.abs(Math.cos(th)), Math.abs(Math.sin(th)));
  const x = courantMedium * Math.sqrt(gMax);
  // sin(πS_m/ppw) ≤ x; when x ≥ 1 only the temporal Nyquist limit ppw ≥ 2·S_m remains.
  return x >= 1 ? 2 * courantMedium : (Math.PI * courantMedium) / Math.asin(x);
}

/** Checks cells per wavelength against the grid's resolvable limit. */
export function checkPpw(field: string, ppw: unknown, courantMedium: number, angleDeg = 0): number {
  const p = finite(field, ppw);
  if (p > MAX_PPW) {
    throw new HushInputError(field, `${field} must be at most ${MAX_PPW} (got ${quote2(p)}): a wave that long is static on the grid`);
  }
  const limit = minimumResolvablePpw(courantMedium, angleDeg);
  if (!(p > limit * (1 + 1e-9))) {
    throw new HushInputError(
      field,
      `${field} must be more than ${limit.toPrecision(4)} on this grid (Courant number ${courantMedium.toPrecision(4)} in the medium, angle ${angleDeg}°): below it the grid carries no propagating wave (got ${quote2(p)})`,
    );
  }
  return p;
}

function quote2(v: number): string {
  return Number.isNaN(v) ? 'NaN' : String(v);
}

/**
 * Magnitude q = |k̃|·Δ of the discrete wavevector of a plane wave of `ppw`
 * cells per wavelength travelling at `angleDeg` from the x axis, solving
 * sin²(q cosθ/2) + sin²(q sinθ/2) = sin²(πS_m/ppw)/S_m² on its first branch.
 * Checks S_m (MIN_COURANT_MEDIUM ≤ S_m ≤ 1), the angle (−360° to 360°) and ppw (resolvable on
 * this grid, at most MAX_PPW).
 */
export function discreteWavenumber(ppw: number, courantMedium: number, angleDeg = 0): number {
  const sm = checkCourantMedium(courantMedium);
  const th = checkAngle(angleDeg);
  return discreteWavenumberUnchecked(checkPpw('cells per wavelength', ppw, sm, th), sm, th);
}

/** `discreteWavenumber` without the checks, for loops over already checked samples (src/physics/internal.ts). */
export function discreteWavenumberUnchecked(ppw: number, courantMedium: number, angleDeg = 0): number {
  const th = angleDeg * DEG;
  const c = Math.abs(Math.cos(th));
  const s = Math.abs(Math.sin(th));
  const target = dispersionTarget(ppw, courantMedium);
  const { qMax, gMax } = branchEnd(c, s);
  if (target > gMax) {
    throw new HushInputError('cells per wavelength', `cells per wavelength ${ppw} is below the resolvable limit of this grid`);
  }
  if (s === 0 || c === 0) return 2 * Math.asin(Math.sqrt(target));
  return solveOnBranch(
    (q) => {
      const a = Math.sin((q * c) / 2);
      const b = Math.sin((q * s) / 2);
      return a * a + b * b - target;
    },
    (q) => 0.5 * (c * Math.sin(q * c) + s * Math.sin(q * s)),
    target,
    qMax,
  );
}

/**
 * The root of f on [0, qMax] (f rises monotonically there: Σ sin²(q·c_i/2) −
 * target), by Newton's method from the axis solution 2·asin(√target),
 * safeguarded by bisection; `df` is f's derivative.
 */
function solveOnBranch(f: (q: number) => number, df: (q: number) => number, target: number, qMax: number): number {
  let lo = 0;
  let hi = qMax;
  let q = Math.min(2 * Math.asin(Math.sqrt(Math.min(1, target))), qMax * 0.999);
  for (let it = 0; it < 60; it++) {
    const v = f(q);
    if (v > 0) hi = q;
    else lo = q;
    let next = q - v / df(q);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - q) <= 1e-15 * q) {
      q = next;
      break;
    }
    q = next;
  }
  return q;
}

/**
 * Magnitude q = |k̃|·Δ of the discrete wavevector of a plane wave of `ppw`
 * cells per wavelength in a 3-D grid, travelling at `angleDeg` θ from the x
 * axis (the face normal) in a plane of incidence turned by the azimuth
 * `azimuthDeg` φ about x: direction (cos θ, sin θ·cos φ, sin θ·sin φ), solving
 * Σ_i sin²(q·c_i/2) = sin²(πS_m/ppw)/S_m² on its first branch (the Yee
 * relation of physics.md §4). φ = 0 is the in-plane `discreteWavenumber`.
 * Checks S_m (against the 3-D limit 1/√3 when the direction leaves the x–y plane),
 * θ and φ (−360° to 360°) and ppw.
 */
export function discreteWavenumber3D(ppw: number, courantMedium: number, angleDeg = 0, azimuthDeg = 0): number {
  const th = checkAngle(angleDeg);
  const ph = inRange('azimuth', azimuthDeg, -360, 360, { unit: 'degrees' });
  const sm = checkCourantMedium(courantMedium, Math.sin(th * DEG) * Math.sin(ph * DEG) === 0 ? 1 : 3);
  return discreteWavenumber3DUnchecked(checkPpw('cells per wavelength', ppw, sm, th), sm, th, ph);
}

/** `discreteWavenumber3D` without the checks (src/physics/internal.ts). */
export function discreteWavenumber3DUnchecked(ppw: number, courantMedium: number, angleDeg: number, azimuthDeg: number): number {
  if (azimuthDeg === 0) return discreteWavenumberUnchecked(ppw, courantMedium, angleDeg);
  const th = angleDeg * DEG;
  const ph = azimuthDeg * DEG;
  const cx = Math.abs(Math.cos(th));
  const cy = Math.abs(Math.sin(th) * Math.cos(ph));
  const cz = Math.abs(Math.sin(th) * Math.sin(ph));
  const target = dispersionTarget(ppw, courantMedium);
  const qMax = Math.PI / Math.max(cx, cy, cz);
  const g = (q: number) => {
    const a = Math.sin((q * cx) / 2);
    const b = Math.sin((q * cy) / 2);
    const c = Math.sin((q * cz) / 2);
    return a * a + b * b + c * c;
  };
  if (target > g(qMax)) {
    throw new HushInputError('cells per wavelength', `cells per wavelength ${ppw} is below the resolvable limit of this grid`);
  }
  return solveOnBranch(
    (q) => g(q) - target,
    (q) => 0.5 * (cx * Math.sin(q * cx) + cy * Math.sin(q * cy) + cz * Math.sin(q * cz)),
    target,
    qMax,
  );
}

/**
 * Transverse Yee factor sin²(k_y/2) + sin²(k_z/2) of the discrete plane wave of
 * `ppw` cells per wavelength at angle θ from the face normal and azimuth φ,
 * with (k_y, k_z) = |k̃|·sin θ·(cos φ, sin φ) (unchecked; src/physics/internal.ts).
 * At φ = 0 it is sin²(k_t/2), k_t = |k̃|·sin θ, the value the 2-D chain uses.
 */
export function transverseFactorUnchecked(ppw: number, courantMedium: number, angleDeg: number, azimuthDeg: number): number {
  const q = discreteWavenumber3DUnchecked(ppw, courantMedium, angleDeg, azimuthDeg);
  const kt = q * Math.sin(angleDeg * DEG);
  if (azimuthDeg === 0) {
    const s = Math.sin(kt / 2);
    return s * s;
  }
  const a = Math.sin((kt * Math.cos(azimuthDeg * DEG)) / 2);
  const b = Math.sin((kt * Math.sin(azimuthDeg * DEG)) / 2);
  return a * a + b * b;
}

/**
 * Transverse factor of a near field that decays as e^{−d/L} along the face
 * normal at phase step ωΔt (physics.md §6): in cells, K_x² = −4·sinh²(1/(2L))
 * and K_t² = Ω² − K_x², so the factor K_t²/4 = sin²(ωΔt/2)/S_m² + sinh²(1/(2L)) (unchecked).
 */
export function evanescentFactorUnchecked(omegaDt: number, courantMedium: number, decayCells: number): number {
  const st = Math.sin(omegaDt / 2) / courantMedium;
  const sh = Math.sinh(1 / (2 * decayCells));
  return st * st + sh * sh;
}

/**
 * Numerical phase velocity relative to the medium's wave speed, v_p/v = ω/(|k̃|v),
 * for `ppw` cells per (physical) wavelength, vacuum Courant number `courant`,
 * direction `angleDeg` and background index `index`, on a grid of `dimensions`
 * dimensions whose Courant limit 1/√D the Courant number must respect. Default:
 * the fewest dimensions that carry the wave, 1 along an axis (angle a multiple
 * of 180°), 2 otherwise.
 * Check values: Schneider, Understanding the FDTD Method, chapter on dispersion (1-D, S = 0.5).
 */
export function numericalPhaseVelocity(ppw: number, courant: number, angleDeg = 0, index = 1, dimensions?: number): number {
  const n = inRange('background index', index, 1, 100);
  const th = checkAngle(angleDeg);
  const axial = th % 180 === 0;
  const dims = dimensions === undefined ? (axial ? 1 : 2) : wholeInRange('dimensions', dimensions, 1, 3);
  if (dims === 1 && !axial) {
    throw new HushInputError('angle', `a 1-D grid carries waves along its axis only (got angle ${th} degrees)`);
  }
  const sm = checkCourant(courant, dims) / n;
  const p = checkPpw('cells per wavelength', ppw, sm, th);
  const q = discreteWavenumberUnchecked(p, sm, th);
  return (2 * Math.PI) / p / q;
}

/**
 * Checks a wave given by its phase step and transverse wavenumber: 0 < ωΔt ≤ π
 * (the temporal Nyquist limit) and |k_t| ≤ π radians per cell (the Brillouin zone).
 */
export function checkWaveStep(omegaDt: unknown, kt: unknown): void {
  inRange('phase step ωΔt', omegaDt, 0, Math.PI, { loOpen: true, unit: 'radians per step' });
  inRange('transverse wavenumber', kt, -Math.PI, Math.PI, { unit: 'radians per cell' });
}

/**
 * Direction of a discrete plane wave with temporal phase step ωΔt and conserved
 * transverse wavenumber k_t (radians per cell), in a grid of medium Courant
 * number S_m: sin²(k_x/2) = sin²(ωΔt/2)/S_m² − sin²(k_t/2), θ = atan2(k_t, k_x).
 * Returns NaN-free values only for propagating waves; throws otherwise.
 */
export function discreteAngle(omegaDt: number, kt: number, courantMedium: number): { kx: number; angleDeg: number } {
  checkWaveStep(omegaDt, kt);
  courantMedium = checkCourantMedium(courantMedium, kt === 0 ? 1 : 2);
  const st = Math.sin(omegaDt / 2) / courantMedium;
  const sk = Math.sin(kt / 2);
  const x = st * st - sk * sk;
  if (!(x > 0 && x <= 1)) {
    throw new HushInputError('transverse wavenumber', 'the wave is evanescent along the normal at this frequency and transverse wavenumber');
  }
  const kx = 2 * Math.asin(Math.sqrt(x));
  return { kx, angleDeg: Math.atan2(kt, kx) / DEG };
}

/**
 * Numerical phase and group velocity of the Yee grid along any direction, from
 * the exact dispersion relation (no small-Δ series), in the units of the
 * medium: cell Δ = 1, the medium's wave speed v = 1, Δt = S_m = S/n.
 *
 * Yee dispersion relation on a uniform cubic grid (physics.md §7; Taflove &
 * Hagness, Computational Electrodynamics, 3rd ed., ch. 4):
 *   (1/S_m²)·sin²(ωΔt/2) = Σ_i sin²(k_iΔ/2),   k = q·d,
 * with d = (cos θ, sin θ cos φ, sin θ sin φ) the unit direction (θ from the x
 * axis, φ about it; φ = 0 in 2-D, θ = 0 in 1-D) and q = |k̃|Δ.
 *
 * For p cells per wavelength (in the medium) the source fixes ωΔt = 2πS_m/p,
 * the right-hand side is T = sin²(πS_m/p)/S_m², and q solves
 * G(q) = Σ_i sin²(q·d_i/2) = T on the first branch 0 < q ≤ π/max|d_i| (the
 * Brillouin zone: beyond it the wave is the alias of another direction).
 * G is increasing there (G' = ½Σ d_i sin(q d_i) ≥ 0), so the root is unique.
 *
 *   v_p/v = ω/q = 2π/(p·q)                                                 (definition)
 *   v_g/v = dω/dq = S_m·Σ_i d_i sin(q d_i) / sin(ωΔt)                       (derived:
 *           implicit differentiation of the relation, dF/dω = sin(ωS_m)/(2S_m), dG/dq = ½Σ d_i sin(q d_i))
 *
 * v_g here is the rate along the direction of k̃ (the projection of the group
 * velocity vector ∇_k ω on k̃/|k̃|); along an axis and along a diagonal the
 * two coincide.
 *
 * Propagation limit along d: the grid carries the wave iff T ≤ G_max =
 * Σ_i sin²(π d_i/(2 max|d_i|)) and ωΔt < π, i.e.
 *   p > p_min = π S_m / asin(S_m √G_max)   (or 2 S_m when S_m √G_max ≥ 1)      (derived)
 * 1-D, S = 0.5: p_min = 3 (Taflove & Hagness, 3rd ed., ch. 4).
 */
import { DEFAULT_COURANT_FRACTION } from './limits';
import { checkCourant, courantLimit } from './courant';
import { MAX_PPW } from './dispersion';
import { HushInputError, quote } from './errors';
import { finite, inRange, wholeInRange } from './validate';

const DEG = Math.PI / 180;

/** |cos| of an angle in degrees, exact at multiples of 30° and 45° (so the 45° diagonal has two equal components). */
export function absCosDeg(deg: number): number {
  let t = Math.abs(deg) % 180;
  if (t > 90) t = 180 - t;
  if (t === 90) return 0;
  if (t === 0) return 1;
  if (t === 45) return Math.SQRT1_2;
  if (t === 60) return 0.5;
  return t < 45 ? Math.cos(t * DEG) : Math.sin((90 - t) * DEG);
}

/** |sin| of an angle in degrees, with the exact values of `absCosDeg`. */
export function absSinDeg(deg: number): number {
  return absCosDeg(90 - (Math.abs(deg) % 180));
}

/** G(q) = Σ sin²(q·d_i/2) for a direction with absolute cosines a, b, c. */
function sumSin2(q: number, a: number, b: number, c: number): number {
  const x = Math.sin((q * a) / 2);
  const y = Math.sin((q * b) / 2);
  const z = Math.sin((q * c) / 2);
  return x * x + y * y + z * z;
}

/** Largest direction cosine: the branch ends at q = π/max. */
function largest(a: number, b: number, c: number): number {
  return Math.max(a, b, c);
}

/** G at the end of the first branch (the Brillouin-zone boundary along d). */
export function branchEndValue(a: number, b: number, c: number): number {
  return sumSin2(Math.PI / largest(a, b, c), a, b, c);
}

/**
 * Smallest cells per wavelength (in the medium) that propagate along the
 * direction (a, b, c) at medium Courant number S_m (see the module comment).
 * Unchecked.
 */
export function propagationLimitUnchecked(courantMedium: number, a: number, b: number, c: number): number {
  const x = courantMedium * Math.sqrt(branchEndValue(a, b, c));
  return x >= 1 ? 2 * courantMedium : (Math.PI * courantMedium) / Math.asin(x);
}

/**
 * q = |k̃|Δ for p cells per wavelength along (a, b, c) (absolute direction
 * cosines, a² + b² + c² = 1): the root of G(q) = T on the first branch.
 * Closed form when the non-zero cosines are equal (axes and diagonals),
 * otherwise Newton's method safeguarded by bisection. Unchecked: p must be above
 * the propagation limit.
 */
export function yeeWavenumberUnchecked(ppw: number, courantMedium: number, a: number, b: number, c: number): number {
  const s = Math.sin((Math.PI * courantMedium) / ppw) / courantMedium;
  const target = s * s;
  const big = largest(a, b, c);
  // Non-zero cosines all equal to `big` (m of them): m·sin²(q·big/2) = T.
  const m = (a === big ? 1 : a === 0 ? 0 : NaN) + (b === big ? 1 : b === 0 ? 0 : NaN) + (c === big ? 1 : c === 0 ? 0 : NaN);
  if (m > 0) return (2 * Math.asin(Math.min(1, Math.sqrt(target / m)))) / big;
  let lo = 0;
  let hi = Math.PI / big;
  let q = Math.min((2 * Math.PI) / ppw, hi);
  for (let it = 0; it < 100; it++) {
    const f = sumSin2(q, a, b, c) - target;
    if (f === 0) return q;
    if (f > 0) hi = q;
    else lo = q;
    const df = 0.5 * (a * Math.sin(q * a) + b * Math.sin(q * b) + c * Math.sin(q * c));
    let next = q - f / df;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - q) <= 2e-16 * q || hi - lo <= 2e-16 * hi) return next;
    q = next;
  }
  return q;
}

/** v_p/v = 2π/(p·q) along (a, b, c). Unchecked. */
export function phaseVelocityUnchecked(ppw: number, courantMedium: number, a: number, b: number, c: number): number {
  return (2 * Math.PI) / ppw / yeeWavenumberUnchecked(ppw, courantMedium, a, b, c);
}

/** v_g/v = S_m·Σ d_i sin(q d_i)/sin(ωΔt) along (a, b, c). Unchecked. */
export function groupVelocityUnchecked(ppw: number, courantMedium: number, a: number, b: number, c: number): number {
  const q = yeeWavenumberUnchecked(ppw, courantMedium, a, b, c);
  const num = a * Math.sin(q * a) + b * Math.sin(q * b) + c * Math.sin(q * c);
  return (courantMedium * num) / Math.sin((2 * Math.PI * courantMedium) / ppw);
}

/**
 * Frequency ratio ω̃/ω of a wave whose wavenumber the geometry fixes (a mode of
 * p cells per wavelength in the medium) along (a, b, c):
 * sin(ω̃Δt/2) = S_m·√G(2π/p), so ω̃/ω = p·asin(S_m√G)/(π·S_m)       (derived from the relation).
 * Unchecked: 2π/p must lie in the Brillouin zone (p ≥ 2·max|d_i|).
 */
export function fixedWavenumberFrequencyRatio(ppw: number, courantMedium: number, a: number, b: number, c: number): number {
  const g = sumSin2((2 * Math.PI) / ppw, a, b, c);
  return (ppw * Math.asin(Math.min(1, courantMedium * Math.sqrt(g)))) / (Math.PI * courantMedium);
}

/** A direction and grid for the velocity functions (vacuum Courant number, index of the medium). */
export interface GridDirectionSpec {
  /** Vacuum Courant number cΔt/Δ; default 0.99/√D. */
  courant?: number;
  /** 1, 2 or 3; default 3. */
  dimensions?: number;
  /** Angle θ from the x axis, degrees; default 0. In 1-D only 0 or ±180. */
  angleDeg?: number;
  /** Azimuth φ about the x axis, degrees (3-D only); default 0. */
  azimuthDeg?: number;
  /** Refractive index n of the medium: the grid works at S/n; default 1. */
  index?: number;
}

export interface VelocitySpec extends GridDirectionSpec {
  /** Cells per wavelength in the medium, λ₀/(n·Δ). */
  ppw: number;
}

/** A checked grid and direction. */
export interface ResolvedDirection {
  dimensions: number;
  courant: number;
  courantMedium: number;
  index: number;
  angleDeg: number;
  azimuthDeg: number;
  /** Absolute direction cosines |d_x|, |d_y|, |d_z|. */
  cosines: [number, number, number];
  /** Smallest cells per wavelength that propagate along this direction. */
  propagationLimitPpw: number;
}

/** Default vacuum Courant number of a D-dimensional grid: 0.99 of its limit 1/√D (common practice: a small margin). */
export function defaultCourant(dimensions: number): number {
  courantLimit(dimensions); // checks dimensions
  // Written as 0.99/√D so that the 3-D value is DEFAULT_COURANT bit for bit.
  return DEFAULT_COURANT_FRACTION / Math.sqrt(dimensions);
}

function formatLimit(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/** Checks the grid and direction of a velocity query. */
export function resolveDirection(spec: GridDirectionSpec): ResolvedDirection {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('velocity', 'the velocity query must be an object', 'value');
  const dimensions = wholeInRange('dimensions', spec.dimensions ?? 3, 1, 3);
  const courant = checkCourant(spec.courant ?? defaultCourant(dimensions), dimensions);
  const index = inRange('background index', spec.index ?? 1, 1, 100);
  const angleDeg = inRange('angle', spec.angleDeg ?? 0, -360, 360, { unit: 'degrees' });
  const azimuthDeg = inRange('azimuth', spec.azimuthDeg ?? 0, -360, 360, { unit: 'degrees' });
  if (dimensions === 1 && angleDeg % 180 !== 0) {
    throw new HushInputError('angle', `a 1-D grid carries waves along its axis only: angle must be 0 or ±180 degrees (got ${quote(angleDeg)} degrees)`);
  }
  if (dimensions < 3 && azimuthDeg % 180 !== 0) {
    throw new HushInputError(
      'azimuth',
      `an azimuth turns the direction out of the x–y plane, which needs a 3-D grid: azimuth must be 0 on a ${dimensions}-D grid (got ${quote(azimuthDeg)} degrees)`,
    );
  }
  const st = absSinDeg(angleDeg);
  const cosines: [number, number, number] = [absCosDeg(angleDeg), st * absCosDeg(azimuthDeg), st * absSinDeg(azimuthDeg)];
  const courantMedium = courant / index;
  return {
    dimensions,
    courant,
    courantMedium,
    index,
    angleDeg,
    azimuthDeg,
    cosines,
    propagationLimitPpw: propagationLimitUnchecked(courantMedium, cosines[0], cosines[1], cosines[2]),
  };
}

/** Checks cells per wavelength against the propagation limit of a resolved grid and direction. */
export function checkVelocityPpw(ppw: unknown, d: ResolvedDirection): number {
  const p = finite('cells per wavelength', ppw);
  if (p > MAX_PPW) {
    throw new HushInputError('cells per wavelength', `cells per wavelength must be at most ${MAX_PPW} (got ${quote(p)}): a wave that long is static on the grid`);
  }
  const limit = d.propagationLimitPpw;
  if (!(p > limit * (1 + 1e-9))) {
    const dir = d.dimensions === 3 ? `angle ${d.angleDeg}°, azimuth ${d.azimuthDeg}°` : `angle ${d.angleDeg}°`;
    throw new HushInputError(
      'cells per wavelength',
      `cells per wavelength must be more than ${formatLimit(limit)} on this grid (${d.dimensions}-D, Courant number ${formatLimit(d.courantMedium)} in the medium, ${dir}): below it the Yee dispersion relation has no real wavenumber, so the grid carries no propagating wave in this direction (got ${quote(p)})`,
    );
  }
  return p;
}

/** Phase and group velocity of one wave on the grid, with the quantities they come from. */
export interface GridVelocity {
  /** v_p/v: numerical phase velocity over the medium's wave speed. */
  phaseVelocityRatio: number;
  /** v_g/v: numerical group velocity (along the direction) over the medium's wave speed. */
  groupVelocityRatio: number;
  /** |k̃|Δ, radians per cell. */
  wavenumber: number;
  /** Phase step ωΔt, radians per time step. */
  omegaDt: number;
  /** Smallest cells per wavelength that propagate along this direction. */
  propagationLimitPpw: number;
  courantMedium: number;
  dimensions: number;
}

/**
 * Phase and group velocity ratios of a wave of `ppw` cells per wavelength (in
 * the medium) on the Yee grid, exact (see the module comment).
 * Example: gridVelocity({ ppw: 10, courant: 0.5, dimensions: 1 }).phaseVelocityRatio = 0.987263701339977
 * (Schneider, Understanding the FDTD Method: ≈ 0.9873).
 */
export function gridVelocity(spec: VelocitySpec): GridVelocity {
  const d = resolveDirection(spec);
  const p = checkVelocityPpw(spec.ppw, d);
  const [a, b, c] = d.cosines;
  const sm = d.courantMedium;
  const q = yeeWavenumberUnchecked(p, sm, a, b, c);
  const omegaDt = (2 * Math.PI * sm) / p;
  const num = a * Math.sin(q * a) + b * Math.sin(q * b) + c * Math.sin(q * c);
  return {
    phaseVelocityRatio: (2 * Math.PI) / p / q,
    groupVelocityRatio: (sm * num) / Math.sin(omegaDt),
    wavenumber: q,
    omegaDt,
    propagationLimitPpw: d.propagationLimitPpw,
    courantMedium: sm,
    dimensions: d.dimensions,
  };
}

/**
 * v_p/v of the Yee grid (exact). Defaults: 3-D, Courant number 0.99/√D, along x, index 1.
 * Example: phaseVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 2, angleDeg: 30 }) = 0.993712967179770;
 * phaseVelocityRatio({ ppw: 20, courant: 0.5, dimensions: 1 }) = 0.996891686342981 (Schneider: ≈ 0.9969).
 */
export function phaseVelocityRatio(spec: VelocitySpec): number {
  return gridVelocity(spec).phaseVelocityRatio;
}

/**
 * v_g/v of the Yee grid along the direction (exact). Same defaults as `phaseVelocityRatio`.
 * Example: groupVelocityRatio({ ppw: 10, courant: 0.5, dimensions: 1 }) = 0.961635641596780; 1 at S = 1 in 1-D.
 */
export function groupVelocityRatio(spec: VelocitySpec): number {
  return gridVelocity(spec).groupVelocityRatio;
}

/** Smallest cells per wavelength that propagate on the grid along the direction (see the module comment). */
export function propagationLimitPpw(spec: GridDirectionSpec = {}): number {
  return resolveDirection(spec).propagationLimitPpw;
}

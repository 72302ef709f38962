/**
 * Grading of the absorber parameters across its depth (physics.md §2).
 * All conductivities here are normalised: σ_norm = σ·η₀·Δ·n, α_norm = α·η₀·Δ·n,
 * so that σΔt/ε₀ = σ_norm·S_m with S_m = S/n the Courant number in the medium.
 */
import { HushInputError } from './errors';
import { ETA0, MIN_CELL_METRES, MAX_ALPHA_NORM, MAX_KAPPA, MAX_LAYERS, MAX_ORDER, MAX_STRENGTH } from './constants';
import { finite, inRange, wholeInRange } from './validate';

/** How σ grows with depth. */
export type GradingKind = 'polynomial' | 'geometric';

/** A graded CPML design in grid units. */
export interface AbsorberDesign {
  /** Absorber thickness N in cells (the perfect conductor sits N cells behind the interface). */
  layers: number;
  /** Polynomial grading order m of σ and κ (ignored by geometric grading except as a label). */
  order: number;
  /** Round-trip attenuation relative to σ_opt's: σ_max/σ_opt for polynomial grading. Default 1. */
  strength?: number;
  /** κ at the back of the layer; κ(u) = 1 + (κ_max − 1)·u^m. Default 1. */
  kappaMax?: number;
  /** α_max·η₀·Δ·n (dimensionless); α(u) = α_max·(1 − u)^{m_a}. Default 0. */
  alphaMaxNorm?: number;
  /** Order m_a of the reversed-polynomial α grading. Default 1. */
  alphaOrder?: number;
  /** σ grading: polynomial (default) or geometric. */
  grading?: GradingKind;
  /** Ratio g per cell of geometric grading σ(x) = σ₀·g^{x/Δ}. Default 2.2. */
  geometricRatio?: number;
}

/** A design with every optional field filled in and checked. */
export interface ResolvedDesign {
  layers: number;
  order: number;
  strength: number;
  kappaMax: number;
  alphaMaxNorm: number;
  alphaOrder: number;
  grading: GradingKind;
  geometricRatio: number;
}

/**
 * σ_opt·η₀·Δ·n = 0.8·(m + 1): Gedney's "optimal" conductivity (Taflove & Hagness,
 * 3rd ed., ch. 7; Gedney 1996), in normalised form.
 */
export function sigmaOptNorm(order: number): number {
  return sigmaOptNormUnchecked(inRange('grading order', order, 0, MAX_ORDER));
}

/** `sigmaOptNorm` without the check, for the profile loops (src/physics/internal.ts). */
export function sigmaOptNormUnchecked(order: number): number {
  return 0.8 * (order + 1);
}

/** σ_opt in S/m for grading order m, cell size Δ (m) and background index n: 0.8(m+1)/(η₀Δn). */
export function sigmaOpt(order: number, cellMetres: number, index = 1): number {
  const m = inRange('grading order', order, 0, MAX_ORDER);
  const d = inRange('cell size', cellMetres, MIN_CELL_METRES, 1, { unit: 'm' });
  const n = inRange('background index', index, 1, 100);
  return (0.8 * (m + 1)) / (ETA0 * d * n);
}

/** Checks a design and fills in defaults. */
export function resolveDesign(design: AbsorberDesign): ResolvedDesign {
  if (design === null || typeof design !== 'object') {
    throw new HushInputError('design', 'design must be an object with at least layers and order', 'value');
  }
  const layers = wholeInRange('layers', design.layers, 1, MAX_LAYERS);
  const order = inRange('grading order', design.order, 0, MAX_ORDER);
  const strength = inRange('strength', design.strength ?? 1, 0, MAX_STRENGTH, { loOpen: true });
  const kappaMax = inRange('kappa max', design.kappaMax ?? 1, 1, MAX_KAPPA);
  const alphaMaxNorm = inRange('alpha max (normalised)', design.alphaMaxNorm ?? 0, 0, MAX_ALPHA_NORM);
  const alphaOrder = inRange('alpha order', design.alphaOrder ?? 1, 0, MAX_ORDER);
  const grading = design.grading ?? 'polynomial';
  if (grading !== 'polynomial' && grading !== 'geometric') {
    throw new HushInputError('grading', `grading must be "polynomial" or "geometric" (got ${JSON.stringify(grading)})`, 'value');
  }
  const geometricRatio = inRange('geometric ratio', design.geometricRatio ?? 2.2, 1, 10, { loOpen: true });
  finite('layers', layers);
  return { layers, order, strength, kappaMax, alphaMaxNorm, alphaOrder, grading, geometricRatio };
}

/**
 * Profiles at a depth u = depth/N ∈ [0, 1]. Writes σ_norm, κ, α_norm into `out`
 * (length 3) to avoid allocation in loops.
 */
export function profileAt(d: ResolvedDesign, u: number, out: Float64Array): void {
  const N = d.layers;
  let sigma: number;
  if (d.grading === 'geometric') {
    // σ(x) = σ₀ g^{x/Δ}; σ₀ set so the continuous round trip equals e^{−1.6·s·N},
    // from R = exp(−2nη₀σ₀Δ(g^N − 1)/ln g) (physics.md §2).
    const g = d.geometricRatio;
    const sigma0 = (0.8 * d.strength * N * Math.log(g)) / (Math.pow(g, N) - 1);
    sigma = sigma0 * Math.pow(g, u * N);
  } else {
    sigma = d.strength * sigmaOptNormUnchecked(d.order) * Math.pow(u, d.order);
  }
  out[0] = sigma;
  out[1] = 1 + (d.kappaMax - 1) * (d.grading === 'geometric' ? u : Math.pow(u, d.order));
  out[2] = d.alphaMaxNorm * Math.pow(1 - u, d.alphaOrder);
}

/** Polynomial σ(u)/σ_max = u^m at depth u = depth/N ∈ [0, 1], order 0 ≤ m ≤ MAX_ORDER; exported for plots and tests. */
export function polynomialProfile(u: number, order: number): number {
  const x = inRange('depth (fraction of the absorber)', u, 0, 1);
  return Math.pow(x, inRange('grading order', order, 0, MAX_ORDER));
}

/** Reversed polynomial α(u)/α_max = (1 − u)^{m_a} at depth u ∈ [0, 1], order 0 ≤ m_a ≤ MAX_ORDER. */
export function reversedPolynomialProfile(u: number, order: number): number {
  const x = inRange('depth (fraction of the absorber)', u, 0, 1);
  return Math.pow(1 - x, inRange('alpha order', order, 0, MAX_ORDER));
}

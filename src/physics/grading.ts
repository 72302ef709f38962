/**
 * Grading of the absorber parameters across its depth (physics.md §2).
 * All conductivities here are normalised: σ_norm = σ·η₀·Δ·n, α_norm = α·η₀·Δ·n,
 * so that σΔt/ε₀ = σ_norm·S_m with S_m = S/n the Courant number in the medium.
 */
import { HushInputError, quote } from './errors';
import { ETA0, MIN_CELL_METRES, MAX_ALPHA_NORM, MAX_KAPPA, MAX_LAYERS, MAX_ORDER, MAX_STRENGTH } from './constants';
import { finite, inRange, wholeInRange } from './validate';

/** How σ grows with depth. */
export type GradingKind = 'polynomial' | 'geometric';

/**
 * How a solver samples the graded profiles onto its E and H nodes (E nodes at
 * integer depths d = 0…N, H nodes at d + ½; depth 0 is the interface node and
 * the perfect conductor sits on the E node at depth N):
 *  - 'node': each node at its own depth, u = d/N (physics.md §3; the default);
 *  - 'average': each node's σ, κ − 1 and α are the integrals of their profiles
 *    over the node's own cell [max(d − ½, 0), min(d + ½, N)] (a cell is 1 wide,
 *    so this is the cell mean with the part outside the absorber counted as zero);
 *  - 'offset': the profile starts half a cell before the interface node, every
 *    node at depth d ≥ −½ sampled at u = min((d + ½)/N, 1);
 *  - 'lagged': one profile array for both fields: the E node at depth d at
 *    u = d/N, and the H node at depth d + ½ takes the E node's value at depth d.
 */
export type SamplingConvention = 'node' | 'average' | 'offset' | 'lagged';

/** Every sampling convention, in the order the documentation lists them. */
export const SAMPLING_CONVENTIONS: readonly SamplingConvention[] = ['node', 'average', 'offset', 'lagged'];

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
  /** How the profiles are sampled onto the nodes (see SamplingConvention). Default 'node'. */
  sampling?: SamplingConvention;
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
  sampling: SamplingConvention;
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
  const sampling = checkSampling(design.sampling ?? 'node');
  finite('layers', layers);
  return { layers, order, strength, kappaMax, alphaMaxNorm, alphaOrder, grading, geometricRatio, sampling };
}

/** Checks a sampling convention name. */
export function checkSampling(sampling: unknown): SamplingConvention {
  if (typeof sampling !== 'string' || !(SAMPLING_CONVENTIONS as readonly string[]).includes(sampling)) {
    throw new HushInputError(
      'sampling',
      `sampling must be one of ${SAMPLING_CONVENTIONS.map((c) => `"${c}"`).join(', ')} (got ${quote(sampling)})`,
      'value',
    );
  }
  return sampling as SamplingConvention;
}

/**
 * x^n for a whole n ≥ 0 by repeated squaring (at most 2·log₂n + 1 products;
 * MAX_ORDER + 1 = 11 needs five): the grading order is usually whole, and
 * Math.pow costs several times more (issue 13). Agrees with Math.pow to a few
 * units in the last place; x^0 = 1 for every x, as Math.pow gives.
 */
export function powWhole(x: number, n: number): number {
  // The common orders written out: the products the loop below forms, in its order.
  if (n === 3) return x * (x * x);
  if (n === 2) return x * x;
  if (n === 1) return x;
  if (n === 4) return x * x * (x * x);
  let r = 1;
  let p = x;
  for (;;) {
    if (n & 1) r *= p;
    n >>= 1;
    if (n === 0) return r;
    p *= p;
  }
}

/** x^m: by `powWhole` when m is a whole number, else Math.pow (a fractional grading order). */
export function powOrder(x: number, m: number): number {
  return Number.isInteger(m) ? powWhole(x, m) : Math.pow(x, m);
}

/**
 * Profiles at a depth u = depth/N ∈ [0, 1]. Writes σ_norm, κ, α_norm into `out`
 * (length 3) to avoid allocation in loops.
 */
export function profileAt(d: ResolvedDesign, u: number, out: Float64Array): void {
  const N = d.layers;
  let sigma: number;
  let um: number;
  if (d.grading === 'geometric') {
    sigma = geometricSigma0(d) * Math.pow(d.geometricRatio, u * N);
    um = u;
  } else {
    um = powOrder(u, d.order);
    sigma = d.strength * sigmaOptNormUnchecked(d.order) * um;
  }
  out[0] = sigma;
  out[1] = 1 + (d.kappaMax - 1) * um;
  out[2] = d.alphaMaxNorm === 0 ? 0 : d.alphaMaxNorm * powOrder(1 - u, d.alphaOrder);
}

/**
 * σ₀ of geometric grading σ(x) = σ₀ g^{x/Δ}, set so the continuous round trip
 * equals e^{−1.6·s·N}, from R = exp(−2nη₀σ₀Δ(g^N − 1)/ln g) (physics.md §2).
 */
export function geometricSigma0(d: ResolvedDesign): number {
  const g = d.geometricRatio;
  return (0.8 * d.strength * d.layers * Math.log(g)) / (Math.pow(g, d.layers) - 1);
}

/**
 * Integrals of the profiles over the depth interval [x0, x1] (in cells,
 * 0 ≤ x0 ≤ x1 ≤ N), in closed form: writes ∫σ_norm dx, ∫(κ − 1) dx and
 * ∫α_norm dx into out[0…2]. The 'average' sampling divides by the cell width 1.
 *   polynomial: ∫(x/N)^m dx = N/(m + 1)·[(x/N)^{m+1}];
 *   geometric:  ∫σ₀g^x dx = σ₀·[g^x]/ln g, κ linear in x/N;
 *   α:          ∫(1 − x/N)^{m_a} dx = −N/(m_a + 1)·[(1 − x/N)^{m_a+1}].
 */
export function profileIntegral(d: ResolvedDesign, x0: number, x1: number, out: Float64Array): void {
  const N = d.layers;
  const u0 = x0 / N;
  const u1 = x1 / N;
  let sigma: number;
  let kappa1: number;
  if (d.grading === 'geometric') {
    const g = d.geometricRatio;
    const lg = Math.log(g);
    const sigma0 = (0.8 * d.strength * N * lg) / (Math.pow(g, N) - 1);
    sigma = (sigma0 * (Math.pow(g, x1) - Math.pow(g, x0))) / lg;
    kappa1 = ((d.kappaMax - 1) * (x1 * x1 - x0 * x0)) / (2 * N);
  } else {
    const m = d.order;
    const poly = (N * (powOrder(u1, m + 1) - powOrder(u0, m + 1))) / (m + 1);
    sigma = d.strength * sigmaOptNormUnchecked(m) * poly;
    kappa1 = (d.kappaMax - 1) * poly;
  }
  const ma = d.alphaOrder;
  out[0] = sigma;
  out[1] = kappa1;
  out[2] = d.alphaMaxNorm === 0 ? 0 : (d.alphaMaxNorm * N * (powOrder(1 - u0, ma + 1) - powOrder(1 - u1, ma + 1))) / (ma + 1);
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

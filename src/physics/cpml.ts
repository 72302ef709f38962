/**
 * CPML recursive-convolution coefficients per node (Roden & Gedney, Microwave
 * Opt. Technol. Lett. 27, 334 (2000); Taflove & Hagness, 3rd ed., ch. 7):
 *   b = exp(−(σ/κ + α)·Δt/ε₀),  a = σ·(b − 1)/(σκ + κ²α),
 *   ψⁿ = b·ψⁿ⁻¹ + a·Dⁿ, stretched difference = D/κ + ψ.
 * Node layout (physics.md §3): E nodes at depths i = 0…N, H nodes at depths
 * i + ½, i = 0…N−1; how the profiles reach the nodes is the design's sampling
 * convention (grading.ts, SamplingConvention; physics.md §6). The H node at
 * depth −½ is lossless under every convention, so the reflection kernel's
 * split into incident and reflected waves (which uses E at depths 0 and −1
 * and the lossless H at −½) holds even where the E node at depth 0 is lossy.
 */
import { geometricSigma0, powWhole, profileIntegral, resolveDesign, sigmaOptNormUnchecked, type AbsorberDesign, type ResolvedDesign } from './grading';
import { checkCourantMedium } from './courant';

/** Coefficients of one absorber on its E and H nodes. */
export interface CpmlCoefficients {
  layers: number;
  /** E nodes 0…N. */
  eB: Float64Array;
  eA: Float64Array;
  eInvKappa: Float64Array;
  /** H nodes at depth i + ½, i = 0…N−1. */
  hB: Float64Array;
  hA: Float64Array;
  hInvKappa: Float64Array;
}

/** Allocates coefficient storage for up to `capacity` layers. */
export function allocateCoefficients(capacity: number): CpmlCoefficients {
  return {
    layers: 0,
    eB: new Float64Array(capacity + 1),
    eA: new Float64Array(capacity + 1),
    eInvKappa: new Float64Array(capacity + 1),
    hB: new Float64Array(capacity),
    hA: new Float64Array(capacity),
    hInvKappa: new Float64Array(capacity),
  };
}

const prof = new Float64Array(3);

/** b and a for normalised σ, κ, α at medium Courant number S_m; writes into out[0], out[1]. */
export function nodeCoefficients(sigma: number, kappa: number, alpha: number, courantMedium: number, out: Float64Array): void {
  const b = Math.exp(-(sigma / kappa + alpha) * courantMedium);
  const den = sigma * kappa + kappa * kappa * alpha;
  out[0] = b;
  out[1] = sigma > 0 && den > 0 ? (sigma * (b - 1)) / den : 0;
}

const ab = new Float64Array(2);

/**
 * Fills `out` (from `allocateCoefficients`) with the coefficients of `design`
 * on a grid of medium Courant number S_m = S/n, following the design's
 * sampling convention. Returns `out`. What does not depend on the node is
 * taken out of the loop (σ_max, geometric σ₀, whether m and m_a are whole);
 * whole orders take `powWhole` instead of Math.pow, and α's power is skipped
 * when α_max = 0 (it would be multiplied by 0).
 */
export function fillCoefficients(design: ResolvedDesign, courantMedium: number, out: CpmlCoefficients): CpmlCoefficients {
  const N = design.layers;
  out.layers = N;
  const sampling = design.sampling;
  if (sampling === 'average') {
    // σ, κ − 1 and α integrated over each node's own cell, clipped to [0, N] (cell width 1).
    for (let i = 0; i <= N; i++) {
      profileIntegral(design, Math.max(i - 0.5, 0), Math.min(i + 0.5, N), prof);
      setE(out, i, prof[0], 1 + prof[1], prof[2], courantMedium);
    }
    for (let i = 0; i < N; i++) {
      profileIntegral(design, i, i + 1, prof);
      setH(out, i, prof[0], 1 + prof[1], prof[2], courantMedium);
    }
    return out;
  }
  // 'node': u = d/N; 'offset': the node at depth d sampled at (d + ½)/N, capped at the back;
  // 'lagged': the H node at depth i + ½ takes the E node's value at depth i.
  const eShift = sampling === 'offset' ? 0.5 : 0;
  const hShift = sampling === 'offset' ? 1 : sampling === 'lagged' ? 0 : 0.5;
  sampleNodes(design, N + 1, eShift, courantMedium, out.eB, out.eA, out.eInvKappa);
  sampleNodes(design, N, hShift, courantMedium, out.hB, out.hA, out.hInvKappa);
  return out;
}

/** b, a, 1/κ of `count` nodes sampled at u = min((i + shift)/N, 1), i = 0…count − 1 (profileAt's profiles). */
function sampleNodes(d: ResolvedDesign, count: number, shift: number, sm: number, bOut: Float64Array, aOut: Float64Array, kOut: Float64Array): void {
  const N = d.layers;
  const geometric = d.grading === 'geometric';
  const m = d.order;
  const mWhole = Number.isInteger(m);
  const sigmaMax = d.strength * sigmaOptNormUnchecked(m);
  const sigma0 = geometric ? geometricSigma0(d) : 0;
  const g = d.geometricRatio;
  const km1 = d.kappaMax - 1;
  const amax = d.alphaMaxNorm;
  const ma = d.alphaOrder;
  const maWhole = Number.isInteger(ma);
  if (alphas.length < count) alphas = new Float64Array(count);
  if (!geometric && km1 === 0 && amax === 0 && mWhole) {
    // κ = 1 and α = 0 on every node: σ/κ = σ, σκ + κ²α = σ and 1/κ = 1 exactly, so the general
    // loop below gives the same values with two divisions more per node.
    // σ into aOut first, then b = exp(−σ·S_m) in a loop of its own (no other live values across the
    // call), then a from σ and b.
    for (let i = 0; i < count; i++) {
      const u = i + shift < N ? (i + shift) / N : 1;
      aOut[i] = sigmaMax * powWhole(u, m);
    }
    for (let i = 0; i < count; i++) bOut[i] = Math.exp(-aOut[i] * sm);
    for (let i = 0; i < count; i++) {
      const sigma = aOut[i];
      aOut[i] = sigma > 0 ? (sigma * (bOut[i] - 1)) / sigma : 0;
      kOut[i] = 1;
    }
    return;
  }
  for (let i = 0; i < count; i++) {
    const u = i + shift < N ? (i + shift) / N : 1;
    let sigma: number;
    let um: number;
    if (geometric) {
      sigma = sigma0 * Math.pow(g, u * N);
      um = u;
    } else {
      um = mWhole ? powWhole(u, m) : Math.pow(u, m);
      sigma = sigmaMax * um;
    }
    const kappa = 1 + km1 * um;
    const alpha = amax === 0 ? 0 : amax * (maWhole ? powWhole(1 - u, ma) : Math.pow(1 - u, ma));
    // σ, κ and α kept for the third loop; the exponent of b for the second.
    aOut[i] = sigma;
    kOut[i] = kappa;
    alphas[i] = alpha;
    bOut[i] = -(sigma / kappa + alpha) * sm;
  }
  for (let i = 0; i < count; i++) bOut[i] = Math.exp(bOut[i]);
  for (let i = 0; i < count; i++) {
    const sigma = aOut[i];
    const kappa = kOut[i];
    const b = bOut[i];
    const den = sigma * kappa + kappa * kappa * alphas[i];
    aOut[i] = sigma > 0 && den > 0 ? (sigma * (b - 1)) / den : 0;
    kOut[i] = 1 / kappa;
  }
}

/** sampleNodes' α per node between its loops, grown as needed. */
let alphas = new Float64Array(0);

function setE(out: CpmlCoefficients, i: number, sigma: number, kappa: number, alpha: number, courantMedium: number): void {
  nodeCoefficients(sigma, kappa, alpha, courantMedium, ab);
  out.eB[i] = ab[0];
  out.eA[i] = ab[1];
  out.eInvKappa[i] = 1 / kappa;
}

function setH(out: CpmlCoefficients, i: number, sigma: number, kappa: number, alpha: number, courantMedium: number): void {
  nodeCoefficients(sigma, kappa, alpha, courantMedium, ab);
  out.hB[i] = ab[0];
  out.hA[i] = ab[1];
  out.hInvKappa[i] = 1 / kappa;
}

/**
 * Coefficients of a design in freshly allocated arrays (convenience for engines
 * and tests). Checks the design (`resolveDesign`, defaults filled in) and the
 * Courant number in the medium (MIN_COURANT_MEDIUM ≤ S_m ≤ 1).
 */
export function cpmlCoefficients(design: AbsorberDesign, courantMedium: number): CpmlCoefficients {
  const d = resolveDesign(design);
  const sm = checkCourantMedium(courantMedium);
  return fillCoefficients(d, sm, allocateCoefficients(d.layers));
}

/**
 * The reflection evaluation as it was before issue 13's kernel work (commit
 * 97fbaef, src/physics/grading.ts, cpml.ts, reflection.ts), kept verbatim as
 * the straightforward reference the fast kernel is checked against
 * (tests/kernel-reference.test.ts): Math.pow for every power, exp per node,
 * F = 1/κ + a/(1 − b·e^{−jωΔt}) stored and divided by in the recurrence, the
 * split by asin/cos/sin (asinh/exp for a near field). Roden & Gedney 2000;
 * Taflove & Hagness, 3rd ed., ch. 7; physics.md §3, §6.
 */
import type { ResolvedDesign } from '../../src/physics/grading';

const RESCALE = 1e150;
const prof = new Float64Array(3);
const ab = new Float64Array(2);

export interface ReferenceCoefficients {
  layers: number;
  eB: Float64Array;
  eA: Float64Array;
  eInvKappa: Float64Array;
  hB: Float64Array;
  hA: Float64Array;
  hInvKappa: Float64Array;
}

export interface ReferenceFactors {
  eRe: Float64Array;
  eIm: Float64Array;
  hRe: Float64Array;
  hIm: Float64Array;
}

export function referenceCoefficients(capacity: number): ReferenceCoefficients {
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

export function referenceFactors(capacity: number): ReferenceFactors {
  return { eRe: new Float64Array(capacity + 1), eIm: new Float64Array(capacity + 1), hRe: new Float64Array(capacity), hIm: new Float64Array(capacity) };
}

function profileAt(d: ResolvedDesign, u: number, out: Float64Array): void {
  const N = d.layers;
  let sigma: number;
  if (d.grading === 'geometric') {
    // σ(x) = σ₀ g^{x/Δ}; σ₀ set so the continuous round trip equals e^{−1.6·s·N},
    // from R = exp(−2nη₀σ₀Δ(g^N − 1)/ln g) (physics.md §2).
    const g = d.geometricRatio;
    const sigma0 = (0.8 * d.strength * N * Math.log(g)) / (Math.pow(g, N) - 1);
    sigma = sigma0 * Math.pow(g, u * N);
  } else {
    sigma = d.strength * (0.8 * (d.order + 1)) * Math.pow(u, d.order);
  }
  out[0] = sigma;
  out[1] = 1 + (d.kappaMax - 1) * (d.grading === 'geometric' ? u : Math.pow(u, d.order));
  out[2] = d.alphaMaxNorm * Math.pow(1 - u, d.alphaOrder);
}

function profileIntegral(d: ResolvedDesign, x0: number, x1: number, out: Float64Array): void {
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
    const poly = (N * (Math.pow(u1, m + 1) - Math.pow(u0, m + 1))) / (m + 1);
    sigma = d.strength * (0.8 * (m + 1)) * poly;
    kappa1 = (d.kappaMax - 1) * poly;
  }
  const ma = d.alphaOrder;
  out[0] = sigma;
  out[1] = kappa1;
  out[2] = (d.alphaMaxNorm * N * (Math.pow(1 - u0, ma + 1) - Math.pow(1 - u1, ma + 1))) / (ma + 1);
}

function nodeCoefficients(sigma: number, kappa: number, alpha: number, courantMedium: number, out: Float64Array): void {
  const b = Math.exp(-(sigma / kappa + alpha) * courantMedium);
  const den = sigma * kappa + kappa * kappa * alpha;
  out[0] = b;
  out[1] = sigma > 0 && den > 0 ? (sigma * (b - 1)) / den : 0;
}

export function referenceFillCoefficients(design: ResolvedDesign, courantMedium: number, out: ReferenceCoefficients): ReferenceCoefficients {
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
  for (let i = 0; i <= N; i++) {
    // 'offset': the node at depth d sampled at (d + ½)/N, capped at the back.
    profileAt(design, sampling === 'offset' ? Math.min((i + 0.5) / N, 1) : i / N, prof);
    setE(out, i, prof[0], prof[1], prof[2], courantMedium);
  }
  for (let i = 0; i < N; i++) {
    // 'lagged': the H node at depth i + ½ takes the E node's value at depth i.
    profileAt(design, sampling === 'offset' ? (i + 1) / N : sampling === 'lagged' ? i / N : (i + 0.5) / N, prof);
    setH(out, i, prof[0], prof[1], prof[2], courantMedium);
  }
  return out;
}

function setE(out: ReferenceCoefficients, i: number, sigma: number, kappa: number, alpha: number, courantMedium: number): void {
  nodeCoefficients(sigma, kappa, alpha, courantMedium, ab);
  out.eB[i] = ab[0];
  out.eA[i] = ab[1];
  out.eInvKappa[i] = 1 / kappa;
}

function setH(out: ReferenceCoefficients, i: number, sigma: number, kappa: number, alpha: number, courantMedium: number): void {
  nodeCoefficients(sigma, kappa, alpha, courantMedium, ab);
  out.hB[i] = ab[0];
  out.hA[i] = ab[1];
  out.hInvKappa[i] = 1 / kappa;
}

export function referenceFillFactors(coef: ReferenceCoefficients, omegaDt: number, out: ReferenceFactors): ReferenceFactors {
  const c = Math.cos(omegaDt);
  const s = Math.sin(omegaDt);
  const N = coef.layers;
  for (let i = 0; i <= N; i++) {
    const b = coef.eB[i];
    const a = coef.eA[i];
    const p = 1 - b * c;
    const q = b * s;
    const den = p * p + q * q;
    out.eRe[i] = coef.eInvKappa[i] + (a * p) / den;
    out.eIm[i] = (-a * q) / den;
  }
  for (let i = 0; i < N; i++) {
    const b = coef.hB[i];
    const a = coef.hA[i];
    const p = 1 - b * c;
    const q = b * s;
    const den = p * p + q * q;
    out.hRe[i] = coef.hInvKappa[i] + (a * p) / den;
    out.hIm[i] = (-a * q) / den;
  }
  return out;
}

export function referenceKernel(
  f: ReferenceFactors,
  layers: number,
  courantMedium: number,
  omegaDt: number,
  sinHalfKt2: number,
  out: Float64Array,
): Float64Array {
  const sh = Math.sin(omegaDt / 2);
  const omega = (2 * sh) / courantMedium; // Ω·Δ/v
  // ζ = 1 − K_t²/Ω² with K_t² = 4 sin²(k_t/2).
  const zeta = 1 - (4 * sinHalfKt2) / (omega * omega);
  const wz = omega * zeta;
  // E_N = 0, H_{N−½} = 1.
  let eRe = 0;
  let eIm = 0;
  let hRe = 1;
  let hIm = 0;
  for (let i = layers - 1; i >= 0; i--) {
    // E_i = E_{i+1} − jΩ·H_{i+½}/F_h
    let fr = f.hRe[i];
    let fi = f.hIm[i];
    let den = fr * fr + fi * fi;
    // H/F = H·conj(F)/|F|²
    let tr = (hRe * fr + hIm * fi) / den;
    let ti = (hIm * fr - hRe * fi) / den;
    // −jΩ·(tr + j ti) = Ω·ti − jΩ·tr
    eRe += omega * ti;
    eIm -= omega * tr;
    // H_{i−½} = H_{i+½} − jΩζ·E_i/F_e
    fr = f.eRe[i];
    fi = f.eIm[i];
    den = fr * fr + fi * fi;
    tr = (eRe * fr + eIm * fi) / den;
    ti = (eIm * fr - eRe * fi) / den;
    hRe += wz * ti;
    hIm -= wz * tr;
    const mag = Math.abs(eRe) + Math.abs(eIm) + Math.abs(hRe) + Math.abs(hIm);
    if (mag > RESCALE) {
      const k = 1 / RESCALE;
      eRe *= k;
      eIm *= k;
      hRe *= k;
      hIm *= k;
    }
  }
  // E_{−1} = E_0 − jΩ·H_{−½} (lossless node).
  const e1Re = eRe + omega * hIm;
  const e1Im = eIm - omega * hRe;
  // Lossless 1-D dispersion: sin²(k̃_x/2) = sin²(ωΔt/2)/S_m² − sin²(k_t/2).
  const x = (sh * sh) / (courantMedium * courantMedium) - sinHalfKt2;
  if (x < 0) {
    // Evanescent along x (physics.md §6): k̃_x = −j/L with sinh²(1/(2L)) = −x, so the
    // lossless field is A·e^{−i/L} + B·e^{+i/L} and e^{±jk̃_x} = e^{±1/L} are real.
    // r = B/A = (E_0·e^{1/L} − E_{−1}) / (E_{−1} − E_0·e^{−1/L}).
    const q = 2 * Math.asinh(Math.sqrt(-x));
    const up = Math.exp(q);
    const down = 1 / up;
    const nRe = eRe * up - e1Re;
    const nIm = eIm * up - e1Im;
    const dRe = e1Re - eRe * down;
    const dIm = e1Im - eIm * down;
    const dd = dRe * dRe + dIm * dIm;
    out[0] = (nRe * dRe + nIm * dIm) / dd;
    out[1] = (nIm * dRe - nRe * dIm) / dd;
    return out;
  }
  const kx = 2 * Math.asin(Math.sqrt(x));
  const ck = Math.cos(kx);
  const sk = Math.sin(kx);
  // r = (E_0·e^{jk} − E_{−1}) / (E_{−1} − E_0·e^{−jk})
  const nRe = eRe * ck - eIm * sk - e1Re;
  const nIm = eRe * sk + eIm * ck - e1Im;
  const dRe = e1Re - (eRe * ck + eIm * sk);
  const dIm = e1Im - (eIm * ck - eRe * sk);
  const dd = dRe * dRe + dIm * dIm;
  out[0] = (nRe * dRe + nIm * dIm) / dd;
  out[1] = (nIm * dRe - nRe * dIm) / dd;
  return out;
}

const refCoef = referenceCoefficients(1024);
const refFac = referenceFactors(1024);

/** [Re r, Im r] by the reference evaluation: coefficients, factors, kernel. */
export function referenceReflection(d: ResolvedDesign, courantMedium: number, omegaDt: number, sinHalfKt2: number, out = new Float64Array(2)): Float64Array {
  referenceFillCoefficients(d, courantMedium, refCoef);
  referenceFillFactors(refCoef, omegaDt, refFac);
  return referenceKernel(refFac, d.layers, courantMedium, omegaDt, sinHalfKt2, out);
}

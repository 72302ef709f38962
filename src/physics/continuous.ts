/**
 * Continuous-theory amplitude reflection of a PML backed by a perfect conductor
 * (Taflove & Hagness, 3rd ed., ch. 7), in normalised units (σ_norm = σ·η₀·Δ·n):
 *   R(θ) = exp(−2·cos θ·∫₀ᴺ σ_norm(x)·w(x) dx),  w = 1/(1 + (α_norm/ω_norm)²),
 * where ω_norm = 2π/ppw; with α = 0 this is exp(−2nη₀σ_max·d·cosθ/(m+1)) for
 * polynomial grading and the geometric closed form of physics.md §2.
 * κ does not change the attenuation of propagating waves in continuous theory.
 */
import { profileAt, resolveDesign, sigmaOptNormUnchecked, type AbsorberDesign, type ResolvedDesign } from './grading';
import { MAX_PPW } from './dispersion';
import { inRange } from './validate';

const DEG = Math.PI / 180;
const prof = new Float64Array(3);
/** 5-point Gauss–Legendre nodes and weights on [−1, 1] (Abramowitz & Stegun, table 25.4). */
const GL_X = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const GL_W = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

/** ∫₀ᴺ σ_norm dx (in cells), closed form when α = 0, else composite Gauss–Legendre. */
export function attenuationIntegral(d: ResolvedDesign, ppw: number): number {
  const N = d.layers;
  if (d.alphaMaxNorm === 0) {
    // Both gradings are normalised so that the round trip is 1.6·s·N nepers at θ = 0.
    if (d.grading === 'geometric') return 0.8 * d.strength * N;
    return (d.strength * sigmaOptNormUnchecked(d.order) * N) / (d.order + 1);
  }
  const wn = (2 * Math.PI) / ppw;
  // 5-point Gauss–Legendre on 64 panels: ample for smooth profiles.
  const xs = GL_X;
  const ws = GL_W;
  const panels = 64;
  let sum = 0;
  for (let p = 0; p < panels; p++) {
    const a = p / panels;
    const h = 1 / panels;
    for (let k = 0; k < 5; k++) {
      const u = a + (h * (xs[k] + 1)) / 2;
      profileAt(d, u, prof);
      const r = prof[2] / wn;
      sum += ((ws[k] * h) / 2) * prof[0] / (1 + r * r);
    }
  }
  return sum * N;
}

/**
 * Continuous-theory amplitude reflection at `angleDeg` (0 ≤ θ < 90°) for `ppw`
 * cells per wavelength (0 < ppw ≤ MAX_PPW); the design is checked and its
 * defaults filled in (`resolveDesign`).
 */
export function continuousReflection(design: AbsorberDesign, ppw: number, angleDeg: number): number {
  const d = resolveDesign(design);
  const p = inRange('cells per wavelength', ppw, 0, MAX_PPW, { loOpen: true });
  const th = inRange('angle', angleDeg, 0, 90, { hiOpen: true, unit: 'degrees' });
  return continuousReflectionUnchecked(d, p, th);
}

/** `continuousReflection` of a resolved design without the checks (src/physics/internal.ts). */
export function continuousReflectionUnchecked(d: ResolvedDesign, ppw: number, angleDeg: number): number {
  return Math.exp(-2 * Math.cos(angleDeg * DEG) * attenuationIntegral(d, ppw));
}

/**
 * Continuous-theory amplitude reflection of a near field decaying as e^{−x/L}
 * (L in cells) at `ppw` cells per wavelength, backed by the perfect conductor:
 * the stretch x̃ = ∫ s dx, s = κ + σ_norm/(α_norm + jω_norm) (Kuzuoglu & Mittra
 * 1996), maps the decay to e^{−x̃/L}, so |r| = exp(−(2/L)·∫₀ᴺ Re s dx) with
 * Re s = κ + σα/(α² + ω²). Without α, σ does not change it: |r| = exp(−(2/L)∫κ dx)
 * (derived). Unchecked (src/physics/internal.ts).
 */
export function continuousEvanescentUnchecked(d: ResolvedDesign, ppw: number, decayCells: number): number {
  const N = d.layers;
  const wn = (2 * Math.PI) / ppw;
  let sum = 0;
  const panels = d.alphaMaxNorm === 0 ? 8 : 64;
  for (let p = 0; p < panels; p++) {
    const a = p / panels;
    const h = 1 / panels;
    for (let k = 0; k < 5; k++) {
      const u = a + (h * (GL_X[k] + 1)) / 2;
      profileAt(d, u, prof);
      const al = prof[2];
      sum += ((GL_W[k] * h) / 2) * (prof[1] + (al > 0 ? (prof[0] * al) / (al * al + wn * wn) : 0));
    }
  }
  return Math.exp((-2 * sum * N) / decayCells);
}

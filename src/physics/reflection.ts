/**
 * Exact complex reflection of a discretised CPML absorber backed by a perfect
 * conductor, as the Yee grid sees it (physics.md §3). The update equations are
 * linear and time invariant, so at each frequency z = e^{jωΔt}:
 *   centred time difference → jΩ, Ω = (2/Δt)·sin(ωΔt/2);
 *   stretched difference D → D·F, F = 1/κ + a/(1 − b·z⁻¹) (Roden & Gedney 2000);
 *   transverse Yee difference → K_t = 2·sin(k_t/2) (per cell), entering as
 *   ε_eff = ε·(1 − K_t²/Ω²).
 * We shoot from the conductor (E_N = 0, H_{N−½} = 1) to the interface and split
 * the lossless field into e^{∓j·k̃_x·i} waves. Units: cell Δ = 1, medium speed
 * v = 1, so Δt = S_m and ε = μ = 1.
 *
 * Inner loops use plain numbers only; the kernel allocates nothing per call.
 */
import { allocateCoefficients, fillCoefficients, type CpmlCoefficients } from './cpml';
import { resolveDesign, type AbsorberDesign, type ResolvedDesign } from './grading';
import { checkCourant, checkCourantMedium, defaultCourant } from './courant';
import { checkPpw, checkWaveStep, evanescentFactorUnchecked, transverseFactorUnchecked } from './dispersion';
import { continuousEvanescentUnchecked, continuousReflectionUnchecked } from './continuous';
import { HushInputError } from './errors';
import { MAX_LAYERS } from './constants';
import { inRange, wholeInRange } from './validate';

const DEG = Math.PI / 180;
const RESCALE = 1e150;

/**
 * Per-frequency inverse node factors 1/F = G_r + j·G_i for E and H nodes: the
 * recurrence divides by F, so it is inverted once per node and frequency here
 * and the kernel only multiplies.
 */
export interface NodeFactors {
  eInvRe: Float64Array;
  eInvIm: Float64Array;
  hInvRe: Float64Array;
  hInvIm: Float64Array;
}

export function allocateFactors(capacity: number): NodeFactors {
  return {
    eInvRe: new Float64Array(capacity + 1),
    eInvIm: new Float64Array(capacity + 1),
    hInvRe: new Float64Array(capacity),
    hInvIm: new Float64Array(capacity),
  };
}

/**
 * 1/F on every node of `coef` at phase step ωΔt, F = 1/κ + a/(1 − b·e^{−jωΔt}):
 * with w = 1 − b·e^{−jωΔt}, 1/F = w/(w/κ + a), one complex division per node
 * (exactly 1 on a lossless node, a = 0 and κ = 1, as F itself is).
 */
export function fillFactors(coef: CpmlCoefficients, omegaDt: number, out: NodeFactors): NodeFactors {
  return fillFactorsAt(coef, Math.cos(omegaDt), Math.sin(omegaDt), out);
}

/** fillFactors with cos ωΔt and sin ωΔt given (a search that samples the same frequencies again computes them once). */
export function fillFactorsAt(coef: CpmlCoefficients, cosDt: number, sinDt: number, out: NodeFactors): NodeFactors {
  invertFactors(coef.layers + 1, cosDt, sinDt, coef.eB, coef.eA, coef.eInvKappa, out.eInvRe, out.eInvIm);
  invertFactors(coef.layers, cosDt, sinDt, coef.hB, coef.hA, coef.hInvKappa, out.hInvRe, out.hInvIm);
  return out;
}

function invertFactors(n: number, c: number, s: number, bs: Float64Array, as: Float64Array, ks: Float64Array, re: Float64Array, im: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const b = bs[i];
    const k = ks[i];
    const p = 1 - b * c;
    const q = b * s;
    const dr = k * p + as[i];
    const di = k * q;
    const dd = dr * dr + di * di;
    re[i] = (p * dr + q * di) / dd;
    im[i] = (q * dr - p * di) / dd;
  }
}

/** Result slot for the kernel: [re, im] of r. */
export type ComplexOut = Float64Array;

/** Numbers per sample in a sample table (`fillSample`): Ω, Ωζ, kind, and the split's two constants. */
export const SAMPLE_STRIDE = 5;

/**
 * The kernel's constants of one sample (phase step ωΔt, transverse factor
 * sin²(k_t/2), medium Courant number S_m), everything of it that does not
 * depend on the layer, written at samples[at…at + 4]:
 *   Ω = 2·sin(ωΔt/2)/S_m (Ω·Δ/v), Ωζ with ζ = 1 − K_t²/Ω², K_t² = 4 sin²(k_t/2);
 *   with x = sin²(ωΔt/2)/S_m² − sin²(k_t/2) = sin²(k̃_x/2) (lossless 1-D dispersion):
 *   x ≥ 0, a propagating wave: kind 0, cos k̃_x = 1 − 2x, sin k̃_x = 2·√(x(1 − x));
 *   x < 0, evanescent along x (physics.md §6): k̃_x = −j/L with sinh(1/(2L)) = √−x,
 *   kind 1, e^{1/L} = (√−x + √(1 − x))² and e^{−1/L}.
 */
export function fillSample(courantMedium: number, omegaDt: number, sinHalfKt2: number, samples: Float64Array, at: number): void {
  const sh = Math.sin(omegaDt / 2);
  const omega = (2 * sh) / courantMedium;
  const zeta = 1 - (4 * sinHalfKt2) / (omega * omega);
  samples[at] = omega;
  samples[at + 1] = omega * zeta;
  const x = (sh * sh) / (courantMedium * courantMedium) - sinHalfKt2;
  if (x < 0) {
    const t = Math.sqrt(-x) + Math.sqrt(1 - x);
    const up = t * t;
    samples[at + 2] = 1;
    samples[at + 3] = up;
    samples[at + 4] = 1 / up;
  } else {
    samples[at + 2] = 0;
    samples[at + 3] = 1 - 2 * x;
    samples[at + 4] = 2 * Math.sqrt(x * (1 - x));
  }
}

const oneSample = new Float64Array(SAMPLE_STRIDE);

/**
 * The kernel: reflection r at depth 0 for node factors `f` (from `fillFactors`
 * at the same ωΔt), layers N, medium Courant number S_m, phase step ωΔt and
 * transverse Yee factor sin²(k_t/2) (in 3-D the sum sin²(k_y/2) + sin²(k_z/2)).
 * Writes [Re r, Im r] into `out`. A transverse factor above sin²(ωΔt/2)/S_m²
 * makes the wave evanescent along x; the split then uses the decaying and
 * growing solutions e^{∓i/L} (physics.md §6). Throws nothing; the caller
 * keeps the factor off the grazing point where the two solutions coincide.
 */
export function reflectionKernel(
  f: NodeFactors,
  layers: number,
  courantMedium: number,
  omegaDt: number,
  sinHalfKt2: number,
  out: ComplexOut,
): ComplexOut {
  fillSample(courantMedium, omegaDt, sinHalfKt2, oneSample, 0);
  return sampledKernel(f, layers, oneSample, 0, out, 0);
}

/**
 * The kernel at the sample held at samples[at…] (`fillSample`): shoots from
 * the conductor (E_N = 0, H_{N−½} = 1) to the interface, writes [Re r, Im r]
 * at out[outAt], out[outAt + 1].
 */
export function sampledKernel(f: NodeFactors, layers: number, samples: Float64Array, at: number, out: Float64Array, outAt: number): Float64Array {
  const omega = samples[at];
  const wz = samples[at + 1];
  const eg = f.eInvRe;
  const egi = f.eInvIm;
  const hg = f.hInvRe;
  const hgi = f.hInvIm;
  let eRe = 0;
  let eIm = 0;
  let hRe = 1;
  let hIm = 0;
  for (let i = layers - 1; i >= 0; i--) {
    // E_i = E_{i+1} − jΩ·H_{i+½}/F_h; −jΩ·(tr + j ti) = Ω·ti − jΩ·tr
    let gr = hg[i];
    let gi = hgi[i];
    let tr = hRe * gr - hIm * gi;
    let ti = hRe * gi + hIm * gr;
    eRe += omega * ti;
    eIm -= omega * tr;
    // H_{i−½} = H_{i+½} − jΩζ·E_i/F_e
    gr = eg[i];
    gi = egi[i];
    tr = eRe * gr - eIm * gi;
    ti = eRe * gi + eIm * gr;
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
  split(eRe, eIm, hRe, hIm, omega, samples[at + 2], samples[at + 3], samples[at + 4], out, outAt);
  return out;
}

/**
 * The kernel at `count` samples of one frequency (one set of node factors),
 * samples[(first + k)·SAMPLE_STRIDE…], k = 0…count − 1, two at a time in one
 * walk over the layers (each layer's 1/F read once for both, their fields in
 * registers). Writes [Re r, Im r] of sample k at out[2k], out[2k + 1]; the
 * same arithmetic per sample as `sampledKernel`, so the same values.
 */
export function sampledKernels(f: NodeFactors, layers: number, samples: Float64Array, first: number, count: number, out: Float64Array): Float64Array {
  const eg = f.eInvRe;
  const egi = f.eInvIm;
  const hg = f.hInvRe;
  const hgi = f.hInvIm;
  let k = 0;
  for (; k + 1 < count; k += 2) {
    const s0 = (first + k) * SAMPLE_STRIDE;
    const s1 = s0 + SAMPLE_STRIDE;
    const om0 = samples[s0];
    const wz0 = samples[s0 + 1];
    const om1 = samples[s1];
    const wz1 = samples[s1 + 1];
    let eRe0 = 0;
    let eIm0 = 0;
    let hRe0 = 1;
    let hIm0 = 0;
    let eRe1 = 0;
    let eIm1 = 0;
    let hRe1 = 1;
    let hIm1 = 0;
    for (let i = layers - 1; i >= 0; i--) {
      const hr = hg[i];
      const hi = hgi[i];
      const er = eg[i];
      const ei = egi[i];
      let tr = hRe0 * hr - hIm0 * hi;
      let ti = hRe0 * hi + hIm0 * hr;
      eRe0 += om0 * ti;
      eIm0 -= om0 * tr;
      tr = eRe0 * er - eIm0 * ei;
      ti = eRe0 * ei + eIm0 * er;
      hRe0 += wz0 * ti;
      hIm0 -= wz0 * tr;
      tr = hRe1 * hr - hIm1 * hi;
      ti = hRe1 * hi + hIm1 * hr;
      eRe1 += om1 * ti;
      eIm1 -= om1 * tr;
      tr = eRe1 * er - eIm1 * ei;
      ti = eRe1 * ei + eIm1 * er;
      hRe1 += wz1 * ti;
      hIm1 -= wz1 * tr;
      if (Math.abs(eRe0) + Math.abs(eIm0) + Math.abs(hRe0) + Math.abs(hIm0) > RESCALE) {
        const r = 1 / RESCALE;
        eRe0 *= r;
        eIm0 *= r;
        hRe0 *= r;
        hIm0 *= r;
      }
      if (Math.abs(eRe1) + Math.abs(eIm1) + Math.abs(hRe1) + Math.abs(hIm1) > RESCALE) {
        const r = 1 / RESCALE;
        eRe1 *= r;
        eIm1 *= r;
        hRe1 *= r;
        hIm1 *= r;
      }
    }
    split(eRe0, eIm0, hRe0, hIm0, om0, samples[s0 + 2], samples[s0 + 3], samples[s0 + 4], out, 2 * k);
    split(eRe1, eIm1, hRe1, hIm1, om1, samples[s1 + 2], samples[s1 + 3], samples[s1 + 4], out, 2 * k + 2);
  }
  if (k < count) sampledKernel(f, layers, samples, (first + k) * SAMPLE_STRIDE, out, 2 * k);
  return out;
}

/**
 * Splits the lossless field at the interface into the incident and the
 * reflected wave: E_{−1} = E_0 − jΩ·H_{−½} (lossless node), then
 * propagating (kind 0, c1 = cos k̃_x, c2 = sin k̃_x): r = (E_0·e^{jk} − E_{−1}) / (E_{−1} − E_0·e^{−jk});
 * evanescent (kind 1, c1 = e^{1/L}, c2 = e^{−1/L}; field A·e^{−i/L} + B·e^{+i/L}):
 * r = B/A = (E_0·e^{1/L} − E_{−1}) / (E_{−1} − E_0·e^{−1/L}).
 */
function split(eRe: number, eIm: number, hRe: number, hIm: number, omega: number, kind: number, c1: number, c2: number, out: Float64Array, at: number): void {
  const e1Re = eRe + omega * hIm;
  const e1Im = eIm - omega * hRe;
  let nRe: number;
  let nIm: number;
  let dRe: number;
  let dIm: number;
  if (kind !== 0) {
    nRe = eRe * c1 - e1Re;
    nIm = eIm * c1 - e1Im;
    dRe = e1Re - eRe * c2;
    dIm = e1Im - eIm * c2;
  } else {
    nRe = eRe * c1 - eIm * c2 - e1Re;
    nIm = eRe * c2 + eIm * c1 - e1Im;
    dRe = e1Re - (eRe * c1 + eIm * c2);
    dIm = e1Im - (eIm * c1 - eRe * c2);
  }
  const dd = dRe * dRe + dIm * dIm;
  out[at] = (nRe * dRe + nIm * dIm) / dd;
  out[at + 1] = (nIm * dRe - nRe * dIm) / dd;
}

/** Where and how a wave meets the absorber. */
export interface WaveSpec {
  /** Cells per wavelength in the background medium. */
  ppw: number;
  /** Vacuum Courant number cΔt/Δ; default 0.99/√D for the grid's D dimensions. */
  courant?: number;
  /** Grid dimensions for the Courant limit and the transverse directions; default 3. */
  dimensions?: number;
  /** Background refractive index n ≥ 1; default 1. */
  index?: number;
  /** Angle of incidence in degrees from the face normal, 0 ≤ θ < 90; default 0. */
  angleDeg?: number;
  /**
   * Azimuth φ of the plane of incidence about the face normal, degrees, 0 ≤ φ ≤ 360 (3-D only;
   * default 0, a plane containing a grid axis). The transverse wavevector is |k̃|·sin θ·(cos φ, sin φ).
   */
  azimuthDeg?: number;
  /**
   * Decay length L > 0 in cells of an evanescent (near) field e^{−d/L} along the
   * face normal, at the frequency of `ppw` (physics.md §6); exclusive with a
   * nonzero angle. Needs a 2-D or 3-D grid. |r| is referenced at the interface
   * node; no energy argument bounds it by 1 (an evanescent field carries no
   * power into the absorber), so results above 1 are allowed, though a scan of
   * 15,552 passive designs (sampling, σ, κ, α, 0.6–20 cells of decay) found
   * none above 1 (largest 0.9999999).
   */
  decayCells?: number;
}

export interface ReflectionResult {
  /** |r|, the amplitude reflection (for a near field not bounded by 1 in principle). */
  amplitude: number;
  /** arg r in degrees, at the interface (depth 0). */
  phaseDeg: number;
  re: number;
  im: number;
  /**
   * Continuous-theory amplitude reflection of the same design: exp(−2cosθ∫σ…) for a
   * propagating wave; exp(−(2/L)∫Re s dx) with s = κ + σ/(α + jω) for a near field.
   */
  continuous: number;
}

/** Checked grid quantities shared by every evaluation of one wave. */
export interface ResolvedWave {
  ppw: number;
  courant: number;
  courantMedium: number;
  dimensions: number;
  index: number;
  angleDeg: number;
  azimuthDeg: number;
  /** Decay length of a near field in cells; 0 for a propagating wave. */
  decayCells: number;
  omegaDt: number;
  /** Transverse Yee factor: sin²(k_t/2), or sin²(k_y/2) + sin²(k_z/2) in 3-D. */
  sinHalfKt2: number;
}

/** Largest decay length accepted, in cells (a longer one is a propagating wave at grazing incidence for any purpose). */
export const MAX_DECAY_CELLS = 1e6;

/**
 * Transverse factor of a near field of decay length L (cells) at ωΔt, checked
 * against what a D-dimensional grid carries: K_t²/4 ≤ D − 1 (a real transverse
 * wavenumber per transverse axis, each |k| ≤ π). Throws a HushInputError that
 * states the shortest decay the grid carries at this frequency.
 */
export function checkedEvanescentFactor(field: string, decayCells: number, omegaDt: number, courantMedium: number, dimensions: number, ppw: number): number {
  if (dimensions === 1) {
    throw new HushInputError(field, `a 1-D grid has no transverse direction, so no evanescent field (got a decay length of ${decayCells} cells)`);
  }
  const f = evanescentFactorUnchecked(omegaDt, courantMedium, decayCells);
  if (f > dimensions - 1) {
    const st = Math.sin(omegaDt / 2) / courantMedium;
    const shortest = 1 / (2 * Math.asinh(Math.sqrt(dimensions - 1 - st * st)));
    throw new HushInputError(
      field,
      `a near field decaying over ${decayCells} cells at ${ppw} cells per wavelength needs a transverse wavenumber no ${dimensions}-D grid carries (K_t²/4 = ${f.toPrecision(4)} > ${dimensions - 1}); the shortest decay this grid carries at that frequency is ${shortest.toPrecision(4)} cells`,
    );
  }
  return f;
}

/** Checks a wave description and derives ωΔt and the transverse factor. */
export function resolveWave(wave: WaveSpec): ResolvedWave {
  if (wave === null || typeof wave !== 'object') {
    throw new HushInputError('wave', 'wave must be an object with at least ppw', 'value');
  }
  const dims = wholeInRange('dimensions', wave.dimensions ?? 3, 1, 3);
  const courant = checkCourant(wave.courant ?? defaultCourant(dims), dims);
  const index = inRange('background index', wave.index ?? 1, 1, 100);
  const angleDeg = inRange('angle', wave.angleDeg ?? 0, 0, 90, { hiOpen: true, unit: 'degrees' });
  const azimuthDeg = inRange('azimuth', wave.azimuthDeg ?? 0, 0, 360, { unit: 'degrees' });
  if (dims === 1 && angleDeg !== 0) {
    throw new HushInputError('angle', `a 1-D grid has normal incidence only (got angle ${angleDeg} degrees)`);
  }
  if (dims < 3 && azimuthDeg !== 0) {
    throw new HushInputError('azimuth', `a ${dims}-D grid has one plane of incidence only: the azimuth needs a 3-D grid (got ${azimuthDeg} degrees)`);
  }
  const decayGiven = wave.decayCells !== undefined;
  const decayCells = decayGiven ? inRange('decay length', wave.decayCells, 0, MAX_DECAY_CELLS, { loOpen: true, unit: 'cells' }) : 0;
  if (decayGiven && (angleDeg !== 0 || azimuthDeg !== 0)) {
    throw new HushInputError(
      'decay length',
      `give either a decay length (an evanescent near field) or an angle of incidence (a propagating wave), not both (got decay ${decayCells} cells and angle ${angleDeg}°${azimuthDeg ? `, azimuth ${azimuthDeg}°` : ''})`,
      'value',
    );
  }
  const courantMedium = courant / index;
  const ppw = checkPpw('cells per wavelength', wave.ppw, courantMedium, angleDeg);
  const omegaDt = (2 * Math.PI * courantMedium) / ppw;
  const sinHalfKt2 = decayGiven
    ? checkedEvanescentFactor('decay length', decayCells, omegaDt, courantMedium, dims, ppw)
    : transverseFactorUnchecked(ppw, courantMedium, angleDeg, azimuthDeg);
  return { ppw, courant, courantMedium, dimensions: dims, index, angleDeg, azimuthDeg, decayCells, omegaDt, sinHalfKt2 };
}

/** Scratch state for repeated evaluation; one per thread of work. */
export interface ReflectionWorkspace {
  coef: CpmlCoefficients;
  factors: NodeFactors;
  out: Float64Array;
}

export function createWorkspace(capacity = MAX_LAYERS): ReflectionWorkspace {
  return { coef: allocateCoefficients(capacity), factors: allocateFactors(capacity), out: new Float64Array(2) };
}

const shared = createWorkspace();

/** Exact reflection of an already resolved design and wave (no checks, no allocation but the result). */
export function reflectionResolved(d: ResolvedDesign, w: ResolvedWave, ws: ReflectionWorkspace = shared): ReflectionResult {
  fillCoefficients(d, w.courantMedium, ws.coef);
  fillFactors(ws.coef, w.omegaDt, ws.factors);
  reflectionKernel(ws.factors, d.layers, w.courantMedium, w.omegaDt, w.sinHalfKt2, ws.out);
  const re = ws.out[0];
  const im = ws.out[1];
  return {
    amplitude: Math.hypot(re, im),
    phaseDeg: Math.atan2(im, re) / DEG,
    re,
    im,
    continuous: w.decayCells > 0 ? continuousEvanescentUnchecked(d, w.ppw, w.decayCells) : continuousReflectionUnchecked(d, w.ppw, w.angleDeg),
  };
}

/**
 * Exact discrete amplitude and phase of the reflection of `design` for `wave`,
 * with the continuous-theory value beside it.
 * Example: reflection({ layers: 10, order: 3 }, { ppw: 20 }).amplitude ≈ 2.5e-5
 * (see tests/reflection.test.ts for the exact value).
 */
export function reflection(design: AbsorberDesign, wave: WaveSpec): ReflectionResult {
  return reflectionResolved(resolveDesign(design), resolveWave(wave));
}

/**
 * Reflection for a wave given directly by its phase step ωΔt and transverse
 * wavenumber k_t (radians per cell), as a periodic time-domain grid defines it.
 * Checks 0 < ωΔt ≤ π, |k_t| ≤ π, and the Courant number in the medium against
 * the 1-D limit (k_t = 0) or the 2-D limit 1/√2 (k_t ≠ 0 needs a second axis).
 * A k_t beyond the frequency's grazing point gives the near field's reflection
 * (evanescent along x, physics.md §6); the grazing point itself is refused.
 */
export function reflectionAtWavenumber(
  design: AbsorberDesign,
  omegaDt: number,
  kt: number,
  courantMedium: number,
): { re: number; im: number; amplitude: number } {
  checkWaveStep(omegaDt, kt);
  const sk = Math.sin(kt / 2);
  return reflectionAtTransverseFactor(design, omegaDt, sk * sk, checkCourantMedium(courantMedium, kt === 0 ? 1 : 2));
}

/**
 * Reflection for a wave given by its phase step ωΔt and transverse factor
 * K_t²/4 (sin²(k_t/2) in 2-D, sin²(k_y/2) + sin²(k_z/2) in 3-D), 0 ≤ K_t²/4 ≤ 2.
 * The grazing point (k̃_x = 0) and waves beyond the grid's upper cut-off
 * (sin²(k̃_x/2) > 1) are refused. Used by the time-domain measurements.
 */
export function reflectionAtTransverseFactor(
  design: AbsorberDesign,
  omegaDt: number,
  transverseFactor: number,
  courantMedium: number,
): { re: number; im: number; amplitude: number } {
  const d = resolveDesign(design);
  inRange('phase step ωΔt', omegaDt, 0, Math.PI, { loOpen: true, unit: 'radians per step' });
  const f = inRange('transverse factor', transverseFactor, 0, 2);
  courantMedium = checkCourantMedium(courantMedium, f === 0 ? 1 : 2);
  const st = Math.sin(omegaDt / 2) / courantMedium;
  const x = st * st - f;
  if (x === 0) throw new HushInputError('transverse wavenumber', 'the wave is at grazing incidence (k̃_x = 0): incident and reflected waves coincide');
  if (x > 1) throw new HushInputError('phase step ωΔt', 'the wave is beyond the grid\'s upper cut-off along the normal (sin²(k̃_x/2) > 1)');
  fillCoefficients(d, courantMedium, shared.coef);
  fillFactors(shared.coef, omegaDt, shared.factors);
  reflectionKernel(shared.factors, d.layers, courantMedium, omegaDt, f, shared.out);
  return { re: shared.out[0], im: shared.out[1], amplitude: Math.hypot(shared.out[0], shared.out[1]) };
}

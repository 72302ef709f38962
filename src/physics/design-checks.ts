/**
 * The samples a design must pass and the worst reflection over them: the
 * band (uniform in frequency) and the angles and azimuths (uniform in degrees)
 * of a resolved spec, grouped by the coefficient set they share (a medium and
 * a sampling convention, propagating waves or the near field), each group
 * with its kernel constants computed once (fillSample); `worstReflection`
 * scans them for one design with an early exit, `amplitudeAt` evaluates one
 * point between them (the dense check's climbs). The search (design.ts)
 * builds its search grid, screen and dense grid from `designChecks`.
 * The work is counted in layer-evaluations (designWork).
 */
import { discreteWavenumberUnchecked, evanescentFactorUnchecked, transverseFactorUnchecked } from './dispersion';
import { fillCoefficients } from './cpml';
import { resolveDesign, type ResolvedDesign, type SamplingConvention } from './grading';
import { SAMPLE_STRIDE, fillFactors, fillFactorsAt, fillSample, reflectionKernel, sampledKernels, type ReflectionWorkspace } from './reflection';
import type { ResolvedSpec } from './design';

/** Samples of (frequency, angle) with their grid quantities (in-plane, one medium), computed once per spec. */
export interface SampleGrid {
  ppw: Float64Array;
  angleDeg: Float64Array;
  omegaDt: Float64Array;
  /** sin²(k_t/2) per [frequency * angles + angle]. */
  sinHalfKt2: Float64Array;
}

/**
 * Sample grid over the band (uniform in frequency, i.e. in 1/ppw) and angles
 * (uniform in degrees), with `nf` × `na` points including the ends (in-plane, one medium).
 */
export function sampleGrid(ppwMin: number, ppwMax: number, angleMaxDeg: number, courantMedium: number, nf: number, na: number): SampleGrid {
  const ppw = bandSamples(ppwMin, ppwMax, nf);
  const angleDeg = rangeSamples(angleMaxDeg, na);
  const f = ppw.length;
  const a = angleDeg.length;
  const omegaDt = new Float64Array(f);
  const sinHalfKt2 = new Float64Array(f * a);
  for (let i = 0; i < f; i++) {
    omegaDt[i] = (2 * Math.PI * courantMedium) / ppw[i];
    for (let j = 0; j < a; j++) sinHalfKt2[i * a + j] = factorOf(ppw[i], courantMedium, angleDeg[j], 0);
  }
  return { ppw, angleDeg, omegaDt, sinHalfKt2 };
}

function bandSamples(ppwMin: number, ppwMax: number, nf: number): Float64Array {
  const f = ppwMax === ppwMin ? 1 : nf;
  const ppw = new Float64Array(f);
  const fHi = 1 / ppwMin;
  const fLo = 1 / ppwMax;
  for (let i = 0; i < f; i++) {
    const nu = f === 1 ? fHi : fHi + ((fLo - fHi) * i) / (f - 1);
    ppw[i] = i === 0 ? ppwMin : i === f - 1 ? ppwMax : 1 / nu;
  }
  return ppw;
}

function rangeSamples(max: number, n: number): Float64Array {
  const a = max === 0 ? 1 : n;
  const out = new Float64Array(a);
  for (let j = 0; j < a; j++) out[j] = a === 1 ? max : (max * j) / (a - 1);
  return out;
}

/** Transverse factor of the propagating wave at (ppw, θ, φ); at φ = 0 the in-plane expression the search has always used. */
function factorOf(ppw: number, courantMedium: number, angleDeg: number, azimuthDeg: number): number {
  if (azimuthDeg !== 0) return transverseFactorUnchecked(ppw, courantMedium, angleDeg, azimuthDeg);
  const th = (angleDeg * Math.PI) / 180;
  const q = discreteWavenumberUnchecked(ppw, courantMedium, angleDeg);
  const s = Math.sin((q * Math.sin(th)) / 2);
  return s * s;
}

/**
 * One set of samples that shares the absorber's coefficients: a medium and a
 * sampling convention, for propagating waves (frequencies × angles × azimuths)
 * or for the near field (frequencies, each with its decay length and gap weight).
 */
export interface CheckGroup {
  evanescent: boolean;
  /** Index n_j of the medium, and n_j/n, the factor on σ_norm and α_norm. */
  index: number;
  scale: number;
  courantMedium: number;
  sampling: SamplingConvention;
  /** Cells per wavelength in the background (the band's coordinate) and in this medium. */
  ppw: Float64Array;
  ppwMedium: Float64Array;
  omegaDt: Float64Array;
  angleDeg: Float64Array;
  azimuthDeg: Float64Array;
  /** Transverse factor per [(frequency·angles + angle)·azimuths + azimuth]. */
  factor: Float64Array;
  /** Near field: weight e^{−2·gap/L} and decay length L per frequency; null for propagating groups. */
  weight: Float64Array | null;
  decay: Float64Array | null;
  /**
   * The kernel's constants of every sample (fillSample), `perFrequency` per
   * frequency in the order the scans take them (angles, then azimuths, from
   * the largest; one azimuth at normal incidence): they do not depend on the design.
   */
  samples: Float64Array;
  perFrequency: number;
  /** cos ωΔt and sin ωΔt per frequency, for the node factors (fillFactorsAt). */
  cosDt: Float64Array;
  sinDt: Float64Array;
}

/** A group's sample table (CheckGroup.samples) and how many samples each frequency has. */
function sampleTable(
  sm: number,
  omegaDt: Float64Array,
  angleDeg: Float64Array,
  azimuthDeg: Float64Array,
  factor: Float64Array,
): { samples: Float64Array; perFrequency: number; cosDt: Float64Array; sinDt: Float64Array } {
  const na = angleDeg.length;
  const nz = azimuthDeg.length;
  let perFrequency = 0;
  for (let j = 0; j < na; j++) perFrequency += angleDeg[j] === 0 ? 1 : nz;
  const samples = new Float64Array(omegaDt.length * perFrequency * SAMPLE_STRIDE);
  let count = 0;
  for (let i = 0; i < omegaDt.length; i++) {
    for (let j = na - 1; j >= 0; j--) {
      for (let z = angleDeg[j] === 0 ? 0 : nz - 1; z >= 0; z--) {
        fillSample(sm, omegaDt[i], factor[(i * na + j) * nz + z], samples, count * SAMPLE_STRIDE);
        count++;
      }
    }
  }
  const cosDt = new Float64Array(omegaDt.length);
  const sinDt = new Float64Array(omegaDt.length);
  for (let i = 0; i < omegaDt.length; i++) {
    cosDt[i] = Math.cos(omegaDt[i]);
    sinDt[i] = Math.sin(omegaDt[i]);
  }
  return { samples, perFrequency, cosDt, sinDt };
}

/** Every sample a design must pass, grouped by coefficient set. */
export interface DesignChecks {
  groups: CheckGroup[];
}

/**
 * The checks of a spec on a grid of nf frequencies, na angles and nz azimuths.
 * `primary`: every medium but only the first convention, in-plane (azimuth 0),
 * with the near field of that convention — a subset of the checks, so a design
 * that fails it fails them all.
 */
export function designChecks(rs: ResolvedSpec, nf: number, na: number, nz: number, primary = false): DesignChecks {
  const ppw = bandSamples(rs.ppwMin, rs.ppwMax, nf);
  const angleDeg = rangeSamples(rs.angleMaxDeg, na);
  const azimuthDeg = rangeSamples(primary ? 0 : rs.azimuthMaxDeg, nz);
  const f = ppw.length;
  const groups: CheckGroup[] = [];
  for (const nj of rs.absorberIndices) {
    const scale = nj / rs.index;
    const sm = rs.courant / nj;
    const ppwMedium = new Float64Array(f);
    const omegaDt = new Float64Array(f);
    const factor = new Float64Array(f * angleDeg.length * azimuthDeg.length);
    for (let i = 0; i < f; i++) {
      ppwMedium[i] = scale === 1 ? ppw[i] : ppw[i] / scale;
      omegaDt[i] = (2 * Math.PI * sm) / ppwMedium[i];
      for (let j = 0; j < angleDeg.length; j++) {
        for (let k = 0; k < azimuthDeg.length; k++) {
          factor[(i * angleDeg.length + j) * azimuthDeg.length + k] = factorOf(ppwMedium[i], sm, angleDeg[j], azimuthDeg[k]);
        }
      }
    }
    const table = sampleTable(sm, omegaDt, angleDeg, azimuthDeg, factor);
    for (const sampling of primary ? rs.samplings.slice(0, 1) : rs.samplings) {
      groups.push({ evanescent: false, index: nj, scale, courantMedium: sm, sampling, ppw, ppwMedium, omegaDt, angleDeg, azimuthDeg, factor, weight: null, decay: null, ...table });
    }
  }
  if (rs.decayMinCells > 0) {
    const sm = rs.courantMedium;
    const omegaDt = new Float64Array(f);
    const factor = new Float64Array(f);
    const weight = new Float64Array(f);
    const decay = new Float64Array(f);
    for (let i = 0; i < f; i++) {
      omegaDt[i] = (2 * Math.PI * sm) / ppw[i];
      decay[i] = (rs.decayMinCells * ppw[i]) / rs.ppwMin;
      factor[i] = evanescentFactorUnchecked(omegaDt[i], sm, decay[i]);
      weight[i] = Math.exp((-2 * rs.gapCells) / decay[i]);
    }
    const zero = new Float64Array(1);
    const table = sampleTable(sm, omegaDt, zero, zero, factor);
    for (const sampling of primary ? rs.samplings.slice(0, 1) : rs.samplings) {
      groups.push({ evanescent: true, index: rs.index, scale: 1, courantMedium: sm, sampling, ppw, ppwMedium: ppw, omegaDt, angleDeg: zero, azimuthDeg: zero, factor, weight, decay, ...table });
    }
  }
  return { groups };
}

/** Worst weighted |r| of a design over the checks, and where. Stops early (returning a value > bound) once a sample exceeds `bound`. */
export interface Worst {
  amplitude: number;
  group: number;
  frequency: number;
  angle: number;
  azimuth: number;
}

export function newWorst(): Worst {
  return { amplitude: 0, group: 0, frequency: 0, angle: 0, azimuth: 0 };
}

/**
 * Work done by the design search so far: kernel evaluations weighted by their
 * layer count (one unit = one layer of one reflection evaluation). A
 * deterministic measure of cost, independent of the machine and its load;
 * tests bound it per call, `npm run bench` converts it to time.
 */
// A typed cell: a module-level number beyond the small-integer range would be boxed anew at every update.
export const layerEvaluations = new Float64Array(1);

/** Cumulative layer-evaluations of the design search (see above). */
export function designWork(): number {
  return layerEvaluations[0];
}

/** The design as group `g` sees it: σ and α scaled to its medium, its sampling convention. */
export function groupDesign(d: ResolvedDesign, g: CheckGroup, out: ResolvedDesign): ResolvedDesign {
  if (g.scale === 1 && d.sampling === g.sampling) return d;
  out.layers = d.layers;
  out.order = d.order;
  out.strength = g.scale === 1 ? d.strength : d.strength * g.scale;
  out.kappaMax = d.kappaMax;
  out.alphaMaxNorm = g.scale === 1 ? d.alphaMaxNorm : d.alphaMaxNorm * g.scale;
  out.alphaOrder = d.alphaOrder;
  out.grading = d.grading;
  out.geometricRatio = d.geometricRatio;
  out.sampling = g.sampling;
  return out;
}

export const scratchDesign: ResolvedDesign = resolveDesign({ layers: 1, order: 1 });

/** frequencyKernels' [re, im] of one frequency's samples, grown as needed. */
let searchOut = new Float64Array(0);

/** The [re, im] pairs the last frequencyKernels call wrote (valid until the next call). */
export function kernelOut(): Float64Array {
  return searchOut;
}

/**
 * r at every sample of frequency i of group g (its directions in the scans' order, `g.samples`)
 * into searchOut, with `ws.coef` holding the group's coefficients; returns the number of samples.
 */
export function frequencyKernels(g: CheckGroup, i: number, N: number, ws: ReflectionWorkspace): number {
  fillFactorsAt(ws.coef, g.cosDt[i], g.sinDt[i], ws.factors);
  const count = g.perFrequency;
  if (searchOut.length < 2 * count) searchOut = new Float64Array(2 * count);
  sampledKernels(ws.factors, N, g.samples, i * count, count, searchOut);
  return count;
}

/**
 * Worst weighted |r| (|r|, times e^{−2·gap/L} for the near field) of `d` over
 * `checks`, starting from the group and frequency of `start` (the previous
 * worst, so an early exit comes soon) and stopping once a value exceeds `bound`.
 */
export function worstReflection(
  d: ResolvedDesign,
  checks: DesignChecks,
  ws: ReflectionWorkspace,
  bound = Infinity,
  start: Worst | null = null,
  out: Worst = newWorst(),
): Worst {
  const groups = checks.groups;
  const G = groups.length;
  const g0 = start ? start.group % G : 0;
  let worst = -1;
  let wg = 0;
  let wf = 0;
  let wa = 0;
  let wz = 0;
  let evaluated = 0;
  const N = d.layers;
  // The group whose coefficients ws.coef holds (a near-field group usually has its propagating group's).
  let filled: CheckGroup | null = null;
  search: for (let gg = 0; gg < G; gg++) {
    const gi = (gg + g0) % G;
    const g = groups[gi];
    const sm = g.courantMedium;
    if (!filled || filled.scale !== g.scale || filled.sampling !== g.sampling || filled.courantMedium !== sm) {
      fillCoefficients(groupDesign(d, g, scratchDesign), sm, ws.coef);
      filled = g;
    }
    const nf = g.ppw.length;
    const na = g.angleDeg.length;
    const nz = g.azimuthDeg.length;
    const f0 = start && gi === g0 ? start.frequency % nf : 0;
    for (let k = 0; k < nf; k++) {
      const i = (k + f0) % nf;
      const w = g.weight ? g.weight[i] : 1;
      // Every direction of this frequency in one pass over the layers, then scanned in the order
      // the search has always used, with the same early exit.
      evaluated += frequencyKernels(g, i, N, ws);
      let at = 0;
      for (let j = na - 1; j >= 0; j--) {
        for (let z = g.angleDeg[j] === 0 ? 0 : nz - 1; z >= 0; z--) {
          const re = searchOut[2 * at];
          const im = searchOut[2 * at + 1];
          at++;
          const amp = Math.sqrt(re * re + im * im) * w;
          if (amp > worst) {
            worst = amp;
            wg = gi;
            wf = i;
            wa = j;
            wz = z;
            if (worst > bound) break search;
          }
        }
      }
    }
  }
  layerEvaluations[0] += evaluated * N;
  out.amplitude = worst;
  out.group = wg;
  out.frequency = wf;
  out.angle = wa;
  out.azimuth = wz;
  return out;
}

/** ωΔt whose node factors `ws.factors` holds for amplitudeAt (NaN: none); a climb in angle keeps ω and reuses them. */
let factorsOmega = NaN;

/** Forgets which ωΔt `ws.factors` holds (after its coefficients were refilled elsewhere). */
export function forgetFactors(): void {
  factorsOmega = NaN;
}

/** One exact evaluation of group `g` at background ppw, angle and azimuth; `ws.coef` must hold the group's coefficients. Returns the weighted |r|. */
export function amplitudeAt(layers: number, g: CheckGroup, rs: ResolvedSpec, ws: ReflectionWorkspace, ppw: number, angleDeg: number, azimuthDeg: number): number {
  const pm = g.scale === 1 ? ppw : ppw / g.scale;
  const sm = g.courantMedium;
  const om = (2 * Math.PI * sm) / pm;
  let f: number;
  let w = 1;
  if (g.evanescent) {
    const L = (rs.decayMinCells * ppw) / rs.ppwMin;
    f = evanescentFactorUnchecked(om, sm, L);
    w = Math.exp((-2 * rs.gapCells) / L);
  } else f = factorOf(pm, sm, angleDeg, azimuthDeg);
  if (om !== factorsOmega) {
    fillFactors(ws.coef, om, ws.factors);
    factorsOmega = om;
  }
  reflectionKernel(ws.factors, layers, sm, om, f, ws.out);
  layerEvaluations[0] += layers;
  return Math.hypot(ws.out[0], ws.out[1]) * w;
}


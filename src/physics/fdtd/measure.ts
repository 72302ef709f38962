/**
 * Time-domain measurement of the amplitude reflection of a CPML design
 * (physics.md §3, "Measuring reflection"): two runs with identical grids near
 * the source, one ending in the absorber, one lossless and long enough that
 * nothing returns within the record (both start from the same far-left
 * termination). The echo at a monitor between source and absorber is
 * E_abs − E_ref; r(ω) = DTFT(echo)/DTFT(incident) at chosen ωΔt, with the
 * propagation phase e^{−2j·k̃_x·D} over the monitor-to-interface distance D
 * removed using the discrete k̃_x. Both records hold the whole response, so the
 * ratio is the exact discrete transfer function and can be set beside the
 * exact model `reflectionAtWavenumber`.
 *
 * 1-D: a CPML line at normal incidence. 2-D: a TMz grid periodic in y with Ny
 * cells, source profile cos(k_t·j), k_t = 2πM/Ny, so every frequency meets the
 * boundary at its own angle θ(ω) = atan2(k_t, k̃_x(ω)).
 *
 * The async routines advance in chunks and yield a macrotask between chunks so
 * a Web Worker can receive a cancel message; they throw MeasurementCancelled
 * when `signal.aborted` is set. The synchronous `createMeasurement…` objects
 * expose the same run step by step.
 */
import { cpmlCoefficients, type CpmlCoefficients } from '../cpml';
import { checkSampling, resolveDesign, type AbsorberDesign, type ResolvedDesign, type SamplingConvention } from '../grading';
import { DEFAULT_COURANT, checkCourant } from '../courant';
import { checkPpw, discreteAngle, discreteWavenumberUnchecked, evanescentFactorUnchecked } from '../dispersion';
import { reflectionAtTransverseFactor } from '../reflection';
import { HushInputError } from '../errors';
import { inRange, wholeInRange } from '../validate';
import { CpmlLine } from './line';
import { TmzGrid2D } from './tmz';
import { ModeLine } from './mode-line';
import { dtftAt } from './dtft';
import { CUTOFF_LEVEL, EDGE_LEVEL_MIN, EDGE_LEVEL_TARGET, fillPulse, planPulse, type PulsePlan } from './pulse';

const DEG = Math.PI / 180;

/** Thrown by the async measurements when their signal is aborted. */
export class MeasurementCancelled extends Error {
  constructor(message = 'reflection measurement cancelled') {
    super(message);
    this.name = 'MeasurementCancelled';
  }
}

export function isMeasurementCancelled(e: unknown): e is MeasurementCancelled {
  return e instanceof MeasurementCancelled;
}

/**
 * Far-left termination shared by both runs. Its own reflection (≈ 2e-8 at 6
 * cells per wavelength, ≈ 1e-9 at 20, from the exact model) only enters the
 * measured r as a relative error of that size: the echo must reflect off it once
 * more to come back to the monitor.
 */
export const FAR_LEFT_TERMINATION: AbsorberDesign = { layers: 48, order: 4 };
/** The termination of a 'terminated' reference run: thick enough that its reflection is ≈ 1e-12 or below over 20–200 cells per wavelength up to 70° (exact model, physics.md §3). */
export const REFERENCE_TERMINATION: AbsorberDesign = { layers: 160, order: 4 };
/** Cells between the monitor and a reference termination (propagating waves; a near field gets NEAR_FIELD_LEFT_GAP_PER_DECAY per cell of decay). */
const REFERENCE_GAP = 20;
/** Cells between the far-left termination and the source. */
const LEFT_GAP = 10;
/** Cells from the source to the monitor. */
const SOURCE_TO_MONITOR = 5;
/** Default cells from the monitor to the absorber interface. */
const DEFAULT_MONITOR_DISTANCE = 10;
/** Accepted miss of the requested angle at the band centre before a higher mode M is tried (each frequency reports its own angle). */
const ANGLE_TOLERANCE_DEG = 1;
/** Default number of measured frequencies. */
const DEFAULT_FREQUENCIES = 9;
/** Spectral level (relative to the peak) above which agreement is judged. */
export const SPECTRUM_THRESHOLD = 1e-3;
/** Largest run accepted, in cell updates (both runs together). */
export const MAX_CELL_UPDATES = 4e9;
/** Largest cells per wavelength accepted (longer waves need impractically long records). */
const MAX_PPW = 400;
/** Cell updates per chunk of the async routines (≈ 10–20 ms of work). */
const DEFAULT_CHUNK = 2_000_000;

export interface MeasureOptions1D {
  /** Vacuum Courant number cΔt/Δ; default 0.99/√3. */
  courant?: number;
  /** Background index n ≥ 1; default 1. */
  index?: number;
  /** Cells per wavelength (in the medium) at the short-wavelength end of the band. */
  ppwLow: number;
  /** Cells per wavelength at the long-wavelength end. */
  ppwHigh: number;
  /** Number of evenly spaced frequencies (default 9), or explicit cells-per-wavelength values inside the band. */
  frequencies?: number | readonly number[];
  /** Cells from the monitor to the absorber interface; default 10. */
  monitorDistance?: number;
  /**
   * The reference run: 'long' (default), a lossless region long enough that
   * nothing returns within the record; or 'terminated', ended a few cells past
   * the monitor by REFERENCE_TERMINATION, whose own reflection (a few 1e-12 or
   * less from 20 to 200 cells per wavelength at up to 70°, from the exact model)
   * then enters the measured r as a relative error of about that divided by |r|.
   * Far cheaper for long records (high cells per wavelength, angles near grazing).
   */
  reference?: 'long' | 'terminated';
  /**
   * How the time-domain grid samples the absorber's profiles onto its nodes
   * (cpml.ts); default the design's own convention. The prediction stays the
   * exact model for the design's convention, so another one here measures how
   * far a grid of that convention departs from it.
   */
  gridSampling?: SamplingConvention;
}

export interface MeasureOptions2D extends MeasureOptions1D {
  /** Angle of incidence at the band centre, 0 ≤ θ < 90 degrees. */
  angleDeg: number;
  /** Period Ny in cells; default chosen for the angle. */
  transverseCells?: number;
  /** Mode number M of the source profile cos(2πM·j/Ny); default chosen with Ny. */
  transverseModes?: number;
  /**
   * 'grid' (default): the periodic 2-D TMz grid of Ny columns. 'reduced': the
   * same grid's single mode cos(k_t·j), run exactly as one chain (mode-line.ts),
   * Ny times cheaper; the two agree to rounding (tests/verification.test.ts).
   * Without transverseCells/transverseModes the chain takes k_t exactly from
   * the angle at the band centre (no period to round it to).
   */
  engine?: 'grid' | 'reduced';
}

/**
 * A measurement on the exact reduction of a periodic 2-D grid to one transverse
 * mode (mode-line.ts), so the transverse wavenumber needs no period: give the
 * angle of incidence at the band centre (a propagating wave; each frequency
 * meets the boundary at its own angle) or the decay length there (an
 * evanescent near field; each frequency has its own decay length), or k_t itself.
 */
export interface MeasureOptionsMode extends MeasureOptions1D {
  /** Angle of incidence at the band centre, 0 ≤ θ < 90 degrees. */
  angleDeg?: number;
  /** Decay length (cells) of an evanescent field e^{−d/L} at the band centre. */
  decayCells?: number;
  /** Transverse wavenumber k_t in radians per cell, 0 ≤ k_t ≤ π. */
  transverseWavenumber?: number;
}

export interface RunControl {
  /** Called with increasing fractions of the work done, ending with 1. */
  onProgress?: (fraction: number) => void;
  /** Checked between chunks; when `aborted` is true the run throws MeasurementCancelled. */
  signal?: { aborted: boolean };
  /** Cell updates per chunk between yields; default 2e6. */
  chunkCellUpdates?: number;
}

export interface MeasuredFrequency {
  /** Cells per wavelength in the medium, 2π·S_m/(ωΔt). */
  ppw: number;
  omegaDt: number;
  /** Direction of the discrete plane wave in the interior, degrees (90 for an evanescent field). */
  angleDeg: number;
  /** Decay length L in cells of an evanescent field at this frequency; 0 for a propagating wave. */
  decayCells: number;
  /** |r| from the time-domain runs. */
  measuredAmplitude: number;
  /** arg r from the time-domain runs, degrees, at the interface. */
  measuredPhaseDeg: number;
  /** |r| from the exact model (physics.md §3). */
  predictedAmplitude: number;
  predictedPhaseDeg: number;
  /** | |r_meas| − |r_model| | / |r_model|. */
  relativeDifference: number;
  /** |DTFT(incident)| relative to its peak over the pulse's band. */
  spectrumLevel: number;
}

export interface ReflectionMeasurement {
  dimensions: 1 | 2;
  /** 'line' (1-D), 'grid' (the periodic 2-D grid) or 'reduced' (its single mode, run as one chain). */
  engine: 'line' | 'grid' | 'reduced';
  /** True when the measured field is evanescent along the normal at every frequency (a near field). */
  evanescent: boolean;
  /** The reference run used (MeasureOptions1D.reference). */
  reference: 'long' | 'terminated';
  /** The convention the prediction is exact for (the design's) and the one the grid sampled its profiles with. */
  sampling: SamplingConvention;
  gridSampling: SamplingConvention;
  courant: number;
  courantMedium: number;
  index: number;
  /** Requested angle (2-D) or 0. */
  angleDeg: number;
  /** Period Ny and mode M (1 and 0 in 1-D); k_t = 2πM/Ny. */
  transverseCells: number;
  transverseModes: number;
  transverseWavenumber: number;
  monitorDistance: number;
  pulse: PulsePlan;
  /** Steps recorded. */
  steps: number;
  /** E nodes of the absorber run and of the reference run. */
  absorberRunNodes: number;
  referenceRunNodes: number;
  cellUpdates: number;
  frequencies: MeasuredFrequency[];
  /** Largest relativeDifference among frequencies whose spectrumLevel ≥ 1e-3. */
  maxRelativeDifference: number;
  /** Largest |echo| over the last tenth of the record relative to the largest |echo|: near 0 when the record is complete. */
  echoTailLevel: number;
  /** The same tail relative to the largest incident value at the monitor: where the echo itself is tiny (a strongly decaying near field) the tail is rounding noise of about 1e-16 of this. */
  echoTailToIncident: number;
}

/** A measurement that can be advanced step by step. */
export interface MeasurementRun {
  readonly totalSteps: number;
  readonly stepsDone: number;
  /** Cell updates per step, both runs together. */
  readonly cellUpdatesPerStep: number;
  /** Advances both runs by up to `steps` steps. */
  advance(steps: number): void;
  /** The result; throws if the run is not complete. */
  result(): ReflectionMeasurement;
}

/** Phase steps for the measured frequencies. */
function chooseFrequencies(spec: number | readonly number[] | undefined, ppwLow: number, ppwHigh: number, sm: number): number[] {
  const wl = (2 * Math.PI * sm) / ppwHigh;
  const wh = (2 * Math.PI * sm) / ppwLow;
  if (spec === undefined || typeof spec === 'number') {
    const count = wholeInRange('frequencies', spec ?? DEFAULT_FREQUENCIES, 1, 1000);
    if (count === 1 || wl === wh) return [0.5 * (wl + wh)];
    const out: number[] = [];
    for (let k = 0; k < count; k++) out.push(wl + ((wh - wl) * k) / (count - 1));
    return out;
  }
  if (!Array.isArray(spec) || spec.length === 0 || spec.length > 1000) {
    throw new HushInputError('frequencies', 'frequencies must be a count or a list of 1 to 1000 cells-per-wavelength values', 'value');
  }
  return spec.map((p) => {
    const v = inRange('frequencies (cells per wavelength)', p, ppwLow, ppwHigh);
    return (2 * Math.PI * sm) / v;
  });
}

interface CommonPlan {
  /** The design the prediction is for, */
  design: ResolvedDesign;
  /** … and the one the grid runs (the same unless gridSampling differs). */
  gridDesign: ResolvedDesign;
  courant: number;
  courantMedium: number;
  index: number;
  omegas: number[];
  monitorDistance: number;
  ppwLow: number;
  ppwHigh: number;
  reference: 'long' | 'terminated';
}

function checkCommon(design: AbsorberDesign, opts: MeasureOptions1D, dims: 1 | 2, angleDeg: number): CommonPlan {
  const d = resolveDesign(design);
  if (opts === null || typeof opts !== 'object') {
    throw new HushInputError('options', 'options must be an object with at least ppwLow and ppwHigh', 'value');
  }
  const courant = checkCourant(opts.courant ?? DEFAULT_COURANT, dims);
  const index = inRange('background index', opts.index ?? 1, 1, 100);
  const sm = courant / index;
  const ppwLow = checkPpw('cells per wavelength (low)', opts.ppwLow, sm, angleDeg);
  const ppwHigh = inRange('cells per wavelength (high)', opts.ppwHigh, ppwLow, MAX_PPW);
  const monitorDistance = wholeInRange('monitor distance', opts.monitorDistance ?? DEFAULT_MONITOR_DISTANCE, 1, 1000);
  const omegas = chooseFrequencies(opts.frequencies, ppwLow, ppwHigh, sm);
  const reference = opts.reference ?? 'long';
  if (reference !== 'long' && reference !== 'terminated') {
    throw new HushInputError('reference', `reference must be "long" or "terminated" (got ${JSON.stringify(reference)})`, 'value');
  }
  const gridDesign = opts.gridSampling === undefined ? d : { ...d, sampling: checkSampling(opts.gridSampling) };
  return { design: d, gridDesign, courant, courantMedium: sm, index, omegas, monitorDistance, ppwLow, ppwHigh, reference };
}

/**
 * Group velocity along x in cells per step of the mode (ωΔt, k_t):
 * dω/dk_x = S_m²·sin k̃_x / sin ωΔt (derived from the Yee dispersion relation,
 * physics.md §4). 0 where the mode does not propagate.
 */
export function groupVelocityX(omegaDt: number, kt: number, courantMedium: number): number {
  const st = Math.sin(omegaDt / 2) / courantMedium;
  const sk = Math.sin(kt / 2);
  const x = st * st - sk * sk;
  if (!(x > 0 && x < 1)) return 0;
  const kx = 2 * Math.asin(Math.sqrt(x));
  return (courantMedium * courantMedium * Math.sin(kx)) / Math.sin(omegaDt);
}

/** Grazing (k̃_x = 0) and upper (k̃_x = π or ωΔt = π) cut-offs of the mode k_t. */
function cutoffs(kt: number, sm: number): { low: number; high: number } {
  const sk = Math.sin(kt / 2);
  const low = kt === 0 ? 0 : 2 * Math.asin(Math.min(1, sm * Math.abs(sk)));
  const top = sm * Math.sqrt(1 + sk * sk);
  const high = top >= 1 ? Math.PI : 2 * Math.asin(top);
  return { low, high };
}

interface Timing {
  pulse: PulsePlan;
  waveform: Float64Array;
  steps: number;
  referenceRight: number;
}

/** Pulse, record length and reference length for the geometry. */
function planTiming(c: CommonPlan, kt: number): Timing {
  const wl = Math.min(...c.omegas, (2 * Math.PI * c.courantMedium) / c.ppwHigh);
  const wh = Math.max(...c.omegas, (2 * Math.PI * c.courantMedium) / c.ppwLow);
  const cut = cutoffs(kt, c.courantMedium);
  const pulse = planPulse(wl, wh, cut.low, cut.high);
  // Slowest x group velocity among components above the SLOW_LEVEL of the spectrum.
  let vMin = Infinity;
  const lo = Math.max(pulse.centreOmegaDt - pulse.slowHalfWidth, cut.low);
  const hi = Math.min(pulse.centreOmegaDt + pulse.slowHalfWidth, cut.high);
  for (let k = 0; k <= 64; k++) {
    const w = lo + ((hi - lo) * k) / 64;
    const v = groupVelocityX(w, kt, c.courantMedium);
    if (v > 0) vMin = Math.min(vMin, v);
  }
  if (!(vMin < Infinity)) vMin = groupVelocityX(pulse.centreOmegaDt, kt, c.courantMedium);
  // Round trip from the source past the monitor into the absorber (slowed by up to κ_max) and back.
  const path = SOURCE_TO_MONITOR + 2 * c.monitorDistance + 2 * c.design.layers * c.design.kappaMax;
  const steps = pulse.length + Math.ceil((1.3 * path) / vMin) + Math.ceil(2 * pulse.width) + 64;
  // Nothing travels faster than the medium speed (S_m cells per step) by more than a negligible precursor.
  const referenceRight = Math.ceil(0.55 * steps * c.courantMedium) + SOURCE_TO_MONITOR + c.monitorDistance + 20;
  return { pulse, waveform: fillPulse(pulse, new Float64Array(pulse.length)), steps, referenceRight };
}

interface Analysis {
  kt: number;
  angleDeg: number;
  transverseCells: number;
  transverseModes: number;
  engine: 'line' | 'grid' | 'reduced';
  evanescent: boolean;
}

/**
 * Normal wavenumber of the mode (ωΔt, k_t) on the lossless grid: sin²(k̃_x/2) =
 * sin²(ωΔt/2)/S_m² − sin²(k_t/2) (physics.md §3). Propagating: kx real, angle;
 * evanescent (negative right side): k̃_x = −j·q with sinh²(q/2) = −(…), decay L = 1/q.
 */
function normalWave(omegaDt: number, kt: number, sm: number): { kx: number; angleDeg: number; q: number } {
  const st = Math.sin(omegaDt / 2) / sm;
  const sk = Math.sin(kt / 2);
  const x = st * st - sk * sk;
  if (x < 0) return { kx: 0, angleDeg: 90, q: 2 * Math.asinh(Math.sqrt(-x)) };
  const { kx, angleDeg } = discreteAngle(omegaDt, kt, sm);
  return { kx, angleDeg, q: 0 };
}

function analyse(
  c: CommonPlan,
  a: Analysis,
  dims: 1 | 2,
  t: Timing,
  recAbs: Float64Array,
  recRef: Float64Array,
  nodesAbs: number,
  nodesRef: number,
): ReflectionMeasurement {
  const T = t.steps;
  const echo = new Float64Array(T);
  let peakEcho = 0;
  for (let n = 0; n < T; n++) {
    echo[n] = recAbs[n] - recRef[n];
    peakEcho = Math.max(peakEcho, Math.abs(echo[n]));
  }
  let tail = 0;
  for (let n = Math.floor(0.9 * T); n < T; n++) tail = Math.max(tail, Math.abs(echo[n]));
  let peakIncident = 0;
  for (let n = 0; n < T; n++) peakIncident = Math.max(peakIncident, Math.abs(recRef[n]));
  const z = new Float64Array(2);
  // Peak of the incident spectrum: a scan over the pulse's main lobe plus the measured frequencies.
  let peak = 0;
  const w0 = t.pulse.centreOmegaDt;
  const spread = 3 / t.pulse.width;
  const scanLow = Math.max(w0 - spread, 1e-6);
  for (let k = 0; k <= 64; k++) {
    dtftAt(recRef, T, scanLow + ((w0 + spread - scanLow) * k) / 64, z);
    peak = Math.max(peak, Math.hypot(z[0], z[1]));
  }
  const sm = c.courantMedium;
  const rows: MeasuredFrequency[] = [];
  for (const w of c.omegas) {
    dtftAt(recRef, T, w, z);
    const iRe = z[0];
    const iIm = z[1];
    dtftAt(echo, T, w, z);
    const eRe = z[0];
    const eIm = z[1];
    peak = Math.max(peak, Math.hypot(iRe, iIm));
    const dd = iRe * iRe + iIm * iIm;
    const qRe = (eRe * iRe + eIm * iIm) / dd;
    const qIm = (eIm * iRe - eRe * iIm) / dd;
    const { kx, angleDeg, q } = normalWave(w, a.kt, sm);
    let rRe: number;
    let rIm: number;
    if (q > 0) {
      // Evanescent: undo the decay monitor → interface → monitor, e^{+2D/L} (physics.md §6).
      const gain = Math.exp(2 * q * c.monitorDistance);
      rRe = qRe * gain;
      rIm = qIm * gain;
    } else {
      // Undo the round trip monitor → interface → monitor: multiply by e^{+2j·k̃_x·D}.
      const ph = 2 * kx * c.monitorDistance;
      rRe = qRe * Math.cos(ph) - qIm * Math.sin(ph);
      rIm = qRe * Math.sin(ph) + qIm * Math.cos(ph);
    }
    const sk = Math.sin(a.kt / 2);
    const model = reflectionAtTransverseFactor(c.design, w, sk * sk, sm);
    const measured = Math.hypot(rRe, rIm);
    rows.push({
      ppw: (2 * Math.PI * sm) / w,
      omegaDt: w,
      angleDeg,
      decayCells: q > 0 ? 1 / q : 0,
      measuredAmplitude: measured,
      measuredPhaseDeg: Math.atan2(rIm, rRe) / DEG,
      predictedAmplitude: model.amplitude,
      predictedPhaseDeg: Math.atan2(model.im, model.re) / DEG,
      relativeDifference: Math.abs(measured - model.amplitude) / model.amplitude,
      spectrumLevel: Math.hypot(iRe, iIm),
    });
  }
  let worst = 0;
  for (const r of rows) {
    r.spectrumLevel /= peak;
    if (r.spectrumLevel >= SPECTRUM_THRESHOLD) worst = Math.max(worst, r.relativeDifference);
  }
  return {
    dimensions: dims,
    engine: a.engine,
    evanescent: a.evanescent,
    reference: c.reference,
    sampling: c.design.sampling,
    gridSampling: c.gridDesign.sampling,
    courant: c.courant,
    courantMedium: sm,
    index: c.index,
    angleDeg: a.angleDeg,
    transverseCells: a.transverseCells,
    transverseModes: a.transverseModes,
    transverseWavenumber: a.kt,
    monitorDistance: c.monitorDistance,
    pulse: t.pulse,
    steps: T,
    absorberRunNodes: nodesAbs,
    referenceRunNodes: nodesRef,
    cellUpdates: T * (nodesAbs + nodesRef),
    frequencies: rows,
    maxRelativeDifference: worst,
    echoTailLevel: peakEcho > 0 ? tail / peakEcho : 0,
    echoTailToIncident: peakIncident > 0 ? tail / peakIncident : 0,
  };
}

function checkWork(steps: number, nodes: number): void {
  const work = steps * nodes;
  if (work > MAX_CELL_UPDATES) {
    throw new HushInputError(
      'band',
      `this measurement would need ${work.toExponential(2)} cell updates (limit ${MAX_CELL_UPDATES.toExponential(0)}); use a wider band of fewer cells per wavelength, or a smaller angle`,
    );
  }
}

/** Lossless cells of the reference run to the right of the source's gap, and its right termination (null: a conductor far enough away). */
function referenceGeometry(c: CommonPlan, t: Timing, rightGap: number): { cells: number; right: CpmlCoefficients | null } {
  if (c.reference === 'long') return { cells: t.referenceRight, right: null };
  return { cells: SOURCE_TO_MONITOR + Math.max(rightGap, c.monitorDistance + REFERENCE_GAP), right: cpmlCoefficients(resolveDesign(REFERENCE_TERMINATION), c.courantMedium) };
}

/**
 * A measurement as a pair of runs (absorber, reference) recorded at one probe:
 * `steps(k, from, recAbs, recRef)` advances both by k steps from step `from`,
 * `finish` analyses the complete records.
 */
function pairRun(
  totalSteps: number,
  cellUpdatesPerStep: number,
  steps: (k: number, from: number, recAbs: Float64Array, recRef: Float64Array) => void,
  finish: (recAbs: Float64Array, recRef: Float64Array) => ReflectionMeasurement,
): MeasurementRun {
  const recAbs = new Float64Array(totalSteps);
  const recRef = new Float64Array(totalSteps);
  let done = 0;
  return {
    totalSteps,
    get stepsDone() {
      return done;
    },
    cellUpdatesPerStep,
    advance(n: number) {
      const k = Math.min(Math.max(0, Math.floor(n)), totalSteps - done);
      steps(k, done, recAbs, recRef);
      done += k;
    },
    result() {
      if (done < totalSteps) throw new Error(`measurement not complete (${done} of ${totalSteps} steps)`);
      return finish(recAbs, recRef);
    },
  };
}

/** A 1-D measurement at normal incidence, ready to advance step by step. */
export function createMeasurement1D(design: AbsorberDesign, opts: MeasureOptions1D): MeasurementRun {
  const c = checkCommon(design, opts, 1, 0);
  const t = planTiming(c, 0);
  const left = cpmlCoefficients(resolveDesign(FAR_LEFT_TERMINATION), c.courantMedium);
  const right = cpmlCoefficients(c.gridDesign, c.courantMedium);
  const near = LEFT_GAP + SOURCE_TO_MONITOR + c.monitorDistance;
  const abs = new CpmlLine({ cells: near, courantMedium: c.courantMedium, left, right });
  const rg = referenceGeometry(c, t, 0);
  const ref = new CpmlLine({ cells: LEFT_GAP + rg.cells, courantMedium: c.courantMedium, left, right: rg.right });
  checkWork(t.steps, abs.nodes + ref.nodes);
  const source = abs.leftInterface + LEFT_GAP;
  const probe = source + SOURCE_TO_MONITOR;
  return pairRun(
    t.steps,
    abs.nodes + ref.nodes,
    (k, from, recAbs, recRef) => {
      abs.advance(k, from, t.waveform, source, recAbs, probe);
      ref.advance(k, from, t.waveform, source, recRef, probe);
    },
    (recAbs, recRef) => analyse(c, { kt: 0, angleDeg: 0, transverseCells: 1, transverseModes: 0, engine: 'line', evanescent: false }, 1, t, recAbs, recRef, abs.nodes, ref.nodes),
  );
}

/** Period Ny and mode M whose k_t = 2πM/Ny gives the requested angle at phase step ω₀Δt. */
export function chooseTransverseMode(angleDeg: number, omegaDt: number, courantMedium: number): { cells: number; modes: number } {
  if (angleDeg === 0) return { cells: 1, modes: 0 };
  const ppw = (2 * Math.PI * courantMedium) / omegaDt;
  const q = discreteWavenumberUnchecked(ppw, courantMedium, angleDeg);
  const kt = q * Math.sin(angleDeg * DEG);
  let best = { cells: 0, modes: 0, err: Infinity };
  for (let m = 1; m <= 8; m++) {
    const ny = Math.max(2 * m + 1, Math.round((2 * Math.PI * m) / kt));
    const ktm = (2 * Math.PI * m) / ny;
    let err = Infinity;
    try {
      err = Math.abs(discreteAngle(omegaDt, ktm, courantMedium).angleDeg - angleDeg);
    } catch {
      continue;
    }
    if (err < best.err - 1e-12) best = { cells: ny, modes: m, err };
    if (err <= ANGLE_TOLERANCE_DEG) break;
  }
  if (!(best.err < Infinity)) {
    throw new HushInputError('angle', `no periodic grid carries a wave at ${angleDeg} degrees at this frequency`);
  }
  return { cells: best.cells, modes: best.modes };
}

/** A 2-D oblique-incidence measurement, ready to advance step by step. */
export function createMeasurement2D(design: AbsorberDesign, opts: MeasureOptions2D): MeasurementRun {
  if (opts === null || typeof opts !== 'object') {
    throw new HushInputError('options', 'options must be an object with at least angleDeg, ppwLow and ppwHigh', 'value');
  }
  const angleDeg = inRange('angle', opts.angleDeg, 0, 90, { hiOpen: true, unit: 'degrees' });
  const c = checkCommon(design, opts, 2, angleDeg);
  const w0 = 0.5 * ((2 * Math.PI * c.courantMedium) / c.ppwLow + (2 * Math.PI * c.courantMedium) / c.ppwHigh);
  const engine = opts.engine ?? 'grid';
  if (engine !== 'grid' && engine !== 'reduced') {
    throw new HushInputError('engine', `engine must be "grid" or "reduced" (got ${JSON.stringify(engine)})`, 'value');
  }
  const periodGiven = opts.transverseCells !== undefined || opts.transverseModes !== undefined;
  let mode = { cells: 0, modes: 0 };
  let kt: number;
  if (engine === 'reduced' && !periodGiven) {
    // The chain needs no period: k_t exactly as the angle at the band centre asks.
    kt = discreteWavenumberUnchecked((2 * Math.PI * c.courantMedium) / w0, c.courantMedium, angleDeg) * Math.sin(angleDeg * DEG);
  } else {
    mode = chooseTransverseMode(angleDeg, w0, c.courantMedium);
    if (periodGiven) {
      const cells = wholeInRange('transverse cells', opts.transverseCells ?? mode.cells, 1, 100_000);
      const modes = wholeInRange('transverse modes', opts.transverseModes ?? mode.modes, 0, Math.floor(cells / 2));
      mode = { cells, modes };
    }
    kt = (2 * Math.PI * mode.modes) / mode.cells;
  }
  const ny = mode.cells;
  for (const w of c.omegas) {
    try {
      discreteAngle(w, kt, c.courantMedium);
    } catch {
      throw new HushInputError('band', `the wave of ${((2 * Math.PI * c.courantMedium) / w).toPrecision(4)} cells per wavelength is evanescent along x at this angle`);
    }
  }
  const t = planTiming(c, kt);
  if (engine === 'reduced') {
    return modeRun(c, t, { kt, angleDeg, transverseCells: ny, transverseModes: mode.modes, engine: 'reduced', evanescent: false }, LEFT_GAP);
  }
  const left = cpmlCoefficients(resolveDesign(FAR_LEFT_TERMINATION), c.courantMedium);
  const right = cpmlCoefficients(c.gridDesign, c.courantMedium);
  const near = LEFT_GAP + SOURCE_TO_MONITOR + c.monitorDistance;
  const rg = referenceGeometry(c, t, 0);
  checkWork(t.steps, (2 * (left.layers + 1) + near + c.design.layers + LEFT_GAP + rg.cells + (rg.right ? rg.right.layers : 0)) * ny);
  const abs = new TmzGrid2D({ cells: near, transverseCells: ny, courantMedium: c.courantMedium, left, right });
  const ref = new TmzGrid2D({ cells: LEFT_GAP + rg.cells, transverseCells: ny, courantMedium: c.courantMedium, left, right: rg.right });
  const source = abs.leftInterface + LEFT_GAP;
  const probe = source + SOURCE_TO_MONITOR;
  const profile = new Float64Array(ny);
  const weights = new Float64Array(ny);
  let norm = 0;
  for (let j = 0; j < ny; j++) {
    profile[j] = Math.cos(kt * j);
    norm += profile[j] * profile[j];
  }
  for (let j = 0; j < ny; j++) weights[j] = profile[j] / norm;
  return pairRun(
    t.steps,
    abs.nodes + ref.nodes,
    (k, from, recAbs, recRef) => {
      abs.advance(k, from, t.waveform, source, profile, recAbs, probe, weights);
      ref.advance(k, from, t.waveform, source, profile, recRef, probe, weights);
    },
    (recAbs, recRef) => analyse(c, { kt, angleDeg, transverseCells: ny, transverseModes: mode.modes, engine: 'grid', evanescent: false }, 2, t, recAbs, recRef, abs.nodes, ref.nodes),
  );
}

/**
 * The pair of runs (absorber, long lossless reference) on the exact one-mode
 * chain (mode-line.ts) with transverse factor K = 2·sin(k_t/2); `leftGap` cells
 * between the far-left termination and the source.
 */
function modeRun(c: CommonPlan, t: Timing, a: Analysis, leftGap: number, rightGap = 0): MeasurementRun {
  const K = 2 * Math.sin(a.kt / 2);
  const left = cpmlCoefficients(resolveDesign(FAR_LEFT_TERMINATION), c.courantMedium);
  const right = cpmlCoefficients(c.gridDesign, c.courantMedium);
  const near = leftGap + SOURCE_TO_MONITOR + c.monitorDistance;
  const rg = referenceGeometry(c, t, rightGap);
  checkWork(t.steps, 2 * (left.layers + 1) + near + c.design.layers + leftGap + rg.cells + (rg.right ? rg.right.layers : 0));
  const abs = new ModeLine({ cells: near, courantMedium: c.courantMedium, transverse: K, left, right });
  const ref = new ModeLine({ cells: leftGap + rg.cells, courantMedium: c.courantMedium, transverse: K, left, right: rg.right });
  const source = abs.leftInterface + leftGap;
  const probe = source + SOURCE_TO_MONITOR;
  return pairRun(
    t.steps,
    abs.nodes + ref.nodes,
    (k, from, recAbs, recRef) => {
      abs.advance(k, from, t.waveform, source, recAbs, probe);
      ref.advance(k, from, t.waveform, source, recRef, probe);
    },
    (recAbs, recRef) => analyse(c, a, 2, t, recAbs, recRef, abs.nodes, ref.nodes),
  );
}

/** Default monitor-to-interface distance for a near field, cells: its echo decays as e^{−2D/L} on the way back. */
const NEAR_FIELD_MONITOR_DISTANCE = 2;
/** Cells between the far-left termination and the source for a near field, per cell of the longest decay length (e^{−2·40} of the field returns). */
const NEAR_FIELD_LEFT_GAP_PER_DECAY = 40;

/**
 * Pulse and record for a near field: the band lies below the mode's grazing
 * cut-off (where the field turns propagating), which the pulse keeps clear of as
 * it keeps clear of zero frequency. Nothing propagates at the band's
 * frequencies, so the record is the pulse, the transient that crosses the
 * geometry at no more than the medium speed (S_m cells per step, slowed by up
 * to κ_max in the absorber) a few times over, and a margin; the echo's tail
 * level (echoTailLevel) shows whether it sufficed.
 */
function planTimingNearField(c: CommonPlan, kt: number): Timing {
  const wl = Math.min(...c.omegas, (2 * Math.PI * c.courantMedium) / c.ppwHigh);
  const wh = Math.max(...c.omegas, (2 * Math.PI * c.courantMedium) / c.ppwLow);
  const grazing = cutoffs(kt, c.courantMedium).low;
  const pulse = planPulse(wl, wh, 0, grazing);
  const path = SOURCE_TO_MONITOR + 2 * c.monitorDistance + 2 * c.design.layers * c.design.kappaMax;
  const steps = pulse.length + Math.ceil((4 * path) / c.courantMedium) + Math.ceil(4 * pulse.width) + 256;
  const referenceRight = Math.ceil(0.55 * steps * c.courantMedium) + SOURCE_TO_MONITOR + c.monitorDistance + 20;
  return { pulse, waveform: fillPulse(pulse, new Float64Array(pulse.length)), steps, referenceRight };
}

/**
 * A measurement on the exact one-mode reduction of a periodic 2-D grid
 * (mode-line.ts), ready to advance step by step: oblique incidence at
 * `angleDeg` (at the band centre), or an evanescent near field of decay
 * `decayCells` (at the band centre), or an explicit k_t. Every frequency of the
 * band must be on the same side of the mode's grazing cut-off.
 */
export function createMeasurementMode(design: AbsorberDesign, opts: MeasureOptionsMode): MeasurementRun {
  if (opts === null || typeof opts !== 'object') {
    throw new HushInputError('options', 'options must be an object with ppwLow, ppwHigh and one of angleDeg, decayCells or transverseWavenumber', 'value');
  }
  const given = [opts.angleDeg, opts.decayCells, opts.transverseWavenumber].filter((v) => v !== undefined).length;
  if (given !== 1) {
    throw new HushInputError('angle', `give exactly one of angleDeg, decayCells and transverseWavenumber (got ${given})`, 'value');
  }
  const angleIn = opts.angleDeg !== undefined ? inRange('angle', opts.angleDeg, 0, 90, { hiOpen: true, unit: 'degrees' }) : 0;
  const c = checkCommon(design, opts, 2, angleIn);
  const w0 = 0.5 * ((2 * Math.PI * c.courantMedium) / c.ppwLow + (2 * Math.PI * c.courantMedium) / c.ppwHigh);
  let kt: number;
  if (opts.angleDeg !== undefined) {
    const ppw0 = (2 * Math.PI * c.courantMedium) / w0;
    kt = discreteWavenumberUnchecked(ppw0, c.courantMedium, angleIn) * Math.sin(angleIn * DEG);
  } else if (opts.decayCells !== undefined) {
    const L = inRange('decay length', opts.decayCells, 0, 1e6, { loOpen: true, unit: 'cells' });
    const f = evanescentFactorUnchecked(w0, c.courantMedium, L);
    if (f > 1) {
      throw new HushInputError('decay length', `a near field decaying over ${L} cells at the band centre needs a transverse wavenumber beyond a 2-D grid's (sin²(k_t/2) = ${f.toPrecision(4)} > 1)`);
    }
    kt = 2 * Math.asin(Math.sqrt(f));
  } else kt = inRange('transverse wavenumber', opts.transverseWavenumber, 0, Math.PI, { unit: 'radians per cell' });
  const sides = c.omegas.map((w) => {
    const st = Math.sin(w / 2) / c.courantMedium;
    const sk = Math.sin(kt / 2);
    return st * st - sk * sk;
  });
  const evanescent = sides[0] < 0;
  for (let k = 0; k < sides.length; k++) {
    if (sides[k] === 0 || sides[k] < 0 !== evanescent) {
      throw new HushInputError('band', 'the band straddles the grazing cut-off of this transverse wavenumber: some frequencies propagate and others are evanescent; narrow the band');
    }
  }
  const angleDeg = evanescent ? 90 : opts.angleDeg !== undefined ? angleIn : discreteAngle(w0, kt, c.courantMedium).angleDeg;
  if (evanescent) {
    if (opts.monitorDistance === undefined) c.monitorDistance = NEAR_FIELD_MONITOR_DISTANCE;
    const t = planTimingNearField(c, kt);
    const longest = Math.max(...c.omegas.map((w) => 1 / normalWave(w, kt, c.courantMedium).q));
    const gap = Math.max(LEFT_GAP, Math.ceil(NEAR_FIELD_LEFT_GAP_PER_DECAY * longest));
    return modeRun(c, t, { kt, angleDeg, transverseCells: 0, transverseModes: 0, engine: 'reduced', evanescent: true }, gap, gap);
  }
  const t = planTiming(c, kt);
  return modeRun(c, t, { kt, angleDeg, transverseCells: 0, transverseModes: 0, engine: 'reduced', evanescent: false }, LEFT_GAP);
}

/** One run of a band measurement: the pulse band, the frequencies measured in it, and the wave. */
export interface MeasurementPiece {
  /** Pulse band (cells per wavelength in the medium); the measured frequencies lie inside it. */
  ppwLow: number;
  ppwHigh: number;
  /** Cells per wavelength measured (inside the study's band). */
  frequencies: number[];
  /** Angle of incidence at the piece's centre (oblique), or the decay length there (near field). */
  angleDeg?: number;
  decayCells?: number;
}

export interface PieceOptions {
  /** Vacuum Courant number; default 0.99/√3. */
  courant?: number;
  /** Background index; default 1. */
  index?: number;
  /** The study's band, cells per wavelength in the medium (short and long end). */
  ppwMin: number;
  ppwMax: number;
  /** Angle of incidence (default 0), or a near field's decay length (cells) at the band's short end, scaled as L·ppw/ppwMin across it. */
  angleDeg?: number;
  decayCells?: number;
  /** Frequencies measured over the whole band (default 5); a band split in k pieces measures 3 in each. */
  frequencies?: number;
}

/** Largest number of pieces a band is split into. */
export const MAX_PIECES = 24;

/**
 * Splits a study's band into the fewest pieces (equal in frequency) that one
 * run each can measure at the given angle (or near field): the pulse keeps
 * CUTOFF_LEVEL at the mode's nearest cut-off (the grazing point, zero
 * frequency, the grid's upper limit) and EDGE_LEVEL_MIN at the piece's edges,
 * so a piece's half-width may be at most a fraction sqrt(ln(1/EDGE_LEVEL_MIN)/ln(1/CUTOFF_LEVEL))
 * of its distance to that cut-off (pulse.ts). Each piece's pulse band is
 * widened, where the cut-off leaves room, to the width that gives the shortest
 * pulse (edge target and cut-off constraints equal), so a narrow band needs no
 * long record. Each piece takes k_t from its own centre: its centre meets the
 * boundary at the angle asked, its lower frequencies more obliquely.
 */
export function planMeasurementPieces(opts: PieceOptions): MeasurementPiece[] {
  if (opts === null || typeof opts !== 'object') throw new HushInputError('options', 'options must be an object with ppwMin and ppwMax', 'value');
  const near = opts.decayCells !== undefined;
  if (near && opts.angleDeg !== undefined && opts.angleDeg !== 0) throw new HushInputError('decay length', 'give an angle or a decay length, not both', 'value');
  const angleDeg = inRange('angle', opts.angleDeg ?? 0, 0, 90, { hiOpen: true, unit: 'degrees' });
  // Normal incidence runs on a 1-D line; anything else on the 2-D reduction.
  const courant = checkCourant(opts.courant ?? DEFAULT_COURANT, near || angleDeg > 0 ? 2 : 1);
  const index = inRange('background index', opts.index ?? 1, 1, 100);
  const sm = courant / index;
  const decay = near ? inRange('decay length', opts.decayCells, 0, 1e6, { loOpen: true, unit: 'cells' }) : 0;
  const ppwMin = checkPpw('cells per wavelength (short end)', opts.ppwMin, sm, angleDeg);
  const ppwMax = inRange('cells per wavelength (long end)', opts.ppwMax, ppwMin, MAX_PPW);
  const count = wholeInRange('frequencies', opts.frequencies ?? DEFAULT_PIECE_FREQUENCIES, 1, 100);
  const kEdgeTarget = Math.sqrt(Math.log(1 / EDGE_LEVEL_TARGET));
  const kEdgeMin = Math.sqrt(Math.log(1 / EDGE_LEVEL_MIN));
  const kCut = Math.sqrt(Math.log(1 / CUTOFF_LEVEL));
  const fit = (0.98 * kEdgeMin) / kCut;
  const nuHi = 1 / ppwMin;
  const nuLo = 1 / ppwMax;
  const omegaOf = (nu: number) => 2 * Math.PI * sm * nu;
  /** Distance from ω_c to the mode's nearest cut-off, and the wave's parameter at ω_c; null when no such wave exists. */
  const gapAt = (nuC: number): { gap: number; angle?: number; decay?: number } | null => {
    const wc = omegaOf(nuC);
    if (near) {
      const L = (decay * nuHi) / nuC;
      const f = evanescentFactorUnchecked(wc, sm, L);
      if (!(f <= 1)) return null;
      const grazing = cutoffs(2 * Math.asin(Math.sqrt(f)), sm).low;
      return { gap: Math.min(wc, grazing - wc), decay: L };
    }
    const kt = discreteWavenumberUnchecked(1 / nuC, sm, angleDeg) * Math.sin(angleDeg * DEG);
    const cut = cutoffs(kt, sm);
    return { gap: Math.min(wc - Math.max(0, cut.low), cut.high - wc), angle: angleDeg };
  };
  for (let k = 1; k <= MAX_PIECES; k++) {
    const pieces: MeasurementPiece[] = [];
    for (let p = 0; p < k; p++) {
      const a = nuHi + ((nuLo - nuHi) * p) / k;
      const b = nuHi + ((nuLo - nuHi) * (p + 1)) / k;
      const nuC = (a + b) / 2;
      const g = gapAt(nuC);
      const half = (omegaOf(a) - omegaOf(b)) / 2;
      if (!g || !(g.gap > 0) || half > fit * g.gap) break;
      // The shortest pulse: width 2·kEdgeTarget/h = 2·kCut/gap, i.e. h = gap·kEdgeTarget/kCut, no narrower than the piece.
      const wc = omegaOf(nuC);
      let h = Math.min(fit * g.gap, Math.max(half, (g.gap * kEdgeTarget) / kCut));
      h = Math.min(h, wc - omegaOf(1 / MAX_PPW) * 1.0001);
      const n = k === 1 ? count : 3;
      const frequencies: number[] = [];
      for (let i = 0; i < n; i++) frequencies.push(n === 1 ? 1 / nuC : 1 / (a + ((b - a) * i) / (n - 1)));
      // The ends by rounding inside the pulse band.
      const ppwLow = Math.min((2 * Math.PI * sm) / (wc + h), ...frequencies);
      const ppwHigh = Math.max((2 * Math.PI * sm) / (wc - h), ...frequencies);
      pieces.push({ ppwLow, ppwHigh, frequencies, ...(near ? { decayCells: g.decay } : { angleDeg }) });
    }
    if (pieces.length === k) return pieces;
  }
  throw new HushInputError(
    'band',
    `the band ${ppwMin}–${ppwMax} cells per wavelength cannot be measured in ${MAX_PIECES} runs ${near ? `as a near field decaying over ${decay} cells` : `at ${angleDeg}°`}: it sits too close to a cut-off of the grid`,
  );
}

/** Frequencies a band measurement reads by default. */
const DEFAULT_PIECE_FREQUENCIES = 5;

/** Runs a prepared measurement to the end synchronously. */
export function runToEnd(run: MeasurementRun): ReflectionMeasurement {
  run.advance(run.totalSteps - run.stepsDone);
  return run.result();
}

function macrotask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/** Drives a prepared measurement in chunks, yielding between them. */
export async function runInChunks(run: MeasurementRun, control: RunControl = {}): Promise<ReflectionMeasurement> {
  const chunkWork = control.chunkCellUpdates === undefined ? DEFAULT_CHUNK : inRange('chunk size', control.chunkCellUpdates, 1, Infinity);
  const chunk = Math.max(1, Math.floor(chunkWork / run.cellUpdatesPerStep));
  const signal = control.signal;
  const report = control.onProgress;
  while (run.stepsDone < run.totalSteps) {
    if (signal && signal.aborted) throw new MeasurementCancelled();
    run.advance(chunk);
    if (report && run.stepsDone < run.totalSteps) report(run.stepsDone / run.totalSteps);
    await macrotask();
  }
  if (signal && signal.aborted) throw new MeasurementCancelled();
  const result = run.result();
  if (report) report(1);
  return result;
}

/**
 * Measures the reflection of `design` at normal incidence on a 1-D line.
 * Example: measureReflection1D({ layers: 8, order: 3 }, { ppwLow: 6, ppwHigh: 14 })
 * resolves to 9 frequencies whose measuredAmplitude matches predictedAmplitude to about 1e-8
 * (see tests/verification.test.ts for the agreement seen).
 */
export async function measureReflection1D(design: AbsorberDesign, opts: MeasureOptions1D, control: RunControl = {}): Promise<ReflectionMeasurement> {
  return runInChunks(createMeasurement1D(design, opts), control);
}

/** Measures the reflection of `design` at oblique incidence on a periodic 2-D TMz grid. */
export async function measureReflection2D(design: AbsorberDesign, opts: MeasureOptions2D, control: RunControl = {}): Promise<ReflectionMeasurement> {
  return runInChunks(createMeasurement2D(design, opts), control);
}

/** Measures the reflection of `design` on the exact one-mode reduction of a periodic 2-D grid (oblique or near field). */
export async function measureReflectionMode(design: AbsorberDesign, opts: MeasureOptionsMode, control: RunControl = {}): Promise<ReflectionMeasurement> {
  return runInChunks(createMeasurementMode(design, opts), control);
}

/** Synchronous one-mode measurement (blocks; prefer the async form in a UI). */
export function measureReflectionModeSync(design: AbsorberDesign, opts: MeasureOptionsMode): ReflectionMeasurement {
  return runToEnd(createMeasurementMode(design, opts));
}

/** Synchronous 1-D measurement (blocks; prefer the async form in a UI). */
export function measureReflection1DSync(design: AbsorberDesign, opts: MeasureOptions1D): ReflectionMeasurement {
  return runToEnd(createMeasurement1D(design, opts));
}

/** Synchronous 2-D measurement (blocks; prefer the async form in a UI). */
export function measureReflection2DSync(design: AbsorberDesign, opts: MeasureOptions2D): ReflectionMeasurement {
  return runToEnd(createMeasurement2D(design, opts));
}


/**
 * Absorber design: the thinnest graded CPML that meets a required amplitude
 * reflection on the user's grid, over a band (cells per wavelength at its short
 * and long ends) and a range of angles of incidence, with the exact discrete
 * reflection of physics.md §3 as the measure.
 *
 * Search, for each allowed grading order m:
 *  1. sample the band uniformly in frequency and the angles uniformly in degree;
 *  2. for a layer count N, find the strength s = σ_max/σ_opt that minimises the
 *     worst sampled |r| (a 20-point log scan, then golden-section refinement
 *     from its best point and from its best other local minimum);
 *  3. find the smallest feasible N by galloping from the continuous-theory
 *     estimate N ≈ ln(1/R)/(1.6·cos θ_max), then bisection; N − 1 is always
 *     evaluated and found infeasible;
 *  4. check the answer on a grid 4× denser in frequency and angle that contains
 *     the search samples; if it fails there, re-optimise the strength on the
 *     dense grid, and if that fails too, step N up by a gallop (1, 2, 4, …
 *     layers) and bisect back to the first N that passes. Passing the dense
 *     grid includes the points between its samples: each of its local maxima
 *     (above a quarter of the target) is climbed within one dense spacing, and
 *     the highest value found is the design's reported worst.
 * So N − 1 always fails: on the search grid (a subset of the dense grid), or on
 * the dense grid at its own best strength.
 * The work of a search is counted (designWork()): the hardening tests bound it
 * per call, which a loaded machine cannot trip as it could a time bound.
 * The cheapest (fewest layers; then lower worst reflection) order wins.
 */
import { DEFAULT_COURANT, checkCourant } from './courant';
import { checkPpw, discreteWavenumberUnchecked } from './dispersion';
import { fillCoefficients } from './cpml';
import { continuousReflectionUnchecked } from './continuous';
import { HushInputError } from './errors';
import { resolveDesign, type ResolvedDesign } from './grading';
import { createWorkspace, fillFactors, reflectionKernel, type ReflectionWorkspace } from './reflection';
import { MAX_LAYERS, MAX_STRENGTH } from './constants';
import { inRange, wholeInRange } from './validate';

/** Angles above this defeat any PML (R → 1 as cos θ → 0); the planner refuses them. */
export const MAX_DESIGN_ANGLE_DEG = 85;

export interface DesignSpec {
  /** Required amplitude reflection |r|, 0 < target < 1. */
  target: number;
  /** Cells per wavelength in the background medium at the short-wavelength end of the band. */
  ppwMin: number;
  /** Cells per wavelength at the long-wavelength end; default ppwMin. */
  ppwMax?: number;
  /** Largest angle of incidence in degrees; default 0. */
  angleMaxDeg?: number;
  /** Vacuum Courant number; default 0.99 of the 3-D limit. */
  courant?: number;
  /** Grid dimensions for the Courant limit; default 3. */
  dimensions?: number;
  /** Background index n; default 1. */
  index?: number;
  /** Allowed polynomial grading orders; default [2, 3, 4]. */
  orders?: number[];
  /** Fixed κ_max; default 1. */
  kappaMax?: number;
  /** Fixed α_max·η₀·Δ·n (CFS shift); default 0. */
  alphaMaxNorm?: number;
  /** Order of the reversed α grading; default 1. */
  alphaOrder?: number;
  /** Layer cap; default 200. */
  maxLayers?: number;
}

export interface DesignResult {
  layers: number;
  order: number;
  strength: number;
  kappaMax: number;
  alphaMaxNorm: number;
  alphaOrder: number;
  /** Worst |r| on the dense check grid. */
  worstAmplitude: number;
  /** Where the worst occurs. */
  worstPpw: number;
  worstAngleDeg: number;
  /** Continuous-theory |r| of the same design at the worst point of the continuous model (largest angle, longest wavelength). */
  continuousAmplitude: number;
  thicknessCells: number;
}

/** Samples of (frequency, angle) with their grid quantities, computed once per spec. */
export interface SampleGrid {
  ppw: Float64Array;
  angleDeg: Float64Array;
  omegaDt: Float64Array;
  /** sin²(k_t/2) per [frequency * angles + angle]. */
  sinHalfKt2: Float64Array;
}

interface ResolvedSpec {
  target: number;
  ppwMin: number;
  ppwMax: number;
  angleMaxDeg: number;
  courant: number;
  courantMedium: number;
  dimensions: number;
  index: number;
  orders: number[];
  kappaMax: number;
  alphaMaxNorm: number;
  alphaOrder: number;
  maxLayers: number;
}

/** Search sampling: frequencies and angles (endpoints included); the dense check uses 4× as many intervals. */
const SEARCH_FREQUENCIES = 6;
const SEARCH_ANGLES = 5;
const DENSE_FACTOR = 4;
const STRENGTH_MIN = 0.05;
const SCAN_POINTS = 20;
const GOLDEN_ITERATIONS = 14;

function resolveSpec(spec: DesignSpec): ResolvedSpec {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('design spec', 'design spec must be an object', 'value');
  const target = inRange('target reflection', spec.target, 0, 1, { loOpen: true, hiOpen: true });
  const dimensions = wholeInRange('dimensions', spec.dimensions ?? 3, 1, 3);
  const courant = checkCourant(spec.courant ?? DEFAULT_COURANT, dimensions);
  const index = inRange('background index', spec.index ?? 1, 1, 100);
  const courantMedium = courant / index;
  const angleMaxDeg = inRange('largest angle', spec.angleMaxDeg ?? 0, 0, 90, { hiOpen: true, unit: 'degrees' });
  if (angleMaxDeg > MAX_DESIGN_ANGLE_DEG) {
    throw new HushInputError(
      'largest angle',
      `largest angle ${angleMaxDeg}° is above ${MAX_DESIGN_ANGLE_DEG}°: near grazing incidence every PML reflects almost fully (its attenuation scales with cos θ), so no layer count helps; move the absorber farther from sources of grazing waves or limit the angle to ${MAX_DESIGN_ANGLE_DEG}°`,
    );
  }
  if (dimensions === 1 && angleMaxDeg !== 0) {
    throw new HushInputError('largest angle', `a 1-D grid has normal incidence only (got ${angleMaxDeg}°)`);
  }
  const ppwMin = checkPpw('cells per wavelength (short end)', spec.ppwMin, courantMedium, 0);
  const ppwMax = inRange('cells per wavelength (long end)', spec.ppwMax ?? ppwMin, ppwMin, 1e6);
  const orders = spec.orders ?? [2, 3, 4];
  if (!Array.isArray(orders) || orders.length === 0) {
    throw new HushInputError('grading orders', 'grading orders must be a non-empty list such as 2, 3, 4', 'value');
  }
  const uniq = [...new Set(orders.map((m) => inRange('grading order', m, 1, 10)))].sort((a, b) => a - b);
  const kappaMax = inRange('kappa max', spec.kappaMax ?? 1, 1, 100);
  const alphaMaxNorm = inRange('alpha max (normalised)', spec.alphaMaxNorm ?? 0, 0, 10);
  const alphaOrder = inRange('alpha order', spec.alphaOrder ?? 1, 0, 10);
  const maxLayers = wholeInRange('layer cap', spec.maxLayers ?? MAX_LAYERS, 1, MAX_LAYERS);
  return { target, ppwMin, ppwMax, angleMaxDeg, courant, courantMedium, dimensions, index, orders: uniq, kappaMax, alphaMaxNorm, alphaOrder, maxLayers };
}

/**
 * Sample grid over the band (uniform in frequency, i.e. in 1/ppw) and angles
 * (uniform in degrees), with `nf` × `na` points including the ends.
 */
export function sampleGrid(ppwMin: number, ppwMax: number, angleMaxDeg: number, courantMedium: number, nf: number, na: number): SampleGrid {
  const f = ppwMax === ppwMin ? 1 : nf;
  const a = angleMaxDeg === 0 ? 1 : na;
  const ppw = new Float64Array(f);
  const angleDeg = new Float64Array(a);
  const omegaDt = new Float64Array(f);
  const sinHalfKt2 = new Float64Array(f * a);
  const fHi = 1 / ppwMin;
  const fLo = 1 / ppwMax;
  for (let i = 0; i < f; i++) {
    const nu = f === 1 ? fHi : fHi + ((fLo - fHi) * i) / (f - 1);
    ppw[i] = i === 0 ? ppwMin : i === f - 1 ? ppwMax : 1 / nu;
    omegaDt[i] = (2 * Math.PI * courantMedium) / ppw[i];
  }
  for (let j = 0; j < a; j++) angleDeg[j] = a === 1 ? angleMaxDeg : (angleMaxDeg * j) / (a - 1);
  for (let i = 0; i < f; i++) {
    for (let j = 0; j < a; j++) {
      const th = (angleDeg[j] * Math.PI) / 180;
      const q = discreteWavenumberUnchecked(ppw[i], courantMedium, angleDeg[j]);
      const s = Math.sin((q * Math.sin(th)) / 2);
      sinHalfKt2[i * a + j] = s * s;
    }
  }
  return { ppw, angleDeg, omegaDt, sinHalfKt2 };
}

/** Worst |r| of a design over a sample grid, and where. Stops early (returning a value > bound) once a sample exceeds `bound`. */
export interface Worst {
  amplitude: number;
  frequency: number;
  angle: number;
}

/**
 * Work done by the design search so far: kernel evaluations weighted by their
 * layer count (one unit = one layer of one reflection evaluation). A
 * deterministic measure of cost, independent of the machine and its load;
 * tests bound it per call, `npm run bench` converts it to time.
 */
let layerEvaluations = 0;

/** Cumulative layer-evaluations of the design search (see above). */
export function designWork(): number {
  return layerEvaluations;
}

export function worstReflection(
  d: ResolvedDesign,
  grid: SampleGrid,
  courantMedium: number,
  ws: ReflectionWorkspace,
  bound = Infinity,
  startFrequency = 0,
  out: Worst = { amplitude: 0, frequency: 0, angle: 0 },
): Worst {
  fillCoefficients(d, courantMedium, ws.coef);
  const nf = grid.ppw.length;
  const na = grid.angleDeg.length;
  let worst = -1;
  let wf = 0;
  let wa = 0;
  let evaluated = 0;
  for (let k = 0; k < nf; k++) {
    const i = (k + startFrequency) % nf;
    const om = grid.omegaDt[i];
    fillFactors(ws.coef, om, ws.factors);
    for (let j = na - 1; j >= 0; j--) {
      reflectionKernel(ws.factors, d.layers, courantMedium, om, grid.sinHalfKt2[i * na + j], ws.out);
      const amp = Math.hypot(ws.out[0], ws.out[1]);
      evaluated++;
      if (amp > worst) {
        worst = amp;
        wf = i;
        wa = j;
        if (worst > bound) {
          layerEvaluations += evaluated * d.layers;
          out.amplitude = worst;
          out.frequency = wf;
          out.angle = wa;
          return out;
        }
      }
    }
  }
  layerEvaluations += evaluated * d.layers;
  out.amplitude = worst;
  out.frequency = wf;
  out.angle = wa;
  return out;
}

/** ωΔt whose node factors `ws.factors` holds for amplitudeAt (NaN: none); a climb in angle keeps ω and reuses them. */
let factorsOmega = NaN;

/** One exact evaluation at an arbitrary (ppw, angle); `ws.coef` must hold the design's coefficients. */
function amplitudeAt(layers: number, courantMedium: number, ws: ReflectionWorkspace, ppw: number, angleDeg: number): number {
  const om = (2 * Math.PI * courantMedium) / ppw;
  const th = (angleDeg * Math.PI) / 180;
  const q = discreteWavenumberUnchecked(ppw, courantMedium, angleDeg);
  const sk = Math.sin((q * Math.sin(th)) / 2);
  if (om !== factorsOmega) {
    fillFactors(ws.coef, om, ws.factors);
    factorsOmega = om;
  }
  reflectionKernel(ws.factors, layers, courantMedium, om, sk * sk, ws.out);
  layerEvaluations += layers;
  return Math.hypot(ws.out[0], ws.out[1]);
}

/** Local maxima of the dense grid refined this many at most (highest first). */
const REFINE_PEAKS = 8;
const REFINE_ROUNDS = 2;
const REFINE_ITERATIONS = 12;
/** Peaks of the dense grid below this share of the target are not climbed (besides the highest). */
const REFINE_FLOOR = 0.25;

interface Peak {
  amplitude: number;
  ppw: number;
  angleDeg: number;
}

/**
 * The worst |r| between the dense samples: every local maximum of the dense
 * grid (the highest REFINE_PEAKS) is climbed by golden-section searches in
 * frequency and in angle, alternately, within one dense spacing of its sample
 * and inside the band and angle range. The result is at least the dense worst.
 */
function refinedWorst(d: ResolvedDesign, dense: SampleGrid, courantMedium: number, ws: ReflectionWorkspace, target: number): Peak {
  fillCoefficients(d, courantMedium, ws.coef);
  const nf = dense.ppw.length;
  const na = dense.angleDeg.length;
  const amp = new Float64Array(nf * na);
  for (let i = 0; i < nf; i++) {
    const om = dense.omegaDt[i];
    fillFactors(ws.coef, om, ws.factors);
    for (let j = 0; j < na; j++) {
      reflectionKernel(ws.factors, d.layers, courantMedium, om, dense.sinHalfKt2[i * na + j], ws.out);
      amp[i * na + j] = Math.hypot(ws.out[0], ws.out[1]);
    }
  }
  layerEvaluations += nf * na * d.layers;
  factorsOmega = NaN; // ws.factors now holds the last dense frequency's factors, for this design only
  const peaks: number[] = [];
  for (let i = 0; i < nf; i++) {
    for (let j = 0; j < na; j++) {
      const v = amp[i * na + j];
      let top = true;
      for (let di = -1; di <= 1 && top; di++) {
        for (let dj = -1; dj <= 1; dj++) {
          const ii = i + di;
          const jj = j + dj;
          if ((di || dj) && ii >= 0 && ii < nf && jj >= 0 && jj < na && amp[ii * na + jj] > v) {
            top = false;
            break;
          }
        }
      }
      if (top) peaks.push(i * na + j);
    }
  }
  peaks.sort((x, y) => amp[y] - amp[x]);
  let best: Peak = { amplitude: -1, ppw: 0, angleDeg: 0 };
  for (const k of peaks) if (amp[k] > best.amplitude) best = { amplitude: amp[k], ppw: dense.ppw[Math.floor(k / na)], angleDeg: dense.angleDeg[k % na] };
  const g = (Math.sqrt(5) - 1) / 2;
  // Golden-section maximisation of f on [a, b].
  const climb = (f: (x: number) => number, a: number, b: number): [number, number] => {
    let c = b - g * (b - a);
    let e = a + g * (b - a);
    let fc = f(c);
    let fe = f(e);
    for (let it = 0; it < REFINE_ITERATIONS; it++) {
      if (fc > fe) {
        b = e;
        e = c;
        fe = fc;
        c = b - g * (b - a);
        fc = f(c);
      } else {
        a = c;
        c = e;
        fc = fe;
        e = a + g * (b - a);
        fe = f(e);
      }
    }
    return fc > fe ? [c, fc] : [e, fe];
  };
  for (const k of peaks.slice(0, REFINE_PEAKS)) {
    // A peak far below the target does not reach it within one dense spacing; only the worst one is always refined (for the reported worst).
    if (k !== peaks[0] && amp[k] < REFINE_FLOOR * target) break;
    const i = Math.floor(k / na);
    const j = k % na;
    // Frequency as ν = 1/ppw (the grid is uniform in it), angle in degrees.
    const nuLo = 1 / dense.ppw[Math.min(nf - 1, i + 1)];
    const nuHi = 1 / dense.ppw[Math.max(0, i - 1)];
    const thLo = dense.angleDeg[Math.max(0, j - 1)];
    const thHi = dense.angleDeg[Math.min(na - 1, j + 1)];
    let nu = 1 / dense.ppw[i];
    let th = dense.angleDeg[j];
    let v = amp[k];
    for (let round = 0; round < REFINE_ROUNDS; round++) {
      if (nf > 1) {
        const [x, fx] = climb((x) => amplitudeAt(d.layers, courantMedium, ws, 1 / x, th), nuLo, nuHi);
        if (fx > v) [nu, v] = [x, fx];
      }
      if (na > 1) {
        const [y, fy] = climb((y) => amplitudeAt(d.layers, courantMedium, ws, 1 / nu, y), thLo, thHi);
        if (fy > v) [th, v] = [y, fy];
      }
    }
    if (v > best.amplitude) best = { amplitude: v, ppw: 1 / nu, angleDeg: th };
  }
  return best;
}

interface Optimum {
  strength: number;
  worst: number;
}

/**
 * Minimises the worst sampled |r| over the strength for fixed N and m: a log
 * scan, then golden-section refinement around the best scan point and around
 * the best other local minimum of the scan. The worst |r| against strength can
 * have narrow notches (interference between the grading and the back wall, at a
 * single frequency and near-normal incidence), so one start is not enough.
 */
function bestStrength(d: ResolvedDesign, grid: SampleGrid, rs: ResolvedSpec, ws: ReflectionWorkspace, stopBelow: number): Optimum {
  const w: Worst = { amplitude: 0, frequency: 0, angle: 0 };
  let start = 0;
  const evalAt = (logS: number, bound: number): number => {
    d.strength = Math.exp(logS);
    worstReflection(d, grid, rs.courantMedium, ws, bound, start, w);
    start = w.frequency;
    return w.amplitude;
  };
  const lo = Math.log(STRENGTH_MIN);
  const hi = Math.log(MAX_STRENGTH);
  const step = (hi - lo) / (SCAN_POINTS - 1);
  const scan = new Float64Array(SCAN_POINTS);
  let bestI = 0;
  let bestV = Infinity;
  for (let i = 0; i < SCAN_POINTS; i++) {
    // Early exit above the best so far: such a value is a lower bound, enough to rank it.
    const v = evalAt(lo + i * step, bestV);
    scan[i] = v;
    if (v < bestV) {
      bestV = v;
      bestI = i;
    }
  }
  let bestLog = lo + bestI * step;
  if (bestV <= stopBelow) return { strength: Math.exp(bestLog), worst: bestV };
  // Second start: the lowest other local minimum of the scan, away from the best one.
  let otherI = -1;
  for (let i = 0; i < SCAN_POINTS; i++) {
    if (Math.abs(i - bestI) <= 1) continue;
    const left = i === 0 ? Infinity : scan[i - 1];
    const right = i === SCAN_POINTS - 1 ? Infinity : scan[i + 1];
    if (scan[i] <= left && scan[i] <= right && (otherI < 0 || scan[i] < scan[otherI])) otherI = i;
  }
  const g = (Math.sqrt(5) - 1) / 2;
  for (const centre of otherI < 0 ? [bestI] : [bestI, otherI]) {
    let a = lo + Math.max(0, centre - 1) * step;
    let b = lo + Math.min(SCAN_POINTS - 1, centre + 1) * step;
    let c = b - g * (b - a);
    let e = a + g * (b - a);
    let fc = evalAt(c, Infinity);
    let fe = evalAt(e, Infinity);
    for (let it = 0; it < GOLDEN_ITERATIONS; it++) {
      if (fc < fe) {
        b = e;
        e = c;
        fe = fc;
        c = b - g * (b - a);
        fc = evalAt(c, Infinity);
      } else {
        a = c;
        c = e;
        fc = fe;
        e = a + g * (b - a);
        fe = evalAt(e, Infinity);
      }
      const m = Math.min(fc, fe);
      if (m < bestV) {
        bestV = m;
        bestLog = fc < fe ? c : e;
      }
      if (bestV <= stopBelow) return { strength: Math.exp(bestLog), worst: bestV };
    }
  }
  return { strength: Math.exp(bestLog), worst: bestV };
}

/**
 * Best strength and worst sampled |r| for a given layer count and order on the
 * search grid of `spec` (exported so tests can probe minimality).
 */
export function bestStrengthFor(spec: DesignSpec, layers: number, order: number, dense = false): Optimum {
  const rs = resolveSpec(spec);
  const grid = dense ? denseGrid(rs) : searchGrid(rs);
  const d = baseDesign(rs, layers, order);
  return bestStrength(d, grid, rs, createWorkspace(), 0);
}

function baseDesign(rs: ResolvedSpec, layers: number, order: number): ResolvedDesign {
  return resolveDesign({ layers, order, strength: 1, kappaMax: rs.kappaMax, alphaMaxNorm: rs.alphaMaxNorm, alphaOrder: rs.alphaOrder });
}

function searchGrid(rs: ResolvedSpec): SampleGrid {
  return sampleGrid(rs.ppwMin, rs.ppwMax, rs.angleMaxDeg, rs.courantMedium, SEARCH_FREQUENCIES, SEARCH_ANGLES);
}

function denseGrid(rs: ResolvedSpec): SampleGrid {
  return sampleGrid(
    rs.ppwMin,
    rs.ppwMax,
    rs.angleMaxDeg,
    rs.courantMedium,
    (SEARCH_FREQUENCIES - 1) * DENSE_FACTOR + 1,
    (SEARCH_ANGLES - 1) * DENSE_FACTOR + 1,
  );
}

/** Thinnest design of one grading order, or null when none up to the layer cap meets the target. */
function designForOrder(rs: ResolvedSpec, order: number, grid: SampleGrid, dense: SampleGrid, ws: ReflectionWorkspace): DesignResult | null {
  const target = rs.target;
  const memo = new Map<number, Optimum>();
  const feasible = (N: number): Optimum => {
    let o = memo.get(N);
    if (!o) {
      o = bestStrength(baseDesign(rs, N, order), grid, rs, ws, target);
      memo.set(N, o);
    }
    return o;
  };
  const ok = (N: number) => feasible(N).worst <= target;
  const cosT = Math.cos((rs.angleMaxDeg * Math.PI) / 180);
  // Continuous-theory estimate at σ_opt: R = e^{−1.6·N·cos θ} (physics.md §2).
  const guess = Math.max(1, Math.min(rs.maxLayers, Math.ceil(Math.log(1 / target) / (1.6 * cosT))));
  let lo: number; // infeasible (0 = none known)
  let hi: number; // feasible
  if (ok(guess)) {
    hi = guess;
    lo = 0;
    let stepDown = 1;
    while (hi - stepDown >= 1 && ok(hi - stepDown)) {
      hi -= stepDown;
      stepDown *= 2;
    }
    lo = Math.max(0, hi - stepDown);
    if (lo >= 1 && ok(lo)) {
      hi = lo;
      lo = 0;
    }
  } else {
    lo = guess;
    let stepUp = Math.max(1, Math.ceil(guess * 0.25));
    hi = -1;
    while (hi < 0) {
      const next = Math.min(rs.maxLayers, lo + stepUp);
      if (ok(next)) hi = next;
      else {
        if (next === rs.maxLayers) return null;
        lo = next;
        stepUp *= 2;
      }
    }
  }
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  // Dense check: the design for N must also meet the target on a grid 4× finer in
  // frequency and angle. If a point between the search samples breaks it, the
  // strength is re-optimised on the dense grid itself; if that still fails, N
  // steps up by a gallop (1, 2, 4, … layers) and a bisection back down, so the
  // answer is the smallest N that passes with N − 1 failing.
  const w: Worst = { amplitude: 0, frequency: 0, angle: 0 };
  const denseMemo = new Map<number, { design: ResolvedDesign; worst: Peak } | null>();
  const densePass = (N: number): { design: ResolvedDesign; worst: Peak } | null => {
    if (denseMemo.has(N)) return denseMemo.get(N) ?? null;
    let pass: { design: ResolvedDesign; worst: Peak } | null = null;
    // The dense grid first (cheap, stops at the first sample over the target), then between its samples.
    const meets = (d: ResolvedDesign): Peak | null => {
      worstReflection(d, dense, rs.courantMedium, ws, target, 0, w);
      if (w.amplitude > target) return null;
      const peak = refinedWorst(d, dense, rs.courantMedium, ws, target);
      return peak.amplitude <= target ? peak : null;
    };
    // Feasibility stopped at the first strength under the target; the answer uses the best one.
    const opt = bestStrength(baseDesign(rs, N, order), grid, rs, ws, 0);
    if (opt.worst <= target) {
      const d = baseDesign(rs, N, order);
      d.strength = opt.strength;
      let peak = meets(d);
      if (!peak) {
        d.strength = bestStrength(baseDesign(rs, N, order), dense, rs, ws, 0).strength;
        peak = meets(d);
      }
      if (peak) pass = { design: d, worst: peak };
    }
    denseMemo.set(N, pass);
    return pass;
  };
  let failed = hi - 1; // the search grid already fails there (or hi = 1)
  let passed = -1;
  for (let step = 1, N = hi; ; step *= 2) {
    if (densePass(N)) {
      passed = N;
      break;
    }
    failed = N;
    if (N === rs.maxLayers) return null;
    N = Math.min(rs.maxLayers, N + step);
  }
  while (passed - failed > 1) {
    const mid = (failed + passed) >> 1;
    if (densePass(mid)) passed = mid;
    else failed = mid;
  }
  const { design: d, worst } = densePass(passed) as { design: ResolvedDesign; worst: Peak };
  const cont = continuousReflectionUnchecked(d, rs.ppwMax, rs.angleMaxDeg);
  return {
    layers: passed,
    order,
    strength: d.strength,
    kappaMax: rs.kappaMax,
    alphaMaxNorm: rs.alphaMaxNorm,
    alphaOrder: rs.alphaOrder,
    worstAmplitude: worst.amplitude,
    worstPpw: worst.ppw,
    worstAngleDeg: worst.angleDeg,
    continuousAmplitude: cont,
    thicknessCells: passed,
  };
}

const cache = new Map<string, DesignResult[]>();
const CACHE_LIMIT = 5000;

function canonicalKey(rs: ResolvedSpec): string {
  return [rs.target, rs.ppwMin, rs.ppwMax, rs.angleMaxDeg, rs.courantMedium, rs.orders.join('/'), rs.kappaMax, rs.alphaMaxNorm, rs.alphaOrder, rs.maxLayers].join('|');
}

const workspace = createWorkspace();

/**
 * The thinnest design per allowed grading order (orders with no design under the
 * layer cap are left out), sorted by layers then worst reflection.
 * Throws when no allowed order meets the target.
 */
export function designOptions(spec: DesignSpec): DesignResult[] {
  const rs = resolveSpec(spec);
  const key = canonicalKey(rs);
  const hit = cache.get(key);
  if (hit) return hit.map((r) => ({ ...r }));
  const grid = searchGrid(rs);
  const dense = denseGrid(rs);
  const results: DesignResult[] = [];
  for (const m of rs.orders) {
    const r = designForOrder(rs, m, grid, dense, workspace);
    if (r) results.push(r);
  }
  if (results.length === 0) {
    throw new HushInputError(
      'target reflection',
      `no design up to ${rs.maxLayers} layers meets |r| ≤ ${rs.target} at ${rs.ppwMin} cells per wavelength${rs.angleMaxDeg ? ` and ${rs.angleMaxDeg}°` : ''}: the grid's discretisation reflection${rs.angleMaxDeg ? ' and the weak absorption at large angles' : ''} set a floor; refine the grid, relax the tolerance${rs.angleMaxDeg ? ' or reduce the largest angle' : ''}`,
    );
  }
  results.sort((a, b) => a.layers - b.layers || a.worstAmplitude - b.worstAmplitude);
  if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  cache.set(key, results);
  return results.map((r) => ({ ...r }));
}

/**
 * The thinnest absorber that meets `target` over the band and angles.
 * Example: designAbsorber({ target: 1e-3, ppwMin: 20 }) → 4 layers of order 2, worst |r| 6.08e-4 (tests/design.test.ts).
 */
export function designAbsorber(spec: DesignSpec): DesignResult {
  return designOptions(spec)[0];
}

/** Clears the design cache (benchmarks measure with and without it). */
export function clearDesignCache(): void {
  cache.clear();
}

/**
 * Strength of the textbook recipe: σ_max chosen so that the continuous-theory
 * R(θ) of a layer of N cells equals the target (the continuous formula of Taflove & Hagness, 3rd ed., ch. 7, solved for σ_max):
 * s = ln(1/R)/(1.6·N·cos θ).
 */
export function textbookStrength(target: number, layers: number, angleDeg = 0): number {
  const R = inRange('target reflection', target, 0, 1, { loOpen: true, hiOpen: true });
  const N = wholeInRange('layers', layers, 1, MAX_LAYERS);
  const th = inRange('angle', angleDeg, 0, MAX_DESIGN_ANGLE_DEG, { unit: 'degrees' });
  // 1/R overflows for R below 1/Number.MAX_VALUE; there ln(1/R) = −ln R.
  const inverse = 1 / R;
  return (Number.isFinite(inverse) ? Math.log(inverse) : -Math.log(R)) / (1.6 * N * Math.cos((th * Math.PI) / 180));
}

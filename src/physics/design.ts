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
 * The sample sets and the worst reflection over them are in design-checks.ts,
 * step 2 in strength-run.ts, step 4's dense check in dense-check.ts.
 */
import { checkCourant, defaultCourant } from './courant';
import { checkPpw } from './dispersion';
import { continuousReflectionUnchecked } from './continuous';
import { setBounded } from './bounded-map';
import { HushInputError } from './errors';
import { checkSampling, profileAt, resolveDesign, type ResolvedDesign, type SamplingConvention } from './grading';
import { MAX_DECAY_CELLS, checkedEvanescentFactor, createWorkspace, type ReflectionWorkspace } from './reflection';
import { MAX_LAYERS } from './constants';
import { inRange, wholeInRange } from './validate';
import { designChecks, newWorst, worstReflection, type CheckGroup, type DesignChecks, type Worst } from './design-checks';
import { DenseCheck, type Peak, type Refined } from './dense-check';
import { StrengthRun, bestStrength, localStrength, type Optimum } from './strength-run';

export { designChecks, designWork, sampleGrid, worstReflection } from './design-checks';
export type { CheckGroup, DesignChecks, SampleGrid, Worst } from './design-checks';

/** Angles above this defeat any PML (R → 1 as cos θ → 0); the planner refuses them. */
export const MAX_DESIGN_ANGLE_DEG = 85;
/**
 * Largest azimuth of the plane of incidence accepted, degrees: the cubic Yee
 * grid is symmetric under φ → −φ and φ → 90° − φ (its dispersion relation,
 * physics.md §4, is), so 0–45° covers every plane of incidence.
 */
export const MAX_AZIMUTH_DEG = 45;
/** The conventions a design under sampling 'all' must meet (the solver-agnostic guarantee; 'lagged' is left out: no thin design survives it, see grading.ts). */
export const ALL_SAMPLINGS: readonly SamplingConvention[] = ['node', 'average', 'offset'];
/** κ_max values the design tries when it chooses κ (a near-field check is given and κ_max is not fixed). */
export const KAPPA_CANDIDATES: readonly number[] = [1, 2, 3, 5, 8];
/**
 * α_max_norm values the design tries when it chooses α, as fractions of the
 * band's lowest ω_norm = 2π/ppwMax, so the CFS shift sits below the band: at
 * 0.5 the propagating attenuation at the band's long end keeps 1/(1 + 0.5²) = 80 %
 * of its α-free value (continuous theory, physics.md §2).
 */
export const ALPHA_FRACTIONS: readonly number[] = [0, 0.2, 0.5];

export interface DesignSpec {
  /** Required amplitude reflection |r|, 0 < target < 1. */
  target: number;
  /** Cells per wavelength in the background medium at the short-wavelength end of the band. */
  ppwMin: number;
  /** Cells per wavelength at the long-wavelength end; default ppwMin. */
  ppwMax?: number;
  /** Largest angle of incidence in degrees; default 0. */
  angleMaxDeg?: number;
  /**
   * Largest azimuth of the plane of incidence about the face normal, 0–45 degrees
   * (3-D only): directions up to angleMaxDeg are checked at every azimuth from 0
   * to this. Default 45 in 3-D (every direction, by the grid's symmetry), 0 otherwise.
   */
  azimuthMaxDeg?: number;
  /** Vacuum Courant number; default 0.99/√D for the grid's D dimensions. */
  courant?: number;
  /** Grid dimensions for the Courant limit and the directions; default 3. */
  dimensions?: number;
  /** Background index n (the σ and α normalisation, and the band's cells per wavelength); default 1. */
  index?: number;
  /**
   * Indices of the media that cross the absorber, each 1–100; default [index].
   * The design meets the target in each: for medium n_j the same physical σ, α
   * and κ give σ_norm and α_norm scaled by n_j/n, Courant number S/n_j and
   * ppw·n/n_j cells per wavelength (physics.md §3). The background is not added
   * when a list is given.
   */
  absorberIndices?: number[];
  /** Allowed polynomial grading orders; default [2, 3, 4]. */
  orders?: number[];
  /** Fixed κ_max. Default 1; chosen from KAPPA_CANDIDATES when a near-field check (decayMinCells) is given. */
  kappaMax?: number;
  /** Fixed α_max·η₀·Δ·n (CFS shift). Default 0; chosen from ALPHA_FRACTIONS when a near-field check is given. */
  alphaMaxNorm?: number;
  /** Order of the reversed α grading; default 1. */
  alphaOrder?: number;
  /** Layer cap; default 200. */
  maxLayers?: number;
  /** Layer floor set by policy; default 1. */
  minLayers?: number;
  /** Sampling convention of the user's solver (grading.ts), or 'all' = the worst of node, average and offset; default 'node'. */
  sampling?: SamplingConvention | 'all';
  /**
   * Shortest decay length L_min (cells) of the structure's evanescent near
   * fields at the band's short end; absent → no near-field check. At a sample
   * of p cells per wavelength the decay checked is L(p) = decayMinCells·p/ppwMin
   * (decay lengths scale with the wavelength at fixed index contrast), in the
   * background medium, and the requirement is |r_ev(L)|·e^{−2·gap/L} ≤ target.
   */
  decayMinCells?: number;
  /** Structure-to-absorber gap in cells, for the near-field check (it has no other use); default 0. */
  gapCells?: number;
  /**
   * Choose κ_max and α_max_norm (those not fixed) from the candidates even
   * without a near-field check; default false, so a spec without near-field
   * inputs keeps κ_max = 1, α = 0 (the designs of model 1.0). Measured: on 1 of 6
   * sample specs (|r| ≤ 5e-4 at 12 cells per wavelength, 20°) the choice saves one
   * layer (5 instead of 6); it costs up to 15× the search work.
   */
  chooseKappaAlpha?: boolean;
}

export interface MediumWorst {
  index: number;
  /** Worst propagating |r| in this medium on the dense check. */
  worstAmplitude: number;
}

export interface DesignResult {
  layers: number;
  order: number;
  strength: number;
  kappaMax: number;
  alphaMaxNorm: number;
  alphaOrder: number;
  /** Worst propagating |r| on the dense check grid (over every medium and convention checked). */
  worstAmplitude: number;
  /** Where the worst occurs (cells per wavelength in the background). */
  worstPpw: number;
  worstAngleDeg: number;
  worstAzimuthDeg: number;
  /**
   * The sampling convention under which the worst propagating |r| occurs (the
   * spec's own unless it asked for 'all'), so that reflection(result, worst
   * point) reproduces worstAmplitude.
   */
  sampling: SamplingConvention;
  /** Index of the medium crossing the absorber that limits the design (its propagating |r| is the highest). */
  limitingIndex: number;
  /** Worst propagating |r| per medium, in the order of absorberIndices. */
  mediumWorst: MediumWorst[];
  /** Continuous-theory |r| of the same design at the worst point of the continuous model (largest angle, longest wavelength). */
  continuousAmplitude: number;
  thicknessCells: number;
  /** Sampling checked: one convention or 'all' (node, average and offset). */
  samplingChecked: SamplingConvention | 'all';
  /** Vacuum Courant number and grid dimensions the design holds for. */
  courant: number;
  dimensions: number;
  /** Azimuths checked: 0 to this, degrees. */
  azimuthMaxDeg: number;
  minLayers: number;
  /** True where the design chose κ_max / α_max (not fixed by the spec). */
  kappaChosen: boolean;
  alphaChosen: boolean;
  /** One sentence: why α_max is what it is. */
  alphaReason: string;
  /** Near-field check (null without decayMinCells): worst |r_ev|·e^{−2·gap/L}, the same |r_ev| before the gap factor, where (background cells per wavelength) and at which decay length. */
  worstEvanescent: number | null;
  worstEvanescentBare: number | null;
  worstEvanescentPpw: number | null;
  worstEvanescentDecayCells: number | null;
  decayMinCells: number | null;
  gapCells: number;
}

/** A design spec checked, with its defaults filled in (κ_max / α_max_norm null: chosen by the design). */
export interface ResolvedSpec {
  target: number;
  ppwMin: number;
  ppwMax: number;
  angleMaxDeg: number;
  azimuthMaxDeg: number;
  courant: number;
  courantMedium: number;
  dimensions: number;
  index: number;
  absorberIndices: number[];
  orders: number[];
  kappaMax: number | null;
  alphaMaxNorm: number | null;
  alphaOrder: number;
  maxLayers: number;
  minLayers: number;
  sampling: SamplingConvention | 'all';
  samplings: SamplingConvention[];
  /** 0: no near-field check. */
  decayMinCells: number;
  gapCells: number;
}

/** Search sampling: frequencies, angles and azimuths (endpoints included); the dense check uses 4× as many intervals in frequency and angle. */
const SEARCH_FREQUENCIES = 6;
const SEARCH_ANGLES = 5;
const DENSE_FACTOR = 4;
/** Azimuths 0 and φ_max on the search grid, and their midpoint too on the dense grid; the dense peaks are climbed in azimuth as well (|r| varies by parts in 10⁵ over φ at 15–30 cells per wavelength, monotonically in nearly every case seen). */
const SEARCH_AZIMUTHS = 2;
const DENSE_AZIMUTHS = 3;
/** With several check groups, a dense miss larger than this factor is not re-optimised (the next layer count is tried instead). */
const REOPT_MISS = 1.5;
/** Strengths σ_max/σ_opt of the coarse scan that ranks the κ/α candidates. */
const RANK_STRENGTHS = [0.35, 0.6, 1, 1.7, 3];

function uniqueSorted(field: string, values: unknown, lo: number, hi: number, example: string): number[] {
  if (!Array.isArray(values) || values.length === 0) {
    throw new HushInputError(field, `${field} must be a non-empty list such as ${example}`, 'value');
  }
  return [...new Set(values.map((m) => inRange(field.replace(/s$/, ''), m, lo, hi)))].sort((a, b) => a - b);
}

/** Checks a design spec and fills in its defaults (the checked half of designOptions; src/physics/internal.ts). */
export function resolveSpec(spec: DesignSpec): ResolvedSpec {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('design spec', 'design spec must be an object', 'value');
  const target = inRange('target reflection', spec.target, 0, 1, { loOpen: true, hiOpen: true });
  const dimensions = wholeInRange('dimensions', spec.dimensions ?? 3, 1, 3);
  const courant = checkCourant(spec.courant ?? defaultCourant(dimensions), dimensions);
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
  let azimuthMaxDeg: number;
  if (spec.azimuthMaxDeg === undefined) azimuthMaxDeg = dimensions === 3 ? MAX_AZIMUTH_DEG : 0;
  else {
    azimuthMaxDeg = inRange('largest azimuth', spec.azimuthMaxDeg, 0, MAX_AZIMUTH_DEG, { unit: 'degrees' });
    if (dimensions < 3 && azimuthMaxDeg !== 0) {
      throw new HushInputError('largest azimuth', `a ${dimensions}-D grid has one plane of incidence: the azimuth needs a 3-D grid (got ${azimuthMaxDeg}°)`);
    }
  }
  // Normal incidence has no plane of incidence to turn.
  if (angleMaxDeg === 0) azimuthMaxDeg = 0;
  const ppwMin = checkPpw('cells per wavelength (short end)', spec.ppwMin, courantMedium, 0);
  const ppwMax = inRange('cells per wavelength (long end)', spec.ppwMax ?? ppwMin, ppwMin, 1e6);
  const absorberIndices = spec.absorberIndices === undefined ? [index] : uniqueSorted('absorber indices', spec.absorberIndices, 1, 100, '1.44, 3.48');
  for (const nj of absorberIndices) {
    if (nj !== index) checkPpw(`cells per wavelength in the medium of index ${nj} (short end)`, (ppwMin * index) / nj, courant / nj, 0);
  }
  const orders = uniqueSorted('grading orders', spec.orders ?? [2, 3, 4], 1, 10, '2, 3, 4');
  const decayGiven = spec.decayMinCells !== undefined;
  const decayMinCells = decayGiven ? inRange('shortest decay length', spec.decayMinCells, 0, MAX_DECAY_CELLS, { loOpen: true, unit: 'cells' }) : 0;
  const gapCells = inRange('gap', spec.gapCells ?? 0, 0, 1e6, { unit: 'cells' });
  const choose = spec.chooseKappaAlpha === undefined ? false : spec.chooseKappaAlpha;
  if (typeof choose !== 'boolean') throw new HushInputError('choose kappa and alpha', `choose kappa and alpha must be true or false (got ${JSON.stringify(choose)})`, 'value');
  const free = decayGiven || choose;
  const kappaMax = spec.kappaMax !== undefined ? inRange('kappa max', spec.kappaMax, 1, 100) : free ? null : 1;
  const alphaMaxNorm = spec.alphaMaxNorm !== undefined ? inRange('alpha max (normalised)', spec.alphaMaxNorm, 0, 10) : free ? null : 0;
  const alphaOrder = inRange('alpha order', spec.alphaOrder ?? 1, 0, 10);
  const maxLayers = wholeInRange('layer cap', spec.maxLayers ?? MAX_LAYERS, 1, MAX_LAYERS);
  const minLayers = wholeInRange('layer floor', spec.minLayers ?? 1, 1, MAX_LAYERS);
  if (minLayers > maxLayers) throw new HushInputError('layer floor', `the layer floor ${minLayers} is above the layer cap ${maxLayers}`);
  const sampling = spec.sampling === 'all' ? 'all' : checkSampling(spec.sampling ?? 'node');
  const samplings = sampling === 'all' ? [...ALL_SAMPLINGS] : [sampling];
  if (decayGiven) {
    // The shortest decay (at the band's short end, where Ω is largest) must exist on the grid.
    checkedEvanescentFactor('shortest decay length', decayMinCells, (2 * Math.PI * courantMedium) / ppwMin, courantMedium, dimensions, ppwMin);
  }
  return {
    target, ppwMin, ppwMax, angleMaxDeg, azimuthMaxDeg, courant, courantMedium, dimensions, index, absorberIndices, orders,
    kappaMax, alphaMaxNorm, alphaOrder, maxLayers, minLayers, sampling, samplings, decayMinCells, gapCells,
  };
}

/**
 * Strength runs of the module's searches: per search key (physics, order,
 * κ_max, α_max_norm: orderSearch) the runs by layers and sample set. Beyond
 * RUN_LIMIT runs in all, the oldest keys' runs are dropped (only work is lost).
 */
const runs = new Map<string, Map<number, StrengthRun>>();
let runCount = 0;
const RUN_LIMIT = 16000;
/** Dense checks of the module's searches by the same key and the design's strength (DenseCheck). */
const denseChecksKept = new Map<string, DenseCheck>();
const DENSE_LIMIT = 1500;

/** The runs of one search key (see `runs`). */
function runsOf(key: string): Map<number, StrengthRun> {
  let m = runs.get(key);
  if (!m) {
    while (runCount >= RUN_LIMIT && runs.size > 0) {
      const oldest = runs.keys().next().value as string;
      runCount -= (runs.get(oldest) as Map<number, StrengthRun>).size;
      runs.delete(oldest);
    }
    m = new Map();
    runs.set(key, m);
  }
  return m;
}


/**
 * Best strength and worst sampled |r| for a given layer count and order on the
 * search grid of `spec` (exported so tests can probe minimality); κ_max and
 * α_max_norm as fixed by the spec, else 1 and 0.
 */
export function bestStrengthFor(spec: DesignSpec, layers: number, order: number, dense = false): Optimum {
  const rs = resolveSpec(spec);
  const checks = dense ? denseChecks(rs) : searchChecks(rs);
  const d = baseDesign(layers, order, rs.kappaMax ?? 1, rs.alphaMaxNorm ?? 0, rs.alphaOrder);
  return bestStrength(d, checks, createWorkspace(), 0);
}

function baseDesign(layers: number, order: number, kappaMax: number, alphaMaxNorm: number, alphaOrder: number): ResolvedDesign {
  return resolveDesign({ layers, order, strength: 1, kappaMax, alphaMaxNorm, alphaOrder });
}

function searchChecks(rs: ResolvedSpec): DesignChecks {
  return designChecks(rs, SEARCH_FREQUENCIES, SEARCH_ANGLES, SEARCH_AZIMUTHS);
}

/** The screen of the search grid (its primary subset), or null when it is the search grid itself. */
function screenChecks(rs: ResolvedSpec): DesignChecks | null {
  const whole = rs.absorberIndices.length === 1 && rs.samplings.length === 1 && rs.azimuthMaxDeg === 0;
  return whole ? null : designChecks(rs, SEARCH_FREQUENCIES, SEARCH_ANGLES, 1, true);
}

function denseChecks(rs: ResolvedSpec): DesignChecks {
  return designChecks(rs, (SEARCH_FREQUENCIES - 1) * DENSE_FACTOR + 1, (SEARCH_ANGLES - 1) * DENSE_FACTOR + 1, DENSE_AZIMUTHS);
}

/**
 * The sample sets of one search: the search grid, its screen (or null) and the
 * dense check; made once per physics (runKey, searchChecksOf) and kept with
 * what the searches of that physics share: the key of their strength runs and
 * dense checks, the candidates' rankings and continuous-theory integrals.
 */
interface SearchChecks {
  grid: DesignChecks;
  screen: DesignChecks | null;
  dense: DesignChecks;
  /** Short key of this physics for the strength runs and dense checks (a counter, unique while the module lives). */
  key: string;
  rankings: Map<string, Ranked[]>;
  integrals: Map<string, CandidateIntegrals>;
}

/** A (κ_max, α_max_norm) candidate and the lowest worst it reaches in designForOrder's ranking. */
interface Ranked {
  kappa: number;
  alpha: number;
  est: number;
}

/** candidateEstimate's integrals per band sample: the attenuation kept by the CFS shift (att/attFree) and ∫₀¹ Re s du. */
interface CandidateIntegrals {
  kept: Float64Array;
  re: Float64Array;
}

const physicsKept = new Map<string, SearchChecks>();
const PHYSICS_LIMIT = 200;
let physicsCount = 0;

/** The sample sets of `rs` and what its searches share (made on first use; the oldest are dropped beyond PHYSICS_LIMIT). */
function searchChecksOf(rs: ResolvedSpec): SearchChecks {
  const key = runKey(rs);
  let c = physicsKept.get(key);
  if (!c) {
    c = { grid: searchChecks(rs), screen: screenChecks(rs), dense: denseChecks(rs), key: `${++physicsCount}`, rankings: new Map(), integrals: new Map() };
    setBounded(physicsKept, key, c, PHYSICS_LIMIT);
  }
  return c;
}

interface Pass {
  layers: number;
  design: ResolvedDesign;
  refined: Refined;
}

/** The search of one grading order with fixed κ_max and α_max_norm: feasibility on the search grid and the dense check, memoised per N. */
interface OrderSearch {
  /** Best strength on the search grid at N, stopping at the first strength under the target (N below the floor: infeasible). */
  feasible(N: number): Optimum;
  /** The checks where the last infeasible `feasible(N)` failed: one group of the screen or of the search grid. */
  failedGroup(N: number): CheckGroup | null;
  /** Best strength on the search grid at N, stopping at the first worst under `bound`. */
  below(N: number, bound: number): Optimum;
  /** The design at N if it passes the dense check, else null. */
  densePass(N: number): Pass | null;
  /** The thinnest design up to `cap` layers (N − 1 failing), or null; the search starts at `start` (default: the continuous-theory estimate). */
  thinnest(cap: number, start?: number): Pass | null;
}

function orderSearch(rs: ResolvedSpec, order: number, kappaMax: number, alphaMaxNorm: number, checks: SearchChecks, ws: ReflectionWorkspace): OrderSearch {
  const { grid, dense, screen } = checks;
  const target = rs.target;
  const base = (N: number) => baseDesign(N, order, kappaMax, alphaMaxNorm, rs.alphaOrder);
  // The strength runs at N on each sample set, shared with every search of the same physics (strengthRun).
  const prefix = `${checks.key}|${order}|${kappaMax}|${alphaMaxNorm}|`;
  const shared = runsOf(prefix);
  const kinds = { screen: 0, grid: 1, dense: 2 } as const;
  const runOf = (N: number, kind: keyof typeof kinds): StrengthRun => {
    const key = 3 * N + kinds[kind];
    let r = shared.get(key);
    if (!r) {
      r = new StrengthRun(base(N), kind === 'screen' ? (screen as DesignChecks) : kind === 'grid' ? grid : dense, ws);
      shared.set(key, r);
      if (runs.get(prefix) === shared) runCount++;
    }
    return r;
  };
  const memo = new Map<number, Optimum>();
  const failedIn = new Map<number, CheckGroup>();
  const infeasible: Optimum = { strength: 1, worst: Infinity, group: 0 };
  const feasible = (N: number): Optimum => {
    if (N < rs.minLayers) return infeasible;
    let o = memo.get(N);
    if (!o) {
      // The screen first: failing its subset of the samples proves failure at a fraction of the work
      // (most of a search's work is spent on layer counts that fail).
      if (screen) {
        o = runOf(N, 'screen').until(target);
        if (o.worst > target) failedIn.set(N, screen.groups[o.group]);
      }
      if (!o || o.worst <= target) {
        o = runOf(N, 'grid').until(target);
        if (o.worst > target) failedIn.set(N, grid.groups[o.group]);
      }
      memo.set(N, o);
    }
    return o;
  };
  const ok = (N: number) => feasible(N).worst <= target;
  const denseCheckOf = (d: ResolvedDesign): DenseCheck => {
    const key = `${prefix}${d.layers}|${d.strength}`;
    let c = denseChecksKept.get(key);
    if (!c) {
      c = new DenseCheck(d, dense, rs);
      setBounded(denseChecksKept, key, c, DENSE_LIMIT);
    }
    return c;
  };
  const denseMemo = new Map<number, Pass | null>();
  const densePass = (N: number): Pass | null => {
    if (N < rs.minLayers) return null;
    if (denseMemo.has(N)) return denseMemo.get(N) ?? null;
    let pass: Pass | null = null;
    // The dense grid first (cheap, stops at the first sample over the target), then between its samples.
    let failedGroup = 0;
    let scanned = 0;
    const meets = (d: ResolvedDesign, bound = target): Refined | null => {
      const check = denseCheckOf(d);
      const sw = check.scan(bound, ws);
      failedGroup = sw.group;
      scanned = sw.amplitude;
      if (sw.amplitude > target) return null;
      const peak = check.refined(target, ws);
      if (peak.overall.amplitude <= target) return peak;
      failedGroup = peak.perGroup.indexOf(peak.overall);
      return null;
    };
    // Feasibility stopped at the first strength under the target; the answer uses the best one.
    const opt = runOf(N, 'grid').until(0);
    if (opt.worst <= target) {
      const d = base(N);
      d.strength = opt.strength;
      // With several groups (media, conventions, azimuths, near field) the dense grid is large: the
      // strength is then re-optimised locally (one scan step either side of the search optimum) on the
      // search grid plus the dense group that failed, and only for a miss below REOPT_MISS × target;
      // the dense check that follows is on every group, so this bounds the work, not the guarantee.
      let peak = meets(d, screen ? REOPT_MISS * target : target);
      if (!peak && !screen) {
        d.strength = runOf(N, 'dense').until(0).strength;
        peak = meets(d);
      } else if (!peak && scanned <= REOPT_MISS * target) {
        d.strength = localStrength(base(N), { groups: [...grid.groups, dense.groups[failedGroup]] }, ws, opt.strength);
        peak = meets(d);
      }
      if (peak) pass = { layers: N, design: d, refined: peak };
    }
    denseMemo.set(N, pass);
    return pass;
  };
  const thinnest = (cap: number, start?: number): Pass | null => {
    if (cap < rs.minLayers) return null;
    const cosT = Math.cos((rs.angleMaxDeg * Math.PI) / 180);
    // Continuous-theory estimate at σ_opt: R = e^{−1.6·N·cos θ} (physics.md §2).
    const estimate = start ?? Math.ceil(Math.log(1 / target) / (1.6 * cosT));
    const guess = Math.max(rs.minLayers, Math.min(cap, estimate));
    let lo: number; // infeasible (rs.minLayers − 1 = none known)
    let hi: number; // feasible
    const floor = rs.minLayers - 1;
    if (ok(guess)) {
      hi = guess;
      let stepDown = 1;
      while (hi - stepDown > floor && ok(hi - stepDown)) {
        hi -= stepDown;
        stepDown *= 2;
      }
      lo = Math.max(floor, hi - stepDown);
      if (lo > floor && ok(lo)) {
        hi = lo;
        lo = floor;
      }
    } else {
      lo = guess;
      let stepUp = Math.max(1, Math.ceil(guess * 0.25));
      hi = -1;
      while (hi < 0) {
        if (lo >= cap) return null;
        const next = Math.min(cap, lo + stepUp);
        if (ok(next)) hi = next;
        else {
          if (next === cap) return null;
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
    let failed = hi - 1; // the search grid already fails there (or hi is the floor)
    let passed = -1;
    for (let step = 1, N = hi; ; step *= 2) {
      if (densePass(N)) {
        passed = N;
        break;
      }
      failed = N;
      if (N >= cap) return null;
      N = Math.min(cap, N + step);
    }
    while (passed - failed > 1) {
      const mid = (failed + passed) >> 1;
      if (densePass(mid)) passed = mid;
      else failed = mid;
    }
    return densePass(passed);
  };
  const below = (N: number, bound: number): Optimum => (N < rs.minLayers ? infeasible : runOf(N, 'grid').until(bound));
  return { feasible, failedGroup: (N) => failedIn.get(N) ?? null, below, densePass, thinnest };
}

/** The reported figures of a design that passed. */
function resultOf(rs: ResolvedSpec, dense: DesignChecks, pass: Pass, choice: { kappaChosen: boolean; alphaChosen: boolean; alphaReason: string }): DesignResult {
  const d = pass.design;
  const groups = dense.groups;
  let prop: Peak | null = null;
  let propGroup = 0;
  let ev: Peak | null = null;
  let evGroup = -1;
  const mediumWorst: MediumWorst[] = rs.absorberIndices.map((index) => ({ index, worstAmplitude: 0 }));
  pass.refined.perGroup.forEach((p, k) => {
    const g = groups[k];
    if (g.evanescent) {
      if (!ev || p.amplitude > ev.amplitude) {
        ev = p;
        evGroup = k;
      }
    } else {
      if (!prop || p.amplitude > prop.amplitude) {
        prop = p;
        propGroup = k;
      }
      const m = mediumWorst[rs.absorberIndices.indexOf(g.index)];
      m.worstAmplitude = Math.max(m.worstAmplitude, p.amplitude);
    }
  });
  const worst = prop as unknown as Peak;
  let evBare: number | null = null;
  let evDecay: number | null = null;
  if (ev && evGroup >= 0) {
    const e = ev as Peak;
    evDecay = (rs.decayMinCells * e.ppw) / rs.ppwMin;
    evBare = e.amplitude / Math.exp((-2 * rs.gapCells) / evDecay);
  }
  const evPeak = ev as Peak | null;
  return {
    layers: pass.layers,
    order: d.order,
    strength: d.strength,
    kappaMax: d.kappaMax,
    alphaMaxNorm: d.alphaMaxNorm,
    alphaOrder: d.alphaOrder,
    worstAmplitude: worst.amplitude,
    worstPpw: worst.ppw,
    worstAngleDeg: worst.angleDeg,
    worstAzimuthDeg: worst.azimuthDeg,
    sampling: groups[propGroup].sampling,
    limitingIndex: groups[propGroup].index,
    mediumWorst,
    continuousAmplitude: continuousReflectionUnchecked(d, rs.ppwMax, rs.angleMaxDeg),
    thicknessCells: pass.layers,
    samplingChecked: rs.sampling,
    courant: rs.courant,
    dimensions: rs.dimensions,
    azimuthMaxDeg: rs.azimuthMaxDeg,
    minLayers: rs.minLayers,
    kappaChosen: choice.kappaChosen,
    alphaChosen: choice.alphaChosen,
    alphaReason: choice.alphaReason,
    worstEvanescent: evPeak ? evPeak.amplitude : null,
    worstEvanescentBare: evBare,
    worstEvanescentPpw: evPeak ? evPeak.ppw : null,
    worstEvanescentDecayCells: evDecay,
    decayMinCells: rs.decayMinCells > 0 ? rs.decayMinCells : null,
    gapCells: rs.gapCells,
  };
}

const prof = new Float64Array(3);

/**
 * Continuous-theory layer estimate of a (κ_max, α_max_norm) candidate at σ_opt,
 * to order the candidates (physics.md §2, and the near-field form of
 * continuous.ts): propagating N ≈ ln(1/R)/(1.6·cos θ·w) with w the share of the
 * attenuation a CFS shift leaves at the band's long end; near field
 * N ≈ max_p (L(p)·ln(1/R)/2 − gap)/∫₀¹ Re s du, s = κ + σ/(α + jω).
 */
function candidateEstimate(rs: ResolvedSpec, order: number, kappaMax: number, alphaMaxNorm: number, ppw: Float64Array, kept: Map<string, CandidateIntegrals>): number {
  const lnR = Math.log(1 / rs.target);
  const cosT = Math.cos((rs.angleMaxDeg * Math.PI) / 180);
  const { kept: share, re } = candidateIntegrals(rs, order, kappaMax, alphaMaxNorm, ppw, kept);
  let est = 0;
  for (let i = 0; i < ppw.length; i++) {
    est = Math.max(est, lnR / (1.6 * cosT * share[i]));
    if (rs.decayMinCells > 0) {
      const L = (rs.decayMinCells * ppw[i]) / rs.ppwMin;
      est = Math.max(est, (L * lnR) / 2 - rs.gapCells > 0 ? ((L * lnR) / 2 - rs.gapCells) / re[i] : 0);
    }
  }
  return est;
}

/** Nodes and weights of 5-point Gauss–Legendre quadrature on [−1, 1] (Abramowitz & Stegun, table 25.4). */
const GAUSS5_NODES = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const GAUSS5_WEIGHTS = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

/** candidateEstimate's integrals of a candidate (they do not depend on the target), by 16-panel 5-point Gauss–Legendre quadrature, kept per physics. */
function candidateIntegrals(rs: ResolvedSpec, order: number, kappaMax: number, alphaMaxNorm: number, ppw: Float64Array, kept: Map<string, CandidateIntegrals>): CandidateIntegrals {
  const key = `${order}|${kappaMax}|${alphaMaxNorm}|${rs.maxLayers}`;
  const known = kept.get(key);
  if (known) return known;
  const d = baseDesign(rs.maxLayers, order, kappaMax, alphaMaxNorm, rs.alphaOrder);
  const panels = 16;
  const xs = GAUSS5_NODES;
  const wts = GAUSS5_WEIGHTS;
  const out: CandidateIntegrals = { kept: new Float64Array(ppw.length), re: new Float64Array(ppw.length) };
  for (let i = 0; i < ppw.length; i++) {
    const wn = (2 * Math.PI) / ppw[i];
    let att = 0;
    let attFree = 0;
    let re = 0;
    for (let p = 0; p < panels; p++) {
      for (let k = 0; k < 5; k++) {
        const u = (p + (xs[k] + 1) / 2) / panels;
        profileAt(d, u, prof);
        const w = wts[k] / (2 * panels);
        const r = prof[2] / wn;
        att += (w * prof[0]) / (1 + r * r);
        attFree += w * prof[0];
        re += w * (prof[1] + (prof[0] * prof[2]) / (prof[2] * prof[2] + wn * wn));
      }
    }
    out.kept[i] = att / attFree;
    out.re[i] = re;
  }
  kept.set(key, out);
  return out;
}

function describeSample(rs: ResolvedSpec, checks: DesignChecks, w: Worst): string {
  const g = checks.groups[w.group];
  const p = g.ppw[w.frequency];
  if (g.evanescent) return `the near field at ${p.toPrecision(3)} cells per wavelength (decay ${((rs.decayMinCells * p) / rs.ppwMin).toPrecision(3)} cells)`;
  return `propagating waves at ${p.toPrecision(3)} cells per wavelength`;
}

/**
 * The thinnest design of one order, choosing κ_max and α_max_norm where the spec
 * leaves them free (only with a near-field check): the candidates
 * KAPPA_CANDIDATES × ALPHA_FRACTIONS·ω_min are ordered by their continuous-theory
 * estimate; the first is searched in full, every other one is first screened on
 * the search grid at one layer fewer than the best so far (a full search only
 * if it passes there), and at the best's layer count only if its search-grid
 * optimum is below the best's dense worst (the tie-break: lower worst |r|).
 * Cheapest = fewest layers; ties → lower worst weighted |r|.
 */
function designForOrder(rs: ResolvedSpec, order: number, checks: SearchChecks, ws: ReflectionWorkspace): DesignResult | null {
  const { grid, dense } = checks;
  const omegaMin = (2 * Math.PI) / rs.ppwMax;
  // Float64Arrays: one element kind whatever the values, so the optimised search does not reshape for them.
  const kappas = Float64Array.from(rs.kappaMax !== null ? [rs.kappaMax] : KAPPA_CANDIDATES);
  const alphas = Float64Array.from(rs.alphaMaxNorm !== null ? [rs.alphaMaxNorm] : ALPHA_FRACTIONS.map((f) => f * omegaMin));
  const kappaChosen = rs.kappaMax === null;
  const alphaChosen = rs.alphaMaxNorm === null;
  if (!kappaChosen && !alphaChosen) {
    const pass = orderSearch(rs, order, kappas[0], alphas[0], checks, ws).thinnest(rs.maxLayers);
    if (!pass) return null;
    const reason =
      rs.alphaMaxNorm !== 0
        ? 'α_max is fixed by the input'
        : rs.decayMinCells > 0
          ? 'α_max is fixed by the input at 0 (no frequency shift)'
          : 'α = 0: no near-field decay length was given, so nothing needs a frequency shift (it would only weaken the absorption of propagating waves at the band\'s long end)';
    return resultOf(rs, dense, pass, { kappaChosen, alphaChosen, alphaReason: reason });
  }
  const band = grid.groups[0].ppw;
  // Order of the candidates: by the lowest worst |r| each reaches on the screen (or the search grid) at
  // one probe layer count, the median of their continuous-theory estimates, over a coarse scan of
  // strengths (each evaluation stops once above the best of all candidates so far): the grid itself
  // ranks them, as continuous theory misses κ's own grading reflection on coarse grids.
  const estimates: number[] = [];
  for (const kappa of kappas) for (const alpha of alphas) estimates.push(candidateEstimate(rs, order, kappa, alpha, band, checks.integrals));
  const sorted = [...estimates].sort((a, b) => a - b);
  const probe = Math.max(rs.minLayers, Math.min(rs.maxLayers, Math.ceil(sorted[Math.floor(sorted.length / 2)])));
  const screen = checks.screen ?? grid;
  const w: Worst = newWorst();
  /** The candidates in order of the lowest worst each reaches at `layers` over RANK_STRENGTHS on the screen. */
  const ranked = (list: { kappa: number; alpha: number }[], layers: number): Ranked[] => {
    const key = `${order}|${layers}|${list.map((c) => `${c.kappa}/${c.alpha}`).join(',')}`;
    const known = checks.rankings.get(key);
    if (known) return [...known];
    let bound = Infinity;
    const out = list.map(({ kappa, alpha }) => {
      const d = baseDesign(layers, order, kappa, alpha, rs.alphaOrder);
      let est = Infinity;
      for (const strength of RANK_STRENGTHS) {
        d.strength = strength;
        worstReflection(d, screen, ws, bound, null, w);
        est = Math.min(est, w.amplitude);
        bound = Math.min(bound, w.amplitude);
      }
      return { kappa, alpha, est };
    });
    out.sort((a, b) => a.est - b.est || a.kappa - b.kappa || a.alpha - b.alpha);
    checks.rankings.set(key, out);
    return [...out];
  };
  const pairs: { kappa: number; alpha: number }[] = [];
  for (const kappa of kappas) for (const alpha of alphas) pairs.push({ kappa, alpha });
  let cands = ranked(pairs, probe);
  let best: Pass | null = null;
  let bestCand = cands[0];
  const searches = new Map<string, OrderSearch>();
  const searchOf = (kappa: number, alpha: number): OrderSearch => {
    const key = `${kappa}|${alpha}`;
    let o = searches.get(key);
    if (!o) {
      o = orderSearch(rs, order, kappa, alpha, checks, ws);
      searches.set(key, o);
    }
    return o;
  };
  let reranked = false;
  for (let ci = 0; ci < cands.length; ci++) {
    const c = cands[ci];
    const search = searchOf(c.kappa, c.alpha);
    if (!best) {
      // While no candidate has a design, each is first screened at the layer cap (after the first, on the
      // one group where the best-ranked one failed there: failing a subset proves failing the whole),
      // so a candidate with no design up to the cap costs one layer count, not a search.
      const g = ci === 0 ? null : searchOf(cands[0].kappa, cands[0].alpha).failedGroup(rs.maxLayers);
      if (g && bestStrength(baseDesign(rs.maxLayers, order, c.kappa, c.alpha, rs.alphaOrder), { groups: [g] }, ws, rs.target).worst > rs.target) continue;
      if (search.feasible(rs.maxLayers).worst > rs.target) continue;
      best = search.thinnest(rs.maxLayers, ci === 0 ? undefined : rs.maxLayers);
      bestCand = c;
      if (best && !reranked && best.layers - 1 >= rs.minLayers) {
        // The rest again, ranked one layer below the first design: the likeliest to beat it come first.
        cands = [...cands.slice(0, ci + 1), ...ranked(cands.slice(ci + 1), best.layers - 1)];
        reranked = true;
      }
      continue;
    }
    const N = best.layers;
    if (N - 1 >= rs.minLayers && search.feasible(N - 1).worst <= rs.target) {
      const fewer = search.thinnest(N - 1, N - 1);
      if (fewer) {
        best = fewer;
        bestCand = c;
        continue;
      }
    }
    // A tie at N can only win with a lower worst: look for a strength under the incumbent's worst
    // (the search grid is a subset of the dense one, so a candidate with none cannot win).
    const bound = best.refined.overall.amplitude;
    const first = search.feasible(N);
    const o = first.worst < bound ? first : first.worst > rs.target ? first : search.below(N, bound);
    if (o.worst < bound) {
      const tie = search.densePass(N);
      if (tie && tie.refined.overall.amplitude < best.refined.overall.amplitude) {
        best = tie;
        bestCand = c;
      }
    }
  }
  if (!best) return null;
  const N = best.layers;
  let reason: string;
  const shift = `${(bestCand.alpha / omegaMin).toPrecision(2)} × the band's lowest ω_norm ${omegaMin.toPrecision(3)}`;
  if (!alphaChosen) reason = bestCand.alpha > 0 ? 'α_max is fixed by the input' : 'α_max is fixed by the input at 0 (no frequency shift)';
  else if (bestCand.alpha === 0) {
    const nearField = rs.decayMinCells > 0 ? `, the near field at the band's long end (decay ${((rs.decayMinCells * rs.ppwMax) / rs.ppwMin).toPrecision(3)} cells) included` : ' (no near-field check was asked for)';
    reason = `α = 0: no frequency shift up to ${ALPHA_FRACTIONS[ALPHA_FRACTIONS.length - 1]} × the band's lowest ω_norm (${omegaMin.toPrecision(3)}) gave a thinner design or a lower worst reflection${nearField}`;
  } else {
    // Why the shift: the α-free candidates at the same layer count, on the search grid (memoised where the search already looked).
    let closest: { kappa: number; o: Optimum } | null = null;
    for (const kappa of kappas) {
      const o = searchOf(kappa, 0).feasible(N);
      if (!closest || o.worst < closest.o.worst) closest = { kappa, o };
    }
    const c = closest as { kappa: number; o: Optimum };
    if (c.o.worst > rs.target) {
      const d = baseDesign(N, order, c.kappa, 0, rs.alphaOrder);
      d.strength = c.o.strength;
      const w = worstReflection(d, grid, ws, Infinity, null);
      const where = describeSample(rs, grid, w);
      const why = grid.groups[w.group].evanescent
        ? "an α-free CPML adds no decay to an evanescent field beyond κ's, and the longest decay sits at the band's long end"
        : rs.decayMinCells > 0
          ? 'the α-free gradings that would absorb the near field reflect the propagating waves more'
          : 'at this thickness the shift lets a stronger grading reflect less';
      reason = `α_max = ${bestCand.alpha.toPrecision(3)} (${shift}, below the band): without a frequency shift no κ_max of ${kappas.join(', ')} meets the target with ${N} layers (the closest, κ_max = ${c.kappa}, reaches ${w.amplitude.toPrecision(3)} from ${where}): ${why}`;
    } else {
      reason = `α_max = ${bestCand.alpha.toPrecision(3)} (${shift}, below the band): ${N} layers meet the target without a shift too (κ_max = ${c.kappa}), and the shift lowers the worst reflection to ${best.refined.overall.amplitude.toPrecision(3)}`;
    }
  }
  return resultOf(rs, dense, best, { kappaChosen, alphaChosen, alphaReason: reason });
}

const cache = new Map<string, DesignResult[]>();
const CACHE_LIMIT = 5000;

function canonicalKey(rs: ResolvedSpec): string {
  return [rs.target, rs.orders.join('/'), rs.kappaMax, rs.alphaMaxNorm, rs.maxLayers, rs.minLayers, runKey(rs)].join('|');
}

/** What the sample sets and the strength runs of a spec depend on: everything but the target, the orders, κ/α choices and layer limits (each run's own order, κ_max, α_max_norm and N are added to it). */
function runKey(rs: ResolvedSpec): string {
  return [rs.ppwMin, rs.ppwMax, rs.angleMaxDeg, rs.azimuthMaxDeg, rs.courant, rs.index, rs.dimensions, rs.absorberIndices.join('/'), rs.alphaOrder, rs.sampling, rs.decayMinCells, rs.gapCells].join('|');
}

const workspace = createWorkspace();

/**
 * `designOptions` for an already resolved spec (src/physics/internal.ts): the
 * plan layer checks its inputs once and calls the search directly.
 */
export function designOptionsResolved(rs: ResolvedSpec): DesignResult[] {
  const key = canonicalKey(rs);
  const hit = cache.get(key);
  if (hit) return hit.map(copyResult);
  const checks = searchChecksOf(rs);
  const results: DesignResult[] = [];
  for (const m of rs.orders) {
    const r = designForOrder(rs, m, checks, workspace);
    if (r) results.push(r);
  }
  if (results.length === 0) {
    const extra = [rs.angleMaxDeg ? ` and ${rs.angleMaxDeg}°` : '', rs.decayMinCells > 0 ? ` with near fields decaying over ${rs.decayMinCells} cells ${rs.gapCells} cells away` : ''].join('');
    throw new HushInputError(
      'target reflection',
      `no design up to ${rs.maxLayers} layers meets |r| ≤ ${rs.target} at ${rs.ppwMin} cells per wavelength${extra}: the grid's discretisation reflection${rs.angleMaxDeg ? ' and the weak absorption at large angles' : ''}${rs.decayMinCells > 0 ? ' and the slow decay of the near field' : ''} set a floor; refine the grid, relax the tolerance${rs.angleMaxDeg ? ' or reduce the largest angle' : ''}${rs.decayMinCells > 0 ? ' or widen the gap' : ''}`,
    );
  }
  results.sort((a, b) => a.layers - b.layers || Math.max(a.worstAmplitude, a.worstEvanescent ?? 0) - Math.max(b.worstAmplitude, b.worstEvanescent ?? 0));
  setBounded(cache, key, results, CACHE_LIMIT);
  return results.map(copyResult);
}

function copyResult(r: DesignResult): DesignResult {
  return { ...r, mediumWorst: r.mediumWorst.map((m) => ({ ...m })) };
}

/**
 * The thinnest design per allowed grading order (orders with no design under the
 * layer cap are left out), sorted by layers then worst reflection.
 * Throws when no allowed order meets the target.
 */
export function designOptions(spec: DesignSpec): DesignResult[] {
  return designOptionsResolved(resolveSpec(spec));
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
  physicsKept.clear();
  runs.clear();
  runCount = 0;
  denseChecksKept.clear();
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

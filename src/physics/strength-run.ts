/**
 * The strength search of one design (layers, order, κ_max and α_max fixed):
 * the strength s = σ_max/σ_opt that minimises the worst sampled |r|, as a
 * resumable run (StrengthRun) that design.ts shares between searches of the
 * same physics, and the local re-optimisation around a known strength
 * (localStrength) that the dense check uses.
 */
import { MAX_STRENGTH } from './constants';
import type { ResolvedDesign } from './grading';
import type { ReflectionWorkspace } from './reflection';
import { newWorst, worstReflection, type DesignChecks, type Worst } from './design-checks';

/** Strengths σ_max/σ_opt scanned, from STRENGTH_MIN to MAX_STRENGTH (log-uniform). */
const STRENGTH_MIN = 0.05;
/** Points per pass of the local strength re-optimisation. */
const LOCAL_SCAN = 8;
const SCAN_POINTS = 20;
const GOLDEN_ITERATIONS = 14;

export interface Optimum {
  strength: number;
  worst: number;
  /** Group of the checks where the worst at that strength lies. */
  group: number;
}

/**
 * Minimises the worst sampled |r| over the strength for fixed N and m: a log
 * scan, then golden-section refinement around the best scan point and around
 * the best other local minimum of the scan. The worst |r| against strength can
 * have narrow notches (interference between the grading and the back wall, at a
 * single frequency and near-normal incidence), so one start is not enough.
 * Stops at the first checkpoint (the end of the scan, each golden step) whose
 * best is ≤ `stopBelow` (StrengthRun).
 */
export function bestStrength(d: ResolvedDesign, checks: DesignChecks, ws: ReflectionWorkspace, stopBelow: number): Optimum {
  return new StrengthRun(d, checks, ws).until(stopBelow);
}

/**
 * One run of bestStrength's optimisation, taken only as far as a caller needs:
 * `until(bound)` gives what bestStrength(…, bound) gives, resuming where an
 * earlier call stopped. Its checkpoints (the end of the scan, each golden
 * step) are where bestStrength may stop; nothing in the run depends on where a
 * caller stops, so one run serves every stopping bound, and shared between
 * searches of the same physics (strengthRun) it makes specs that differ only
 * in their target share the work, with the same results as separate runs.
 */
export class StrengthRun {
  private readonly points: Optimum[] = [];
  private final: Optimum | null = null;
  private readonly w: Worst = newWorst();
  private start: Worst | null = null;
  private lastGroup = 0;
  /** 0: the scan is next; 1: golden-section steps; 2: done. */
  private phase = 0;
  private bestV = Infinity;
  private bestLog = 0;
  private bestGroup = 0;
  private readonly lo = Math.log(STRENGTH_MIN);
  private readonly stepSize = (Math.log(MAX_STRENGTH) - Math.log(STRENGTH_MIN)) / (SCAN_POINTS - 1);
  /** Scan points to refine around (the best, then the best other local minimum), the current one, and its golden step (−1: not started). */
  private centres: number[] = [];
  private centre = 0;
  private it = -1;
  private a = 0;
  private b = 0;
  private c = 0;
  private e = 0;
  private fc = 0;
  private fe = 0;
  private gc = 0;
  private ge = 0;

  constructor(
    private readonly d: ResolvedDesign,
    private readonly checks: DesignChecks,
    private readonly ws: ReflectionWorkspace,
  ) {}

  until(stopBelow: number): Optimum {
    // The checkpoints' bests only fall, so the first one at or under the bound is where bestStrength stops.
    for (const p of this.points) if (p.worst <= stopBelow) return p;
    for (;;) {
      if (this.final) return this.final;
      const p = this.step();
      if (p) {
        // A checkpoint that did not improve on the last one kept is never the first under a bound: not kept.
        const last = this.points.length > 0 ? this.points[this.points.length - 1] : null;
        if (!last || p.worst !== last.worst) this.points.push(p);
        if (p.worst <= stopBelow) return p;
      }
    }
  }

  private evalAt(logS: number, bound: number): number {
    this.d.strength = Math.exp(logS);
    worstReflection(this.d, this.checks, this.ws, bound, this.start, this.w);
    this.start = this.w;
    this.lastGroup = this.w.group;
    return this.w.amplitude;
  }

  private best(): Optimum {
    return { strength: Math.exp(this.bestLog), worst: this.bestV, group: this.bestGroup };
  }

  /** Runs to the next checkpoint and returns it, or sets `final` at the end and returns null. */
  private step(): Optimum | null {
    const lo = this.lo;
    const step = this.stepSize;
    if (this.phase === 0) {
      // A log scan of the strength; each value stops early above the best so far (a lower bound, enough to rank it).
      const scan = new Float64Array(SCAN_POINTS);
      let bestI = 0;
      for (let i = 0; i < SCAN_POINTS; i++) {
        const v = this.evalAt(lo + i * step, this.bestV);
        scan[i] = v;
        if (v < this.bestV) {
          this.bestV = v;
          bestI = i;
          this.bestGroup = this.lastGroup;
        }
      }
      this.bestLog = lo + bestI * step;
      // Second start: the lowest other local minimum of the scan, away from the best one.
      let otherI = -1;
      for (let i = 0; i < SCAN_POINTS; i++) {
        if (Math.abs(i - bestI) <= 1) continue;
        const left = i === 0 ? Infinity : scan[i - 1];
        const right = i === SCAN_POINTS - 1 ? Infinity : scan[i + 1];
        if (scan[i] <= left && scan[i] <= right && (otherI < 0 || scan[i] < scan[otherI])) otherI = i;
      }
      this.centres = otherI < 0 ? [bestI] : [bestI, otherI];
      this.phase = 1;
      return this.best();
    }
    const g = (Math.sqrt(5) - 1) / 2;
    for (;;) {
      if (this.centre >= this.centres.length) {
        this.final = this.best();
        this.phase = 2;
        return null;
      }
      if (this.it < 0) {
        const centre = this.centres[this.centre];
        this.a = lo + Math.max(0, centre - 1) * step;
        this.b = lo + Math.min(SCAN_POINTS - 1, centre + 1) * step;
        this.c = this.b - g * (this.b - this.a);
        this.e = this.a + g * (this.b - this.a);
        // Each new point is evaluated only as far as it takes to know it is worse than the other
        // (its value then a lower bound above the other's): such a point leaves the bracket at the
        // next step unused, so the steps, the best and its group are those of full evaluations.
        this.fc = this.evalAt(this.c, Infinity);
        this.gc = this.lastGroup;
        this.fe = this.evalAt(this.e, this.fc);
        this.ge = this.lastGroup;
        this.it = 0;
      }
      if (this.it >= GOLDEN_ITERATIONS) {
        this.centre++;
        this.it = -1;
        continue;
      }
      if (this.fc < this.fe) {
        this.b = this.e;
        this.e = this.c;
        this.fe = this.fc;
        this.ge = this.gc;
        this.c = this.b - g * (this.b - this.a);
        this.fc = this.evalAt(this.c, this.fe);
        this.gc = this.lastGroup;
      } else {
        this.a = this.c;
        this.c = this.e;
        this.fc = this.fe;
        this.gc = this.ge;
        this.e = this.a + g * (this.b - this.a);
        this.fe = this.evalAt(this.e, this.fc);
        this.ge = this.lastGroup;
      }
      const m = Math.min(this.fc, this.fe);
      if (m < this.bestV) {
        this.bestV = m;
        this.bestLog = this.fc < this.fe ? this.c : this.e;
        this.bestGroup = this.fc < this.fe ? this.gc : this.ge;
      }
      this.it++;
      return this.best();
    }
  }
}

/**
 * Minimises the worst |r| over log-strength within one scan step of `around`:
 * two nested scans (LOCAL_SCAN points over ±1 step, then over ± one of those
 * spacings around the best), each evaluation stopping as soon as it exceeds the
 * best so far (a value above the best only needs to be known to be above it).
 */
export function localStrength(d: ResolvedDesign, checks: DesignChecks, ws: ReflectionWorkspace, around: number): number {
  const w: Worst = newWorst();
  let start: Worst | null = null;
  const evalAt = (logS: number, bound: number): number => {
    d.strength = Math.exp(logS);
    worstReflection(d, checks, ws, bound, start, w);
    start = w;
    return w.amplitude;
  };
  const lo = Math.log(STRENGTH_MIN);
  const hi = Math.log(MAX_STRENGTH);
  let bestLog = Math.log(around);
  let bestV = evalAt(bestLog, Infinity);
  let half = (hi - lo) / (SCAN_POINTS - 1);
  for (let pass = 0; pass < 2; pass++) {
    const centre = bestLog;
    for (let k = 0; k < LOCAL_SCAN; k++) {
      const x = centre - half + (2 * half * (k + 0.5)) / LOCAL_SCAN;
      if (x < lo || x > hi) continue;
      const v = evalAt(x, bestV);
      if (v < bestV) {
        bestV = v;
        bestLog = x;
      }
    }
    half = (2 * half) / LOCAL_SCAN;
  }
  return Math.exp(bestLog);
}


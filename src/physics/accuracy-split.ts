/**
 * The accuracy split (issue 11 §2): the total tolerated intensity error is
 * shared between the absorber's echo, the grid's dispersion and the run
 * length, and the cheapest plan that meets it is searched over the cell size,
 * the duration and the absorber's share. The physics and the cost enter as
 * callbacks, so the plan layer plugs in its own design search and cost model.
 *
 * Combination (following `phase`, physics.md §1): worst case the three errors
 * add, ε_a + ε_d + ε_r ≤ ε; with random phases they add in quadrature,
 * √(ε_a² + ε_d² + ε_r²) ≤ ε. (Worst-case echoes really add in amplitude; the
 * neglected cross terms 2·A_i·A_j are second order, at most (ε/2)² in all.)
 *
 * Search, deterministic and bounded:
 *  1. Candidate cells: `cellMax` (the user's cell), a geometric ladder of
 *     CELL_LADDER_STEPS steps down to `cellMin`, and the largest cells at which
 *     the dispersion error takes DISPERSION_SHARES of the tolerance (bisection
 *     on log Δ; the dispersion error must not decrease with the cell). Equal
 *     `cellMin` and `cellMax` fix the cell.
 *  2. Each cell has a lower bound on its cost: no absorber, and the shortest
 *     run its remaining budget allows. Cells are planned in increasing order of
 *     that bound, and the search stops at the first bound not below the best
 *     plan found (branch and bound).
 *  3. At one cell, with R the budget left after dispersion:
 *     - run fixed (the user gave the duration): the absorber takes what the
 *       run leaves, one design search;
 *     - run searched: the thinnest design that fits R at all, then, while it
 *       can pay, the next thicker design (the design whose error is just below
 *       the previous one's): each design's own error, not the budget it was
 *       asked for, sets what the run gets, and a design whose cost with the
 *       longest-lived budget for the run (all of R) is already not below the
 *       best plan ends the walk (thicker designs only cost more);
 *     - no run: the absorber takes R.
 *  4. The plan in which the absorber takes all the rest at the user's own cell
 *     and duration is a candidate too, so the searched plan never costs more.
 * Every callback call is counted (`evaluations`); the design searches are
 * bounded by `maxAbsorberSearches` (default MAX_ABSORBER_SEARCHES) and per
 * cell by MAX_DESIGNS_PER_CELL.
 */
import type { PhaseModel } from './budget';
import { HushInputError, isHushInputError } from './errors';
import { inRange, wholeInRange } from './validate';

/** Steps of the geometric ladder of cells from cellMax to cellMin. */
export const CELL_LADDER_STEPS = 8;
/** Shares of the tolerance at which the dispersion error's cell is a candidate. */
export const DISPERSION_SHARES: readonly number[] = [0.99, 0.95, 0.9, 0.8, 0.65, 0.5, 0.3, 0.1];
/** Most design searches at one cell. */
export const MAX_DESIGNS_PER_CELL = 6;
/** Default bound on the design searches of one split. */
export const MAX_ABSORBER_SEARCHES = 40;
/** Budgets handed to the callbacks are this much below what is left, so rounding never breaks the total. */
const SAFETY = 1 - 1e-9;
/** Relative step below a design's own error to ask for the next thicker design. */
const NEXT_DESIGN_STEP = 1e-6;

/** A design chosen for an absorber error budget: the design and the error it actually causes (≤ the budget). */
export interface AbsorberChoice<D> {
  design: D;
  error: number;
}

/** How the run length enters. */
export type RunModel =
  /** No run length given: no run error, no duration. */
  | { kind: 'none' }
  /** The user fixed the run (a duration, or passes): its duration at a cell and the error it leaves. */
  | { kind: 'fixed'; duration: (cell: number) => number; error: (cell: number, duration: number) => number }
  /**
   * The planner chooses the run: the shortest duration for a run error (any error in (0, tolerance]),
   * the error of a duration, and the user's own duration (for the absorber-takes-all plan).
   */
  | {
      kind: 'searched';
      durationFor: (cell: number, error: number) => number;
      error: (cell: number, duration: number) => number;
      baselineDuration: (cell: number) => number;
    };

export interface SplitProblem<D> {
  /** Total tolerated relative intensity error. */
  tolerance: number;
  /** How the parts combine: 'worst' (add) or 'random' (quadrature). */
  phase: PhaseModel;
  /** Largest cell allowed (the user's cell), m or any unit the callbacks share. */
  cellMax: number;
  /** Finest cell allowed; default cellMax (the cell is fixed). */
  cellMin?: number;
  /** Dispersion error at a cell; must not decrease as the cell grows. */
  dispersionError: (cell: number) => number;
  run: RunModel;
  /** The cheapest absorber whose error is at most `error` at this cell, or null (or a HushInputError) when none is. */
  absorber: (cell: number, error: number) => AbsorberChoice<D> | null;
  /** Cost of a plan; `design` null means no absorber (a lower bound). Must not decrease with the duration or a thicker design. */
  cost: (cell: number, design: D | null, duration: number | null) => number;
  /** Bound on the design searches; default MAX_ABSORBER_SEARCHES. */
  maxAbsorberSearches?: number;
}

export interface SplitErrors {
  absorber: number;
  dispersion: number;
  run: number;
  /** The three combined as `phase` says; at most the tolerance. */
  combined: number;
}

export interface SplitPlan<D> {
  cell: number;
  duration: number | null;
  design: D;
  errors: SplitErrors;
  /** Each part's share of the tolerance in the combining measure (worst: ε_i/ε; random: ε_i²/ε²). */
  shares: { absorber: number; dispersion: number; run: number };
  cost: number;
  /** cost(cell, null, duration): the plan without its absorber. */
  costWithoutAbsorber: number;
  /** cost − costWithoutAbsorber: what the absorber adds. */
  absorberCost: number;
}

export type CellStatus = 'planned' | 'pruned' | 'dispersion exceeds the tolerance' | 'no plan fits';

export interface CellCandidate {
  cell: number;
  dispersionError: number;
  /** Lower bound on any plan's cost at this cell (no absorber, shortest run); null when the cell cannot meet the tolerance. */
  lowerBound: number | null;
  /** Cheapest plan found at this cell; null when none was planned or none fits. */
  cost: number | null;
  status: CellStatus;
}

export interface SplitEvaluations {
  absorber: number;
  cost: number;
  dispersion: number;
  runDuration: number;
  runError: number;
}

export interface SplitResult<D> {
  best: SplitPlan<D>;
  /** The absorber takes all the rest at the user's cell and duration; null when that plan cannot meet the tolerance. */
  baseline: SplitPlan<D> | null;
  /** Why the baseline is null. */
  baselineNote: string | null;
  /** baseline.cost − best.cost (≥ 0), null without a baseline. */
  saving: number | null;
  /** The candidate cells, largest first. */
  cells: CellCandidate[];
  evaluations: SplitEvaluations;
  /** True when the bound on design searches stopped the search early. */
  truncated: boolean;
}

interface Ctx<D> {
  p: SplitProblem<D>;
  tol: number;
  worst: boolean;
  maxSearches: number;
  ev: SplitEvaluations;
  best: SplitPlan<D> | null;
  truncated: boolean;
}

/** What is left of `total` once `used` is spent: total − used, or √(total² − used²). */
function remainder(worst: boolean, total: number, used: number): number {
  if (worst) return total - used;
  return used >= total ? 0 : Math.sqrt((total - used) * (total + used));
}

function combine(worst: boolean, a: number, d: number, r: number): number {
  return worst ? a + d + r : Math.sqrt(a * a + d * d + r * r);
}

function finiteOrThrow(what: string, v: unknown): number {
  if (typeof v !== 'number' || Number.isNaN(v)) throw new Error(`split: the ${what} callback returned ${String(v)}`);
  return v;
}

/** Calls a callback that may signal infeasibility with a HushInputError; returns null then. */
function attempt<T>(f: () => T): T | null {
  try {
    return f();
  } catch (e) {
    if (isHushInputError(e)) return null;
    throw e;
  }
}

function dispersionAt<D>(c: Ctx<D>, cell: number): number {
  c.ev.dispersion++;
  return finiteOrThrow('dispersion error', c.p.dispersionError(cell));
}

function costOf<D>(c: Ctx<D>, cell: number, design: D | null, duration: number | null): number {
  c.ev.cost++;
  return finiteOrThrow('cost', c.p.cost(cell, design, duration));
}

function absorberFor<D>(c: Ctx<D>, cell: number, budget: number): AbsorberChoice<D> | null {
  if (c.ev.absorber >= c.maxSearches) {
    c.truncated = true;
    return null;
  }
  c.ev.absorber++;
  const choice = attempt(() => c.p.absorber(cell, budget));
  if (choice === null || choice === undefined) return null;
  finiteOrThrow('absorber error', choice.error);
  return choice;
}

function runErrorAt<D>(c: Ctx<D>, cell: number, duration: number): number | null {
  c.ev.runError++;
  const e = attempt(() => (c.p.run as { error: (cell: number, d: number) => number }).error(cell, duration));
  return e === null ? null : finiteOrThrow('run error', e);
}

function durationFor<D>(c: Ctx<D>, cell: number, error: number): number | null {
  const run = c.p.run;
  if (run.kind !== 'searched') return null;
  c.ev.runDuration++;
  const t = attempt(() => run.durationFor(cell, error));
  return t === null ? null : finiteOrThrow('run duration', t);
}

/** A complete plan if its errors combine to at most the tolerance. */
function makePlan<D>(c: Ctx<D>, cell: number, duration: number | null, choice: AbsorberChoice<D>, dispersion: number, run: number): SplitPlan<D> | null {
  const combined = combine(c.worst, choice.error, dispersion, run);
  if (!(combined <= c.tol)) return null;
  const cost = costOf(c, cell, choice.design, duration);
  const bare = costOf(c, cell, null, duration);
  const share = (e: number) => (c.worst ? e / c.tol : (e * e) / (c.tol * c.tol));
  return {
    cell,
    duration,
    design: choice.design,
    errors: { absorber: choice.error, dispersion, run, combined },
    shares: { absorber: share(choice.error), dispersion: share(dispersion), run: share(run) },
    cost,
    costWithoutAbsorber: bare,
    absorberCost: cost - bare,
  };
}

function offer<D>(c: Ctx<D>, plan: SplitPlan<D> | null): void {
  if (plan && (c.best === null || plan.cost < c.best.cost)) c.best = plan;
}

/** The absorber takes all the rest at the user's cell and duration. */
/** An error as a percentage for a note (3 significant digits). */
function percent(x: number): string {
  return `${Number((100 * x).toPrecision(3))} %`;
}

function baselinePlan<D>(c: Ctx<D>): { plan: SplitPlan<D> | null; note: string | null } {
  const cell = c.p.cellMax;
  const run = c.p.run;
  const ed = dispersionAt(c, cell);
  let duration: number | null = null;
  let er = 0;
  if (run.kind !== 'none') {
    duration = finiteOrThrow('duration', run.kind === 'fixed' ? run.duration(cell) : run.baselineDuration(cell));
    const e = runErrorAt(c, cell, duration);
    if (e === null) return { plan: null, note: 'the run error of the given duration cannot be evaluated' };
    er = e;
  }
  const left = remainder(c.worst, remainder(c.worst, c.tol, ed), er);
  if (!(left > 0)) {
    return { plan: null, note: `the dispersion (${percent(ed)}) and the run length (${percent(er)}) leave nothing of the tolerance (${percent(c.tol)}) to the absorber at the given cell and duration` };
  }
  const choice = absorberFor(c, cell, left * SAFETY);
  if (!choice) return { plan: null, note: `no absorber meets the ${percent(left)} of intensity error the other errors leave at the given cell` };
  const plan = makePlan(c, cell, duration, choice, ed, er);
  return { plan, note: plan ? null : 'the absorber chosen exceeds its budget' };
}

/** Candidate cells, largest first, without duplicates. */
function candidateCells<D>(c: Ctx<D>, cellMin: number): number[] {
  const cellMax = c.p.cellMax;
  const cells = [cellMax];
  if (cellMin < cellMax) {
    const ratio = cellMin / cellMax;
    for (let k = 1; k <= CELL_LADDER_STEPS; k++) cells.push(k === CELL_LADDER_STEPS ? cellMin : cellMax * Math.pow(ratio, k / CELL_LADDER_STEPS));
    const eMax = dispersionAt(c, cellMax);
    const eMin = dispersionAt(c, cellMin);
    for (const f of DISPERSION_SHARES) {
      const target = f * c.tol;
      // Largest cell with dispersion error ≤ f·ε: none if even cellMin exceeds it; cellMax (already listed) if it meets it.
      if (eMin > target || eMax <= target) continue;
      let lo = Math.log(cellMin);
      let hi = Math.log(cellMax);
      for (let it = 0; it < 48; it++) {
        const mid = 0.5 * (lo + hi);
        if (dispersionAt(c, Math.exp(mid)) <= target) lo = mid;
        else hi = mid;
      }
      cells.push(Math.exp(lo));
    }
  }
  cells.sort((a, b) => b - a);
  const out: number[] = [];
  for (const x of cells) if (out.length === 0 || Math.abs(out[out.length - 1] - x) > 1e-12 * x) out.push(x);
  return out;
}

interface Prepared {
  cand: CellCandidate;
  /** Budget left after dispersion. */
  left: number;
  /** Fixed run: its duration and error; searched: the shortest duration (run takes all of `left`). */
  duration: number | null;
  runError: number;
}

function prepare<D>(c: Ctx<D>, cell: number): Prepared {
  const ed = dispersionAt(c, cell);
  const cand: CellCandidate = { cell, dispersionError: ed, lowerBound: null, cost: null, status: 'dispersion exceeds the tolerance' };
  const left = remainder(c.worst, c.tol, ed);
  const prepared: Prepared = { cand, left, duration: null, runError: 0 };
  if (!(left > 0)) return prepared;
  const run = c.p.run;
  cand.status = 'no plan fits';
  if (run.kind === 'fixed') {
    const T = finiteOrThrow('duration', run.duration(cell));
    const er = runErrorAt(c, cell, T);
    if (er === null || !(remainder(c.worst, left, er) > 0)) return prepared;
    prepared.duration = T;
    prepared.runError = er;
  } else if (run.kind === 'searched') {
    const T = durationFor(c, cell, left * SAFETY);
    if (T === null) return prepared;
    prepared.duration = T;
  }
  cand.lowerBound = costOf(c, cell, null, prepared.duration);
  cand.status = 'pruned';
  return prepared;
}

function planCell<D>(c: Ctx<D>, pr: Prepared): void {
  const { cand, left } = pr;
  const cell = cand.cell;
  const ed = cand.dispersionError;
  const run = c.p.run;
  let cellBest: number | null = null;
  const take = (plan: SplitPlan<D> | null) => {
    if (!plan) return;
    if (cellBest === null || plan.cost < cellBest) cellBest = plan.cost;
    offer(c, plan);
  };
  if (run.kind !== 'searched') {
    const budget = remainder(c.worst, left, pr.runError) * SAFETY;
    const choice = absorberFor(c, cell, budget);
    if (choice) take(makePlan(c, cell, pr.duration, choice, ed, pr.runError));
  } else {
    let budget = left * SAFETY;
    for (let k = 0; k < MAX_DESIGNS_PER_CELL; k++) {
      const choice = absorberFor(c, cell, budget);
      if (!choice) break;
      const runBudget = remainder(c.worst, left, choice.error) * SAFETY;
      if (runBudget > 0) {
        const T = durationFor(c, cell, runBudget);
        if (T !== null) {
          const er = runErrorAt(c, cell, T);
          if (er !== null) take(makePlan(c, cell, T, choice, ed, er));
        }
      }
      // A thicker design cannot beat the best plan if this one, with the run given all of R, does not.
      const floor = costOf(c, cell, choice.design, pr.duration);
      if (c.best !== null && floor >= c.best.cost) break;
      budget = choice.error * (1 - NEXT_DESIGN_STEP);
      if (!(budget > 0)) break;
    }
  }
  cand.cost = cellBest;
  cand.status = cellBest === null ? 'no plan fits' : 'planned';
}

/**
 * The cheapest split of the tolerance (see the module comment).
 * Example (tests/accuracy-split.test.ts): a 1-D study whose dispersion error
 * grows as Δ² is planned at the largest cell that leaves the absorber and the
 * run enough, with each part's error and the saving against the
 * absorber-takes-all plan.
 */
export function splitAccuracy<D>(problem: SplitProblem<D>): SplitResult<D> {
  if (problem === null || typeof problem !== 'object') throw new HushInputError('split', 'the split problem must be an object', 'value');
  const tol = inRange('intensity error', problem.tolerance, 0, Infinity, { loOpen: true, hiOpen: true });
  if (problem.phase !== 'worst' && problem.phase !== 'random') {
    throw new HushInputError('phase', `phase must be "worst" or "random" (got ${JSON.stringify(problem.phase) ?? 'nothing'})`, 'value');
  }
  const cellMax = inRange('cell', problem.cellMax, 0, Infinity, { loOpen: true, hiOpen: true });
  const cellMin = inRange('cell_min', problem.cellMin ?? cellMax, 0, cellMax, { loOpen: true });
  const kind = problem.run?.kind;
  if (kind !== 'none' && kind !== 'fixed' && kind !== 'searched') {
    throw new HushInputError('run', `run kind must be "none", "fixed" or "searched" (got ${JSON.stringify(kind) ?? 'nothing'})`, 'value');
  }
  const maxSearches = wholeInRange('design searches', problem.maxAbsorberSearches ?? MAX_ABSORBER_SEARCHES, 1, 10_000);
  const c: Ctx<D> = {
    p: problem,
    tol,
    worst: problem.phase === 'worst',
    maxSearches,
    ev: { absorber: 0, cost: 0, dispersion: 0, runDuration: 0, runError: 0 },
    best: null,
    truncated: false,
  };
  const base = baselinePlan(c);
  offer(c, base.plan);
  const prepared = candidateCells(c, cellMin).map((cell) => prepare(c, cell));
  const order = prepared.filter((p) => p.cand.lowerBound !== null).sort((a, b) => (a.cand.lowerBound as number) - (b.cand.lowerBound as number));
  for (const pr of order) {
    if (pr.cand.cell === cellMax && kind !== 'searched') {
      // With the run fixed or absent, the plan at the user's cell is the baseline itself.
      pr.cand.cost = base.plan ? base.plan.cost : null;
      pr.cand.status = base.plan ? 'planned' : 'no plan fits';
      continue;
    }
    if (c.best !== null && (pr.cand.lowerBound as number) >= c.best.cost) break;
    if (c.ev.absorber >= c.maxSearches) {
      c.truncated = true;
      break;
    }
    planCell(c, pr);
  }
  if (!c.best) {
    const finest = prepared[prepared.length - 1].cand;
    const why =
      finest.dispersionError >= tol
        ? `the dispersion error alone is ${finest.dispersionError.toPrecision(3)} at the finest cell allowed (${finest.cell.toPrecision(4)}), at least the tolerance ${tol}: allow a finer cell, shorten the path or relax the tolerance`
        : `no absorber and run fit what the dispersion leaves at any cell from ${cellMax.toPrecision(4)} down to ${cellMin.toPrecision(4)}: relax the tolerance or allow a finer cell`;
    throw new HushInputError('intensity error', `no split of the intensity error ${tol} meets it: ${why}`);
  }
  const best = c.best as SplitPlan<D>;
  return {
    best,
    baseline: base.plan,
    baselineNote: base.note,
    saving: base.plan ? base.plan.cost - best.cost : null,
    cells: prepared.map((p) => p.cand),
    evaluations: c.ev,
    truncated: c.truncated,
  };
}

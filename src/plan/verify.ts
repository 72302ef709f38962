/**
 * The time-domain check of a design, independent of any front end: which runs
 * to make for a design on a study's grid (chosen before any step is taken),
 * running them with progress and cancellation, and the comparison of the
 * measured |r| with the exact discrete prediction. The task pane's worker
 * (taskpane/verify.worker.ts) and `hush verify` both call it.
 *
 * Both checks run on exact reductions of the study's grid to one transverse
 * mode: the 1-D line at normal incidence, and the one-mode chain of a periodic
 * 2-D grid (src/physics/fdtd/mode-line.ts) at the study's largest angle, which
 * gives what the 2-D grid gives to rounding at a fraction of its cost. The
 * study's band is split into the fewest pieces one run can each measure
 * (planMeasurementPieces: clear of the grid's cut-offs, a narrow band widened
 * in the pulse so the record stays short), and every run ends its reference at
 * a thick absorber instead of a long lossless line. The measurement routines
 * report their cost (cell updates) when a run is prepared; callers bound that
 * work, not time.
 */
import type { AbsorberDesign } from '../physics';
import {
  createMeasurement1D,
  createMeasurement2D,
  isMeasurementCancelled,
  planMeasurementPieces,
  runInChunks,
  type MeasureOptions1D,
  type MeasureOptions2D,
  type MeasurementRun,
  type ReflectionMeasurement,
} from '../physics/fdtd';

import type { CheckName, MeasuredPoint, VerifyGrid } from './verify-compare';

export { isMeasurementCancelled };
export * from './verify-compare';

/** Largest work the pane starts per check, in cell updates (all pieces of the band together). */
export const PANE_BUDGET_1D = 5e8;
export const PANE_BUDGET_2D = 1.2e9;
/** Frequencies measured inside the study's band. */
export const MEASURED_FREQUENCIES = 5;

export interface PreparedRun<O> {
  /** The first piece of the band, */
  run: MeasurementRun;
  options: O;
  /** … the other pieces, run after it, */
  rest: { run: MeasurementRun; options: O }[];
  /** … and the work of all of them. */
  cellUpdates: number;
  /** Set when the run covers less than asked, or is split, and why. */
  note?: string;
}

/**
 * A check that is not made, and why: 'not-needed' (a 1-D study has no oblique
 * incidence), 'budget' (more work than the caller allows; `cellUpdates` says
 * how much) or 'unmeasurable' (the band or angle cannot be measured).
 */
export interface SkippedRun {
  skipped: string;
  reason: 'not-needed' | 'budget' | 'unmeasurable';
  cellUpdates?: number;
}

export interface RunChoice {
  oneD: PreparedRun<MeasureOptions1D> | SkippedRun;
  twoD: PreparedRun<MeasureOptions2D> | SkippedRun;
}

/** Largest work started per check, in cell updates. */
export interface VerifyBudget {
  oneD: number;
  twoD: number;
}

export const PANE_BUDGET: VerifyBudget = { oneD: PANE_BUDGET_1D, twoD: PANE_BUDGET_2D };

/** Cells per wavelength measured: evenly spaced in frequency over the study's band (one value for a one-point band). */
export function measuredPpw(grid: VerifyGrid): number[] {
  if (grid.ppwMax === grid.ppwMin) return [grid.ppwMin];
  const fHi = 1 / grid.ppwMin;
  const fLo = 1 / grid.ppwMax;
  const out: number[] = [];
  for (let k = 0; k < MEASURED_FREQUENCIES; k++) {
    const f = fHi + ((fLo - fHi) * k) / (MEASURED_FREQUENCIES - 1);
    out.push(k === 0 ? grid.ppwMin : k === MEASURED_FREQUENCIES - 1 ? grid.ppwMax : 1 / f);
  }
  return out;
}

/** The band [ppwLow, ppwHigh] widened by `factor` in frequency span around the study's band centre (band arithmetic for callers; the runs widen their pulses themselves). */
export function widenedBand(grid: VerifyGrid, factor: number): [number, number] {
  const fHi = 1 / grid.ppwMin;
  const fLo = 1 / grid.ppwMax;
  const centre = (fHi + fLo) / 2;
  // A one-point band gets a span of 10 % of its frequency to widen.
  const half = Math.max((fHi - fLo) / 2, factor > 1 ? 0.05 * centre : 0) * factor;
  return [1 / (centre + half), 1 / Math.max(centre - half, centre * 0.05)];
}

function prepare<O extends MeasureOptions1D>(
  grid: VerifyGrid,
  angleDeg: number,
  make: (o: O) => MeasurementRun,
  options: (piece: { ppwLow: number; ppwHigh: number; frequencies: number[]; angleDeg?: number }) => O,
  budget: number,
): PreparedRun<O> | SkippedRun {
  try {
    const pieces = planMeasurementPieces({
      courant: grid.courant,
      index: grid.index,
      ppwMin: grid.ppwMin,
      ppwMax: grid.ppwMax,
      angleDeg,
      frequencies: MEASURED_FREQUENCIES,
    });
    const runs = pieces.map((p) => {
      const o = options(p);
      return { run: make(o), options: o };
    });
    const cellUpdates = runs.reduce((sum, r) => sum + r.run.totalSteps * r.run.cellUpdatesPerStep, 0);
    if (cellUpdates > budget) {
      return { skipped: `it would need ${cellUpdates.toExponential(1)} cell updates (at most ${budget.toExponential(1)} are run)`, reason: 'budget', cellUpdates };
    }
    const note = runs.length > 1 ? `the band is measured in ${runs.length} runs, each clear of the grid's cut-offs at ${angleDeg}°` : undefined;
    return { ...runs[0], rest: runs.slice(1), cellUpdates, ...(note ? { note } : {}) };
  } catch (e) {
    return { skipped: e instanceof Error ? e.message : String(e), reason: 'unmeasurable' };
  }
}

/** The runs for a design on a study's grid, each check within its budget (default the pane's). */
export function chooseRuns(design: AbsorberDesign, grid: VerifyGrid, budget: VerifyBudget = PANE_BUDGET): RunChoice {
  const common = (p: { ppwLow: number; ppwHigh: number; frequencies: number[] }) => ({
    courant: grid.courant,
    index: grid.index,
    ppwLow: p.ppwLow,
    ppwHigh: p.ppwHigh,
    frequencies: p.frequencies,
    reference: 'terminated' as const,
    ...(grid.gridSampling !== undefined ? { gridSampling: grid.gridSampling } : {}),
  });
  const oneD = prepare<MeasureOptions1D>(grid, 0, (o) => createMeasurement1D(design, o), common, budget.oneD);
  const twoD: RunChoice['twoD'] =
    grid.dimensions === 1
      ? { skipped: 'a 1-D study has no oblique incidence', reason: 'not-needed' }
      : prepare<MeasureOptions2D>(
          grid,
          grid.angleMaxDeg,
          (o) => createMeasurement2D(design, o),
          (p) => ({ ...common(p), angleDeg: p.angleDeg ?? grid.angleMaxDeg, engine: 'reduced' }),
          budget.twoD,
        );
  return { oneD, twoD };
}

export function isPrepared<O>(r: PreparedRun<O> | SkippedRun): r is PreparedRun<O> {
  return 'run' in r;
}

/** One verification to run: the checks of one or more designs (one per sampling convention) on one grid. */
export interface VerificationPlan {
  checks: { design: AbsorberDesign; run: CheckName; prepared: PreparedRun<MeasureOptions1D> }[];
  /** Checks not made, with the design's convention. */
  skipped: { design: AbsorberDesign; run: CheckName; skip: SkippedRun }[];
  /** Work of all checks, cell updates. */
  cellUpdates: number;
}

/** Prepares the checks of each design (several when a design is verified under several conventions). */
export function planVerification(designs: AbsorberDesign | readonly AbsorberDesign[], grid: VerifyGrid, budget: VerifyBudget = PANE_BUDGET): VerificationPlan {
  const plan: VerificationPlan = { checks: [], skipped: [], cellUpdates: 0 };
  for (const design of Array.isArray(designs) ? designs : [designs as AbsorberDesign]) {
    const choice = chooseRuns(design, grid, budget);
    for (const [run, c] of [['1-D', choice.oneD], ['2-D', choice.twoD]] as const) {
      if (isPrepared<MeasureOptions1D>(c)) {
        plan.checks.push({ design, run, prepared: c });
        plan.cellUpdates += c.cellUpdates;
      } else plan.skipped.push({ design, run, skip: c });
    }
  }
  return plan;
}

export interface VerifyControl {
  /** Progress of one check (all pieces of its band) from 0 to 1, and of the whole verification by work. */
  onProgress?: (run: CheckName, fraction: number, overall: number) => void;
  /** Checked between chunks; when `aborted` is true the verification throws MeasurementCancelled. */
  signal?: { aborted: boolean };
}

export interface VerificationReport {
  points: MeasuredPoint[];
  /** Runs that were split or not made, and why. */
  notes: string[];
  cellUpdates: number;
  seconds: number;
}

function pointsOf(m: ReflectionMeasurement, run: CheckName): MeasuredPoint[] {
  return m.frequencies.map((f) => ({ run, ppw: f.ppw, angleDeg: f.angleDeg, measured: f.measuredAmplitude, predicted: f.predictedAmplitude, sampling: m.sampling, gridSampling: m.gridSampling }));
}

/** Runs a prepared verification: every check in turn, every piece of its band; throws when no check could be made. */
export async function runVerificationPlan(plan: VerificationPlan, control: VerifyControl = {}): Promise<VerificationReport> {
  const t0 = typeof performance !== 'undefined' ? performance.now() : Date.now();
  const points: MeasuredPoint[] = [];
  const notes: string[] = [];
  const several = new Set([...plan.checks, ...plan.skipped].map((c) => c.design.sampling ?? 'node')).size > 1;
  const label = (run: CheckName, d: AbsorberDesign) => (several ? `${run} (${d.sampling ?? 'node'})` : run);
  let doneAll = 0;
  for (const c of plan.checks) {
    const p = c.prepared;
    const pieces: MeasurementRun[] = [p.run, ...p.rest.map((r) => r.run)];
    let done = 0;
    for (const piece of pieces) {
      const work = piece.totalSteps * piece.cellUpdatesPerStep;
      const m = await runInChunks(piece, {
        signal: control.signal,
        onProgress: (f) => control.onProgress?.(c.run, (done + f * work) / p.cellUpdates, (doneAll + done + f * work) / plan.cellUpdates),
      });
      done += work;
      points.push(...pointsOf(m, c.run));
    }
    doneAll += done;
    if (p.note) notes.push(`${label(c.run, c.design)}: ${p.note}`);
  }
  for (const s of plan.skipped) notes.push(`${label(s.run, s.design)} run not made: ${s.skip.skipped}`);
  if (points.length === 0) throw new Error(notes.join('; '));
  const t1 = typeof performance !== 'undefined' ? performance.now() : Date.now();
  return { points, notes, cellUpdates: plan.cellUpdates, seconds: (t1 - t0) / 1000 };
}

/** The time-domain check of one design on a study's grid, each check within the budget (default the pane's). */
export function runVerification(design: AbsorberDesign, grid: VerifyGrid, control: VerifyControl & { budget?: VerifyBudget } = {}): Promise<VerificationReport> {
  return runVerificationPlan(planVerification(design, grid, control.budget), control);
}

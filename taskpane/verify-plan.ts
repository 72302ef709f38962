/**
 * Which time-domain runs the pane makes for a design, chosen before any step
 * is taken. Both checks run on exact reductions of the study's grid to one
 * transverse mode: the 1-D line at normal incidence, and the one-mode chain of
 * a periodic 2-D grid (src/physics/fdtd/mode-line.ts) at the study's largest
 * angle, which gives what the 2-D grid gives to rounding at a fraction of its
 * cost. The study's band is split into the fewest pieces one run can each
 * measure (planMeasurementPieces: clear of the grid's cut-offs, a narrow band
 * widened in the pulse so the record stays short), and every run ends its
 * reference at a thick absorber instead of a long lossless line. The
 * measurement routines report their cost (cell updates) when a run is
 * prepared; the pane bounds that work, not time.
 */
import type { AbsorberDesign } from '../src/plan/steps';
import { createMeasurement1D, createMeasurement2D, type MeasureOptions1D, type MeasureOptions2D, type MeasurementRun } from '../src/plan/steps';
// The band planner of the measurement (src/plan/steps.ts does not re-export it yet).
import { planMeasurementPieces } from '../src/physics/fdtd/measure';
import type { VerifyGrid } from './verify-protocol';

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

export interface RunChoice {
  oneD: PreparedRun<MeasureOptions1D> | { skipped: string };
  twoD: PreparedRun<MeasureOptions2D> | { skipped: string };
}

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
): PreparedRun<O> | { skipped: string } {
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
      return { skipped: `it would need ${cellUpdates.toExponential(1)} cell updates (the pane runs at most ${budget.toExponential(1)})` };
    }
    const note = runs.length > 1 ? `the band is measured in ${runs.length} runs, each clear of the grid's cut-offs at ${angleDeg}°` : undefined;
    return { ...runs[0], rest: runs.slice(1), cellUpdates, ...(note ? { note } : {}) };
  } catch (e) {
    return { skipped: e instanceof Error ? e.message : String(e) };
  }
}

export function chooseRuns(design: AbsorberDesign, grid: VerifyGrid): RunChoice {
  const common = (p: { ppwLow: number; ppwHigh: number; frequencies: number[] }) => ({
    courant: grid.courant,
    index: grid.index,
    ppwLow: p.ppwLow,
    ppwHigh: p.ppwHigh,
    frequencies: p.frequencies,
    reference: 'terminated' as const,
  });
  const oneD = prepare<MeasureOptions1D>(grid, 0, (o) => createMeasurement1D(design, o), common, PANE_BUDGET_1D);
  const twoD: RunChoice['twoD'] =
    grid.dimensions === 1
      ? { skipped: 'a 1-D study has no oblique incidence' }
      : prepare<MeasureOptions2D>(
          grid,
          grid.angleMaxDeg,
          (o) => createMeasurement2D(design, o),
          (p) => ({ ...common(p), angleDeg: p.angleDeg ?? grid.angleMaxDeg, engine: 'reduced' }),
          PANE_BUDGET_2D,
        );
  return { oneD, twoD };
}

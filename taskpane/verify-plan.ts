/**
 * Which time-domain runs the pane can afford for a design, chosen before any
 * step is taken: the measurement routines of src/physics/fdtd report their
 * cost (cell updates) when a run is prepared, so the pane tries the study's
 * band first and, when the band is too narrow for a short record, a band
 * widened symmetrically in frequency around it, measuring only frequencies
 * inside the study's band. The 2-D run uses the study's largest angle.
 */
import type { AbsorberDesign } from '../src/plan/steps';
import { createMeasurement1D, createMeasurement2D, type MeasureOptions1D, type MeasureOptions2D, type MeasurementRun } from '../src/plan/steps';
import type { VerifyGrid } from './verify-protocol';

/** Largest runs the pane starts, in cell updates (about 10–20 s of a browser's single thread for the 2-D run). */
export const PANE_BUDGET_1D = 5e8;
export const PANE_BUDGET_2D = 1.2e9;
/** Widening factors tried on the band's frequency span when the study's own band needs too long a record. */
export const WIDENING = [1, 1.1, 1.25, 1.5, 2] as const;
/** Frequencies measured inside the study's band. */
export const MEASURED_FREQUENCIES = 5;

export interface PreparedRun<O> {
  run: MeasurementRun;
  options: O;
  cellUpdates: number;
  /** Set when the run covers less than asked (for example one frequency of the band), and why. */
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

/** The band [ppwLow, ppwHigh] widened by `factor` in frequency span around the study's band centre. */
export function widenedBand(grid: VerifyGrid, factor: number): [number, number] {
  const fHi = 1 / grid.ppwMin;
  const fLo = 1 / grid.ppwMax;
  const centre = (fHi + fLo) / 2;
  // A one-point band gets a span of 10 % of its frequency to widen.
  const half = Math.max((fHi - fLo) / 2, factor > 1 ? 0.05 * centre : 0) * factor;
  return [1 / (centre + half), 1 / Math.max(centre - half, centre * 0.05)];
}

function prepare<O extends MeasureOptions1D>(make: (o: O) => MeasurementRun, base: (band: [number, number]) => O, grid: VerifyGrid, budget: number): PreparedRun<O> | { skipped: string } {
  let last = '';
  for (const factor of WIDENING) {
    const band: [number, number] = factor === 1 ? [grid.ppwMin, grid.ppwMax] : widenedBand(grid, factor);
    const options = base(band);
    try {
      const run = make(options);
      const cellUpdates = run.totalSteps * run.cellUpdatesPerStep;
      if (cellUpdates <= budget) return { run, options, cellUpdates };
      last = `it would need ${cellUpdates.toExponential(1)} cell updates (the pane runs at most ${budget.toExponential(1)})`;
    } catch (e) {
      last = e instanceof Error ? e.message : String(e);
    }
  }
  return { skipped: last };
}

export function chooseRuns(design: AbsorberDesign, grid: VerifyGrid): RunChoice {
  const frequencies = measuredPpw(grid);
  const common = (band: [number, number]) => ({ courant: grid.courant, index: grid.index, ppwLow: band[0], ppwHigh: band[1], frequencies });
  const oneD = prepare<MeasureOptions1D>((o) => createMeasurement1D(design, o), common, grid, PANE_BUDGET_1D);
  const twoDAt = (g: VerifyGrid) =>
    prepare<MeasureOptions2D>(
      (o) => createMeasurement2D(design, o),
      (band) => ({ courant: g.courant, index: g.index, ppwLow: band[0], ppwHigh: band[1], frequencies: measuredPpw(g), angleDeg: g.angleMaxDeg }),
      g,
      PANE_BUDGET_2D,
    );
  let twoD: RunChoice['twoD'];
  if (grid.dimensions === 1) twoD = { skipped: 'a 1-D study has no oblique incidence' };
  else {
    twoD = twoDAt(grid);
    // A whole band at an oblique angle often needs too long a record (or reaches the grid's cut-off);
    // one frequency at the band's centre is a shorter, narrower run that still tests the angle.
    if (!('run' in twoD) && grid.ppwMax !== grid.ppwMin) {
      const centre = 2 / (1 / grid.ppwMin + 1 / grid.ppwMax);
      const one = twoDAt({ ...grid, ppwMin: centre, ppwMax: centre });
      if ('run' in one) twoD = { ...one, note: `2-D run at one frequency (${centre.toPrecision(3)} cells per wavelength) instead of the band: for the band, ${twoD.skipped}` };
    }
  }
  return { oneD, twoD };
}

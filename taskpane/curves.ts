/**
 * Predicted reflection curves of one design for the charts, from the core's
 * exact discrete model (physics.md §3) with the continuous-theory value beside
 * it (physics.md §2). Points the model cannot evaluate (a wave the grid cannot
 * carry at that angle) are null, so the chart leaves a gap instead of a guess.
 */
import { reflection, type AbsorberDesign } from '../src/plan/steps';

export interface GridOfStudy {
  courant: number;
  dimensions: number;
  index: number;
}

export interface Curve {
  x: number[];
  discrete: Array<number | null>;
  continuous: Array<number | null>;
}

/** Upper end of the angle axis: at least 85°, and 5° beyond the study's largest angle, below grazing. */
export function angleAxisEnd(angleMaxDeg: number): number {
  return Math.min(89, Math.max(85, angleMaxDeg + 5));
}

/** |r| against the angle of incidence from 0° to `endDeg` in 1° steps, at `ppw` cells per wavelength. */
export function reflectionVsAngle(design: AbsorberDesign, grid: GridOfStudy, ppw: number, endDeg: number): Curve {
  const x: number[] = [];
  const discrete: Array<number | null> = [];
  const continuous: Array<number | null> = [];
  for (let a = 0; a <= endDeg; a++) {
    x.push(a);
    try {
      const r = reflection(design, { ppw, courant: grid.courant, dimensions: grid.dimensions, index: grid.index, angleDeg: a });
      discrete.push(r.amplitude);
      continuous.push(r.continuous);
    } catch {
      discrete.push(null);
      continuous.push(null);
    }
  }
  return { x, discrete, continuous };
}

/** Cells-per-wavelength axis: log-spaced over the band, widened to a factor 2 either side when the band is one point. */
export function ppwAxis(ppwMin: number, ppwMax: number, points = 61): number[] {
  let lo = ppwMin;
  let hi = ppwMax;
  if (hi / lo < 1.5) {
    const mid = Math.sqrt(lo * hi);
    lo = Math.max(lo / 1.25, Math.min(lo, 4));
    hi = mid * 2;
  }
  const out: number[] = [];
  for (let i = 0; i < points; i++) out.push(lo * Math.pow(hi / lo, i / (points - 1)));
  return out;
}

/** |r| against cells per wavelength at a fixed angle. */
export function reflectionVsPpw(design: AbsorberDesign, grid: GridOfStudy, ppws: number[], angleDeg: number): Curve {
  const discrete: Array<number | null> = [];
  const continuous: Array<number | null> = [];
  for (const ppw of ppws) {
    try {
      const r = reflection(design, { ppw, courant: grid.courant, dimensions: grid.dimensions, index: grid.index, angleDeg });
      discrete.push(r.amplitude);
      continuous.push(r.continuous);
    } catch {
      discrete.push(null);
      continuous.push(null);
    }
  }
  return { x: ppws, discrete, continuous };
}

/**
 * The comparison of a time-domain measurement with the exact discrete
 * prediction (src/plan/verify.ts runs the measurement): what was measured, the
 * tolerance, and whether they agree. Pure arithmetic with no engine, so the
 * task pane's page imports it without the time-domain code.
 */
import type { SamplingConvention } from '../physics';

/** Relative difference between measured and predicted |r| accepted as agreement (the measurement's own accuracy). */
export const AGREEMENT = 0.01;
/** The grid and band a design is verified on (the study's). */
export interface VerifyGrid {
  courant: number;
  dimensions: number;
  index: number;
  ppwMin: number;
  ppwMax: number;
  angleMaxDeg: number;
  /** How the time-domain grid samples the profiles; default the design's own convention (the one the prediction is exact for). */
  gridSampling?: SamplingConvention;
}

export type CheckName = '1-D' | '2-D';

/** One measured frequency: |r| from the time-domain run beside the exact discrete prediction for the same wave. */
export interface MeasuredPoint {
  run: CheckName;
  ppw: number;
  angleDeg: number;
  measured: number;
  predicted: number;
  /** The convention the prediction is exact for, and the one the grid used (absent: node for both). */
  sampling?: SamplingConvention;
  gridSampling?: SamplingConvention;
}

/** Largest |measured − predicted| / predicted over the points (0 for none). */
export function largestRelativeDifference(points: readonly MeasuredPoint[]): number {
  let worst = 0;
  for (const p of points) worst = Math.max(worst, relativeDifference(p));
  return worst;
}

/** |measured − predicted| / predicted of one point. */
export function relativeDifference(p: MeasuredPoint): number {
  return Math.abs(p.measured - p.predicted) / p.predicted;
}

export interface Comparison {
  /** Largest relative difference over the points, and the point where it occurs (null for no points). */
  largestDifference: number;
  worst: MeasuredPoint | null;
  tolerance: number;
  /** True when every point is within the tolerance (and there is at least one). */
  agree: boolean;
}

/** Measured against predicted: agreement when every point's relative difference is at most `tolerance`. */
export function compareMeasurement(points: readonly MeasuredPoint[], tolerance = AGREEMENT): Comparison {
  let worst: MeasuredPoint | null = null;
  let largest = 0;
  for (const p of points) {
    const d = relativeDifference(p);
    // A NaN difference (a broken run) is a disagreement, never hidden by a max.
    if (worst === null || !(d <= largest)) [worst, largest] = [p, Number.isNaN(d) ? Infinity : d];
  }
  return { largestDifference: largest, worst, tolerance, agree: worst !== null && largest <= tolerance };
}

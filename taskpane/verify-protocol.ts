/** Messages between the pane and the verification worker (verify.worker.ts). */
import type { AbsorberDesign } from '../src/plan/steps';

/** The grid and band a design is verified on (the study's). */
export interface VerifyGrid {
  courant: number;
  dimensions: number;
  index: number;
  ppwMin: number;
  ppwMax: number;
  angleMaxDeg: number;
}

export interface VerifyRequest {
  type: 'run';
  id: number;
  design: AbsorberDesign;
  grid: VerifyGrid;
}

export interface VerifyCancel {
  type: 'cancel';
  id: number;
}

export type ToWorker = VerifyRequest | VerifyCancel;

/** One measured frequency: |r| from the time-domain run beside the exact discrete prediction for the same wave. */
export interface MeasuredPoint {
  run: '1-D' | '2-D';
  ppw: number;
  angleDeg: number;
  measured: number;
  predicted: number;
}

export type FromWorker =
  | { type: 'progress'; id: number; run: '1-D' | '2-D'; fraction: number }
  | { type: 'result'; id: number; points: MeasuredPoint[]; seconds: number; notes: string[] }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };

/** Largest |measured − predicted| / predicted over the points (0 for none). */
export function largestRelativeDifference(points: readonly MeasuredPoint[]): number {
  let worst = 0;
  for (const p of points) worst = Math.max(worst, Math.abs(p.measured - p.predicted) / p.predicted);
  return worst;
}

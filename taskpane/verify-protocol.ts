/** Messages between the pane and the verification worker (verify.worker.ts). */
import type { AbsorberDesign } from '../src/plan/steps';
import type { MeasuredPoint, VerifyGrid } from '../src/plan/verify-compare';

export { largestRelativeDifference, type MeasuredPoint, type VerifyGrid } from '../src/plan/verify-compare';

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

export type FromWorker =
  | { type: 'progress'; id: number; run: '1-D' | '2-D'; fraction: number }
  | { type: 'result'; id: number; points: MeasuredPoint[]; seconds: number; notes: string[] }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };

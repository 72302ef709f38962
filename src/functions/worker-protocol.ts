/**
 * Messages between the worksheet functions (worker-client.ts, main thread of
 * the shared runtime) and their Web Worker (worker.ts). Everything in them is
 * plain data (structured clone): inputs already read and checked on the main
 * thread, results as the plan API returns them, errors as their fields.
 */
import type { AbsorberDesign, DesignResult, DesignSpec, WaveSpec } from '../plan/steps';
import type { Plan, ProjectRow } from '../plan';

/** The wave of a HUSH.REFLECTION_TABLE cell apart from its two axes (cells per wavelength, angle): the same for every cell. */
export type TableWave = Omit<WaveSpec, 'ppw' | 'angleDeg'>;

/** One heavy computation. */
export type Job =
  | { kind: 'plan'; row: ProjectRow }
  | { kind: 'design'; spec: DesignSpec }
  | { kind: 'table'; design: AbsorberDesign; wave: TableWave; ppws: number[]; angles: number[] };

/** What each kind of job settles with. */
export interface JobValues {
  plan: Plan;
  design: DesignResult;
  table: number[][];
}

/** An exception as data: a HushInputError keeps its field and kind (so the cell shows #VALUE! or #NUM! with its message). */
export type SerializedError = { input: true; field: string; message: string; kind: 'value' | 'number' } | { input: false; message: string };

export interface RunJob {
  type: 'run';
  id: number;
  job: Job;
}

export type ToWorker = RunJob;

export type FromWorker =
  /** The worker's script has loaded and it takes jobs. */
  | { type: 'ready' }
  /** The worker began job `id` (tests use it to cancel a job while it runs). */
  | { type: 'started'; id: number }
  | { type: 'done'; id: number; value: unknown }
  | { type: 'failed'; id: number; error: SerializedError };

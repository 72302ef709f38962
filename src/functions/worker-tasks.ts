/**
 * What the heavy worksheet functions compute, as plain functions of a job
 * (worker-protocol.ts): the same code runs in the Web Worker (worker.ts) and,
 * where no worker can be had, on the main thread (worker-client.ts's
 * fallback, through the scheduler). Inputs arrive already read and checked by
 * src/functions/args.ts; the plan API checks the rest and throws
 * HushInputError, which crosses the worker boundary as data.
 */
import { designAbsorber, HushInputError, isHushInputError, reflection } from '../plan/steps';
import { planRow } from '../plan';
import type { Job, JobValues, SerializedError } from './worker-protocol';

/**
 * Largest HUSH.REFLECTION_TABLE, in layer-evaluations: (values of ppw_list) ×
 * (angles) × layers, one unit being one layer of one exact reflection (the
 * unit of the design search's designWork()). 2·10⁶ allows, e.g., 100 × 100
 * values at 200 layers or 500 × 500 values at 8 layers; measured on a 2-core
 * machine at about 3·10³ layer-evaluations per ms at 200 layers (about 12 µs
 * per cell at 10 layers), so at most a few seconds of the worker's time.
 */
export const REFLECTION_TABLE_MAX_WORK = 2_000_000;

/** A whole number with thousands separators (2,000,000), as the description states the bound. */
function grouped(n: number): string {
  return String(n).replace(/\B(?=(\d{3})+$)/g, ',');
}

/** The work of a table job (layer-evaluations). */
export function tableJobWork(job: Extract<Job, { kind: 'table' }>): number {
  return job.ppws.length * job.angles.length * job.design.layers;
}

/** Refuses a table above REFLECTION_TABLE_MAX_WORK with #NUM!, saying what was asked and what is allowed. */
export function checkTableSize(job: Extract<Job, { kind: 'table' }>): void {
  const work = tableJobWork(job);
  if (work <= REFLECTION_TABLE_MAX_WORK) return;
  throw new HushInputError(
    'ppw_list',
    `REFLECTION_TABLE computes at most ${grouped(REFLECTION_TABLE_MAX_WORK)} cells × layers (values of ppw_list × angles × layers); ` +
      `${job.ppws.length} × ${job.angles.length} × ${job.design.layers} = ${grouped(work)} asked: give fewer values or fewer layers`,
    'number',
  );
}

let tableLayerEvaluations = 0;

/** Layer-evaluations done by reflection tables in this thread so far (the same unit as designWork()). */
export function tableWork(): number {
  return tableLayerEvaluations;
}

/** Row `i` of a table job: the exact |r| at ppws[i] for every angle. */
export function tableRow(job: Extract<Job, { kind: 'table' }>, i: number): number[] {
  const { design, wave, ppws, angles } = job;
  const row = new Array<number>(angles.length);
  for (let j = 0; j < angles.length; j++) {
    row[j] = reflection(design, { ...wave, ppw: ppws[i], angleDeg: angles[j] }).amplitude;
    tableLayerEvaluations += design.layers;
  }
  return row;
}

/** Runs one job to its value (throws what the plan API throws). */
export function runJob<K extends Job['kind']>(job: Extract<Job, { kind: K }>): JobValues[K];
export function runJob(job: Job): JobValues[Job['kind']] {
  switch (job.kind) {
    case 'plan':
      return planRow(job.row);
    case 'design':
      return designAbsorber(job.spec);
    case 'table': {
      checkTableSize(job);
      return job.ppws.map((_, i) => tableRow(job, i));
    }
  }
}

/** An exception as data, for postMessage. */
export function serializeError(e: unknown): SerializedError {
  if (isHushInputError(e)) return { input: true, field: e.field, message: e.message, kind: e.kind };
  return { input: false, message: e instanceof Error ? e.message : String(e) };
}

/** The exception back from its data: a HushInputError again, or an Error with the message. */
export function deserializeError(s: SerializedError): Error {
  return s.input ? new HushInputError(s.field, s.message, s.kind) : new Error(s.message);
}

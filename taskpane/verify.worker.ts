/**
 * Web Worker: runs the time-domain measurements of one design (1-D, then the
 * one-mode reduction of the 2-D grid at the study's largest angle, each in as
 * many pieces as its band needs) in chunks, posting progress over all pieces,
 * and stops when the pane sends a cancel.
 */
import { isMeasurementCancelled, runInChunks, type MeasurementRun, type ReflectionMeasurement } from '../src/plan/steps';
import { chooseRuns, type PreparedRun } from './verify-plan';
import type { FromWorker, MeasuredPoint, ToWorker } from './verify-protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const signals = new Map<number, { aborted: boolean }>();

function post(m: FromWorker): void {
  scope.postMessage(m);
}

function points(m: ReflectionMeasurement, run: '1-D' | '2-D'): MeasuredPoint[] {
  return m.frequencies.map((f) => ({ run, ppw: f.ppw, angleDeg: f.angleDeg, measured: f.measuredAmplitude, predicted: f.predictedAmplitude }));
}

scope.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.type === 'cancel') {
    const s = signals.get(msg.id);
    if (s) s.aborted = true;
    return;
  }
  const signal = { aborted: false };
  signals.set(msg.id, signal);
  const t0 = performance.now();
  try {
    const choice = chooseRuns(msg.design, msg.grid);
    const out: MeasuredPoint[] = [];
    const notes: string[] = [];
    /** Runs every piece of a check, with one progress scale over their work. */
    const runAll = async <O>(p: PreparedRun<O>, run: '1-D' | '2-D') => {
      const pieces: MeasurementRun[] = [p.run, ...p.rest.map((r) => r.run)];
      let done = 0;
      for (const piece of pieces) {
        const work = piece.totalSteps * piece.cellUpdatesPerStep;
        const m = await runInChunks(piece, { signal, onProgress: (f) => post({ type: 'progress', id: msg.id, run, fraction: (done + f * work) / p.cellUpdates }) });
        done += work;
        out.push(...points(m, run));
      }
      if (p.note) notes.push(`${run}: ${p.note}`);
    };
    if ('run' in choice.oneD) await runAll(choice.oneD, '1-D');
    else notes.push(`1-D run not made: ${choice.oneD.skipped}`);
    if ('run' in choice.twoD) await runAll(choice.twoD, '2-D');
    else notes.push(`2-D run not made: ${choice.twoD.skipped}`);
    if (out.length === 0) throw new Error(notes.join('; '));
    post({ type: 'result', id: msg.id, points: out, seconds: (performance.now() - t0) / 1000, notes });
  } catch (e) {
    if (isMeasurementCancelled(e)) post({ type: 'cancelled', id: msg.id });
    else post({ type: 'error', id: msg.id, message: e instanceof Error ? e.message : String(e) });
  } finally {
    signals.delete(msg.id);
  }
};

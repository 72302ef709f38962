/**
 * Web Worker: runs the time-domain measurements of one design (1-D, then 2-D)
 * in chunks, posting progress, and stops when the pane sends a cancel.
 */
import { isMeasurementCancelled, runInChunks, type ReflectionMeasurement } from '../src/plan/steps';
import { chooseRuns } from './verify-plan';
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
    if ('run' in choice.oneD) {
      const m = await runInChunks(choice.oneD.run, { signal, onProgress: (f) => post({ type: 'progress', id: msg.id, run: '1-D', fraction: f }) });
      out.push(...points(m, '1-D'));
    } else notes.push(`1-D run not made: ${choice.oneD.skipped}`);
    if ('run' in choice.twoD) {
      const m = await runInChunks(choice.twoD.run, { signal, onProgress: (f) => post({ type: 'progress', id: msg.id, run: '2-D', fraction: f }) });
      out.push(...points(m, '2-D'));
      if (choice.twoD.note) notes.push(choice.twoD.note);
    } else notes.push(`2-D run not made: ${choice.twoD.skipped}`);
    if (out.length === 0) throw new Error(notes.join('; '));
    post({ type: 'result', id: msg.id, points: out, seconds: (performance.now() - t0) / 1000, notes });
  } catch (e) {
    if (isMeasurementCancelled(e)) post({ type: 'cancelled', id: msg.id });
    else post({ type: 'error', id: msg.id, message: e instanceof Error ? e.message : String(e) });
  } finally {
    signals.delete(msg.id);
  }
};

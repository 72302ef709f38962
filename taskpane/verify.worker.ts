/**
 * Web Worker: runs the time-domain verification of one design
 * (src/plan/verify.ts: 1-D, then the one-mode reduction of the 2-D grid at the
 * study's largest angle, each in as many pieces as its band needs) in chunks,
 * posting progress, and stops when the pane sends a cancel.
 */
import { isMeasurementCancelled, runVerification } from '../src/plan/verify';
import type { FromWorker, ToWorker } from './verify-protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const signals = new Map<number, { aborted: boolean }>();

function post(m: FromWorker): void {
  scope.postMessage(m);
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
  try {
    const out = await runVerification(msg.design, msg.grid, { signal, onProgress: (run, fraction) => post({ type: 'progress', id: msg.id, run, fraction }) });
    post({ type: 'result', id: msg.id, points: out.points, seconds: out.seconds, notes: out.notes });
  } catch (e) {
    if (isMeasurementCancelled(e)) post({ type: 'cancelled', id: msg.id });
    else post({ type: 'error', id: msg.id, message: e instanceof Error ? e.message : String(e) });
  } finally {
    signals.delete(msg.id);
  }
};

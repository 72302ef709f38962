/**
 * Web Worker of the heavy worksheet functions: runs one job at a time (a
 * row's plan, a design search, a reflection table) off the thread that Excel's
 * shared runtime gives the worksheet functions and the task pane, and posts
 * the result or the error back (worker-protocol.ts). A job is one synchronous
 * call of the plan API; to stop one, the main thread terminates this worker
 * (worker-client.ts) and starts a fresh one for the next.
 */
import { runJob, serializeError } from './worker-tasks';
import type { FromWorker, ToWorker } from './worker-protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;

function post(m: FromWorker): void {
  scope.postMessage(m);
}

scope.onmessage = (ev: MessageEvent<ToWorker>) => {
  const m = ev.data;
  if (!m || m.type !== 'run') return;
  post({ type: 'started', id: m.id });
  try {
    post({ type: 'done', id: m.id, value: runJob(m.job) });
  } catch (e) {
    post({ type: 'failed', id: m.id, error: serializeError(e) });
  }
};

post({ type: 'ready' });

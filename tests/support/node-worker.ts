/**
 * A Web Worker for Node tests: the add-in's worker script (src/functions/worker.ts,
 * TypeScript, loaded through tsx) in a real worker_threads thread, behind the
 * part of the DOM Worker interface the worksheet executor uses
 * (src/functions/worker-client.ts, WorkerLike). `self`, `postMessage` and
 * `onmessage` are provided the way a dedicated worker has them, so the script
 * runs unchanged; its design work is counted in its own thread, not in the
 * test's.
 */
import path from 'path';
import { Worker } from 'worker_threads';
import type { WorkerFactory, WorkerLike } from '../../src/functions/worker-client';
import type { FromWorker, ToWorker } from '../../src/functions/worker-protocol';

const ROOT = path.resolve(__dirname, '..', '..');
export const WORKER_ENTRY = path.join(ROOT, 'src/functions/worker.ts');

const BOOT = `
const { parentPort, workerData } = require('worker_threads');
globalThis.self = globalThis;
globalThis.postMessage = (m) => parentPort.postMessage(m);
parentPort.on('message', (data) => {
  if (typeof globalThis.onmessage === 'function') globalThis.onmessage({ data });
});
require(workerData.tsx).require(workerData.entry, workerData.entry);
`;

export class NodeWebWorker implements WorkerLike {
  onmessage: ((ev: { data: FromWorker }) => void) | null = null;
  onerror: ((ev: { message?: string }) => void) | null = null;
  /** Every message the worker posted, in order (tests read 'started'). */
  readonly received: FromWorker[] = [];
  terminated = false;
  private readonly thread: Worker;

  constructor(entry = WORKER_ENTRY) {
    this.thread = new Worker(BOOT, { eval: true, workerData: { entry, tsx: require.resolve('tsx/cjs/api') } });
    this.thread.on('message', (data: FromWorker) => {
      this.received.push(data);
      this.onmessage?.({ data });
    });
    this.thread.on('error', (e: Error) => this.onerror?.({ message: e.message }));
  }

  postMessage(message: ToWorker): void {
    this.thread.postMessage(message);
  }

  terminate(): void {
    this.terminated = true;
    void this.thread.terminate();
  }
}

/** A factory that records the workers it made. */
export function nodeWorkers(entry = WORKER_ENTRY): { factory: WorkerFactory; made: NodeWebWorker[]; terminateAll(): void } {
  const made: NodeWebWorker[] = [];
  return {
    made,
    factory: () => {
      const w = new NodeWebWorker(entry);
      made.push(w);
      return w;
    },
    terminateAll: () => made.forEach((w) => w.terminated || w.terminate()),
  };
}

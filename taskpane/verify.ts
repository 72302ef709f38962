/**
 * Runs the time-domain verification in a Web Worker, one run at a time, with
 * progress and cancellation. A cancelled or superseded run never resolves
 * with stale points.
 */
import type { AbsorberDesign } from '../src/plan/steps';
import type { FromWorker, MeasuredPoint, ToWorker, VerifyGrid } from './verify-protocol';

export interface VerifyHandlers {
  onProgress(run: '1-D' | '2-D', fraction: number): void;
}

export interface VerifyOutcome {
  points: MeasuredPoint[];
  seconds: number;
  /** Runs that were not made, and why. */
  notes: string[];
}

export class CancelledError extends Error {
  constructor() {
    super('verification cancelled');
    this.name = 'CancelledError';
  }
}

function createWorker(): Worker {
  // webpack 5 bundles the worker from this exact expression; tsconfig's CommonJS
  // module setting does not know import.meta, which the browser build (ES modules) has.
  // @ts-expect-error TS1343: import.meta is only typed for ES module targets
  return new Worker(new URL('./verify.worker.ts', import.meta.url));
}

export class Verifier {
  private worker: Worker | null = null;
  private nextId = 1;
  private current: { id: number; resolve: (o: VerifyOutcome) => void; reject: (e: Error) => void; handlers: VerifyHandlers } | null = null;

  constructor(private readonly make: () => Worker = createWorker) {}

  get running(): boolean {
    return this.current !== null;
  }

  run(design: AbsorberDesign, grid: VerifyGrid, handlers: VerifyHandlers): Promise<VerifyOutcome> {
    this.cancel();
    const w = this.ensure();
    const id = this.nextId++;
    return new Promise<VerifyOutcome>((resolve, reject) => {
      this.current = { id, resolve, reject, handlers };
      const msg: ToWorker = { type: 'run', id, design, grid };
      w.postMessage(msg);
    });
  }

  /** Stops the running verification (its promise rejects with CancelledError). */
  cancel(): void {
    const c = this.current;
    if (!c) return;
    this.current = null;
    const msg: ToWorker = { type: 'cancel', id: c.id };
    this.worker?.postMessage(msg);
    c.reject(new CancelledError());
  }

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const w = this.make();
    w.onmessage = (ev: MessageEvent<FromWorker>) => {
      const m = ev.data;
      const c = this.current;
      if (!c || m.id !== c.id) return;
      if (m.type === 'progress') c.handlers.onProgress(m.run, m.fraction);
      else if (m.type === 'result') {
        this.current = null;
        c.resolve({ points: m.points, seconds: m.seconds, notes: m.notes });
      } else if (m.type === 'error') {
        this.current = null;
        c.reject(new Error(m.message));
      } else if (m.type === 'cancelled') {
        this.current = null;
        c.reject(new CancelledError());
      }
    };
    w.onerror = (ev: ErrorEvent) => {
      const c = this.current;
      this.current = null;
      this.worker = null;
      w.terminate();
      c?.reject(new Error(`the verification worker failed: ${ev.message || 'unknown error'}`));
    };
    this.worker = w;
    return w;
  }
}

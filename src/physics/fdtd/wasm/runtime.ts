/**
 * Loads the WebAssembly build of the 2-D step (tmz-step.c) when the host
 * allows it, and lays out a grid's arrays in the module's linear memory.
 * Anything that goes wrong (no WebAssembly, a Content-Security-Policy that
 * forbids compiling it, not enough memory) returns null, and the grid keeps
 * the TypeScript step: same arithmetic, only slower.
 */
import { TMZ_STEP_WASM_BASE64 } from './tmz-step-wasm';

interface WasmApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  Memory: new (d: { initial: number; maximum?: number }) => { buffer: ArrayBuffer };
}

const PAGE = 65536;
let compiled: object | null | undefined;

function decodeBase64(s: string): Uint8Array {
  const g = globalThis as { atob?: (s: string) => string; Buffer?: { from(s: string, e: string): Uint8Array } };
  if (g.Buffer) return new Uint8Array(g.Buffer.from(s, 'base64'));
  const bin = (g.atob as (s: string) => string)(s);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

function api(): WasmApi | null {
  const w = (globalThis as { WebAssembly?: WasmApi }).WebAssembly;
  return w && typeof w.Module === 'function' ? w : null;
}

function module(): object | null {
  if (compiled !== undefined) return compiled;
  try {
    const w = api();
    compiled = w ? new w.Module(decodeBase64(TMZ_STEP_WASM_BASE64)) : null;
  } catch {
    compiled = null;
  }
  return compiled;
}

/** Set by tests and benchmarks to compare the two steps; not a user setting. */
export const wasmSwitch = { enabled: true };

export type TmzStepFn = (ez: number, hx: number, hy: number, ny: number, G: number, gL: number, gR: number, dt: number, sides: number) => void;

/** A block of linear memory with a bump allocator for Float64Arrays and the step function bound to it. */
export interface WasmArena {
  step: TmzStepFn;
  /** Float64Array of `length` values at a fresh 8-byte aligned offset. */
  doubles(length: number): { array: Float64Array; offset: number };
  /** Int32Array of `length` values at a fresh offset. */
  ints(length: number): { array: Int32Array; offset: number };
}

/** An arena of at least `bytes` bytes, or null when WebAssembly cannot be used here. */
export function createArena(bytes: number): WasmArena | null {
  if (!wasmSwitch.enabled) return null;
  const w = api();
  const m = module();
  if (!w || !m) return null;
  try {
    const heapBase = 1 << 17; // above the module's 64 KiB stack and (empty) data
    const pages = Math.ceil((heapBase + bytes + 64) / PAGE);
    if (pages > 65536) return null;
    const memory = new w.Memory({ initial: pages, maximum: pages });
    const instance = new w.Instance(m, { env: { memory } });
    const base = (instance.exports.__heap_base as { value: number } | undefined)?.value ?? 0;
    if (base > heapBase) return null;
    const step = instance.exports.tmz_step as TmzStepFn;
    let next = heapBase;
    const buffer = memory.buffer;
    return {
      step,
      doubles(length: number) {
        next = (next + 7) & ~7;
        const offset = next;
        next += length * 8;
        return { array: new Float64Array(buffer, offset, length), offset };
      },
      ints(length: number) {
        next = (next + 7) & ~7;
        const offset = next;
        next += length * 4;
        return { array: new Int32Array(buffer, offset, length), offset };
      },
    };
  } catch {
    return null;
  }
}

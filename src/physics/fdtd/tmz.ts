/**
 * 2-D TMz Yee grid (Ez(i,j), Hx(i,j+½), Hy(i+½,j)), periodic in y with Ny
 * cells, CPML along x only, lossless elsewhere, in the core's normalised units
 * (Δ = 1, v = 1, ε = μ = 1, Δt = S_m):
 *   ∂Hx/∂t = −∂Ez/∂y,  ∂Hy/∂t = ∂Ez/∂x (stretched),  ∂Ez/∂t = ∂Hy/∂x (stretched) − ∂Hx/∂y.
 * The x-stretched differences use the recursive-convolution CPML of Roden &
 * Gedney (2000) with the same node convention and coefficient indexing as the
 * 1-D line (see line.ts): column g along x is an E-node row of Ny values.
 *
 * Storage is row-major with y contiguous: Ez and Hx at g·Ny + j (g = 0…G),
 * Hy at g·Ny + j (g = 0…G−1, position g + ½). ψ storage exists only for the
 * absorber columns. The step loop allocates nothing.
 */
import type { CpmlCoefficients } from '../cpml';
import { HushInputError } from '../errors';
import { inRange, wholeInRange } from '../validate';
import { createArena, type WasmArena } from './wasm/runtime';

/** Largest grid the engine builds (Ez values). */
export const MAX_GRID_NODES = 50_000_000;

/** Geometry and absorbers of a periodic TMz grid. */
export interface TmzGrid {
  /** Cells along x between the left and right interfaces, ≥ 1. */
  cells: number;
  /** Cells along y (the period), ≥ 1. */
  transverseCells: number;
  /** Medium Courant number S_m, 0 < S_m ≤ 1/√2. */
  courantMedium: number;
  /** Absorber at the right x end (depth grows to the right). */
  right?: CpmlCoefficients | null;
  /** Absorber at the left x end (depth grows to the left). */
  left?: CpmlCoefficients | null;
}

interface Side {
  layers: number;
  eB: Float64Array;
  eA: Float64Array;
  eInvKappa: Float64Array;
  hB: Float64Array;
  hA: Float64Array;
  hInvKappa: Float64Array;
  /** ψ for ∂Hy/∂x in Ez, at depth i = 0…N−1, row i·Ny. */
  psiE: Float64Array;
  /** ψ for ∂Ez/∂x in Hy, at depth i + ½, row i·Ny. */
  psiH: Float64Array;
}

/** Float64Array storage: plain, or inside a WebAssembly arena (then with its byte offset). */
type Alloc = (length: number) => { array: Float64Array; offset: number };

const plainAlloc: Alloc = (length) => ({ array: new Float64Array(length), offset: -1 });

function copyInto(alloc: Alloc, src: Float64Array, length: number): { array: Float64Array; offset: number } {
  const a = alloc(length);
  a.array.set(src.subarray(0, length));
  return a;
}

function sideLayers(c: CpmlCoefficients | null | undefined): number {
  if (c === null || c === undefined) return 0;
  return wholeInRange('absorber layers', c.layers, 1, MAX_GRID_NODES);
}

/** Builds a side's arrays; `record` (9 int32: layers and 8 byte offsets) describes it to the WebAssembly step. */
function makeSide(c: CpmlCoefficients | null | undefined, ny: number, alloc: Alloc, record: Int32Array | null): Side | null {
  const n = sideLayers(c);
  if (n === 0 || !c) return null;
  const parts = [
    copyInto(alloc, c.eB, n + 1),
    copyInto(alloc, c.eA, n + 1),
    copyInto(alloc, c.eInvKappa, n + 1),
    copyInto(alloc, c.hB, n),
    copyInto(alloc, c.hA, n),
    copyInto(alloc, c.hInvKappa, n),
    alloc(n * ny),
    alloc(n * ny),
  ];
  if (record) {
    record[0] = n;
    for (let k = 0; k < 8; k++) record[k + 1] = parts[k].offset;
  }
  return {
    layers: n,
    eB: parts[0].array,
    eA: parts[1].array,
    eInvKappa: parts[2].array,
    hB: parts[3].array,
    hA: parts[4].array,
    hInvKappa: parts[5].array,
    psiE: parts[6].array,
    psiH: parts[7].array,
  };
}

/** Bytes a grid needs in a WebAssembly arena (with alignment slack). */
function arenaBytes(total: number, hy: number, nl: number, nr: number, ny: number): number {
  const side = (n: number) => (n === 0 ? 0 : (3 * (n + 1) + 3 * n + 2 * n * ny) * 8 + 8 * 8);
  return (2 * total + hy) * 8 + side(nl) + side(nr) + 2 * 9 * 4 + 64;
}

export class TmzGrid2D {
  readonly ez: Float64Array;
  readonly hx: Float64Array;
  readonly hy: Float64Array;
  readonly ny: number;
  /** Index of the last E column (a conductor). */
  readonly last: number;
  readonly leftInterface: number;
  readonly rightInterface: number;
  readonly dt: number;
  time = 0;
  private readonly leftSide: Side | null;
  private readonly rightSide: Side | null;
  private readonly nativeStep: (() => void) | null;

  constructor(grid: TmzGrid) {
    if (grid === null || typeof grid !== 'object') {
      throw new HushInputError('grid', 'grid must be an object with cells, transverseCells and courantMedium', 'value');
    }
    const cells = wholeInRange('lossless cells', grid.cells, 1, MAX_GRID_NODES);
    const ny = wholeInRange('transverse cells', grid.transverseCells, 1, MAX_GRID_NODES);
    this.dt = inRange('Courant number in the medium', grid.courantMedium, 0, Math.SQRT1_2 * (1 + 1e-12), { loOpen: true });
    this.ny = ny;
    const nl = sideLayers(grid.left);
    const nr = sideLayers(grid.right);
    this.leftInterface = nl;
    this.rightInterface = nl + cells;
    this.last = nl + cells + nr;
    const total = (this.last + 1) * ny;
    if (total > MAX_GRID_NODES) {
      throw new HushInputError('lossless cells', `the grid must have at most ${MAX_GRID_NODES} nodes (got ${total})`);
    }
    // The same arrays, in WebAssembly memory when the host allows it (tmz-step.c), else plain.
    const arena: WasmArena | null = createArena(arenaBytes(total, this.last * ny, nl, nr, ny));
    const alloc: Alloc = arena ? (n) => arena.doubles(n) : plainAlloc;
    const records = arena ? arena.ints(18) : null;
    const ez = alloc(total);
    const hx = alloc(total);
    const hy = alloc(this.last * ny);
    this.ez = ez.array;
    this.hx = hx.array;
    this.hy = hy.array;
    this.leftSide = makeSide(grid.left, ny, alloc, records ? records.array.subarray(0, 9) : null);
    this.rightSide = makeSide(grid.right, ny, alloc, records ? records.array.subarray(9, 18) : null);
    if (arena && records) {
      const step = arena.step;
      const [pe, px, py, G, gL, gR, dt, ps] = [ez.offset, hx.offset, hy.offset, this.last, this.leftInterface, this.rightInterface, this.dt, records.offset];
      this.nativeStep = () => step(pe, px, py, ny, G, gL, gR, dt, ps);
    } else {
      this.nativeStep = null;
    }
  }

  /** True when steps run in the WebAssembly build of the same update. */
  get usesWebAssembly(): boolean {
    return this.nativeStep !== null;
  }

  /** Ez nodes, a cost measure (cell updates per step). */
  get nodes(): number {
    return (this.last + 1) * this.ny;
  }

  reset(): void {
    this.ez.fill(0);
    this.hx.fill(0);
    this.hy.fill(0);
    for (const s of [this.leftSide, this.rightSide]) {
      if (s) {
        s.psiE.fill(0);
        s.psiH.fill(0);
      }
    }
    this.time = 0;
  }

  /**
   * One leapfrog step as a single sweep over the x columns: H in column g
   * (from Ez in columns g and g + 1, not yet advanced), then Ez in column g
   * (from Hy in columns g − 1 and g and Hx in column g, all just advanced).
   * Equivalent to "all H, then all E", with one pass over memory.
   */
  step(): void {
    if (this.nativeStep) {
      this.nativeStep();
      this.time++;
      return;
    }
    const ez = this.ez;
    const hx = this.hx;
    const hy = this.hy;
    const dt = this.dt;
    const ny = this.ny;
    const G = this.last;
    const gL = this.leftInterface;
    const gR = this.rightInterface;
    const L = this.leftSide;
    const R = this.rightSide;
    for (let g = 0; g < G; g++) {
      const r = g * ny;
      if (g < gL) {
        const s = L as Side;
        const i = gL - g - 1;
        stretchedH(ez, hx, hy, r, ny, dt, s.hB[i], s.hA[i], s.hInvKappa[i], s.psiH, i * ny);
      } else if (g < gR) {
        losslessH(ez, hx, hy, r, ny, dt);
      } else {
        const s = R as Side;
        const i = g - gR;
        stretchedH(ez, hx, hy, r, ny, dt, s.hB[i], s.hA[i], s.hInvKappa[i], s.psiH, i * ny);
      }
      if (g === 0) continue;
      if (g <= gL) {
        const s = L as Side;
        const i = gL - g;
        stretchedE(ez, hx, hy, r, ny, dt, s.eB[i], s.eA[i], s.eInvKappa[i], s.psiE, i * ny);
      } else if (g < gR) {
        losslessE(ez, hx, hy, r, ny, dt);
      } else {
        const s = R as Side;
        const i = g - gR;
        stretchedE(ez, hx, hy, r, ny, dt, s.eB[i], s.eA[i], s.eInvKappa[i], s.psiE, i * ny);
      }
    }
    this.time++;
  }

  /**
   * Advances `count` steps from step index `from`. After each step n the soft
   * source adds waveform[n]·sourceProfile[j] to Ez in column `sourceColumn`,
   * and record[n] receives Σ_j probeWeights[j]·Ez(probeColumn, j).
   */
  advance(
    count: number,
    from: number,
    waveform: Float64Array,
    sourceColumn: number,
    sourceProfile: Float64Array,
    record: Float64Array,
    probeColumn: number,
    probeWeights: Float64Array,
  ): void {
    const ez = this.ez;
    const ny = this.ny;
    const nw = waveform.length;
    const s0 = sourceColumn * ny;
    const p0 = probeColumn * ny;
    for (let c = 0; c < count; c++) {
      const n = from + c;
      this.step();
      if (n < nw) {
        const w = waveform[n];
        for (let j = 0; j < ny; j++) ez[s0 + j] += w * sourceProfile[j];
      }
      let acc = 0;
      for (let j = 0; j < ny; j++) acc += probeWeights[j] * ez[p0 + j];
      record[n] = acc;
    }
  }
}

// Column kernels. Row r = g·Ny starts column g; y is periodic, so the first
// or last value of each column wraps. The running value of the neighbour is
// kept in a register to halve the loads.

function losslessH(ez: Float64Array, hx: Float64Array, hy: Float64Array, r: number, ny: number, dt: number): void {
  const last = r + ny - 1;
  let cur = ez[r];
  for (let k = r; k < last; k++) {
    const next = ez[k + 1];
    hx[k] -= dt * (next - cur);
    hy[k] += dt * (ez[k + ny] - cur);
    cur = next;
  }
  hx[last] -= dt * (ez[r] - cur);
  hy[last] += dt * (ez[last + ny] - cur);
}

function stretchedH(
  ez: Float64Array,
  hx: Float64Array,
  hy: Float64Array,
  r: number,
  ny: number,
  dt: number,
  b: number,
  a: number,
  invKappa: number,
  psi: Float64Array,
  p0: number,
): void {
  const last = r + ny - 1;
  const off = p0 - r;
  let cur = ez[r];
  for (let k = r; k < last; k++) {
    const next = ez[k + 1];
    hx[k] -= dt * (next - cur);
    const d = ez[k + ny] - cur;
    const p = b * psi[k + off] + a * d;
    psi[k + off] = p;
    hy[k] += dt * (invKappa * d + p);
    cur = next;
  }
  hx[last] -= dt * (ez[r] - cur);
  const d = ez[last + ny] - cur;
  const p = b * psi[last + off] + a * d;
  psi[last + off] = p;
  hy[last] += dt * (invKappa * d + p);
}

function losslessE(ez: Float64Array, hx: Float64Array, hy: Float64Array, r: number, ny: number, dt: number): void {
  const end = r + ny;
  let prev = hx[end - 1];
  for (let k = r; k < end; k++) {
    const h = hx[k];
    ez[k] += dt * (hy[k] - hy[k - ny] - (h - prev));
    prev = h;
  }
}

function stretchedE(
  ez: Float64Array,
  hx: Float64Array,
  hy: Float64Array,
  r: number,
  ny: number,
  dt: number,
  b: number,
  a: number,
  invKappa: number,
  psi: Float64Array,
  p0: number,
): void {
  const end = r + ny;
  const off = p0 - r;
  let prev = hx[end - 1];
  for (let k = r; k < end; k++) {
    const h = hx[k];
    const d = hy[k] - hy[k - ny];
    const p = b * psi[k + off] + a * d;
    psi[k + off] = p;
    ez[k] += dt * (invKappa * d + p - (h - prev));
    prev = h;
  }
}

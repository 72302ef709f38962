/**
 * 1-D Yee line with CPML ends, in the core's normalised units (cell Δ = 1,
 * medium wave speed v = 1, ε = μ = 1, Δt = S_m). Ez on integer nodes, Hy on
 * half nodes; the update is the recursive-convolution CPML of Roden & Gedney
 * (Microwave Opt. Technol. Lett. 27, 334 (2000)):
 *   ψⁿ = b·ψⁿ⁻¹ + a·Dⁿ,  field += Δt·(D/κ + ψ),
 * with the node convention of physics.md §3: an absorber of N layers has its
 * interface (depth 0) on an E node, E nodes at depths 0…N use eB/eA/eInvKappa[i],
 * H nodes at depth i + ½ use hB/hA/hInvKappa[i], and a perfect conductor sits on
 * the E node at depth N. Depth grows away from the lossless interior.
 *
 * Layout of the E nodes g = 0…G (G = left + cells + right):
 *   g = 0 conductor | left absorber | left interface gL = left | lossless |
 *   right interface gR = gL + cells | right absorber | g = G conductor.
 * H node h[g] sits at g + ½. Without an absorber on a side the conductor sits
 * on that side's interface node.
 *
 * The step loop allocates nothing.
 */
import type { CpmlCoefficients } from '../cpml';
import { HushInputError } from '../errors';
import { inRange, wholeInRange } from '../validate';

/** Largest line the engine builds (E nodes); keeps a worker from exhausting memory on a typo. */
export const MAX_LINE_NODES = 10_000_000;

/** Geometry and absorbers of a 1-D line. */
export interface LineGrid {
  /** Cells between the left and right interfaces (lossless region), ≥ 1. */
  cells: number;
  /** Medium Courant number S_m = Δt (normalised), 0 < S_m ≤ 1. */
  courantMedium: number;
  /** Absorber on the right (depth grows to the right); none puts a conductor on the right interface. */
  right?: CpmlCoefficients | null;
  /** Absorber on the left (depth grows to the left). */
  left?: CpmlCoefficients | null;
}

/** One absorber side's coefficients and auxiliary ψ storage (also the mode chain's, mode-line.ts). */
export interface Side {
  layers: number;
  eB: Float64Array;
  eA: Float64Array;
  eInvKappa: Float64Array;
  hB: Float64Array;
  hA: Float64Array;
  hInvKappa: Float64Array;
  psiE: Float64Array;
  psiH: Float64Array;
}

export function makeSide(c: CpmlCoefficients | null | undefined): Side | null {
  if (c === null || c === undefined) return null;
  const n = c.layers;
  wholeInRange('absorber layers', n, 1, MAX_LINE_NODES);
  return {
    layers: n,
    eB: c.eB.slice(0, n + 1),
    eA: c.eA.slice(0, n + 1),
    eInvKappa: c.eInvKappa.slice(0, n + 1),
    hB: c.hB.slice(0, n),
    hA: c.hA.slice(0, n),
    hInvKappa: c.hInvKappa.slice(0, n),
    psiE: new Float64Array(n),
    psiH: new Float64Array(n),
  };
}

export class CpmlLine {
  /** Ez at nodes 0…G. */
  readonly e: Float64Array;
  /** Hy at nodes g + ½, g = 0…G−1. */
  readonly h: Float64Array;
  /** Index of the last E node (a conductor). */
  readonly last: number;
  /** E node of the left interface (depth 0 of the left absorber, or the left conductor). */
  readonly leftInterface: number;
  /** E node of the right interface (depth 0 of the right absorber, or the right conductor). */
  readonly rightInterface: number;
  readonly dt: number;
  /** Steps taken. */
  time = 0;
  private readonly leftSide: Side | null;
  private readonly rightSide: Side | null;

  constructor(grid: LineGrid) {
    if (grid === null || typeof grid !== 'object') {
      throw new HushInputError('grid', 'grid must be an object with cells and courantMedium', 'value');
    }
    const cells = wholeInRange('lossless cells', grid.cells, 1, MAX_LINE_NODES);
    this.dt = inRange('Courant number in the medium', grid.courantMedium, 0, 1, { loOpen: true });
    this.leftSide = makeSide(grid.left);
    this.rightSide = makeSide(grid.right);
    const nl = this.leftSide ? this.leftSide.layers : 0;
    const nr = this.rightSide ? this.rightSide.layers : 0;
    this.leftInterface = nl;
    this.rightInterface = nl + cells;
    this.last = nl + cells + nr;
    if (this.last + 1 > MAX_LINE_NODES) {
      throw new HushInputError('lossless cells', `the line must have at most ${MAX_LINE_NODES} nodes (got ${this.last + 1})`);
    }
    this.e = new Float64Array(this.last + 1);
    this.h = new Float64Array(this.last);
  }

  /** Number of E nodes, a cost measure (cell updates per step). */
  get nodes(): number {
    return this.last + 1;
  }

  /** Zeroes all fields and auxiliary variables and the clock. */
  reset(): void {
    this.e.fill(0);
    this.h.fill(0);
    for (const s of [this.leftSide, this.rightSide]) {
      if (s) {
        s.psiE.fill(0);
        s.psiH.fill(0);
      }
    }
    this.time = 0;
  }

  /** One leapfrog step: H from E, then E from H. */
  step(): void {
    const e = this.e;
    const h = this.h;
    const dt = this.dt;
    const gL = this.leftInterface;
    const gR = this.rightInterface;
    const G = this.last;
    // H, lossless: gL ≤ g < gR.
    for (let g = gL; g < gR; g++) h[g] += dt * (e[g + 1] - e[g]);
    const L = this.leftSide;
    if (L) {
      // H at g + ½, g < gL: depth (gL − g − 1) + ½.
      const { hB, hA, hInvKappa, psiH } = L;
      for (let g = 0; g < gL; g++) {
        const i = gL - g - 1;
        const d = e[g + 1] - e[g];
        const p = hB[i] * psiH[i] + hA[i] * d;
        psiH[i] = p;
        h[g] += dt * (hInvKappa[i] * d + p);
      }
    }
    const R = this.rightSide;
    if (R) {
      const { hB, hA, hInvKappa, psiH } = R;
      for (let g = gR; g < G; g++) {
        const i = g - gR;
        const d = e[g + 1] - e[g];
        const p = hB[i] * psiH[i] + hA[i] * d;
        psiH[i] = p;
        h[g] += dt * (hInvKappa[i] * d + p);
      }
    }
    // E, lossless: gL < g < gR.
    for (let g = gL + 1; g < gR; g++) e[g] += dt * (h[g] - h[g - 1]);
    if (L) {
      // E at g, 1 ≤ g ≤ gL: depth gL − g (the conductor at g = 0 stays 0).
      const { eB, eA, eInvKappa, psiE } = L;
      for (let g = 1; g <= gL; g++) {
        const i = gL - g;
        const d = h[g] - h[g - 1];
        const p = eB[i] * psiE[i] + eA[i] * d;
        psiE[i] = p;
        e[g] += dt * (eInvKappa[i] * d + p);
      }
    }
    if (R) {
      const { eB, eA, eInvKappa, psiE } = R;
      for (let g = gR; g < G; g++) {
        const i = g - gR;
        const d = h[g] - h[g - 1];
        const p = eB[i] * psiE[i] + eA[i] * d;
        psiE[i] = p;
        e[g] += dt * (eInvKappa[i] * d + p);
      }
    }
    this.time++;
  }

  /**
   * Advances `count` steps from step index `from`: after each step n the soft
   * source adds waveform[n] to Ez at `sourceNode` and record[n] receives Ez at
   * `probeNode`. Indices past the waveform's end add nothing.
   */
  advance(count: number, from: number, waveform: Float64Array, sourceNode: number, record: Float64Array, probeNode: number): void {
    const e = this.e;
    const nw = waveform.length;
    for (let k = 0; k < count; k++) {
      const n = from + k;
      this.step();
      if (n < nw) e[sourceNode] += waveform[n];
      record[n] = e[probeNode];
    }
  }
}

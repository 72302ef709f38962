/**
 * A 1-D Yee chain carrying one transverse mode of a periodic 2-D TMz grid,
 * exactly: in the grid of tmz.ts, fields of the form
 *   Ez(g, j) = e_g·cos(k_t·j),  Hy(g + ½, j) = h_g·cos(k_t·j),  Hx(g, j + ½) = t_g·sin(k_t·(j + ½))
 * stay of that form under the update (derived: cos(k(j+1)) − cos(kj) = −2 sin(k/2)·sin(k(j+½))
 * and sin(k(j+½)) − sin(k(j−½)) = 2 sin(k/2)·cos(kj)), with K = 2·sin(k_t/2):
 *   t_g += Δt·K·e_g,   h_g += Δt·(stretched ∂x e),   e_g += Δt·(stretched ∂x h − K·t_g).
 * So a source profile cos(k_t·j) in the grid and a source e_s in this chain give
 * the same field to rounding, at the cost of one column instead of Ny
 * (tests/verification.test.ts runs both). The CPML along x is the recursive
 * convolution of Roden & Gedney (2000) with the node layout and coefficient
 * indexing of line.ts; the transverse difference is not stretched, as in tmz.ts.
 * K may be any real number (the chain is then a mode of no particular period),
 * which is how an evanescent near field of any decay length is run
 * (physics.md §6). Units: Δ = 1, v = 1, Δt = S_m. The step loop allocates nothing.
 */
import type { CpmlCoefficients } from '../cpml';
import { HushInputError } from '../errors';
import { inRange, wholeInRange } from '../validate';
import { makeSide, MAX_LINE_NODES, type Side } from './line';

/** Geometry, absorbers and transverse mode of a mode chain. */
export interface ModeLineGrid {
  /** Cells between the left and right interfaces (lossless region), ≥ 1. */
  cells: number;
  /** Medium Courant number S_m = Δt (normalised). */
  courantMedium: number;
  /** Transverse Yee factor K = 2·sin(k_t/2), 0 ≤ K ≤ 2 (the range of a 2-D grid). */
  transverse: number;
  right?: CpmlCoefficients | null;
  left?: CpmlCoefficients | null;
}

export class ModeLine {
  /** Ez amplitude e_g at nodes 0…G. */
  readonly e: Float64Array;
  /** Hy amplitude h_g at nodes g + ½, g = 0…G−1. */
  readonly h: Float64Array;
  /** Hx amplitude t_g at nodes g (the transverse field). */
  readonly t: Float64Array;
  readonly last: number;
  readonly leftInterface: number;
  readonly rightInterface: number;
  readonly dt: number;
  readonly transverse: number;
  time = 0;
  private readonly leftSide: Side | null;
  private readonly rightSide: Side | null;

  constructor(grid: ModeLineGrid) {
    if (grid === null || typeof grid !== 'object') {
      throw new HushInputError('grid', 'grid must be an object with cells, courantMedium and transverse', 'value');
    }
    const cells = wholeInRange('lossless cells', grid.cells, 1, MAX_LINE_NODES);
    this.transverse = inRange('transverse factor K', grid.transverse, 0, 2);
    // Stable for every mode of a 2-D grid: S_m ≤ 1/√2 (Taflove & Hagness, 3rd ed., ch. 4).
    this.dt = inRange('Courant number in the medium', grid.courantMedium, 0, Math.SQRT1_2 * (1 + 1e-12), { loOpen: true });
    this.leftSide = makeSide(grid.left);
    this.rightSide = makeSide(grid.right);
    const nl = this.leftSide ? this.leftSide.layers : 0;
    const nr = this.rightSide ? this.rightSide.layers : 0;
    this.leftInterface = nl;
    this.rightInterface = nl + cells;
    this.last = nl + cells + nr;
    if (this.last + 1 > MAX_LINE_NODES) {
      throw new HushInputError('lossless cells', `the chain must have at most ${MAX_LINE_NODES} nodes (got ${this.last + 1})`);
    }
    this.e = new Float64Array(this.last + 1);
    this.h = new Float64Array(this.last);
    this.t = new Float64Array(this.last + 1);
  }

  /** Number of E nodes, a cost measure (cell updates per step). */
  get nodes(): number {
    return this.last + 1;
  }

  reset(): void {
    this.e.fill(0);
    this.h.fill(0);
    this.t.fill(0);
    for (const s of [this.leftSide, this.rightSide]) {
      if (s) {
        s.psiE.fill(0);
        s.psiH.fill(0);
      }
    }
    this.time = 0;
  }

  /** One leapfrog step: both H fields from E, then E from H. */
  step(): void {
    const e = this.e;
    const h = this.h;
    const t = this.t;
    const dt = this.dt;
    const K = this.transverse;
    const gL = this.leftInterface;
    const gR = this.rightInterface;
    const G = this.last;
    for (let g = 1; g < G; g++) t[g] += dt * (K * e[g]);
    for (let g = gL; g < gR; g++) h[g] += dt * (e[g + 1] - e[g]);
    const L = this.leftSide;
    if (L) {
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
    for (let g = gL + 1; g < gR; g++) e[g] += dt * (h[g] - h[g - 1] - K * t[g]);
    if (L) {
      const { eB, eA, eInvKappa, psiE } = L;
      for (let g = 1; g <= gL; g++) {
        const i = gL - g;
        const d = h[g] - h[g - 1];
        const p = eB[i] * psiE[i] + eA[i] * d;
        psiE[i] = p;
        e[g] += dt * (eInvKappa[i] * d + p - K * t[g]);
      }
    }
    if (R) {
      const { eB, eA, eInvKappa, psiE } = R;
      for (let g = gR; g < G; g++) {
        const i = g - gR;
        const d = h[g] - h[g - 1];
        const p = eB[i] * psiE[i] + eA[i] * d;
        psiE[i] = p;
        e[g] += dt * (eInvKappa[i] * d + p - K * t[g]);
      }
    }
    this.time++;
  }

  /**
   * Advances `count` steps from step index `from`: after each step n the soft
   * source adds waveform[n] to e at `sourceNode` and record[n] receives e at
   * `probeNode` (the mode's amplitude, as the grid's cos-weighted probe reads it).
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

/**
 * The dense check of one design, kept so that searches with other targets
 * reuse it (design.ts keeps them per physics and strength): its scan of the
 * dense grid replayed for any bound, and the climbs between its samples, each
 * done once (see the class).
 */
import { fillCoefficients } from './cpml';
import type { ResolvedDesign } from './grading';
import type { ReflectionWorkspace } from './reflection';
import { amplitudeAt, forgetFactors, frequencyKernels, groupDesign, kernelOut, layerEvaluations, scratchDesign, type CheckGroup, type DesignChecks } from './design-checks';
import type { ResolvedSpec } from './design';

/** Local maxima of the dense grid refined this many at most per group (highest first). */
const REFINE_PEAKS = 8;
const REFINE_ROUNDS = 2;
const REFINE_ITERATIONS = 12;
/** Peaks of the dense grid below this share of the target are not climbed (besides each group's highest). */
const REFINE_FLOOR = 0.25;

export interface Peak {
  /** Weighted |r| (the near field's includes e^{−2·gap/L}). */
  amplitude: number;
  ppw: number;
  angleDeg: number;
  azimuthDeg: number;
}

export interface Refined {
  overall: Peak;
  perGroup: Peak[];
}

/**
 * The dense check of one design (its layers, order, κ_max, α_max_norm and
 * strength fixed), kept so that searches with other targets reuse it
 * (denseCheckOf):
 * - `scan(bound)`: what worstReflection(d, dense, ws, bound) gives (the worst
 *   weighted |r| in its sample order, stopping once over `bound`), its
 *   samples computed only as far as a scan has gone;
 * - `refined(target)`: the worst weighted |r| between the dense samples, per
 *   group: every local maximum of a group's dense grid (the highest
 *   REFINE_PEAKS, and below the highest only those at or above REFINE_FLOOR ×
 *   target) is climbed by golden-section searches in frequency, angle and
 *   azimuth, in turn, within one dense spacing of its sample and inside the
 *   band and direction ranges; each climb is done once. The result is at least
 *   the dense worst.
 * The same arithmetic as computing each afresh, so the same values.
 */
export class DenseCheck {
  private readonly d: ResolvedDesign;
  /** The scan's weighted |r| (√(re² + im²)·w) and group, in worstReflection's order; `done` of `total` computed. */
  private readonly scanAmp: Float64Array;
  private readonly scanGroup: Uint16Array;
  private done = 0;
  private nextGroup = 0;
  private nextFrequency = 0;
  /** Per group: weighted |r| by Math.hypot at (i·na + j)·nz + z, its local maxima (highest first), the best of them, and the climbs so far. */
  private readonly tables: Float64Array[];
  private readonly peaks: (number[] | null)[];
  private readonly firstBest: Peak[];
  private readonly climbs: Peak[][];

  constructor(
    design: ResolvedDesign,
    private readonly dense: DesignChecks,
    private readonly rs: ResolvedSpec,
  ) {
    // The same property order as resolveDesign's objects, so the coefficient code sees one object shape.
    const { layers, order, strength, kappaMax, alphaMaxNorm, alphaOrder, grading, geometricRatio, sampling } = design;
    this.d = { layers, order, strength, kappaMax, alphaMaxNorm, alphaOrder, grading, geometricRatio, sampling };
    let total = 0;
    for (const g of dense.groups) {
      let perFrequency = 0;
      for (let j = 0; j < g.angleDeg.length; j++) perFrequency += g.angleDeg[j] === 0 ? 1 : g.azimuthDeg.length;
      total += g.ppw.length * perFrequency;
    }
    this.scanAmp = new Float64Array(total);
    this.scanGroup = new Uint16Array(total);
    this.tables = dense.groups.map((g) => new Float64Array(g.ppw.length * g.angleDeg.length * g.azimuthDeg.length));
    this.peaks = dense.groups.map(() => null);
    this.firstBest = [];
    this.climbs = dense.groups.map(() => []);
  }

  /** Computes the next frequency of the scan (every direction of it, in one pass over the layers). */
  private extend(ws: ReflectionWorkspace, filled: { group: CheckGroup | null }): void {
    const gi = this.nextGroup;
    const g = this.dense.groups[gi];
    const sm = g.courantMedium;
    const N = this.d.layers;
    const f = filled.group;
    if (!f || f.scale !== g.scale || f.sampling !== g.sampling || f.courantMedium !== sm) {
      fillCoefficients(groupDesign(this.d, g, scratchDesign), sm, ws.coef);
      filled.group = g;
    }
    const i = this.nextFrequency;
    const na = g.angleDeg.length;
    const nz = g.azimuthDeg.length;
    const w = g.weight ? g.weight[i] : 1;
    layerEvaluations[0] += frequencyKernels(g, i, N, ws) * N;
    const out = kernelOut();
    const table = this.tables[gi];
    let at = 0;
    for (let j = na - 1; j >= 0; j--) {
      for (let z = g.angleDeg[j] === 0 ? 0 : nz - 1; z >= 0; z--) {
        const re = out[2 * at];
        const im = out[2 * at + 1];
        at++;
        this.scanAmp[this.done] = Math.sqrt(re * re + im * im) * w;
        this.scanGroup[this.done] = gi;
        this.done++;
        table[(i * na + j) * nz + z] = Math.hypot(re, im) * w;
      }
      if (g.angleDeg[j] === 0) for (let z = 1; z < nz; z++) table[(i * na + j) * nz + z] = table[(i * na + j) * nz];
    }
    if (++this.nextFrequency === g.ppw.length) {
      this.nextFrequency = 0;
      this.nextGroup++;
    }
  }

  /** worstReflection(d, dense, ws, bound): the worst weighted |r| and its group, stopping once over `bound`. */
  scan(bound: number, ws: ReflectionWorkspace): { amplitude: number; group: number } {
    const filled: { group: CheckGroup | null } = { group: null };
    let worst = -1;
    let group = 0;
    for (let p = 0; ; p++) {
      if (p === this.done) {
        if (this.done === this.scanAmp.length) break;
        this.extend(ws, filled);
      }
      const a = this.scanAmp[p];
      if (a > worst) {
        worst = a;
        group = this.scanGroup[p];
        if (worst > bound) break;
      }
    }
    return { amplitude: worst, group };
  }

  /** The worst between the dense samples, per group and overall, for `target` (see the class). */
  refined(target: number, ws: ReflectionWorkspace): Refined {
    const filled: { group: CheckGroup | null } = { group: null };
    while (this.done < this.scanAmp.length) this.extend(ws, filled);
    const perGroup: Peak[] = [];
    let overall: Peak = { amplitude: -1, ppw: 0, angleDeg: 0, azimuthDeg: 0 };
    this.dense.groups.forEach((g, gi) => {
      const peaks = this.peaksOf(gi);
      let best = this.firstBest[gi];
      const amp = this.tables[gi];
      let coefficients = false;
      for (let n = 0; n < Math.min(REFINE_PEAKS, peaks.length); n++) {
        const k = peaks[n];
        // A peak far below the target does not reach it within one dense spacing; only the worst one is always refined (for the reported worst).
        if (k !== peaks[0] && amp[k] < REFINE_FLOOR * target) break;
        let c = this.climbs[gi][n];
        if (!c) {
          if (!coefficients) {
            fillCoefficients(groupDesign(this.d, g, scratchDesign), g.courantMedium, ws.coef);
            forgetFactors(); // ws.factors no longer belongs to these coefficients
            coefficients = true;
          }
          c = this.climb(gi, k, ws);
          this.climbs[gi][n] = c;
        }
        if (c.amplitude > best.amplitude) best = c;
      }
      perGroup.push(best);
      if (best.amplitude > overall.amplitude) overall = best;
    });
    return { overall, perGroup };
  }

  /** Group gi's local maxima of the dense grid, highest first (and, once, the best of them). */
  private peaksOf(gi: number): number[] {
    const known = this.peaks[gi];
    if (known) return known;
    const g = this.dense.groups[gi];
    const amp = this.tables[gi];
    const nf = g.ppw.length;
    const na = g.angleDeg.length;
    const nz = g.azimuthDeg.length;
    const peaks: number[] = [];
    for (let i = 0; i < nf; i++) {
      for (let j = 0; j < na; j++) {
        for (let z = 0; z < nz; z++) {
          if (z > 0 && g.angleDeg[j] === 0) continue;
          const v = amp[(i * na + j) * nz + z];
          let top = true;
          for (let di = -1; di <= 1 && top; di++) {
            for (let dj = -1; dj <= 1 && top; dj++) {
              for (let dz = -1; dz <= 1; dz++) {
                const ii = i + di;
                const jj = j + dj;
                const zz = z + dz;
                if ((di || dj || dz) && ii >= 0 && ii < nf && jj >= 0 && jj < na && zz >= 0 && zz < nz && amp[(ii * na + jj) * nz + zz] > v) {
                  top = false;
                  break;
                }
              }
            }
          }
          if (top) peaks.push((i * na + j) * nz + z);
        }
      }
    }
    peaks.sort((x, y) => amp[y] - amp[x]);
    let best: Peak = { amplitude: -1, ppw: 0, angleDeg: 0, azimuthDeg: 0 };
    for (const k of peaks) {
      if (amp[k] > best.amplitude) {
        const p = this.at(g, k);
        best = { amplitude: amp[k], ppw: g.ppw[p.i], angleDeg: g.angleDeg[p.j], azimuthDeg: g.azimuthDeg[p.z] };
      }
    }
    this.peaks[gi] = peaks;
    this.firstBest[gi] = best;
    return peaks;
  }

  private at(g: CheckGroup, k: number): { i: number; j: number; z: number } {
    const na = g.angleDeg.length;
    const nz = g.azimuthDeg.length;
    return { i: Math.floor(k / (na * nz)), j: Math.floor(k / nz) % na, z: k % nz };
  }

  /** The climb from dense sample k of group gi (`ws.coef` holds the group's coefficients). */
  private climb(gi: number, k: number, ws: ReflectionWorkspace): Peak {
    const g = this.dense.groups[gi];
    const { rs } = this;
    const N = this.d.layers;
    const g2 = (Math.sqrt(5) - 1) / 2;
    // Golden-section maximisation of f on [a, b].
    const climb = (f: (x: number) => number, a: number, b: number): [number, number] => {
      let c = b - g2 * (b - a);
      let e = a + g2 * (b - a);
      let fc = f(c);
      let fe = f(e);
      for (let it = 0; it < REFINE_ITERATIONS; it++) {
        if (fc > fe) {
          b = e;
          e = c;
          fe = fc;
          c = b - g2 * (b - a);
          fc = f(c);
        } else {
          a = c;
          c = e;
          fc = fe;
          e = a + g2 * (b - a);
          fe = f(e);
        }
      }
      return fc > fe ? [c, fc] : [e, fe];
    };
    const nf = g.ppw.length;
    const na = g.angleDeg.length;
    const nz = g.azimuthDeg.length;
    const { i, j, z } = this.at(g, k);
    // Frequency as ν = 1/ppw (the grid is uniform in it), angles in degrees.
    const nuLo = 1 / g.ppw[Math.min(nf - 1, i + 1)];
    const nuHi = 1 / g.ppw[Math.max(0, i - 1)];
    const thLo = g.angleDeg[Math.max(0, j - 1)];
    const thHi = g.angleDeg[Math.min(na - 1, j + 1)];
    const phLo = g.azimuthDeg[Math.max(0, z - 1)];
    const phHi = g.azimuthDeg[Math.min(nz - 1, z + 1)];
    let nu = 1 / g.ppw[i];
    let th = g.angleDeg[j];
    let ph = g.azimuthDeg[z];
    let v = this.tables[gi][k];
    for (let round = 0; round < REFINE_ROUNDS; round++) {
      if (nf > 1) {
        const [x, fx] = climb((x) => amplitudeAt(N, g, rs, ws, 1 / x, th, ph), nuLo, nuHi);
        if (fx > v) [nu, v] = [x, fx];
      }
      if (na > 1) {
        const [y, fy] = climb((y) => amplitudeAt(N, g, rs, ws, 1 / nu, y, ph), thLo, thHi);
        if (fy > v) [th, v] = [y, fy];
      }
      if (nz > 1 && th > 0) {
        const [y, fy] = climb((y) => amplitudeAt(N, g, rs, ws, 1 / nu, th, y), phLo, phHi);
        if (fy > v) [ph, v] = [y, fy];
      }
    }
    return { amplitude: v, ppw: 1 / nu, angleDeg: th, azimuthDeg: ph };
  }
}


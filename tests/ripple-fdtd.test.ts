/**
 * Ripple round trip (issue: accuracy budget): a 1-D time-domain run of a thin
 * dielectric slab with a deliberately thin absorber behind it. The monitor
 * beyond the slab records the transmitted wave plus the absorber's echo; the
 * spectrum ratio to a reference run (same grid, absorber replaced by a long
 * lossless line) shows the spurious ripple. Its measured peak-to-peak and
 * period must match the diagnostics of physics.md §1 (4·|r|, c/(2·n_g·L)) within 20 %.
 * The time-domain loop here is written independently of src/physics/fdtd.
 */
import { describe, expect, it } from 'vitest';
import { cpmlCoefficients, reflection, resolveDesign, rippleFromReflection, SPEED_OF_LIGHT } from '../src/physics';
import { dtftAt } from '../src/physics/internal';

const S = 0.5; // Courant number (1-D, vacuum background)
const CELL = 1e-6; // m, only to express frequencies in Hz for the diagnostics
const THIN = { layers: 3, order: 2 }; // deliberately thin absorber
const LEFT = resolveDesign({ layers: 40, order: 3 }); // quiet left end, identical in both runs

interface RunSpec {
  interior: number; // lossless cells between the left and right interfaces
  rightAbsorber: boolean;
  slabStart: number;
  slabEnd: number;
  slabIndex: number;
  source: number;
  monitor: number;
  steps: number;
}

/** Plain 1-D Yee loop (Ez, Hy) with CPML on the left and optionally the right (Roden & Gedney 2000). */
function run(spec: RunSpec): Float64Array {
  const L = LEFT.layers;
  const left = cpmlCoefficients(LEFT, S);
  const right = cpmlCoefficients(resolveDesign(THIN), S);
  const R = spec.rightAbsorber ? THIN.layers : 0;
  const G = L + spec.interior + R; // E nodes 0..G, conductors at 0 and G
  const e = new Float64Array(G + 1);
  const h = new Float64Array(G);
  const psiE = new Float64Array(G + 1);
  const psiH = new Float64Array(G);
  const epsInv = new Float64Array(G + 1).fill(1);
  const gL = L;
  for (let g = gL + spec.slabStart; g < gL + spec.slabEnd; g++) epsInv[g] = 1 / (spec.slabIndex * spec.slabIndex);
  // Per-node coefficients: depth into the left absorber is gL − g (E) and gL − g − ½ (H).
  const eb = new Float64Array(G + 1), ea = new Float64Array(G + 1), ek = new Float64Array(G + 1).fill(1);
  const hb = new Float64Array(G), ha = new Float64Array(G), hk = new Float64Array(G).fill(1);
  for (let i = 0; i <= L; i++) {
    const g = gL - i;
    eb[g] = left.eB[i]; ea[g] = left.eA[i]; ek[g] = left.eInvKappa[i];
  }
  for (let i = 0; i < L; i++) {
    const g = gL - i - 1; // H node g + ½ at depth i + ½
    hb[g] = left.hB[i]; ha[g] = left.hA[i]; hk[g] = left.hInvKappa[i];
  }
  const gR = gL + spec.interior;
  for (let i = 0; i <= R; i++) {
    const g = gR + i;
    eb[g] = right.eB[i]; ea[g] = right.eA[i]; ek[g] = right.eInvKappa[i];
  }
  for (let i = 0; i < R; i++) {
    const g = gR + i;
    hb[g] = right.hB[i]; ha[g] = right.hA[i]; hk[g] = right.hInvKappa[i];
  }
  const rec = new Float64Array(spec.steps);
  const w0 = 2 * Math.PI * S * 0.05; // centre at 20 cells per wavelength
  const width = 45; // steps; spectrum above 1e-3 of peak from ≈ 10 to ≈ 60 cells per wavelength
  const t0 = 8 * width;
  for (let n = 0; n < spec.steps; n++) {
    for (let g = 0; g < G; g++) {
      const d = e[g + 1] - e[g];
      psiH[g] = hb[g] * psiH[g] + ha[g] * d;
      h[g] += S * (hk[g] * d + psiH[g]);
    }
    for (let g = 1; g < G; g++) {
      const d = h[g] - h[g - 1];
      psiE[g] = eb[g] * psiE[g] + ea[g] * d;
      e[g] += S * epsInv[g] * (ek[g] * d + psiE[g]);
    }
    const t = n - t0;
    e[gL + spec.source] += Math.sin(w0 * t) * Math.exp(-((t / width) ** 2));
    rec[n] = e[gL + spec.monitor];
  }
  return rec;
}

describe('spectral ripple from a thin absorber, time-domain round trip', () => {
  const D = 120; // monitor to absorber interface, cells
  const steps = 1400 + Math.ceil((4 * D) / S);
  const base = { slabStart: 60, slabEnd: 66, slabIndex: 1.5, source: 20, monitor: 100, steps };
  const interior = base.monitor + D;
  const withAbsorber = run({ ...base, interior, rightAbsorber: true });
  // Reference: the right end so far away that nothing returns within the record.
  const reference = run({ ...base, interior: interior + Math.ceil(steps * S) + 50, rightAbsorber: false });

  // Intensity ratio over the band, uniform in frequency ν = 1/ppw (cycles per cell).
  const nuLo = 1 / 40;
  const nuHi = 1 / 12;
  const count = 1200;
  const nu = new Float64Array(count);
  const ratio = new Float64Array(count);
  const a = new Float64Array(2);
  const b = new Float64Array(2);
  for (let k = 0; k < count; k++) {
    nu[k] = nuLo + ((nuHi - nuLo) * k) / (count - 1);
    const om = 2 * Math.PI * S * nu[k];
    dtftAt(withAbsorber, steps, om, a);
    dtftAt(reference, steps, om, b);
    ratio[k] = (a[0] * a[0] + a[1] * a[1]) / (b[0] * b[0] + b[1] * b[1]);
  }

  it('measured peak-to-peak ripple ≈ 4|r| (physics.md §1, derived) within 20 %', () => {
    // Around 20 cells per wavelength: take the swing over ±1 ripple period.
    const centre = 1 / 20;
    const period = 1 / (2 * D);
    let max = -Infinity;
    let min = Infinity;
    for (let k = 0; k < count; k++) {
      if (Math.abs(nu[k] - centre) <= period) {
        max = Math.max(max, ratio[k]);
        min = Math.min(min, ratio[k]);
      }
    }
    const measured = max - min;
    const r = reflection(THIN, { ppw: 20, courant: S, dimensions: 1 }).amplitude;
    const predicted = rippleFromReflection(r, D * CELL).peakToPeak;
    expect(measured / predicted).toBeGreaterThan(0.8);
    expect(measured / predicted).toBeLessThan(1.2);
  });

  it('measured ripple period ≈ c/(2·n_g·L) (Fabry–Perot; Saleh & Teich, Fundamentals of Photonics, Fabry–Perot resonator) within 20 %', () => {
    // Local maxima of the ratio between 15 and 30 cells per wavelength.
    const peaks: number[] = [];
    for (let k = 1; k < count - 1; k++) {
      if (nu[k] > 1 / 30 && nu[k] < 1 / 15 && ratio[k] > ratio[k - 1] && ratio[k] >= ratio[k + 1]) peaks.push(nu[k]);
    }
    expect(peaks.length).toBeGreaterThan(3);
    const spacingNu = (peaks[peaks.length - 1] - peaks[0]) / (peaks.length - 1);
    const measuredHz = (spacingNu * SPEED_OF_LIGHT) / CELL; // f = c/(ppw·Δ)
    const predictedHz = rippleFromReflection(0.01, D * CELL).periodHz;
    expect(measuredHz / predictedHz).toBeGreaterThan(0.8);
    expect(measuredHz / predictedHz).toBeLessThan(1.2);
  });

  it('the inverse diagnostic recovers |r| and the distance from the measured ripple within 20 %', async () => {
    const { reflectionFromRipple } = await import('../src/physics');
    const centre = 1 / 20;
    const period = 1 / (2 * D);
    let max = -Infinity;
    let min = Infinity;
    for (let k = 0; k < count; k++) if (Math.abs(nu[k] - centre) <= period) { max = Math.max(max, ratio[k]); min = Math.min(min, ratio[k]); }
    // The period is the measured spacing of the ripple's maxima, not the predicted one.
    const peaks: number[] = [];
    for (let k = 1; k < count - 1; k++) {
      if (nu[k] > 1 / 30 && nu[k] < 1 / 15 && ratio[k] > ratio[k - 1] && ratio[k] >= ratio[k + 1]) peaks.push(nu[k]);
    }
    const measuredPeriodHz = (((peaks[peaks.length - 1] - peaks[0]) / (peaks.length - 1)) * SPEED_OF_LIGHT) / CELL;
    const inv = reflectionFromRipple(max - min, measuredPeriodHz);
    const r = reflection(THIN, { ppw: 20, courant: S, dimensions: 1 }).amplitude;
    expect(inv.amplitude / r).toBeGreaterThan(0.8);
    expect(inv.amplitude / r).toBeLessThan(1.2);
    expect(inv.distanceMetres / (D * CELL)).toBeGreaterThan(0.8);
    expect(inv.distanceMetres / (D * CELL)).toBeLessThan(1.2);
    console.log(`ripple inverse: |r| ${(inv.amplitude / r).toFixed(3)}× the exact value, distance ${(inv.distanceMetres / (D * CELL)).toFixed(3)}× the true one`);
  });
});

/**
 * The fast reflection evaluation (issue 13: whole grading orders by repeated
 * squaring, 1/F once per node and frequency, the sample's constants once per
 * sample, several directions in one pass) against the straightforward one it
 * replaced, kept verbatim in tests/support/reflection-reference.ts (Math.pow,
 * F divided in the recurrence, asin/cos/sin of the split). Independent
 * computation: the same formulas (physics.md §3, §6; Roden & Gedney 2000)
 * evaluated the old way, over seeded random designs and waves: every sampling
 * convention, polynomial (whole and fractional m) and geometric grading,
 * κ_max > 1, CFS α (whole and fractional m_a), oblique and azimuthal
 * incidence, and evanescent near fields.
 *
 * The tolerance: |Δr| ≤ 1e-12·|r| + 1e-13. A reflection is the small
 * difference of two near-equal waves at the interface, so a last-place change
 * in any node's σ moves r by about 1e-14 absolute (the reference with only
 * Math.pow replaced by repeated squaring moves as much: measured over 20,000
 * such cases, up to 1e-8 relative at |r| ≈ 1e-6), below any planning target;
 * where |r| ≥ 1e-2 the two agree to ≤ 1e-12 relative (checked below).
 */
import { describe, expect, it } from 'vitest';
import { resolveDesign, SAMPLING_CONVENTIONS, type ResolvedDesign } from '../src/physics/grading';
import { createWorkspace, fillFactors, fillSample, reflectionKernel, sampledKernel, sampledKernels, SAMPLE_STRIDE } from '../src/physics/reflection';
import { fillCoefficients } from '../src/physics/cpml';
import { evanescentFactorUnchecked, transverseFactorUnchecked } from '../src/physics/dispersion';
import { referenceReflection } from './support/reflection-reference';

function rng(seed: number): () => number {
  return () => {
    seed = (seed * 1664525 + 1013904223) >>> 0;
    return seed / 2 ** 32;
  };
}

interface Case {
  d: ResolvedDesign;
  sm: number;
  omegaDt: number;
  factor: number;
  evanescent: boolean;
}

function randomCase(r: () => number, i: number): Case {
  const sampling = SAMPLING_CONVENTIONS[i % 4];
  const d = resolveDesign({
    layers: 1 + Math.floor(r() * (r() < 0.8 ? 40 : 200)),
    order: r() < 0.8 ? Math.floor(r() * 11) : r() * 10,
    strength: 0.05 + r() * 3,
    kappaMax: r() < 0.5 ? 1 : 1 + r() * 20,
    alphaMaxNorm: r() < 0.5 ? 0 : r() * 2,
    alphaOrder: r() < 0.7 ? Math.floor(r() * 4) : r() * 3,
    grading: r() < 0.15 ? 'geometric' : 'polynomial',
    geometricRatio: 1.05 + r() * 3,
    sampling,
  });
  const sm = (0.3 + 0.69 * r()) / Math.sqrt(3);
  const ppw = 5 + r() * 100;
  const omegaDt = (2 * Math.PI * sm) / ppw;
  const evanescent = i % 4 === 3 || r() < 0.2;
  const factor = evanescent
    ? Math.min(evanescentFactorUnchecked(omegaDt, sm, 0.6 + r() * 20), 2)
    : transverseFactorUnchecked(ppw, sm, r() * 85, r() < 0.5 ? 0 : r() * 90);
  return { d, sm, omegaDt, factor, evanescent };
}

const CASES = 4000;

describe('fast reflection kernel vs the reference evaluation', () => {
  it(`agrees over ${CASES} random cases to 1e-12·|r| + 1e-13, and to 1e-12 relative where |r| ≥ 1e-2`, () => {
    const r = rng(20261202);
    const ws = createWorkspace();
    const seen = { evanescent: 0, kappa: 0, alpha: 0, large: 0, sampling: new Set<string>() };
    let worstLarge = 0;
    for (let i = 0; i < CASES; i++) {
      const c = randomCase(r, i);
      const ref = referenceReflection(c.d, c.sm, c.omegaDt, c.factor);
      fillCoefficients(c.d, c.sm, ws.coef);
      fillFactors(ws.coef, c.omegaDt, ws.factors);
      reflectionKernel(ws.factors, c.d.layers, c.sm, c.omegaDt, c.factor, ws.out);
      const a = Math.hypot(ref[0], ref[1]);
      const diff = Math.hypot(ws.out[0] - ref[0], ws.out[1] - ref[1]);
      if (!(diff <= 1e-12 * a + 1e-13)) throw new Error(`case ${i}: ${JSON.stringify(c)}: r = ${ws.out[0]} + ${ws.out[1]}j, reference ${ref[0]} + ${ref[1]}j`);
      if (a >= 1e-2) {
        worstLarge = Math.max(worstLarge, diff / a);
        seen.large++;
      }
      if (c.evanescent) seen.evanescent++;
      if (c.d.kappaMax > 1) seen.kappa++;
      if (c.d.alphaMaxNorm > 0) seen.alpha++;
      seen.sampling.add(c.d.sampling);
    }
    expect(worstLarge).toBeLessThanOrEqual(1e-12);
    expect(seen.sampling.size).toBe(4);
    for (const n of [seen.evanescent, seen.kappa, seen.alpha, seen.large]) expect(n).toBeGreaterThan(CASES / 10);
  });

  it('gives bit-identical values one sample at a time and several samples in one pass', () => {
    const r = rng(7);
    const ws = createWorkspace();
    for (let t = 0; t < 200; t++) {
      const c = randomCase(r, t);
      fillCoefficients(c.d, c.sm, ws.coef);
      fillFactors(ws.coef, c.omegaDt, ws.factors);
      const count = 1 + (t % 13); // more than one pass of 8 for some
      const samples = new Float64Array(count * SAMPLE_STRIDE);
      const factors: number[] = [];
      for (let k = 0; k < count; k++) {
        const f = k === 0 ? c.factor : r() < 0.3 ? Math.min(evanescentFactorUnchecked(c.omegaDt, c.sm, 0.6 + 20 * r()), 2) : c.factor * r();
        factors.push(f);
        fillSample(c.sm, c.omegaDt, f, samples, k * SAMPLE_STRIDE);
      }
      const many = sampledKernels(ws.factors, c.d.layers, samples, 0, count, new Float64Array(2 * count));
      for (let k = 0; k < count; k++) {
        const one = sampledKernel(ws.factors, c.d.layers, samples, k * SAMPLE_STRIDE, new Float64Array(2), 0);
        const direct = reflectionKernel(ws.factors, c.d.layers, c.sm, c.omegaDt, factors[k], new Float64Array(2));
        expect(Object.is(many[2 * k], one[0]) && Object.is(many[2 * k + 1], one[1])).toBe(true);
        expect(Object.is(direct[0], one[0]) && Object.is(direct[1], one[1])).toBe(true);
      }
    }
  });
});

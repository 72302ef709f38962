/**
 * The design search shares its work between specs that differ only in their
 * target (src/physics/design.ts: strength runs, dense checks, sample sets,
 * rankings and integrals kept per physics). The property checked: a search
 * that reuses what searches for other targets left behind gives the same
 * designs, to the last bit (toEqual compares numbers with Object.is), as the
 * same search made cold, and does less work (counted in layer-evaluations,
 * designWork, not in time). Source of the expected values: the same search
 * run cold, an independent computation of the same function.
 */
import { describe, expect, it } from 'vitest';
import { clearDesignCache, designOptions, designWork, type DesignResult, type DesignSpec } from '../src/physics/design';

const TARGETS = [1e-2, 4e-3, 1.5e-3];

function cold(spec: DesignSpec): { results: DesignResult[]; work: number } {
  clearDesignCache();
  const w0 = designWork();
  const results = designOptions(spec);
  return { results, work: designWork() - w0 };
}

describe.each([
  ['2-D, oblique, one medium', { ppwMin: 15, ppwMax: 30, angleMaxDeg: 40, dimensions: 2 }],
  ['3-D near field (κ_max and α chosen)', { ppwMin: 20, ppwMax: 40, angleMaxDeg: 30, decayMinCells: 4, gapCells: 3 }],
  ['two media, every sampling convention', { ppwMin: 20, angleMaxDeg: 20, dimensions: 2, index: 1.44, absorberIndices: [1.44, 3.48], sampling: 'all' as const }],
])('shared search work: %s', (_name, physics) => {
  it('gives the designs of cold searches, with less work', () => {
    const expected = TARGETS.map((target) => cold({ ...physics, target }));
    clearDesignCache();
    const w0 = designWork();
    const warm = TARGETS.map((target) => designOptions({ ...physics, target }));
    const warmWork = designWork() - w0;
    warm.forEach((r, k) => expect(r, `target ${TARGETS[k]}`).toEqual(expected[k].results));
    expect(warmWork).toBeLessThan(expected.reduce((s, e) => s + e.work, 0));
    // And in the other order (the loosest target last), still the same designs.
    clearDesignCache();
    const reversed = [...TARGETS].reverse().map((target) => designOptions({ ...physics, target }));
    reversed.reverse().forEach((r, k) => expect(r, `target ${TARGETS[k]}, reversed order`).toEqual(expected[k].results));
  });
});

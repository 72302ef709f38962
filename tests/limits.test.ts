/** Documented limits are enforced with clear errors, not hangs (README "Limits"). */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'fs';
import { join } from 'path';
import { tmpdir } from 'os';
import { MAX_LAYERS, MAX_PPW, reflection, designAbsorber } from '../src/physics';
import { MAX_TABLE_ROWS, readTable } from '../src/plan/table-file';

describe('limits', () => {
  it(`at most ${MAX_LAYERS} layers`, () => {
    expect(() => reflection({ layers: MAX_LAYERS + 1, order: 3 }, { ppw: 20 })).toThrow(/layers must be a whole number from 1 to 200/);
    expect(() => designAbsorber({ target: 1e-3, ppwMin: 20, maxLayers: 201 })).toThrow(/layer cap must be a whole number from 1 to 200/);
  });
  it(`cells per wavelength above the grid's resolvable limit and at most ${MAX_PPW}`, () => {
    expect(() => reflection({ layers: 8, order: 3 }, { ppw: 2 })).toThrow(/must be more than 2\.95/);
    expect(() => reflection({ layers: 8, order: 3 }, { ppw: 2e6 })).toThrow(/must be at most 1000000/);
  });
  it(`project tables of at most ${MAX_TABLE_ROWS} studies`, async () => {
    const dir = mkdtempSync(join(tmpdir(), 'hush-limits-'));
    const file = join(dir, 'big.csv');
    writeFileSync(file, 'study\n' + 'x\n'.repeat(MAX_TABLE_ROWS + 1));
    await expect(readTable(file)).rejects.toThrow(/at most 100000 studies/);
  });
});

/**
 * The plan's accuracy split on the demo project (an invented scenario): the
 * three errors combine as `phase` says to at most intensity_error, the
 * searched plan is never dearer than the plan that gives the absorber all
 * that the dispersion and the run leave at the user's own cell and duration,
 * and the dispersion-limited row refines its cell. The error models
 * themselves are checked against published values and time-domain runs in
 * tests/velocity.test.ts, tests/dispersion-error.test.ts and
 * tests/run-error.test.ts; the optimiser on its own in tests/accuracy-split.test.ts.
 */
import { readFileSync } from 'fs';
import path from 'path';
import { describe, expect, it } from 'vitest';
import { parseCsv, planRow, rowFromTable, type Plan } from '../src/plan';

const rows = parseCsv(readFileSync(path.join(__dirname, '../assets/demo-project.csv'), 'utf8'));
const [header, ...data] = rows;
const plans: Plan[] = data.map((r) => planRow(rowFromTable(header, r)));

describe('accuracy split on the demo project', () => {
  it('error_absorber, error_dispersion and error_run combine (added, or in quadrature) to at most intensity_error', () => {
    for (const p of plans) {
      const e = p.accuracy.errors;
      const combined = p.inputs.phase === 'worst' ? e.absorber + e.dispersion + e.run : Math.hypot(e.absorber, e.dispersion, e.run);
      expect(combined).toBeCloseTo(e.combined, 12);
      if (!p.accuracy.shareOverride) expect(e.combined, p.inputs.study).toBeLessThanOrEqual(p.inputs.intensityError);
    }
  });

  it('the searched plan never costs more than the absorber-takes-all plan, and saves on the demo', () => {
    const savings: string[] = [];
    for (const p of plans) {
      const a = p.accuracy;
      if (a.baselineCost !== null) expect(a.cost, p.inputs.study).toBeLessThanOrEqual(a.baselineCost);
      if (a.saving !== null && a.saving > 0 && a.baselineCost) savings.push(`${p.inputs.study}: ${((100 * a.saving) / a.baselineCost).toFixed(1)} % cheaper in ${a.measure}`);
    }
    console.log(`split savings on the demo: ${savings.join('; ')}`);
    expect(savings.length).toBeGreaterThan(0);
  });

  it('a row whose path makes dispersion the limit gets a finer cell, and dispersion takes most of the tolerance', () => {
    const p = plans.find((x) => x.inputs.path !== null) as Plan;
    expect(p.accuracy.cell).toBeLessThan(p.inputs.cell);
    expect(p.accuracy.errors.dispersion).toBeGreaterThan(p.accuracy.errors.absorber + p.accuracy.errors.run);
    expect(p.warnings.some((w) => /^cell refined to/.test(w))).toBe(true);
  });

  it('a searched ring-down chooses its own residual, shorter than the 1e-3 default when the budget allows', () => {
    const p = plans.find((x) => x.inputs.q !== null && !x.inputs.ringTargetGiven) as Plan;
    expect(p.accuracy.errors.run).toBeGreaterThan(0);
    expect(p.accuracy.shares.run).toBeGreaterThan(0);
  });
});

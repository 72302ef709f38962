/**
 * The task pane's accuracy breakdown (taskpane/budget-view.ts), built from the
 * plan API on the demo project: the bar's parts are the plan's error split
 * (derived: each part over the tolerance when errors add), the cost chart's
 * points are the split's candidate cells with the planned one marked.
 */
import { describe, expect, it } from 'vitest';
import * as fs from 'fs';
import * as path from 'path';
import { parseCsv } from '../src/plan/csv';
import { planRow, rowFromTable } from '../src/plan';
import { budgetBarSvg, budgetSegments, cellCostSvg, cellPoints, costLabel } from '../taskpane/budget-view';

const table = parseCsv(fs.readFileSync(path.join(__dirname, '..', 'assets', 'demo-project.csv'), 'utf8'));
const plans = table.slice(1).map((r) => planRow(rowFromTable(table[0], r)));
const byName = (s: string) => plans[table.slice(1).findIndex((r) => r[0].startsWith(s))];

describe('accuracy breakdown', () => {
  it('the bar parts are the error split over the tolerance and sum to 1 on every demo row', () => {
    for (const p of plans) {
      const s = budgetSegments(p);
      expect(s.map((x) => x.key)).toEqual(['absorber', 'dispersion', 'run', 'unused']);
      expect(s.reduce((t, x) => t + x.fraction, 0)).toBeCloseTo(1, 12);
      for (const x of s) expect(x.fraction).toBeGreaterThanOrEqual(0);
    }
    const cavity = byName('Breakwater');
    const s = budgetSegments(cavity);
    // Errors add (phase worst): each part is its error over the tolerance.
    expect(s[2].fraction).toBeCloseTo(cavity.accuracy.errors.run / cavity.inputs.intensityError, 9);
    expect(s[0].error).toBe(cavity.accuracy.errors.absorber);
    // What is left, added to the three, is the tolerance (errors add).
    expect(s.reduce((t, x) => t + x.error, 0)).toBeCloseTo(cavity.inputs.intensityError, 12);
    const svg = budgetBarSvg(s, cavity.inputs.intensityError);
    expect(svg).toMatch(/^<svg class="budget-bar"/);
    expect(svg.match(/class="seg seg-run"/g)?.length).toBe(2); // the bar's segment and its legend swatch
    expect(svg).not.toMatch(/NaN|undefined/);
  });
  it('the cost chart marks the planned cell among the candidates (the interferometer arm refines its cell)', () => {
    const arm = byName('Quayside');
    const pts = cellPoints(arm);
    expect(pts.filter((p) => p.kind === 'planned')).toHaveLength(1);
    expect(pts.find((p) => p.kind === 'planned')!.cellNm).toBeCloseTo(arm.accuracy.cell * 1e9, 9);
    expect(arm.accuracy.cell).toBeLessThan(arm.inputs.cell);
    // Coarser cells cannot meet the tolerance (the dispersion alone exceeds it); finer ones cost at least their bound, more than the plan.
    for (const p of pts) {
      if (p.cellNm > arm.accuracy.cell * 1e9 * (1 + 1e-9)) expect(p.kind).toBe('infeasible');
      if (p.kind === 'at least') expect(p.cost!).toBeGreaterThanOrEqual(arm.accuracy.cost);
    }
    expect(pts.some((p) => p.kind === 'at least')).toBe(true);
    const svg = cellCostSvg(pts, costLabel(arm));
    expect(svg).toContain('class="planned"');
    expect(svg).toContain('class="bound"');
    expect(svg).toContain('class="infeasible"');
    expect(svg).toContain('cost (estimate)');
    expect(svg).not.toMatch(/NaN|undefined|Infinity/);
    for (const p of plans) expect(cellCostSvg(cellPoints(p), costLabel(p))).not.toMatch(/NaN|undefined|Infinity/);
  });
});

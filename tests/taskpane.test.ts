/**
 * The task pane's pure parts in Node: embedded demo, page security policy,
 * options from the plan API, curves, chart helpers, formatting, the choice of
 * verification runs. The browser behaviour is in tests/browser-taskpane.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createHash } from 'crypto';
import * as fs from 'fs';
import * as path from 'path';
import { designOptions, reflection, ETA0 } from '../src/physics';
import { parseCsv } from '../src/plan/csv';
import { OUTPUT_NAMES, planRow, planToRow, rowFromTable } from '../src/plan';
import { DEMO_PROJECT_CSV } from '../taskpane/demo-table';
import { CFS_RELEVANT_PPW, TABLE_SCHEMA, alphaChoices, designAlphaMax, optionPlans, outputValues, studyPlan, suggestedAlphaMax } from '../taskpane/plan-adapter';
import { decadeLabel, layoutChart, linearTicks, logRange, niceTicks, type ChartSpec } from '../taskpane/charts';
import { angleAxisEnd, ppwAxis, reflectionVsAngle, reflectionVsPpw } from '../taskpane/curves';
import { applyHeadline, decibels, hours, money, percent, sig, themeLabel } from '../taskpane/format';
import { VALIDATED_ROWS, insertStarterTable, starterSheet, type ExcelRunner } from '../taskpane/insert-table';
import { EXCEL_API_NEEDS, checkExcelApi } from '../taskpane/requirements';
import { starterTable } from '../src/plan/starter';
import { OUTPUT_COLUMNS } from '../src/plan';
import { luminance } from '../taskpane/theme';
import { largestRelativeDifference } from '../taskpane/verify-protocol';
import { PANE_BUDGET_1D, PANE_BUDGET_2D, chooseRuns, measuredPpw, widenedBand } from '../taskpane/verify-plan';
import { MemoryWorkbook } from '../src/workbook/memory';

const ROOT = path.resolve(__dirname, '..');
const csv = fs.readFileSync(path.join(ROOT, 'assets', 'demo-project.csv'), 'utf8');
const table = parseCsv(csv);
const values = (k: number) => Object.fromEntries(table[0].map((h, c) => [h, table[k + 1][c] ?? '']));

describe('embedded demo project', () => {
  it('is a verbatim copy of assets/demo-project.csv (regenerate: node taskpane/embed-demo.js)', () => {
    expect(DEMO_PROJECT_CSV).toBe(csv);
  });

  it('is a project table for the in-page workbook', () => {
    const wb = new MemoryWorkbook(table[0], table.slice(1), TABLE_SCHEMA);
    expect(wb.rows.length).toBe(table.length - 1);
  });
});

describe('page security policy', () => {
  it("allows exactly the page's inline Office.js loader by its hash", () => {
    const html = fs.readFileSync(path.join(ROOT, 'taskpane', 'taskpane.html'), 'utf8');
    const scripts = [...html.matchAll(/<script>([\s\S]*?)<\/script>/g)].map((m) => m[1]);
    expect(scripts.length).toBe(1);
    // CSP Level 2: 'sha256-<base64 of the SHA-256 of the script text>'.
    const hash = createHash('sha256').update(scripts[0]).digest('base64');
    expect(html).toContain(`'sha256-${hash}'`);
    expect(scripts[0]).toContain('preview');
  });
});

describe('options from the plan API', () => {
  it("recommends the study's own plan, and each option is the plan of its order and α", () => {
    for (const k of [0, 4]) {
      const study = studyPlan(values(k));
      const reference = planRow(rowFromTable(table[0], table[k + 1]));
      expect(study).toEqual(reference);
      const opts = optionPlans(study);
      const rec = opts.filter((o) => o.recommended);
      expect(rec.length).toBe(1);
      expect(rec[0].plan).toBe(study);
      // Independent computation: the core's designOptions over the same spec, one α at a time.
      for (const alphaMax of alphaChoices(study)) {
        const i = study.inputs;
        const spec = {
          target: study.requiredReflection,
          ppwMin: study.grid.ppwShort,
          ppwMax: study.grid.ppwLong,
          angleMaxDeg: i.angleMaxDeg,
          courant: i.courant,
          dimensions: i.dimensions,
          index: i.index,
          orders: i.orders,
          kappaMax: i.kappaMaxGiven ? i.kappaMax : undefined,
          alphaMaxNorm: alphaMax * ETA0 * i.cell * i.index,
          sampling: i.sampling,
          absorberIndices: i.absorberIndices,
          minLayers: i.minLayers,
          decayMinCells: i.decayMin === null ? undefined : i.decayMin / i.cell,
          gapCells: i.gapCells,
        };
        const core = designOptions(spec);
        for (const all of core) {
          // One order at a time, as the option asks (κ is chosen per spec, so a one-order spec may choose differently).
          const d = designOptions({ ...spec, orders: [all.order] })[0];
          const o = opts.find((x) => x.alphaMax === alphaMax && x.order === d.order)!;
          // The recommended option is the study's own plan, whose κ/α were searched with every order at once.
          if (o.recommended) continue;
          expect(o.plan!.design.layers).toBe(d.layers);
          expect(o.plan!.design.worstAmplitude).toBeCloseTo(d.worstAmplitude, 15);
        }
      }
    }
  });

  it('offers a CFS α only when the band reaches far enough in cells', () => {
    const tidewater = studyPlan(values(0)); // 52–56 cells per wavelength, α = 0 in the row
    const jetty = studyPlan(values(4)); // 36 cells per wavelength
    expect(tidewater.grid.ppwLong).toBeGreaterThanOrEqual(CFS_RELEVANT_PPW);
    expect(alphaChoices(tidewater)).toEqual([0, suggestedAlphaMax(tidewater)]);
    // The jetty's design chose a CFS shift for its near field: that α is offered, and α = 0 beside it.
    expect(alphaChoices(jetty)).toEqual([designAlphaMax(jetty), 0]);
    expect(designAlphaMax(jetty)).toBeGreaterThan(0);
    // derived: α_norm = α·η₀·Δ·n = π/ppw_long, i.e. α/ω = ½ at the long end.
    expect(suggestedAlphaMax(tidewater) * ETA0 * tidewater.inputs.cell * tidewater.inputs.index).toBeCloseTo(Math.PI / tidewater.grid.ppwLong, 12);
    expect(optionPlans(tidewater).length).toBe(6);
  });

  it('writes every output column, blanks where the plan has no value', () => {
    const plan = studyPlan(values(6)); // 1-D study without price: no cost
    const out = outputValues(plan);
    expect(Object.keys(out)).toEqual([...OUTPUT_NAMES]);
    const row = planToRow(plan);
    OUTPUT_NAMES.forEach((n, k) => expect(out[n]).toBe(row[k] ?? ''));
    expect(out.cost).toBe('');
  });
});

describe('curves', () => {
  const design = { layers: 10, order: 3 };
  const grid = { courant: 0.5, dimensions: 2, index: 1 };
  it('are the core reflection at each point', () => {
    const a = reflectionVsAngle(design, grid, 20, 85);
    expect(a.x.length).toBe(86);
    const r40 = reflection(design, { ppw: 20, courant: 0.5, dimensions: 2, angleDeg: 40 });
    expect(a.discrete[40]).toBe(r40.amplitude);
    expect(a.continuous[40]).toBe(r40.continuous);
    const p = reflectionVsPpw(design, grid, [10, 20], 0);
    expect(p.discrete[1]).toBe(reflection(design, { ppw: 20, courant: 0.5, dimensions: 2 }).amplitude);
  });

  it('span the angles beyond the study and the band', () => {
    expect(angleAxisEnd(40)).toBe(85);
    expect(angleAxisEnd(84)).toBe(89);
    const ax = ppwAxis(20, 80, 5);
    expect(ax[0]).toBe(20);
    expect(ax[4]).toBeCloseTo(80, 12);
    const single = ppwAxis(36, 36, 5);
    expect(single[0]).toBeLessThan(36);
    expect(single[4]).toBeGreaterThan(36);
  });
});

describe('chart helpers', () => {
  it('lay out a log |r| chart with its dB axis on the same scale (dB = 20·log10|r|)', () => {
    const spec: ChartSpec = {
      title: 't',
      xLabel: 'angle of incidence (°)',
      yLabel: '|r| (amplitude ratio)',
      yLog: true,
      yDb: true,
      series: [{ label: 'a', x: [0, 30, 60, 85], y: [1e-5, 2e-5, null, 0.3], colour: '#000' }],
      lines: [
        { axis: 'y', value: 1e-3, kind: 'target', colour: '#f00', label: 'target' },
        { axis: 'x', value: 60, kind: 'angle', colour: '#0f0', label: 'angle' },
      ],
    };
    const L = layoutChart(spec, 296, 220);
    // The y range is whole decades around the data and the target: 1e-5 … 1.
    expect(L.yTicks.map((t) => t.label)).toEqual(['1e-5', '1e-4', '1e-3', '0.01', '0.1', '1']);
    // derived: |r| = 1e-3 is −60 dB, so the −60 dB tick sits exactly at the 0.001 tick.
    const db60 = L.dbTicks.find((t) => t.label === '\u221260');
    const r3 = L.yTicks.find((t) => t.label === '1e-3');
    expect(db60 && r3 && Math.abs(db60.y - r3.y)).toBeLessThan(1e-9);
    // The null point splits the line in two.
    expect(L.series[0].paths.map((p) => p.length)).toEqual([2, 1]);
    // Everything stays inside the chart: tick labels at ~0.6 em a character, titles above the plot.
    expect(L.plot.left).toBeGreaterThanOrEqual(6 + 4 * 11 * 0.6);
    expect(L.plot.right).toBeLessThan(296);
    expect(L.yLabel.y).toBeLessThan(L.plot.top);
    expect(L.lines.map((l) => l.spec.kind)).toEqual(['target', 'angle']);
  });

  it('place linear ticks at 1, 2 or 5 × 10^k and decade labels', () => {
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(20.3, 36.9, 4)).toEqual([25, 30, 35]);
    expect(decadeLabel(-2)).toBe('0.01');
    expect(decadeLabel(-3)).toBe('1e-3');
  });

  it('choose log ranges and tick labels', () => {
    expect(logRange([2e-4, 3e-2])).toEqual([1e-4, 1e-1]);
    const [lo, hi] = logRange([40, 44], true);
    expect(lo).toBeCloseTo(40 / 1.05, 12);
    expect(hi).toBeCloseTo(44 * 1.05, 12);
    expect(linearTicks([0.0555, 0.056, 0.0565])).toEqual(['0.0555', '0.0560', '0.0565']);
  });
});

describe('formatting', () => {
  it('rounds for display', () => {
    expect(sig(0.004987562)).toBe('0.00499');
    expect(sig(2.5e-5)).toBe('2.5e-5');
    expect(percent(7.6923)).toBe('7.7 %');
    expect(hours(0.2)).toBe('12 min');
    expect(hours(100)).toBe('4.17 d');
    expect(money(1234.5)).toBe('1,234.50');
    expect(money(0.00555)).toBe('0.00555');
  });

  it('gives reflections in decibels, 20·log10|r| (the amplitude convention)', () => {
    // derived: 20·log10(1e-3) = −60; 20·log10(0.5) = −6.0206.
    expect(decibels(1e-3)).toBe('\u221260.0 dB');
    expect(decibels(0.5)).toBe('\u22126.0 dB');
    expect(decibels(0)).toBe('—');
  });

  it("says Apply's result in one line", () => {
    expect(applyHeadline(35, 1)).toBe('Wrote 35 cells of row 1');
    expect(applyHeadline(1, 5)).toBe('Wrote 1 cell of row 5');
  });

  it('labels the theme button with its setting and what a press does (auto → light → dark → auto)', () => {
    expect(themeLabel('auto', 'dark').text).toBe('Theme: auto');
    expect(themeLabel('auto', 'dark').aria).toContain('dark now');
    expect(themeLabel('auto', 'dark').aria).toContain('switch to light');
    expect(themeLabel('light', 'light').aria).toContain('switch to dark');
    expect(themeLabel('dark', 'dark').aria).toContain('switch to auto');
  });
});

describe('Insert project table', () => {
  const table = starterTable();
  const s = starterSheet(table);

  it('lays out the header (inputs, then outputs), the example row, choice lists and the HUSH.PLAN formula', () => {
    expect(s.width).toBe(table.inputs.length + table.outputs.length);
    expect(s.header.slice(0, s.inputCount)).toEqual(table.inputs.map((c) => c.name));
    // HUSH.PLAN spills its values in OUTPUT_COLUMNS order, so the headers beside the formula must be in that order.
    expect(table.outputs.map((o) => o.header).length).toBe(OUTPUT_COLUMNS.length);
    expect(s.example[table.inputs.findIndex((c) => c.name === 'band_short')]).toBe('2.2 GHz');
    expect(s.example.length).toBe(s.inputCount);
    // Columns by spreadsheet lettering (common practice: A…Z, AA…): the formula sits in the first output column.
    const last = (n: number) => (n <= 26 ? String.fromCharCode(64 + n) : String.fromCharCode(64 + Math.floor((n - 1) / 26)) + String.fromCharCode(65 + ((n - 1) % 26)));
    expect(s.formula.address).toBe(`${last(s.inputCount + 1)}2`);
    expect(s.formula.formula).toBe(`=HUSH.PLAN($A$1:$${last(s.inputCount)}$1,A2:${last(s.inputCount)}2)`);
    expect(s.area).toBe(`A1:${last(s.width)}${VALIDATED_ROWS + 1}`);
    const choice = table.inputs.filter((c) => c.choices);
    expect(s.validations.length).toBe(choice.length);
    const phase = table.inputs.findIndex((c) => c.name === 'phase');
    expect(s.validations).toContainEqual({ address: `${last(phase + 1)}2:${last(phase + 1)}201`, source: 'worst,random' });
    expect(s.notes.length).toBe(s.width);
    expect(s.notes[0]).toEqual({ address: 'A1', text: table.inputs[0].note });
  });

  /** A stand-in for Excel.run that records what a batch writes, with a sheet whose area holds `used`. */
  function fakeExcel(used: string | null) {
    const log: string[] = [];
    const range = (address: string) => ({
      getUsedRangeOrNullObject: () => ({ load: () => undefined, isNullObject: used === null, address: used ?? '' }),
      set values(v: unknown[][]) {
        log.push(`values ${address} ${v[0].length}`);
      },
      set formulas(v: string[][]) {
        log.push(`formula ${address} ${v[0][0]}`);
      },
      clear: (what: string) => log.push(`clear ${address} ${what}`),
      dataValidation: {
        clear: () => undefined,
        set rule(r: { list: { source: string } }) {
          log.push(`list ${address} ${r.list.source}`);
        },
      },
      format: { font: { set bold(_: boolean) {} } },
    });
    const sheet = {
      name: 'Sheet1',
      load: () => undefined,
      getRange: range,
      getRangeByIndexes: (r: number, c: number, h: number, w: number) => range(`${r},${c},${h},${w}`),
      notes: { add: () => log.push('note'), getItemOrNullObject: () => ({ load: () => undefined, isNullObject: true }) },
    };
    let syncs = 0;
    const context = { workbook: { worksheets: { getActiveWorksheet: () => sheet } }, sync: async () => void syncs++ };
    const excel: ExcelRunner = { run: (batch) => batch(context as unknown as Excel.RequestContext) };
    return { excel, log, syncs: () => syncs };
  }

  it('writes into an empty area without asking, in one batch', async () => {
    const f = fakeExcel(null);
    let asked = 0;
    const r = await insertStarterTable(f.excel, async () => (asked++, true), false, s);
    expect(asked).toBe(0);
    expect(r).toMatchObject({ written: true, sheet: 'Sheet1', notes: false, replaced: null });
    expect(f.log).toContain(`values 0,0,1,${s.width} ${s.width}`);
    expect(f.log).toContain(`values 1,0,1,${s.inputCount} ${s.inputCount}`);
    expect(f.log).toContain(`formula ${s.formula.address} ${s.formula.formula}`);
    expect(f.log.filter((l) => l.startsWith('list')).length).toBe(s.validations.length);
    expect(f.log).not.toContain('note');
    expect(f.log.some((l) => l.startsWith('clear'))).toBe(false);
  });

  it('asks before writing over a non-empty area, and writes nothing when refused', async () => {
    const f = fakeExcel('Sheet1!B3:C4');
    const questions: string[] = [];
    const r = await insertStarterTable(f.excel, async (q) => (questions.push(q), false), true, s);
    expect(questions.length).toBe(1);
    expect(questions[0]).toContain('Sheet1!B3:C4 is not empty');
    expect(r.written).toBe(false);
    expect(f.log).toEqual([]);
    const g = fakeExcel('Sheet1!B3:C4');
    const w = await insertStarterTable(g.excel, async () => true, true, s);
    expect(w).toMatchObject({ written: true, notes: true, replaced: 'Sheet1!B3:C4' });
    expect(g.log[0]).toBe(`clear ${s.area} Contents`);
    expect(g.log.filter((l) => l === 'note').length).toBe(s.width);
  });
});

describe('Excel API requirement check', () => {
  it('names the missing sets and the pane work they stop; notes (1.18) are optional', () => {
    const upTo = (max: number) => (_: string, v: string) => Number(v.split('.')[1]) <= max;
    expect(checkExcelApi(upTo(20)).message).toBe('');
    const old = checkExcelApi(upTo(7));
    expect(old.missing.map((n) => n.version)).toEqual(['1.8', '1.9']);
    expect(old.message).toContain('lacks ExcelApi 1.8, 1.9');
    const no18 = checkExcelApi(upTo(17));
    expect(no18.missing).toEqual([]);
    expect(no18.skipped.map((n) => n.version)).toEqual(['1.18']);
    expect(no18.message).toContain('header notes');
  });

  it('covers every Excel call of the pane and the Office workbook', () => {
    const src = ['taskpane/insert-table.ts', 'src/workbook/office.ts'].map((f) => fs.readFileSync(path.join(ROOT, f), 'utf8')).join('\n');
    // Calls above ExcelApi 1.1, by the requirement set on each one's page of the Excel JavaScript API reference.
    const calls = ['getUsedRangeOrNullObject', 'getSurroundingRegion', 'getRangeByIndexes', 'dataValidation', 'getTables', 'getFirst', 'notes'];
    const needs = EXCEL_API_NEEDS.map((n) => n.use).join(' ');
    for (const c of calls) {
      expect(src, c).toContain(c);
      expect(needs, c).toContain(c);
    }
  });
});

describe('theme', () => {
  it('reads luminance by the WCAG 2 definition', () => {
    expect(luminance('#ffffff')).toBe(1);
    expect(luminance('#000')).toBe(0);
    // WCAG 2 relative luminance of #808080: ((0.502+0.055)/1.055)^2.4 = 0.2158605.
    expect(luminance('#808080')).toBeCloseTo(0.2158605, 6);
    expect(luminance('dark')).toBeNull();
  });
});

describe('verification runs', () => {
  const grid = { courant: 0.5, dimensions: 3, index: 1.44, ppwMin: 30, ppwMax: 40, angleMaxDeg: 10 };
  it('measures inside the band, evenly in frequency', () => {
    const p = measuredPpw(grid);
    expect(p.length).toBe(5);
    expect(p[0]).toBe(30);
    expect(p[4]).toBe(40);
    // derived: the middle point is at the mean frequency, 1/((1/30 + 1/40)/2) = 240/7.
    expect(p[2]).toBeCloseTo(240 / 7, 12);
    const [lo, hi] = widenedBand(grid, 1.5);
    expect(lo).toBeLessThan(30);
    expect(hi).toBeGreaterThan(40);
  });

  it('picks 1-D and 2-D runs within the pane budget for the demo waveguide', () => {
    const plan = studyPlan(values(4));
    const d = plan.design;
    const choice = chooseRuns(
      { layers: d.layers, order: d.order, strength: d.strength, kappaMax: d.kappaMax, alphaMaxNorm: d.alphaMaxNorm, alphaOrder: d.alphaOrder },
      { courant: plan.inputs.courant, dimensions: 3, index: plan.inputs.index, ppwMin: plan.grid.ppwShort, ppwMax: plan.grid.ppwLong, angleMaxDeg: plan.inputs.angleMaxDeg },
    );
    expect('run' in choice.oneD && choice.oneD.cellUpdates <= PANE_BUDGET_1D).toBe(true);
    expect('run' in choice.twoD && choice.twoD.cellUpdates <= PANE_BUDGET_2D).toBe(true);
  });

  it('skips the 2-D run for a 1-D study and says why', () => {
    const c = chooseRuns({ layers: 5, order: 3 }, { ...grid, dimensions: 1, courant: 0.9, index: 1, angleMaxDeg: 0 });
    expect(c.twoD).toEqual({ skipped: 'a 1-D study has no oblique incidence', reason: 'not-needed' });
  });

  it('states the largest relative difference', () => {
    const pts = [
      { run: '1-D' as const, ppw: 20, angleDeg: 0, measured: 1.01e-3, predicted: 1e-3 },
      { run: '2-D' as const, ppw: 20, angleDeg: 30, measured: 1.96e-3, predicted: 2e-3 },
    ];
    // derived: max(0.01, 0.02) = 0.02.
    expect(largestRelativeDifference(pts)).toBeCloseTo(0.02, 12);
  });
});

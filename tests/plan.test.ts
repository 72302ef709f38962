import { describe, expect, it } from 'vitest';
import { designAbsorber, requiredAmplitude, MODEL_VERSION } from '../src/physics';
import { INPUT_NAMES, OUTPUT_NAMES, clearPlanCache, errorToRow, planHeader, planHeaderText, planInputs, planRow, planToRow, rowFromTable, type ProjectRow } from '../src/plan';
import { parseCsv, writeCsv } from '../src/plan/csv';

const oneD: ProjectRow = { dimensions: 1, band_short: '1550 nm', cell: '50 nm', cells_x: 200, gap: '1 wavelength', intensity_error: '1%' };

const ring: ProjectRow = {
  study: 'ring',
  dimensions: 3,
  band_short: '1540 nm',
  band_long: '1560 nm',
  index: 1.44,
  index_max: 3.48,
  cell: '30 nm',
  size_x: '3 um',
  size_y: '3 um',
  size_z: '0.6 um',
  gap: '0.5 wavelengths',
  angle_max: 20,
  intensity_error: '0.5%',
  q: 2000,
  throughput: 1e9,
  price_per_hour: '$2/h',
};

function value(plan: ReturnType<typeof planRow>, name: string) {
  return planToRow(plan)[OUTPUT_NAMES.indexOf(name)];
}

describe('planRow: budget → design → cost', () => {
  it('the documented 1-D example', () => {
    const p = planRow(oneD);
    // Budget: worst case |r| = √1.01 − 1 (physics.md §1, derived), as the budget module computes it.
    expect(p.requiredReflection).toBe(requiredAmplitude({ intensityError: 0.01 }));
    expect(p.requiredReflection).toBeCloseTo(Math.sqrt(1.01) - 1, 15);
    // ppw = λ/(nΔ) = 1550/50 = 31; gap = ⌈1 · 1550/50⌉ = 31 cells.
    expect(p.grid.ppwShort).toBe(31);
    expect(p.inputs.gapCells).toBe(31);
    // Default Courant number in 1-D: 0.99 of the limit 1.
    expect(p.inputs.courant).toBe(0.99);
    // Design: the same as asking the design search directly (independent call).
    const d = designAbsorber({ target: requiredAmplitude({ intensityError: 0.01 }), ppwMin: 31, ppwMax: 31, courant: 0.99, dimensions: 1, index: 1, orders: [2, 3, 4], kappaMax: 1, alphaMaxNorm: 0, angleMaxDeg: 0, gapCells: 31 });
    expect(p.design).toEqual(d);
    // Cells: 200 + 2·31 gap + 2·layers (hand count).
    expect(p.cost.domain.cellsTotal).toBe(262 + 2 * d.layers);
    expect(p.cost.domain.psiTotal).toBe(2 * 2 * d.layers);
    expect(p.modelVersion).toBe(MODEL_VERSION);
    expect(p.warnings).toContain('no run length: give duration, passes or q for steps, runtime and cost');
  });

  it('faces_seen, coupling, phase and share reach the budget', () => {
    const p = planRow({ ...ring, faces_seen: 2, coupling: 0.5, phase: 'random', share: 0.5 });
    expect(p.requiredReflection).toBe(requiredAmplitude({ intensityError: 0.005, faces: 2, coupling: 0.5, phase: 'random', share: 0.5 }));
  });

  it('echoes normalised SI inputs, sizes rounded up to whole cells', () => {
    const i = planInputs(ring);
    expect(i.wavelengthShort).toBe(1.54e-6);
    expect(i.cell).toBe(3e-8);
    expect(i.interiorCells).toEqual([100, 100, 20]); // 3 um / 30 nm = 100, 0.6 um / 30 nm = 20
    // ⌈0.5 · 1560 nm / (1.44 · 30 nm)⌉ = ⌈18.06⌉ = 19 cells.
    expect(i.gapCells).toBe(19);
    // Ring-down frequency defaults to the band centre in frequency.
    expect(i.ringFrequency).toBe(Number(((299792458 / 1.54e-6 + 299792458 / 1.56e-6) / 2).toPrecision(12)));
    expect(i.faces).toEqual(['absorbing', 'absorbing', 'absorbing', 'absorbing', 'absorbing', 'absorbing']);
  });

  it('periodic and symmetric faces: no absorber there', () => {
    const p = planRow({ ...ring, periodic: 'x y', faces: '' });
    expect(p.inputs.faces).toEqual(['periodic', 'periodic', 'periodic', 'periodic', 'absorbing', 'absorbing']);
    expect(p.cost.domain.axisCells.slice(0, 2)).toEqual([100, 100]);
    const s = planRow({ ...ring, faces: 'x-, x+, y+, z-, z+' });
    expect(s.inputs.faces[2]).toBe('symmetric');
    expect(s.cost.domain.faceLayers[2]).toBe(0);
  });

  it('the same study typed in nm, um, THz plans identically', () => {
    const nm = planToRow(planRow(ring));
    const um = planToRow(planRow({ ...ring, band_short: '1.54 um', band_long: '1.56 um', cell: '0.03 um', size_x: '3000 nm', size_z: 600 }));
    // c/1540 nm and c/1560 nm to 12 digits; the ends in either order.
    const thz = planToRow(planRow({ ...ring, band_short: '192.174652564 THz', band_long: '194.670427273 THz' }));
    expect(um).toStrictEqual(nm);
    expect(thz).toStrictEqual(nm);
  });

  it('a microwave study in GHz and in mm plans identically', () => {
    const base: ProjectRow = { band_short: '30 GHz', cell: '1 mm', size_x: '50 mm', size_y: '50 mm', size_z: '10 mm', intensity_error: '2%', duration: '2 ns', throughput: 3e8 };
    const ghz = planToRow(planRow(base));
    const mm = planToRow(planRow({ ...base, band_short: '9.99308193333 mm', cell: '0.1 cm', duration: '2000 ps' }));
    expect(mm).toStrictEqual(ghz);
  });

  it('is deterministic: bit-identical after clearing the cache', () => {
    const a = planToRow(planRow(ring));
    clearPlanCache();
    const b = planToRow(planRow(ring));
    expect(b).toStrictEqual(a);
    expect(planRow(ring)).toBe(planRow({ ...ring })); // cached by canonical inputs
  });

  it('header and row line up; the error row keeps its message in notes', () => {
    const p = planRow(ring);
    expect(planToRow(p).length).toBe(planHeader().length);
    expect(planHeaderText()).toContain('runtime [h]');
    expect(value(p, 'steps')).toBe(p.cost.time!.steps);
    expect(value(p, 'runtime')).toBe(p.cost.runtime!.totalSeconds / 3600);
    expect(value(p, 'cost')).toBe(p.cost.runtime!.cost);
    const e = errorToRow('cell is required');
    expect(e[OUTPUT_NAMES.indexOf('notes')]).toBe('error: cell is required');
    expect(e[OUTPUT_NAMES.indexOf('layers')]).toBeNull();
  });

  it('warnings: resolution below common practice, absorber too close, grazing angles', () => {
    const p = planRow({ ...ring, cell: '50 nm', gap: 0, angle_max: 70, q: '' });
    const w = p.warnings.join('\n');
    // 1540 nm / (3.48 · 50 nm) = 8.851 cells per wavelength < 10 (common practice), shown rounded down.
    expect(w).toMatch(/resolution: 8\.8 cells per wavelength in the densest material \(index 3\.48\)/);
    expect(w).toMatch(/absorber close to the structure: gap 0 cells/);
    expect(w).toMatch(/grazing incidence: at 70°/);
  });

  it('a shortfall is never shown as the threshold itself: 9.99 cells per wavelength reads 9.9', () => {
    // 30 GHz in vacuum: λ = 9.993 mm; 1 mm cells give 9.993 cells per wavelength (derived), below 10 (common practice).
    const w = planRow({ dimensions: 1, band_short: '30 GHz', cell: '1 mm', cells_x: 100, intensity_error: '1%' }).warnings.join('\n');
    expect(w).toMatch(/resolution: 9\.9 cells per wavelength/);
  });

  it('inputs that other inputs leave unused are named in the notes, not dropped silently', () => {
    const one = planRow({ ...ring, q: '', duration: '20 ps', ring_target: 1e-4, efficiency: 0.9, latency: '2 us' }).warnings;
    expect(one).toContain('ring_target is not used: they describe a resonance, which needs q');
    expect(one).toContain('efficiency and latency are not used: they apply to runs on several nodes (nodes is 1)');
    const many = planRow({ ...ring, nodes: 4, efficiency: 0.8, bandwidth: '10 GB/s' });
    expect(many.warnings).toContain(
      'bandwidth is not used: the stated efficiency sets the parallel runtime (halo_per_step is still reported); clear efficiency to model the halo exchange',
    );
    expect(planRow(ring).warnings.filter((w) => /not used/.test(w))).toEqual([]);
  });

  it('no output column shares its name with an input field (a table holds both side by side)', () => {
    const inputs = new Set(INPUT_NAMES);
    expect(OUTPUT_NAMES.filter((n) => inputs.has(n))).toEqual([]);
  });

  it('memory is split into fields, material and ψ, with the per-cell constants it used in the output (hand count)', () => {
    const p = planRow(ring);
    const GB = 1e9;
    const cells = value(p, 'cells_total') as number;
    // 3-D, single precision: 6 field and 3 material values per cell, 4 bytes each (src/plan/fields.ts COST_CONSTANTS).
    expect([value(p, 'field_values_per_cell'), value(p, 'material_values_per_cell'), value(p, 'bytes_per_value')]).toEqual([6, 3, 4]);
    expect(value(p, 'memory_fields')).toBeCloseTo((cells * 6 * 4) / GB, 15);
    expect(value(p, 'memory_material')).toBeCloseTo((cells * 3 * 4) / GB, 15);
    expect((value(p, 'memory_fields') as number) + (value(p, 'memory_material') as number) + (value(p, 'memory_psi') as number)).toBeCloseTo(value(p, 'memory') as number, 12);
    const adj = planRow({ ...ring, fields_per_cell: 12, precision: 'double' });
    expect([value(adj, 'field_values_per_cell'), value(adj, 'bytes_per_value')]).toEqual([12, 8]);
  });

  it('parallel_efficiency is blank when the halo model has no runtime to derive it from', () => {
    const noRun = planRow({ ...ring, q: '', nodes: 4, bandwidth: '10 GB/s', throughput: '' });
    expect(value(noRun, 'parallel_efficiency')).toBeNull();
    const run = planRow({ ...ring, nodes: 4, bandwidth: '10 GB/s' });
    expect(value(run, 'parallel_efficiency')).toBeGreaterThan(0);
    expect(value(run, 'parallel_efficiency')).toBeLessThan(1);
  });

  it('a blank gap means the size includes the clearance: no gap is added and no gap warning is given (a typed 0 is warned about)', () => {
    const typed = planRow({ ...ring, gap: 0 });
    const blank = planRow({ ...ring, gap: '' });
    expect(typed.warnings.join('\n')).toMatch(/absorber close to the structure: gap 0 cells/);
    expect(blank.warnings.join('\n')).not.toMatch(/absorber close/);
    expect(blank.cost.domain.axisCells).toEqual(typed.cost.domain.axisCells);
  });

  it('stated per-cell constants can be adjusted per row', () => {
    const base = planRow(ring).cost;
    const adj = planRow({ ...ring, fields_per_cell: 12, material_per_cell: 0 }).cost;
    // Memory = cells × (fields + material) × 4 bytes + ψ × 4 bytes (physics.md §5).
    expect(base.memory.totalBytes).toBe(base.domain.cellsTotal * 9 * 4 + base.domain.psiTotal * 4);
    expect(adj.memory.totalBytes).toBe(base.domain.cellsTotal * 12 * 4 + base.domain.psiTotal * 4);
  });

  it('bad input names the field', () => {
    expect(() => planRow({ ...ring, band_short: '5 kg' })).toThrow('band_short must be a wavelength or a frequency such as 1550 nm or 193 THz (got "5 kg")');
    expect(() => planRow({ ...ring, band_short: '' })).toThrow(/band_short is required/);
    expect(() => planRow({ ...ring, cells_x: 100 })).toThrow('give size_x or cells_x, not both');
    expect(() => planRow({ ...ring, periodic: 'x', faces: 'x-, z+' })).toThrow('face x- is absorbing but axis x is periodic');
    expect(() => planRow({ ...ring, faces_seen: 7 })).toThrow('faces_seen must be a whole number from 1 to 6 (got 7)');
    expect(() => planRow({ ...ring, duration: '1 ps' })).toThrow('give one of duration, passes or q, not several');
    expect(() => planRow({ ...ring, courant: 0.7 })).toThrow(/above the 3-D stability limit/);
    expect(() => planRow({ ...ring, dimensions: 2 })).toThrow('size_z is given but the study is 2-D');
    expect(() => planRow({ ...ring, nodes: 4 })).toThrow(/4 nodes need a parallel efficiency/);
  });

  it('rowFromTable reads header names without units or case', () => {
    const row = rowFromTable(['Study', 'band_short [nm]', 'layers [cells]', 'colour'], ['a', '1550', '7', 'red']);
    expect(row).toEqual({ study: 'a', band_short: '1550' });
    expect(INPUT_NAMES).toContain('price_per_hour');
  });
});

describe('CSV (RFC 4180)', () => {
  it('quoted fields with commas, quotes and line breaks; CRLF or LF', () => {
    const text = 'a,b,c\r\n"x, y","say ""hi""","two\nlines"\n1,,3';
    expect(parseCsv(text)).toEqual([
      ['a', 'b', 'c'],
      ['x, y', 'say "hi"', 'two\nlines'],
      ['1', '', '3'],
    ]);
    expect(parseCsv(writeCsv(parseCsv(text)))).toEqual(parseCsv(text));
    expect(writeCsv([['a,b', 'c"d', ' e']])).toBe('"a,b","c""d"," e"\r\n');
  });

  it('refuses an unclosed quote and text after a closing quote', () => {
    expect(() => parseCsv('a,"b\n')).toThrow(/quoted field is not closed/);
    expect(() => parseCsv('a,"b"c\n')).toThrow(/text after a closing quote/);
  });
});

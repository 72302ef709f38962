import { cellsFor } from '../plan/row';
import { FACE_NAMES, HushInputError, runCost, type FaceKind, type Precision } from '../plan/steps';
import { readInput, type Gap } from '../plan/fields';
import { UsageError } from './args';
import { fmt, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const costSpec: CommandSpec = {
  name: 'cost',
  summary:
    'Cells, ψ values and memory of a domain with absorbers and, with --cell, --courant and --duration, its time steps; with --throughput (and --price-per-hour) a runtime and cost. Runtime and cost are planning estimates from your figures; check convergence before relying on results.',
  fields: ['cells', 'layers', 'faces', 'gap', 'precision', 'cell', 'courant', 'duration', 'throughput', 'price_per_hour', 'fields_per_cell', 'material_per_cell', 'absorber_factor'],
  required: ['cells', 'layers'],
  switches: { json: { help: 'print one line of JSON' } },
  notes: [
    '--layers takes one count for every absorbing face, or one per face in x-,x+,y-,y+,z-,z+ order (0 where a face has none).',
    '--gap is in cells (a bare number) or a length (with --cell).',
  ],
};

/** One layer count for every absorbing face, or one per face of the grid in x-,x+,y-,y+,z-,z+ order (0 allowed there). */
function layerCounts(text: string, dims: number): number | number[] {
  const parts = text.split(',').map((t) => t.trim());
  if (parts.length !== 1 && parts.length !== 2 * dims) {
    throw new HushInputError('layers', `--layers must be one whole number or ${2 * dims} (one per face of a ${dims}-D grid: ${FACE_NAMES.slice(0, 2 * dims).join(',')}; got ${JSON.stringify(text)})`, 'value');
  }
  const each = parts.map((p) => (parts.length > 1 && /^0+$/.test(p) ? 0 : (readInput<'count'>('layers', p) as number)));
  return parts.length === 1 ? each[0] : each;
}

function faceKinds(words: string[] | undefined, dims: number): FaceKind[] {
  const names = FACE_NAMES.slice(0, 2 * dims) as readonly string[];
  if (words === undefined || (words.length === 1 && words[0] === 'all')) return names.map(() => 'absorbing');
  for (const t of words) if (!names.includes(t)) throw new HushInputError('faces', `faces must list faces of a ${dims}-D grid (${names.join(', ')}; got ${JSON.stringify(t)})`, 'value');
  // Faces not listed carry no absorber (periodic or symmetric: the count is the same).
  return names.map((n) => (words.includes(n) ? 'absorbing' : 'symmetric'));
}

function gapCells(gap: Gap | undefined, cell: number | undefined): number {
  if (gap === undefined) return 0;
  if ('cells' in gap) return gap.cells;
  if ('metres' in gap) {
    if (cell === undefined) throw new UsageError('--gap as a length needs --cell');
    return cellsFor(gap.metres, cell);
  }
  throw new UsageError('--gap in wavelengths needs a wavelength: give it in cells or as a length');
}

/** `hush cost`: cells, ψ, memory and (with a cell, Courant number and duration) steps of one domain. */
export function costCommand(argv: string[], io: CommandIO): number {
  const o = new Options(costSpec, argv);
  const interior = o.required<'counts'>('cells');
  if (interior.length > 3) throw new HushInputError('cells', `cells must be 1 to 3 whole numbers (got ${interior.length})`, 'value');
  const dims = interior.length;
  const faces = faceKinds(o.get<'faces'>('faces'), dims);
  const rawLayers = o.typedText('layers');
  if (rawLayers === undefined) throw new UsageError('option --layers is required (e.g. --layers 12, or one per face: --layers 12,12,8,8,20,20)');
  const layers = layerCounts(rawLayers, dims);
  if (Array.isArray(layers)) {
    layers.forEach((L, i) => {
      if (L > 0 && faces[i] !== 'absorbing') throw new UsageError(`--layers gives ${L} layers to ${FACE_NAMES[i]}, which --faces leaves without an absorber; give 0 there or list the face in --faces`);
    });
  }
  const cell = o.get<'length'>('cell');
  const courant = o.get<'number'>('courant');
  const duration = o.get<'time'>('duration');
  const timed = [cell, courant, duration].filter((v) => v !== undefined).length;
  if (timed !== 0 && timed !== 3) throw new UsageError('steps need all of --cell, --courant and --duration');
  const r = runCost({
    domain: { dimensions: dims, interior, layers, faces, gap: gapCells(o.get<'gap'>('gap'), cell) },
    precision: (o.get<'choice'>('precision') ?? 'single') as Precision,
    fieldsPerCell: o.get<'count'>('fields_per_cell'),
    materialPerCell: o.get<'count'>('material_per_cell'),
    absorberFactor: o.get<'number'>('absorber_factor'),
    time: timed ? { cellMetres: cell as number, courant: courant as number, duration: duration as number } : undefined,
    throughput: o.get<'number'>('throughput'),
    pricePerHour: o.get<'price'>('price_per_hour'),
  });
  for (const n of o.notes) io.err(`hush cost: note: ${n}`);
  const d = r.domain;
  const out: Record<string, number | string | null> = {
    cells_total: d.cellsTotal,
    cells_interior: d.cellsInterior,
    cells_absorber: d.cellsAbsorber,
    psi_total: d.psiTotal,
    overhead_percent: d.overheadPercent,
    psi_per_stretched_axis: d.psiPerAxis,
    fields_per_cell: r.memory.fieldsPerCell,
    material_per_cell: r.memory.materialPerCell,
    bytes_per_value: r.memory.bytesPerValue,
    memory_bytes: r.memory.totalBytes,
    memory_psi_bytes: r.memory.psiBytes,
  };
  if (r.time) {
    out.time_step_s = r.time.timeStep;
    out.steps = r.time.steps;
  }
  if (r.runtime) {
    out.absorber_factor = r.runtime.absorberFactor;
    out.runtime_s = r.runtime.totalSeconds;
    out.runtime_interior_s = r.runtime.interiorSeconds;
    out.runtime_absorber_s = r.runtime.absorberSeconds;
    out.cost = r.runtime.cost;
  }
  if (o.flag('json')) {
    io.out(JSON.stringify(out));
    return 0;
  }
  io.out(`grid ${d.axisCells.join(' × ')} cells: ${d.cellsTotal} total, ${d.cellsInterior} interior, ${d.cellsAbsorber} absorber (+${fmt(d.overheadPercent)} %)`);
  io.out(`ψ values ${d.psiTotal} (${d.psiPerAxis} per cell per stretched axis)`);
  io.out(
    `memory ${fmt(r.memory.totalBytes / 1e9)} GB (${r.memory.fieldsPerCell} field + ${r.memory.materialPerCell} material values per cell, ${r.memory.bytesPerValue} bytes each; ψ ${fmt(r.memory.psiBytes / 1e9)} GB)`,
  );
  if (r.time) io.out(`time step ${fmt(r.time.timeStep)} s, ${r.time.steps} steps`);
  if (r.runtime) {
    io.out(
      `runtime ${fmt(r.runtime.totalSeconds / 3600)} h (interior ${fmt(r.runtime.interiorSeconds / 3600)} h, absorber ${fmt(r.runtime.absorberSeconds / 3600)} h at ${r.runtime.absorberFactor}× per cell)` +
        (r.runtime.cost === null ? '' : `, cost ${fmt(r.runtime.cost)}`),
    );
    io.out('runtime and cost are planning estimates from your throughput and price; check convergence before relying on results');
  }
  return 0;
}

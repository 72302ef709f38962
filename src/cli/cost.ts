import { FACE_NAMES, runCost, type FaceKind } from '../plan/steps';
import { parseLength, parseTime } from '../plan/units';
import { numberOption, parseArgs, requiredNumber, stringOption, UsageError } from './args';
import { fmt, type CommandIO } from './io';

export const costUsage =
  'hush cost --cells NX[,NY[,NZ]] --layers N|N1,N2,… (one per face, x-,x+,y-,y+,z-,z+ order) [--faces x-,x+,y-,y+,z-,z+ (absorbing faces; default all)] [--gap CELLS=0] [--precision single|double] [--cell SIZE (e.g. 20nm; a bare number is metres) --courant C --duration T (e.g. 3ps; a bare number is seconds)] [--throughput UPDATES_PER_S] [--price PER_NODE_HOUR] [--fields-per-cell F] [--material-per-cell M] [--absorber-factor A=1.5] [--json]';

function parseCells(text: string | undefined): number[] {
  if (text === undefined) throw new UsageError('option --cells is required (e.g. --cells 200,200,100)');
  const parts = text.split(/[,x×]/).map((t) => t.trim());
  if (parts.length < 1 || parts.length > 3 || parts.some((p) => !/^\d+$/.test(p))) {
    throw new UsageError(`--cells must be 1 to 3 whole numbers separated by commas (got ${JSON.stringify(text)})`);
  }
  return parts.map(Number);
}

/** One layer count for every absorbing face, or one per face of the grid in x-,x+,y-,y+,z-,z+ order. */
function parseLayers(text: string | undefined, dims: number): number | number[] {
  if (text === undefined) throw new UsageError('option --layers is required (e.g. --layers 12, or one per face: --layers 12,12,8,8,20,20)');
  const parts = text.split(',').map((t) => t.trim());
  if (parts.some((p) => !/^\d+$/.test(p)) || (parts.length !== 1 && parts.length !== 2 * dims)) {
    throw new UsageError(`--layers must be one whole number or ${2 * dims} (one per face of a ${dims}-D grid: ${FACE_NAMES.slice(0, 2 * dims).join(',')}; got ${JSON.stringify(text)})`);
  }
  return parts.length === 1 ? Number(parts[0]) : parts.map(Number);
}

function parseFaceList(text: string | undefined, dims: number): FaceKind[] {
  const names = FACE_NAMES.slice(0, 2 * dims) as readonly string[];
  if (text === undefined) return names.map(() => 'absorbing');
  const set = new Set<string>();
  for (const t of text.split(/[\s,]+/).filter(Boolean)) {
    if (!names.includes(t)) throw new UsageError(`--faces lists faces of a ${dims}-D grid (${names.join(',')}; got ${JSON.stringify(t)})`);
    set.add(t);
  }
  // Faces not listed carry no absorber (periodic or symmetric: the count is the same).
  return names.map((n) => (set.has(n) ? 'absorbing' : 'symmetric'));
}

/** `hush cost`: cells, ψ, memory and (with a cell, Courant number and duration) steps of one domain. */
export function costCommand(argv: string[], io: CommandIO): number {
  const args = parseArgs(argv, {
    cells: {}, layers: {}, faces: {}, gap: {}, precision: {}, cell: {}, courant: {}, duration: {}, throughput: {}, price: {}, 'fields-per-cell': {}, 'material-per-cell': {}, 'absorber-factor': {}, json: { flag: true },
  });
  if (args.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(args.positional[0])}`);
  const interior = parseCells(stringOption(args, 'cells'));
  const dims = interior.length;
  const faces = parseFaceList(stringOption(args, 'faces'), dims);
  const layers = parseLayers(stringOption(args, 'layers'), dims);
  if (Array.isArray(layers)) {
    layers.forEach((L, i) => {
      if (L > 0 && faces[i] !== 'absorbing') throw new UsageError(`--layers gives ${L} layers to ${FACE_NAMES[i]}, which --faces leaves without an absorber; give 0 there or list the face in --faces`);
    });
  }
  const cellText = stringOption(args, 'cell');
  const courant = numberOption(args, 'courant');
  const durationText = stringOption(args, 'duration');
  const timed = [cellText, courant, durationText].filter((v) => v !== undefined).length;
  if (timed !== 0 && timed !== 3) throw new UsageError('steps need all of --cell, --courant and --duration');
  const precision = stringOption(args, 'precision') ?? 'single';
  if (precision !== 'single' && precision !== 'double') throw new UsageError(`--precision must be single or double (got ${JSON.stringify(precision)})`);
  const r = runCost({
    domain: { dimensions: dims, interior, layers, faces, gap: numberOption(args, 'gap', 0) },
    precision,
    fieldsPerCell: numberOption(args, 'fields-per-cell'),
    materialPerCell: numberOption(args, 'material-per-cell'),
    absorberFactor: numberOption(args, 'absorber-factor'),
    time: timed ? { cellMetres: parseLength("cell", cellText as string, "m"), courant: courant as number, duration: parseTime("duration", durationText as string, "s") } : undefined,
    throughput: numberOption(args, 'throughput'),
    pricePerHour: numberOption(args, 'price'),
  });
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
  if (args.options.has('json')) {
    io.out(JSON.stringify(out));
    return 0;
  }
  io.out(`grid ${d.axisCells.join(' × ')} cells: ${fmt(d.cellsTotal)} total, ${fmt(d.cellsInterior)} interior, ${fmt(d.cellsAbsorber)} absorber (+${fmt(d.overheadPercent)} %)`);
  io.out(`ψ values ${fmt(d.psiTotal)} (${d.psiPerAxis} per cell per stretched axis)`);
  io.out(
    `memory ${fmt(r.memory.totalBytes / 1e9)} GB (${r.memory.fieldsPerCell} field + ${r.memory.materialPerCell} material values per cell, ${r.memory.bytesPerValue} bytes each; ψ ${fmt(r.memory.psiBytes / 1e9)} GB)`,
  );
  if (r.time) io.out(`time step ${fmt(r.time.timeStep)} s, ${r.time.steps} steps`);
  if (r.runtime) {
    io.out(
      `runtime ${fmt(r.runtime.totalSeconds / 3600)} h (interior ${fmt(r.runtime.interiorSeconds / 3600)} h, absorber ${fmt(r.runtime.absorberSeconds / 3600)} h at ${r.runtime.absorberFactor}× per cell)` +
        (r.runtime.cost === null ? '' : `, cost ${fmt(r.runtime.cost)}`),
    );
    io.out('runtime and cost are planning estimates from your throughput and price');
  }
  return 0;
}

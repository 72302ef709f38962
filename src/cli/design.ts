import { amplitudeToDb } from '../plan/fields';
import { readInput, type Gap } from '../plan/fields';
import { defaultCourant, designOptions, exactFor, type DesignResult, type SamplingConvention } from '../plan/steps';
import { UsageError } from './args';
import { fmt, fmtDb, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const designSpec: CommandSpec = {
  name: 'design',
  summary:
    'The thinnest CPML absorber whose worst exact discrete reflection over the band (cells per wavelength from --ppw-min to --ppw-max) and angles (0 to --angle-max) meets --target, strength optimised per grading order and checked on a denser grid.',
  fields: [
    'target', 'ppw_min', 'ppw_max', 'angle_max', 'azimuth_max', 'courant', 'dimensions', 'index', 'index_absorber', 'orders', 'kappa_max', 'alpha_max_norm', 'alpha_order',
    'min_layers', 'max_layers', 'sampling', 'decay_min', 'gap',
  ],
  required: ['target', 'ppw_min'],
  switches: { all: { help: 'list the thinnest design of every allowed grading order' }, json: { help: 'print JSON (one object, or a list with --all)' } },
  notes: [
    '--index may be a list (1.44,3.48): the first is the background (it normalises σ, α and the cells per wavelength), and the design meets the target in every medium listed; --index-absorber lists the media without changing the background.',
    '--decay-min (cells, or wavelengths at the band\'s short end) and --gap (cells) add the near-field check |r_ev(L)|·e^(−2·gap/L) ≤ target; κ_max and α_max are then chosen by the design unless given.',
  ],
};

/** Cells from a gap-like value (cells, or wavelengths at `ppw` cells per wavelength); a length needs a cell size the design does not have. */
function cellsOf(name: string, g: Gap | undefined, ppw: number): number | undefined {
  if (g === undefined) return undefined;
  if ('cells' in g) return g.cells;
  if ('wavelengths' in g) return g.wavelengths * ppw;
  throw new UsageError(`--${name.replace(/_/g, '-')} as a length needs a cell size: give it in cells or in wavelengths`);
}

function toJson(d: DesignResult, courant: number) {
  return {
    layers: d.layers,
    order: d.order,
    strength: d.strength,
    kappa_max: d.kappaMax,
    alpha_max_norm: d.alphaMaxNorm,
    alpha_order: d.alphaOrder,
    worst_amplitude: d.worstAmplitude,
    worst_amplitude_db: amplitudeToDb(d.worstAmplitude),
    worst_ppw: d.worstPpw,
    worst_angle_deg: d.worstAngleDeg,
    continuous_amplitude: d.continuousAmplitude,
    thickness_cells: d.thicknessCells,
    courant,
    dimensions: d.dimensions,
    sampling: d.samplingChecked,
    worst_sampling: d.sampling,
    limiting_index: d.limitingIndex,
    azimuth_max_deg: d.azimuthMaxDeg,
    worst_azimuth_deg: d.worstAzimuthDeg,
    kappa_chosen: d.kappaChosen,
    alpha_chosen: d.alphaChosen,
    alpha_reason: d.alphaReason,
    worst_evanescent: d.worstEvanescent,
    worst_evanescent_bare: d.worstEvanescentBare,
    worst_evanescent_decay_cells: d.worstEvanescentDecayCells,
    min_layers: d.minLayers,
  };
}

/** The design inputs as `hush design` reads them (any command whose spec lists designSpec's fields), and the grid they describe. */
export function readDesignOptions(o: Options): { options: DesignResult[]; courant: number; dimensions: number; index: number; absorberIndices: number[] | undefined } {
  const dimensions = o.get<'count'>('dimensions') ?? 3;
  const courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
  const ppwMin = o.required<'number'>('ppw_min');
  // --index: one background index, or a list whose first entry is the background.
  const indexText = o.typedText('index');
  const indexList = indexText !== undefined && /[,;\s]/.test(indexText.trim()) ? (readInput<'numbers'>('index_absorber', indexText) as number[]) : undefined;
  const index = indexList ? indexList[0] : (o.get<'number'>('index') ?? 1);
  const absorberIndices = o.get<'numbers'>('index_absorber') ?? indexList;
  const options = designOptions({
    target: o.required<'reflection'>('target'),
    ppwMin,
    ppwMax: o.get<'number'>('ppw_max'),
    angleMaxDeg: o.get<'angle'>('angle_max') ?? 0,
    courant,
    dimensions,
    index,
    absorberIndices,
    azimuthMaxDeg: o.get<'angle'>('azimuth_max'),
    minLayers: o.get<'count'>('min_layers'),
    sampling: o.get<'choice'>('sampling') as SamplingConvention | 'all' | undefined,
    decayMinCells: cellsOf('decay_min', o.get<'gap'>('decay_min'), ppwMin),
    gapCells: cellsOf('gap', o.get<'gap'>('gap'), o.get<'number'>('ppw_max') ?? ppwMin),
    orders: o.get<'numbers'>('orders'),
    kappaMax: o.get<'number'>('kappa_max'),
    alphaMaxNorm: o.get<'number'>('alpha_max_norm'),
    alphaOrder: o.get<'number'>('alpha_order'),
    maxLayers: o.get<'count'>('max_layers'),
  });
  return { options, courant, dimensions, index, absorberIndices };
}

/** `hush design`: the thinnest absorber meeting a target over a band and angles. */
export function designCommand(argv: string[], io: CommandIO): number {
  const o = new Options(designSpec, argv);
  const { options, courant, dimensions } = readDesignOptions(o);
  for (const n of o.notes) io.err(`hush design: note: ${n}`);
  const all = o.flag('all');
  if (o.flag('json')) {
    io.out(JSON.stringify(all ? options.map((d) => toJson(d, courant)) : toJson(options[0], courant)));
    return 0;
  }
  const rows = all ? options : [options[0]];
  io.out('layers  order  strength  worst |r|  worst dB   at ppw  at angle  continuous |r|');
  for (const d of rows) {
    io.out(
      `${String(d.layers).padStart(6)}  ${String(d.order).padStart(5)}  ${fmt(d.strength).padStart(8)}  ${fmt(d.worstAmplitude).padStart(9)}  ${fmtDb(amplitudeToDb(d.worstAmplitude)).replace(' dB', '').padStart(8)}  ${fmt(d.worstPpw).padStart(7)}  ${(fmt(d.worstAngleDeg) + '°').padStart(8)}  ${fmt(d.continuousAmplitude).padStart(14)}`,
    );
  }
  const d0 = rows[0];
  io.out(`exact on the grid for ${exactFor(d0.samplingChecked)}, ${dimensions}-D, Courant number ${fmt(courant, 6)}`);
  if (d0.mediumWorst.length > 1) io.out(`media crossing the absorber: ${d0.mediumWorst.map((m) => `n = ${m.index}: worst |r| ${fmt(m.worstAmplitude)}`).join('; ')}; limiting: n = ${d0.limitingIndex}`);
  if (d0.worstEvanescent !== null) {
    io.out(`near field: worst evanescent |r|·e^(−2·gap/L) = ${fmt(d0.worstEvanescent)} (|r| ${fmt(d0.worstEvanescentBare ?? 0)} at L = ${fmt(d0.worstEvanescentDecayCells ?? 0)} cells), κ_max ${fmt(d0.kappaMax)}, α_max·η₀·Δ·n ${fmt(d0.alphaMaxNorm)}`);
  }
  if (d0.alphaChosen || d0.kappaChosen) io.out(d0.alphaReason);
  return 0;
}

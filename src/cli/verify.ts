import { ALL_SAMPLINGS, SAMPLING_CONVENTIONS, defaultCourant, exactFor, HushInputError, type AbsorberDesign, type SamplingConvention } from '../plan/steps';
import { AGREEMENT, compareMeasurement, planVerification, relativeDifference, runVerificationPlan, type MeasuredPoint, type VerifyGrid } from '../plan/verify';
import { UsageError } from './args';
import { designSpec, readDesignOptions } from './design';
import { fmt, type CommandIO } from './io';
import { absorberFromOptions } from './absorber';
import { Options, type CommandSpec } from './options';
import { progressBar } from './progress';

/** Largest time-domain work `hush verify` starts, in cell updates (every run of every check together). */
export const VERIFY_MAX_CELL_UPDATES = 4e9;

/** Design-search inputs that an explicit absorber (--layers) leaves without meaning. */
const SEARCH_ONLY = ['target', 'orders', 'min_layers', 'max_layers', 'decay_min', 'gap', 'azimuth_max', 'index_absorber'] as const;
const ABSORBER = ['layers', 'order', 'strength'] as const;

export const verifySpec: CommandSpec = {
  name: 'verify',
  summary:
    'Time-domain check of a design: the absorber `hush design` finds for the same options (or the one given by --layers, --order, --strength…) is run on a 1-D line at normal incidence and, for a 2-D or 3-D study, on the exact one-mode reduction of a periodic 2-D grid at --angle-max, over the band --ppw-min to --ppw-max; the measured |r| is set beside the exact discrete prediction. Exit 0 when every frequency agrees within 1 %, 1 when one does not, 2 on bad input.',
  fields: [...designSpec.fields, ...ABSORBER],
  required: ['ppw_min'],
  switches: {
    'grid-sampling': {
      value: 'CONVENTION',
      help: `how the time-domain grid samples the profiles (${SAMPLING_CONVENTIONS.join(', ')}); default the prediction's own --sampling. Another convention measures how far a grid of that kind departs from the prediction`,
    },
    'max-work': { value: 'CELL_UPDATES', help: `refuse a verification needing more time-domain work than this, in cell updates (cells × steps of every run); default and largest ${VERIFY_MAX_CELL_UPDATES.toExponential(0)}` },
    json: { help: 'print one line of JSON: predicted, measured, relative_difference (the largest), tolerance, agree, runs (one per frequency), design, notes' },
  },
  notes: [
    'Without --layers the absorber is the thinnest design `hush design` prints for the same options (--target is then required); with --layers (and --order) the absorber is given, and the design-search options (--target, --orders, --min-layers, --max-layers, --decay-min, --gap, --azimuth-max, --index-absorber) do not apply.',
    `The work is bounded before any step is taken: a verification needing more than ${VERIFY_MAX_CELL_UPDATES.toExponential(0)} cell updates (cells × steps of every run; about a minute at the 6e7 cell updates per second of one core measured for this engine, a planning estimate), or more than --max-work, is refused; a narrower band, fewer cells per wavelength or a smaller angle need less.`,
    '--sampling all verifies the design under node, average and offset in turn. The runs measure in the background medium (the first --index) and in the plane of incidence.',
  ],
};

function maxWorkOf(o: Options): number {
  const t = o.text('max-work');
  if (t === undefined) return VERIFY_MAX_CELL_UPDATES;
  const x = /^\s*[+]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/.test(t) ? Number(t) : NaN;
  if (!(x >= 1 && x <= VERIFY_MAX_CELL_UPDATES)) throw new UsageError(`--max-work must be a number of cell updates from 1 to ${VERIFY_MAX_CELL_UPDATES.toExponential(0)} (got ${JSON.stringify(t)})`);
  return x;
}

function gridSamplingOf(o: Options): SamplingConvention | undefined {
  const t = o.text('grid-sampling');
  if (t === undefined) return undefined;
  const v = t.trim().toLowerCase();
  if (!(SAMPLING_CONVENTIONS as readonly string[]).includes(v)) throw new UsageError(`--grid-sampling must be one of ${SAMPLING_CONVENTIONS.join(', ')} (got ${JSON.stringify(t)})`);
  return v as SamplingConvention;
}

interface Verified {
  design: AbsorberDesign;
  samplings: SamplingConvention[];
  grid: VerifyGrid;
  notes: string[];
}

/** The absorber and grid to verify, from the options: the design search's result, or the absorber given. */
function readVerification(o: Options): Verified {
  const notes: string[] = [];
  const explicit = o.has('layers');
  const sampling = (o.get<'choice'>('sampling') ?? 'node') as SamplingConvention | 'all';
  const samplings = sampling === 'all' ? [...ALL_SAMPLINGS] : [sampling];
  const angleMaxDeg = o.get<'angle'>('angle_max') ?? 0;
  const ppwMin = o.required<'number'>('ppw_min');
  const ppwMax = o.get<'number'>('ppw_max') ?? ppwMin;
  if (ppwMax < ppwMin) throw new HushInputError('ppw_max', `ppw_max must be at least ppw_min (${ppwMin}) (got ${ppwMax})`);
  let design: AbsorberDesign;
  let dimensions: number;
  let courant: number;
  let index: number;
  if (explicit) {
    for (const f of SEARCH_ONLY) if (o.has(f)) throw new UsageError(`--${f.replace(/_/g, '-')} belongs to a design search; with --layers the absorber is given (drop --layers to verify the design hush design finds)`);
    dimensions = o.get<'count'>('dimensions') ?? 3;
    courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
    index = o.get<'number'>('index') ?? 1;
    design = absorberFromOptions(o);
  } else {
    for (const f of ABSORBER) if (o.has(f)) throw new UsageError(`--${f} needs --layers: without it the design search chooses the absorber (give --layers, --order and --strength to verify one of your own)`);
    const r = readDesignOptions(o);
    const d = r.options[0];
    ({ dimensions, courant, index } = r);
    design = { layers: d.layers, order: d.order, strength: d.strength, kappaMax: d.kappaMax, alphaMaxNorm: d.alphaMaxNorm, alphaOrder: d.alphaOrder };
    if (r.absorberIndices && r.absorberIndices.some((n) => n !== index)) notes.push(`the runs measure in the background medium n = ${index} only; the design was also checked in n = ${r.absorberIndices.filter((n) => n !== index).join(', ')}`);
    if ((o.get<'angle'>('azimuth_max') ?? 0) > 0) notes.push('the runs measure in the plane of incidence; the azimuths the design was checked at are not measured');
  }
  const gridSampling = gridSamplingOf(o);
  const grid: VerifyGrid = { courant, dimensions, index, ppwMin, ppwMax, angleMaxDeg, ...(gridSampling ? { gridSampling } : {}) };
  return { design, samplings, grid, notes };
}

function pointJson(p: MeasuredPoint, tolerance: number) {
  const d = relativeDifference(p);
  return {
    check: p.run,
    ppw: p.ppw,
    angle_deg: p.angleDeg,
    sampling: p.sampling ?? 'node',
    grid_sampling: p.gridSampling ?? p.sampling ?? 'node',
    predicted: p.predicted,
    measured: p.measured,
    relative_difference: d,
    agree: d <= tolerance,
  };
}

function percent(x: number): string {
  return Number.isFinite(x) ? `${fmt(x * 100, 2)} %` : String(x);
}

/** `hush verify`: the time-domain check of a design against the exact prediction. */
export async function verifyCommand(argv: string[], io: CommandIO): Promise<number> {
  const o = new Options(verifySpec, argv);
  const v = readVerification(o);
  const designs = v.samplings.map((s) => ({ ...v.design, sampling: s }));
  // Each check may use the whole bound; the sum is checked below, before any step is taken.
  const maxWork = maxWorkOf(o);
  const plan = planVerification(designs, v.grid, { oneD: maxWork, twoD: maxWork });
  for (const s of plan.skipped) {
    if (s.skip.reason === 'budget' || s.skip.reason === 'unmeasurable') {
      throw new HushInputError('band', `the ${s.run} run cannot be made: ${s.skip.skipped}${s.skip.reason === 'budget' ? '; narrow the band, lower the cells per wavelength or the angle' : ''}`, 'value');
    }
  }
  if (plan.cellUpdates > maxWork) {
    throw new HushInputError(
      'band',
      `this verification would need ${plan.cellUpdates.toExponential(2)} cell updates (at most ${maxWork.toExponential(1)} are run${maxWork < VERIFY_MAX_CELL_UPDATES ? ', --max-work' : ''}); narrow the band, lower the cells per wavelength or the angle, or verify one --sampling at a time`,
      'value',
    );
  }
  for (const n of [...o.notes, ...v.notes]) io.err(`hush verify: note: ${n}`);
  const bar = progressBar(io, (done, total) => `${Math.floor((100 * done) / total)} % of ${total.toExponential(1)} cell updates`);
  const report = await runVerificationPlan(plan, { onProgress: (_run, _fraction, overall) => bar?.(Math.min(1, overall) * plan.cellUpdates, plan.cellUpdates) });
  bar?.(plan.cellUpdates, plan.cellUpdates);
  // A 2-D run fixes the transverse wavenumber, so each frequency meets the boundary at its own angle.
  const beyond = report.points.filter((p) => p.run === '2-D' && p.angleDeg > v.grid.angleMaxDeg + 0.05);
  if (beyond.length) {
    report.notes.push(
      `${beyond.length} frequencies of the 2-D run meet the boundary beyond --angle-max (up to ${fmt(Math.max(...beyond.map((p) => p.angleDeg)))}°: each run fixes the transverse wavenumber, so each frequency has its own angle); there the predicted |r| may exceed the design's target, and the check compares the measurement with the prediction, not with the target`,
    );
  }
  const tolerance = AGREEMENT;
  const c = compareMeasurement(report.points, tolerance);
  const sampling = v.samplings.length === 1 ? v.samplings[0] : 'all';
  const gridSampling = v.grid.gridSampling;
  const exact = `The prediction is the exact discrete reflection for ${exactFor(sampling)}; the time-domain grid ${gridSampling && gridSampling !== sampling ? `samples the profiles by the ${gridSampling} convention instead` : 'uses the same convention'}.`;
  const d = v.design;
  if (o.flag('json')) {
    io.out(
      JSON.stringify({
        agree: c.agree,
        tolerance,
        relative_difference: c.largestDifference,
        predicted: c.worst?.predicted ?? null,
        measured: c.worst?.measured ?? null,
        worst_ppw: c.worst?.ppw ?? null,
        worst_angle_deg: c.worst?.angleDeg ?? null,
        runs: report.points.map((p) => pointJson(p, tolerance)),
        design: { layers: d.layers, order: d.order, strength: d.strength ?? 1, kappa_max: d.kappaMax ?? 1, alpha_max_norm: d.alphaMaxNorm ?? 0, alpha_order: d.alphaOrder ?? 1 },
        sampling,
        grid_sampling: gridSampling ?? sampling,
        exact_for: exactFor(sampling),
        courant: v.grid.courant,
        dimensions: v.grid.dimensions,
        index: v.grid.index,
        ppw_min: v.grid.ppwMin,
        ppw_max: v.grid.ppwMax,
        angle_max_deg: v.grid.angleMaxDeg,
        cell_updates: report.cellUpdates,
        seconds: report.seconds,
        notes: report.notes,
      }),
    );
    return c.agree ? 0 : 1;
  }
  io.out(
    `absorber: ${d.layers} layers, order ${d.order}, strength ${fmt(d.strength ?? 1)}, κ_max ${fmt(d.kappaMax ?? 1)}, α_max·η₀·Δ·n ${fmt(d.alphaMaxNorm ?? 0)}; ` +
      `${v.grid.dimensions}-D grid, Courant number ${fmt(v.grid.courant, 6)}, index ${fmt(v.grid.index)}`,
  );
  const several = v.samplings.length > 1;
  io.out(`check  ${several ? 'sampling ' : ''}     ppw   angle  predicted |r|  measured |r|  difference  result`);
  for (const p of report.points) {
    const diff = relativeDifference(p);
    io.out(
      `${p.run.padEnd(5)}  ${several ? (p.sampling ?? 'node').padEnd(9) : ''}${fmt(p.ppw).padStart(6)}  ${(fmt(p.angleDeg) + '°').padStart(6)}  ${fmt(p.predicted).padStart(13)}  ${fmt(p.measured).padStart(12)}  ${percent(diff).padStart(10)}  ${diff <= tolerance ? 'agrees' : 'DISAGREES'}`,
    );
  }
  io.out(exact);
  for (const n of report.notes) io.out(`note: ${n}`);
  io.out(
    `largest relative difference ${percent(c.largestDifference)} (tolerance ${percent(tolerance)}) over ${report.points.length} frequencies, ` +
      `${report.cellUpdates.toExponential(2)} cell updates in ${fmt(report.seconds, 2)} s: ` +
      (c.agree ? 'the measurement agrees with the prediction' : 'the measurement DISAGREES with the prediction'),
  );
  return c.agree ? 0 : 1;
}

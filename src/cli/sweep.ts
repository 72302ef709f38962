import { amplitudeToDb, writeCsv } from '../plan';
import { defaultCourant, exactFor, reflection, HushInputError, type SamplingConvention } from '../plan/steps';
import { type CommandIO } from './io';
import { absorberFromOptions } from './absorber';
import { Options, type CommandSpec } from './options';
import { writeFileAtomic } from './write';

export const sweepSpec: CommandSpec = {
  name: 'sweep',
  summary:
    'Exact discrete |r| (and dB) of one CPML design over cells per wavelength × angle, as CSV for plotting elsewhere: one row per (ppw, angle), evenly spaced in frequency between --ppw-min and --ppw-max and in angle from 0 to --angle-max. Exact for the grid convention --sampling names (default node; all: the worst of node, average and offset at each point).',
  fields: ['layers', 'order', 'strength', 'kappa_max', 'alpha_max_norm', 'alpha_order', 'sampling', 'ppw_min', 'ppw_max', 'ppw_points', 'angle_max', 'angle_points', 'courant', 'dimensions', 'index'],
  required: ['layers', 'order', 'ppw_min'],
  switches: { out: { value: 'FILE.csv', help: 'write the CSV to this file (an existing file needs --replace) instead of standard output' }, replace: { help: 'with --out: replace an existing file' } },
};

/** `hush sweep`: |r| of one design over a grid of cells per wavelength and angles, as CSV. */
export async function sweepCommand(argv: string[], io: CommandIO): Promise<number> {
  const o = new Options(sweepSpec, argv);
  const dimensions = o.get<'count'>('dimensions') ?? 3;
  const courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
  const ppwMin = o.required<'number'>('ppw_min');
  const ppwMax = o.get<'number'>('ppw_max') ?? ppwMin;
  if (ppwMax < ppwMin) throw new HushInputError('ppw_max', `ppw_max must be at least ppw_min (${ppwMin}) (got ${ppwMax})`);
  const angleMax = o.get<'angle'>('angle_max') ?? 0;
  const nf = ppwMax === ppwMin ? 1 : (o.get<'count'>('ppw_points') ?? 25);
  const na = angleMax === 0 ? 1 : (o.get<'count'>('angle_points') ?? 10);
  const design = absorberFromOptions(o);
  const index = o.get<'number'>('index') ?? 1;
  const sampling = (o.get<'choice'>('sampling') ?? 'node') as SamplingConvention | 'all';
  const conventions: SamplingConvention[] = sampling === 'all' ? ['node', 'average', 'offset'] : [sampling];
  const rows: (string | number | null)[][] = [['ppw', 'angle_deg', 'amplitude', 'amplitude_db', 'continuous', 'continuous_db']];
  for (let i = 0; i < nf; i++) {
    // Evenly spaced in frequency (1/ppw), the ends exact.
    const ppw = i === 0 ? ppwMin : i === nf - 1 ? ppwMax : 1 / (1 / ppwMin + ((1 / ppwMax - 1 / ppwMin) * i) / (nf - 1));
    for (let j = 0; j < na; j++) {
      const angle = na === 1 ? angleMax : (angleMax * j) / (na - 1);
      const wave = { ppw, angleDeg: angle, courant, dimensions, index };
      // Under 'all', the worst of the three conventions at this point.
      const r = conventions.map((c) => reflection({ ...design, sampling: c }, wave)).reduce((a, b) => (b.amplitude > a.amplitude ? b : a));
      rows.push([ppw, angle, r.amplitude, amplitudeToDb(r.amplitude), r.continuous, amplitudeToDb(r.continuous)]);
    }
  }
  const text = writeCsv(rows);
  for (const n of o.notes) io.err(`hush sweep: note: ${n}`);
  const out = o.text('out');
  if (out === undefined) {
    if (o.flag('replace')) throw new HushInputError('replace', '--replace only applies with --out', 'value');
    io.out(text.replace(/\r\n$/, ''));
  } else {
    await writeFileAtomic(out, text, o.flag('replace'));
    io.out(`wrote ${out}: ${rows.length - 1} reflections (exact on the grid for ${exactFor(sampling)})`);
  }
  return 0;
}

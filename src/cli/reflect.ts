import { amplitudeToDb } from '../plan/fields';
import { defaultCourant, exactFor, reflection, toNormalisedConductivity, type SamplingConvention } from '../plan/steps';
import { UsageError } from './args';
import { fmt, fmtDb, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const reflectSpec: CommandSpec = {
  name: 'reflect',
  summary:
    'Exact discrete amplitude reflection |r| of one CPML design at one frequency and angle (or for an evanescent field of decay length --decay), as the Yee grid sees it, with the continuous-theory value beside it. The figure is exact for the grid convention --sampling names (default node: σ, κ, α sampled at each node’s own depth).',
  fields: ['layers', 'order', 'strength', 'kappa_max', 'alpha_max', 'cell', 'alpha_max_norm', 'alpha_order', 'sampling', 'ppw', 'courant', 'dimensions', 'angle', 'azimuth', 'decay', 'index'],
  required: ['layers', 'order', 'ppw'],
  switches: { json: { help: 'print one line of JSON: amplitude, amplitude_db, phase_deg, continuous, alpha_max_norm, courant, sampling' } },
  notes: ['--alpha-max (S/m) needs --cell to be normalised; or give --alpha-max-norm (α·η₀·Δ·n) directly.', '--decay and a nonzero --angle are exclusive: an evanescent field has no angle of incidence.', 'With --decay, |r| is the evanescent field sent back at the interface; it may exceed 1.'],
};

/** `hush reflect`: exact discrete reflection of one design at one frequency and angle. */
export function reflectCommand(argv: string[], io: CommandIO): number {
  const o = new Options(reflectSpec, argv);
  o.exclusive('alpha_max', 'alpha_max_norm');
  const index = o.get<'number'>('index') ?? 1;
  const dimensions = o.get<'count'>('dimensions') ?? 3;
  const alphaMax = o.get<'conductivity'>('alpha_max');
  const cell = o.get<'length'>('cell');
  if (alphaMax !== undefined && alphaMax !== 0 && cell === undefined) throw new UsageError('--alpha-max (S/m) needs --cell (e.g. --cell 20nm) to normalise it, or give --alpha-max-norm');
  const alphaMaxNorm = alphaMax !== undefined && cell !== undefined ? toNormalisedConductivity('alpha_max', alphaMax, cell, index) : (o.get<'number'>('alpha_max_norm') ?? 0);
  const courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
  const sampling = (o.get<'choice'>('sampling') ?? 'node') as SamplingConvention | 'all';
  if (sampling === 'all') throw new UsageError("--sampling all is for designs (hush design): one reflection is computed under one convention (node, average, offset or lagged)");
  const angle = o.get<'angle'>('angle') ?? 0;
  const decay = o.get<'number'>('decay');
  if (decay !== undefined && angle !== 0) throw new UsageError('give --decay or a nonzero --angle, not both: an evanescent field has no angle of incidence');
  const r = reflection(
    {
      layers: o.required<'count'>('layers'),
      order: o.required<'number'>('order'),
      strength: o.get<'number'>('strength'),
      kappaMax: o.get<'number'>('kappa_max'),
      alphaMaxNorm,
      alphaOrder: o.get<'number'>('alpha_order'),
      sampling,
    },
    { ppw: o.required<'number'>('ppw'), courant, dimensions, angleDeg: angle, azimuthDeg: o.get<'angle'>('azimuth'), decayCells: decay, index },
  );
  for (const n of o.notes) io.err(`hush reflect: note: ${n}`);
  if (o.flag('json')) {
    io.out(JSON.stringify({ amplitude: r.amplitude, amplitude_db: amplitudeToDb(r.amplitude), phase_deg: r.phaseDeg, continuous: r.continuous, alpha_max_norm: alphaMaxNorm, courant, sampling }));
  } else {
    io.out(`amplitude reflection |r| = ${fmt(r.amplitude)} (${fmtDb(amplitudeToDb(r.amplitude))}, phase ${fmt(r.phaseDeg)}°), exact on the grid for ${exactFor(sampling)}`);
    io.out(`continuous theory        = ${fmt(r.continuous)} (${fmtDb(amplitudeToDb(r.continuous))}; ignores the grid)`);
    io.out(`Courant number ${fmt(courant, 6)} (vacuum), ${dimensions}-D grid`);
  }
  return 0;
}

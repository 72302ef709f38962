import { amplitudeToDb } from '../plan/fields';
import { defaultCourant, reflection, toNormalisedConductivity } from '../plan/steps';
import { UsageError } from './args';
import { fmt, fmtDb, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const reflectSpec: CommandSpec = {
  name: 'reflect',
  summary:
    'Exact discrete amplitude reflection |r| of one CPML design at one frequency and angle, as the Yee grid sees it (exact for the grid convention of physics.md §3: profiles sampled at each node’s own depth), with the continuous-theory value beside it.',
  fields: ['layers', 'order', 'strength', 'kappa_max', 'alpha_max', 'cell', 'alpha_max_norm', 'alpha_order', 'ppw', 'courant', 'dimensions', 'angle', 'index'],
  required: ['layers', 'order', 'ppw'],
  switches: { json: { help: 'print one line of JSON: amplitude, amplitude_db, phase_deg, continuous, alpha_max_norm, courant' } },
  notes: ['--alpha-max (S/m) needs --cell to be normalised; or give --alpha-max-norm (α·η₀·Δ·n) directly.'],
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
  const r = reflection(
    {
      layers: o.required<'count'>('layers'),
      order: o.required<'number'>('order'),
      strength: o.get<'number'>('strength'),
      kappaMax: o.get<'number'>('kappa_max'),
      alphaMaxNorm,
      alphaOrder: o.get<'number'>('alpha_order'),
    },
    { ppw: o.required<'number'>('ppw'), courant, dimensions, angleDeg: o.get<'angle'>('angle') ?? 0, index },
  );
  for (const n of o.notes) io.err(`hush reflect: note: ${n}`);
  if (o.flag('json')) {
    io.out(JSON.stringify({ amplitude: r.amplitude, amplitude_db: amplitudeToDb(r.amplitude), phase_deg: r.phaseDeg, continuous: r.continuous, alpha_max_norm: alphaMaxNorm, courant }));
  } else {
    io.out(`amplitude reflection |r| = ${fmt(r.amplitude)} (${fmtDb(amplitudeToDb(r.amplitude))}, phase ${fmt(r.phaseDeg)}°), exact on the grid (profiles sampled at each node's depth)`);
    io.out(`continuous theory        = ${fmt(r.continuous)} (${fmtDb(amplitudeToDb(r.continuous))}; ignores the grid)`);
    io.out(`Courant number ${fmt(courant, 6)} (vacuum), ${dimensions}-D grid`);
  }
  return 0;
}

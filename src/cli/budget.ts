import { amplitudeToDb } from '../plan/fields';
import { intensityErrorFromAmplitude, requiredAmplitude, type MonitorKind, type PhaseModel } from '../plan/steps';
import { UsageError } from './args';
import { fmt, fmtDb, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const budgetSpec: CommandSpec = {
  name: 'budget',
  summary: 'Tolerated intensity error → the amplitude reflection |r| each absorbing face may have, for a field-intensity monitor (1+c|r|)²−1 or a flux monitor c²|r|²; with --amplitude, the inverse.',
  fields: ['intensity_error', 'amplitude', 'coupling', 'faces_seen', 'phase', 'monitor', 'share'],
  switches: { json: { help: 'print one line of JSON' } },
  notes: ['Give exactly one of --intensity-error or --amplitude.'],
};

/** `hush budget`: tolerated intensity error ↔ required amplitude reflection per face. */
export function budgetCommand(argv: string[], io: CommandIO): number {
  const o = new Options(budgetSpec, argv);
  const options = {
    coupling: o.get<'fraction'>('coupling') ?? 1,
    faces: o.get<'count'>('faces_seen') ?? 1,
    phase: (o.get<'choice'>('phase') ?? 'worst') as PhaseModel,
    share: o.get<'fraction'>('share') ?? 1,
    monitor: (o.get<'choice'>('monitor') ?? 'intensity') as MonitorKind,
  };
  const shown = { coupling: options.coupling, faces_seen: options.faces, phase: options.phase, monitor: options.monitor, share: options.share };
  const eps = o.get<'fraction'>('intensity_error');
  const amp = o.get<'reflection'>('amplitude');
  if ((eps === undefined) === (amp === undefined)) throw new UsageError('give exactly one of --intensity-error or --amplitude');
  const json = o.flag('json');
  if (eps !== undefined) {
    const a = requiredAmplitude({ intensityError: eps, ...options });
    for (const n of o.notes) io.err(`hush budget: note: ${n}`);
    if (json) io.out(JSON.stringify({ amplitude: a, amplitude_db: amplitudeToDb(a), power: a * a, intensity_error: eps, ...shown }));
    else io.out(`required amplitude reflection per face |r| ≤ ${fmt(a, 6)} (${fmtDb(amplitudeToDb(a))}; power |r|² ≤ ${fmt(a * a)})`);
  } else {
    const e = intensityErrorFromAmplitude(amp as number, options);
    for (const n of o.notes) io.err(`hush budget: note: ${n}`);
    if (json) io.out(JSON.stringify({ intensity_error: e, amplitude: amp, ...shown }));
    else io.out(`intensity error caused: ${fmt(e, 6)} (${fmt(100 * e, 4)} %)`);
  }
  return 0;
}

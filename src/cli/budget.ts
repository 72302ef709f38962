import { intensityErrorFromAmplitude, requiredAmplitude, type PhaseModel } from '../plan/steps';
import { numberOption, parseArgs, stringOption, UsageError } from './args';
import { fmt, type CommandIO } from './io';

export const budgetUsage =
  'hush budget (--intensity-error E | --amplitude R) [--coupling C=1] [--faces K=1] [--phase worst|random] [--share F=1] [--json]';

/** `hush budget`: tolerated intensity error ↔ required amplitude reflection per face. */
export function budgetCommand(argv: string[], io: CommandIO): number {
  const args = parseArgs(argv, {
    'intensity-error': {}, amplitude: {}, coupling: {}, faces: {}, phase: {}, share: {}, json: { flag: true },
  });
  if (args.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(args.positional[0])}`);
  const phase = (stringOption(args, 'phase') ?? 'worst') as PhaseModel;
  const options = {
    coupling: numberOption(args, 'coupling', 1),
    faces: numberOption(args, 'faces', 1),
    phase,
    share: numberOption(args, 'share', 1),
  };
  const eps = numberOption(args, 'intensity-error');
  const amp = numberOption(args, 'amplitude');
  if ((eps === undefined) === (amp === undefined)) throw new UsageError('give exactly one of --intensity-error or --amplitude');
  const json = args.options.has('json');
  if (eps !== undefined) {
    const a = requiredAmplitude({ intensityError: eps, ...options });
    if (json) io.out(JSON.stringify({ amplitude: a, power: a * a, intensity_error: eps, ...options }));
    else io.out(`required amplitude reflection per face |r| ≤ ${fmt(a, 6)}  (power |r|² ≤ ${fmt(a * a)})`);
  } else {
    const e = intensityErrorFromAmplitude(amp!, options);
    if (json) io.out(JSON.stringify({ intensity_error: e, amplitude: amp, ...options }));
    else io.out(`intensity error caused: ${fmt(e, 6)} (${fmt(100 * e, 4)} %)`);
  }
  return 0;
}

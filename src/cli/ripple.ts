import { reflectionFromRipple, rippleFromReflection } from '../plan/steps';
import { numberOption, parseArgs, UsageError } from './args';
import { fmt, type CommandIO } from './io';

export const rippleUsage =
  'hush ripple (--amplitude R --distance METRES | --peak-to-peak P --period HZ) [--group-index NG=1] [--coupling C=1] [--json]';

/** `hush ripple`: the spectral ripple a reflection causes, or the reflection a ripple implies. */
export function rippleCommand(argv: string[], io: CommandIO): number {
  const args = parseArgs(argv, {
    amplitude: {}, distance: {}, 'peak-to-peak': {}, period: {}, 'group-index': {}, coupling: {}, json: { flag: true },
  });
  if (args.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(args.positional[0])}`);
  const ng = numberOption(args, 'group-index', 1)!;
  const c = numberOption(args, 'coupling', 1)!;
  const amp = numberOption(args, 'amplitude');
  const pp = numberOption(args, 'peak-to-peak');
  const json = args.options.has('json');
  if ((amp === undefined) === (pp === undefined)) throw new UsageError('give either --amplitude with --distance, or --peak-to-peak with --period');
  if (amp !== undefined) {
    const d = numberOption(args, 'distance');
    if (d === undefined) throw new UsageError('--amplitude needs --distance METRES (monitor to boundary)');
    const r = rippleFromReflection(amp, d, ng, c);
    if (json) io.out(JSON.stringify({ peak_to_peak: r.peakToPeak, period_hz: r.periodHz }));
    else io.out(`ripple: ${fmt(100 * r.peakToPeak)} % peak-to-peak, period ${fmt(r.periodHz)} Hz`);
  } else {
    const f = numberOption(args, 'period');
    if (f === undefined) throw new UsageError('--peak-to-peak needs --period HZ');
    const r = reflectionFromRipple(pp!, f, ng, c);
    if (json) io.out(JSON.stringify({ amplitude: r.amplitude, distance_m: r.distanceMetres }));
    else io.out(`implied |r| = ${fmt(r.amplitude)} at ${fmt(r.distanceMetres)} m from the monitor`);
  }
  return 0;
}

import { reflectionFromRipple, rippleFromReflection } from '../plan/steps';
import { UsageError } from './args';
import { fmt, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const rippleSpec: CommandSpec = {
  name: 'ripple',
  summary: 'The spectral ripple a reflection causes (peak-to-peak 4c|r|, period c/(2·n_g·L)), or the reflection and distance an observed ripple implies.',
  fields: ['amplitude', 'distance', 'peak_to_peak', 'period', 'group_index', 'coupling'],
  switches: { json: { help: 'print one line of JSON' } },
  notes: ['Give --amplitude with --distance, or --peak-to-peak with --period.'],
};

/** `hush ripple`: the spectral ripple a reflection causes, or the reflection a ripple implies. */
export function rippleCommand(argv: string[], io: CommandIO): number {
  const o = new Options(rippleSpec, argv);
  const ng = o.get<'number'>('group_index') ?? 1;
  const c = o.get<'fraction'>('coupling') ?? 1;
  const amp = o.get<'reflection'>('amplitude');
  const pp = o.get<'fraction'>('peak_to_peak');
  const json = o.flag('json');
  if ((amp === undefined) === (pp === undefined)) throw new UsageError('give either --amplitude with --distance, or --peak-to-peak with --period');
  if (amp !== undefined) {
    const d = o.get<'length'>('distance');
    if (d === undefined) throw new UsageError('--amplitude needs --distance (monitor to boundary, e.g. 10cm)');
    const r = rippleFromReflection(amp, d, ng, c);
    for (const n of o.notes) io.err(`hush ripple: note: ${n}`);
    if (json) io.out(JSON.stringify({ peak_to_peak: r.peakToPeak, period_hz: r.periodHz }));
    else io.out(`ripple: ${fmt(100 * r.peakToPeak)} % peak-to-peak, period ${fmt(r.periodHz)} Hz`);
  } else {
    const f = o.get<'frequency'>('period');
    if (f === undefined) throw new UsageError('--peak-to-peak needs --period (e.g. 1.5GHz)');
    const r = reflectionFromRipple(pp as number, f, ng, c);
    for (const n of o.notes) io.err(`hush ripple: note: ${n}`);
    if (json) io.out(JSON.stringify({ amplitude: r.amplitude, distance_m: r.distanceMetres }));
    else io.out(`implied |r| = ${fmt(r.amplitude)} at ${fmt(r.distanceMetres)} m from the monitor`);
  }
  return 0;
}

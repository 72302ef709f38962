import { defaultCourant, gridVelocity } from '../plan/steps';
import { fmt, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const dispersionSpec: CommandSpec = {
  name: 'dispersion',
  summary:
    'Numerical phase and group velocity of the Yee grid, relative to the true wave speed, for a wave of --ppw cells per wavelength (in the medium) travelling at --angle from the x axis and --azimuth about it: the exact dispersion relation solved, not its small-cell series.',
  fields: ['ppw', 'courant', 'dimensions', 'angle', 'azimuth', 'index'],
  required: ['ppw'],
  switches: { json: { help: 'print one line of JSON: phase_velocity_ratio, group_velocity_ratio, courant, dimensions, propagation_limit_ppw' } },
};

/** `hush dispersion`: the grid's phase and group velocity along one direction. */
export function dispersionCommand(argv: string[], io: CommandIO): number {
  const o = new Options(dispersionSpec, argv);
  const dimensions = o.get<'count'>('dimensions') ?? 3;
  const courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
  const v = gridVelocity({
    ppw: o.required<'number'>('ppw'),
    courant,
    dimensions,
    angleDeg: o.get<'angle'>('angle') ?? 0,
    azimuthDeg: o.get<'angle'>('azimuth') ?? 0,
    index: o.get<'number'>('index') ?? 1,
  });
  for (const n of o.notes) io.err(`hush dispersion: note: ${n}`);
  if (o.flag('json')) {
    io.out(
      JSON.stringify({
        phase_velocity_ratio: v.phaseVelocityRatio,
        group_velocity_ratio: v.groupVelocityRatio,
        courant,
        dimensions,
        propagation_limit_ppw: v.propagationLimitPpw,
      }),
    );
  } else {
    io.out(`phase velocity v_p/v = ${fmt(v.phaseVelocityRatio, 8)}  (error ${fmt((1 - v.phaseVelocityRatio) * 100, 4)} %)`);
    io.out(`group velocity v_g/v = ${fmt(v.groupVelocityRatio, 8)}  (error ${fmt((1 - v.groupVelocityRatio) * 100, 4)} %)`);
    io.out(`exact Yee dispersion, ${dimensions}-D, Courant number ${fmt(courant, 6)} (vacuum); no propagation below ${fmt(v.propagationLimitPpw, 5)} cells per wavelength along this direction`);
  }
  return 0;
}

import { amplitudeToDb } from '../plan/fields';
import { defaultCourant, designOptions, type DesignResult } from '../plan/steps';
import { fmt, fmtDb, type CommandIO } from './io';
import { Options, type CommandSpec } from './options';

export const designSpec: CommandSpec = {
  name: 'design',
  summary:
    'The thinnest CPML absorber whose worst exact discrete reflection over the band (cells per wavelength from --ppw-min to --ppw-max) and angles (0 to --angle-max) meets --target, strength optimised per grading order and checked on a denser grid.',
  fields: ['target', 'ppw_min', 'ppw_max', 'angle_max', 'courant', 'dimensions', 'index', 'orders', 'kappa_max', 'alpha_max_norm', 'alpha_order', 'max_layers'],
  required: ['target', 'ppw_min'],
  switches: { all: { help: 'list the thinnest design of every allowed grading order' }, json: { help: 'print JSON (one object, or a list with --all)' } },
};

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
  };
}

/** `hush design`: the thinnest absorber meeting a target over a band and angles. */
export function designCommand(argv: string[], io: CommandIO): number {
  const o = new Options(designSpec, argv);
  const dimensions = o.get<'count'>('dimensions') ?? 3;
  const courant = o.get<'number'>('courant') ?? defaultCourant(dimensions);
  const options = designOptions({
    target: o.required<'reflection'>('target'),
    ppwMin: o.required<'number'>('ppw_min'),
    ppwMax: o.get<'number'>('ppw_max'),
    angleMaxDeg: o.get<'angle'>('angle_max') ?? 0,
    courant,
    dimensions,
    index: o.get<'number'>('index') ?? 1,
    orders: o.get<'numbers'>('orders'),
    kappaMax: o.get<'number'>('kappa_max'),
    alphaMaxNorm: o.get<'number'>('alpha_max_norm'),
    alphaOrder: o.get<'number'>('alpha_order'),
    maxLayers: o.get<'count'>('max_layers'),
  });
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
  io.out(`exact on the grid (profiles sampled at each node's depth), ${dimensions}-D, Courant number ${fmt(courant, 6)}`);
  return 0;
}

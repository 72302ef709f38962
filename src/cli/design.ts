import { designOptions } from '../plan/steps';
import { numberOption, parseArgs, requiredNumber, stringOption, UsageError } from './args';
import { fmt, type CommandIO } from './io';

export const designUsage =
  'hush design --target R --ppw-min P1 [--ppw-max P2=P1] [--angle-max DEG=0] [--courant C] [--dimensions D=3] [--index n=1] [--orders 2,3,4] [--kappa-max K=1] [--alpha-max-norm A=0] [--alpha-order MA=1] [--max-layers L=200] [--all] [--json]';

function parseOrders(text: string | undefined): number[] | undefined {
  if (text === undefined) return undefined;
  const parts = text.split(',').map((t) => t.trim());
  const out = parts.map((p) => (/^\d+(\.\d+)?$/.test(p) ? Number(p) : NaN));
  if (out.some((x) => !Number.isFinite(x))) throw new UsageError(`--orders must be a comma-separated list of numbers such as 2,3,4 (got ${JSON.stringify(text)})`);
  return out;
}

function toJson(d: ReturnType<typeof designOptions>[number]) {
  return {
    layers: d.layers,
    order: d.order,
    strength: d.strength,
    kappa_max: d.kappaMax,
    alpha_max_norm: d.alphaMaxNorm,
    alpha_order: d.alphaOrder,
    worst_amplitude: d.worstAmplitude,
    worst_ppw: d.worstPpw,
    worst_angle_deg: d.worstAngleDeg,
    continuous_amplitude: d.continuousAmplitude,
    thickness_cells: d.thicknessCells,
  };
}

/** `hush design`: the thinnest absorber meeting a target over a band and angles. */
export function designCommand(argv: string[], io: CommandIO): number {
  const args = parseArgs(argv, {
    target: {}, 'ppw-min': {}, 'ppw-max': {}, 'angle-max': {}, courant: {}, dimensions: {}, index: {}, orders: {},
    'kappa-max': {}, 'alpha-max-norm': {}, 'alpha-order': {}, 'max-layers': {}, all: { flag: true }, json: { flag: true },
  });
  if (args.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(args.positional[0])}`);
  const options = designOptions({
    target: requiredNumber(args, 'target'),
    ppwMin: requiredNumber(args, 'ppw-min'),
    ppwMax: numberOption(args, 'ppw-max'),
    angleMaxDeg: numberOption(args, 'angle-max', 0),
    courant: numberOption(args, 'courant'),
    dimensions: numberOption(args, 'dimensions', 3),
    index: numberOption(args, 'index', 1),
    orders: parseOrders(stringOption(args, 'orders')),
    kappaMax: numberOption(args, 'kappa-max'),
    alphaMaxNorm: numberOption(args, 'alpha-max-norm'),
    alphaOrder: numberOption(args, 'alpha-order'),
    maxLayers: numberOption(args, 'max-layers'),
  });
  const all = args.options.has('all');
  if (args.options.has('json')) {
    io.out(JSON.stringify(all ? options.map(toJson) : toJson(options[0])));
    return 0;
  }
  const rows = all ? options : [options[0]];
  io.out('layers  order  strength  worst |r|   at ppw  at angle  continuous |r|');
  for (const d of rows) {
    io.out(
      `${String(d.layers).padStart(6)}  ${String(d.order).padStart(5)}  ${fmt(d.strength).padStart(8)}  ${fmt(d.worstAmplitude).padStart(9)}  ${fmt(d.worstPpw).padStart(7)}  ${(fmt(d.worstAngleDeg) + '°').padStart(8)}  ${fmt(d.continuousAmplitude).padStart(14)}`,
    );
  }
  return 0;
}

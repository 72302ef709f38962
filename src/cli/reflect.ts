import { ETA0, reflection } from '../plan/steps';
import { parseArgs, numberOption, requiredNumber, UsageError } from './args';
import { fmt, type CommandIO } from './io';

export const reflectUsage =
  'hush reflect --layers N --order M [--strength S=1] [--kappa-max K=1] [--alpha-max A=0 --cell METRES] [--alpha-order MA=1] --ppw P [--courant C] [--dimensions D=3] [--angle DEG=0] [--index n=1] [--json]';

/** `hush reflect`: exact discrete reflection of one design at one frequency and angle. */
export function reflectCommand(argv: string[], io: CommandIO): number {
  const args = parseArgs(argv, {
    layers: {}, order: {}, strength: {}, 'kappa-max': {}, 'alpha-max': {}, cell: {}, 'alpha-order': {},
    ppw: {}, courant: {}, dimensions: {}, angle: {}, index: {}, json: { flag: true },
  });
  if (args.positional.length) throw new UsageError(`unexpected argument ${JSON.stringify(args.positional[0])}`);
  const index = numberOption(args, 'index', 1)!;
  const alphaMax = numberOption(args, 'alpha-max', 0)!;
  const cell = numberOption(args, 'cell');
  if (alphaMax !== 0 && cell === undefined) throw new UsageError('--alpha-max (S/m) needs --cell METRES to normalise it');
  if (cell !== undefined && !(cell > 0)) throw new UsageError(`--cell must be a positive length in metres (got ${cell})`);
  if (alphaMax < 0) throw new UsageError(`--alpha-max must be at least 0 S/m (got ${alphaMax})`);
  // α_norm = α·η₀·Δ·n (physics.md §3).
  const alphaMaxNorm = cell === undefined ? 0 : alphaMax * ETA0 * cell * index;
  if (!Number.isFinite(alphaMaxNorm)) throw new UsageError(`--alpha-max ${alphaMax} S/m with --cell ${cell} m and --index ${index} is out of range (α·η₀·Δ·n overflows)`);
  const design = {
    layers: requiredNumber(args, 'layers'),
    order: requiredNumber(args, 'order'),
    strength: numberOption(args, 'strength', 1),
    kappaMax: numberOption(args, 'kappa-max', 1),
    alphaMaxNorm,
    alphaOrder: numberOption(args, 'alpha-order', 1),
  };
  const wave = {
    ppw: requiredNumber(args, 'ppw'),
    courant: numberOption(args, 'courant'),
    dimensions: numberOption(args, 'dimensions', 3),
    angleDeg: numberOption(args, 'angle', 0),
    index,
  };
  const r = reflection(design, wave);
  if (args.options.has('json')) {
    io.out(JSON.stringify({ amplitude: r.amplitude, phase_deg: r.phaseDeg, continuous: r.continuous, alpha_max_norm: alphaMaxNorm }));
  } else {
    io.out(`amplitude reflection |r| = ${fmt(r.amplitude)}  (phase ${fmt(r.phaseDeg)}°)`);
    io.out(`continuous theory        = ${fmt(r.continuous)}  (ignores the grid)`);
  }
  return 0;
}

/** The absorber a command is given by its options (--layers, --order, --strength, --kappa-max, --alpha-max-norm, --alpha-order). */
import type { AbsorberDesign } from '../plan/steps';
import type { Options } from './options';

export function absorberFromOptions(o: Options): AbsorberDesign {
  return {
    layers: o.required<'count'>('layers'),
    order: o.required<'number'>('order'),
    strength: o.get<'number'>('strength'),
    kappaMax: o.get<'number'>('kappa_max'),
    alphaMaxNorm: o.get<'number'>('alpha_max_norm'),
    alphaOrder: o.get<'number'>('alpha_order'),
  };
}

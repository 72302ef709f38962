/**
 * Columns of the rows the worksheet functions spill: HUSH.DESIGN's design row
 * (its header from HUSH.DESIGN_HEADER) and HUSH.PLAN's plan row (the plan API's
 * output columns, planHeaderText). Columns the design row shares with the
 * plan row carry the same header text.
 */
import type { DesignResult } from '../plan/steps';
import { OUTPUT_COLUMNS, outputHeaderText, type OutputColumn } from '../plan';

function planColumn(name: string): OutputColumn {
  const c = OUTPUT_COLUMNS.find((col) => col.name === name);
  if (!c) throw new Error(`no plan output column ${name}`);
  return c;
}

export interface DesignColumn {
  header: string;
  value: (d: DesignResult) => number;
}

/** HUSH.DESIGN's row, in order. */
export const DESIGN_COLUMNS: readonly DesignColumn[] = [
  { header: outputHeaderText(planColumn('layers')), value: (d) => d.layers },
  { header: outputHeaderText(planColumn('order')), value: (d) => d.order },
  { header: outputHeaderText(planColumn('strength')), value: (d) => d.strength },
  { header: 'kappa_max', value: (d) => d.kappaMax },
  { header: 'alpha_max_norm [α·η₀·Δ·n]', value: (d) => d.alphaMaxNorm },
  { header: 'alpha_order', value: (d) => d.alphaOrder },
  { header: outputHeaderText(planColumn('worst_reflection')), value: (d) => d.worstAmplitude },
  { header: 'worst_ppw [cells/λ]', value: (d) => d.worstPpw },
  { header: 'worst_angle [deg]', value: (d) => d.worstAngleDeg },
  { header: outputHeaderText(planColumn('continuous_reflection')), value: (d) => d.continuousAmplitude },
];

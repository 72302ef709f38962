/**
 * The accuracy breakdown of the selected study: where its tolerated error
 * goes (a stacked bar of the absorber's, the dispersion's and the run
 * length's parts against the tolerance) and what the split's candidate cells
 * cost (the cheapest plan found at each cell the search looked at, the
 * planned one marked). Pure: the model and the SVG markup are built from the
 * plan API's AccuracyPlan; the pane puts the markup in its page.
 */
import type { Plan } from './plan-adapter';

export interface BudgetSegment {
  key: 'absorber' | 'dispersion' | 'run' | 'unused';
  label: string;
  /** The part of the tolerance it takes (0..1): its error over the tolerance when errors add, its squared ratio in quadrature. */
  fraction: number;
  /** Its intensity error (fraction), null for the unused part. */
  error: number | null;
}

/** The three parts and what is left, as shares of the tolerance (they sum to 1). */
export function budgetSegments(plan: Plan): BudgetSegment[] {
  const a = plan.accuracy;
  const s = a.shares;
  const parts: BudgetSegment[] = [
    { key: 'absorber', label: 'absorber', fraction: s.absorber, error: a.errors.absorber },
    { key: 'dispersion', label: 'dispersion', fraction: s.dispersion, error: a.errors.dispersion },
    { key: 'run', label: 'run length', fraction: s.run, error: a.errors.run },
  ];
  const used = parts.reduce((t, p) => t + p.fraction, 0);
  // Rounding can put the sum a hair above 1 when a part takes all the rest.
  const scale = used > 1 ? 1 / used : 1;
  for (const p of parts) p.fraction *= scale;
  parts.push({ key: 'unused', label: 'unused', fraction: Math.max(0, 1 - used * scale), error: null });
  return parts;
}

export interface CellPoint {
  /** Cell size in nm. */
  cellNm: number;
  cost: number;
  planned: boolean;
}

/** The split's candidate cells that have a plan, with their cheapest cost (in the plan's cost measure). */
export function cellPoints(plan: Plan): CellPoint[] {
  const a = plan.accuracy;
  const points = a.cells
    .filter((c) => c.cost !== null && Number.isFinite(c.cost))
    .map((c) => ({ cellNm: c.cell * 1e9, cost: c.cost as number, planned: Math.abs(c.cell - a.cell) <= 1e-12 * a.cell }));
  if (!points.some((p) => p.planned)) points.push({ cellNm: a.cell * 1e9, cost: a.cost, planned: true });
  return points.sort((p, q) => p.cellNm - q.cellNm);
}

function escape(t: string): string {
  return t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function num(x: number): string {
  return Number(x.toFixed(2)).toString();
}

function short(x: number): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e4 || a < 1e-2 ? x.toExponential(1) : Number(x.toPrecision(3)).toString();
}

/** The stacked bar as SVG markup, `width` px wide, labelled below. */
export function budgetBarSvg(segments: readonly BudgetSegment[], tolerance: number, width = 300): string {
  const h = 18;
  let x = 0;
  const rects: string[] = [];
  const legend: string[] = [];
  segments.forEach((s, k) => {
    const w = s.fraction * width;
    if (w > 0) rects.push(`<rect class="seg seg-${s.key}" x="${num(x)}" y="0" width="${num(w)}" height="${h}"><title>${escape(s.label)}: ${short(s.fraction * 100)} % of the tolerance</title></rect>`);
    x += w;
    const text = s.error === null ? `${escape(s.label)} ${short(s.fraction * 100)} %` : `${escape(s.label)} ${short(s.error * 100)} %`;
    legend.push(`<g transform="translate(${(k % 2) * (width / 2)},${h + 8 + Math.floor(k / 2) * 16})"><rect class="seg seg-${s.key}" width="10" height="10"/><text x="14" y="9">${text}</text></g>`);
  });
  const total = h + 8 + 2 * 16;
  return (
    `<svg class="budget-bar" viewBox="0 0 ${width} ${total}" width="100%" role="img" aria-label="Error split against the tolerance of ${short(tolerance * 100)} %">` +
    `${rects.join('')}<line class="tolerance" x1="${width}" y1="0" x2="${width}" y2="${h}"/>${legend.join('')}</svg>`
  );
}

/** Cost against cell size for the split's candidate cells (log cost axis when it spans more than 10×), the planned cell marked. */
export function cellCostSvg(points: readonly CellPoint[], costLabel: string, width = 300, height = 150): string {
  if (points.length === 0) return '';
  const left = 46;
  const bottom = 30;
  const top = 8;
  const right = 8;
  const xs = points.map((p) => p.cellNm);
  const ys = points.map((p) => p.cost);
  const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
  const [y0, y1] = [Math.min(...ys), Math.max(...ys)];
  const log = y0 > 0 && y1 / y0 > 10;
  const fy = (y: number) => (log ? Math.log10(y) : y);
  const [a, b] = [fy(y0), fy(y1)];
  const sx = (x: number) => left + (x1 === x0 ? 0.5 : (x - x0) / (x1 - x0)) * (width - left - right);
  const sy = (y: number) => top + (b === a ? 0.5 : 1 - (fy(y) - a) / (b - a)) * (height - top - bottom);
  const line = points.map((p, k) => `${k ? 'L' : 'M'}${num(sx(p.cellNm))},${num(sy(p.cost))}`).join('');
  const dots = points
    .map((p) => `<circle class="${p.planned ? 'planned' : 'candidate'}" cx="${num(sx(p.cellNm))}" cy="${num(sy(p.cost))}" r="${p.planned ? 5 : 3}"><title>${short(p.cellNm)} nm: ${short(p.cost)}${p.planned ? ' (planned)' : ''}</title></circle>`)
    .join('');
  const axis = `<line class="axis" x1="${left}" y1="${height - bottom}" x2="${width - right}" y2="${height - bottom}"/><line class="axis" x1="${left}" y1="${top}" x2="${left}" y2="${height - bottom}"/>`;
  const ticks =
    `<text class="tick" x="${left}" y="${height - bottom + 12}" text-anchor="middle">${short(x0)}</text>` +
    (x1 > x0 ? `<text class="tick" x="${width - right}" y="${height - bottom + 12}" text-anchor="end">${short(x1)}</text>` : '') +
    `<text class="tick" x="${left - 4}" y="${num(sy(y1)) }" text-anchor="end" dominant-baseline="middle">${short(y1)}</text>` +
    (y1 > y0 ? `<text class="tick" x="${left - 4}" y="${num(sy(y0))}" text-anchor="end" dominant-baseline="middle">${short(y0)}</text>` : '');
  const labels =
    `<text class="label" x="${(left + width - right) / 2}" y="${height - 4}" text-anchor="middle">cell [nm]</text>` +
    `<text class="label" transform="translate(10,${(top + height - bottom) / 2}) rotate(-90)" text-anchor="middle">${escape(costLabel)}${log ? ' (log)' : ''}</text>`;
  return `<svg class="cell-cost" viewBox="0 0 ${width} ${height}" width="100%" role="img" aria-label="Cheapest plan at each candidate cell size">${axis}<path class="curve" d="${line}"/>${dots}${ticks}${labels}</svg>`;
}

/** The y-axis label of the cost chart, from the split's cost measure. */
export function costLabel(plan: Plan): string {
  switch (plan.accuracy.measure) {
    case 'price':
      return 'cost (estimate)';
    case 'runtime':
      return 'runtime [h] (estimate)';
    case 'cell updates':
      return 'cell updates';
    default:
      return 'cells';
  }
}

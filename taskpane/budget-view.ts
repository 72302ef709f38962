/**
 * The accuracy breakdown of the selected study: where its tolerated error
 * goes (a stacked bar of the absorber's, the dispersion's and the run
 * length's parts against the tolerance) and what the split's candidate cells
 * cost (the cheapest plan found at each cell the search looked at, the
 * planned one marked). Pure: the model and the SVG markup are built from the
 * plan API's AccuracyPlan; the pane puts the markup in its page.
 */
import type { Plan } from './plan-adapter';
import { sig } from './format';

export interface BudgetSegment {
  key: 'absorber' | 'dispersion' | 'run' | 'unused';
  label: string;
  /** The part of the tolerance it takes (0..1): its error over the tolerance when errors add, its squared ratio in quadrature. */
  fraction: number;
  /** Its intensity error (fraction); for the unused part, the error that could still be added. */
  error: number;
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
  // What is left, as intensity error that could still be added (errors add, or combine in quadrature).
  const left = Math.max(0, 1 - used * scale);
  const tol = plan.inputs.intensityError;
  parts.push({ key: 'unused', label: 'unused', fraction: left, error: plan.inputs.phase === 'worst' ? left * tol : Math.sqrt(left) * tol });
  return parts;
}

export interface CellPoint {
  /** Cell size in nm. */
  cellNm: number;
  /** The cheapest plan found at this cell; for a pruned cell, the lower bound that ruled it out; null where no plan can meet the tolerance. */
  cost: number | null;
  kind: 'planned' | 'costed' | 'at least' | 'infeasible';
}

/** The split's candidate cells: planned and costed ones, pruned ones at their lower bound, infeasible ones without a cost. */
export function cellPoints(plan: Plan): CellPoint[] {
  const a = plan.accuracy;
  const same = (x: number) => Math.abs(x - a.cell) <= 1e-12 * a.cell;
  const points: CellPoint[] = a.cells.map((c) =>
    same(c.cell)
      ? { cellNm: c.cell * 1e9, cost: c.cost ?? a.cost, kind: 'planned' }
      : c.cost !== null
        ? { cellNm: c.cell * 1e9, cost: c.cost, kind: 'costed' }
        : c.lowerBound !== null
          ? { cellNm: c.cell * 1e9, cost: c.lowerBound, kind: 'at least' }
          : { cellNm: c.cell * 1e9, cost: null, kind: 'infeasible' },
  );
  if (!points.some((p) => p.kind === 'planned')) points.push({ cellNm: a.cell * 1e9, cost: a.cost, kind: 'planned' });
  return points.sort((p, q) => p.cellNm - q.cellNm);
}

function escape(t: string): string {
  return t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function num(x: number): string {
  return Number(x.toFixed(2)).toString();
}


/** The stacked bar as SVG markup, `width` px wide, labelled below. */
export function budgetBarSvg(segments: readonly BudgetSegment[], tolerance: number, width = 300): string {
  const h = 18;
  let x = 0;
  const rects: string[] = [];
  const legend: string[] = [];
  segments.forEach((s, k) => {
    const w = s.fraction * width;
    if (w > 0) rects.push(`<rect class="seg seg-${s.key}" x="${num(x)}" y="0" width="${num(w)}" height="${h}"><title>${escape(s.label)}: ${sig(s.fraction * 100)} % of the tolerance</title></rect>`);
    x += w;
    const text = `${escape(s.label)} ${sig(s.error * 100)} %`;
    legend.push(`<g transform="translate(${(k % 2) * (width / 2)},${h + 8 + Math.floor(k / 2) * 16})"><rect class="seg seg-${s.key}" width="10" height="10"/><text x="14" y="9">${text}</text></g>`);
  });
  const total = h + 8 + 2 * 16;
  return (
    `<svg class="budget-bar" viewBox="0 0 ${width} ${total}" width="100%" role="img" aria-label="Error split against the tolerance of ${sig(tolerance * 100)} %">` +
    `${rects.join('')}<line class="tolerance" x1="${width}" y1="0" x2="${width}" y2="${h}"/>${legend.join('')}</svg>`
  );
}

/**
 * Cost against cell size for the split's candidate cells (log cost axis when
 * it spans more than 10×): the planned cell filled, other planned cells as
 * dots, pruned cells hollow at the lower bound that ruled them out, cells
 * where no plan meets the tolerance as crosses on the axis.
 */
export function cellCostSvg(points: readonly CellPoint[], costLabel: string, width = 300, height = 160): string {
  const priced = points.filter((p) => p.cost !== null && Number.isFinite(p.cost) && p.cost > 0) as (CellPoint & { cost: number })[];
  if (priced.length === 0) return '';
  const left = 56;
  const bottom = 44;
  const top = 8;
  const right = 8;
  const xs = points.map((p) => p.cellNm);
  const ys = priced.map((p) => p.cost);
  const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
  const [y0, y1] = [Math.min(...ys), Math.max(...ys)];
  const log = y1 / y0 > 10;
  const fy = (y: number) => (log ? Math.log10(y) : y);
  const [a, b] = [fy(y0), fy(y1)];
  const base = height - bottom;
  const sx = (x: number) => left + (x1 === x0 ? 0.5 : (x - x0) / (x1 - x0)) * (width - left - right);
  const sy = (y: number) => top + (b === a ? 0.5 : 1 - (fy(y) - a) / (b - a)) * (base - top);
  const line = priced.map((p, k) => `${k ? 'L' : 'M'}${num(sx(p.cellNm))},${num(sy(p.cost))}`).join('');
  const marks = points
    .map((p) => {
      const x = num(sx(p.cellNm));
      if (p.cost === null) return `<path class="infeasible" d="M${num(sx(p.cellNm) - 3)},${base - 3}l6,6m0,-6l-6,6"><title>${sig(p.cellNm)} nm: no plan meets the tolerance</title></path>`;
      const tip = `${sig(p.cellNm)} nm: ${p.kind === 'at least' ? 'at least ' : ''}${sig(p.cost)}${p.kind === 'planned' ? ' (planned)' : ''}`;
      return `<circle class="${p.kind === 'at least' ? 'bound' : p.kind === 'planned' ? 'planned' : 'candidate'}" cx="${x}" cy="${num(sy(p.cost))}" r="${p.kind === 'planned' ? 5 : 3}"><title>${tip}</title></circle>`;
    })
    .join('');
  const axis = `<line class="axis" x1="${left}" y1="${base}" x2="${width - right}" y2="${base}"/><line class="axis" x1="${left}" y1="${top}" x2="${left}" y2="${base}"/>`;
  const ticks =
    `<text class="tick" x="${left}" y="${base + 12}" text-anchor="start">${sig(x0)}</text>` +
    (x1 > x0 ? `<text class="tick" x="${width - right}" y="${base + 12}" text-anchor="end">${sig(x1)}</text>` : '') +
    `<text class="tick" x="${left - 4}" y="${num(sy(y1) + 3)}" text-anchor="end">${sig(y1)}</text>` +
    (y1 > y0 ? `<text class="tick" x="${left - 4}" y="${num(sy(y0) + 3)}" text-anchor="end">${sig(y0)}</text>` : '');
  const labels =
    `<text class="label" x="${(left + width - right) / 2}" y="${base + 24}" text-anchor="middle">cell [nm]</text>` +
    `<text class="label" transform="translate(10,${(top + base) / 2}) rotate(-90)" text-anchor="middle">${escape(costLabel)}${log ? ' (log)' : ''}</text>`;
  const legend = [
    ['planned', 'planned'],
    ['bound', 'at least (pruned)'],
    ...(points.some((p) => p.cost === null) ? [['infeasible', 'no plan']] : []),
  ]
    .map(([c, t], k) => `<g transform="translate(${[12, 80, 200][k]},${height - 6})">${c === 'infeasible' ? `<path class="infeasible" d="M-3,-7l6,6m0,-6l-6,6"/>` : `<circle class="${c}" cx="0" cy="-4" r="3.5"/>`}<text x="7" y="0">${t}</text></g>`)
    .join('');
  return `<svg class="cell-cost" viewBox="0 0 ${width} ${height}" width="100%" role="img" aria-label="Cheapest plan at each candidate cell size">${axis}<path class="curve" d="${line}"/>${marks}${ticks}${labels}${legend}</svg>`;
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

/** The study panel: inputs as read (with units), the budget and the warnings. */
import type { Plan } from './plan-adapter';
import { inputUnit, isInputField } from './plan-adapter';
import type { RowValues } from '../src/workbook/types';
import { byId, el } from './dom';
import { cellText, sig } from './format';
import { budgetBarSvg, budgetSegments, cellCostSvg, cellPoints, costLabel } from './budget-view';

export function renderStudy(plan: Plan, values: RowValues): void {
  const i = plan.inputs;
  const g = plan.grid;
  const budget = byId('budget');
  budget.textContent = '';
  const dl = el('dl', { class: 'budget' });
  const pair = (k: string, v: string) => dl.append(el('dt', {}, k), el('dd', {}, v));
  const faces = i.facesSeen === 1 ? 'one absorbing face' : `${i.facesSeen} absorbing faces (${i.phase === 'worst' ? 'amplitudes add' : 'random phases'})`;
  pair('Tolerated error', `${sig(i.intensityError * 100)} % in intensity at the monitor`);
  pair('Echo path', `coupling ${sig(i.coupling)}, ${faces}${i.share !== null ? `, ${sig(i.share * 100)} % of the budget (share)` : ''}`);
  pair('Required |r|', `${sig(plan.requiredReflection)} per face (amplitude)`);
  const e = plan.accuracy.errors;
  pair('Error split', `absorber ${sig(e.absorber * 100)} %, dispersion ${sig(e.dispersion * 100)} %, run ${sig(e.run * 100)} % (${i.phase === 'worst' ? 'added' : 'in quadrature'}: ${sig(e.combined * 100)} %)`);
  pair('Band', `${g.ppwLong === g.ppwShort ? sig(g.ppwShort) : `${sig(g.ppwShort)} to ${sig(g.ppwLong)}`} cells per wavelength in the background (n = ${sig(i.index)})`);
  pair('Angles', i.dimensions === 1 ? 'normal incidence (1-D)' : `0° to ${sig(i.angleMaxDeg)}°`);
  pair('Grid', `${i.dimensions}-D, Courant number ${sig(i.courant)} (limit ${sig(g.courantLimit)})`);
  budget.appendChild(dl);

  // The breakdown: markup built from numbers and our own labels only (budget-view.ts escapes text).
  byId('accuracy-bar').innerHTML = budgetBarSvg(budgetSegments(plan), i.intensityError);
  const points = cellPoints(plan);
  const several = points.filter((p) => p.cost !== null).length > 1;
  byId('cell-cost').innerHTML = several ? cellCostSvg(points, costLabel(plan)) : '';
  byId('cell-cost').hidden = !several;
  byId('cell-cost-title').hidden = !several;

  const ul = byId('warnings');
  ul.textContent = '';
  for (const w of plan.warnings) ul.appendChild(el('li', {}, w));

  const table = byId('inputs');
  table.textContent = '';
  for (const [k, v] of Object.entries(values)) {
    const text = cellText(v);
    if (text.trim() === '' || !isInputField(k)) continue;
    const unit = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text.trim()) ? inputUnit(k) : '';
    table.appendChild(el('tr', {}, el('td', {}, k), el('td', {}, unit ? `${text} ${unit}` : text)));
  }
}

/**
 * The task pane: the study of one project row, its absorber options, curves of
 * the highlighted option, a time-domain verification in a worker, and Apply.
 *
 * In Excel it reads the selected row through the Office.js workbook; outside
 * Excel (no Office host, or ?preview) it works on the embedded demo project
 * in an in-page table. The logic below is the same for both (src/workbook).
 */
import { MODEL_VERSION, type AbsorberDesign } from '../src/plan/steps';
import { APP_VERSION, parseCsv } from '../src/plan';
import { MemoryWorkbook } from '../src/workbook/memory';
import { OfficeWorkbook } from '../src/workbook/office';
import type { CellValue, SelectedRow, Workbook } from '../src/workbook/types';
import { renderChart, type Chart, type ChartSpec } from './charts';
import { angleAxisEnd, ppwAxis, reflectionVsAngle, reflectionVsPpw, type GridOfStudy } from './curves';
import { DEMO_PROJECT_CSV } from './demo-table';
import { byId, el, show } from './dom';
import { applyHeadline, decibels, hours, money, percent, sig, themeLabel } from './format';
import { OUTPUT_COLUMNS, TABLE_SCHEMA, optionPlans, outputValues, studyPlan, type OptionPlan, type Plan } from './plan-adapter';
import { checkExcelApi } from './requirements';
import { renderStudy } from './study-view';
import { chartColours, officeTheme, systemTheme, type Theme } from './theme';
import { CancelledError, Verifier } from './verify';
import { largestRelativeDifference, type MeasuredPoint, type VerifyGrid } from './verify-protocol';
import { AGREEMENT } from '../src/plan/verify-compare';

export { AGREEMENT };

interface State {
  workbook: Workbook;
  row: SelectedRow | null;
  plan: Plan | null;
  options: OptionPlan[];
  highlighted: number;
  measured: Map<number, MeasuredPoint[]>;
  verifyNotes: Map<number, string[]>;
  charts: Chart[];
  theme: 'auto' | Theme;
}

const state: State = {
  workbook: undefined as unknown as Workbook,
  row: null,
  plan: null,
  options: [],
  highlighted: -1,
  measured: new Map(),
  verifyNotes: new Map(),
  charts: [],
  theme: 'auto',
};

const verifier = new Verifier();

function isPreview(): boolean {
  return /[?&]preview(=|&|$)/.test(location.search);
}

function message(text: string, isError = false): void {
  const m = byId('message');
  m.textContent = text;
  m.classList.toggle('error', isError);
}

function errorText(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

// ---------------------------------------------------------------- theme

function effectiveTheme(): Theme {
  if (state.theme !== 'auto') return state.theme;
  return officeTheme() ?? systemTheme();
}

function applyTheme(): void {
  document.documentElement.dataset.theme = effectiveTheme();
  const t = byId('theme-toggle');
  const label = themeLabel(state.theme, effectiveTheme());
  t.textContent = label.text;
  t.setAttribute('aria-label', label.aria);
  t.title = label.aria;
  renderCharts();
}

// ---------------------------------------------------------------- demo table

function demoWorkbook(): MemoryWorkbook {
  const rows = parseCsv(DEMO_PROJECT_CSV);
  const header = rows[0].map((h) => h.trim());
  // Output columns the demo sheet does not have yet are added empty, as `hush plan` adds them.
  const have = new Set(header.map((h) => TABLE_SCHEMA.normalise!(h)));
  const added = OUTPUT_COLUMNS.filter((c) => !have.has(c.name)).map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name));
  const data: CellValue[][] = rows.slice(1).map((r) => [...header.map((_, k) => r[k] ?? ''), ...added.map(() => '')]);
  return new MemoryWorkbook([...header, ...added], data, TABLE_SCHEMA, 'demo');
}

function renderDemoTable(wb: MemoryWorkbook, written: Array<[number, number]> = []): void {
  const table = byId('demo-table');
  table.textContent = '';
  const mark = new Set(written.map(([r, c]) => `${r}:${c}`));
  table.appendChild(el('thead', {}, el('tr', {}, el('th', { scope: 'col' }, '#'), ...wb.header.map((h) => el('th', { scope: 'col' }, h)))));
  const body = el('tbody');
  wb.rows.forEach((r, ri) => {
    const tr = el('tr', { 'data-row': String(ri) }, el('th', { scope: 'row' }, String(ri + 1)));
    if (ri === wb.selectedRow) tr.classList.add('selected');
    r.forEach((v, ci) => {
      const td = el('td', { 'data-col': String(ci) }, typeof v === 'number' ? sig(v, 6) : String(v));
      td.dataset.value = String(v);
      if (mark.has(`${ri}:${ci}`)) td.classList.add('written');
      tr.appendChild(td);
    });
    body.appendChild(tr);
  });
  table.appendChild(body);
}

function setUpDemo(): void {
  const wb = demoWorkbook();
  state.workbook = wb;
  const picker = byId<HTMLSelectElement>('row-picker');
  picker.textContent = '';
  wb.rows.forEach((_, i) => {
    const study = String(wb.cell(i, 'study'));
    picker.appendChild(el('option', { value: String(i) }, `${i + 1}. ${study}`));
  });
  picker.addEventListener('change', () => {
    wb.select(Number(picker.value));
    renderDemoTable(wb);
    void loadRow();
  });
  wb.onChange((cells) => renderDemoTable(wb, cells));
  renderDemoTable(wb);
  show('picker', true);
  show('demo-box', true);
  show('theme-toggle', true);
  byId('where').textContent = 'Outside Excel: working on the embedded demo project (invented lab scenario). Apply writes to the table below.';
}

function setUpExcel(): void {
  state.workbook = new OfficeWorkbook(TABLE_SCHEMA);
  byId('where').textContent = 'In Excel: select a cell in a study row of your project table, then read it.';
  const api = checkExcelApi((name, version) => Office.context.requirements.isSetSupported(name, version));
  byId('api-message').textContent = api.message;
  // Without the required sets the pane's Excel buttons would fail at their first call: they stay hidden.
  if (api.missing.length) return;
  show('excel-read', true);
  show('insert-box', true);
  byId('read-selection').addEventListener('click', () => void loadRow());
  const notes = api.skipped.every((n) => n.version !== '1.18');
  byId('insert-table').addEventListener('click', () => void insertTable(notes));
}

/** Asks a yes/no question inside the pane (Office add-ins have no window.confirm). */
function askInPane(question: string): Promise<boolean> {
  const box = byId('insert-confirm');
  byId('insert-question').textContent = question;
  box.hidden = false;
  const yes = byId<HTMLButtonElement>('insert-yes');
  const no = byId<HTMLButtonElement>('insert-no');
  no.focus();
  return new Promise((resolve) => {
    const done = (answer: boolean) => {
      box.hidden = true;
      yes.removeEventListener('click', onYes);
      no.removeEventListener('click', onNo);
      resolve(answer);
    };
    const onYes = () => done(true);
    const onNo = () => done(false);
    yes.addEventListener('click', onYes);
    no.addEventListener('click', onNo);
  });
}

async function insertTable(notes: boolean): Promise<void> {
  const button = byId<HTMLButtonElement>('insert-table');
  const out = byId('insert-result');
  button.disabled = true;
  out.className = 'result';
  out.textContent = '';
  try {
    // Loaded on first use: the starter table and its notes are not part of the page's own JavaScript.
    const { insertStarterTable } = await import(/* webpackChunkName: "insert-table" */ './insert-table');
    const r = await insertStarterTable(Excel, askInPane, notes);
    out.className = `result ${r.written ? 'ok' : ''}`;
    out.textContent = r.written
      ? `Wrote the project table at ${r.sheet}!${r.area.split(':')[0]}: header, an invented example row (replace it with your studies) and its HUSH.PLAN outputs.` +
        (r.notes ? ' Hover a header for its meaning and unit.' : ' Header notes were left out: this Excel lacks ExcelApi 1.18 (notes).')
      : 'Nothing written: the sheet is as it was.';
  } catch (e) {
    out.className = 'result bad';
    out.textContent = `Insert project table failed: ${errorText(e)}`;
  } finally {
    button.disabled = false;
  }
}

// ---------------------------------------------------------------- study and options

async function loadRow(): Promise<void> {
  verifier.cancel();
  resetVerify();
  byId('apply-result').textContent = '';
  message('');
  state.row = null;
  state.plan = null;
  state.options = [];
  state.measured.clear();
  state.verifyNotes.clear();
  try {
    state.row = await state.workbook.readSelectedRow();
    state.plan = studyPlan(state.row.values);
  } catch (e) {
    for (const id of ['study', 'options-box', 'curves-box', 'verify-box', 'apply-box']) show(id, false);
    message(state.row ? `${state.row.label}: ${errorText(e)}` : errorText(e), true);
    return;
  }
  state.options = optionPlans(state.plan);
  state.highlighted = Math.max(0, state.options.findIndex((o) => o.recommended));
  renderStudy(state.plan, state.row.values);
  byId('study-title').textContent = `Study: ${state.row.label}`;
  for (const id of ['study', 'options-box', 'curves-box', 'verify-box', 'apply-box']) show(id, true);
  renderOptions();
  renderCharts();
}

function gridOf(plan: Plan): GridOfStudy {
  return { courant: plan.inputs.courant, dimensions: plan.inputs.dimensions, index: plan.inputs.index };
}

function designOf(plan: Plan): AbsorberDesign {
  const d = plan.design;
  return { layers: d.layers, order: d.order, strength: d.strength, kappaMax: d.kappaMax, alphaMaxNorm: d.alphaMaxNorm, alphaOrder: d.alphaOrder };
}

function optionName(o: OptionPlan): string {
  return `m = ${o.order}${o.alphaMax > 0 ? `, CFS α = ${sig(o.alphaMax)} S/m` : ''}`;
}

/** The grading cell of the options table: order, and the CFS α on a second line. */
function optionCell(o: OptionPlan): HTMLElement {
  const td = el('td', {}, `m = ${o.order}`);
  if (o.alphaMax > 0) td.append(el('br'), el('span', { class: 'small' }, `α ${sig(o.alphaMax)} S/m`));
  return td;
}

/** What the cost axis shows: the price when the row has one, else the runtime, else the cell count. */
function costMeasure(plan: Plan): { label: string; value: (p: Plan) => number | null } {
  if (plan.cost.runtime && plan.cost.runtime.cost !== null) {
    return { label: "cost (estimate, price's currency)", value: (p) => p.cost.runtime?.cost ?? null };
  }
  if (plan.cost.runtime) {
    // A unit that keeps the ticks short: hours, minutes or seconds, from this study's runtime.
    const t = plan.cost.runtime.totalSeconds;
    const [unit, scale] = t >= 3600 ? ['h', 3600] : t >= 60 ? ['min', 60] : ['s', 1];
    return { label: `runtime (${unit}, estimate)`, value: (p) => (p.cost.runtime ? p.cost.runtime.totalSeconds / scale : null) };
  }
  return { label: 'cells (total)', value: (p) => p.cost.domain.cellsTotal };
}

function renderOptions(): void {
  const body = byId('options').querySelector('tbody')!;
  body.textContent = '';
  state.options.forEach((o, k) => {
    const p = o.plan;
    const radio = el('input', { type: 'radio', name: 'option', value: String(k), 'aria-label': `Highlight ${optionName(o)}` }) as HTMLInputElement;
    radio.checked = k === state.highlighted;
    radio.disabled = !p;
    radio.addEventListener('change', () => highlight(k));
    const name = optionCell(o);
    if (o.recommended) name.append(el('br'), el('span', { class: 'badge', title: 'what the plan recommends for this row' }, 'recommended'));
    const tr = el('tr', { 'data-option': String(k) }, el('td', {}, radio), name);
    if (p) {
      const rt = p.cost.runtime;
      // data-value keeps the plan's exact number beside the rounded text.
      const cell = (field: string, value: number | null, text: string) => el('td', { 'data-field': field, 'data-value': value === null ? '' : String(value) }, text);
      const worst = cell('worst', p.design.worstAmplitude, sig(p.design.worstAmplitude));
      worst.append(el('br'), el('span', { class: 'small', 'data-field': 'worst-db' }, decibels(p.design.worstAmplitude)));
      tr.append(
        cell('layers', p.design.layers, String(p.design.layers)),
        worst,
        cell('overhead', p.cost.domain.overheadPercent, percent(p.cost.domain.overheadPercent)),
        // Runtime and cost share a column (two lines) so the table fits a 320 px pane.
        el(
          'td',
          {},
          el('span', { 'data-field': 'runtime', 'data-value': rt ? String(rt.totalSeconds / 3600) : '' }, rt ? hours(rt.totalSeconds / 3600) : '—'),
          el('br'),
          el('span', { class: 'small', 'data-field': 'cost', 'data-value': rt && rt.cost !== null ? String(rt.cost) : '' }, rt && rt.cost !== null ? money(rt.cost) : '—'),
        ),
      );
      tr.addEventListener('click', (ev) => {
        if (ev.target !== radio) {
          radio.checked = true;
          highlight(k);
        }
      });
    } else {
      tr.classList.add('unavailable');
      tr.appendChild(el('td', { colspan: '4', class: 'small' }, o.error ?? 'no design'));
    }
    if (o.recommended) tr.classList.add('recommended');
    if (k === state.highlighted) tr.classList.add('highlighted');
    body.appendChild(tr);
  });
}

function highlight(k: number): void {
  if (k === state.highlighted || !state.options[k]?.plan) return;
  verifier.cancel();
  resetVerify();
  byId('apply-result').textContent = '';
  state.highlighted = k;
  byId('options')
    .querySelectorAll('tbody tr')
    .forEach((tr, i) => tr.classList.toggle('highlighted', i === k));
  renderCharts();
  const prev = state.measured.get(k);
  if (prev) showVerifyResult(prev, null, state.verifyNotes.get(k));
}

// ---------------------------------------------------------------- charts

function chartWidth(): number {
  const w = byId('options-box').clientWidth || byId('app').clientWidth || 320;
  return Math.max(260, Math.min(680, w));
}

function renderCharts(): void {
  state.charts.forEach((c) => c.destroy());
  state.charts = [];
  const plan = state.plan;
  const opt = state.options[state.highlighted];
  if (!plan || !opt?.plan) return;
  const colours = chartColours();
  const width = chartWidth();
  const target = plan.requiredReflection;
  const targetLine = { kind: 'target' as const, colour: colours.target, label: `target |r| = ${sig(target)}` };
  const angleMax = plan.inputs.angleMaxDeg;
  const angleLine = { kind: 'angle' as const, colour: colours.angle, label: `study's largest angle, ${sig(angleMax)}°` };
  const bandLine = {
    kind: 'band' as const,
    colour: colours.band,
    label: plan.grid.ppwLong === plan.grid.ppwShort ? `study's frequency, ${sig(plan.grid.ppwShort)} cells/λ` : `band edges, ${sig(plan.grid.ppwShort)} and ${sig(plan.grid.ppwLong)} cells/λ`,
  };

  // Cost against worst reflection, every option a point.
  const measure = costMeasure(plan);
  const avail = state.options.map((o, k) => ({ o, k })).filter((x) => x.o.plan);
  const pts = (filter: (k: number, o: OptionPlan) => boolean) => {
    const sel = avail.filter((x) => filter(x.k, x.o));
    return { x: sel.map((x) => x.o.plan!.design.worstAmplitude), y: sel.map((x) => measure.value(x.o.plan!)) };
  };
  const costSpec: ChartSpec = {
    title: `${measure.label} against worst amplitude reflection for ${avail.length} options; target ${sig(target)}`,
    xLabel: 'worst |r| (amplitude ratio)',
    yLabel: measure.label,
    xLog: true,
    series: [
      { label: 'option', ...pts(() => true), colour: colours.option, points: true, pointSize: 7 },
      { label: 'recommended', ...pts((_, o) => o.recommended), colour: colours.recommended, points: true, pointSize: 11, ring: true },
      { label: 'highlighted', ...pts((k) => k === state.highlighted), colour: colours.highlight, points: true, pointSize: 16, ring: true },
    ],
    lines: [{ axis: 'x', value: target, ...targetLine }],
  };
  state.charts.push(renderChart(byId('chart-cost'), costSpec, colours, width, 200));
  byId('caption-cost').textContent = `${measure.label[0].toUpperCase()}${measure.label.slice(1)} against worst reflection for every option.`;

  const design = designOf(opt.plan);
  const grid = gridOf(plan);
  const measured = state.measured.get(state.highlighted) ?? [];
  const m2 = measured.filter((p) => p.run === '2-D');
  const m1 = measured.filter((p) => p.run === '1-D');

  // Against angle, at the design's worst cells per wavelength.
  const ppwAt = opt.plan.design.worstPpw;
  const angleEnd = plan.inputs.dimensions === 1 ? 85 : angleAxisEnd(plan.inputs.angleMaxDeg);
  const va = reflectionVsAngle(design, grid, ppwAt, angleEnd);
  const angleSpec: ChartSpec = {
    title: `Amplitude reflection against angle of incidence at ${sig(ppwAt)} cells per wavelength; target ${sig(target)}`,
    xLabel: 'angle of incidence (°)',
    xTight: true,
    yLabel: '|r| (amplitude ratio)',
    yLog: true,
    yDb: true,
    yInclude: [target],
    series: [
      { label: `discrete grid, ${sig(ppwAt)} cells/λ`, x: va.x, y: va.discrete, colour: colours.discrete },
      { label: 'continuous theory', x: va.x, y: va.continuous, colour: colours.continuous, dash: [6, 4] },
    ],
    lines: [
      { axis: 'y', value: target, ...targetLine },
      ...(angleMax > 0 ? [{ axis: 'x' as const, value: angleMax, ...angleLine }] : []),
    ],
  };
  // A 1-D grid has no oblique incidence: no angle chart, and the caption says why.
  const angleBox = byId('chart-angle');
  angleBox.hidden = plan.inputs.dimensions === 1;
  if (plan.inputs.dimensions !== 1) state.charts.push(renderChart(angleBox, angleSpec, colours, width));
  byId('caption-angle').textContent =
    plan.inputs.dimensions === 1
      ? 'A 1-D study meets the absorber at normal incidence only, so there is no angle to plot.'
      : `Study's largest angle: ${sig(plan.inputs.angleMaxDeg)}° (vertical line). Discrete values are exact for the grid; the dashed curve is continuous theory.`;

  // Against cells per wavelength across the band, at normal incidence and at the largest angle.
  const ppws = ppwAxis(plan.grid.ppwShort, plan.grid.ppwLong);
  const v0 = reflectionVsPpw(design, grid, ppws, 0);
  const theta = plan.inputs.angleMaxDeg;
  const vt = theta > 0 ? reflectionVsPpw(design, grid, ppws, theta) : null;
  const ppwSpec: ChartSpec = {
    title: `Amplitude reflection against cells per wavelength from ${sig(ppws[0])} to ${sig(ppws[ppws.length - 1])}; target ${sig(target)}`,
    xLabel: 'cells per wavelength (cells/λ)',
    yLabel: '|r| (amplitude ratio)',
    xLog: true,
    xTight: true,
    yLog: true,
    yDb: true,
    yInclude: [target],
    series: [
      { label: 'discrete, 0°', x: v0.x, y: v0.discrete, colour: colours.discrete },
      ...(vt ? [{ label: `discrete, ${sig(theta)}°`, x: vt.x, y: vt.discrete, colour: colours.discrete2, dash: [2, 3] }] : []),
      { label: 'continuous, 0°', x: v0.x, y: v0.continuous, colour: colours.continuous, dash: [6, 4] },
      ...(m1.length ? [{ label: '1-D run, measured', x: m1.map((p) => p.ppw), y: m1.map((p) => p.measured), colour: colours.measured, points: true }] : []),
      // The 2-D run is made at the study's largest angle, so its points belong on the θ° curve.
      ...(m2.length
        ? [{ label: `2-D run at ${sig(m2[0].angleDeg)}°, measured`, x: m2.map((p) => p.ppw), y: m2.map((p) => p.measured), colour: colours.measured2, points: true, ring: true, pointSize: 10 }]
        : []),
    ],
    lines: [
      { axis: 'y', value: target, ...targetLine },
      // The study's band, where the axis is wider than it.
      { axis: 'x', value: plan.grid.ppwShort, ...bandLine },
      ...(plan.grid.ppwLong !== plan.grid.ppwShort ? [{ axis: 'x' as const, value: plan.grid.ppwLong, ...bandLine }] : []),
    ],
  };
  state.charts.push(renderChart(byId('chart-ppw'), ppwSpec, colours, width));
  byId('caption-ppw').textContent =
    plan.grid.ppwLong === plan.grid.ppwShort
      ? `The study's one frequency: ${sig(plan.grid.ppwShort)} cells per wavelength (vertical line).`
      : `Band of the study: ${sig(plan.grid.ppwShort)} to ${sig(plan.grid.ppwLong)} cells per wavelength (vertical lines).`;

  const d = opt.plan.design;
  byId('highlight-summary').textContent =
    `${optionName(opt)}: ${d.layers} layers, σmax/σopt = ${sig(d.strength)}, worst |r| = ${sig(d.worstAmplitude)} ` +
    `at ${sig(d.worstPpw)} cells/λ and ${sig(d.worstAngleDeg)}° (target ${sig(target)}).`;
}

// ---------------------------------------------------------------- verify

function resetVerify(): void {
  byId<HTMLProgressElement>('verify-progress').value = 0;
  byId('verify-stage').textContent = '';
  const r = byId('verify-result');
  r.textContent = '';
  r.className = 'result';
  delete r.dataset.difference;
  byId<HTMLButtonElement>('verify').disabled = false;
  byId<HTMLButtonElement>('cancel').disabled = true;
}

function showVerifyResult(points: MeasuredPoint[], seconds: number | null, notes: string[] = []): void {
  const diff = largestRelativeDifference(points);
  const r = byId('verify-result');
  const n1 = points.filter((p) => p.run === '1-D').length;
  const n2 = points.length - n1;
  r.dataset.difference = String(diff);
  r.className = `result ${diff <= AGREEMENT ? 'ok' : 'bad'}`;
  // Say exactly what was measured: a skipped 2-D run confirms nothing about oblique incidence.
  const oblique = (state.plan?.inputs.dimensions ?? 1) > 1 && (state.plan?.inputs.angleMaxDeg ?? 0) > 0;
  const scope = n2 > 0 || !oblique ? 'The grid behaves as predicted.' : 'The grid behaves as predicted at normal incidence; oblique incidence was not measured.';
  r.textContent =
    `Largest relative difference between measured and predicted |r|: ${sig(diff * 100, 2)} % ` +
    `over ${n1} frequencies of the 1-D run${n2 > 0 ? ` and ${n2} of the 2-D run` : ' (no 2-D run)'}` +
    (seconds !== null ? ` (${sig(seconds, 2)} s). ` : '. ') +
    (diff <= AGREEMENT ? scope : `More than ${AGREEMENT * 100} %: the prediction is not confirmed for this design.`) +
    (notes.length ? ` ${notes.join('. ')}.` : '');
}

async function runVerify(): Promise<void> {
  const plan = state.plan;
  const k = state.highlighted;
  const opt = state.options[k];
  if (!plan || !opt?.plan) return;
  resetVerify();
  const grid: VerifyGrid = {
    courant: plan.inputs.courant,
    dimensions: plan.inputs.dimensions,
    index: plan.inputs.index,
    ppwMin: plan.grid.ppwShort,
    ppwMax: plan.grid.ppwLong,
    angleMaxDeg: plan.inputs.angleMaxDeg,
  };
  const bar = byId<HTMLProgressElement>('verify-progress');
  const stage = byId('verify-stage');
  byId<HTMLButtonElement>('verify').disabled = true;
  byId<HTMLButtonElement>('cancel').disabled = false;
  stage.textContent = 'starting…';
  try {
    const out = await verifier.run(designOf(opt.plan), grid, {
      onProgress: (run, fraction) => {
        // The 1-D run is quick; the 2-D run takes most of the time.
        bar.value = run === '1-D' ? 0.1 * fraction : 0.1 + 0.9 * fraction;
        stage.textContent = `${run} run ${Math.round(fraction * 100)} %`;
      },
    });
    if (state.options[k] !== opt) return;
    bar.value = 1;
    stage.textContent = 'done';
    state.measured.set(k, out.points);
    state.verifyNotes.set(k, out.notes);
    renderCharts();
    showVerifyResult(out.points, out.seconds, out.notes);
  } catch (e) {
    if (e instanceof CancelledError) {
      stage.textContent = 'cancelled';
    } else {
      const r = byId('verify-result');
      r.className = 'result bad';
      r.textContent = `Verification failed: ${errorText(e)}`;
      stage.textContent = '';
    }
  } finally {
    byId<HTMLButtonElement>('verify').disabled = false;
    byId<HTMLButtonElement>('cancel').disabled = true;
  }
}

// ---------------------------------------------------------------- apply

async function apply(): Promise<void> {
  const opt = state.options[state.highlighted];
  const row = state.row;
  const out = byId('apply-result');
  if (!row || !opt?.plan) return;
  const button = byId<HTMLButtonElement>('apply');
  button.disabled = true;
  try {
    const report = await state.workbook.writeOutputs(row, outputValues(opt.plan));
    out.className = 'result ok';
    out.textContent = '';
    // One line to read; the cells written (and any output without a column) behind a disclosure.
    out.append(
      el('span', { class: 'headline' }, `${applyHeadline(report.cells.length, report.row)}.`),
      el(
        'details',
        { class: 'written-cells' },
        el('summary', {}, 'which cells'),
        el('p', {}, `${row.label}, ${optionName(opt)}: ${report.cells.join(', ')}.`),
        ...(report.missing.length ? [el('p', {}, `No column for ${report.missing.join(', ')}.`)] : []),
      ),
    );
    out.dataset.cells = JSON.stringify(report.cells);
  } catch (e) {
    out.className = 'result bad';
    out.textContent = `Nothing written: ${errorText(e)}`;
  } finally {
    button.disabled = false;
  }
}

// ---------------------------------------------------------------- start

function wire(): void {
  byId('verify').addEventListener('click', () => void runVerify());
  byId('cancel').addEventListener('click', () => verifier.cancel());
  byId('apply').addEventListener('click', () => void apply());
  byId('theme-toggle').addEventListener('click', () => {
    state.theme = state.theme === 'auto' ? 'light' : state.theme === 'light' ? 'dark' : 'auto';
    applyTheme();
  });
  if (typeof matchMedia === 'function') matchMedia('(prefers-color-scheme: dark)').addEventListener('change', applyTheme);
  let last = 0;
  new ResizeObserver(() => {
    const w = chartWidth();
    if (Math.abs(w - last) > 8) {
      last = w;
      renderCharts();
    }
  }).observe(byId('app'));
  byId('version').textContent = `Hush ${APP_VERSION}, model ${MODEL_VERSION}. Runtime and cost figures are planning estimates.`;
}

async function officeHost(): Promise<string | null> {
  if (isPreview() || typeof Office === 'undefined' || typeof Office.onReady !== 'function') return null;
  const timeout = new Promise<null>((resolve) => setTimeout(() => resolve(null), 5000));
  const info = await Promise.race([Office.onReady(), timeout]);
  return info && info.host ? String(info.host) : null;
}

async function start(): Promise<void> {
  wire();
  const host = await officeHost();
  if (host === 'Excel') setUpExcel();
  else setUpDemo();
  applyTheme();
  byId('app').setAttribute('aria-busy', 'false');
  if (state.workbook.kind === 'demo') await loadRow();
}

void start();

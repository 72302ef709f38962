/**
 * Small hand-written SVG charts for the pane: lines and markers on linear or
 * log-10 axes, reference lines (the target, the band's edges, the study's
 * largest angle) each in its own style, an optional secondary axis in decibels
 * beside a log |r| axis, and an HTML legend below that wraps on a narrow pane.
 * Axis titles sit above the plot, horizontally, so a long one is never cut.
 * The drawing is pure geometry (`layoutChart`, tested in Node); `renderChart`
 * only turns it into SVG elements.
 */
import type { ChartColours } from './theme';

export interface ChartSeries {
  label: string;
  x: number[];
  y: Array<number | null>;
  colour: string;
  dash?: number[];
  /** Markers only, no line (measured points, options). */
  points?: boolean;
  pointSize?: number;
  /** Hollow marker (drawn as a ring). */
  ring?: boolean;
}

/** Kinds of reference line, each drawn and listed in its own style. */
export type ReferenceKind = 'target' | 'band' | 'angle';

export interface ReferenceLine {
  axis: 'x' | 'y';
  value: number;
  kind: ReferenceKind;
  colour: string;
  /** Legend text; lines of one kind with the same label are listed once. */
  label: string;
}

export interface ChartSpec {
  /** Accessible description of what the chart shows. */
  title: string;
  xLabel: string;
  yLabel: string;
  xLog?: boolean;
  yLog?: boolean;
  series: ChartSeries[];
  lines?: ReferenceLine[];
  /** Force the y range to include these values (e.g. the target). */
  yInclude?: number[];
  /** Log x axis over the data's own span instead of whole decades. */
  xTight?: boolean;
  /** A secondary y axis on the right in decibels (20·log10 of the log y axis's amplitude). */
  yDb?: boolean;
}

/** Dash patterns of the reference lines (SVG stroke-dasharray, px). */
export const REFERENCE_DASH: Readonly<Record<ReferenceKind, string>> = {
  target: '6 4',
  band: '2 3',
  angle: '8 3 2 3',
};

/**
 * A range on a log axis covering `values`: whole decades around at least one
 * decade, or (tight) the data's own span with a 5 % margin.
 */
export function logRange(values: number[], tight = false): [number, number] {
  const v = values.filter((x) => Number.isFinite(x) && x > 0);
  if (v.length === 0) return [1e-6, 1];
  let lo = Math.min(...v);
  let hi = Math.max(...v);
  if (tight) return [lo / 1.05, hi * 1.05];
  if (hi / lo < 10) {
    const mid = Math.sqrt(lo * hi);
    lo = Math.min(lo, mid / Math.sqrt(10));
    hi = Math.max(hi, mid * Math.sqrt(10));
  }
  // Number('1e-4') is exact where Math.pow(10, -4) is not.
  return [Number(`1e${Math.floor(Math.log10(lo) + 1e-9)}`), Number(`1e${Math.ceil(Math.log10(hi) - 1e-9)}`)];
}

function linRange(values: number[]): [number, number] {
  const v = values.filter((x) => Number.isFinite(x));
  if (v.length === 0) return [0, 1];
  const lo = Math.min(...v);
  const hi = Math.max(...v);
  const pad = hi > lo ? (hi - lo) * 0.08 : Math.abs(hi) * 0.1 || 1;
  return [Math.max(0, lo - pad), hi + pad];
}

/** Linear tick labels with just enough decimals to tell neighbouring ticks apart. */
export function linearTicks(ticks: number[]): string[] {
  const step = ticks.length > 1 ? Math.abs(ticks[1] - ticks[0]) : Math.abs(ticks[0]) || 1;
  const decimals = Math.max(0, Math.min(12, -Math.floor(Math.log10(step) + 1e-9)));
  return ticks.map((t) => (Math.abs(t) >= 1e5 ? t.toExponential(2) : t.toFixed(decimals)));
}

/** Ticks at 1, 2 or 5 × 10^k inside [lo, hi], at most about `count` of them. */
export function niceTicks(lo: number, hi: number, count: number): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = Number(`1e${Math.floor(Math.log10(raw))}`);
  const f = raw / mag;
  const step = (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * mag;
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + step * 1e-9; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/** Decade label: 0.01 … 1000 written out, 1e-5 beyond. */
export function decadeLabel(k: number): string {
  return k >= -2 && k <= 3 ? String(Number(`1e${k}`)) : `1e${k}`;
}

/** Decibels as an axis label, with a true minus sign. */
function dbLabel(v: number): string {
  return v < 0 ? `\u2212${Math.abs(v)}` : String(v);
}

interface Axis {
  lo: number;
  hi: number;
  log: boolean;
  ticks: Array<{ value: number; label: string }>;
}

/** Ticks of an axis spanning `length` px; `gap` px is the least room one label needs. */
function makeAxis(range: [number, number], log: boolean, length: number, gap: number): Axis {
  const [lo, hi] = range;
  if (log) {
    const k0 = Math.ceil(Math.log10(lo) - 1e-9);
    const k1 = Math.floor(Math.log10(hi) + 1e-9);
    const decades = Math.log10(hi / lo);
    const every = Math.max(1, Math.ceil((gap * decades) / length));
    const ticks: Axis['ticks'] = [];
    for (let k = k0; k <= k1; k++) if ((k - k0) % every === 0) ticks.push({ value: Number(`1e${k}`), label: decadeLabel(k) });
    return { lo, hi, log, ticks };
  }
  const values = niceTicks(lo, hi, Math.max(2, Math.floor(length / gap)));
  const labels = linearTicks(values);
  return { lo, hi, log, ticks: values.map((value, i) => ({ value, label: labels[i] })) };
}

function position(a: Axis, v: number, from: number, to: number): number {
  const t = a.log ? Math.log10(v / a.lo) / Math.log10(a.hi / a.lo) : (v - a.lo) / (a.hi - a.lo);
  return from + t * (to - from);
}

/** Rough width of a label in px at the pane's 11 px font (0.6 em a character: wide enough for digits). */
function textWidth(s: string, px = 11): number {
  return s.length * px * 0.6;
}

export interface ChartLayout {
  width: number;
  height: number;
  plot: { left: number; top: number; right: number; bottom: number };
  xTicks: Array<{ x: number; labelX: number; label: string }>;
  yTicks: Array<{ y: number; label: string }>;
  dbTicks: Array<{ y: number; label: string }>;
  xLabel: { x: number; y: number; text: string };
  yLabel: { x: number; y: number; text: string };
  dbLabel: { x: number; y: number; text: string } | null;
  /** Polylines (each a list of points, split at gaps) and markers, per series. */
  series: Array<{ spec: ChartSeries; paths: Array<Array<[number, number]>>; points: Array<[number, number]> }>;
  lines: Array<{ spec: ReferenceLine; x1: number; y1: number; x2: number; y2: number }>;
}

const FONT = 11;

/** Where everything of a chart goes, in px of a `width` × `height` SVG. */
export function layoutChart(spec: ChartSpec, width: number, height: number): ChartLayout {
  const xs = spec.series.flatMap((s) => s.x).filter((v) => Number.isFinite(v) && (!spec.xLog || v > 0));
  const xLines = (spec.lines ?? []).filter((l) => l.axis === 'x').map((l) => l.value);
  const yLines = (spec.lines ?? []).filter((l) => l.axis === 'y').map((l) => l.value);
  const ys = spec.series
    .flatMap((s) => s.y)
    .filter((v): v is number => v !== null && Number.isFinite(v) && (!spec.yLog || v > 0))
    .concat(spec.yInclude ?? [], yLines);
  const xMin = Math.min(...xs);
  const xMax = Math.max(...xs);
  // A log axis over less than a factor 3 has no decade ticks to label: drawn linear.
  const xLog = Boolean(spec.xLog) && !(spec.xTight && xs.length > 1 && xMax / xMin < 3);
  const xRange: [number, number] = xLog
    ? logRange(xs.concat(xLines), spec.xTight)
    : spec.xTight && xs.length > 1
      ? [xMin, xMax]
      : linRange(xs);
  const yRange = spec.yLog ? logRange(ys) : linRange(ys);
  const dbOn = Boolean(spec.yDb && spec.yLog);

  // Vertical room: the axis titles above the plot, the tick labels and the x title below.
  const top = FONT + 10;
  const bottom = height - (FONT + 6 + FONT + 8);
  const yAxis = makeAxis(yRange, Boolean(spec.yLog), bottom - top, FONT + 4);
  const dbRange: [number, number] = [20 * Math.log10(yRange[0]), 20 * Math.log10(yRange[1])];
  const dbValues = dbOn ? niceTicks(dbRange[0], dbRange[1], Math.max(2, Math.floor((bottom - top) / (FONT + 10)))) : [];
  const left = 6 + Math.max(...yAxis.ticks.map((t) => textWidth(t.label)), 10);
  const right = width - (dbOn ? 8 + Math.max(...dbValues.map((v) => textWidth(dbLabel(v))), 10) : 10);
  const xAxis = makeAxis(xRange, xLog, right - left, 46);
  const X = (v: number) => position(xAxis, v, left, right);
  const Y = (v: number) => position(yAxis, v, bottom, top);
  const ok = (x: number, y: number | null): y is number =>
    y !== null && Number.isFinite(x) && Number.isFinite(y) && (!xLog || x > 0) && (!spec.yLog || y > 0);

  const series = spec.series.map((s) => {
    const paths: Array<Array<[number, number]>> = [];
    const points: Array<[number, number]> = [];
    let run: Array<[number, number]> = [];
    s.x.forEach((x, i) => {
      const y = s.y[i];
      if (ok(x, y)) {
        const p: [number, number] = [X(x), Y(y)];
        run.push(p);
        points.push(p);
      } else if (run.length) {
        paths.push(run);
        run = [];
      }
    });
    if (run.length) paths.push(run);
    return { spec: s, paths: s.points ? [] : paths, points: s.points ? points : [] };
  });
  const lines = (spec.lines ?? [])
    .filter((l) => (l.axis === 'x' ? l.value >= xAxis.lo && l.value <= xAxis.hi : l.value >= yAxis.lo && l.value <= yAxis.hi))
    .map((l) => (l.axis === 'x' ? { spec: l, x1: X(l.value), y1: top, x2: X(l.value), y2: bottom } : { spec: l, x1: left, y1: Y(l.value), x2: right, y2: Y(l.value) }));
  return {
    width,
    height,
    plot: { left, top, right, bottom },
    // A label at the plot's edge is moved inward just enough to stay inside the chart.
    xTicks: xAxis.ticks.map((t) => {
      const half = textWidth(t.label) / 2 + 1;
      const x = X(t.value);
      return { x, labelX: Math.min(Math.max(x, half), width - half), label: t.label };
    }),
    yTicks: yAxis.ticks.map((t) => ({ y: Y(t.value), label: t.label })),
    dbTicks: dbValues.map((v) => ({ y: bottom + ((v - dbRange[0]) / (dbRange[1] - dbRange[0])) * (top - bottom), label: dbLabel(v) })),
    xLabel: { x: (left + right) / 2, y: height - 4, text: spec.xLabel },
    yLabel: { x: 2, y: FONT + 1, text: spec.yLabel },
    dbLabel: dbOn ? { x: width - 2, y: FONT + 1, text: 'dB' } : null,
    series,
    lines,
  };
}

/** A rendered chart. */
export interface Chart {
  destroy(): void;
}

const SVG = 'http://www.w3.org/2000/svg';

function svg<K extends keyof SVGElementTagNameMap>(tag: K, attrs: Record<string, string | number>, text?: string): SVGElementTagNameMap[K] {
  const e = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, String(v));
  if (text !== undefined) e.textContent = text;
  return e;
}

let clipIds = 0;

export function renderChart(host: HTMLElement, spec: ChartSpec, colours: ChartColours, width: number, height = 220): Chart {
  host.textContent = '';
  host.setAttribute('role', 'img');
  host.setAttribute('aria-label', spec.title);
  host.tabIndex = 0;
  const L = layoutChart(spec, width, height);
  const { left, top, right, bottom } = L.plot;
  const root = svg('svg', { width, height, viewBox: `0 0 ${width} ${height}`, class: 'chart-svg', 'font-size': FONT, fill: colours.text, 'aria-hidden': 'true' });
  const clip = `chart-clip-${++clipIds}`;
  const defs = svg('defs', {});
  const clipPath = svg('clipPath', { id: clip });
  // Markers may sit on the plot's edge: the clip leaves them room.
  clipPath.appendChild(svg('rect', { x: left - 8, y: top - 8, width: right - left + 16, height: bottom - top + 16 }));
  defs.appendChild(clipPath);
  root.appendChild(defs);
  const grid = svg('g', { stroke: colours.grid, 'stroke-width': 1 });
  for (const t of L.xTicks) grid.appendChild(svg('line', { x1: t.x, x2: t.x, y1: top, y2: bottom }));
  for (const t of L.yTicks) grid.appendChild(svg('line', { x1: left, x2: right, y1: t.y, y2: t.y }));
  root.appendChild(grid);
  root.appendChild(svg('rect', { x: left, y: top, width: right - left, height: bottom - top, fill: 'none', stroke: colours.axis, 'stroke-width': 1 }));
  const labels = svg('g', {});
  for (const t of L.xTicks) labels.appendChild(svg('text', { x: t.labelX, y: bottom + FONT + 3, 'text-anchor': 'middle' }, t.label));
  for (const t of L.yTicks) labels.appendChild(svg('text', { x: left - 4, y: t.y + 4, 'text-anchor': 'end' }, t.label));
  for (const t of L.dbTicks) labels.appendChild(svg('text', { x: right + 4, y: t.y + 4, 'text-anchor': 'start' }, t.label));
  labels.appendChild(svg('text', { x: L.xLabel.x, y: L.xLabel.y, 'text-anchor': 'middle', class: 'axis-title' }, L.xLabel.text));
  labels.appendChild(svg('text', { x: L.yLabel.x, y: L.yLabel.y, 'text-anchor': 'start', class: 'axis-title' }, L.yLabel.text));
  if (L.dbLabel) labels.appendChild(svg('text', { x: L.dbLabel.x, y: L.dbLabel.y, 'text-anchor': 'end', class: 'axis-title' }, L.dbLabel.text));
  root.appendChild(labels);
  const plot = svg('g', { 'clip-path': `url(#${clip})`, fill: 'none' });
  for (const l of L.lines) {
    plot.appendChild(svg('line', { x1: l.x1, y1: l.y1, x2: l.x2, y2: l.y2, stroke: l.spec.colour, 'stroke-width': 1.5, 'stroke-dasharray': REFERENCE_DASH[l.spec.kind], class: `ref ref-${l.spec.kind}` }));
  }
  for (const s of L.series) {
    for (const p of s.paths) {
      plot.appendChild(
        svg('polyline', {
          points: p.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(' '),
          stroke: s.spec.colour,
          'stroke-width': 2,
          'stroke-linejoin': 'round',
          ...(s.spec.dash ? { 'stroke-dasharray': s.spec.dash.join(' ') } : {}),
        }),
      );
    }
    const r = (s.spec.pointSize ?? 7) / 2;
    for (const [x, y] of s.points) {
      plot.appendChild(
        svg('circle', { cx: x.toFixed(1), cy: y.toFixed(1), r, stroke: s.spec.colour, 'stroke-width': s.spec.ring ? 2 : 1, fill: s.spec.ring ? 'none' : s.spec.colour }),
      );
    }
  }
  root.appendChild(plot);
  host.appendChild(root);
  host.appendChild(legend(spec, colours));
  return { destroy: () => (host.textContent = '') };
}

/** A legend key: a short sample of the line or marker, drawn as the chart draws it. */
function key(colour: string, dash: string | null, marker: 'none' | 'dot' | 'ring'): SVGSVGElement {
  const k = svg('svg', { width: 20, height: 10, viewBox: '0 0 20 10', class: 'key', 'aria-hidden': 'true' });
  if (marker === 'none') k.appendChild(svg('line', { x1: 1, y1: 5, x2: 19, y2: 5, stroke: colour, 'stroke-width': 2, ...(dash ? { 'stroke-dasharray': dash } : {}) }));
  else k.appendChild(svg('circle', { cx: 10, cy: 5, r: 3.5, stroke: colour, 'stroke-width': marker === 'ring' ? 2 : 1, fill: marker === 'ring' ? 'none' : colour }));
  return k;
}

function legend(spec: ChartSpec, colours: ChartColours): HTMLElement {
  const ul = document.createElement('ul');
  ul.className = 'legend';
  const item = (label: string, k: SVGSVGElement, kind: string) => {
    const li = document.createElement('li');
    li.dataset.kind = kind;
    li.append(k, document.createTextNode(label));
    ul.appendChild(li);
  };
  for (const s of spec.series) item(s.label, key(s.colour, s.dash ? s.dash.join(' ') : null, s.points ? (s.ring ? 'ring' : 'dot') : 'none'), 'series');
  const seen = new Set<string>();
  for (const l of spec.lines ?? []) {
    const id = `${l.kind}\u0000${l.label}`;
    if (seen.has(id)) continue;
    seen.add(id);
    item(l.label, key(l.colour, REFERENCE_DASH[l.kind], 'none'), l.kind);
  }
  ul.style.color = colours.text;
  return ul;
}

/**
 * Charts with uPlot: each series brings its own x values; they are merged onto
 * one ascending x axis (uPlot's aligned data) with gaps where a series has no
 * point. Reference lines (the target) are drawn in a hook so they span the plot.
 * The legend is our own HTML below the canvas: it wraps on a narrow pane.
 */
import uPlot from 'uplot';
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

export interface ReferenceLine {
  axis: 'x' | 'y';
  value: number;
  colour: string;
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
}

export interface AlignedData {
  x: number[];
  ys: Array<Array<number | null>>;
}

/** Merges series onto the sorted union of their x values (exactly equal x values share a slot). */
export function alignSeries(series: Array<Pick<ChartSeries, 'x' | 'y'>>): AlignedData {
  const xs = [...new Set(series.flatMap((s) => s.x.filter((v) => Number.isFinite(v))))].sort((a, b) => a - b);
  const slot = new Map(xs.map((v, i) => [v, i]));
  const ys = series.map((s) => {
    const col: Array<number | null> = new Array(xs.length).fill(null);
    s.x.forEach((v, i) => {
      const k = slot.get(v);
      const y = s.y[i];
      if (k !== undefined && y !== null && Number.isFinite(y)) col[k] = y;
    });
    return col;
  });
  return { x: xs, ys };
}

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

function logTick(v: number): string {
  if (v === 0) return '0';
  const e = Math.log10(v);
  if (Math.abs(e - Math.round(e)) < 1e-9) {
    const k = Math.round(e);
    return k >= -2 && k <= 3 ? String(Number(v.toPrecision(1))) : `1e${k}`;
  }
  return '';
}

/** A rendered chart: redraw with new colours or width without rebuilding the DOM around it. */
export interface Chart {
  plot: uPlot;
  destroy(): void;
}

export function renderChart(host: HTMLElement, spec: ChartSpec, colours: ChartColours, width: number, height = 220): Chart {
  host.textContent = '';
  host.setAttribute('role', 'img');
  host.setAttribute('aria-label', spec.title);
  host.tabIndex = 0;
  const data = alignSeries(spec.series);
  // A log axis over less than a factor 3 has no decade ticks to label: draw it linear.
  const xLog = spec.xLog && !(spec.xTight && data.x.length > 1 && data.x[data.x.length - 1] / data.x[0] < 3);
  const allY = data.ys.flat().filter((y): y is number => y !== null).concat(spec.yInclude ?? []);
  const yRange = spec.yLog ? logRange(allY) : linRange(allY);
  const xRange = xLog
    ? logRange(data.x.concat((spec.lines ?? []).filter((l) => l.axis === 'x').map((l) => l.value)), spec.xTight)
    : spec.xTight
      ? ([data.x[0], data.x[data.x.length - 1]] as [number, number])
      : linRange(data.x);
  const axis = (label: string, log: boolean | undefined): uPlot.Axis => ({
    label,
    stroke: colours.text,
    labelSize: 18,
    labelFont: '12px system-ui, "Segoe UI", sans-serif',
    font: '11px system-ui, "Segoe UI", sans-serif',
    grid: { stroke: colours.grid, width: 1 },
    ticks: { stroke: colours.axis, width: 1, size: 4 },
    values: log
      ? (_u, ticks) => (ticks.length > 1 && ticks[ticks.length - 1] / ticks[0] < 10 ? linearTicks(ticks) : ticks.map(logTick))
      : (_u, ticks) => linearTicks(ticks),
  });
  const opts: uPlot.Options = {
    width,
    height,
    pxAlign: 0,
    legend: { show: false },
    cursor: { show: false },
    scales: {
      x: { time: false, distr: xLog ? 3 : 1, log: 10, range: () => xRange },
      y: { distr: spec.yLog ? 3 : 1, log: 10, range: () => yRange },
    },
    axes: [
      { ...axis(spec.xLabel, xLog), space: 40 },
      { ...axis(spec.yLabel, spec.yLog), size: spec.yLog ? 52 : 64, space: 24 },
    ],
    series: [
      {},
      ...spec.series.map(
        (s): uPlot.Series => ({
          label: s.label,
          stroke: s.colour,
          width: s.points ? 0 : 2,
          dash: s.dash,
          spanGaps: !s.points,
          paths: s.points ? () => null : undefined,
          points: s.points
            ? { show: true, size: s.pointSize ?? 7, stroke: s.colour, fill: s.ring ? 'transparent' : s.colour, width: s.ring ? 2 : 1 }
            : { show: false },
        }),
      ),
    ],
    hooks: {
      draw: [
        (u: uPlot) => {
          const ctx = u.ctx;
          for (const l of spec.lines ?? []) {
            ctx.save();
            ctx.strokeStyle = l.colour;
            ctx.lineWidth = 1.5 * devicePixelRatio;
            ctx.setLineDash([6 * devicePixelRatio, 4 * devicePixelRatio]);
            ctx.beginPath();
            const { left, top, width: w, height: h } = u.bbox;
            if (l.axis === 'y') {
              const y = u.valToPos(l.value, 'y', true);
              ctx.moveTo(left, y);
              ctx.lineTo(left + w, y);
            } else {
              const x = u.valToPos(l.value, 'x', true);
              ctx.moveTo(x, top);
              ctx.lineTo(x, top + h);
            }
            ctx.stroke();
            ctx.restore();
          }
        },
      ],
    },
  };
  const plot = new uPlot(opts, [data.x, ...data.ys] as uPlot.AlignedData, host);
  host.appendChild(legend(spec, colours));
  return { plot, destroy: () => plot.destroy() };
}

function legend(spec: ChartSpec, colours: ChartColours): HTMLElement {
  const ul = document.createElement('ul');
  ul.className = 'legend';
  const item = (label: string, colour: string, kind: 'line' | 'dash' | 'point' | 'ring') => {
    const li = document.createElement('li');
    const key = document.createElement('span');
    key.className = `key key-${kind}`;
    key.style.setProperty('--key', colour);
    li.append(key, document.createTextNode(label));
    ul.appendChild(li);
  };
  for (const s of spec.series) item(s.label, s.colour, s.points ? (s.ring ? 'ring' : 'point') : s.dash ? 'dash' : 'line');
  for (const l of spec.lines ?? []) item(l.label, l.colour, 'dash');
  ul.style.color = colours.text;
  return ul;
}

/**
 * Light or dark: Office's theme when the pane runs in Office
 * (Office.context.officeTheme, body background luminance), the system's
 * prefers-color-scheme otherwise; the preview can force either.
 */
export type Theme = 'light' | 'dark';

/** Relative luminance of "#rrggbb" or "#rgb" (WCAG 2 definition), or null when not a hex colour. */
export function luminance(hex: string): number | null {
  const m = /^#?([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(hex.trim());
  if (!m) return null;
  const h = m[1].length === 3 ? m[1].replace(/./g, (c) => c + c) : m[1];
  const ch = [0, 2, 4].map((i) => parseInt(h.slice(i, i + 2), 16) / 255);
  const lin = ch.map((c) => (c <= 0.03928 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4)));
  return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2];
}

/** The theme Office reports, or null when there is none (outside Office, or a host without themes). */
export function officeTheme(): Theme | null {
  try {
    const t = typeof Office !== 'undefined' ? Office.context?.officeTheme : undefined;
    const l = t?.bodyBackgroundColor ? luminance(t.bodyBackgroundColor) : null;
    return l === null ? null : l < 0.4 ? 'dark' : 'light';
  } catch {
    return null;
  }
}

export function systemTheme(): Theme {
  return typeof matchMedia === 'function' && matchMedia('(prefers-color-scheme: dark)').matches ? 'dark' : 'light';
}

/** Chart colours for a theme, read from the CSS custom properties the stylesheet sets. */
export interface ChartColours {
  text: string;
  grid: string;
  axis: string;
  discrete: string;
  discrete2: string;
  continuous: string;
  target: string;
  band: string;
  angle: string;
  measured: string;
  measured2: string;
  option: string;
  recommended: string;
  highlight: string;
}

export function chartColours(el: Element = document.documentElement): ChartColours {
  const s = getComputedStyle(el);
  const v = (name: string, fallback: string) => s.getPropertyValue(name).trim() || fallback;
  return {
    text: v('--text', '#1b1b1b'),
    grid: v('--chart-grid', '#e3e3e3'),
    axis: v('--chart-axis', '#6b6b6b'),
    discrete: v('--chart-discrete', '#1f5fbf'),
    discrete2: v('--chart-discrete-2', '#6b8fd6'),
    continuous: v('--chart-continuous', '#8a5a00'),
    target: v('--chart-target', '#b3261e'),
    band: v('--chart-band', '#5c5f66'),
    angle: v('--chart-angle', '#00838f'),
    measured: v('--chart-measured', '#0b7a3b'),
    measured2: v('--chart-measured-2', '#7b3fb3'),
    option: v('--chart-option', '#1f5fbf'),
    recommended: v('--chart-recommended', '#0b7a3b'),
    highlight: v('--chart-highlight', '#b35c00'),
  };
}

/** Number formatting for the pane: short, unambiguous, never "NaN". */

/** 3 significant digits; scientific below 1e-3 or from 1e6 (e.g. 2.5e-5, 0.0123, 1.23e+6 → "1.23e6"). */
export function sig(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a < 1e-3 || a >= 1e6) {
    const [m, e] = x.toExponential(digits - 1).split('e');
    return `${Number(m)}e${Number(e)}`;
  }
  return String(Number(x.toPrecision(digits)));
}

/** Percent with one decimal: 12.34 → "12.3 %". */
export function percent(x: number): string {
  return Number.isFinite(x) ? `${x.toFixed(1)} %` : '—';
}

/** A duration in hours shown in the most readable unit: 0.02 h → "1.2 min", 30 h → "30.0 h", 100 h → "4.17 d". */
export function hours(h: number): string {
  if (!Number.isFinite(h)) return '—';
  if (h < 1 / 60) return `${sig(h * 3600)} s`;
  if (h < 1) return `${sig(h * 60)} min`;
  if (h < 48) return `${sig(h)} h`;
  return `${sig(h / 24)} d`;
}

/** Money: two decimals, grouped; three significant digits below 10 (0.00555 → "0.00555"). */
export function money(x: number): string {
  if (!Number.isFinite(x)) return '—';
  if (Math.abs(x) < 10) return sig(x);
  return x.toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}

/** A cell value as text for the study panel. */
export function cellText(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isInteger(v) ? String(v) : sig(v, 4);
  return String(v);
}

/** Amplitude ratio in decibels, 20·log10|r|, one decimal: 1e-3 → "−60.0 dB" (U+2212 minus). */
export function decibels(amplitude: number): string {
  if (!Number.isFinite(amplitude) || amplitude <= 0) return '—';
  const db = 20 * Math.log10(amplitude);
  return `${db < 0 ? '\u2212' : ''}${Math.abs(db).toFixed(1)} dB`;
}

/** Apply's one-line confirmation: "Wrote 35 cells of row 5". */
export function applyHeadline(count: number, row: number): string {
  if (count === 0) return `Wrote nothing in row ${row}: the table has no output column`;
  return `Wrote ${count} ${count === 1 ? 'cell' : 'cells'} of row ${row}`;
}

/**
 * The theme button's text and accessible name: the current setting and what a
 * press does (auto → light → dark → auto), e.g. "Theme: auto (dark)".
 */
export function themeLabel(setting: 'auto' | 'light' | 'dark', shown: 'light' | 'dark'): { text: string; aria: string } {
  const next = setting === 'auto' ? 'light' : setting === 'light' ? 'dark' : 'auto';
  const text = `Theme: ${setting}`;
  const now = setting === 'auto' ? `Theme: auto (following Office or the system: ${shown} now)` : text;
  return { text, aria: `${now}. Press to switch to ${next} (order: auto, light, dark).` };
}

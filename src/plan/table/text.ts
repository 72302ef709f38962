/**
 * Text helpers of the table readers and writers: quoting input in messages,
 * showing text safely on a terminal, spreadsheet column letters, plain numbers.
 */
import { MAX_QUOTE_CHARS } from './limits';

/** "A", "B", …, "Z", "AA", … for a 0-based column index. */
export function columnLetters(index: number): string {
  let n = index + 1;
  let s = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/** 0-based column index of letters such as "XFD"; -1 when they are not column letters. */
export function columnIndex(letters: string): number {
  if (!/^[A-Z]{1,7}$/.test(letters)) return -1;
  let n = 0;
  for (let i = 0; i < letters.length; i++) n = n * 26 + (letters.charCodeAt(i) - 64);
  return n - 1;
}

/** "B5" for a 0-based column and a 1-based row. */
export function cellName(column: number, row: number): string {
  return `${columnLetters(column)}${row}`;
}

/**
 * Characters shown escaped on a terminal: C0 controls, DEL, C1 controls
 * (ESC and CSI start terminal escape sequences), line and paragraph
 * separators, and the bidirectional overrides and isolates that can make
 * shown text differ from the stored text.
 */
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

const NAMED: Record<string, string> = { '\n': '\\n', '\r': '\\r', '\t': '\\t' };

function escapeChar(ch: string): string {
  const named = NAMED[ch];
  if (named) return named;
  const code = ch.charCodeAt(0);
  return code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u${code.toString(16).padStart(4, '0')}`;
}

/** Text as printed on a terminal: control characters shown escaped ("\x1b", "\n"), everything else as it is. */
export function terminalSafe(text: string): string {
  return text.replace(UNSAFE, escapeChar);
}

/** JSON text with the characters of `terminalSafe` written as \u escapes (still valid JSON, same value). */
export function jsonTerminalSafe(json: string): string {
  return json.replace(UNSAFE, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** Input quoted for a message: at most MAX_QUOTE_CHARS characters of it ("…" marks a cut), control characters escaped. */
export function quoteInput(value: unknown, max = MAX_QUOTE_CHARS): string {
  const text = String(value ?? '');
  const chars = Array.from(text);
  const shown = chars.length > max ? `${chars.slice(0, max).join('')}…` : text;
  return `"${terminalSafe(shown).replace(/"/g, '\\"')}"`;
}

/** Decimal notation as typed in a CSV cell or on the command line: 3, -2, +0.5, .5, 1e-3. */
export const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * A CSV cell that is a plain number: decimal notation with at most 15
 * significant digits (what a spreadsheet keeps) and no leading zero before a
 * digit ("007" is an identifier, kept as text). Returns the number, or null
 * when the cell stays text.
 */
export function plainNumber(text: string): number | null {
  if (!DECIMAL.test(text)) return null;
  if (/^[+-]?0\d/.test(text)) return null;
  const digits = text.replace(/[eE].*$/, '').replace(/[^\d]/g, '').replace(/^0+/, '');
  if (digits.replace(/0+$/, '').length > 15) return null;
  const x = Number(text);
  return Number.isFinite(x) ? x : null;
}

/**
 * OOXML's escape for characters XML 1.0 cannot hold: "_xHHHH_" (ECMA-376
 * Part 1, §22.9.2.19 ST_Xstring); "_x005F_" escapes an underscore that
 * starts such a sequence. Spreadsheet programs write control characters
 * typed in a cell this way.
 */
export function ooxmlUnescape(text: string): string {
  return text.indexOf('_x') < 0 ? text : text.replace(/_x([0-9A-Fa-f]{4})_/g, (_, h: string) => String.fromCharCode(parseInt(h, 16)));
}

const OOXML_UNSAFE = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f\ufffe\uffff]|_(?=x[0-9A-Fa-f]{4}_)/g;

/** Text with the characters XML 1.0 cannot hold (and DEL) written as "_xHHHH_", so a workbook keeps them. */
export function ooxmlEscape(text: string): string {
  return text.replace(OOXML_UNSAFE, (ch) => (ch === '_' ? '_x005F_' : `_x${ch.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}_`));
}

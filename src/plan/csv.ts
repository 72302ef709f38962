/**
 * CSV as RFC 4180 defines it: fields separated by commas, records by CRLF (LF
 * accepted), a field in double quotes may hold commas, line breaks and doubled
 * quotes. Text stays text: the reader never converts numbers, so a table can be
 * written back exactly as typed.
 */
import { HushInputError } from '../physics/errors';

/** Parses CSV text into records of fields. A leading byte-order mark is dropped; a final line break ends the last record. */
export function parseCsv(text: string): string[][] {
  const s = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let i = 0;
  let quoted = false;
  let fieldStarted = false;
  let line = 1;
  while (i < s.length) {
    const ch = s[i];
    if (quoted) {
      if (ch === '"') {
        if (s[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        const next = s[i];
        if (next !== undefined && next !== ',' && next !== '\n' && next !== '\r') {
          throw new HushInputError('csv', `CSV line ${line}: text after a closing quote (RFC 4180 quotes whole fields)`, 'value');
        }
        continue;
      }
      if (ch === '\n') line++;
      field += ch;
      i++;
      continue;
    }
    if (ch === '"' && !fieldStarted) {
      quoted = true;
      fieldStarted = true;
      i++;
      continue;
    }
    if (ch === ',') {
      row.push(field);
      field = '';
      fieldStarted = false;
      i++;
      continue;
    }
    if (ch === '\r' || ch === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      fieldStarted = false;
      i += ch === '\r' && s[i + 1] === '\n' ? 2 : 1;
      line++;
      continue;
    }
    field += ch;
    fieldStarted = true;
    i++;
  }
  if (quoted) throw new HushInputError('csv', `CSV line ${line}: a quoted field is not closed`, 'value');
  if (fieldStarted || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}

/** Quotes a field when it holds a comma, quote, line break or surrounding spaces. */
export function csvField(v: string | number | boolean | null | undefined): string {
  if (v === null || v === undefined) return '';
  const t = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : String(v);
  return /[",\r\n]|^\s|\s$/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
}

/** Writes records as CSV with CRLF line ends (RFC 4180). */
export function writeCsv(rows: ReadonlyArray<ReadonlyArray<string | number | boolean | null | undefined>>): string {
  return rows.map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}

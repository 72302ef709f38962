/**
 * CSV as RFC 4180 defines it: fields separated by commas (or another
 * delimiter), records by CRLF (LF or CR accepted), a field in double quotes
 * may hold delimiters, line breaks and doubled quotes. Text stays text: the
 * reader never converts numbers, so a table can be written back exactly as
 * typed.
 */
import { HushInputError } from '../physics/errors';

export interface CsvOptions {
  /** Field delimiter, one character (default ","). */
  delimiter?: string;
  /** Fields of a record beyond this many are dropped when empty and refused when not (default: no bound). */
  maxFields?: number;
  /** Most characters of one field (default: no bound). */
  maxFieldChars?: number;
}

const QUOTE = 34;
const CR = 13;
const LF = 10;

function tooLong(line: number, field: number, max: number): never {
  throw new HushInputError('csv', `CSV line ${line}, field ${field}: more than ${max} characters in one cell`, 'value');
}

/**
 * Calls `onRecord(fields, line)` for each record (line = where it starts,
 * 1-based); stops when `onRecord` throws. A leading byte-order mark is
 * dropped; a final line break ends the last record.
 */
export function eachCsvRecord(text: string, onRecord: (fields: string[], line: number) => void, options: CsvOptions = {}): void {
  const delim = (options.delimiter ?? ',').charCodeAt(0);
  const maxFields = options.maxFields ?? Infinity;
  const maxChars = options.maxFieldChars ?? Infinity;
  const s = text;
  const n = s.length;
  let i = s.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  let row: string[] = [];
  let fieldCount = 0;
  let recordLine = 1;
  let any = false;
  const push = (v: string) => {
    fieldCount++;
    if (v.length > maxChars) tooLong(recordLine, fieldCount, maxChars);
    if (fieldCount <= maxFields) row.push(v);
    else if (v !== '') {
      throw new HushInputError('csv', `CSV line ${recordLine} has a value in field ${fieldCount}: a project table may have at most ${maxFields} columns`, 'value');
    }
  };
  while (i < n) {
    any = true;
    let c = s.charCodeAt(i);
    let value: string;
    if (c === QUOTE) {
      // Quoted field: runs up to a quote not followed by another quote.
      let start = i + 1;
      let parts = '';
      let closed = false;
      let j = start;
      while (j < n) {
        const q = s.indexOf('"', j);
        if (q < 0) break;
        for (let k = j; k < q; k++) if (s.charCodeAt(k) === LF) line++;
        if (s.charCodeAt(q + 1) === QUOTE) {
          parts += s.slice(start, q + 1);
          if (parts.length > maxChars) tooLong(recordLine, fieldCount + 1, maxChars);
          j = q + 2;
          start = j;
          continue;
        }
        parts += s.slice(start, q);
        i = q + 1;
        closed = true;
        break;
      }
      if (!closed) throw new HushInputError('csv', `CSV line ${recordLine}: a quoted field is not closed`, 'value');
      value = parts;
      c = s.charCodeAt(i);
      if (i < n && c !== delim && c !== CR && c !== LF) {
        throw new HushInputError('csv', `CSV line ${line}: text after a closing quote (RFC 4180 quotes whole fields)`, 'value');
      }
    } else {
      let j = i;
      while (j < n) {
        const d = s.charCodeAt(j);
        if (d === delim || d === CR || d === LF) break;
        j++;
      }
      value = s.slice(i, j);
      i = j;
      c = s.charCodeAt(i);
    }
    push(value);
    if (i >= n) break;
    if (c === delim) {
      i++;
      if (i >= n) push('');
      continue;
    }
    // End of record.
    i += c === CR && s.charCodeAt(i + 1) === LF ? 2 : 1;
    const fields = row;
    row = [];
    fieldCount = 0;
    onRecord(fields, recordLine);
    line++;
    recordLine = line;
    any = false;
  }
  if (any) onRecord(row, recordLine);
}

/** Parses CSV text into records of fields (see eachCsvRecord). */
export function parseCsv(text: string, options: CsvOptions = {}): string[][] {
  const rows: string[][] = [];
  eachCsvRecord(text, (r) => rows.push(r), options);
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

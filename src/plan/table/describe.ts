/** The one line that says what was read: "t.xlsx: sheet 'studies', header on row 3, 8 studies". */
import { blankRow, type Table } from './model';

export function describeRead(table: Table): string {
  const studies = table.rows.filter((r) => !blankRow(r)).length;
  const parts: string[] = [];
  if (table.sheet) {
    const s = table.sheet;
    let sheet = `sheet '${s.name}'`;
    if (s.count > 1) sheet += ` (${s.position} of ${s.count}${s.skipped.length ? `; before it ${s.skipped.join(', ')} ${s.skipped.length === 1 ? 'has' : 'have'} no header` : ''})`;
    parts.push(sheet);
  }
  parts.push(`header on row ${table.header.number}`);
  parts.push(`${studies} ${studies === 1 ? 'study' : 'studies'}`);
  const how: string[] = [];
  if (table.encoding && table.encoding !== 'UTF-8') how.push(table.encoding);
  if (table.delimiter && table.delimiter !== ',') how.push(`'${table.delimiter}'-separated`);
  return `${table.file}: ${parts.join(', ')}${how.length ? ` (${how.join(', ')})` : ''}`;
}

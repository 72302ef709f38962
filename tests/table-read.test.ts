/**
 * Reading project tables: encodings, delimiters, the header below title
 * rows, sheets, cells beyond the header, repeated fields, .xlsx cells
 * (shared and rich strings, formulas, formats, dates, escapes). Expected
 * values come from the formats' definitions (RFC 4180, RFC 3629, the WHATWG
 * Encoding Standard, ECMA-376 Part 1) or from the test's own cells.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'fs';
import { tmpdir } from 'os';
import { join } from 'path';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { describeRead, planTable, readTable, type Table } from '../src/plan/table-file';
import { decodeTable, windows1252 } from '../src/plan/table/decode';
import { slideFormula } from '../src/plan/table/xlsx-read';
import { isDateFormat, serialDateText } from '../src/plan/table/formats';
import { ooxmlEscape, ooxmlUnescape, plainNumber } from '../src/plan/table/text';
import { priceParts, parsePrice } from '../src/plan/units';
import { buildXlsx, rowXml } from './support/xlsx-build';

const dir = mkdtempSync(join(tmpdir(), 'hush-read-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let n = 0;
function file(name: string, content: string | Buffer): string {
  const f = join(dir, `${n++}-${name}`);
  writeFileSync(f, content);
  return f;
}

async function run(argv: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CommandIO = { out: (t) => out.push(t), err: (t) => err.push(t), isTTY: false };
  const code = await main(argv, io);
  return { code, out, err };
}

/** A 1-D study that plans in a few milliseconds (the demo's smallest kind). */
const HEAD = ['study', 'dimensions', 'band_short', 'cell', 'cells_x', 'intensity_error'];
const ROW = ['s1', '1', '1550 nm', '50 nm', '100', '1%'];

function values(t: Table): unknown[][] {
  return t.rows.map((r) => r.values);
}

describe('encodings (UTF-8 with or without BOM, UTF-16 with BOM; otherwise Windows-1252 with a note)', () => {
  const text = 'study,remark\r\nσ λ × Résonateur,€2.50/h\r\n';
  it('UTF-8 with and without a byte-order mark read the same', () => {
    const plain = decodeTable(Buffer.from(text, 'utf8'), 't.csv');
    const bom = decodeTable(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')]), 't.csv');
    expect(plain).toEqual({ text, encoding: 'UTF-8', note: null });
    expect(bom).toEqual({ text, encoding: 'UTF-8', note: null });
  });
  it('UTF-16 little- and big-endian with a byte-order mark', () => {
    const le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    const be = Buffer.from(le);
    be.swap16(); // FE FF then big-endian code units
    expect(decodeTable(le, 't.csv')).toMatchObject({ text, encoding: 'UTF-16LE' });
    expect(decodeTable(be, 't.csv')).toMatchObject({ text, encoding: 'UTF-16BE' });
  });
  it('a Windows-1252 CSV (what a Western Windows spreadsheet saves as "CSV") is read as such, with a note', async () => {
    // "Résonateur" and "€2.50/h" in Windows-1252: é = 0xE9, € = 0x80 (WHATWG Encoding Standard, index-windows-1252).
    const bytes = Buffer.concat([Buffer.from(`${HEAD.join(',')},price_per_hour\r\nR`), Buffer.from([0xe9]), Buffer.from('sonateur,1,1550 nm,50 nm,100,1%,'), Buffer.from([0x80]), Buffer.from('2.50/h\r\n')]);
    const f = file('cp1252.csv', bytes);
    const t = await readTable(f);
    expect(t.rows[0].values[0]).toBe('Résonateur');
    expect(t.rows[0].values[6]).toBe('€2.50/h');
    expect(t.encoding).toBe('Windows-1252');
    expect(t.notes).toEqual([
      `${f} is not UTF-8 (byte 75 is 0xE9); read as Windows-1252, the encoding of a "CSV" saved by a Western-language Windows spreadsheet program; if names look wrong, save the table as "CSV UTF-8"`,
    ]);
    expect(describeRead(t)).toBe(`${f}: header on row 1, 1 study (Windows-1252)`);
    const r = await run(['plan', f]);
    expect(r.code).toBe(0);
    expect(r.err[0]).toMatch(/^hush plan: .* is not UTF-8 .*read as Windows-1252/);
    expect(r.out[1]).toMatch(/^study/);
    expect(r.out[2]).toMatch(/^Résonateur /);
  });
  it('the Windows-1252 table agrees with an independent decoder (Python cp1252) on every byte it defines', () => {
    const py = ['python3', '/usr/bin/python3'].find((p) => spawnSync(p, ['-c', ''], { encoding: 'utf8' }).status === 0);
    // Fixed points of the WHATWG index (recalled from memory): 0x80 €, 0x8A Š, 0x99 ™, 0x9F Ÿ; Latin-1 elsewhere.
    expect(windows1252(Uint8Array.from([0x80, 0x8a, 0x99, 0x9f, 0xe9, 0x41]))).toBe('€Š™Ÿé\u0041');
    if (!py) return;
    const r = spawnSync(py, ['-c', 'import sys,json; print(json.dumps([bytes([b]).decode("cp1252", errors="replace") for b in range(256)]))'], { encoding: 'utf8' });
    const theirs = JSON.parse(r.stdout) as string[];
    for (let b = 0; b < 256; b++) {
      // Python leaves 0x81, 0x8D, 0x8F, 0x90, 0x9D undefined; the WHATWG index maps them to the C1 code points of the same value.
      const mine = windows1252(Uint8Array.from([b]));
      expect(mine, `byte 0x${b.toString(16)}`).toBe(theirs[b] === '\ufffd' ? String.fromCharCode(b) : theirs[b]);
    }
  });
  it('a zero byte (UTF-16 without a byte-order mark) and a broken UTF-8 file behind a BOM are refused with how to save them', async () => {
    const r = await run(['plan', file('u16.csv', Buffer.from('study,cell\r\n', 'utf16le'))]);
    expect(r.code).toBe(2);
    expect(r.err).toEqual([expect.stringMatching(/has a zero byte at byte 2: it is not a text table \(UTF-16 is read only with a byte-order mark; save it as "CSV UTF-8"\)$/)]);
    const broken = await run(['plan', file('bom.csv', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('study\r\nR'), Buffer.from([0xe9, 0x0d, 0x0a])]))]);
    expect(broken.err[0]).toMatch(/starts with a UTF-8 byte-order mark but byte 12 is not UTF-8: save it again as "CSV UTF-8"/);
  });
});

describe('CSV delimiter', () => {
  it('";" when the header has no "," (a European spreadsheet\'s CSV); a decimal comma then stays text and is refused by its field', async () => {
    const f = file('semi.csv', `${HEAD.join(';')}\r\ns1;1;1550 nm;50 nm;100;1%\r\ns2;1;1550 nm;50 nm;100;0,5%\r\n`);
    const t = await readTable(f);
    expect(t.delimiter).toBe(';');
    expect(values(t)).toEqual([ROW, ['s2', '1', '1550 nm', '50 nm', '100', '0,5%']]);
    expect(describeRead(t)).toBe(`${f}: header on row 1, 2 studies (';'-separated)`);
    const r = await run(['plan', f]);
    expect(r.code).toBe(1);
    expect(r.err).toEqual(['hush plan: row 3: intensity_error must be a number or a percentage such as 0.01 or 1% (got "0,5%")']);
  });
  it('"," when the header has one, even with ";" in its cells', async () => {
    const t = await readTable(file('comma.csv', `${HEAD.join(',')},remark\r\n${ROW.join(',')},"a;b"\r\n`));
    expect(t.delimiter).toBe(',');
    expect(t.rows[0].values[6]).toBe('a;b');
  });
});

describe('the header row', () => {
  it('is found below title rows, rows keep their numbers, and the read line says where', async () => {
    const f = file('title.csv', `Lantern Bay studies (invented example)\r\nprepared for the Q3 proposal\r\n${HEAD.join(',')}\r\n${ROW.join(',')}\r\n,,,,,\r\ns3,1,1310 nm,40 nm,80,0.5%\r\n`);
    const t = await readTable(f);
    expect(t.header.number).toBe(3);
    expect(t.above.map((r) => r.values[0])).toEqual(['Lantern Bay studies (invented example)', 'prepared for the Q3 proposal']);
    expect(t.rows.map((r) => r.number)).toEqual([4, 5, 6]);
    expect(describeRead(t)).toBe(`${f}: header on row 3, 2 studies`);
    const r = await run(['plan', f, '--out', join(dir, 'title-plan.json')]);
    expect(r.code).toBe(0);
    expect(r.out[0]).toBe(`${f}: header on row 3, 2 studies`);
    const j = JSON.parse(readFileSync(join(dir, 'title-plan.json'), 'utf8'));
    expect(j.source.header_row).toBe(3);
    expect(j.source.rows_above_header).toEqual([['Lantern Bay studies (invented example)'], ['prepared for the Q3 proposal']]);
    expect(j.rows.map((x: { row: number; outputs: unknown }) => [x.row, x.outputs === null])).toEqual([
      [4, false],
      [5, true],
      [6, false],
    ]);
  });
  it('a title that is a field name alone ("Study") does not hide the header below it', async () => {
    const t = await readTable(file('study-title.csv', `Study\r\n${HEAD.join(',')}\r\n${ROW.join(',')}\r\n`));
    expect(t.header.number).toBe(2);
  });
  it('a table whose first 20 rows name no plan field is refused', async () => {
    const r = await run(['plan', file('none.csv', 'a,b\r\n1,2\r\n')]);
    expect(r.code).toBe(2);
    expect(r.err).toEqual([expect.stringMatching(/cannot read .*none\.csv: has no header row: none of its first 20 rows names a plan field \(study, band_short, cell, intensity_error, …\)$/)]);
  });
});

describe('nothing typed is dropped', () => {
  it('cells beyond the header are kept under a generated header named by their column, and said so', async () => {
    const f = file('beyond.csv', `${HEAD.join(',')},remark\r\n${ROW.join(',')},ok,,,stray\r\n`);
    const t = await readTable(f);
    expect(t.columns.map((c) => c.name)).toEqual([...HEAD, 'remark', '', '', 'column J']);
    expect(t.columns[9]).toMatchObject({ generated: true, field: null, key: 'column J' });
    const out = join(dir, 'beyond.csv.json');
    const r = await run(['plan', f, '--out', out]);
    expect(r.err).toEqual(['hush plan: columns kept as they are (not plan fields): "column J" (no header; cells below it)']);
    expect(JSON.parse(readFileSync(out, 'utf8')).rows[0].inputs['column J']).toBe('stray');
    const csv = join(dir, 'beyond-plan.csv');
    await run(['plan', f, '--out', csv]);
    const lines = readFileSync(csv, 'utf8').split('\r\n');
    expect(lines[0]).toMatch(/^\uFEFFstudy,dimensions,band_short,cell,cells_x,intensity_error,remark,,,column J,required_reflection/);
    expect(lines[1]).toMatch(/^s1,1,1550 nm,50 nm,100,1%,ok,,,stray,0\.00/);
  });
  it('a field given in two columns fails each row that gives it, naming both cells', async () => {
    const f = file('twice.csv', `${HEAD.join(',')},intensity_error\r\ns1,1,1550 nm,50 nm,100,1%,10%\r\ns2,1,1550 nm,50 nm,100,,\r\ns3,1,1550 nm,50 nm,100,1%,\r\n`);
    const r = await run(['plan', f]);
    expect(r.code).toBe(1);
    expect(r.err).toEqual([
      'hush plan: intensity_error appears in columns F and G: rows that give it fail; keep one of those columns',
      'hush plan: row 2: intensity_error appears in columns F and G (F2 "1%", G2 "10%"): keep one of those columns',
      // Row 3 gives it in neither column: the field's own error.
      'hush plan: row 3: intensity_error is required: the tolerated relative intensity error, e.g. 1% or 0.01',
      'hush plan: row 4: intensity_error appears in columns F and G (F4 "1%", G4 (empty)): keep one of those columns',
    ]);
  });
  it('JSON keeps every column: a repeated name gets its column letter, "__proto__" is a key like any other', async () => {
    const f = file('proto.csv', `${HEAD.join(',')},remark,__proto__,remark,constructor\r\n${ROW.join(',')},first,p,second,c\r\n`);
    const out = join(dir, 'proto.json');
    expect((await run(['plan', f, '--out', out])).code).toBe(0);
    const j = JSON.parse(readFileSync(out, 'utf8'));
    const inputs = j.rows[0].inputs;
    expect(Object.keys(inputs)).toEqual([...HEAD, 'remark (column G)', '__proto__', 'remark (column I)', 'constructor']);
    expect(Object.getOwnPropertyDescriptor(inputs, '__proto__')?.value).toBe('p');
    expect(inputs['remark (column G)']).toBe('first');
    expect(inputs['remark (column I)']).toBe('second');
  });
});

describe('.xlsx sheets', () => {
  const studies = rowXml(1, HEAD) + rowXml(2, ['sheet study', 1, '1550 nm', '50 nm', 100, 0.01]);
  const cover = rowXml(1, ['Lantern Bay Photonics Lab: study plan (invented example)']) + rowXml(3, ['see the next sheet']);
  it('without --sheet: the first visible sheet with a header (a cover sheet and a hidden sheet are passed over)', async () => {
    const f = file('book.xlsx', buildXlsx({ sheets: [{ name: 'cover', data: cover }, { name: 'old', data: studies, state: 'hidden' }, { name: 'studies', data: studies }] }));
    const t = await readTable(f);
    expect(t.sheet).toMatchObject({ name: 'studies', position: 3, count: 3 });
    expect(describeRead(t)).toBe(`${f}: sheet 'studies' (3 of 3; before it 'cover' has no header), header on row 1, 1 study`);
    const r = await run(['plan', f]);
    expect(r.code).toBe(0);
    expect(r.out.at(-1)).toMatch(/^1 planned, 0 failed/);
  });
  it('--sheet NAME or N reads that sheet, hidden or not; a sheet that is not there is refused with the list', async () => {
    const f = file('book2.xlsx', buildXlsx({ sheets: [{ name: 'studies', data: studies }, { name: 'Old Plan', data: rowXml(1, HEAD) + rowXml(2, ['old', 1, '1310 nm', '40 nm', 80, 0.02]), state: 'hidden' }] }));
    expect((await readTable(f, { sheet: 'old plan' })).rows[0].values[0]).toBe('old');
    expect((await readTable(f, { sheet: '2' })).rows[0].values[0]).toBe('old');
    const r = await run(['plan', f, '--sheet', 'nope']);
    expect(r.code).toBe(2);
    expect(r.err).toEqual([`hush plan: cannot read ${f}: has no sheet "nope"; its sheets: 'studies', 'Old Plan' (hidden)`]);
    expect((await run(['plan', f, '--sheet', '3'])).err[0]).toMatch(/has no sheet "3" \(it has 2\)/);
    expect((await run(['plan', file('t.csv', `${HEAD.join(',')}\r\n`), '--sheet', '1'])).err).toEqual(['hush plan: --sheet applies to .xlsx tables (a CSV file has one table)']);
  });
  it('a workbook whose only table is on a hidden sheet, or that has none, is refused (not "0 planned, 0 failed")', async () => {
    const f = file('hidden.xlsx', buildXlsx({ sheets: [{ name: 'cover', data: cover }, { name: 'studies', data: studies, state: 'hidden' }] }));
    const r = await run(['plan', f]);
    expect(r.code).toBe(2);
    expect(r.err).toEqual([
      `hush plan: cannot read ${f}: no visible sheet has a header row naming plan fields (study, band_short, cell, …) within its first 20 rows; sheets: 'cover', 'studies' (hidden); hidden sheet 'studies' has one: give --sheet "studies" to plan it`,
    ]);
  });
  it('the header below a title row on a sheet, and cells placed from B3 on, keep their places', async () => {
    const data = rowXml(1, ['Plan of the quarter']) + rowXml(3, HEAD, 1) + rowXml(4, ['b-study', 1, '1550 nm', '50 nm', 100, 0.01], 1);
    const t = await readTable(file('b3.xlsx', buildXlsx({ sheets: [{ name: 'S', data }] })));
    expect(t.header.number).toBe(3);
    expect(t.columns[0]).toMatchObject({ name: '', field: null });
    expect(t.columns[1]).toMatchObject({ name: 'study', field: 'study' });
    expect(t.rows[0].values).toEqual(['', 'b-study', 1, '1550 nm', '50 nm', 100, 0.01]);
    expect(t.above.map((r) => r.number)).toEqual([1, 2]);
  });
});

describe('.xlsx cells (ECMA-376 Part 1, §18.3 and §18.4)', () => {
  const styles =
    '<?xml version="1.0" encoding="UTF-8"?><styleSheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">' +
    '<numFmts count="1"><numFmt numFmtId="164" formatCode="0.000&quot; nm&quot;"/></numFmts>' +
    '<cellXfs count="4"><xf numFmtId="0"/><xf numFmtId="164"/><xf numFmtId="10"/><xf numFmtId="14"/></cellXfs></styleSheet>';
  it('shared and rich strings (phonetic runs left out), booleans, errors, numbers with their formats, dates, escapes', async () => {
    const data =
      rowXml(1, [...HEAD, 'flag', 'check', 'when']) +
      '<row r="2"><c r="A2" t="s"><v>0</v></c><c r="B2"><v>1</v></c><c r="C2" t="s"><v>1</v></c><c r="D2" s="1"><v>50</v></c>' +
      '<c r="E2"><v>100</v></c><c r="F2" s="2"><v>0.01</v></c><c r="G2" t="b"><v>1</v></c><c r="H2" t="e"><v>#N/A</v></c><c r="I2" s="3"><v>45123</v></c></row>';
    const f = file('cells.xlsx', buildXlsx({ sheets: [{ name: 'S', data }], sharedStrings: ['<r><t>Beacon </t></r><r><rPr><b/></rPr><t>ring_x000D_</t></r><rPh><t>ビーコン</t></rPh>', '1550 nm'], styles }));
    const t = await readTable(f);
    expect(t.rows[0].values).toEqual(['Beacon ring\r', 1, '1550 nm', 50, 100, 0.01, true, '#N/A', 45123]);
    expect(t.rows[0].formats).toEqual([undefined, undefined, undefined, '0.000" nm"', undefined, '0.00%', undefined, undefined, 'mm-dd-yy']);
    // Derived: 1899-12-30 + 45123 days = 2023-07-16 and + 43831 days = 2020-01-01 (Python's datetime agrees); serial 1 is 1900-01-01,
    // 60 the 29 February 1900 spreadsheets count, 61 is 1900-03-01 (common practice); 1904 system: serial 0 is 1904-01-01.
    expect(serialDateText(45123, false)).toBe('2023-07-16');
    expect(serialDateText(43831.5, false)).toBe('2020-01-01T12:00:00');
    expect([1, 59, 60, 61].map((s) => serialDateText(s, false))).toEqual(['1900-01-01', '1900-02-28', '1900-02-29', '1900-03-01']);
    expect(serialDateText(0, true)).toBe('1904-01-01');
    expect(isDateFormat('mm-dd-yy')).toBe(true);
    expect(isDateFormat('0.000" nm"')).toBe(false);
    expect(isDateFormat('[Red]0.00')).toBe(false);
    expect(isDateFormat('[h]:mm:ss')).toBe(true);
  });
  it('a formula keeps its saved result; one without a result fails its row with what to do (not "[object Object]")', async () => {
    const data =
      rowXml(1, HEAD) +
      '<row r="2"><c r="A2" t="inlineStr"><is><t>with result</t></is></c><c r="B2"><v>1</v></c><c r="C2" t="inlineStr"><is><t>1550 nm</t></is></c>' +
      '<c r="D2"><f>25*2</f><v>50</v></c><c r="E2" t="str"><f>"1"&amp;"00"</f><v>100</v></c><c r="F2"><v>0.01</v></c></row>' +
      '<row r="3"><c r="A3" t="inlineStr"><is><t>no result</t></is></c><c r="B3"><v>1</v></c><c r="C3" t="inlineStr"><is><t>1550 nm</t></is></c>' +
      '<c r="D3"><f>25*2</f></c><c r="E3"><v>100</v></c><c r="F3"><v>0.01</v></c></row>';
    const f = file('formula.xlsx', buildXlsx({ sheets: [{ name: 'S', data }] }));
    const t = await readTable(f);
    expect(t.rows[0].values.slice(3, 5)).toEqual([50, '100']);
    expect(t.rows[0].formulas?.slice(3, 5)).toEqual(['25*2', '"1"&"00"']);
    const r = await run(['plan', f]);
    expect(r.code).toBe(1);
    expect(r.err).toEqual([
      'hush plan: row 3: cell in D3 is a formula (=25*2) without a saved result: open the workbook in a spreadsheet program and save it, so the result is stored with the formula',
    ]);
  });
  it('a date where a quantity belongs fails its row, naming the date', async () => {
    const data = rowXml(1, HEAD) + '<row r="2"><c r="A2" t="inlineStr"><is><t>d</t></is></c><c r="B2"><v>1</v></c><c r="C2" t="inlineStr"><is><t>1550 nm</t></is></c><c r="D2" s="3"><v>50</v></c><c r="E2"><v>100</v></c><c r="F2"><v>0.01</v></c></row>';
    const r = await run(['plan', file('date.xlsx', buildXlsx({ sheets: [{ name: 'S', data }], styles }))]);
    expect(r.err).toEqual(['hush plan: row 2: cell in D2 is a date (1900-02-19), not a cell value; format the cell as a number or text']);
  });
  it('shared formulas: a follower cell gets the first cell\'s formula moved by its offset (relative references only)', () => {
    expect(slideFormula('A2*2', 3, 0)).toBe('A5*2');
    expect(slideFormula('$A$1+A2+B$2+$C3', 3, 1)).toBe('$A$1+B5+C$2+$C6');
    expect(slideFormula('SUM(A2:A3)&"A2"', 1, 0)).toBe('SUM(A3:A4)&"A2"');
    expect(slideFormula('LOG10(A2)', 1, 0)).toBe('LOG10(A3)');
    const data =
      rowXml(1, ['study', 'cells_x', 'twice']) +
      '<row r="2"><c r="A2" t="inlineStr"><is><t>a</t></is></c><c r="B2"><v>10</v></c><c r="C2"><f t="shared" ref="C2:C3" si="0">B2*2</f><v>20</v></c></row>' +
      '<row r="3"><c r="A3" t="inlineStr"><is><t>b</t></is></c><c r="B3"><v>30</v></c><c r="C3"><f t="shared" si="0"/><v>60</v></c></row>';
    return readTable(file('shared.xlsx', buildXlsx({ sheets: [{ name: 'S', data }] }))).then((t) => {
      expect(t.rows.map((r) => r.formulas?.[2])).toEqual(['B2*2', 'B3*2']);
    });
  });
  it('parts written with a namespace prefix ("x:row") read like the usual ones', async () => {
    const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
    const sheet = `<?xml version="1.0" encoding="UTF-8"?><x:worksheet xmlns:x="${NS}"><x:sheetData>${rowXml(1, HEAD).replace(/<(\/?)(row|c|is|t|v)\b/g, '<$1x:$2')}${rowXml(2, ROW).replace(/<(\/?)(row|c|is|t|v)\b/g, '<$1x:$2')}</x:sheetData></x:worksheet>`;
    const t = await readTable(file('prefix.xlsx', buildXlsx({ sheets: [{ name: 'S', data: sheet }] })));
    expect(values(t)).toEqual([ROW]);
  });
  it('control characters a spreadsheet escapes as _xHHHH_ come back as typed, and go out the same way', () => {
    expect(ooxmlUnescape('a_x001B_[31mred_x005F_x0041_')).toBe('a\u001b[31mred_x0041_');
    expect(ooxmlEscape('a\u001b[31mred_x0041_')).toBe('a_x001B_[31mred_x005F_x0041_');
    expect(ooxmlUnescape(ooxmlEscape('\u0000\u0008\u000b_x1234_\t\n'))).toBe('\u0000\u0008\u000b_x1234_\t\n');
  });
});

describe('plain numbers (a CSV cell that becomes a number cell in the workbook)', () => {
  it('decimal notation with at most 15 significant digits and no padding zeros; anything else stays text', () => {
    expect(['1.44', '-2', '+3', '.5', '6e8', '1.5E-3', '0', '0.000001', '1500000000000000000000'].map(plainNumber)).toEqual([1.44, -2, 3, 0.5, 6e8, 1.5e-3, 0, 1e-6, 1.5e21]);
    expect(['007', '1,5', '1 550', '1550 nm', '0x10', '1.2345678901234567', 'Infinity', '', '1e400', '-01'].map(plainNumber)).toEqual(Array(10).fill(null));
  });
});

describe('prices: a number with an optional currency and /h; k = ×10³ and M = ×10⁶, never ignored', () => {
  it('reads the forms a proposal uses', () => {
    expect(priceParts('price_per_hour', '$2.5k/h')).toEqual({ value: 2500, currency: '$' });
    expect(priceParts('price_per_hour', '2.5M')).toEqual({ value: 2.5e6, currency: '' });
    expect(priceParts('price_per_hour', '2.5 kEUR/h')).toEqual({ value: 2500, currency: 'EUR' });
    expect(priceParts('price_per_hour', '2.40 eur per hour')).toEqual({ value: 2.4, currency: 'EUR' });
    expect(priceParts('price_per_hour', '€2.50/node-hour')).toEqual({ value: 2.5, currency: '€' });
    expect(priceParts('price_per_hour', '25 kr/h')).toEqual({ value: 25, currency: 'kr' });
    expect(priceParts('price_per_hour', '2.5 KES')).toEqual({ value: 2.5, currency: 'KES' });
    expect(parsePrice('price_per_hour', '3')).toBe(3);
  });
  it('refuses what could be a multiplier it does not know, or two currencies', () => {
    for (const t of ['2.5 mio', '2.5m', '2.5 bn', '2.5 G', '$2.5 USD', '2.5kk', 'free', '1,200']) {
      expect(() => parsePrice('price_per_hour', t), t).toThrow(/price_per_hour must be a price per hour such as 3, 3\/h, \$3\/h, 2\.40 EUR\/h or \$2\.5k\/h \(k = ×1000, M = ×1000000\)/);
    }
  });
});

describe('rows that differ only in their study name', () => {
  it('share one plan: planned once, the others answered from it', async () => {
    const rows = Array.from({ length: 40 }, (_, k) => [`copy ${k}`, ...ROW.slice(1)].join(','));
    const t = await readTable(file('copies.csv', `${HEAD.join(',')}\r\n${rows.join('\r\n')}\r\n`));
    const p = planTable(t);
    expect(p.work).toEqual({ planned: 1, reused: 39 });
    expect(new Set(p.plans).size).toBe(1);
    expect(new Set(p.planned.map((r) => r.outputs)).size).toBe(1);
    expect(p.planned.map((r) => r.figures?.study)).toEqual(Array.from({ length: 40 }, (_, k) => `copy ${k}`));
  });
});

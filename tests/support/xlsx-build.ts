/**
 * A minimal .xlsx builder for tests (ECMA-376 SpreadsheetML in a zip,
 * PKWARE APPNOTE.TXT 4.3): the test gives each sheet's XML (or rows of
 * cells), and the builder adds the workbook, relationships and content
 * types. Lets the tests make hostile and odd workbooks (a cell at XFD1,
 * 100,001 rows, hidden sheets, formulas without results) in milliseconds,
 * without checking large files in.
 */
import { deflateRawSync, crc32 } from 'zlib';

export interface SheetSpec {
  name: string;
  /** The <sheetData> content, or the whole worksheet XML when it starts with "<?xml" or "<worksheet". */
  data: string;
  state?: 'hidden' | 'veryHidden';
  /** Comments part content (<comment> elements). */
  comments?: string;
}

export interface BookSpec {
  sheets: SheetSpec[];
  /** <si> elements of the shared strings part. */
  sharedStrings?: string[];
  /** The styles part (whole XML). */
  styles?: string;
  date1904?: boolean;
  /** Store parts uncompressed. */
  store?: boolean;
}

export function xmlEscape(t: string): string {
  return t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** A row of cells; strings become inline strings, numbers numbers. */
export function rowXml(r: number, cells: (string | number | null)[], firstColumn = 0): string {
  const letters = (i: number) => {
    let n = i + 1;
    let s = '';
    while (n > 0) {
      s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
      n = Math.floor((n - 1) / 26);
    }
    return s;
  };
  const cs = cells
    .map((v, k) => {
      if (v === null) return '';
      const ref = `${letters(firstColumn + k)}${r}`;
      return typeof v === 'number' ? `<c r="${ref}"><v>${v}</v></c>` : `<c r="${ref}" t="inlineStr"><is><t>${xmlEscape(v)}</t></is></c>`;
    })
    .join('');
  return `<row r="${r}">${cs}</row>`;
}

const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const RNS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const PR = 'http://schemas.openxmlformats.org/package/2006/relationships';

export function zip(files: [string, string | Buffer][], store = false): Buffer {
  const locals: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const [name, content] of files) {
    const data = Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8');
    const packed = store ? data : deflateRawSync(data);
    const n = Buffer.from(name, 'utf8');
    const crc = crc32(data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0x800, 6);
    local.writeUInt16LE(store ? 0 : 8, 8);
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(packed.length, 18);
    local.writeUInt32LE(data.length, 22);
    local.writeUInt16LE(n.length, 26);
    locals.push(local, n, packed);
    const c = Buffer.alloc(46);
    c.writeUInt32LE(0x02014b50, 0);
    c.writeUInt16LE(20, 4);
    c.writeUInt16LE(20, 6);
    c.writeUInt16LE(0x800, 8);
    c.writeUInt16LE(store ? 0 : 8, 10);
    c.writeUInt32LE(crc, 16);
    c.writeUInt32LE(packed.length, 20);
    c.writeUInt32LE(data.length, 24);
    c.writeUInt16LE(n.length, 28);
    c.writeUInt32LE(offset, 42);
    central.push(c, n);
    offset += 30 + n.length + packed.length;
  }
  const dir = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(files.length, 8);
  end.writeUInt16LE(files.length, 10);
  end.writeUInt32LE(dir.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, dir, end]);
}

export function buildXlsx(spec: BookSpec): Buffer {
  const files: [string, string][] = [];
  const types = [
    '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>',
    '<Default Extension="xml" ContentType="application/xml"/>',
    '<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>',
  ];
  const rels: string[] = [];
  const sheets: string[] = [];
  spec.sheets.forEach((s, k) => {
    const n = k + 1;
    const xml = s.data.startsWith('<?xml') || s.data.startsWith('<worksheet') ? s.data : `<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="${NS}" xmlns:r="${RNS}"><sheetData>${s.data}</sheetData></worksheet>`;
    files.push([`xl/worksheets/sheet${n}.xml`, xml]);
    types.push(`<Override PartName="/xl/worksheets/sheet${n}.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>`);
    rels.push(`<Relationship Id="rId${n}" Type="${RNS}/worksheet" Target="worksheets/sheet${n}.xml"/>`);
    sheets.push(`<sheet name="${xmlEscape(s.name)}" sheetId="${n}"${s.state ? ` state="${s.state}"` : ''} r:id="rId${n}"/>`);
    if (s.comments) {
      files.push([`xl/comments${n}.xml`, `<?xml version="1.0" encoding="UTF-8"?><comments xmlns="${NS}"><authors><author>t</author></authors><commentList>${s.comments}</commentList></comments>`]);
      files.push([`xl/worksheets/_rels/sheet${n}.xml.rels`, `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="${PR}"><Relationship Id="rId1" Type="${RNS}/comments" Target="../comments${n}.xml"/></Relationships>`]);
    }
  });
  if (spec.sharedStrings) {
    files.push(['xl/sharedStrings.xml', `<?xml version="1.0" encoding="UTF-8"?><sst xmlns="${NS}" count="${spec.sharedStrings.length}">${spec.sharedStrings.map((t) => (t.startsWith('<') ? `<si>${t}</si>` : `<si><t>${xmlEscape(t)}</t></si>`)).join('')}</sst>`]);
    rels.push(`<Relationship Id="rIdS" Type="${RNS}/sharedStrings" Target="sharedStrings.xml"/>`);
  }
  if (spec.styles) {
    files.push(['xl/styles.xml', spec.styles]);
    rels.push(`<Relationship Id="rIdT" Type="${RNS}/styles" Target="styles.xml"/>`);
  }
  files.unshift(
    ['[Content_Types].xml', `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">${types.join('')}</Types>`],
    ['_rels/.rels', `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="${PR}"><Relationship Id="rId1" Type="${RNS}/officeDocument" Target="xl/workbook.xml"/></Relationships>`],
    ['xl/workbook.xml', `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="${NS}" xmlns:r="${RNS}">${spec.date1904 ? '<workbookPr date1904="1"/>' : ''}<sheets>${sheets.join('')}</sheets></workbook>`],
    ['xl/_rels/workbook.xml.rels', `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="${PR}">${rels.join('')}</Relationships>`],
  );
  return zip(files, spec.store);
}

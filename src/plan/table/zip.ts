/**
 * The zip container of an .xlsx (PKWARE APPNOTE.TXT, sections 4.3 and 4.4):
 * the central directory lists the parts, each part is read on its own
 * (stored or deflated) and unpacked in chunks against a byte budget, so a
 * part is read only as far as it is needed and an archive that unpacks to
 * far more than it holds is refused early. Also fixes the timestamps of a
 * written archive, so the same workbook gives the same bytes.
 */
import { createInflateRaw } from 'zlib';

export class ZipError extends Error {}

export interface ZipEntry {
  name: string;
  method: number;
  flags: number;
  compressedSize: number;
  size: number;
  /** Offset of the local file header. */
  offset: number;
}

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;
const LOCAL = 0x04034b50;

function findEndOfCentralDirectory(buf: Buffer): number {
  // The end record is 22 bytes plus a comment of at most 65,535 bytes.
  const stop = Math.max(0, buf.length - 22 - 65535);
  for (let i = buf.length - 22; i >= stop; i--) if (buf.readUInt32LE(i) === EOCD) return i;
  return -1;
}

/** The parts of a zip archive by name. Throws ZipError when `buf` is not a zip archive this reader handles. */
export function zipEntries(buf: Buffer): Map<string, ZipEntry> {
  const end = buf.length >= 22 ? findEndOfCentralDirectory(buf) : -1;
  if (end < 0) throw new ZipError('not a zip archive');
  const count = buf.readUInt16LE(end + 10);
  const size = buf.readUInt32LE(end + 12);
  let p = buf.readUInt32LE(end + 16);
  if (count === 0xffff || size === 0xffffffff || p === 0xffffffff) throw new ZipError('a ZIP64 archive (larger than a project table can be)');
  if (p + size > buf.length) throw new ZipError('the zip directory lies outside the file (truncated or damaged)');
  const entries = new Map<string, ZipEntry>();
  for (let k = 0; k < count; k++) {
    if (p + 46 > buf.length || buf.readUInt32LE(p) !== CENTRAL) throw new ZipError('damaged zip directory');
    const flags = buf.readUInt16LE(p + 8);
    const method = buf.readUInt16LE(p + 10);
    const compressedSize = buf.readUInt32LE(p + 20);
    const uncompressed = buf.readUInt32LE(p + 24);
    const nameLength = buf.readUInt16LE(p + 28);
    const extra = buf.readUInt16LE(p + 30);
    const comment = buf.readUInt16LE(p + 32);
    const offset = buf.readUInt32LE(p + 42);
    const name = buf.toString(flags & 0x800 ? 'utf8' : 'latin1', p + 46, p + 46 + nameLength);
    entries.set(name.replace(/^\/+/, ''), { name, method, flags, compressedSize, size: uncompressed, offset });
    p += 46 + nameLength + extra + comment;
  }
  return entries;
}

/** Budget of unpacked bytes shared by the parts read from one archive. */
export interface UnpackBudget {
  /** Bytes still allowed. */
  left: number;
  /** Bytes unpacked so far (counted work). */
  used: number;
}

/** Thrown when the budget is spent. */
export class BudgetSpent extends Error {}

/**
 * Chunks of one part, unpacked. Stops (and frees the inflater) when the
 * caller stops iterating; throws BudgetSpent when the budget runs out.
 */
export async function* entryChunks(buf: Buffer, e: ZipEntry, budget: UnpackBudget): AsyncGenerator<Buffer> {
  if (e.flags & 1) throw new ZipError(`part ${e.name} is encrypted`);
  if (buf.readUInt32LE(e.offset) !== LOCAL) throw new ZipError(`damaged zip part ${e.name}`);
  const start = e.offset + 30 + buf.readUInt16LE(e.offset + 26) + buf.readUInt16LE(e.offset + 28);
  const end = start + e.compressedSize;
  if (end > buf.length) throw new ZipError(`zip part ${e.name} is truncated`);
  const data = buf.subarray(start, end);
  const spend = (n: number) => {
    budget.used += n;
    budget.left -= n;
    if (budget.left < 0) throw new BudgetSpent(`unpacks to more than the bytes allowed`);
  };
  if (e.method === 0) {
    for (let i = 0; i < data.length; i += 65536) {
      const chunk = data.subarray(i, Math.min(data.length, i + 65536));
      spend(chunk.length);
      yield chunk;
    }
    return;
  }
  if (e.method !== 8) throw new ZipError(`zip part ${e.name} uses compression method ${e.method} (only stored and deflated parts are read)`);
  const inflater = createInflateRaw({ chunkSize: 65536 });
  inflater.end(data);
  try {
    for await (const chunk of inflater as AsyncIterable<Buffer>) {
      spend(chunk.length);
      yield chunk;
    }
  } catch (err) {
    if (err instanceof BudgetSpent) throw err;
    throw new ZipError(`zip part ${e.name} does not unpack (${err instanceof Error ? err.message : String(err)})`);
  } finally {
    inflater.destroy();
  }
}

/**
 * Sets the modification time of every part of a zip archive to 1980-01-01
 * 00:00 (the earliest MS-DOS date a zip records), in place, so that writing
 * the same workbook twice gives the same bytes.
 */
export function fixZipTimes(buf: Buffer): void {
  const DOS_DATE = (0 << 9) | (1 << 5) | 1; // 1980-01-01
  const DOS_TIME = 0;
  const end = findEndOfCentralDirectory(buf);
  if (end < 0) throw new ZipError('not a zip archive');
  const count = buf.readUInt16LE(end + 10);
  let p = buf.readUInt32LE(end + 16);
  for (let k = 0; k < count; k++) {
    if (buf.readUInt32LE(p) !== CENTRAL) throw new ZipError('damaged zip directory');
    buf.writeUInt16LE(DOS_TIME, p + 12);
    buf.writeUInt16LE(DOS_DATE, p + 14);
    const local = buf.readUInt32LE(p + 42);
    if (buf.readUInt32LE(local) !== LOCAL) throw new ZipError('damaged zip part');
    buf.writeUInt16LE(DOS_TIME, local + 10);
    buf.writeUInt16LE(DOS_DATE, local + 12);
    p += 46 + buf.readUInt16LE(p + 28) + buf.readUInt16LE(p + 30) + buf.readUInt16LE(p + 32);
  }
}

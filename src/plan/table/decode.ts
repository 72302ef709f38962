/**
 * Bytes of a text table → text. UTF-8 (with or without a byte-order mark)
 * and UTF-16 with a byte-order mark are read as they are. Bytes that are not
 * valid UTF-8 are read as Windows-1252, the encoding of a "CSV" saved by a
 * spreadsheet program on a Western-language Windows (its "CSV UTF-8" is
 * UTF-8), with a note that says so and how to save UTF-8 instead.
 */
import { HushInputError } from '../../physics/errors';

export type TextEncoding = 'UTF-8' | 'UTF-16LE' | 'UTF-16BE' | 'Windows-1252';

export interface DecodedText {
  text: string;
  encoding: TextEncoding;
  /** Set when the encoding was guessed: what was done and how to avoid the guess. */
  note: string | null;
}

/** Decodes a table file's bytes; `name` is used in messages. */
export function decodeTable(bytes: Uint8Array, name: string): DecodedText {
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { text: utf8(bytes.subarray(3), name), encoding: 'UTF-8', note: null };
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: new TextDecoder('utf-16le').decode(bytes.subarray(2)), encoding: 'UTF-16LE', note: null };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: new TextDecoder('utf-16be').decode(bytes.subarray(2)), encoding: 'UTF-16BE', note: null };
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    throw new HushInputError(
      'table',
      `${name} has a zero byte at byte ${nul + 1}: it is not a text table (UTF-16 is read only with a byte-order mark; save it as "CSV UTF-8")`,
      'value',
    );
  }
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), encoding: 'UTF-8', note: null };
  } catch {
    const at = firstInvalidUtf8(bytes);
    return {
      text: windows1252(bytes),
      encoding: 'Windows-1252',
      note:
        `${name} is not UTF-8 (byte ${at + 1} is 0x${bytes[at].toString(16).toUpperCase().padStart(2, '0')}); read as Windows-1252, the encoding of a "CSV" ` +
        'saved by a Western-language Windows spreadsheet program; if names look wrong, save the table as "CSV UTF-8"',
    };
  }
}

function utf8(bytes: Uint8Array, name: string): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    const at = firstInvalidUtf8(bytes) + 3;
    throw new HushInputError('table', `${name} starts with a UTF-8 byte-order mark but byte ${at + 1} is not UTF-8: save it again as "CSV UTF-8"`, 'value');
  }
}

/** Index of the first byte that does not belong to a well-formed UTF-8 sequence (RFC 3629, section 4). */
function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i];
    let n: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c < 0x80) n = 0;
    else if (c >= 0xc2 && c <= 0xdf) n = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      n = 2;
      if (c === 0xe0) lo = 0xa0;
      if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      n = 3;
      if (c === 0xf0) lo = 0x90;
      if (c === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= n; k++) {
      const d = b[i + k];
      if (d === undefined || d < (k === 1 ? lo : 0x80) || d > (k === 1 ? hi : 0xbf)) return i;
    }
    i += n + 1;
  }
  return Math.max(0, b.length - 1);
}

/**
 * Windows-1252: Latin-1 except 0x80–0x9F, which hold € ‚ ƒ „ … † ‡ ˆ ‰ Š ‹ Œ Ž
 * ‘ ’ “ ” • – — ˜ ™ š › œ ž Ÿ (WHATWG Encoding Standard, index-windows-1252,
 * recalled from memory and checked in tests against Python's cp1252 codec);
 * the five bytes it leaves undefined map to the same C1 code points, as that
 * index does. Node's TextDecoder('windows-1252') decodes Latin-1 instead.
 */
const HIGH = [
  0x20ac, 0x81, 0x201a, 0x192, 0x201e, 0x2026, 0x2020, 0x2021, 0x2c6, 0x2030, 0x160, 0x2039, 0x152, 0x8d, 0x17d, 0x8f,
  0x90, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x2dc, 0x2122, 0x161, 0x203a, 0x153, 0x9d, 0x17e, 0x178,
];

export function windows1252(bytes: Uint8Array): string {
  let out = '';
  for (let i = 0; i < bytes.length; i += 8192) {
    const chunk = bytes.subarray(i, Math.min(bytes.length, i + 8192));
    const codes = new Array<number>(chunk.length);
    for (let k = 0; k < chunk.length; k++) {
      const b = chunk[k];
      codes[k] = b >= 0x80 && b <= 0x9f ? HIGH[b - 0x80] : b;
    }
    out += String.fromCharCode(...codes);
  }
  return out;
}

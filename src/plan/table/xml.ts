/**
 * Streaming XML of the parts of an .xlsx, through saxes (a SAX parser that
 * checks well-formedness and expands no external entities). Element and
 * attribute names are given without their namespace prefix, so parts written
 * with prefixes ("x:row") read like the usual ones. The text of one open
 * node is bounded, so a part cannot make the parser hold an unbounded string.
 */
import type { SaxesParser as Parser, SaxesTagPlain } from 'saxes';
import { MAX_CELL_CHARS } from './limits';

export interface XmlHandlers {
  open(name: string, attributes: Record<string, string>): void;
  close(name: string): void;
  text(text: string): void;
}

/** Thrown by a handler to stop reading a part early. */
export class StopReading extends Error {}

export class XmlError extends Error {}

function local(name: string): string {
  const i = name.indexOf(':');
  return i < 0 ? name : name.slice(i + 1);
}

/** Attributes by local name (namespace declarations left out; the first of two with one local name kept). */
function attributes(tag: SaxesTagPlain): Record<string, string> {
  const a = tag.attributes as Record<string, string>;
  let plain = true;
  for (const k in a) if (k.includes(':')) plain = false;
  // Most tags have no prefixed attribute: their attributes are used as they are (only known names are read from them).
  if (plain) return a;
  const out: Record<string, string> = Object.create(null);
  for (const [k, v] of Object.entries(a)) {
    if (k === 'xmlns' || k.startsWith('xmlns:')) continue;
    out[local(k)] ??= v as string;
  }
  return out;
}

/** Slack over a cell's characters for the text and names saxes holds while a node is open. */
const PENDING_LIMIT = MAX_CELL_CHARS * 2 + 4096;

/**
 * Feeds the chunks of one part to the handlers. Returns when the part ends
 * or a handler throws StopReading (the chunks are then no longer read).
 */
export async function readXml(chunks: AsyncIterable<Buffer>, part: string, h: XmlHandlers): Promise<void> {
  const { SaxesParser } = await import('saxes');
  const parser: Parser = new SaxesParser({ position: false });
  let failure: Error | null = null;
  parser.on('error', (e) => {
    failure ??= new XmlError(`part ${part} is not well-formed XML (${e.message})`);
  });
  parser.on('opentag', (t) => h.open(local(t.name), attributes(t as SaxesTagPlain)));
  parser.on('closetag', (t) => h.close(local(t.name)));
  parser.on('text', (t) => h.text(t));
  parser.on('cdata', (t) => h.text(t));
  parser.on('doctype', () => {
    failure ??= new XmlError(`part ${part} declares a document type, which spreadsheet files never do`);
  });
  const decoder = new TextDecoder('utf-8');
  const pending = parser as unknown as { text?: string; name?: string };
  try {
    for await (const chunk of chunks) {
      parser.write(decoder.decode(chunk, { stream: true }));
      if (failure) throw failure;
      if ((pending.text?.length ?? 0) > PENDING_LIMIT || (pending.name?.length ?? 0) > PENDING_LIMIT) {
        throw new XmlError(`part ${part} has a value or name of more than ${MAX_CELL_CHARS} characters`);
      }
    }
    parser.write(decoder.decode());
    parser.close();
    if (failure) throw failure;
  } catch (e) {
    if (e instanceof StopReading) return;
    throw e;
  }
}

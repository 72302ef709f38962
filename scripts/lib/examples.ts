/**
 * The worked examples of the worksheet functions, read from the JSDoc of
 * src/functions/functions.ts ("Example: =HUSH.NAME(arg, , "text") → value"):
 * shared by the examples test (which evaluates each one) and scripts/docs.ts
 * (which can rewrite the printed results after a deliberate model change).
 */

export interface Example {
  id: string;
  exportName: string;
  formula: string;
  args: unknown[];
  /** The printed result as written in the doc. */
  resultText: string;
  expected: unknown;
}

/** Splits a formula's argument list at top-level commas (not inside quotes or braces). */
export function splitTopLevel(text: string, separators: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let quoted = false;
  let current = '';
  for (const ch of text) {
    if (ch === '"') quoted = !quoted;
    if (!quoted && ch === '{') depth++;
    if (!quoted && ch === '}') depth--;
    if (!quoted && depth === 0 && separators.includes(ch)) {
      parts.push(current);
      current = '';
    } else {
      current += ch;
    }
  }
  parts.push(current);
  return parts;
}

/** An Excel literal: number, "text", TRUE/FALSE, {array}; an empty argument is omitted (null). */
export function literal(text: string): unknown {
  const t = text.trim();
  if (t === '') return null;
  if (t.startsWith('"') && t.endsWith('"')) return t.slice(1, -1).replace(/""/g, '"');
  if (/^(TRUE|FALSE)$/i.test(t)) return t.toUpperCase() === 'TRUE';
  if (t.startsWith('{') && t.endsWith('}')) {
    return splitTopLevel(t.slice(1, -1), ';').map((row) => splitTopLevel(row, ',').map(literal));
  }
  const n = Number(t);
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) || !Number.isFinite(n)) throw new Error(`cannot read the literal ${t}`);
  return n;
}

/** A value printed as the examples print it: numbers to 15 significant digits, text quoted, arrays in braces. */
export function printed(v: unknown): string {
  if (Array.isArray(v)) return `{${(v as unknown[][]).map((row) => row.map(printed).join(', ')).join('; ')}}`;
  if (typeof v === 'number') return String(Number(v.toPrecision(15)));
  if (typeof v === 'string') return `"${v.replace(/"/g, '""')}"`;
  return String(v);
}

export function collectExamples(source: string): { examples: Example[]; functionIds: string[]; misplaced: string[] } {
  const examples: Example[] = [];
  const functionIds: string[] = [];
  const misplaced: string[] = [];
  const block = /\/\*\*([\s\S]*?)\*\/\s*export function (\w+)/g;
  for (const m of source.matchAll(block)) {
    const doc = m[1];
    const exportName = m[2];
    const tag = /@customfunction\s+(\w+)/.exec(doc);
    if (!tag) continue;
    const id = tag[1];
    functionIds.push(id);
    for (const line of doc.split('\n')) {
      const ex = /Example:\s*(=HUSH\.(\w+)\((.*)\))\s*→\s*(.+?)\s*$/.exec(line.replace(/^\s*\*\s?/, ''));
      if (!ex) continue;
      const [, formula, name, argText, result] = ex;
      if (name !== id) misplaced.push(`example "${formula}" sits on the JSDoc of HUSH.${id}`);
      const args = argText.trim() === '' ? [] : splitTopLevel(argText, ',').map(literal);
      examples.push({ id, exportName, formula, args, resultText: result, expected: literal(result) });
    }
  }
  return { examples, functionIds, misplaced };
}

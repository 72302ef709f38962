/**
 * Documentation generated from the field registry (src/plan/fields) and kept
 * in the repository, so that a reader of the source sees it too:
 *  - the `@param` lines of the worksheet functions (src/functions/functions.ts)
 *    whose parameter is a registry field: meaning, accepted forms, range and
 *    default, exactly as the readers apply them (text after " — " on such a
 *    line is the function's own remark and is kept);
 *  - the README's table of project-table fields (between the markers
 *    <!-- fields:begin --> and <!-- fields:end -->);
 *  - the README's table of worksheet functions with each one's worked
 *    example and its exact result (<!-- functions:begin --> … end), from the
 *    same JSDoc the add-in's metadata and help pages are generated from.
 * `npx tsx scripts/docs.ts` rewrites both; `--check` only reports drift
 * (tests/fields.test.ts runs the same check); `--examples` also rewrites the
 * printed results of the worksheet functions' worked examples after a
 * deliberate change of the model or of an output (review the diff).
 */
import { readFileSync, writeFileSync } from 'fs';
import path from 'path';
import { INPUTS, TABLE_FIELDS, acceptedForms, bareUnitText, rangeText, type InputField } from '../src/plan/fields';

const root = path.join(__dirname, '..');
export const FUNCTIONS_FILE = path.join(root, 'src/functions/functions.ts');
export const README_FILE = path.join(root, 'README.md');

const byParam = new Map(INPUTS.map((f) => [f.param, f]));

/** The generated description of a worksheet parameter named after a registry field. */
export function paramText(f: InputField): string {
  const d = /^[a-z]/.test(f.description) ? f.description.charAt(0).toUpperCase() + f.description.slice(1) : f.description;
  const range = rangeText(f);
  return `${d}: ${acceptedForms(f)}${range ? `; ${range}` : ''}.${f.defaultText === 'required' ? '' : ` Default ${f.defaultText}.`}`;
}

/** functions.ts with every registry parameter's @param line regenerated. */
export function syncParams(source: string): string {
  return source.replace(/^(\s*\*\s*@param\s+)(\[?)(\w+)(\]?)\s+(.*)$/gm, (line, lead: string, open: string, name: string, close: string, text: string) => {
    const f = byParam.get(name);
    if (!f) return line;
    const remark = text.includes(' — ') ? text.slice(text.indexOf(' — ')) : '';
    return `${lead}${open}${name}${close} ${paramText(f)}${remark}`;
  });
}

/** Names used as worksheet parameters that are not registry fields, with what they are. */
export function nonRegistryParams(source: string): string[] {
  const out: string[] = [];
  for (const m of source.matchAll(/^\s*\*\s*@param\s+\[?(\w+)\]?/gm)) if (!byParam.has(m[1])) out.push(m[1]);
  return [...new Set(out)];
}

/** The README's table of project-table fields. */
export function fieldTable(): string {
  const rows = TABLE_FIELDS.map((f) => `| \`${f.name}\` | ${f.description} | ${bareUnitText(f)} | ${f.defaultText} |`);
  return ['| field | meaning | bare number in | default |', '|---|---|---|---|', ...rows].join('\n');
}

/** Longest example result shown in the README's function table; longer ones point to the help page. */
const MAX_README_RESULT = 160;

/** The README's table of worksheet functions: signature, description, worked example → exact result. */
export function functionTable(source: string): string {
  const rows: string[] = [];
  const block = /\/\*\*((?:(?!\/\*\*)[\s\S])*?)\*\/\s*export function (\w+)/g;
  for (const m of source.matchAll(block)) {
    const doc = m[1].split('\n').map((l) => l.replace(/^\s*\*\s?/, ''));
    const id = doc.find((l) => l.startsWith('@customfunction'))?.split(/\s+/)[1];
    if (!id) continue;
    const description = doc.find((l) => l.trim() !== '' && !l.startsWith('@') && !l.startsWith('Example:')) ?? '';
    const params = doc.filter((l) => l.startsWith('@param')).map((l) => l.split(/\s+/)[1]);
    const example = doc.find((l) => l.startsWith('Example:'))?.slice('Example:'.length).trim() ?? '';
    const shown = example.length > MAX_README_RESULT ? `${example.slice(0, example.indexOf(' → '))} → a row: see its help page` : example;
    const cell = (t: string) => t.replace(/\|/g, '\\|');
    rows.push(`| \`${id}(${params.join(', ')})\` | ${cell(description)} | \`${cell(shown)}\` |`);
  }
  return ['| function | what it returns | worked example → exact result |', '|---|---|---|', ...rows].join('\n');
}

function between(text: string, name: string, content: string): string {
  const begin = `<!-- ${name}:begin -->`;
  const end = `<!-- ${name}:end -->`;
  const a = text.indexOf(begin);
  const b = text.indexOf(end);
  if (a < 0 || b < a) throw new Error(`README.md lacks the markers ${begin} … ${end}`);
  return `${text.slice(0, a + begin.length)}\n${content}\n${text.slice(b)}`;
}

export function syncReadme(readme: string, functions: string = readFileSync(FUNCTIONS_FILE, 'utf8')): string {
  return between(between(readme, 'fields', fieldTable()), 'functions', functionTable(functions));
}

async function main(): Promise<void> {
  const check = process.argv.includes('--check');
  const examples = process.argv.includes('--examples');
  const drift: string[] = [];
  let functions = syncParams(readFileSync(FUNCTIONS_FILE, 'utf8'));
  if (examples) {
    const { collectExamples, printed } = await import('./lib/examples');
    (globalThis as Record<string, unknown>).CustomFunctions ??= {
      Error: class extends Error {},
      ErrorCode: { invalidValue: '#VALUE!', invalidNumber: '#NUM!' },
    };
    const fns = (await import('../src/functions/functions')) as unknown as Record<string, (...a: unknown[]) => unknown>;
    for (const e of collectExamples(functions).examples) {
      const value = printed(await fns[e.exportName](...e.args));
      if (value !== e.resultText) functions = functions.replace(`${e.formula} → ${e.resultText}`, `${e.formula} → ${value}`);
    }
  }
  const readme = syncReadme(readFileSync(README_FILE, 'utf8'), functions);
  for (const [file, text] of [
    [FUNCTIONS_FILE, functions],
    [README_FILE, readme],
  ] as const) {
    if (readFileSync(file, 'utf8') === text) continue;
    drift.push(path.relative(root, file));
    if (!check) writeFileSync(file, text);
  }
  if (check && drift.length) {
    console.error(`out of date with the field registry: ${drift.join(', ')}; run npx tsx scripts/docs.ts`);
    process.exit(1);
  }
  console.log(drift.length ? `${check ? 'would update' : 'updated'} ${drift.join(', ')}` : 'documentation matches the field registry');
}

if (require.main === module) void main();

/**
 * The worksheet functions' help pages (issue 15, "Add-in correctness"): one
 * page per function, generated at build time from the JSDoc of
 * src/functions/functions.ts (scripts/help-pages.ts, through
 * webpack.config.js's HelpPagesPlugin), served by the add-in under help/, and
 * linked by each function's helpUrl in functions.json. Checked on the
 * generator directly (every function, its parameters and examples as the
 * JSDoc has them) and on the production build (tests/support/web-build.ts,
 * shared with tests/build.test.ts): every function in functions.json has its
 * page, the page shows its examples and parameters, the helpUrl points to it,
 * and the description Excel shows is the JSDoc's one sentence.
 */
import { existsSync, readFileSync } from 'fs';
import path from 'path';
import { beforeAll, describe, expect, it } from 'vitest';
import { DEV_URL, HELP_CSS, devHelpUrl, excelMetadata, functionPage, helpFiles, readFunctions, syntax } from '../scripts/help-pages';
import { collectExamples } from '../scripts/lib/examples';
import { webBuild } from './support/web-build';

const source = readFileSync(path.join(__dirname, '../src/functions/functions.ts'), 'utf8');
const fns = readFunctions(source);

/** The text a reader sees: tags removed, entities decoded, white space collapsed (the build minifies the HTML). */
function textOf(html: string): string {
  return html
    .replace(/<(script|style)[\s\S]*?<\/\1>/g, '')
    .replace(/<br\s*\/?>/g, ' ')
    // A tag starts with a letter (or / and a letter) after "<"; a "<" before a space is text (the minifier writes "< 1" unescaped).
    .replace(/<!?\/?[a-zA-Z][^>]*>/g, ' ')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&')
    .replace(/\s+/g, ' ');
}

/** The JSDoc @param lines of one function, as written (the source of truth the docs script generates). */
function paramLines(id: string): { name: string; text: string }[] {
  const block = [...source.matchAll(/\/\*\*((?:(?!\*\/)[\s\S])*?)\*\/\s*export function \w+/g)].map((m) => m[1]).find((b) => new RegExp(`@customfunction ${id}\\b`).test(b))!;
  return [...block.matchAll(/@param\s+\[?(\w+)\]?\s+(.*)$/gm)].map((m) => ({ name: m[1], text: m[2].trimEnd() }));
}

/** Checks that a page (as HTML) shows everything a reader needs of function `id`. */
function expectPageOf(id: string, html: string): void {
  const text = textOf(html);
  const f = fns.find((g) => g.id === id)!;
  expect(text, id).toContain(`HUSH.${id}`);
  expect(text, id).toContain(f.description);
  expect(text, id).toContain(syntax(f));
  for (const p of paramLines(id)) {
    expect(text, `${id}: parameter ${p.name}`).toContain(p.name);
    expect(text, `${id}: parameter ${p.name}`).toContain(p.text);
  }
  const examples = collectExamples(source).examples.filter((e) => e.id === id);
  expect(examples.length, id).toBeGreaterThan(0);
  for (const e of examples) {
    expect(text, `${id}: example`).toContain(e.formula);
    expect(text, `${id}: example result`).toContain(e.resultText);
  }
}

describe('help pages from the JSDoc (scripts/help-pages.ts)', () => {
  it('reads every worksheet function, with the same examples the examples test evaluates', () => {
    const { functionIds, examples } = collectExamples(source);
    expect(fns.map((f) => f.id)).toEqual(functionIds);
    expect(fns.flatMap((f) => f.examples)).toEqual(examples);
  });

  it('each function names its own page with @helpurl and has a one-sentence description', () => {
    for (const f of fns) {
      expect(f.helpUrl, f.id).toBe(devHelpUrl(f.id));
      expect(f.description, f.id).toMatch(/^[^\n]+\.$/);
      // One sentence: no sentence end followed by more text (a dot inside a name such as HUSH.PLAN is not one).
      expect(f.description, f.id).not.toMatch(/[.!?]\s+\S/);
      expect(f.description.length, f.id).toBeLessThanOrEqual(200);
    }
  });

  it('the heavy functions are @cancelable, the others are not', () => {
    expect(fns.filter((f) => f.cancelable).map((f) => f.id)).toEqual(['REFLECTION_TABLE', 'LAYERS', 'DESIGN', 'PLAN', 'CELLS', 'MEMORY', 'STEPS', 'RUNTIME', 'COST']);
  });

  it('each page shows the function, its syntax, every parameter as the JSDoc states it, its result and every worked example', () => {
    for (const f of fns) expectPageOf(f.id, functionPage(f, 'Hush 0.0.0'));
  });

  it('text is escaped, not markup: a parameter with < and > and a quoted example stay text', () => {
    const f = fns.find((g) => g.id === 'REFLECTION')!;
    const html = functionPage(f, 'v');
    expect(html).toContain('&lt; 90°');
    expect(html).toContain('&quot;45 deg&quot;');
    expect(html).not.toMatch(/<script/i);
  });

  it('the folder has one page per function, an index linking each, and a stylesheet', () => {
    const files = helpFiles(source, 'Hush 0.0.0');
    expect([...files.keys()].sort()).toEqual([...fns.map((f) => `${f.id}.html`), 'help.css', 'index.html'].sort());
    const index = files.get('index.html')!;
    for (const f of fns) expect(index).toContain(`href="${f.id}.html"`);
    expect(files.get('help.css')).toBe(HELP_CSS);
  });

  it('functions.json gets the one-sentence description and, with a public URL, the help link on that host', () => {
    const json = JSON.stringify({ functions: [{ id: 'PLAN', description: 'long\nExample: …', helpUrl: devHelpUrl('PLAN') }] });
    const out = JSON.parse(excelMetadata(json, source, 'https://planner.example.org/hush/')).functions[0];
    expect(out.description).toBe(fns.find((f) => f.id === 'PLAN')!.description);
    expect(out.helpUrl).toBe('https://planner.example.org/hush/help/PLAN.html');
    expect(JSON.parse(excelMetadata(json, source)).functions[0].helpUrl).toBe(`${DEV_URL}help/PLAN.html`);
  });
});

describe('help pages in the production build (dist/web/help)', () => {
  let out = '';
  beforeAll(() => {
    out = webBuild();
  });

  it('every function in functions.json links its page, which the build wrote and which shows its examples and parameters', () => {
    const meta = JSON.parse(readFileSync(path.join(out, 'functions.json'), 'utf8')) as { functions: { id: string; description: string; helpUrl: string }[] };
    expect(meta.functions.map((f) => f.id).sort()).toEqual(fns.map((f) => f.id).sort());
    for (const f of meta.functions) {
      expect(f.helpUrl, f.id).toBe(`${DEV_URL}help/${f.id}.html`);
      const file = path.join(out, f.helpUrl.slice(DEV_URL.length));
      expect(existsSync(file), file).toBe(true);
      expectPageOf(f.id, readFileSync(file, 'utf8'));
      expect(f.description, f.id).toBe(fns.find((g) => g.id === f.id)!.description);
    }
    expect(existsSync(path.join(out, 'help/index.html'))).toBe(true);
    expect(existsSync(path.join(out, 'help/help.css'))).toBe(true);
  });
});

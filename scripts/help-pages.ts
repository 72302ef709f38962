/**
 * The help pages of the worksheet functions, generated at build time from the
 * JSDoc of src/functions/functions.ts (the same comments custom-functions-
 * metadata-plugin reads for functions.json): one page per function,
 * help/<ID>.html, with its one-sentence description, syntax, arguments (the
 * @param lines, which scripts/docs.ts generates from the field registry),
 * result and worked examples (read by scripts/lib/examples.ts, the reader the
 * examples test evaluates), plus help/index.html and help/help.css.
 *
 * Each function's `@helpurl` names its page on the development host
 * (DEV_URL + help/<ID>.html); webpack.config.js (HelpPagesPlugin) emits the
 * pages into dist/web/help/ and rewrites functions.json: the helpUrl to the
 * host the add-in is built for (--env publicUrl), and the description to the
 * one sentence before the Example: lines, which Excel shows as the function's
 * description (the examples are on the help page).
 *
 *   npx tsx scripts/help-pages.ts [OUT_DIR]   writes the pages (default dist/web/help)
 */
import { mkdirSync, readFileSync, writeFileSync } from 'fs';
import path from 'path';
import { collectExamples, type Example } from './lib/examples';

/** Where the manifest and the @helpurl tags point during development (webpack.config.js replaces it with --env publicUrl). */
export const DEV_URL = 'https://localhost:3000/';
/** The folder of the help pages under the add-in's root. */
export const HELP_DIR = 'help';

export interface HelpParam {
  name: string;
  optional: boolean;
  text: string;
}

export interface HelpFunction {
  id: string;
  exportName: string;
  /** The untagged text of the JSDoc without its Example: lines. */
  description: string;
  params: HelpParam[];
  returns: string;
  helpUrl: string;
  cancelable: boolean;
  examples: Example[];
}

/** The page a function's @helpurl must name on the development host. */
export function devHelpUrl(id: string): string {
  return `${DEV_URL}${HELP_DIR}/${id}.html`;
}

/** Every @customfunction of functions.ts with what its help page shows. */
export function readFunctions(source: string): HelpFunction[] {
  const { examples } = collectExamples(source);
  const out: HelpFunction[] = [];
  // A JSDoc block (no "*/" inside) right before an exported function.
  for (const m of source.matchAll(/\/\*\*((?:(?!\*\/)[\s\S])*?)\*\/\s*export function (\w+)/g)) {
    const lines = m[1].split('\n').map((l) => l.replace(/^\s*\*\s?/, '').trimEnd());
    const id = /@customfunction\s+(\w+)/.exec(m[1])?.[1];
    if (!id) continue;
    const description: string[] = [];
    const params: HelpParam[] = [];
    let returns = '';
    let helpUrl = '';
    let cancelable = false;
    let tagged = false;
    for (const line of lines) {
      const t = line.trim();
      if (t.startsWith('@')) tagged = true;
      const param = /^@param\s+(\[)?(\w+)\]?\s*(.*)$/.exec(t);
      if (param) params.push({ name: param[2], optional: Boolean(param[1]), text: param[3] });
      else if (t.startsWith('@returns')) returns = t.replace(/^@returns\s*/, '');
      else if (t.startsWith('@helpurl')) helpUrl = t.replace(/^@helpurl\s*/, '');
      else if (t === '@cancelable') cancelable = true;
      else if (!tagged && t !== '' && !t.startsWith('Example:')) description.push(t);
    }
    out.push({ id, exportName: m[2], description: description.join(' '), params, returns, helpUrl, cancelable, examples: examples.filter((e) => e.id === id) });
  }
  return out;
}

function escape(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** =HUSH.ID(a, b, [c], …): the syntax as Excel's formula bar shows it, optional arguments in brackets. */
export function syntax(f: HelpFunction): string {
  return `=HUSH.${f.id}(${f.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')})`;
}

function page(title: string, body: string, version: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'self'">
<title>${escape(title)}</title>
<link rel="stylesheet" href="help.css">
</head>
<body>
<header><a href="index.html">Hush worksheet functions</a></header>
<main>
${body}
</main>
<footer>${escape(version)}</footer>
</body>
</html>
`;
}

/** The help page of one function. */
export function functionPage(f: HelpFunction, version: string): string {
  const params = f.params.length
    ? `<dl class="args">
${f.params.map((p) => `<dt id="arg-${p.name}"><code>${escape(p.name)}</code>${p.optional ? ' <span class="muted">optional</span>' : ''}</dt>\n<dd>${escape(p.text)}</dd>`).join('\n')}
</dl>`
    : '<p>None.</p>';
  const examples = `<ul class="examples">
${f.examples.map((e) => `<li><code>${escape(e.formula)}</code><br>→ <code>${escape(e.resultText)}</code></li>`).join('\n')}
</ul>`;
  const background = f.cancelable
    ? '\n<p class="muted">Computed in the background, off the thread Excel and the task pane use; Excel cancels the calculation when the cell is edited or deleted, an argument changes or a recalculation is forced.</p>'
    : '';
  return page(
    `HUSH.${f.id} — Hush help`,
    `<h1>HUSH.${escape(f.id)}</h1>
<p class="summary">${escape(f.description)}</p>
<h2>Syntax</h2>
<p><code class="syntax">${escape(syntax(f))}</code></p>
<h2>Arguments</h2>
${params}
<h2>Result</h2>
<p>${escape(f.returns)}</p>${background}
<h2>Examples</h2>
${examples}`,
    version,
  );
}

/** The list of all functions, each linked to its page. */
export function indexPage(fns: readonly HelpFunction[], version: string): string {
  return page(
    'Hush worksheet functions',
    `<h1>Hush worksheet functions</h1>
<table class="index">
<tbody>
${fns.map((f) => `<tr><td><a href="${f.id}.html"><code>HUSH.${escape(f.id)}</code></a></td><td>${escape(f.description)}</td></tr>`).join('\n')}
</tbody>
</table>`,
    version,
  );
}

/** The help pages' stylesheet: plain, readable at 320 px, light or dark as the system is. */
export const HELP_CSS = `:root { color-scheme: light dark; --bg: #ffffff; --text: #1b1b1b; --muted: #5c5f66; --border: #d5d8dd; --surface: #f5f6f8; --accent: #1f5fbf; }
@media (prefers-color-scheme: dark) { :root { --bg: #1f1f1f; --text: #ececec; --muted: #a9adb4; --border: #45484d; --surface: #2a2b2e; --accent: #6ea8ff; } }
body { margin: 0; background: var(--bg); color: var(--text); font: 15px/1.5 "Segoe UI", system-ui, -apple-system, sans-serif; }
header, main, footer { max-width: 50rem; margin: 0 auto; padding: 0 1rem; }
header { padding-top: 0.75rem; font-size: 0.9em; }
footer { padding: 1.5rem 1rem; color: var(--muted); font-size: 0.85em; }
a { color: var(--accent); }
h1 { font-size: 1.5em; margin: 0.5em 0 0.25em; }
h2 { font-size: 1.1em; margin: 1.4em 0 0.4em; }
.summary { font-size: 1.05em; }
.muted { color: var(--muted); font-size: 0.9em; }
code { font-family: Consolas, "SF Mono", Menlo, monospace; font-size: 0.92em; overflow-wrap: anywhere; }
.syntax { display: inline-block; padding: 0.3em 0.5em; background: var(--surface); border-radius: 4px; }
table { border-collapse: collapse; width: 100%; }
th, td { text-align: left; vertical-align: top; padding: 0.35em 0.5em; border-bottom: 1px solid var(--border); }
th { font-weight: 600; font-size: 0.9em; color: var(--muted); }
.index td:first-child { white-space: nowrap; }
dl.args { margin: 0; }
dl.args dt { margin-top: 0.7em; }
dl.args dd { margin: 0.1em 0 0 1.2em; }
ul.examples { list-style: none; padding: 0; margin: 0; }
ul.examples li { padding: 0.45em 0; border-bottom: 1px solid var(--border); }
`;

/** Every file of the help folder (name → contents): one page per function, the index and the stylesheet. */
export function helpFiles(source: string, version: string): Map<string, string> {
  const fns = readFunctions(source);
  const files = new Map<string, string>();
  for (const f of fns) files.set(`${f.id}.html`, functionPage(f, version));
  files.set('index.html', indexPage(fns, version));
  files.set('help.css', HELP_CSS);
  return files;
}

/**
 * functions.json as Excel should get it: each description the one sentence
 * before the function's Example: lines, each helpUrl on `publicUrl` (ending
 * in "/") instead of DEV_URL.
 */
export function excelMetadata(json: string, source: string, publicUrl: string = DEV_URL): string {
  const meta = JSON.parse(json) as { functions: { id: string; description?: string; helpUrl?: string }[] };
  const byId = new Map(readFunctions(source).map((f) => [f.id, f]));
  for (const f of meta.functions) {
    const doc = byId.get(f.id);
    if (doc) f.description = doc.description;
    if (f.helpUrl?.startsWith(DEV_URL)) f.helpUrl = publicUrl + f.helpUrl.slice(DEV_URL.length);
  }
  return JSON.stringify(meta, null, 4);
}

function main(): void {
  const root = path.join(__dirname, '..');
  const out = path.resolve(process.argv[2] ?? path.join(root, 'dist/web', HELP_DIR));
  const source = readFileSync(path.join(root, 'src/functions/functions.ts'), 'utf8');
  const version = `Hush ${(JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string }).version}`;
  mkdirSync(out, { recursive: true });
  const files = helpFiles(source, version);
  for (const [name, text] of files) writeFileSync(path.join(out, name), text);
  console.log(`wrote ${files.size} files to ${path.relative(process.cwd(), out) || '.'}`);
}

if (require.main === module) main();

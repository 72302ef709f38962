/**
 * The add-in build (webpack.config.js): one production build (shared with the
 * browser test, tests/support/web-build.ts), then checks of what Excel will
 * load — functions.json generated from the JSDoc (every function, its
 * parameters, optional flags, dimensionality and result type), the bundle
 * registering each function, the shared-runtime page loading the shared chunk
 * and both entries under a Content-Security-Policy, the size of what the page
 * loads, and the copied manifest and icons. Also starts the http dev server
 * (no certificates) and fetches the page from it.
 */
import { spawn, type ChildProcess } from 'child_process';
import { existsSync, readFileSync } from 'fs';
import net from 'net';
import path from 'path';
import { gzipSync } from 'zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pageScripts, webBuild } from './support/web-build';

const root = path.join(__dirname, '..');
const webpackCli = path.join(root, 'node_modules/webpack-cli/bin/cli.js');
let out = '';

beforeAll(() => {
  out = webBuild();
});

/** The shared runtime page's own JavaScript, gzipped at level 9, stays within this many bytes (issue 13: ≤ 80 KB). */
const PAGE_JS_GZIP_BOUND = 80_000;

interface Param {
  name: string;
  type: string;
  optional?: boolean;
  dimensionality?: string;
  description?: string;
}
interface FunctionMeta {
  id: string;
  name: string;
  description: string;
  parameters: Param[];
  result: { type: string; dimensionality?: string };
  options?: Record<string, boolean>;
}

/**
 * The expected worksheet signature of each function: [name, type, optional] per
 * parameter (a fourth element 'matrix' for a range parameter), and the result
 * (type '' when it is any).
 */
type ParamSpec = [string, string, boolean] | [string, string, boolean, 'matrix'];
const budgetTail: ParamSpec[] = [
  ['coupling', 'any', true],
  ['faces_seen', 'any', true],
  ['phase', 'any', true],
  ['share', 'any', true],
  ['monitor', 'any', true],
];
const reflectionParams: ParamSpec[] = [
  ['layers', 'any', false],
  ['order', 'any', false],
  ['ppw', 'any', false],
  ['angle', 'any', true],
  ['strength', 'any', true],
  ['kappa_max', 'any', true],
  ['alpha_max_norm', 'any', true],
  ['alpha_order', 'any', true],
  ['courant', 'any', true],
  ['index', 'any', true],
  ['dimensions', 'any', true],
  ['sampling', 'any', true],
  ['decay', 'any', true],
  ['azimuth', 'any', true],
];
const designParams: ParamSpec[] = [
  ['target', 'any', false],
  ['ppw_min', 'any', false],
  ['ppw_max', 'any', true],
  ['angle_max', 'any', true],
  ['orders', 'any', true, 'matrix'],
  ['courant', 'any', true],
  ['index', 'any', true],
  ['dimensions', 'any', true],
  ['kappa_max', 'any', true],
  ['alpha_max_norm', 'any', true],
  ['sampling', 'any', true],
  ['decay_min', 'any', true],
  ['gap', 'any', true],
  ['min_layers', 'any', true],
  ['azimuth_max', 'any', true],
  ['index_absorber', 'any', true],
];
const velocityParams: ParamSpec[] = [
  ['ppw', 'any', false],
  ['courant', 'any', true],
  ['dimensions', 'any', true],
  ['angle', 'any', true],
  ['azimuth', 'any', true],
];
const tableParams: ParamSpec[] = [
  ['header', 'any', false, 'matrix'],
  ['row', 'any', false, 'matrix'],
];
/** The heavy functions: computed in the worksheet functions' worker and cancelled by Excel when superseded (src/functions/plans.ts). */
const CANCELABLE = new Set(['REFLECTION_TABLE', 'LAYERS', 'DESIGN', 'PLAN', 'CELLS', 'MEMORY', 'STEPS', 'RUNTIME', 'COST']);
const expected: Record<string, { params: ParamSpec[]; result: string; matrix: boolean }> = {
  NEEDED_REFLECTION: { params: [['intensity_error', 'any', false], ...budgetTail], result: 'number', matrix: false },
  ERROR_FROM_REFLECTION: { params: [['amplitude', 'any', false], ...budgetTail], result: 'number', matrix: false },
  REFLECTION: { params: reflectionParams, result: 'number', matrix: false },
  REFLECTION_CONTINUOUS: { params: reflectionParams, result: 'number', matrix: false },
  REFLECTION_TABLE: {
    params: [reflectionParams[0], reflectionParams[1], ['ppw_list', 'any', false, 'matrix'], ['angles', 'any', true, 'matrix'], ...reflectionParams.slice(4)],
    result: 'number',
    matrix: true,
  },
  RIPPLE: {
    params: [['amplitude', 'any', false], ['distance', 'any', false], ['group_index', 'any', true], ['coupling', 'any', true]],
    result: 'number',
    matrix: true,
  },
  RIPPLE_SOURCE: {
    params: [['peak_to_peak', 'any', false], ['period', 'any', false], ['group_index', 'any', true], ['coupling', 'any', true]],
    result: 'number',
    matrix: true,
  },
  MODEL_VERSION: { params: [], result: 'string', matrix: false },
  LAYERS: { params: designParams, result: 'number', matrix: false },
  DESIGN: { params: designParams, result: 'number', matrix: true },
  DESIGN_HEADER: { params: [], result: 'string', matrix: true },
  PLAN: { params: tableParams, result: '', matrix: true },
  PLAN_HEADER: { params: [], result: 'string', matrix: true },
  CELLS: { params: tableParams, result: 'number', matrix: false },
  MEMORY: { params: tableParams, result: 'number', matrix: false },
  STEPS: { params: tableParams, result: 'number', matrix: false },
  RUNTIME: { params: tableParams, result: 'number', matrix: false },
  COST: { params: tableParams, result: 'number', matrix: false },
  PHASE_VELOCITY: { params: velocityParams, result: 'number', matrix: false },
  GROUP_VELOCITY: { params: velocityParams, result: 'number', matrix: false },
};

function metadata(dir = out): FunctionMeta[] {
  return JSON.parse(readFileSync(path.join(dir, 'functions.json'), 'utf8')).functions;
}

describe('generated functions.json', () => {
  it('lists exactly the HUSH functions, each with its parameters, optional flags, dimensionality and result type', () => {
    const fns = metadata();
    expect(fns.map((f) => f.id).sort()).toEqual(Object.keys(expected).sort());
    for (const f of fns) {
      const e = expected[f.id];
      expect(f.name).toBe(f.id);
      expect(
        f.parameters.map((p) => (p.dimensionality === 'matrix' ? [p.name, p.type, Boolean(p.optional), 'matrix'] : [p.name, p.type, Boolean(p.optional)])),
        f.id,
      ).toEqual(e.params);
      for (const p of f.parameters) {
        expect(p.dimensionality ?? 'scalar', `${f.id}.${p.name}`).toMatch(/^(scalar|matrix)$/);
        expect(p.description, `${f.id}.${p.name} is described`).toBeTruthy();
      }
      expect(f.result.type ?? '', f.id).toBe(e.result);
      expect(f.result.dimensionality ?? 'scalar', f.id).toBe(e.matrix ? 'matrix' : 'scalar');
      // Pure functions of their arguments: nothing volatile or streaming; the heavy ones are cancelable (issue 13).
      expect(f.options ?? {}, f.id).toEqual(CANCELABLE.has(f.id) ? { cancelable: true } : {});
    }
  });

  it('describes each function in one sentence; its worked examples are on its help page (tests/help-pages.test.ts)', () => {
    for (const f of metadata()) {
      expect(f.description, f.id).toMatch(/^[^\n]+\.$/);
      expect(f.description, f.id).not.toMatch(/Example:|[.!?]\s+\S/);
    }
  });

  it('optional parameters state their default', () => {
    for (const f of metadata()) {
      for (const p of f.parameters.filter((q) => q.optional)) {
        expect(p.description, `${f.id}.${p.name}`).toMatch(/Default /);
      }
    }
  });
});

describe('bundles and page', () => {
  it('functions.js registers every function through the generated associate calls', () => {
    const js = readFileSync(path.join(out, 'functions.js'), 'utf8');
    for (const id of Object.keys(expected)) expect(js).toContain(`CustomFunctions.associate("${id}"`);
  });

  it('taskpane.html loads Office.js first, then the shared chunk, then both entries (shared runtime), under a CSP with connect-src \'self\'', () => {
    const html = readFileSync(path.join(out, 'taskpane.html'), 'utf8');
    const office = html.indexOf('appsforoffice.microsoft.com/lib/1/hosted/office.js');
    expect(office).toBeGreaterThan(-1);
    // Office.js is written by the inline loader, before any bundle; the bundles run in this order (all deferred).
    expect(pageScripts(html)).toEqual(['shared.js', 'taskpane.js', 'functions.js']);
    expect(html.search(/src="?shared\.js/)).toBeGreaterThan(office);
    const csp = /http-equiv="?Content-Security-Policy"?\s+content="([^"]+)"/.exec(html);
    expect(csp).not.toBeNull();
    const directives = Object.fromEntries(
      csp![1].split(';').map((d) => {
        const [name, ...values] = d.trim().split(/\s+/);
        return [name, values];
      }),
    );
    expect(directives['connect-src']).toEqual(["'self'"]);
    expect(directives['default-src']).toEqual(["'self'"]);
    expect(directives['script-src']).not.toContain("'unsafe-eval'");
  });

  /** The modules each script was built from, from its source map (e.g. "src/physics/reflection.ts", "node_modules/mathjs/lib/esm/type/unit/Unit.js"). */
  function modules(script: string): string[] {
    const map = JSON.parse(readFileSync(path.join(out, `${script}.map`), 'utf8')) as { sources: string[] };
    return map.sources.map((s) => s.replace(/^webpack:\/\/[^/]*\/(\.\/)?/, ''));
  }

  it('the code both entries carry is in shared.js once (the plan API, the physics core, the unit engine), and no module is in two scripts', () => {
    const shared = modules('shared.js');
    for (const m of ['src/plan/index.ts', 'src/plan/units.ts', 'src/physics/reflection.ts', 'src/physics/design.ts', 'node_modules/mathjs/lib/esm/type/unit/Unit.js']) {
      expect(shared, m).toContain(m);
    }
    const scripts = ['shared.js', 'taskpane.js', 'functions.js'];
    const seen = new Map<string, string>();
    for (const script of scripts) {
      for (const m of modules(script)) {
        expect(seen.get(m), `${m} in ${script} and ${seen.get(m)}`).toBeUndefined();
        seen.set(m, script);
      }
    }
  });

  it(`the page's JavaScript is at most ${PAGE_JS_GZIP_BOUND} bytes gzipped (level 9), mathjs reduced to its unit parser`, () => {
    const html = readFileSync(path.join(out, 'taskpane.html'), 'utf8');
    const sizes = pageScripts(html).map((f) => [f, gzipSync(readFileSync(path.join(out, f)), { level: 9 }).length] as const);
    const total = sizes.reduce((a, [, n]) => a + n, 0);
    console.log(`page JavaScript, gzip level 9: ${sizes.map(([f, n]) => `${f} ${n}`).join(', ')}; total ${total} bytes`);
    expect(total).toBeLessThanOrEqual(PAGE_JS_GZIP_BOUND);
    // Of mathjs only the Unit class and utilities: no Complex or Fraction libraries (src/plan/units.ts holds the two values the unit table needs), no functions, matrices, expression parser or BigNumber.
    const libraries = pageScripts(html).flatMap(modules).filter((m) => m.startsWith('node_modules/'));
    for (const m of libraries.filter((x) => x.startsWith('node_modules/mathjs/'))) expect(m).toMatch(/^node_modules\/mathjs\/lib\/esm\/(type\/unit\/\w+\.js|utils\/)/);
    for (const m of libraries) expect(m).not.toMatch(/decimal\.js|typed-function|seedrandom|complex\.js|fraction\.js/);
  });

  it('the worksheet functions\' worker is a script of its own (functions-worker.js): self-contained, not loaded by the page, named by functions.js', () => {
    const worker = readFileSync(path.join(out, 'functions-worker.js'), 'utf8');
    expect(worker).not.toMatch(/importScripts/);
    const html = readFileSync(path.join(out, 'taskpane.html'), 'utf8');
    expect(pageScripts(html)).not.toContain('functions-worker.js');
    const own = modules('functions-worker.js');
    for (const m of ['src/functions/worker.ts', 'src/functions/worker-tasks.ts', 'src/plan/index.ts', 'src/physics/design.ts']) expect(own, m).toContain(m);
    for (const m of own) expect(m, 'no task pane or Office code in the worker').not.toMatch(/^(taskpane|src\/workbook)\//);
    expect(readFileSync(path.join(out, 'functions.js'), 'utf8') + readFileSync(path.join(out, 'shared.js'), 'utf8')).toContain('functions-worker');
  });

  it('no eval in the bundles (the CSP forbids it)', () => {
    for (const f of ['shared.js', 'functions.js', 'taskpane.js', 'functions-worker.js']) {
      expect(readFileSync(path.join(out, f), 'utf8')).not.toMatch(/\beval\(/);
    }
  });

  it('copies the manifest, the stylesheet and every icon the manifest names', () => {
    const manifest = readFileSync(path.join(out, 'manifest.xml'), 'utf8');
    expect(manifest).toBe(readFileSync(path.join(root, 'manifest.xml'), 'utf8'));
    expect(existsSync(path.join(out, 'taskpane.css'))).toBe(true);
    for (const m of manifest.matchAll(/https:\/\/localhost:3000\/(assets\/[\w.-]+\.png)/g)) {
      expect(existsSync(path.join(out, m[1])), m[1]).toBe(true);
    }
  });

  it('publicUrl rewrites every dev URL in the copied manifest, and nothing else changes', async () => {
    // The copy step of a build with --env publicUrl=… (webpack.config.js), applied to manifest.xml.
    // eslint-disable-next-line @typescript-eslint/no-require-imports -- the config is CommonJS
    const config = await require('../webpack.config.js')({ publicUrl: 'https://planner.example.org/hush' }, { mode: 'production' });
    const copy = config.plugins.find((p: { patterns?: unknown }) => Array.isArray(p.patterns)) as { patterns: { to: string; transform(c: Buffer): string | Buffer }[] };
    const pattern = copy.patterns.find((q) => q.to === 'manifest.xml')!;
    const original = readFileSync(path.join(root, 'manifest.xml'));
    const manifest = pattern.transform(original).toString();
    expect(manifest).not.toContain('https://localhost:3000/');
    expect(manifest).toContain('https://planner.example.org/hush/taskpane.html');
    expect(manifest.split('https://planner.example.org/hush/').join('https://localhost:3000/')).toBe(original.toString());
  });
});

describe('http dev server (no certificates)', () => {
  let server: ChildProcess | undefined;

  afterAll(() => {
    if (server && server.exitCode === null) server.kill('SIGTERM');
  });

  async function freePort(): Promise<number> {
    return new Promise((resolve, reject) => {
      const s = net.createServer();
      s.once('error', reject);
      s.listen(0, '127.0.0.1', () => {
        const port = (s.address() as net.AddressInfo).port;
        s.close(() => resolve(port));
      });
    });
  }

  it('serves taskpane.html and functions.json over http', async () => {
    const port = await freePort();
    server = spawn(process.execPath, [webpackCli, 'serve', '--mode', 'development', '--env', 'http', '--env', `port=${port}`], {
      cwd: root,
      env: { ...process.env, NO_COLOR: '1' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let log = '';
    server.stdout!.on('data', (d) => (log += d));
    server.stderr!.on('data', (d) => (log += d));
    const base = `http://127.0.0.1:${port}`;
    // Ask until it answers or exits; the suite's generous timeout is only a safety net.
    let page: Response | undefined;
    while (server.exitCode === null) {
      try {
        page = await fetch(`${base}/taskpane.html`);
        if (page.ok) break;
      } catch {
        // not listening yet
      }
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(page?.ok, `dev server did not answer:\n${log}`).toBe(true);
    expect(await page!.text()).toContain('functions.js');
    const meta = await fetch(`${base}/functions.json`);
    expect(meta.ok).toBe(true);
    const ids = ((await meta.json()) as { functions: FunctionMeta[] }).functions.map((f) => f.id);
    expect(ids).toContain('NEEDED_REFLECTION');
    const help = await fetch(`${base}/help/PLAN.html`);
    expect(help.ok).toBe(true);
    expect(await help.text()).toContain('HUSH.PLAN');
    expect(log).not.toMatch(/certificate/i);
  });
});

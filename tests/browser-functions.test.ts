/**
 * The worksheet functions of the built add-in in a real browser (Chromium
 * through playwright-core): the shared-runtime page (taskpane.html, under its
 * Content-Security-Policy) with a stand-in for Excel's CustomFunctions that
 * collects what functions.js registers, then the heavy functions called as
 * Excel calls them (every argument, then the CancelableInvocation). Checks
 * that they compute in the bundled Web Worker (functions-worker.js is
 * requested; the results equal the plan API's, computed here in Node), that a
 * cancelled REFLECTION_TABLE settles with the cancellation, and that the
 * bound is #NUM!.
 *
 * Without Chromium the suite is skipped with a message (install:
 * apt-get install -y chromium); under CI (CI=true) a missing browser fails.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import type { AddressInfo } from 'net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { designAbsorber, reflection } from '../src/physics';
import { planRow, planToRow, rowFromTable } from '../src/plan';
import { webBuild } from './support/web-build';

const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const haveBrowser = fs.existsSync(CHROMIUM);
const onCi = process.env.CI === 'true';
/** A safety net for a hung page, as generous as the suite's (vitest.config.mts); not a bound on the work. */
const HUNG = 600_000;

if (!haveBrowser) {
  const text = `browser tests skipped: no Chromium at ${CHROMIUM}; install one with "apt-get install -y chromium" (or set CHROMIUM_PATH)`;
  if (onCi) throw new Error(`${text} — required under CI`);
  console.warn(text);
}

const H = ['band_short', 'cell', 'size_x', 'size_y', 'size_z', 'gap', 'intensity_error', 'passes', 'throughput', 'price_per_hour'];
const R: (string | number)[] = ['1550 nm', '25 nm', '8 um', '8 um', '3 um', '0.5 wavelengths', '1%', 20, 1e9, '$2.50/h'];

describe.skipIf(!haveBrowser)('worksheet functions in Chromium (shared-runtime page, Excel stood in for)', () => {
  let context: import('playwright-core').BrowserContext;
  let page: import('playwright-core').Page;
  let server: import('http').Server;
  let userDir = '';
  const requests: string[] = [];

  beforeAll(async () => {
    const DIST = webBuild();
    // eslint-disable-next-line @typescript-eslint/no-require-imports -- scripts/preview.js is CommonJS
    const { serve } = require('../scripts/preview.js') as { serve: (dir: string, port: number) => Promise<{ server: import('http').Server; url: string }> };
    const s = await serve(DIST, 0);
    server = s.server;
    const origin = `http://localhost:${(server.address() as AddressInfo).port}`;
    const { chromium } = await import('playwright-core');
    userDir = fs.mkdtempSync(path.join(os.tmpdir(), 'hush-chromium-'));
    context = await chromium.launchPersistentContext(userDir, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync'],
    });
    context.on('request', (r) => requests.push(r.url()));
    page = context.pages()[0] ?? (await context.newPage());
    page.setDefaultTimeout(HUNG);
    await page.addInitScript(() => {
      const w = window as unknown as Record<string, unknown>;
      const fns: Record<string, unknown> = {};
      w.__hushFunctions = fns;
      w.CustomFunctions = {
        associate: (id: string, f: unknown) => (fns[id] = f),
        Error: class extends Error {
          constructor(
            public code: string,
            message?: string,
          ) {
            super(message);
          }
        },
        ErrorCode: { invalidValue: '#VALUE!', invalidNumber: '#NUM!' },
      };
    });
    await page.goto(`${origin}/taskpane.html`);
    await page.waitForFunction(() => 'COST' in ((window as unknown as Record<string, Record<string, unknown>>).__hushFunctions ?? {}), null, { timeout: HUNG });
  });

  afterAll(async () => {
    await context?.close();
    server?.close();
    if (userDir) fs.rmSync(userDir, { recursive: true, force: true });
  });

  it('LAYERS, DESIGN, PLAN, COST and REFLECTION_TABLE compute in functions-worker.js and equal the plan API', async () => {
    const got = await page.evaluate(
      async ([h, r]) => {
        const F = (window as unknown as Record<string, Record<string, (...a: unknown[]) => Promise<unknown>>>).__hushFunctions;
        const inv = () => ({});
        // The invocation is the last parameter: pad the arguments with nulls to the function's own count.
        const call = (f: (...a: unknown[]) => Promise<unknown>, args: unknown[]) => f(...args, ...Array(f.length - 1 - args.length).fill(null), inv());
        return {
          layers: await call(F.LAYERS, [1e-4, 15, 30, 45, [[3, 4]]]),
          design: await call(F.DESIGN, [1e-3, 20]),
          plan: await call(F.PLAN, [[h], [r]]),
          cost: await call(F.COST, [[h], [r]]),
          table: await call(F.REFLECTION_TABLE, [10, 3, [[20], [40]], [[0, 45]]]),
        };
      },
      [H, R] as const,
    );
    const d = designAbsorber({ target: 1e-4, ppwMin: 15, ppwMax: 30, angleMaxDeg: 45, orders: [3, 4] });
    expect(got.layers).toBe(d.layers);
    expect((got.design as number[][])[0][0]).toBe(designAbsorber({ target: 1e-3, ppwMin: 20 }).layers);
    const row = planToRow(planRow(rowFromTable(H, R))).map((v) => (v === null ? '' : v));
    expect(got.plan).toEqual([row]);
    expect(typeof got.cost).toBe('number');
    // Another JavaScript engine: ECMAScript leaves Math.sin, Math.exp … implementation-approximated (ECMA-262 §21.3.2),
    // so Chromium's results may differ from Node's in the last digits (seen here: 4·10⁻¹² relative at 45°).
    const expected = [20, 40].map((ppw) => [0, 45].map((a) => reflection({ layers: 10, order: 3 }, { ppw, angleDeg: a, courant: 0.99 / Math.sqrt(3), dimensions: 3 }).amplitude));
    const table = got.table as number[][];
    expected.forEach((r, i) => r.forEach((x, j) => expect(Math.abs(table[i][j] / x - 1), `cell ${i},${j}`).toBeLessThan(1e-10)));
    expect(requests.some((u) => u.endsWith('/functions-worker.js')), 'the page loaded the worker script').toBe(true);
  });

  it('a cancelled REFLECTION_TABLE settles with the cancellation; above the bound it is #NUM! stating the bound', async () => {
    const got = await page.evaluate(async () => {
      const F = (window as unknown as Record<string, Record<string, (...a: unknown[]) => Promise<unknown>>>).__hushFunctions;
      const settle = (p: Promise<unknown>) => p.then(() => 'resolved', (e: { code: string; message: string }) => `${e.code} ${e.message}`);
      const inv: { onCanceled?: () => void } = {};
      // The largest table allowed (100 × 100 values at 200 layers), cancelled as soon as it was called.
      const T = F.REFLECTION_TABLE;
      const big = T(200, 3, [Array.from({ length: 100 }, (_, i) => 10 + i)], [Array.from({ length: 100 }, (_, j) => j * 0.8)], ...Array(T.length - 5).fill(null), inv);
      inv.onCanceled!();
      const tooBig = F.REFLECTION_TABLE(200, 3, [Array(500).fill(20)], [Array(500).fill(0)]);
      return { cancelled: await settle(big), tooBig: await settle(tooBig) };
    });
    expect(got.cancelled).toBe('#VALUE! the calculation was cancelled: Excel recalculated or removed the cells waiting for it');
    expect(got.tooBig).toMatch(/^#NUM! REFLECTION_TABLE computes at most 2,000,000 cells × layers .*500 × 500 × 200 = 50,000,000 asked/);
  });
});

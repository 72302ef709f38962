/**
 * The built task pane in a real browser (Chromium through playwright-core),
 * outside Excel on the embedded demo project, served on loopback by this test.
 * Expected numbers come from the plan API (planRow) computed here in Node: an
 * independent call of the same API the pane must show.
 *
 * Without Chromium the suite is skipped with a message (install:
 * apt-get install -y chromium); under CI (CI=true) a missing browser fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import type { AddressInfo } from 'net';
import { parseCsv } from '../src/plan/csv';
import { OUTPUT_NAMES, headerName, planRow, planToRow, rowFromTable } from '../src/plan';
import { webBuild } from './support/web-build';

const ROOT = path.resolve(__dirname, '..');
const ARTIFACTS = path.join(ROOT, 'test-artifacts');
const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const haveBrowser = fs.existsSync(CHROMIUM);
const onCi = process.env.CI === 'true';
/**
 * How long a wait for the page may take before it counts as hung: a safety net
 * as generous as the suite's (vitest.config.mts), not a bound a loaded machine
 * could trip; the work each wait covers is bounded by the page itself.
 */
const HUNG = 600_000;

if (!haveBrowser) {
  const text = `browser tests skipped: no Chromium at ${CHROMIUM}; install one with "apt-get install -y chromium" (or set CHROMIUM_PATH)`;
  if (onCi) throw new Error(`${text} — required under CI`);
  console.warn(text);
}

/** Demo row used throughout: the half-domain waveguide (3-D, 10°, one wavelength), whose 2-D run fits the pane's budget. */
const DEMO_ROW = 4;

function demoRow() {
  const rows = parseCsv(fs.readFileSync(path.join(ROOT, 'assets', 'demo-project.csv'), 'utf8'));
  return rowFromTable(rows[0], rows[DEMO_ROW + 1]);
}

describe.skipIf(!haveBrowser)('task pane in Chromium (demo project outside Excel)', () => {
  // Loaded lazily so a machine without the browser never touches playwright.
  let context: import('playwright-core').BrowserContext;
  let page: import('playwright-core').Page;
  let server: import('http').Server;
  let origin = '';
  const requests: string[] = [];
  const pageErrors: string[] = [];
  const failed: string[] = [];
  let userDir = '';

  beforeAll(async () => {
    const DIST = webBuild(); // the build tests/build.test.ts checks (built once per change)
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const { serve } = require('../scripts/preview.js') as { serve: (dir: string, port: number) => Promise<{ server: import('http').Server; url: string }> };
    const s = await serve(DIST, 0);
    server = s.server;
    origin = `http://localhost:${(server.address() as AddressInfo).port}`;
    const { chromium } = await import('playwright-core');
    userDir = fs.mkdtempSync(path.join(os.tmpdir(), 'hush-chromium-'));
    context = await chromium.launchPersistentContext(userDir, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-quic', '--no-first-run', '--disable-sync'],
      viewport: { width: 380, height: 900 },
    });
    context.on('request', (r) => requests.push(r.url()));
    context.on('response', (r) => r.status() >= 400 && failed.push(`${r.status()} ${r.url()}`));
    page = context.pages()[0] ?? (await context.newPage());
    page.setDefaultTimeout(HUNG);
    page.on('pageerror', (e) => pageErrors.push(`${e.message}\n${e.stack ?? ''}`));
    await page.goto(s.url);
    await page.waitForSelector('#options tbody tr', { timeout: HUNG });
    await page.selectOption('#row-picker', String(DEMO_ROW));
    await page.waitForFunction((label) => document.getElementById('study-title')?.textContent?.includes(label), 'Jetty', { timeout: HUNG });
  });

  afterAll(async () => {
    await context?.close();
    server?.close();
    if (userDir) fs.rmSync(userDir, { recursive: true, force: true });
  });

  it("lists one option per grading order and CFS α (the design's own α and none)", async () => {
    const plan = planRow(demoRow());
    // derived: 3 default orders × 2 α choices — the design chose a CFS α > 0 for this row's near field, and the
    // pane sets α = 0 beside it for comparison (the band's long end, 36 cells per wavelength, is under the CFS
    // threshold of 40 that would otherwise add a suggested α).
    expect(plan.inputs.orders).toEqual([2, 3, 4]);
    expect(plan.grid.ppwLong).toBeLessThan(40);
    expect(plan.design.alphaMaxNorm).toBeGreaterThan(0);
    expect(await page.locator('#options tbody tr').count()).toBe(6);
    expect(await page.locator('#options tbody tr.recommended').count()).toBe(1);
  });

  it("shows the plan API's numbers for the recommended option", async () => {
    const plan = planRow(demoRow()); // independent computation: the plan API in Node
    const row = page.locator('#options tbody tr.recommended');
    const value = async (field: string) => Number(await row.locator(`td[data-field="${field}"]`).getAttribute('data-value'));
    // Integers exactly. Real numbers to 1e-11 relative: Chromium's V8 and Node's V8 may be different
    // versions, and ECMA-262 (§21.3.2, "implementation-approximated") leaves Math.exp, Math.log, Math.pow…
    // to each engine's own approximation, so results agree to rounding, not bit for bit (seen: 4e-14 relative).
    const close = (got: number, want: number) => expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-11 * Math.abs(want));
    expect(await value('layers')).toBe(plan.design.layers);
    close(await value('worst'), plan.design.worstAmplitude);
    close(await value('overhead'), plan.cost.domain.overheadPercent);
    close(await value('runtime'), plan.cost.runtime!.totalSeconds / 3600);
    close(await value('cost'), plan.cost.runtime!.cost!);
    expect(await row.textContent()).toContain(`m = ${plan.design.order}`);
  });

  it('draws the three charts (canvas pixels are not blank)', async () => {
    for (const id of ['chart-cost', 'chart-angle', 'chart-ppw']) {
      const stats = await page.evaluate((chartId) => {
        const c = document.querySelector(`#${chartId} canvas`) as HTMLCanvasElement | null;
        if (!c) return null;
        const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        let painted = 0;
        const colours = new Set<number>();
        for (let i = 0; i < d.length; i += 4) {
          if (d[i + 3] > 0) {
            painted++;
            colours.add((d[i] << 16) | (d[i + 1] << 8) | d[i + 2]);
          }
        }
        return { painted, colours: colours.size, width: c.width };
      }, id);
      expect(stats, id).not.toBeNull();
      // common practice: axes, grid and at least two series leave well over 1000 painted pixels in several colours.
      expect(stats!.painted, id).toBeGreaterThan(1000);
      expect(stats!.colours, id).toBeGreaterThan(3);
      expect(stats!.width, id).toBeGreaterThan(200);
    }
  });

  it('verifies the design by the 1-D and 2-D time-domain runs within 1 %', async () => {
    await page.click('#verify');
    await expect.poll(async () => page.locator('#cancel').isEnabled(), { timeout: HUNG }).toBe(true);
    await page.waitForSelector('#verify-result[data-difference]', { timeout: HUNG });
    const diff = Number(await page.getAttribute('#verify-result', 'data-difference'));
    // The exact model is exact for the discrete equations (physics.md §3): the runs must agree to the measurement's accuracy.
    expect(diff).toBeLessThanOrEqual(0.01);
    const text = await page.textContent('#verify-result');
    expect(text).toMatch(/1-D run and [1-9]\d* of the 2-D run/);
    expect(await page.locator('#chart-ppw .legend').textContent()).toContain('1-D run, measured');
    expect(await page.locator('#chart-ppw .legend').textContent()).toMatch(/2-D run at [0-9.]+°, measured/);
  });

  it('cancels a running verification', async () => {
    // The demo row's runs take about 0.1 s in Chromium, shorter than a round trip of the test to the page:
    // waiting for Cancel to be enabled and then clicking it would find it disabled again (playwright's click
    // then waits for it forever). So Verify and Cancel are pressed in one task of the page, while the run
    // has surely started and not ended (runVerify enables Cancel before its first await).
    const during = await page.evaluate(() => {
      (document.getElementById('verify') as HTMLButtonElement).click();
      const cancel = document.getElementById('cancel') as HTMLButtonElement;
      const enabled = !cancel.disabled;
      cancel.click();
      return enabled;
    });
    expect(during).toBe(true);
    await expect.poll(async () => page.textContent('#verify-stage'), { timeout: HUNG }).toBe('cancelled');
    expect(await page.locator('#verify').isEnabled()).toBe(true);
    // The cancelled run leaves no result behind, even once its worker has answered.
    await page.waitForTimeout(1000);
    expect(await page.textContent('#verify-stage')).toBe('cancelled');
    expect(await page.getAttribute('#verify-result', 'data-difference')).toBeNull();
    expect(await page.textContent('#verify-result')).toBe('');
  });

  it("applies the design to exactly that row's output cells", async () => {
    const snapshot = () =>
      page.$$eval('#demo-table tbody tr', (trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => td.dataset.value ?? '')));
    const header = await page.$$eval('#demo-table thead th', (ths) => ths.slice(1).map((th) => th.textContent ?? ''));
    const before = await snapshot();
    await page.click('#apply');
    await page.waitForSelector('#apply-result.ok', { timeout: HUNG });
    const after = await snapshot();
    const changed: string[] = [];
    before.forEach((r, ri) => r.forEach((v, ci) => v !== after[ri][ci] && changed.push(`${ri}:${ci}`)));
    // Expected: the non-blank plan outputs of row DEMO_ROW, in their columns (all blank before).
    const plan = planRow(demoRow());
    const values = planToRow(plan);
    const expected: string[] = [];
    OUTPUT_NAMES.forEach((n, k) => {
      if (values[k] === null || values[k] === '') return;
      const c = header.findIndex((h) => headerName(h) === n);
      expect(c, n).toBeGreaterThanOrEqual(0);
      expect(after[DEMO_ROW][c], n).toBe(String(values[k]));
      expected.push(`${DEMO_ROW}:${c}`);
    });
    expect(changed.sort()).toEqual(expected.sort());
    // One line, the cells behind a disclosure (closed until asked).
    expect(await page.textContent('#apply-result .headline')).toBe(`Wrote ${OUTPUT_NAMES.length} cells of row ${DEMO_ROW + 1}.`);
    expect(await page.locator('#apply-result details').getAttribute('open')).toBeNull();
    expect(await page.locator('#apply-result details p').first().isVisible()).toBe(false);
  });

  it('saves screenshots in light and dark theme', async () => {
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    for (const theme of ['light', 'dark']) {
      while ((await page.getAttribute('html', 'data-theme')) !== theme || !(await page.textContent('#theme-toggle'))?.includes(theme)) {
        await page.click('#theme-toggle');
      }
      await page.waitForTimeout(200);
      const file = path.join(ARTIFACTS, `taskpane-${theme}.png`);
      await page.screenshot({ path: file, fullPage: true });
      expect(fs.statSync(file).size).toBeGreaterThan(10_000);
    }
  });

  it('makes no request to any origin but its own, finds everything it asks for, and raises no errors', () => {
    const foreign = requests.filter((u) => new URL(u).origin !== origin);
    expect(foreign).toEqual([]);
    expect(requests.length).toBeGreaterThan(3);
    // No 404 (the favicon is a <link rel="icon"> to an icon the build copies).
    expect(failed).toEqual([]);
    expect(requests.some((u) => /icon-32\.png$/.test(u))).toBe(true);
    // Not even the worksheet-functions chunk: outside Excel it skips its registration (no CustomFunctions runtime).
    expect(pageErrors).toEqual([]);
  });
});

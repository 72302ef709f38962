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
/** Screenshots go to test-artifacts/ (not tracked); HUSH_SCREENSHOTS=docs refreshes the committed ones in docs/screenshots. */
const SCREENSHOTS = process.env.HUSH_SCREENSHOTS === 'docs' ? path.join(ROOT, 'docs', 'screenshots') : path.join(ROOT, 'test-artifacts', 'screenshots');
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
    const value = async (field: string) => Number(await row.locator(`[data-field="${field}"]`).getAttribute('data-value'));
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

  it('draws the three charts with every label inside them and each reference line listed once in its own style', async () => {
    for (const id of ['chart-cost', 'chart-angle', 'chart-ppw']) {
      const c = await page.evaluate((chartId) => {
        const svg = document.querySelector(`#${chartId} svg.chart-svg`) as SVGSVGElement | null;
        if (!svg) return null;
        const w = svg.width.baseVal.value;
        const h = svg.height.baseVal.value;
        // Text outside the SVG's box would be cut (or overlap the neighbours): each label's box must lie inside.
        const outside = [...svg.querySelectorAll('text')]
          .map((t) => ({ t: t.textContent ?? '', b: t.getBBox() }))
          .filter(({ b }) => b.x < -0.5 || b.y < -0.5 || b.x + b.width > w + 0.5 || b.y + b.height > h + 0.5)
          .map(({ t }) => t);
        const legend = [...document.querySelectorAll(`#${chartId} .legend li`)].map((li) => ({ kind: (li as HTMLElement).dataset.kind, text: li.textContent ?? '' }));
        const ref = [...svg.querySelectorAll('line.ref')].map((l) => [l.getAttribute('class'), l.getAttribute('stroke-dasharray'), l.getAttribute('stroke')]);
        return { w, marks: svg.querySelectorAll('polyline, circle').length, outside, legend, ref, titles: [...svg.querySelectorAll('text.axis-title')].map((t) => t.textContent) };
      }, id);
      expect(c, id).not.toBeNull();
      expect(c!.w, id).toBeGreaterThan(200);
      expect(c!.marks, id).toBeGreaterThan(1);
      expect(c!.outside, id).toEqual([]);
      expect(c!.legend.filter((l) => l.kind === 'target').length, id).toBe(1);
      expect(c!.legend.filter((l) => /target/.test(l.text)).length, id).toBe(1);
      // Reference lines of different kinds differ in dash pattern and colour.
      const styles = new Map(c!.ref.map(([cls, dash, stroke]) => [cls, `${dash} ${stroke}`]));
      expect(new Set(styles.values()).size, id).toBe(styles.size);
      if (id !== 'chart-cost') expect(c!.titles, id).toContain('dB');
      // This row has one frequency (band_short = band_long), so its one "band" line is labelled as that.
      const g = planRow(demoRow()).grid;
      if (id === 'chart-ppw') expect(g.ppwLong).toBe(g.ppwShort);
      if (id === 'chart-ppw') expect(c!.legend.filter((l) => l.kind === 'band').map((l) => l.text), id).toEqual([`study's frequency, ${Number(g.ppwShort.toPrecision(3))} cells/λ`]);
      if (id === 'chart-angle') expect(c!.legend.filter((l) => l.kind === 'angle').map((l) => l.text), id).toEqual(["study's largest angle, 10°"]);
    }
  });

  it('fits a 320 px pane: no sideways scrolling, the options table within its box, reflections in dB', async () => {
    await page.setViewportSize({ width: 320, height: 900 });
    try {
      await page.waitForFunction(() => ((document.querySelector('#chart-ppw svg') as SVGSVGElement | null)?.width.baseVal.value ?? Infinity) <= 300, undefined, { timeout: HUNG });
      const fit = await page.evaluate(() => {
        const doc = document.scrollingElement!;
        const table = document.getElementById('options')!;
        return { page: doc.scrollWidth - doc.clientWidth, table: table.scrollWidth - table.parentElement!.clientWidth, right: table.getBoundingClientRect().right };
      });
      expect(fit.page).toBeLessThanOrEqual(0);
      expect(fit.table).toBeLessThanOrEqual(0);
      expect(fit.right).toBeLessThanOrEqual(320);
      const db = await page.textContent('#options tbody tr.recommended [data-field="worst-db"]');
      // derived: dB = 20·log10|r|, one decimal, with a true minus sign.
      const plan = planRow(demoRow());
      expect(db).toBe(`\u2212${Math.abs(20 * Math.log10(plan.design.worstAmplitude)).toFixed(1)} dB`);
    } finally {
      await page.setViewportSize({ width: 380, height: 900 });
    }
  });

  it('verifies the design by the 1-D and 2-D time-domain runs within 1 %', async () => {
    await page.click('#verify');
    // No wait for Cancel to be enabled here: the run (about 0.1 s) may be over before the test's first look,
    // and the wait would then never end (the 600 s hang of an earlier run). The cancel case checks it in-page.
    // Either outcome ends the wait (a failed run says why in the result, which the next line shows).
    await page.waitForSelector('#verify-result.ok, #verify-result.bad', { timeout: HUNG });
    expect(await page.getAttribute('#verify-result', 'data-difference'), (await page.textContent('#verify-result')) ?? '').not.toBeNull();
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
      const v = values[k];
      // Numbers to 1e-11 relative (Chromium's and Node's Math functions differ in the last bits; see above), text exactly.
      if (typeof v === 'number') expect(Math.abs(Number(after[DEMO_ROW][c]) - v), n).toBeLessThanOrEqual(1e-11 * Math.abs(v));
      else expect(after[DEMO_ROW][c], n).toBe(String(v));
      expected.push(`${DEMO_ROW}:${c}`);
    });
    expect(changed.sort()).toEqual(expected.sort());
    // One line, the cells behind a disclosure (closed until asked).
    expect(await page.textContent('#apply-result .headline')).toBe(`Wrote ${OUTPUT_NAMES.length} cells of row ${DEMO_ROW + 1}.`);
    expect(await page.locator('#apply-result details').getAttribute('open')).toBeNull();
    expect(await page.locator('#apply-result details p').first().isVisible()).toBe(false);
  });

  it('saves screenshots at 320 px and 1200 px in light and dark theme (test-artifacts/screenshots; HUSH_SCREENSHOTS=docs for docs/screenshots)', async () => {
    fs.mkdirSync(SCREENSHOTS, { recursive: true });
    // The demo table open, so the written cells show; the verification's points on the chart.
    await page.click('#verify');
    await page.waitForSelector('#verify-result.ok, #verify-result.bad', { timeout: HUNG });
    for (const width of [320, 1200]) {
      await page.setViewportSize({ width, height: 900 });
      for (const theme of ['light', 'dark']) {
        while ((await page.textContent('#theme-toggle')) !== `Theme: ${theme}`) await page.click('#theme-toggle');
        expect(await page.getAttribute('html', 'data-theme')).toBe(theme);
        await page.waitForFunction((w) => Math.abs((document.querySelector('#chart-ppw svg') as SVGSVGElement).width.baseVal.value - Math.min(680, w - 24)) < 30, width, { timeout: HUNG });
        const file = path.join(SCREENSHOTS, `taskpane-${width}-${theme}.png`);
        await page.screenshot({ path: file, fullPage: true });
        expect(fs.statSync(file).size).toBeGreaterThan(10_000);
      }
    }
    await page.setViewportSize({ width: 380, height: 900 });
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

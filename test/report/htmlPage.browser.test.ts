import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { htmlPage } from '../../src/report/htmlPage.js';
import { readRuntime } from '../../src/report/readRuntime.js';
import { reportModelFixture } from './fixtures.js';

// Debian's Chromium (STACK.md). CI installs it (scripts/system-packages.txt), so there a missing
// browser is a failure; on a developer machine without it the test skips and says why.
const CHROMIUM = '/usr/bin/chromium';
const hasChromium = existsSync(CHROMIUM);
if (!hasChromium && !process.env.CI) {
  process.stderr.write(`test/report/htmlPage.browser.test.ts: skipped, no ${CHROMIUM} (apt-get install -y chromium)\n`);
}
const EVIL = '<img src=x onerror=alert(1)>';

// Browser globals used inside page.evaluate callbacks; the project's tsconfig has no DOM lib.
interface BrowserElement {
  getAttribute(name: string): string | null;
  textContent: string | null;
  getBoundingClientRect(): { left: number; top: number };
  scrollIntoView(opts?: unknown): void;
}
declare const document: { querySelector(selector: string): BrowserElement | null };
declare const window: unknown;

/** One browser for the whole file (starting Chromium is the slow part); each block opens its own page. */
let shared: Promise<Browser> | null = null;
function sharedBrowser(): Promise<Browser> {
  shared ??= import('playwright-core').then(({ chromium }) =>
    chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    }),
  );
  return shared;
}
afterAll(async () => {
  if (shared) await (await shared).close();
});

describe.skipIf(!hasChromium && !process.env.CI)('report page in headless Chromium, network cut', () => {
  let browser: Browser;
  let page: Page;
  let dir: string;
  const problems: string[] = [];
  const blocked: string[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'datlas-page-'));
    const file = join(dir, 'report.html');
    writeFileSync(file, htmlPage({ model: reportModelFixture({ runName: EVIL, title: `Sweep ${EVIL}` }), runtime: readRuntime() }));
    browser = await sharedBrowser();
    page = await browser.newPage({ viewport: { width: 1200, height: 1000 } });
    page.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
    page.on('dialog', (d) => {
      problems.push(`dialog: ${d.message()}`);
      void d.dismiss();
    });
    // Cut the network: only the file itself may load.
    await page.route('**/*', (route) => {
      const url = route.request().url();
      if (url.startsWith('file:')) return route.continue();
      blocked.push(url);
      return route.abort();
    });
    await page.goto(pathToFileURL(file).href);
    await page.waitForSelector('body[data-ready="true"]', { timeout: 20_000 });
  }, 60_000);

  afterAll(async () => {
    await page?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  /** Page coordinates of a data point (x, y) on map section 0, from the view's own scales. */
  async function pointOf(x: number, y: number): Promise<{ x: number; y: number }> {
    await page.evaluate(() => document.querySelector('#map-0')!.scrollIntoView({ block: 'center' }));
    return page.evaluate(
      ([dx, dy]) => {
        // The page's own API (window.datlas); typed loosely because it lives in the browser.
        const api = (window as unknown as { datlas: { views: { origin(): [number, number]; scale(n: string): (v: number) => number }[] } }).datlas;
        const view = api.views[0];
        const r = document.querySelector('#map-0 canvas')!.getBoundingClientRect();
        const [ox, oy] = view.origin();
        return { x: r.left + ox + view.scale('x')(dx), y: r.top + oy + view.scale('y')(dy) };
      },
      [x, y],
    );
  }

  it('draws the map with no console errors and no network request', async () => {
    expect(await page.locator('#map-0 canvas').count()).toBe(1);
    const box = await page.locator('#map-0 canvas').boundingBox();
    expect(box!.width).toBeGreaterThan(300);
    expect(problems).toEqual([]);
    expect(blocked).toEqual([]);
  });

  it('hovering a cell shows that cell’s mean, interval, seeds and runs', async () => {
    // The fixture's cell at width 64, epoch 1000, noise 0.2 has seed values 0.71 ± 0.01 (mean 0.71,
    // sd 0.01, t(2) = 4.303 from a handbook table → interval 0.71 ± 0.0248).
    const p = await pointOf(64, 1000);
    await page.mouse.move(p.x, p.y);
    await page.waitForFunction(() => document.querySelector('#readout-0')?.getAttribute('data-cell') !== null);
    const text = (await page.textContent('#readout-0')) ?? '';
    expect(text).toContain('width 64 · epochs 1000');
    expect(await page.textContent('#readout-0 .ro-mean')).toBe('0.71');
    expect(await page.textContent('#readout-0 .ro-interval')).toBe('0.685 – 0.735');
    expect(await page.textContent('#readout-0 .ro-seeds')).toBe('3 (0, 1, 2)');
    // Another cell gives other numbers: width 8, epoch 10 (no bump): 0.4 exactly.
    const q = await pointOf(8, 10);
    await page.mouse.move(q.x, q.y);
    await page.waitForFunction(() => document.querySelector('#readout-0 .ro-head')?.textContent === 'width 8 · epochs 10');
    expect(await page.textContent('#readout-0 .ro-mean')).toBe('0.4');
  });

  it('renders a run name with markup as text, never as an element', async () => {
    const p = await pointOf(64, 1000);
    await page.mouse.move(p.x, p.y);
    await page.waitForFunction(() => document.querySelector('#readout-0 .ro-head')?.textContent === 'width 64 · epochs 1000');
    const runs = await page.$$eval('#readout-0 .ro-run', (spans) => spans.map((x) => x.textContent));
    expect(runs).toEqual([EVIL, 'b', 'c']);
    // Each seed's own value beside its run: the fixture's seeds are 0.70, 0.71, 0.72.
    const vals = await page.$$eval('#readout-0 .ro-val', (spans) => spans.map((x) => x.textContent));
    expect(vals).toEqual([' · seed 0: 0.7', ' · seed 1: 0.71', ' · seed 2: 0.72']);
    expect(await page.locator('#readout-0 img').count()).toBe(0);
    expect(await page.locator('img[src="x"]').count()).toBe(0);
    expect(await page.textContent('h1')).toBe(`Sweep ${EVIL}`);
    expect(await page.title()).toBe(`Sweep ${EVIL}`);
    expect(problems).toEqual([]);
  });

  it('the selector switches to the other label-noise map', async () => {
    const before = await page.getAttribute('#map-0', 'data-variant');
    expect(before).toBe('1');
    await page.evaluate(() => document.querySelector('#map-0')!.scrollIntoView({ block: 'center' }));
    const shotBefore = await page.locator('#map-0').screenshot();
    await page.selectOption('#select-0', '0');
    await page.waitForFunction(() => document.querySelector('#map-0')?.getAttribute('data-variant') === '0');
    await page.waitForFunction(() => document.querySelector('#map-0 canvas') !== null);
    await page.evaluate(() => (window as unknown as { datlas: { views: { runAsync(): Promise<unknown> }[] } }).datlas.views[0].runAsync().then(() => true));
    const shotAfter = await page.locator('#map-0').screenshot();
    expect(shotAfter.equals(shotBefore)).toBe(false);
    // At noise 0.1 the same cell's mean is 0.4 − 0.03·3 + 0.3 = 0.61 (the fixture's formula).
    const p = await pointOf(64, 1000);
    await page.mouse.move(p.x + 1, p.y);
    await page.mouse.move(p.x, p.y);
    await page.waitForFunction(() => document.querySelector('#readout-0 .ro-mean')?.textContent === '0.61');
    expect(await page.textContent('#meta-0')).toContain('17 measured cells');
    expect(problems).toEqual([]);
  });
});

describe.skipIf(!hasChromium && !process.env.CI)('a full report page (three maps, figures, tables) in headless Chromium', () => {
  let browser: Browser;
  let page: Page;
  let dir: string;
  const problems: string[] = [];

  beforeAll(async () => {
    const { buildReport } = await import('../../src/report/buildReport.js');
    const { writeReport } = await import('../../src/report/writeReport.js');
    const { syntheticRows, syntheticTable } = await import('./syntheticSweep.js');
    dir = mkdtempSync(join(tmpdir(), 'datlas-fullpage-'));
    const model = buildReport({ table: syntheticTable(syntheticRows({ runName: EVIL })), title: 'Synthetic', boot: 100, now: '2026-12-01T00:00:00.000Z' });
    const files = await writeReport({ model, outDir: dir, scale: 1 });
    browser = await sharedBrowser();
    page = await browser.newPage({ viewport: { width: 1200, height: 1000 } });
    page.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
    await page.route('**/*', (route) => (route.request().url().startsWith('file:') ? route.continue() : route.abort()));
    await page.goto(pathToFileURL(files.html).href);
    await page.waitForSelector('body[data-ready="true"]', { timeout: 30_000 });
  }, 120_000);

  afterAll(async () => {
    await page?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('draws all three maps and their pictures with no console errors, and every selector switches its map', async () => {
    expect(await page.locator('.chart canvas').count()).toBe(3);
    // Pictures (interpolated field, slices, by noise) load from data URLs: all decoded.
    const broken = await page.$$eval('figure img', (imgs) => imgs.filter((i) => !(i as unknown as { naturalWidth: number }).naturalWidth).length);
    expect(broken).toBe(0);
    expect(await page.locator('figure img').count()).toBeGreaterThanOrEqual(6);
    for (let si = 0; si < 3; si++) {
      const options = await page.locator(`#select-${si} option`).count();
      expect(options).toBeGreaterThan(1);
      const now = Number(await page.getAttribute(`#map-${si}`, 'data-variant'));
      const next = (now + 1) % options;
      await page.selectOption(`#select-${si}`, String(next));
      // The change handler re-renders synchronously up to the view's first run.
      expect(await page.getAttribute(`#map-${si}`, 'data-variant')).toBe(String(next));
    }
    expect(problems).toEqual([]);
  });
});

/**
 * The report in a real headless browser (Debian's chromium driven by playwright-core; no browser
 * is ever downloaded). Skipped only when chromium is missing outside CI; in CI (CI set) it must run.
 */
import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Page } from 'playwright-core';
import { writeFitPage } from '../../src/report/fit-page.js';
import { writeHtmlReport } from '../../src/report/html-report.js';
import { fitResultsFile } from '../../src/io/fit-file.js';
import { tmpDir } from '../helpers.js';
import { gridSweepFile } from './helpers.js';

const CHROMIUM = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((p) => fs.existsSync(p));
const skip = CHROMIUM === undefined && !process.env.CI;
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

const dir = tmpDir('report-browser');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/**
 * Open a page from its file URL in a fresh headless browser; `check` looks at it. Console errors and
 * warnings, page errors and every requested URL are collected for the check; the browser is closed after.
 */
async function withPage(page: string, check: (tab: Page, seen: { readonly problems: readonly string[]; readonly requests: readonly string[] }) => Promise<void>): Promise<void> {
  const context = await chromium.launchPersistentContext(fs.mkdtempSync(path.join(dir, 'profile-')), { executablePath: CHROMIUM, headless: true, args: ARGS, viewport: { width: 1280, height: 900 } });
  try {
    const tab = await context.newPage();
    const problems: string[] = [];
    const requests: string[] = [];
    tab.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`);
    });
    tab.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
    tab.on('request', (r) => requests.push(r.url()));
    await tab.goto(pathToFileURL(page).href, { waitUntil: 'load' });
    await check(tab, { problems, requests });
  } finally {
    await context.close();
  }
}

/** Requests of anything but the page itself and inline data. */
const outside = (requests: readonly string[]): string[] => requests.filter((u) => !u.startsWith('file:') && !u.startsWith('data:'));

describe.skipIf(skip)('report in a headless browser', () => {
  it('opens the fit page: every panel has a size, no errors, no requests', async () => {
    const results = await gridSweepFile(dir, 'fit-grid.arrow');
    const fit = await fitResultsFile(results, { observations: [{ output: 'crust_km', value: 7.1, sd: 0.8 }], predict: ['f_max'] });
    const page = path.join(dir, 'fit.html');
    const built = await writeFitPage(fit, page);
    await withPage(page, async (tab, { problems, requests }) => {
      const panels = await tab.$$eval('figure.plot', (figs) => figs.map((f) => [f.getAttribute('data-plot'), f.querySelector('svg')?.getBoundingClientRect().width ?? 0, f.querySelector('svg')?.getBoundingClientRect().height ?? 0]));
      // three inputs, one pair matrix, crust_km and f_max
      expect(panels.map((p) => p[0])).toEqual(['marginal', 'marginal', 'marginal', 'pairs', 'predictive', 'predictive']);
      expect(panels).toHaveLength(built.plots.length);
      for (const [, w, h] of panels) {
        expect(w).toBeGreaterThan(100);
        expect(h).toBeGreaterThan(100);
      }
      const sections = await tab.$$eval('section.card', (cards) => cards.map((c) => c.getAttribute('data-section')));
      expect(sections).toEqual(['fit', 'marginals', 'pairs', 'predictive', 'summary', 'assumptions']);
      expect(problems).toEqual([]);
      expect(outside(requests)).toEqual([]);
    });
  });

  it('opens from a file URL without errors or requests, every plot has a size, the page is not blank', async () => {
    expect(CHROMIUM, 'chromium not found at /usr/bin/chromium (CI must install it: apt-get install chromium)').toBeDefined();
    const results = await gridSweepFile(dir);
    const page = path.join(dir, 'report.html');
    const report = await writeHtmlReport(results, page);
    await withPage(page, async (tab, { problems, requests }) => {
      const sizes = await tab.$$eval('figure.plot svg', (svgs) => svgs.map((s) => s.getBoundingClientRect()).map((b) => [b.width, b.height]));
      expect(sizes).toHaveLength(report.plots.length);
      expect(sizes.length).toBeGreaterThanOrEqual(10);
      for (const [w, h] of sizes) {
        expect(w).toBeGreaterThan(100);
        expect(h).toBeGreaterThan(100);
      }
      const shot = await tab.screenshot({ fullPage: true, path: path.join(dir, 'report.png') });
      // decode the PNG in the browser itself and look at its pixels
      // (the page script is a string: the test's TypeScript has no DOM types)
      const stats = (await tab.evaluate(`(async () => {
        const img = new Image();
        img.src = 'data:image/png;base64,${shot.toString('base64')}';
        await img.decode();
        const canvas = document.createElement('canvas');
        canvas.width = img.width;
        canvas.height = img.height;
        const ctx = canvas.getContext('2d');
        ctx.drawImage(img, 0, 0);
        const px = ctx.getImageData(0, 0, img.width, img.height).data;
        const colours = new Set();
        let dark = 0;
        for (let i = 0; i < px.length; i += 4) {
          colours.add(((px[i] >> 3) << 10) | ((px[i + 1] >> 3) << 5) | (px[i + 2] >> 3));
          if (px[i] + px[i + 1] + px[i + 2] < 300) dark++;
        }
        return { width: img.width, height: img.height, colours: colours.size, darkShare: dark / (px.length / 4) };
      })()`)) as { width: number; height: number; colours: number; darkShare: number };
      expect(stats.width).toBe(1280);
      expect(stats.height).toBeGreaterThan(1500);
      // viridis maps, the categorical palette, text and grey: far more than a blank page's handful
      expect(stats.colours).toBeGreaterThan(200);
      expect(stats.darkShare).toBeGreaterThan(0.01);
      expect(problems).toEqual([]);
      // the page loads nothing but itself
      expect(outside(requests)).toEqual([]);
    });
  });
});

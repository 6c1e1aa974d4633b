import { describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL, fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { writeReport } from '../../src/report/writeReport.js';
import { writeTestBatch } from './writeTestBatch.js';

const CHROMIUM = '/usr/bin/chromium';
const outputDir = fileURLToPath(new URL('../../test-output/', import.meta.url));

describe('the report in a real browser (headless Chromium)', () => {
  it('loads from file:// with no console errors, no network requests and every chart drawn', async () => {
    if (!existsSync(CHROMIUM)) {
      throw new Error(`Chromium is not installed at ${CHROMIUM}; install it with: apt-get update && apt-get install -y chromium chromium-driver (as .ci/run does).`);
    }
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-report-browser-'));
    const profile = await mkdtemp(join(tmpdir(), 'revtrace-chromium-profile-'));
    try {
      await writeTestBatch(dir);
      const reportPath = await writeReport(dir, { title: 'Rotor K, day 3 <script>window.__pwned = 1</script>' });
      const context = await chromium.launchPersistentContext(profile, {
        executablePath: CHROMIUM,
        headless: true,
        args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
        viewport: { width: 1280, height: 900 },
      });
      try {
        const page = await context.newPage();
        const consoleErrors: string[] = [];
        const pageErrors: string[] = [];
        const requests: string[] = [];
        page.on('console', (m) => {
          if (m.type() === 'error' || m.type() === 'warning') consoleErrors.push(m.text());
        });
        page.on('pageerror', (e) => pageErrors.push(e.message));
        page.on('request', (r) => requests.push(r.url()));
        const url = pathToFileURL(reportPath).href;
        await page.goto(url, { waitUntil: 'load' });

        expect(consoleErrors).toEqual([]);
        expect(pageErrors).toEqual([]);
        // the only request is the report itself (data: URIs for the previews are not fetched from anywhere)
        expect(requests.filter((u) => u !== url && !u.startsWith('data:'))).toEqual([]);
        expect(await page.evaluate('typeof window.__pwned')).toBe('undefined');
        expect(await page.evaluate('document.scripts.length')).toBe(0);

        const charts = await page.$$eval('figure.chart', (figs) =>
          figs.map((f) => {
            const svg = f.querySelector('svg');
            const box = svg?.getBoundingClientRect();
            return {
              id: f.getAttribute('data-chart'),
              width: box?.width ?? 0,
              height: box?.height ?? 0,
              marks: svg ? svg.querySelectorAll('path, line, rect, circle').length : 0,
              drawn: svg ? [...svg.querySelectorAll('g.mark-line path, g.mark-symbol path, g.mark-rule line, g.mark-rect path, g.mark-area path')].filter((e) => (e.getAttribute('d') ?? 'x') !== '' ).length : 0,
            };
          }),
        );
        // 3 comparison charts + 6 per ok run (8 ok runs in the test batch)
        expect(charts.length).toBe(3 + 8 * 6);
        for (const c of charts) {
          expect(c.width, `chart ${c.id}`).toBeGreaterThan(100);
          expect(c.height, `chart ${c.id}`).toBeGreaterThan(100);
          expect(c.drawn, `chart ${c.id} has drawn marks`).toBeGreaterThan(0);
        }
        const previews = await page.$$eval('figure.preview img', (imgs) => imgs.map((i) => (i as unknown as { naturalWidth: number }).naturalWidth));
        expect(previews.length).toBe(8);
        for (const w of previews) expect(w).toBeGreaterThan(0);
        const h1 = await page.textContent('h1');
        expect(h1).toContain('<script>window.__pwned = 1</script>');

        await mkdir(outputDir, { recursive: true });
        await page.screenshot({ path: join(outputDir, 'report-top.png') });
        await page.locator('section#comparison').screenshot({ path: join(outputDir, 'report-comparison.png') });
        await page.locator('section#trend').screenshot({ path: join(outputDir, 'report-trend.png') });
        await page.locator('article.run').first().scrollIntoViewIfNeeded();
        await page.locator('article.run').first().screenshot({ path: join(outputDir, 'report-run.png') });
        await page.emulateMedia({ media: 'print' });
        await page.screenshot({ path: join(outputDir, 'report-print.png') });
      } finally {
        await context.close();
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
      await rm(profile, { recursive: true, force: true });
    }
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadReportData } from '../../src/report/loadReportData.js';
import { renderReport } from '../../src/report/renderReport.js';
import { writeReport } from '../../src/report/writeReport.js';
import { SMALL_DAY, writeTestBatch, type TestRun } from './writeTestBatch.js';

const HOSTILE_RUN = '"><img src=x onerror=alert(1)>';
const HOSTILE_NOTES = '<script>alert("notes")</script>';
const HOSTILE_GROUP = '<script>alert(2)</script>';

let dir: string;
let html: string;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-report-'));
  const runs: TestRun[] = [...SMALL_DAY, { run: HOSTILE_RUN, direction: 'reverse', setting: 2.0, rate_deg_s: -2.5, se_deg_s: 0.05, notes: HOSTILE_NOTES }];
  await writeTestBatch(dir, runs);
  html = await renderReport(await loadReportData(dir), { title: 'Day 3 <script>alert("title")</script>' });
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('renderReport', () => {
  it('has the header, warnings first, real headings and table headers', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toMatch(/<h1>Day 3 &lt;script&gt;/);
    const order = ['<h1>', 'id="warnings-heading"', 'id="comparison-heading"', 'id="trend-heading"', 'id="runs-heading"', 'id="methods-heading"'].map((s) => html.indexOf(s));
    expect(order.every((p) => p > 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    expect(html).toContain('Runs: <strong>10</strong> — 9 done, 1 failed');
    expect(html).toContain('The video ends after 0.4 s; record at least 2 s per run.');
    expect(html).toContain('/lab/day3/manifest.csv');
    expect(html).toMatch(/<th scope="col">Reverse \/ forward \[Fieller 95%\]<\/th>/);
    expect(html).toContain('rpm');
    // each steady run also shows the interval that allows for a rate wander too small to detect
    expect(html).toContain('Allowing for undetected rate wander (up to 0.021 deg/√s)');
    expect(html).toContain('differs from zero: p = 0.047');
  });

  it('escapes every text that comes from a manifest or a file name', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toContain('<img src=x');
    // no onerror attribute on any real tag (quoted attribute values, where escaped text may sit, are dropped first)
    expect(html.replace(/="[^"]*"/g, '=""')).not.toMatch(/<[^>]*\sonerror\s*=/i);
    expect(html).toContain('&lt;script&gt;alert(&quot;notes&quot;)&lt;/script&gt;');
    expect(html).toContain('Run &quot;&gt;&lt;img src=x onerror=alert(1)&gt;');
  });

  it('needs nothing from the network: no scripts, stylesheets, fonts or remote images', () => {
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/@import|@font-face/i);
    expect(html).not.toMatch(/\b(src|href)\s*=\s*["']?(https?:)?\/\//i);
    expect(html).not.toMatch(/url\(\s*["']?(https?:)?\/\//i);
    // the only absolute URLs are SVG namespace declarations
    const urls = html.match(/https?:\/\/[^\s"'<>)]+/g) ?? [];
    expect(urls.filter((u) => !/^http:\/\/www\.w3\.org\/(2000\/svg|1999\/xlink)$/.test(u))).toEqual([]);
  });

  it('draws the comparison charts and six charts per finished run, with previews inline', () => {
    expect(html.match(/<figure class="chart"/g)?.length).toBe(3 + 9 * 6);
    expect(html.match(/<img src="data:image\/png;base64,/g)?.length).toBe(9);
    for (const id of ['both', 'reverse', 'powerlaw', 'angle', 'residuals', 'rate', 'segments', 'path', 'quality']) expect(html).toContain(`data-chart="${id}"`);
  });

  it('links each run’s files relative to the report', () => {
    expect(html).toContain('href="runs/f-2.0-a/angle.csv"');
    expect(html).toContain('href="runs/r-3.5-a/fit.json"');
    expect(html).toContain(`href="runs/${encodeURIComponent(HOSTILE_RUN).replace(/"/g, '&quot;')}/rate.csv"`);
  });

  it('pools replicates and compares directions per setting', () => {
    // 3 reverse runs at 2.0 L/min (two from the small day plus the hostile-named one), 2 at 3.5
    expect(html).toContain('pooled (3)');
    expect(html).toContain('pooled (2)');
    expect(html).toMatch(/turns the other way/);
  });

  it('keeps labels from names escaped inside the Vega SVG too', async () => {
    const d2 = await mkdtemp(join(tmpdir(), 'revtrace-report-labels-'));
    try {
      await writeTestBatch(d2, [
        { run: 'a', direction: 'forward', setting: null, rate_deg_s: 40, group: HOSTILE_GROUP },
        { run: 'b', direction: 'reverse', setting: null, rate_deg_s: -1.5, group: HOSTILE_GROUP },
      ]);
      const h = await renderReport(await loadReportData(d2));
      expect(h).not.toMatch(/<script/i);
      // the categorical axis of the comparison chart carries the group name as inert SVG text (Vega may shorten it with …)
      expect(h).toMatch(/<text[^>]*>&lt;script&gt;alert\(2\)&lt;/);
    } finally {
      await rm(d2, { recursive: true, force: true });
    }
  });
});

describe('renderReport on a folder with no finished runs', () => {
  it('still renders, saying there is nothing to compare', async () => {
    const d = await mkdtemp(join(tmpdir(), 'revtrace-report-empty-'));
    try {
      await writeTestBatch(d, [{ run: 'only', direction: 'reverse', setting: 1, rate_deg_s: 0, failed: 'No frames could be decoded; check the video plays.' }]);
      const h = await renderReport(await loadReportData(d));
      expect(h).toContain('No run has a rate to compare yet.');
      expect(h).toContain('No frames could be decoded; check the video plays.');
      expect(h.match(/<figure class="chart"/g)).toBeNull();
    } finally {
      await rm(d, { recursive: true, force: true });
    }
  });
});

describe('renderReport with incomplete run files', () => {
  it('renders runs whose fit and track files lack numbers (null where a value could not be computed)', async () => {
    const d = await mkdtemp(join(tmpdir(), 'revtrace-report-nulls-'));
    try {
      await writeTestBatch(d, [
        { run: 'f', direction: 'forward', setting: 1, rate_deg_s: 40 },
        { run: 'r', direction: 'reverse', setting: 1, rate_deg_s: -1 },
      ]);
      const fitPath = join(d, 'runs', 'r', 'fit.json');
      const fit = JSON.parse(await readFile(fitPath, 'utf8'));
      fit.steady.rate_deg_s.se = null;
      fit.steady.rate_deg_s.ci = null;
      fit.diagnostics.residual_rms_deg = null;
      await writeFile(fitPath, JSON.stringify(fit));
      const trackPath = join(d, 'runs', 'r', 'track.json');
      const track = JSON.parse(await readFile(trackPath, 'utf8'));
      track.view.axis_ratio = null;
      track.view.tilt_deg = null;
      await writeFile(trackPath, JSON.stringify(track));
      const h = await renderReport(await loadReportData(d));
      expect(h).toMatch(/Run <a href="#run-r">r<\/a> is not in the comparison/);
      expect(h).toContain('id="run-r"');
      expect(h).toContain('−1.000 [—, —]');
    } finally {
      await rm(d, { recursive: true, force: true });
    }
  });
});

describe('writeReport', () => {
  it('writes report.html in the batch folder, or a given file with links relative to it', async () => {
    const p = await writeReport(dir);
    expect(p).toBe(join(dir, 'report.html'));
    const other = join(dir, 'elsewhere', 'day3.html');
    const q = await writeReport(dir, { out: other, title: 'Elsewhere' });
    expect(q).toBe(other);
    const text = await readFile(other, 'utf8');
    expect(text).toContain('href="../runs/f-2.0-a/angle.csv"');
  });
});

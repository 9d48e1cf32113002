/**
 * The report in a real browser: Debian's chromium, driven by playwright-core (which never
 * downloads a browser of its own). Checks what string tests cannot: that every chart lays out
 * with a size, that the page logs no errors, and that opening it makes no request but for the
 * file itself. Full-page screenshots go to tests/out/ for a person to look at.
 *
 * Set TRELLIS_DOCS_SCREENSHOT=1 to also refresh docs/report-screenshot.png (the README's picture).
 */

import { existsSync, mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { renderCodebook } from '../../src/report/codebook.js';
import { renderReport } from '../../src/report/html.js';
import { emptyReport, largeReport, sampleReport } from '../report/sample.js';
import { palettePng } from './png.js';

const CHROMIUM = '/usr/bin/chromium';
const present = existsSync(CHROMIUM);
// CI installs Debian's chromium (.ci/run): there a missing browser is a failure, not a skip.
if (!present && process.env.CI) throw new Error(`${CHROMIUM} is missing: the browser checks of the report must run in CI (apt-get install chromium)`);
if (!present) console.warn(`Skipping the browser checks of the report: ${CHROMIUM} is not installed (apt-get install chromium).`);

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const out = join(root, 'tests/out');

interface Visit {
  url: string;
  /** Every request the page made; the only one should be for the file itself. */
  requests: string[];
  errors: string[];
  charts: { id: string; width: number; height: number }[];
  /** Charts whose drawing overflows their own box (a label cut off at an edge). */
  overflowing: string[];
  /** Pairs of labels in one chart that overlap (unreadable); rotated labels are left out. */
  overlapping: string[];
  /** The document's scroll width: wider than the window means the page scrolls sideways. */
  pageWidth: number;
}

describe.skipIf(!present)('the HTML report in Chromium', () => {
  let browser: Browser;
  let dir: string;

  beforeAll(async () => {
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
    });
    dir = mkdtempSync(join(tmpdir(), 'trellis-report-'));
    mkdirSync(out, { recursive: true });
  });

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  async function visit(name: string, html: string, screenshot: string, width = 1200): Promise<Visit> {
    const file = join(dir, `${name}.html`);
    writeFileSync(file, html);
    const page = await browser.newPage({ viewport: { width, height: 900 }, deviceScaleFactor: 1 });
    const v: Visit = { url: pathToFileURL(file).href, requests: [], errors: [], charts: [], overflowing: [], overlapping: [], pageWidth: 0 };
    page.on('request', (r) => v.requests.push(r.url()));
    page.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') v.errors.push(`${m.type()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => v.errors.push(`page error: ${e.message}`));
    await page.goto(v.url, { waitUntil: 'load' });
    v.charts = await page.$$eval('svg', (svgs) =>
      svgs.map((s) => {
        const r = s.getBoundingClientRect();
        return { id: s.id, width: r.width, height: r.height };
      }),
    );
    // Every mark's box, in the chart's own units, must lie inside the chart's viewBox.
    v.overflowing = await page.$$eval('svg.chart', (svgs) =>
      svgs.flatMap((s) => {
        const vb = (s as SVGSVGElement).viewBox.baseVal;
        const out: string[] = [];
        for (const el of Array.from(s.querySelectorAll('text')) as SVGGraphicsElement[]) {
          const b = el.getBBox();
          const m = el.getCTM();
          const sm = (s as SVGSVGElement).getCTM();
          if (!m || !sm) continue;
          // Corners of the text's box in the svg's user space (accounts for rotation).
          const rel = sm.inverse().multiply(m);
          const pts = [
            [b.x, b.y],
            [b.x + b.width, b.y],
            [b.x, b.y + b.height],
            [b.x + b.width, b.y + b.height],
          ].map(([x, y]) => new DOMPoint(x, y).matrixTransform(rel));
          const xs = pts.map((p) => p.x);
          const ys = pts.map((p) => p.y);
          if (Math.min(...xs) < vb.x - 1 || Math.max(...xs) > vb.x + vb.width + 1 || Math.min(...ys) < vb.y - 1 || Math.max(...ys) > vb.y + vb.height + 1) {
            out.push(`${s.id}: "${el.textContent}"`);
          }
        }
        return out;
      }),
    );
    v.overlapping = await page.$$eval('svg.chart', (svgs) =>
      svgs.flatMap((s) => {
        const boxes = (Array.from(s.querySelectorAll('text:not([transform])')) as SVGTextElement[]).map((el) => ({ el, b: el.getBBox() }));
        const out: string[] = [];
        // A pixel of slack: glyph boxes of neighbouring lines touch without the ink meeting.
        for (let i = 0; i < boxes.length; i++)
          for (let j = i + 1; j < boxes.length; j++) {
            const a = boxes[i]!.b;
            const b = boxes[j]!.b;
            if (a.x + 1 < b.x + b.width && b.x + 1 < a.x + a.width && a.y + 1 < b.y + b.height && b.y + 1 < a.y + a.height) {
              out.push(`${s.id}: "${boxes[i]!.el.textContent}" / "${boxes[j]!.el.textContent}"`);
            }
          }
        return out;
      }),
    );
    v.pageWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    await page.screenshot({ path: join(out, screenshot), fullPage: true });
    await page.close();
    return v;
  }

  it('renders every chart, logs no error and requests nothing but the file', async () => {
    const v = await visit('report', renderReport(sampleReport()), 'report.png');
    expect(v.errors).toEqual([]);
    expect(v.requests).toEqual([v.url]);
    expect(v.charts.map((c) => c.id)).toEqual(['chart-heatmap', 'chart-acceptance', 'chart-calibration', 'chart-overtime', 'chart-growth', 'chart-unclaimed']);
    for (const c of v.charts) {
      expect(c.width, c.id).toBeGreaterThan(100);
      expect(c.height, c.id).toBeGreaterThan(40);
    }
    expect(v.overflowing).toEqual([]);
    expect(v.overlapping).toEqual([]);
  });

  it('lays out on a narrow page without charts spilling out', async () => {
    // A laptop split-screen: the charts scale down to the column, the heat map scrolls.
    const v = await visit('report-narrow', renderReport(sampleReport()), 'report-narrow.png', 760);
    expect(v.errors).toEqual([]);
    expect(v.requests).toEqual([v.url]);
    for (const c of v.charts.filter((c) => c.id !== 'chart-heatmap')) expect(c.width, c.id).toBeLessThanOrEqual(760);
    expect(v.pageWidth).toBeLessThanOrEqual(760);
  });

  it('keeps labels apart and inside the charts for a large study', async () => {
    // 60 transcripts with long names and 2,000 decisions: labels must thin out, not pile up.
    const v = await visit('report-large', renderReport(largeReport()), 'report-large.png');
    expect(v.errors).toEqual([]);
    expect(v.requests).toEqual([v.url]);
    expect(v.overflowing).toEqual([]);
    expect(v.overlapping).toEqual([]);
    // The wide heat map scrolls inside its own box; the page itself does not scroll sideways.
    expect(v.pageWidth).toBeLessThanOrEqual(1200);
  });

  it('renders a study just begun, with words in place of charts', async () => {
    const v = await visit('report-empty', renderReport(emptyReport()), 'report-empty.png');
    expect(v.errors).toEqual([]);
    expect(v.requests).toEqual([v.url]);
    expect(v.charts).toEqual([]);
  });

  it('renders the HTML codebook offline', async () => {
    const v = await visit('codebook', renderCodebook(sampleReport(), 'html'), 'codebook.png');
    expect(v.errors).toEqual([]);
    expect(v.requests).toEqual([v.url]);
  });

  it('prints to PDF without error', async () => {
    // Print CSS is exercised by the browser's own print path; the PDF only has to come out.
    const file = join(dir, 'print.html');
    writeFileSync(file, renderReport(sampleReport()));
    const page = await browser.newPage();
    await page.goto(pathToFileURL(file).href);
    const pdf = await page.pdf({ format: 'A4', printBackground: true });
    await page.close();
    writeFileSync(join(out, 'report.pdf'), pdf);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(pdf.length).toBeGreaterThan(20_000);
  });

  it.runIf(process.env.TRELLIS_DOCS_SCREENSHOT === '1')('refreshes the README screenshot', async () => {
    const file = join(dir, 'docs.html');
    writeFileSync(file, renderReport(sampleReport()));
    const page = await browser.newPage({ viewport: { width: 1200, height: 1000 }, deviceScaleFactor: 1 });
    await page.goto(pathToFileURL(file).href);
    const target = join(root, 'docs/report-screenshot.png');
    const shot = await page.screenshot({ clip: { x: 0, y: 0, width: 1200, height: 1000 } });
    await page.close();
    writeFileSync(join(out, 'report-screenshot-rgb.png'), shot);
    writeFileSync(target, palettePng(shot));
    expect(statSync(target).size).toBeLessThan(300_000);
    expect(statSync(target).size).toBeLessThan(shot.length);
  });
});

/**
 * The HTML report in a real headless browser (Debian's chromium through
 * playwright-core): it loads from its own file without fetching anything,
 * runs its scripts without errors, shows every figure, sorts the ranking
 * table and shows a point's id on hover.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeReportFiles } from '../../src/io/write-audit.js';
import { buildReport } from '../../src/report/index.js';
import { makeFixture } from './fixture.js';

const CHROMIUM = '/usr/bin/chromium';
const hasChromium = existsSync(CHROMIUM);
if (!hasChromium) {
  console.log(`browser test skipped: ${CHROMIUM} is missing (install Debian's chromium package to run it)`);
}

describe('the HTML report in headless chromium', () => {
  const fixture = makeFixture({ grid: true, n: 240 });
  const report = buildReport(fixture, { png: false });
  const dir = mkdtempSync(path.join(tmpdir(), 'steadyfold-browser-'));
  const fileUrl = pathToFileURL(path.join(dir, 'report.html')).href;
  let browser: Browser | null = null;
  let page: Page;
  const requests: string[] = [];
  const consoleErrors: string[] = [];
  const pageErrors: string[] = [];

  beforeAll(async () => {
    if (!hasChromium) return;
    await writeReportFiles(dir, report);
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: [
        '--no-sandbox',
        '--headless',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    });
    page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
    page.on('request', (r) => requests.push(r.url()));
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(m.text());
    });
    page.on('pageerror', (e) => pageErrors.push(e.message));
    // Anything but the page itself is recorded and refused.
    await page.route('**/*', (route) => (route.request().url() === fileUrl ? route.continue() : route.abort()));
    await page.goto(fileUrl, { waitUntil: 'load' });
  });

  afterAll(async () => {
    await browser?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it.skipIf(!hasChromium)('loads with no console error, no page error and no request but the file itself', async () => {
    expect(consoleErrors).toEqual([]);
    expect(pageErrors).toEqual([]);
    expect(requests).toEqual([fileUrl]);
  });

  it.skipIf(!hasChromium)('shows every figure as an inline SVG with drawn marks', async () => {
    const figures = await page.$$eval('figure', (els) =>
      els.map((f) => {
        const svg = f.querySelector('svg');
        const box = svg ? svg.getBoundingClientRect() : null;
        return {
          id: f.id,
          marks: svg ? svg.querySelectorAll('.marks circle, .marks rect, .marks polyline, .marks polygon, .marks path').length : 0,
          width: box ? box.width : 0,
          height: box ? box.height : 0,
        };
      }),
    );
    expect(figures.map((f) => f.id)).toEqual(report.figures.map((f) => `fig-${f.name}`));
    for (const f of figures) {
      expect(f.marks, f.id).toBeGreaterThan(0);
      expect(f.width, f.id).toBeGreaterThan(100);
      expect(f.height, f.id).toBeGreaterThan(100);
    }
  });

  it.skipIf(!hasChromium)('sorts the ranking table when a header is clicked, and back when the rank header is clicked', async () => {
    const ranks = (): Promise<string[]> =>
      page.$$eval('#ranking-table tbody tr', (rows) => rows.map((r) => (r as HTMLTableRowElement).cells[0].textContent ?? ''));
    const start = await ranks();
    expect(start).toEqual(['1', '2', '3', '4', '5', '6', '7', 'not ranked', 'not ranked']);
    await page.click('#ranking-table th:has-text("composite score")');
    // Ascending composite: the lowest-ranked first, the unranked (no score) last.
    expect(await ranks()).toEqual(['7', '6', '5', '4', '3', '2', '1', 'not ranked', 'not ranked']);
    await page.click('#ranking-table th:has-text("rank")');
    expect(await ranks()).toEqual(start);
  });

  it.skipIf(!hasChromium)('shows the id and label of a point of the seed grid on hover, and outlines it in the other seeds', async () => {
    const circle = page.locator('#fig-seed-grid circle[data-r]').nth(40);
    await circle.scrollIntoViewIfNeeded();
    const box = (await circle.boundingBox())!;
    const x = box.x + box.width / 2;
    const y = box.y + box.height / 2;
    // The point actually under the mouse there (another may be drawn on top).
    const row = await page.evaluate(([px, py]) => document.elementFromPoint(px, py)?.getAttribute('data-r') ?? null, [x, y]);
    expect(row).not.toBeNull();
    await page.mouse.move(x, y);
    const tip = page.locator('#tip');
    await expect.poll(() => tip.isVisible()).toBe(true);
    const text = await tip.textContent();
    const r = Number(row);
    expect(text).toContain(`id ${fixture.results.dataset.ids![r]}`);
    expect(text).toContain(`label ${fixture.results.dataset.labels![r]}`);
    expect(text).toMatch(/seed \d/);
    const outlined = await page.$$eval(`#fig-seed-grid .hl`, (els) => els.length);
    expect(outlined).toBeGreaterThanOrEqual(2);
  });

  it.skipIf(!hasChromium)('shows the id of a ringed least-stable point on hover', async () => {
    const least = fixture.results.settings[0].stability.points!.least_stable[0];
    const ring = page.locator(`#fig-point-stability circle.ring[data-r="${least.row - 1}"]`);
    await ring.scrollIntoViewIfNeeded();
    await ring.hover();
    const tip = page.locator('#tip');
    await expect.poll(() => tip.isVisible()).toBe(true);
    expect(await tip.textContent()).toContain(`id ${least.id}`);
    expect(await tip.textContent()).toContain('stability');
  });

  it.skipIf(!hasChromium)('takes a screenshot of the first screen', async () => {
    await page.mouse.move(0, 0);
    await page.evaluate(() => window.scrollTo(0, 0));
    const shot = path.join(mkdtempSync(path.join(tmpdir(), 'steadyfold-shot-')), 'report-first-screen.png');
    await page.screenshot({ path: shot });
    expect(existsSync(shot)).toBe(true);
    console.log(`report screenshot: ${shot}`);
    // The recommendation is on the first screen.
    const box = await page.locator('#recommendation').boundingBox();
    expect(box!.y + box!.height).toBeLessThan(900);
  });
});

import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeReportFiles } from '../../src/io/write-audit.js';
import { buildReport } from '../../src/report/index.js';
import { makeFixture } from './fixture.js';

describe('the Markdown report written next to its figures', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'steadyfold-md-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('resolves every image and every figure link to a file that was written', async () => {
    const report = buildReport(makeFixture({ grid: true }));
    await writeReportFiles(dir, report);
    const md = readFileSync(path.join(dir, 'report.md'), 'utf8');
    const images = [...md.matchAll(/!\[[^\]]*\]\(([^)\s]+)\)/g)].map((m) => m[1]);
    const links = [...md.matchAll(/\]\(([^)\s]+)\)/g)].map((m) => m[1]);
    expect(images.length).toBe(report.figures.length);
    for (const target of [...images, ...links]) {
      expect(target, target).toMatch(/^figures\/[a-z0-9-]+\.(png|svg)$/);
      expect(existsSync(path.join(dir, target)), target).toBe(true);
    }
    // The images are the PNG copies, and each is a PNG file.
    for (const target of images) {
      expect(target.endsWith('.png')).toBe(true);
      const bytes = readFileSync(path.join(dir, target));
      expect(Array.from(bytes.subarray(1, 4))).toEqual([0x50, 0x4e, 0x47]);
    }
    expect(readFileSync(path.join(dir, 'settings.csv'), 'utf8')).toBe(report.settingsCsv);
  });

  it('names the recommended setting in its first lines and keeps the figure sections in page order', () => {
    const md = readFileSync(path.join(dir, 'report.md'), 'utf8');
    const head = md.split('\n').slice(0, 12).join('\n');
    expect(head).toContain('**Use t-SNE, perplexity 30, init random: rank 1 of 7');
    const order = ['## Summary', '## Read this before the maps', '## Settings ranked', '## Scores over the grid', '## Maps of the leading settings', '## Every seed of every setting', '## Which points move between seeds', '## Distances: data against map', '## How these results were made'];
    const at = order.map((h) => md.indexOf(`\n${h}\n`));
    for (const i of at) expect(i).toBeGreaterThan(0);
    expect([...at].sort((a, b) => a - b)).toEqual(at);
  });
});

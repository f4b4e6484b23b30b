import { describe, expect, it } from 'vitest';
import { Rng } from '../../src/core/rng.js';
import { buildReport } from '../../src/report/index.js';
import { makeFixture } from './fixture.js';

describe('the report of a large audit', () => {
  it('stays under 20 MB of HTML for 50,000 points and 45 runs, drawing seeded subsamples', () => {
    const f = makeFixture({ grid: true, n: 50_000, labelCount: 10, seeds: [1, 2, 3, 4, 5] });
    expect(f.results.runs.length).toBeGreaterThanOrEqual(40);
    // A realistic distance sample: 20,000 pairs.
    const rng = new Rng(5);
    const m = 20_000;
    const i = Array.from({ length: m }, () => rng.int(50_000));
    const j = i.map((a) => (a + 1 + rng.int(49_999)) % 50_000);
    f.results.dataset.distance_sample = { i, j, distance: i.map(() => 1 + rng.next()) };
    const report = buildReport(f, { png: false });
    const bytes = Buffer.byteLength(report.html, 'utf8');
    expect(bytes).toBeLessThan(20 * 1024 * 1024);
    // Every figure states its subsample rule.
    expect(report.html).toContain('of 50,000 points per seed');
    expect(report.html).toContain('of 50,000 points, the same in every panel, a seeded random sample stratified by label');
    expect(report.html).toContain('2,000 of the 20,000 sampled pairs drawn (seeded)');
    expect(report.html).toMatch(/of 50,000 points: a seeded random sample of 3,000 stratified by label, plus every ringed point/);
    // No figure draws more points than its cap.
    const grid = report.figures.find((x) => x.name === 'seed-grid')!.svg;
    expect((grid.match(/<circle /g) ?? []).length).toBeLessThanOrEqual(60_000 + 20);
    console.log(`large report: ${(bytes / 1024 / 1024).toFixed(2)} MB of HTML, ${report.figures.length} figures`);
  });
});

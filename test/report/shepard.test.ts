import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { averageRanks, shepardSvg, spearman } from '../../src/report/shepard.js';

const ref = JSON.parse(readFileSync(new URL('../fixtures/report-references.json', import.meta.url), 'utf8')) as {
  spearman: Array<{ a: number[]; b: number[]; rho: number; ranks_a?: number[] }>;
};

describe('spearman', () => {
  it('matches scipy.stats.spearmanr (scipy 1.10.1) on a sample without ties', () => {
    const { a, b, rho } = ref.spearman[0];
    expect(spearman(a, b)).toBeCloseTo(rho, 12);
  });

  it('gives tied values their average rank, as scipy.stats.rankdata and spearmanr do (scipy 1.10.1)', () => {
    const { a, b, rho, ranks_a } = ref.spearman[1];
    expect(Array.from(averageRanks(a))).toEqual(ranks_a);
    expect(spearman(a, b)).toBeCloseTo(rho, 12);
  });

  it('is 1 for any increasing transform, −1 for a decreasing one, NaN for a constant sample', () => {
    const x = [3, 1, 4, 1.5, 9, 2.6];
    expect(spearman(x, x.map((v) => Math.exp(v)))).toBeCloseTo(1, 14);
    expect(spearman(x, x.map((v) => -v * v))).toBeCloseTo(-1, 14);
    expect(Number.isNaN(spearman(x, x.map(() => 2)))).toBe(true);
    expect(Number.isNaN(spearman([1], [2]))).toBe(true);
    expect(() => spearman([1, 2], [1])).toThrow(RangeError);
  });
});

describe('shepardSvg', () => {
  it('draws one dot per finite pair and the panel titles, inside labelled axes', () => {
    const x = Float64Array.from([0, 1, 2, 3, NaN]);
    const y = Float64Array.from([0, 2, 4, 6, 1]);
    const svg = shepardSvg([{ title: ['Setting A', 'Spearman ρ 1.000'], x, y, colour: '#E69F00' }], 'T', 'note', true);
    const marks = svg.slice(svg.indexOf('<g class="marks">'));
    expect((marks.match(/<circle /g) ?? []).length).toBe(4);
    expect(svg).toContain('distance in the data');
    expect(svg).toContain('distance in the map');
    expect(svg).toContain('Spearman ρ 1.000');
    // A straight line y = 2x stays straight after the linear scaling of both axes.
    const pts = [...marks.matchAll(/cx="([^"]+)" cy="([^"]+)"/g)].map((m) => [Number(m[1]), Number(m[2])]);
    const slope = (i: number): number => (pts[i][1] - pts[0][1]) / (pts[i][0] - pts[0][0]);
    expect(slope(2)).toBeCloseTo(slope(1), 1);
    expect(slope(3)).toBeCloseTo(slope(1), 1);
  });
});

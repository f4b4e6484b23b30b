import { describe, expect, it } from 'vitest';
import { fitAB } from '../../../src/embed/umap/index.js';
import { readJson } from './testdata.js';

/** Written by test/fixtures/scripts/umap_ab.py (scipy 1.10.1 curve_fit, umap-learn's find_ab_params method). */
interface AbFixture {
  versions: Record<string, string>;
  cases: Array<{
    min_dist: number;
    spread: number;
    a: number;
    b: number;
    a_converged: number;
    b_converged: number;
    sum_sq_residual: number;
    sum_sq_residual_converged: number;
  }>;
}

const fx = readJson<AbFixture>('umap-ab.json');

function sse(minDist: number, spread: number, a: number, b: number): number {
  let s = 0;
  for (let i = 0; i < 300; i++) {
    const x = (3 * spread * i) / 299;
    const target = x < minDist ? 1 : Math.exp(-(x - minDist) / spread);
    s += (1 / (1 + a * x ** (2 * b)) - target) ** 2;
  }
  return s;
}

describe('fitAB', () => {
  it.each(fx.cases.map((c) => [c.min_dist, c.spread, c] as const))(
    'matches scipy 1.10.1 curve_fit (umap-learn find_ab_params method) for min_dist %s, spread %s',
    (minDist, spread, c) => {
      const { a, b } = fitAB(minDist, spread);
      // curve_fit stops at its default tolerance, a few parts in 1e6 from the minimum.
      expect(Math.abs(a - c.a) / c.a).toBeLessThan(1e-5);
      expect(Math.abs(b - c.b) / c.b).toBeLessThan(1e-5);
      // The minimum itself (scipy least_squares to 1e-15) is matched much more closely.
      expect(Math.abs(a - c.a_converged) / c.a_converged).toBeLessThan(1e-8);
      expect(Math.abs(b - c.b_converged) / c.b_converged).toBeLessThan(1e-8);
      expect(sse(minDist, spread, a, b)).toBeLessThanOrEqual(c.sum_sq_residual * (1 + 1e-12));
    },
  );

  it('reproduces the widely quoted default a = 1.577, b = 0.895 for min_dist 0.1 (umap-learn; umap-js 1.4 hard-codes the same pair)', () => {
    const { a, b } = fitAB(0.1);
    expect(a).toBeCloseTo(1.577, 3);
    expect(b).toBeCloseTo(0.895, 3);
  });

  it('rejects a negative min_dist, one above spread, and a non-positive spread', () => {
    expect(() => fitAB(-0.1)).toThrow(RangeError);
    expect(() => fitAB(1.5, 1)).toThrow(/minDist/);
    expect(() => fitAB(0.1, 0)).toThrow(/spread/);
  });
});

import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cli, tempDir, writeTemp } from './helpers.js';

/**
 * `steadyfold score` through real CSV files against scikit-learn 1.2.1
 * `sklearn.manifold.trustworthiness` and scipy 1.10.1 `scipy.spatial.procrustes`,
 * on tie-free synthetic data (test/fixtures/scripts/make_metric_fixtures.py).
 */
interface Fixture {
  X: number[][];
  Y: number[][];
  Y2: number[][];
  rank_metrics: { values: Array<{ k: number; trustworthiness: number; continuity: number }> };
  procrustes: { disparity: number };
}

const fx = JSON.parse(readFileSync(new URL('../fixtures/metrics-mixture300.json', import.meta.url), 'utf8')) as Fixture;

describe('steadyfold score against scikit-learn', () => {
  const dir = tempDir();
  const header = fx.X[0].map((_, j) => `f${j}`).join(',');
  const data = writeTemp(dir, 'x.csv', `${header}\n${fx.X.map((r) => r.map(String).join(',')).join('\n')}\n`);
  const emb = writeTemp(dir, 'y.csv', `x,y\n${fx.Y.map((r) => `${r[0]},${r[1]}`).join('\n')}\n`);
  const emb2 = writeTemp(dir, 'y2.csv', `x,y\n${fx.Y2.map((r) => `${r[0]},${r[1]}`).join('\n')}\n`);

  for (const k of [5, 10, 30]) {
    it(`gives scikit-learn's trustworthiness and continuity to 1e-9 at k = ${k}`, () => {
      const ref = fx.rank_metrics.values.find((v) => v.k === k)!;
      const r = cli(['score', data, emb, '--k', String(k), '--json']);
      expect(r.stderr).toBe('');
      expect(r.status).toBe(0);
      const out = JSON.parse(r.stdout) as { scores: Record<string, number> };
      expect(Math.abs(out.scores.trustworthiness - ref.trustworthiness)).toBeLessThan(1e-9);
      expect(Math.abs(out.scores.continuity - ref.continuity)).toBeLessThan(1e-9);
    });
  }

  it("adds scipy's Procrustes disparity with --against", () => {
    const r = cli(['score', data, emb, '--against', emb2, '--json']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout) as { scores: Record<string, number> };
    expect(Math.abs(out.scores.procrustes_disparity - fx.procrustes.disparity)).toBeLessThan(1e-12);
    expect(out.scores.knn_overlap_between).toBeGreaterThan(0);
  });

  it('refuses an embedding with the wrong number of rows, naming both files', () => {
    const short = writeTemp(dir, 'short.csv', 'x,y\n1,2\n3,4\n');
    const r = cli(['score', data, short]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/short\.csv: has 2 rows but .*x\.csv has 300/);
  });
});

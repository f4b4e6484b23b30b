import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { selectRows, sqDist } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { exactKnn } from '../../src/neighbors/exact.js';
import { logSpacedK } from '../../src/metrics/coranking.js';
import {
  buildScoringIndex,
  distanceSample,
  scoreStructure,
  scoringSummary,
} from '../../src/metrics/scoring.js';
import { gaussianMatrix, loadDigits500, nearestCentroidLabels, readFixtureJson, similarity } from './testdata.js';

const fixture = readFixtureJson('structure-metrics.json');
const K = 10;

function digits() {
  const d = loadDigits500();
  return { ...d, knnX: exactKnn(d.X, 30), knnE1: exactKnn(d.E1, K) };
}

/** R_NX(K), K = 1..498, of D500 X → E1 (numpy 1.24.2, stable (distance, index) tie rule). */
function digitsRnx(): number[] {
  const path = fileURLToPath(new URL('../fixtures/digits500_pca2_rnx.csv', import.meta.url));
  return readFileSync(path, 'utf8').trim().split(/\r?\n/).slice(1).map((l) => Number(l.split(',')[2]));
}

describe('buildScoringIndex and scoreStructure', () => {
  it('reproduce every external value for D500 X → E1 with all rows and all pairs', () => {
    const { X, y, E1, knnX, knnE1 } = digits();
    const index = buildScoringIndex(X, knnX, { k: K, labels: y, seed: 1 });
    expect(scoringSummary(index)).toEqual({ rnx_rows: 500, distance_pairs: 124750, distance_all_pairs: true });
    const s = scoreStructure(index, E1, knnE1);
    // numpy 1.24.2 stable-tie co-ranking (computed).
    expect(s.auc_rnx).toBeCloseTo(0.30333682252620214, 14);
    // scipy 1.10.1 spearmanr(pdist(X), pdist(E1)) (computed).
    expect(s.distance_spearman).toBeCloseTo(0.6218943968657221, 14);
    // scipy 1.10.1 spearmanr of class-centroid distances (structure-metrics.json).
    expect(s.centroid_spearman).toBeCloseTo(fixture.centroid_spearman.D500_X_E1_y, 14);
    // numpy 1.24.2 Pearson of log 10-NN radius (computed).
    expect(s.density_correlation).toBeCloseTo(-0.02044516501175936, 14);
    // scikit-learn 1.2.1 silhouette_score(E1, y) (computed).
    expect(s.label_silhouette).toBeCloseTo(0.14856011079523682, 14);
    // numpy leave-one-out 10-NN vote (structure-metrics.json).
    expect(s.label_knn_accuracy).toBeCloseTo(fixture.label_knn_accuracy.D500_E1_y['10'], 15);
    const ref = digitsRnx();
    expect(s.rnx_curve.K).toEqual(logSpacedK(498, 40));
    s.rnx_curve.K.forEach((k, t) => expect(s.rnx_curve.values[t]).toBeCloseTo(ref[k - 1], 14));
  });

  it('estimate from seeded samples above the limits, reporting the sample sizes', () => {
    const { X, y, E1, knnX, knnE1 } = digits();
    const opts = { k: K, labels: y, seed: 7, rnxExactLimit: 100, rnxSampleRows: 150, pairExactLimit: 100, pairSample: 30000 };
    const index = buildScoringIndex(X, knnX, opts);
    expect(scoringSummary(index)).toEqual({ rnx_rows: 150, distance_pairs: 30000, distance_all_pairs: false });
    const s = scoreStructure(index, E1, knnE1);
    expect(Math.abs(s.auc_rnx - 0.30333682252620214)).toBeLessThan(0.02);
    expect(Math.abs(s.distance_spearman - 0.6218943968657221)).toBeLessThan(0.01);
    // Samples depend on the seed only.
    const again = buildScoringIndex(X, knnX, opts);
    expect(Array.from(again.rnx.rows)).toEqual(Array.from(index.rnx.rows));
    expect(Array.from(again.pairI)).toEqual(Array.from(index.pairI));
    expect(Array.from(again.pairJ)).toEqual(Array.from(index.pairJ));
    expect(scoreStructure(again, E1, knnE1)).toEqual(s);
    const other = buildScoringIndex(X, knnX, { ...opts, seed: 8 });
    expect(Array.from(other.pairI)).not.toEqual(Array.from(index.pairI));
  });

  it('use a given partition for the centroid correlation when there are no labels', () => {
    const { X, y, E1, knnX, knnE1 } = digits();
    const pE1 = nearestCentroidLabels(E1, y);
    const index = buildScoringIndex(X, knnX, { k: K, labels: null, groups: pE1, seed: 1 });
    const s = scoreStructure(index, E1, knnE1);
    expect(s.label_silhouette).toBeNull();
    expect(s.label_knn_accuracy).toBeNull();
    const withLabels = buildScoringIndex(X, knnX, { k: K, labels: pE1, seed: 1 });
    expect(s.centroid_spearman).toBe(scoreStructure(withLabels, E1, knnE1).centroid_spearman);
    const two = buildScoringIndex(X, knnX, { k: K, labels: null, groups: Int32Array.from(y, (v) => v % 2), seed: 1 });
    expect(scoreStructure(two, E1, knnE1).centroid_spearman).toBeNull();
    const none = buildScoringIndex(X, knnX, { k: K, labels: null, seed: 1 });
    expect(scoreStructure(none, E1, knnE1).centroid_spearman).toBeNull();
  });

  it('score a map of a row subset exactly like an index built on those rows', () => {
    const { X, y, E1, knnX } = digits();
    const rows = Int32Array.from({ length: 500 }, (_, i) => i).filter((i) => i % 5 !== 1);
    const Xs = selectRows(X, rows);
    const Ys = selectRows(E1, rows);
    const ys = Int32Array.from(rows, (i) => y[i]);
    const knnYs = exactKnn(Ys, K);
    const viaFull = scoreStructure(buildScoringIndex(X, knnX, { k: K, labels: y, seed: 1 }), Ys, knnYs, rows);
    const direct = scoreStructure(buildScoringIndex(Xs, exactKnn(Xs, K), { k: K, labels: ys, seed: 1 }), Ys, knnYs);
    expect(viaFull.rnx_curve.K).toEqual(direct.rnx_curve.K);
    direct.rnx_curve.values.forEach((v, t) => expect(viaFull.rnx_curve.values[t]).toBeCloseTo(v, 14));
    for (const key of ['auc_rnx', 'distance_spearman', 'centroid_spearman', 'density_correlation', 'label_silhouette',
      'label_knn_accuracy'] as const) {
      expect(viaFull[key]).toBeCloseTo(direct[key] as number, 14);
    }
  });

  it('give 1 (within 1e-12) for a rotated, scaled copy and an AUC near 0 for a shuffled map', () => {
    const X = gaussianMatrix(new Rng(5), 400, 2);
    const labels = Int32Array.from({ length: 400 }, (_, i) => (X.data[2 * i] > 0 ? 1 : 0) + (X.data[2 * i + 1] > 0 ? 2 : 0));
    const Y = similarity(X, [0.28, 0.96, -0.96, 0.28], 12, [-3, 40]);
    const index = buildScoringIndex(X, exactKnn(X, K), { k: K, labels, seed: 2 });
    const s = scoreStructure(index, Y, exactKnn(Y, K));
    expect(Math.abs(s.auc_rnx - 1)).toBeLessThan(1e-12);
    expect(Math.abs(s.distance_spearman - 1)).toBeLessThan(1e-12);
    expect(Math.abs(s.density_correlation - 1)).toBeLessThan(1e-12);
    expect(s.centroid_spearman).toBeCloseTo(1, 12);
    const perm = Int32Array.from({ length: 400 }, (_, i) => i);
    const rng = new Rng(9);
    for (let t = 399; t > 0; t--) {
      const u = rng.int(t + 1);
      [perm[t], perm[u]] = [perm[u], perm[t]];
    }
    const shuffled: Matrix = selectRows(Y, perm);
    const bad = scoreStructure(index, shuffled, exactKnn(shuffled, K));
    expect(Math.abs(bad.auc_rnx)).toBeLessThan(0.03);
    expect(Math.abs(bad.distance_spearman)).toBeLessThan(0.05);
  });

  it('reject maps whose rows or kNN graph do not fit the index', () => {
    const { X, y, E1, knnX } = digits();
    const index = buildScoringIndex(X, knnX, { k: K, labels: y, seed: 1 });
    const part = selectRows(E1, [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    expect(() => scoreStructure(index, part, exactKnn(part, K))).toThrow(/pass the rows it covers/);
    expect(() => scoreStructure(index, E1, exactKnn(E1, 5))).toThrow(/at least k = 10 columns/);
    const rows = Int32Array.from({ length: 12 }, (_, i) => 11 - i);
    expect(() => scoreStructure(index, part, exactKnn(part, K), rows)).toThrow(/strictly ascending/);
    expect(() => buildScoringIndex(X, exactKnn(X, 5), { k: K, labels: y, seed: 1 })).toThrow(/k must be an integer from 1 to 5/);
  });
});

describe('distanceSample', () => {
  it('draws a seeded subset of the scoring pairs with their data distances', () => {
    const { X, y, knnX } = digits();
    const index = buildScoringIndex(X, knnX, { k: K, labels: y, seed: 3 });
    const a = distanceSample(index, 2000);
    expect(a.i).toHaveLength(2000);
    expect(distanceSample(index, 2000)).toEqual(a);
    const keys = new Set<number>();
    a.i.forEach((i, t) => {
      const j = a.j[t];
      expect(i).toBeLessThan(j);
      expect(a.distance[t]).toBe(Math.sqrt(sqDist(X, i, X, j)));
      keys.add(i * 500 + j);
    });
    expect(keys.size).toBe(2000);
    expect(distanceSample(index, 10 ** 6).i).toHaveLength(124750);
    expect(distanceSample(index, 0).i).toHaveLength(0);
  });
});

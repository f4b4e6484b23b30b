import { describe, expect, it } from 'vitest';
import { matrixFromRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { exactKnn } from '../../src/neighbors/exact.js';
import {
  continuity,
  knnOverlap,
  knnOverlapMatrices,
  trustworthiness,
} from '../../src/metrics/neighbourhood.js';
import {
  S10,
  gaussianMatrix,
  loadDigits500,
  naiveRanks,
  naiveTrust,
  readFixtureJson,
  similarity,
} from './testdata.js';

const col = (values: number[]): Matrix => matrixFromRows(values.map((v) => [v]));

describe('trustworthiness and continuity', () => {
  it('give 0.2 and 0.4 on the five-point line example, whose ties resolve by index', () => {
    const X = col([0, 1, 2, 3, 4]);
    const Y = col([0, 2, 4, 1, 3]);
    // T = 0.2: scikit-learn 1.2.1 test_trustworthiness (test_t_sne.py).
    expect(trustworthiness(X, Y, 1)).toBeCloseTo(0.2, 15);
    // C = 0.4: scikit-learn 1.2.1 trustworthiness(Y, X, n_neighbors=1), computed.
    expect(continuity(X, Y, 1)).toBeCloseTo(0.4, 15);
  });

  it('are exactly 1 for an affine copy of the data (scikit-learn 1.2.1 test: 5 + X/10, k = 5)', () => {
    const X = gaussianMatrix(new Rng(1), 100, 2);
    const Y = similarity(X, [1, 0, 0, 1], 0.1, [5, 5]);
    expect(trustworthiness(X, Y, 5)).toBe(1);
    expect(continuity(X, Y, 5)).toBe(1);
  });

  it('match scikit-learn 1.2.1 on S10 for k = 1..4 (tie-free data)', () => {
    // Values computed with sklearn.manifold.trustworthiness; continuity via swapped arguments.
    const expected = [
      [1, 0.875, 0.9],
      [2, 109 / 130, 0.884615384615385],
      [3, 0.913333333333333, 0.946666666666667],
      [4, 0.942857142857143, 0.971428571428571],
    ];
    for (const [k, T, C] of expected) {
      expect(trustworthiness(S10.X, S10.Y, k)).toBeCloseTo(T, 14);
      expect(continuity(S10.X, S10.Y, k)).toBeCloseTo(C, 14);
    }
  });

  it('use the n(n−k)(n−k−1) normalisation for k ≥ n/2 (S10, k = 5, 6, 8)', () => {
    // Values from an independent Python implementation of the Venna–Kaski definition
    // with this normalisation (its attribution to Venna & Kaski is from memory);
    // scikit-learn refuses k ≥ n/2.
    const expected = [
      [5, 0.92, 0.86],
      [6, 0.85, 0.85],
      [8, 0.6, 0.6],
    ];
    for (const [k, T, C] of expected) {
      expect(trustworthiness(S10.X, S10.Y, k)).toBeCloseTo(T, 14);
      expect(continuity(S10.X, S10.Y, k)).toBeCloseTo(C, 14);
    }
  });

  it('equal scikit-learn 1.2.1 to the last bit on the tie-free mixture fixture, k up to 149 = n/2 − 1', () => {
    const fx = readFixtureJson('metrics-mixture300.json');
    const X = matrixFromRows(fx.X);
    const Y = matrixFromRows(fx.Y);
    for (const v of fx.rank_metrics.values) {
      expect(trustworthiness(X, Y, v.k)).toBe(v.trustworthiness);
      expect(continuity(X, Y, v.k)).toBe(v.continuity);
    }
    const Y2 = matrixFromRows(fx.Y2);
    for (const v of fx.rank_metrics_Y2.values) {
      expect(trustworthiness(X, Y2, v.k)).toBe(v.trustworthiness);
      expect(continuity(X, Y2, v.k)).toBe(v.continuity);
    }
  });

  it('match scikit-learn 1.2.1 on the UCI wine data (standardised) and its first two principal components', () => {
    const fx = readFixtureJson('metrics-wine.json');
    const X = matrixFromRows(fx.X);
    const Y = matrixFromRows(fx.Y);
    for (const v of fx.rank_metrics.values) {
      expect(trustworthiness(X, Y, v.k)).toBeCloseTo(v.trustworthiness, 12);
      expect(continuity(X, Y, v.k)).toBeCloseTo(v.continuity, 12);
    }
  });

  it('give the stable-tie values on the tie-heavy digits data (D500 → E1) and stay within 1e-4 of scikit-learn', () => {
    const { X, E1 } = loadDigits500();
    // [stable ties, scikit-learn 1.2.1] per k; both computed with Python (numpy stable argsort vs sklearn as shipped).
    const T: Record<number, [number, number]> = {
      5: [0.8538617886178862, 0.8538479674796748],
      10: [0.8573832817337461, 0.8573820433436532],
      15: [0.8577618448637316, 0.857754856743536],
      30: [0.8576753942060873, 0.8576695269526953],
    };
    const C: Record<number, [number, number]> = {
      5: [0.9577, 0.9577040650406504],
      10: [0.9516689370485036, 0.9516710010319918],
      15: [0.94724500349406, 0.9472631726065688],
      30: [0.9358807480748075, 0.9358911624495783],
    };
    const knnX = exactKnn(X, 30);
    const knnY = exactKnn(E1, 30);
    for (const k of [5, 10, 15, 30]) {
      const t = trustworthiness(X, E1, k, { knnX, knnY });
      const c = continuity(X, E1, k, { knnX, knnY });
      expect(t).toBeCloseTo(T[k][0], 12);
      expect(c).toBeCloseTo(C[k][0], 12);
      expect(Math.abs(t - T[k][1])).toBeLessThan(1e-4);
      expect(Math.abs(c - C[k][1])).toBeLessThan(1e-4);
    }
  });

  it('agree with the full-rank-matrix definition for every k on integer data full of ties', () => {
    const rng = new Rng(42);
    const n = 60;
    const X = matrixFromRows(Array.from({ length: n }, () => Array.from({ length: 3 }, () => rng.int(4))));
    const Y = matrixFromRows(Array.from({ length: n }, () => [rng.int(5), rng.int(5)]));
    const RX = naiveRanks(X);
    const RY = naiveRanks(Y);
    for (let k = 1; k <= n - 2; k++) {
      expect(trustworthiness(X, Y, k)).toBeCloseTo(naiveTrust(RX, RY, n, k), 13);
      expect(continuity(X, Y, k)).toBeCloseTo(naiveTrust(RY, RX, n, k), 13);
    }
  });

  it('agree with the full-rank-matrix definition in 12 dimensions with ties, where far points are pruned by projection', () => {
    const rng = new Rng(43);
    const n = 150;
    const X = matrixFromRows(Array.from({ length: n }, () => Array.from({ length: 12 }, () => rng.int(3))));
    const Y = matrixFromRows(Array.from({ length: n }, () => [rng.normal(), rng.normal()]));
    const RX = naiveRanks(X);
    const RY = naiveRanks(Y);
    for (const k of [1, 3, 10, 40, 74, 75, 100, 148]) {
      expect(trustworthiness(X, Y, k)).toBeCloseTo(naiveTrust(RX, RY, n, k), 13);
      expect(continuity(X, Y, k)).toBeCloseTo(naiveTrust(RY, RX, n, k), 13);
    }
  });

  it('do not change when integer data are shifted far from the origin (exact ties stay ties)', () => {
    const { X, E1 } = loadDigits500();
    const shifted = { n: X.n, d: X.d, data: X.data.map((v) => v + 1e6) };
    for (const k of [5, 30]) {
      expect(trustworthiness(shifted, E1, k)).toBe(trustworthiness(X, E1, k));
    }
  });

  it('average over given rows: the full-rank-matrix sum over those rows scaled by n/m, exact ranks among all points', () => {
    const rng = new Rng(44);
    const n = 150;
    const X = matrixFromRows(Array.from({ length: n }, () => Array.from({ length: 12 }, () => rng.int(3))));
    const Y = matrixFromRows(Array.from({ length: n }, () => [rng.normal(), rng.normal()]));
    const RX = naiveRanks(X);
    const RY = naiveRanks(Y);
    const rows = Int32Array.from({ length: 50 }, (_, t) => 3 * t);
    const partial = (RH: Int32Array, RL: Int32Array, k: number): number => {
      let sum = 0;
      for (const i of rows) {
        for (let j = 0; j < n; j++) if (j !== i && RL[i * n + j] <= k && RH[i * n + j] > k) sum += RH[i * n + j] - k;
      }
      const G = n * k * (2 * n - 3 * k - 1);
      return 1 - (2 / G) * sum * (n / rows.length);
    };
    for (const k of [5, 15]) {
      expect(trustworthiness(X, Y, k, { rows })).toBeCloseTo(partial(RX, RY, k), 13);
      expect(continuity(X, Y, k, { rows })).toBeCloseTo(partial(RY, RX, k), 13);
      // Every row given: the same bytes as no rows at all.
      const all = Int32Array.from({ length: n }, (_, i) => i);
      expect(trustworthiness(X, Y, k, { rows: all })).toBe(trustworthiness(X, Y, k));
    }
    expect(() => trustworthiness(X, Y, 5, { rows: Int32Array.from([3, 2]) })).toThrow(/ascending/);
    expect(() => trustworthiness(X, Y, 5, { rows: Int32Array.from([150]) })).toThrow(/0\.\.149/);
  });

  it('estimate the full score closely from a 1,000-row sample of 3,000 (digits-like clusters, t-SNE-like map)', () => {
    const rng = new Rng(45);
    const n = 3000;
    const X = gaussianMatrix(rng, n, 20);
    for (let i = 0; i < n; i++) X.data[i * 20 + (i % 8)] += 6; // eight groups
    const Y = matrixFromRows(Array.from({ length: n }, (_, i) => [(i % 8) * 5 + rng.normal(), rng.normal()]));
    const full = trustworthiness(X, Y, 15);
    const rows = Int32Array.from({ length: 1000 }, (_, t) => 3 * t + (t % 3));
    expect(Math.abs(trustworthiness(X, Y, 15, { rows }) - full)).toBeLessThan(0.005);
    expect(Math.abs(continuity(X, Y, 15, { rows }) - continuity(X, Y, 15))).toBeLessThan(0.005);
  });

  it('give the same bytes with reuseRanks, map after map of the same data, whether later intruders fall inside what was kept or not', () => {
    for (const [seed, integer] of [[46, false], [47, true]] as const) {
      const rng = new Rng(seed);
      const n = 400;
      const d = 12;
      const X = matrixFromRows(Array.from({ length: n }, (_, i) => Array.from({ length: d }, (_, c) => (integer ? rng.int(3) : rng.normal()) + (c === i % 4 ? 4 : 0))));
      const maps: Matrix[] = [];
      // A faithful-ish map, a noisier one, an unrelated one (far intruders: rescans), then faithful again (hits).
      for (const noise of [0.3, 1.5, -1, 0.3]) {
        maps.push(matrixFromRows(Array.from({ length: n }, (_, i) => (noise < 0 ? [rng.normal(), rng.normal()] : [(i % 4) * 3 + noise * rng.normal(), noise * rng.normal()]))));
      }
      // A fresh copy of X's data gets a fresh cache; the first X is reused across calls.
      const fresh = (): Matrix => ({ n, d, data: X.data.slice() });
      const rows = Int32Array.from({ length: 100 }, (_, t) => 4 * t + 1);
      for (const Y of maps) {
        for (const k of [5, 15]) {
          expect(trustworthiness(X, Y, k, { reuseRanks: true })).toBe(trustworthiness(fresh(), Y, k));
          expect(trustworthiness(X, Y, k, { reuseRanks: true, rows })).toBe(trustworthiness(fresh(), Y, k, { rows }));
        }
      }
    }
  });

  it('give the same value whether the high-dimensional neighbour list is short or long', () => {
    const { X, E1 } = loadDigits500();
    const short = trustworthiness(X, E1, 7, { knnX: exactKnn(X, 7) });
    const long = trustworthiness(X, E1, 7, { knnX: exactKnn(X, 120), knnY: exactKnn(E1, 50) });
    expect(long).toBe(short);
    expect(trustworthiness(X, E1, 7)).toBe(short);
  });

  it('are 1 for a rotated, scaled and translated copy of the embedding', () => {
    const X = gaussianMatrix(new Rng(3), 200, 6);
    const Y = matrixFromRows(Array.from({ length: 200 }, (_, i) => [X.data[i * 6], X.data[i * 6 + 1]]));
    const c = Math.cos(0.7);
    const s = Math.sin(0.7);
    const Ymoved = similarity(Y, [c, s, -s, c], 3.5, [-2, 11]);
    expect(trustworthiness(Y, Ymoved, 10)).toBe(1);
    expect(continuity(Y, Ymoved, 10)).toBe(1);
  });

  it('are near 0.5 for an embedding unrelated to the data (random permutation of the rows)', () => {
    const rng = new Rng(5);
    const n = 1000;
    const X = gaussianMatrix(rng, n, 5);
    const Y = gaussianMatrix(rng, n, 2);
    // Expected value 0.5 for k ≪ n (random neighbours have uniformly distributed ranks).
    expect(Math.abs(trustworthiness(X, Y, 10) - 0.5)).toBeLessThan(0.03);
    expect(Math.abs(continuity(X, Y, 10) - 0.5)).toBeLessThan(0.03);
  });

  it('reject k outside 1..n − 2 and mismatched inputs, naming the allowed range', () => {
    expect(() => trustworthiness(S10.X, S10.Y, 0)).toThrow(RangeError);
    expect(() => trustworthiness(S10.X, S10.Y, 9)).toThrow(/from 1 to n − 2 = 8/);
    expect(() => continuity(S10.X, S10.Y, 2.5)).toThrow(RangeError);
    expect(() => trustworthiness(S10.X, col([1, 2, 3]), 1)).toThrow(/same points/);
    expect(() => trustworthiness(S10.X, S10.Y, 4, { knnX: exactKnn(S10.X, 3) })).toThrow(/at least k = 4/);
    const bad = matrixFromRows([[0, 0], [1, NaN], [2, 2]]);
    expect(() => trustworthiness(bad, bad, 1)).toThrow(/non-finite/);
  });

  it('do not modify their inputs', () => {
    const X = S10.X.data.slice();
    const Y = S10.Y.data.slice();
    trustworthiness(S10.X, S10.Y, 3);
    continuity(S10.X, S10.Y, 3);
    expect(S10.X.data).toEqual(X);
    expect(S10.Y.data).toEqual(Y);
  });
});

describe('knnOverlap', () => {
  it('gives the shared-neighbour fraction and Jaccard of S10, data vs embedding and embedding vs embedding', () => {
    // Computed with numpy (index tie rule); the fraction equals Q_NX(k) of Lee & Verleysen (2009).
    const xy = [
      [1, 0.6, 0.6],
      [2, 0.5, 0.433333333333333],
      [3, 0.766666666666667, 0.67],
      [4, 0.9, 0.84],
    ];
    const yy = [
      [1, 0.9, 0.9],
      [2, 0.75, 0.666666666666667],
      [3, 0.933333333333333, 0.9],
      [4, 0.925, 0.88],
    ];
    for (const [k, f, j] of xy) {
      const o = knnOverlapMatrices(S10.X, S10.Y, k);
      expect(o.fraction).toBeCloseTo(f, 14);
      expect(o.jaccard).toBeCloseTo(j, 14);
    }
    for (const [k, f, j] of yy) {
      const o = knnOverlapMatrices(S10.Y, S10.Y2, k);
      expect(o.fraction).toBeCloseTo(f, 14);
      expect(o.jaccard).toBeCloseTo(j, 14);
    }
  });

  it('reproduces the D500 values with index tie breaking in the integer pixel space', () => {
    // Computed with numpy: stable argsort of squared distances (D500 = first 500 UCI digits in scikit-learn 1.2.1).
    const { X, E1, E2 } = loadDigits500();
    const gX = exactKnn(X, 30);
    const g1 = exactKnn(E1, 30);
    const g2 = exactKnn(E2, 30);
    const xe1: Array<[number, number, number]> = [
      [5, 0.2004, 0.12423809523809524],
      [10, 0.2954, 0.18690916393547974],
      [15, 0.3556, 0.2345278253223041],
      [30, 0.46386666666666665, 0.32866306309754706],
    ];
    const e1e2: Array<[number, number, number]> = [
      [5, 0.2836, 0.18969047619047621],
      [10, 0.377, 0.25609246481073106],
      [15, 0.446, 0.31164519941736096],
      [30, 0.5622666666666667, 0.4135315378420627],
    ];
    for (const [k, f, j] of xe1) {
      const o = knnOverlap(gX, g1, k);
      expect(o.fraction).toBeCloseTo(f, 12);
      expect(o.jaccard).toBeCloseTo(j, 12);
    }
    for (const [k, f, j] of e1e2) {
      const o = knnOverlap(g1, g2, k);
      expect(o.fraction).toBeCloseTo(f, 12);
      expect(o.jaccard).toBeCloseTo(j, 12);
    }
    const xe2: Array<[number, number]> = [
      [5, 0.1748],
      [10, 0.2718],
      [15, 0.33586666666666665],
      [30, 0.45526666666666665],
    ];
    for (const [k, f] of xe2) expect(knnOverlap(gX, g2, k).fraction).toBeCloseTo(f, 12);
  });

  it('matches the numpy values of the mixture and wine fixtures', () => {
    const mix = readFixtureJson('metrics-mixture300.json');
    const X = matrixFromRows(mix.X);
    const Y = matrixFromRows(mix.Y);
    const Y2 = matrixFromRows(mix.Y2);
    for (const v of mix.knn_overlap.values) {
      const a = knnOverlapMatrices(X, Y, v.k);
      const b = knnOverlapMatrices(Y, Y2, v.k);
      expect(a.fraction).toBeCloseTo(v.X_Y_fraction, 12);
      expect(a.jaccard).toBeCloseTo(v.X_Y_jaccard, 12);
      expect(b.fraction).toBeCloseTo(v.Y_Y2_fraction, 12);
      expect(b.jaccard).toBeCloseTo(v.Y_Y2_jaccard, 12);
    }
    const wine = readFixtureJson('metrics-wine.json');
    for (const v of wine.knn_overlap.values) {
      const o = knnOverlapMatrices(matrixFromRows(wine.X), matrixFromRows(wine.Y), v.k);
      expect(o.fraction).toBeCloseTo(v.X_Y_fraction, 12);
      expect(o.jaccard).toBeCloseTo(v.X_Y_jaccard, 12);
    }
  });

  it('reports per-point fractions whose mean is the overall fraction', () => {
    const o = knnOverlapMatrices(S10.X, S10.Y, 3);
    expect(o.perPoint.length).toBe(10);
    const mean = o.perPoint.reduce((s, v) => s + v, 0) / 10;
    expect(mean).toBeCloseTo(o.fraction, 15);
    for (const v of o.perPoint) expect([0, 1 / 3, 2 / 3, 1]).toContain(v);
  });

  it('is near k/(n − 1) for two unrelated point sets', () => {
    const rng = new Rng(11);
    const n = 1000;
    const k = 10;
    const o = knnOverlapMatrices(gaussianMatrix(rng, n, 2), gaussianMatrix(rng, n, 2), k);
    // Expected fraction for independent neighbour sets: k/(n − 1) ≈ 0.01 (sd of the mean ≈ 0.001).
    expect(Math.abs(o.fraction - k / (n - 1))).toBeLessThan(0.004);
  });

  it('is 1 for identical graphs and uses only the first k columns', () => {
    const g = exactKnn(S10.Y, 5);
    expect(knnOverlap(g, g, 5)).toMatchObject({ fraction: 1, jaccard: 1 });
    expect(knnOverlap(exactKnn(S10.X, 9), exactKnn(S10.Y, 3), 2).fraction).toBeCloseTo(0.5, 15);
  });

  it('rejects k larger than a graph has columns, and graphs of different sizes', () => {
    expect(() => knnOverlap(exactKnn(S10.X, 3), exactKnn(S10.Y, 5), 4)).toThrow(/from 1 to 3/);
    expect(() => knnOverlap(exactKnn(S10.X, 3), exactKnn(col([1, 2, 3, 4]), 3), 2)).toThrow(RangeError);
    expect(() => knnOverlapMatrices(S10.X, S10.Y, 10)).toThrow(/from 1 to n − 1 = 9/);
  });
});

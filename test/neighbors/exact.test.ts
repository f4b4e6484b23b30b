import { readFileSync } from 'node:fs';

import { describe, expect, it } from 'vitest';

import { sqDist } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { KnnGraph, Matrix } from '../../src/core/types.js';
import { DEFAULT_KNN_SEED, EXACT_KNN_LIMIT, exactKnn, knnOf, knnPrefix } from '../../src/neighbors/exact.js';
import { splitBlocks } from '../../src/neighbors/exact-tiles.js';
import { nnDescent } from '../../src/neighbors/nndescent.js';
import { workerThreadsAvailable } from '../../src/preprocess/parallel.js';

/** The obvious O(n² log n) reference: sort all other points by (squared distance, index). */
function naiveKnn(m: Matrix, k: number): KnnGraph {
  const indices = new Int32Array(m.n * k);
  const distances = new Float64Array(m.n * k);
  for (let i = 0; i < m.n; i++) {
    const cand: Array<[number, number]> = [];
    for (let j = 0; j < m.n; j++) if (j !== i) cand.push([sqDist(m, i, m, j), j]);
    cand.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    for (let t = 0; t < k; t++) {
      indices[i * k + t] = cand[t][1];
      distances[i * k + t] = Math.sqrt(cand[t][0]);
    }
  }
  return { n: m.n, k, indices, distances };
}

function gaussian(seed: number, n: number, d: number): Matrix {
  const rng = new Rng(seed);
  const data = new Float64Array(n * d);
  for (let i = 0; i < data.length; i++) data[i] = rng.normal();
  return { n, d, data };
}

/** Small integers: almost every row has many exactly tied distances. */
function tiedIntegers(seed: number, n: number, d: number, levels: number): Matrix {
  const rng = new Rng(seed);
  const data = new Float64Array(n * d);
  for (let i = 0; i < data.length; i++) data[i] = rng.int(levels);
  return { n, d, data };
}

function digitsPixels(): Matrix {
  const text = readFileSync(new URL('../fixtures/digits500_X.csv', import.meta.url), 'utf8');
  const rows = text.trim().split('\n').slice(1);
  const data = new Float64Array(rows.length * 64);
  rows.forEach((line, i) => {
    const v = line.split(',');
    for (let j = 0; j < 64; j++) data[i * 64 + j] = Number(v[j + 1]);
  });
  return { n: rows.length, d: 64, data };
}

function expectSameGraph(actual: KnnGraph, expected: KnnGraph): void {
  expect(actual.n).toBe(expected.n);
  expect(actual.k).toBe(expected.k);
  expect(Array.from(actual.indices)).toEqual(Array.from(expected.indices));
  // Bit-for-bit: both sum (a − b)² over the columns in the same order.
  expect(Array.from(actual.distances)).toEqual(Array.from(expected.distances));
}

describe('exactKnn', () => {
  it('equals a naive sort-based search exactly on random data', () => {
    const m = gaussian(1, 301, 7);
    expectSameGraph(exactKnn(m, 15), naiveKnn(m, 15));
  });

  it('equals the naive search exactly on heavily tied integer data, lower index first among equals', () => {
    const m = tiedIntegers(2, 203, 3, 3); // 27 distinct points, so ties everywhere including distance 0
    expectSameGraph(exactKnn(m, 40), naiveKnn(m, 40));
  });

  it('equals the naive search exactly on the digits pixels (UCI optical digits, 500 rows, integer values)', () => {
    const m = digitsPixels();
    expectSameGraph(exactKnn(m, 30), naiveKnn(m, 30));
  });

  it('handles fewer rows than one block and row counts that are not multiples of the tile', () => {
    for (const n of [2, 3, 5, 63, 64, 65, 130]) {
      const m = gaussian(3 + n, n, 4);
      const k = Math.min(n - 1, 9);
      expectSameGraph(exactKnn(m, k), naiveKnn(m, k));
    }
  });

  it('orders identical points by index', () => {
    const m: Matrix = { n: 6, d: 2, data: new Float64Array(12).fill(1.5) };
    const g = exactKnn(m, 5);
    expect(Array.from(g.indices.subarray(0, 5))).toEqual([1, 2, 3, 4, 5]);
    expect(Array.from(g.indices.subarray(15, 20))).toEqual([0, 1, 2, 4, 5]);
    expect(Array.from(g.distances).every((v) => v === 0)).toBe(true);
  });

  it('never lists a point as its own neighbour, nor a neighbour twice', () => {
    const m = tiedIntegers(4, 250, 2, 4);
    const g = exactKnn(m, 20);
    for (let i = 0; i < g.n; i++) {
      const row = Array.from(g.indices.subarray(i * 20, (i + 1) * 20));
      expect(row).not.toContain(i);
      expect(new Set(row).size).toBe(20);
    }
  });

  it('returns rows sorted by (distance, index)', () => {
    const m = tiedIntegers(5, 150, 4, 3);
    const g = exactKnn(m, 25);
    for (let i = 0; i < g.n; i++) {
      for (let t = 1; t < 25; t++) {
        const a = g.distances[i * 25 + t - 1];
        const b = g.distances[i * 25 + t];
        expect(a < b || (a === b && g.indices[i * 25 + t - 1] < g.indices[i * 25 + t])).toBe(true);
      }
    }
  });

  it('allows k = n − 1 (every other point)', () => {
    const m = gaussian(6, 40, 3);
    expectSameGraph(exactKnn(m, 39), naiveKnn(m, 39));
  });

  it('rejects k outside 1..n−1 and non-finite input with a RangeError', () => {
    const m = gaussian(7, 10, 2);
    expect(() => exactKnn(m, 0)).toThrow(RangeError);
    expect(() => exactKnn(m, 10)).toThrow(/1\.\.9/);
    expect(() => exactKnn(m, 2.5)).toThrow(RangeError);
    expect(() => exactKnn({ n: 1, d: 2, data: new Float64Array(2) }, 1)).toThrow(RangeError);
    const bad = m.data.slice();
    bad[5] = Number.POSITIVE_INFINITY;
    expect(() => exactKnn({ n: 10, d: 2, data: bad }, 3)).toThrow(/non-finite value at row 2, column 1/);
  });

  it('leaves its input untouched', () => {
    const m = gaussian(8, 70, 3);
    const copy = m.data.slice();
    exactKnn(m, 5);
    expect(m.data).toEqual(copy);
  });
});

describe('exactKnn against scikit-learn', () => {
  // test/fixtures/knn-sklearn-200x8.json: scikit-learn 1.2.1 NearestNeighbors(n_neighbors=11).kneighbors
  // on tie-free 200 × 8 Gaussian data (numpy 1.24.2), self column dropped; made by
  // test/fixtures/scripts/knn_sklearn.py.
  const fixture = JSON.parse(readFileSync(new URL('../fixtures/knn-sklearn-200x8.json', import.meta.url), 'utf8')) as {
    versions: Record<string, string>;
    n: number;
    d: number;
    k: number;
    X: number[][];
    indices: number[][];
    distances: number[][];
  };

  it('finds the same neighbour indices and distances to 1e-12', () => {
    expect(fixture.versions['scikit-learn']).toBe('1.2.1');
    const { n, d, k } = fixture;
    const data = new Float64Array(n * d);
    fixture.X.forEach((row, i) => row.forEach((v, j) => (data[i * d + j] = v)));
    const g = exactKnn({ n, d, data }, k);
    for (let i = 0; i < n; i++) {
      expect(Array.from(g.indices.subarray(i * k, (i + 1) * k))).toEqual(fixture.indices[i]);
      for (let t = 0; t < k; t++) expect(Math.abs(g.distances[i * k + t] - fixture.distances[i][t])).toBeLessThan(1e-12);
    }
  });
});

describe('knnPrefix', () => {
  it('equals a fresh search with the smaller k, even with ties', () => {
    const m = tiedIntegers(9, 180, 3, 3);
    const big = exactKnn(m, 30);
    for (const k of [1, 7, 30]) expectSameGraph(knnPrefix(big, k), exactKnn(m, k));
  });

  it('copies, so changing the prefix leaves the source alone', () => {
    const big = exactKnn(gaussian(10, 50, 2), 6);
    const before = big.indices.slice();
    const p = knnPrefix(big, 3);
    p.indices[0] = -1;
    p.distances[0] = -1;
    expect(big.indices).toEqual(before);
    expect(big.distances[0]).toBeGreaterThanOrEqual(0);
  });

  it('rejects k outside 1..g.k with a RangeError', () => {
    const g = exactKnn(gaussian(11, 20, 2), 5);
    expect(() => knnPrefix(g, 0)).toThrow(RangeError);
    expect(() => knnPrefix(g, 6)).toThrow(/1\.\.5/);
  });
});

describe('exactKnn on several threads', () => {
  it('returns the same bytes on two and three threads as on one', () => {
    // Without a loadable worker thread the multi-thread calls would quietly run on one.
    expect(workerThreadsAvailable()).toBe(true);
    const m = gaussian(13, 2500, 10);
    const one = exactKnn(m, 15);
    expectSameGraph(exactKnn(m, 15, { threads: 2 }), one);
    expectSameGraph(exactKnn(m, 15, { threads: 3 }), one);
  });

  it('keeps the lower index first among equal distances across the split between threads', () => {
    const m = tiedIntegers(14, 2100, 3, 3); // 27 distinct points, ~78 copies each
    const g = exactKnn(m, 40, { threads: 2 });
    expectSameGraph(g, exactKnn(m, 40));
    // Row 2099's 40 neighbours at distance 0 are the 40 lowest-index copies of itself.
    const copies: number[] = [];
    for (let j = 0; j < 2099 && copies.length < 40; j++) if (sqDist(m, j, m, 2099) === 0) copies.push(j);
    expect(copies.length).toBe(40);
    expect(Array.from(g.indices.subarray(2099 * 40, 2100 * 40))).toEqual(copies);
  });

  it('rejects a thread count that is not a positive integer', () => {
    expect(() => exactKnn(gaussian(15, 10, 2), 3, { threads: 0 })).toThrow(RangeError);
    expect(() => exactKnn(gaussian(15, 10, 2), 3, { threads: 1.5 })).toThrow(RangeError);
  });
});

describe('splitBlocks', () => {
  it('cuts the query blocks into contiguous ranges of about equal work', () => {
    for (const [blocks, parts] of [
      [40, 2],
      [313, 3],
      [1, 2],
    ]) {
      const b = splitBlocks(blocks, parts);
      expect(b.length).toBe(parts + 1);
      expect(b[0]).toBe(0);
      expect(b[parts]).toBe(blocks);
      const work: number[] = [];
      for (let p = 0; p < parts; p++) {
        expect(b[p + 1]).toBeGreaterThanOrEqual(b[p]);
        let w = 0;
        for (let a = b[p]; a < b[p + 1]; a++) w += blocks - a; // block a meets blocks a..blocks−1
        work.push(w);
      }
      // No range exceeds its equal share by more than one block's worth of tiles.
      for (const w of work) expect(w).toBeLessThanOrEqual((blocks * (blocks + 1)) / 2 / parts + blocks);
    }
  });
});

describe('knnOf', () => {
  it('is the exact search up to the exact limit, with or without options', () => {
    const m = gaussian(12, 120, 5);
    expectSameGraph(knnOf(m, 8), exactKnn(m, 8));
    expectSameGraph(knnOf(m, 8, { exactLimit: 120, rng: new Rng(1) }), exactKnn(m, 8));
    expect(EXACT_KNN_LIMIT).toBe(20_000);
  });

  it('switches to NN-descent above the limit, seeded by the given generator or else the documented default', () => {
    const m = gaussian(16, 400, 4);
    expectSameGraph(knnOf(m, 6, { exactLimit: 399, rng: new Rng(5) }), nnDescent(m, 6, new Rng(5)));
    expectSameGraph(knnOf(m, 6, { exactLimit: 100 }), nnDescent(m, 6, new Rng(DEFAULT_KNN_SEED)));
  });

  it('rejects a negative or NaN exact limit', () => {
    const m = gaussian(17, 20, 2);
    expect(() => knnOf(m, 3, { exactLimit: -1 })).toThrow(RangeError);
    expect(() => knnOf(m, 3, { exactLimit: Number.NaN })).toThrow(RangeError);
  });
});

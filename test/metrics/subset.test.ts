import { describe, expect, it } from 'vitest';
import { selectRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { KnnGraph } from '../../src/core/types.js';
import { exactKnn } from '../../src/neighbors/exact.js';
import { checkRowList, knnWithin, positionsOf, sharedRows } from '../../src/metrics/subset.js';
import { loadDigits500 } from './testdata.js';

function same(a: KnnGraph, b: KnnGraph): void {
  expect([a.n, a.k]).toEqual([b.n, b.k]);
  expect(Array.from(a.indices)).toEqual(Array.from(b.indices));
  expect(Array.from(a.distances)).toEqual(Array.from(b.distances));
}

describe('knnWithin', () => {
  it('equals an exact search on the kept rows, with or without a cached graph, on tied data', () => {
    const { X } = loadDigits500(); // integer pixels: many exact distance ties
    const rng = new Rng(12);
    const keep = Int32Array.from({ length: 500 }, (_, i) => i).filter(() => rng.next() < 0.7);
    const direct = exactKnn(selectRows(X, keep), 10);
    same(knnWithin(X, exactKnn(X, 30), keep, 10), direct); // mostly from the cached lists
    same(knnWithin(X, exactKnn(X, 10), keep, 10), direct); // mostly direct scans
    same(knnWithin(X, null, keep, 10), direct);
  });

  it('returns a prefix when every row is kept', () => {
    const { E1 } = loadDigits500();
    const all = Int32Array.from({ length: 500 }, (_, i) => i);
    same(knnWithin(E1, exactKnn(E1, 20), all, 7), exactKnn(E1, 7));
  });

  it('refuses k beyond the kept rows', () => {
    const { E1 } = loadDigits500();
    expect(() => knnWithin(E1, null, Int32Array.of(1, 2, 3), 3)).toThrow(/from 1 to 2/);
  });
});

describe('row lists', () => {
  it('intersect, index and validate ascending row lists', () => {
    expect(Array.from(sharedRows(Int32Array.of(0, 2, 3, 7, 9), Int32Array.of(1, 2, 7, 8, 9)))).toEqual([2, 7, 9]);
    expect(Array.from(positionsOf(Int32Array.of(1, 3), 5))).toEqual([-1, 0, -1, 1, -1]);
    expect(() => checkRowList(Int32Array.of(0, 2, 2), 5)).toThrow(/strictly ascending/);
    expect(() => checkRowList(Int32Array.of(0, 5), 5)).toThrow(/0\.\.4/);
  });
});

import { describe, expect, it } from 'vitest';
import { Rng } from '../../src/core/rng.js';
import type { KnnGraph, Matrix } from '../../src/core/types.js';
import { GRID_MIN_ROWS, exactKnn } from '../../src/neighbors/exact.js';
import { gridKnn2d } from '../../src/neighbors/grid2d.js';

/** The brute-force search on the same points: a third column of zeros adds exactly 0 to every squared distance. */
function bruteForce(m: Matrix, k: number): KnnGraph {
  const data = new Float64Array(3 * m.n);
  for (let i = 0; i < m.n; i++) {
    data[3 * i] = m.data[2 * i];
    data[3 * i + 1] = m.data[2 * i + 1];
  }
  return exactKnn({ n: m.n, d: 3, data }, k);
}

function expectSame(m: Matrix, k: number): void {
  const a = gridKnn2d(m, k);
  const b = bruteForce(m, k);
  expect(Buffer.from(a.indices.buffer).equals(Buffer.from(b.indices.buffer))).toBe(true);
  expect(Buffer.from(a.distances.buffer).equals(Buffer.from(b.distances.buffer))).toBe(true);
}

function points(n: number, f: (i: number) => [number, number]): Matrix {
  const data = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) [data[2 * i], data[2 * i + 1]] = f(i);
  return { n, d: 2, data };
}

describe('gridKnn2d: the same bytes as the brute-force search', () => {
  it('on Gaussian points, k = 1, 15 and 60', () => {
    const rng = new Rng(4);
    const m = points(3000, () => [rng.normal(), rng.normal()]);
    for (const k of [1, 15, 60]) expectSame(m, k);
  });

  it('on clustered points like a map, with a few far outliers', () => {
    const rng = new Rng(5);
    const m = points(2500, (i) => (i % 500 === 0 ? [400 + i, -300] : [10 * (i % 7) + rng.normal(), 5 * (i % 3) + 0.3 * rng.normal()]));
    expectSame(m, 15);
  });

  it('on an integer lattice with duplicated points, where most distances tie', () => {
    const m = points(2000, (i) => [(i * 7) % 31, Math.floor(i / 31) % 23]);
    for (const k of [4, 15, 50]) expectSame(m, k);
  });

  it('when every point is the same (ties everywhere: lowest indices first)', () => {
    const m = points(600, () => [3, 3]);
    expectSame(m, 10);
    expect(Array.from(gridKnn2d(m, 3).indices.subarray(0, 3))).toEqual([1, 2, 3]);
  });

  it('on collinear points and on points far from the origin', () => {
    const rng = new Rng(6);
    expectSame(points(1500, () => [rng.normal() * 100, 0]), 12);
    expectSame(points(1500, () => [1e7 + rng.normal() * 1e-3, -5e6 + rng.normal() * 1e-3]), 12);
  });

  it('is what exactKnn returns for 2-column inputs from GRID_MIN_ROWS rows on', () => {
    const rng = new Rng(7);
    const m = points(GRID_MIN_ROWS, () => [rng.next(), rng.next()]);
    const viaExact = exactKnn(m, 9);
    const viaGrid = gridKnn2d(m, 9);
    expect(Array.from(viaExact.indices)).toEqual(Array.from(viaGrid.indices));
    expectSame(m, 9);
  });
});

import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';

import { InternalError } from '../../src/core/errors.js';
import { matrixFromRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { centerColumns, columnMeans, zScore } from '../../src/preprocess/scale.js';

function randomMatrix(seed: number, n: number, d: number): Matrix {
  const rng = new Rng(seed);
  const data = new Float64Array(n * d);
  // Columns on very different scales and offsets.
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) data[i * d + j] = 1000 * j + (j + 1) * 3 * rng.normal();
  return { n, d, data };
}

function column(m: Matrix, j: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < m.n; i++) out.push(m.data[i * m.d + j]);
  return out;
}

describe('zScore', () => {
  it('gives every column mean 0 and sample standard deviation 1 (ddof 1)', () => {
    const z = zScore(randomMatrix(1, 200, 7));
    for (let j = 0; j < 7; j++) {
      const col = column(z, j);
      // Independent implementation: simple-statistics 7.12.1 (sampleStandardDeviation divides by n − 1).
      expect(Math.abs(ssMean(col))).toBeLessThan(1e-12);
      expect(sampleStandardDeviation(col)).toBeCloseTo(1, 12);
    }
  });

  it('equals (x − mean) / sd computed with simple-statistics 7.12.1', () => {
    const m = randomMatrix(2, 50, 4);
    const z = zScore(m);
    for (let j = 0; j < 4; j++) {
      const col = column(m, j);
      const mu = ssMean(col);
      const sd = sampleStandardDeviation(col);
      for (let i = 0; i < m.n; i++) expect(z.data[i * 4 + j]).toBeCloseTo((col[i] - mu) / sd, 12);
    }
  });

  it('leaves its input untouched', () => {
    const m = randomMatrix(3, 30, 3);
    const copy = m.data.slice();
    zScore(m);
    expect(m.data).toEqual(copy);
  });

  it('throws InternalError for a constant column, which the loader should have dropped', () => {
    const m = matrixFromRows([
      [1, 5],
      [2, 5],
      [3, 5],
    ]);
    expect(() => zScore(m)).toThrow(InternalError);
    expect(() => zScore(m)).toThrow(/column 1 is constant/);
  });

  it('throws InternalError for a single row', () => {
    expect(() => zScore(matrixFromRows([[1, 2]]))).toThrow(InternalError);
  });
});

describe('centerColumns', () => {
  it('subtracts the column means and returns them', () => {
    const m = randomMatrix(4, 40, 5);
    const { centered, mean } = centerColumns(m);
    for (let j = 0; j < 5; j++) {
      // Reference mean: simple-statistics 7.12.1.
      expect(mean[j]).toBeCloseTo(ssMean(column(m, j)), 9);
      expect(Math.abs(ssMean(column(centered, j)))).toBeLessThan(1e-10);
      for (let i = 0; i < m.n; i++) expect(centered.data[i * 5 + j]).toBe(m.data[i * 5 + j] - mean[j]);
    }
    expect(centered.n).toBe(40);
    expect(centered.d).toBe(5);
  });

  it('returns a new matrix and leaves its input untouched', () => {
    const m = randomMatrix(5, 10, 2);
    const copy = m.data.slice();
    const { centered } = centerColumns(m);
    expect(centered.data).not.toBe(m.data);
    expect(m.data).toEqual(copy);
  });

  it('writes into a given output array, and rejects one of the wrong length', () => {
    const m = matrixFromRows([
      [1, 10],
      [3, 30],
    ]);
    const out = new Float64Array(4);
    const { centered } = centerColumns(m, out);
    expect(centered.data).toBe(out);
    expect(Array.from(out)).toEqual([-1, -10, 1, 10]);
    expect(() => centerColumns(m, new Float64Array(3))).toThrow(RangeError);
  });

  it('agrees with columnMeans on a hand-checked example', () => {
    const m = matrixFromRows([
      [1, 10],
      [2, 20],
      [6, 60],
    ]);
    expect(Array.from(columnMeans(m))).toEqual([3, 30]);
    expect(Array.from(centerColumns(m).centered.data)).toEqual([-2, -20, -1, -10, 3, 30]);
  });
});

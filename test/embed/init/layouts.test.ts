import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import type { Matrix } from '../../../src/core/types.js';
import { pcaLayout, principalScores2, randomLayout, rescaleToBox, scaleToMaxAbsInPlace } from '../../../src/embed/init/index.js';
import { fixturePath, maxAbsDiff, sameBytes } from '../umap/testdata.js';

function csvRows(name: string): number[][] {
  return readFileSync(fixturePath(name), 'utf8')
    .trim()
    .split('\n')
    .slice(1)
    .map((line) => line.split(',').map(Number));
}

/** The 500 × 64 pixel block of test/fixtures/digits500_X.csv (UCI digits as bundled with scikit-learn 1.2.1). */
function digits(): Matrix {
  const rows = csvRows('digits500_X.csv');
  const data = new Float64Array(rows.length * 64);
  rows.forEach((r, i) => {
    for (let t = 0; t < 64; t++) data[i * 64 + t] = r[t + 1];
  });
  return { n: rows.length, d: 64, data };
}

describe('pcaLayout', () => {
  it('equals the numpy 1.24.2 SVD projection of digits500 (fixture digits500_pca2.csv, same largest-loading-positive signs), scaled to max |coordinate| 10', () => {
    const ref = csvRows('digits500_pca2.csv');
    const expected = new Float64Array(2 * ref.length);
    ref.forEach((r, i) => {
      expected[2 * i] = r[2];
      expected[2 * i + 1] = r[3];
    });
    scaleToMaxAbsInPlace(expected, 10);
    const ours = pcaLayout(digits());
    expect(maxAbsDiff(ours, expected)).toBeLessThan(1e-8);
    let big = 0;
    for (const v of ours) big = Math.max(big, Math.abs(v));
    expect(big).toBeCloseTo(10, 12);
  });

  it('uses the Gram-matrix route for short wide data and agrees with the scatter-matrix route', () => {
    const rng = new Rng(3);
    const r = 12;
    const d = 30;
    const A = new Float64Array(r * d);
    for (let e = 0; e < A.length; e++) A[e] = rng.normal() * (1 + (e % d) / 3);
    const wide = principalScores2(A, r, d);
    // The same rows padded with copies: the principal axes do not change, so the first r scores agree.
    const tall = new Float64Array(3 * r * d);
    tall.set(A, 0);
    tall.set(A, r * d);
    tall.set(A, 2 * r * d);
    const viaScatter = principalScores2(tall, 3 * r, d);
    expect(maxAbsDiff(wide, viaScatter.subarray(0, 2 * r))).toBeLessThan(1e-9);
  });

  it('scores 0 on the second axis when the data vary along one direction only', () => {
    const rows = 20;
    const data = new Float64Array(rows * 3);
    for (let i = 0; i < rows; i++) {
      data[i * 3] = i;
      data[i * 3 + 1] = 2 * i;
      data[i * 3 + 2] = 5;
    }
    const y = pcaLayout({ n: rows, d: 3, data });
    for (let i = 0; i < rows; i++) expect(Math.abs(y[2 * i + 1])).toBeLessThan(1e-9);
    // Loading (1, 2, 0)/√5 has its largest entry positive, so the score grows with i.
    expect(y[2 * (rows - 1)]).toBeCloseTo(10, 9);
  });
});

describe('randomLayout', () => {
  it('draws coordinates uniform in [−10, 10) from the generator, the same bytes for the same seed', () => {
    const a = randomLayout(500, new Rng(9));
    const b = randomLayout(500, new Rng(9));
    const c = randomLayout(500, new Rng(10));
    expect(sameBytes(a, b)).toBe(true);
    expect(sameBytes(a, c)).toBe(false);
    let lo = Infinity;
    let hi = -Infinity;
    let mean = 0;
    for (const v of a) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
      mean += v / a.length;
    }
    expect(lo).toBeGreaterThanOrEqual(-10);
    expect(hi).toBeLessThan(10);
    expect(lo).toBeLessThan(-9.5);
    expect(hi).toBeGreaterThan(9.5);
    expect(Math.abs(mean)).toBeLessThan(0.6); // SD of the mean: 20/√12/√1000 ≈ 0.18
  });
});

describe('rescaleToBox', () => {
  it('maps each axis onto [0, 10] without changing the input', () => {
    const y = Float64Array.of(-3, 4, 1, 8, 5, 6);
    const copy = y.slice();
    const out = rescaleToBox(y);
    expect(Array.from(out)).toEqual([0, 0, 5, 10, 10, 5]);
    expect(sameBytes(y, copy)).toBe(true);
  });

  it('sets an axis without spread to 0', () => {
    expect(Array.from(rescaleToBox(Float64Array.of(2, 7, 2, 9)))).toEqual([0, 0, 0, 10]);
  });
});

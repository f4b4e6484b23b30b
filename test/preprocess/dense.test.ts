import { describe, expect, it } from 'vitest';

import { Rng } from '../../src/core/rng.js';
import { multiplyABt, orthonormalizeRowsInPlace, transpose } from '../../src/preprocess/dense.js';

function randomArray(seed: number, length: number): Float64Array {
  const rng = new Rng(seed);
  const a = new Float64Array(length);
  for (let i = 0; i < length; i++) a[i] = rng.normal();
  return a;
}

function gramError(v: Float64Array, rows: number, len: number): number {
  let worst = 0;
  for (let a = 0; a < rows; a++) {
    for (let b = 0; b < rows; b++) {
      let s = 0;
      for (let t = 0; t < len; t++) s += v[a * len + t] * v[b * len + t];
      worst = Math.max(worst, Math.abs(s - (a === b ? 1 : 0)));
    }
  }
  return worst;
}

describe('multiplyABt', () => {
  it('equals the textbook triple loop for shapes that do and do not fill whole 4 × 4 tiles', () => {
    for (const [rA, rB, len] of [
      [8, 8, 5],
      [7, 9, 13],
      [1, 1, 1],
      [3, 5, 2],
      [12, 2, 30],
    ]) {
      const a = randomArray(rA * 100 + rB, rA * len);
      const b = randomArray(rB * 100 + len, rB * len);
      const c = multiplyABt(a, rA, b, rB, len);
      expect(c.length).toBe(rA * rB);
      for (let i = 0; i < rA; i++) {
        for (let j = 0; j < rB; j++) {
          let s = 0;
          for (let t = 0; t < len; t++) s += a[i * len + t] * b[j * len + t];
          expect(c[i * rB + j]).toBeCloseTo(s, 12);
        }
      }
    }
  });

  it('computes a hand-checked 2 × 2 product', () => {
    // [[1, 2], [3, 4]] · [[5, 6], [7, 8]]ᵀ = [[17, 23], [39, 53]]
    const c = multiplyABt(new Float64Array([1, 2, 3, 4]), 2, new Float64Array([5, 6, 7, 8]), 2, 2);
    expect(Array.from(c)).toEqual([17, 23, 39, 53]);
  });
});

describe('transpose', () => {
  it('swaps rows and columns, also for shapes larger than one band', () => {
    const rows = 70;
    const cols = 131;
    const a = randomArray(1, rows * cols);
    const t = transpose(a, rows, cols);
    for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) expect(t[j * rows + i]).toBe(a[i * cols + j]);
  });
});

describe('orthonormalizeRowsInPlace', () => {
  it('makes random rows orthonormal and spanning the same space', () => {
    const rows = 9;
    const len = 40;
    const v = randomArray(2, rows * len);
    const orig = v.slice();
    orthonormalizeRowsInPlace(v, rows, len);
    expect(gramError(v, rows, len)).toBeLessThan(1e-14);
    // Gram–Schmidt keeps the first row's direction.
    let norm = 0;
    for (let t = 0; t < len; t++) norm += orig[t] * orig[t];
    for (let t = 0; t < len; t++) expect(v[t]).toBeCloseTo(orig[t] / Math.sqrt(norm), 14);
  });

  it('completes the basis deterministically when rows are dependent or zero', () => {
    const len = 6;
    const v = new Float64Array(4 * len);
    const base = [1, 2, 0, -1, 3, 1];
    for (let t = 0; t < len; t++) {
      v[t] = base[t];
      v[len + t] = 2 * base[t]; // a multiple of row 0
      // row 2 stays zero
      v[3 * len + t] = t === 4 ? 1 : 0;
    }
    const w = v.slice();
    orthonormalizeRowsInPlace(v, 4, len);
    orthonormalizeRowsInPlace(w, 4, len);
    expect(gramError(v, 4, len)).toBeLessThan(1e-14);
    expect(Array.from(v)).toEqual(Array.from(w));
  });

  it('keeps nearly dependent rows orthogonal to machine precision', () => {
    const len = 200;
    const rows = 12;
    const a = randomArray(3, len);
    const b = randomArray(4, rows * len);
    const v = new Float64Array(rows * len);
    for (let i = 0; i < rows; i++) for (let t = 0; t < len; t++) v[i * len + t] = a[t] + 1e-10 * b[i * len + t];
    orthonormalizeRowsInPlace(v, rows, len);
    expect(gramError(v, rows, len)).toBeLessThan(1e-13);
  });

  it('rejects more rows than the row length', () => {
    expect(() => orthonormalizeRowsInPlace(new Float64Array(6), 3, 2)).toThrow(RangeError);
  });
});

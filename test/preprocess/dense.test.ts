import { describe, expect, it } from 'vitest';

import { Rng } from '../../src/core/rng.js';
import { multiplyABt, multiplyABtBlock, orthonormalizeRowsInPlace, transpose } from '../../src/preprocess/dense.js';
import { gemmTasks, runTask } from '../../src/preprocess/tasks.js';

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

describe('multiplyABtBlock', () => {
  it('computes any block of the product with the same bits as the whole product, in both loop orders', () => {
    // Shapes where A has fewer rows than B, more rows, and the same; blocks that cut through 4 × 4 tiles.
    for (const [rA, rB, len] of [
      [10, 37, 23],
      [37, 10, 23],
      [9, 9, 5],
    ]) {
      const a = randomArray(rA + 7 * rB, rA * len);
      const b = randomArray(rB + 11 * rA, rB * len);
      const whole = multiplyABt(a, rA, b, rB, len);
      for (const [i0, i1, j0, j1] of [
        [0, rA, 0, rB],
        [1, rA - 2, 3, rB],
        [2, 3, 0, rB - 1],
        [0, rA, 5, 6],
      ]) {
        const out = new Float64Array(rA * rB).fill(Number.NaN);
        multiplyABtBlock(a, i0, i1, b, j0, j1, len, out, rB);
        for (let i = 0; i < rA; i++) {
          for (let j = 0; j < rB; j++) {
            const inside = i >= i0 && i < i1 && j >= j0 && j < j1;
            if (inside) expect(Object.is(out[i * rB + j], whole[i * rB + j])).toBe(true);
            else expect(out[i * rB + j]).toBeNaN();
          }
        }
      }
    }
  });

  it('sums each entry left to right, like the textbook loop, to the last bit', () => {
    const a = randomArray(40, 6 * 17);
    const b = randomArray(41, 9 * 17);
    const c = multiplyABt(a, 6, b, 9, 17);
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 9; j++) {
        let s = 0;
        for (let t = 0; t < 17; t++) s += a[i * 17 + t] * b[j * 17 + t];
        expect(c[i * 9 + j]).toBe(s);
      }
    }
  });
});

describe('gemmTasks', () => {
  it('splits a product into pieces that together give the same bytes as one call, for 1 to 5 pieces', () => {
    for (const [rA, rB] of [
      [10, 203],
      [203, 10],
      [3, 2],
    ]) {
      const len = 13;
      const a = randomArray(50 + rA, rA * len);
      const b = randomArray(60 + rB, rB * len);
      const whole = multiplyABt(a, rA, b, rB, len);
      for (let parts = 1; parts <= 5; parts++) {
        const out = new Float64Array(rA * rB).fill(Number.NaN);
        const tasks = gemmTasks(a, rA, b, rB, len, out, parts);
        expect(tasks.length).toBeLessThanOrEqual(parts);
        for (const t of tasks) runTask(t);
        expect(Array.from(out)).toEqual(Array.from(whole));
      }
    }
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

  it('extends an orthonormal set from a given row on, leaving the earlier rows untouched', () => {
    const rows = 8;
    const len = 30;
    const v = randomArray(5, rows * len);
    orthonormalizeRowsInPlace(v, 3, len);
    const head = v.slice(0, 3 * len);
    orthonormalizeRowsInPlace(v, rows, len, 3);
    expect(Array.from(v.subarray(0, 3 * len))).toEqual(Array.from(head));
    expect(gramError(v, rows, len)).toBeLessThan(1e-14);
  });

  it('rejects more rows than the row length', () => {
    expect(() => orthonormalizeRowsInPlace(new Float64Array(6), 3, 2)).toThrow(RangeError);
  });
});

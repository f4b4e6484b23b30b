import { describe, expect, it } from 'vitest';
import { matrixFromRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { alignTo, procrustes } from '../../src/metrics/procrustes.js';
import { S10, gaussianMatrix, loadDigits500, readFixtureJson, similarity } from './testdata.js';

function expectMatrixClose(actual: Matrix, expected: number[][], digits: number): void {
  expect(actual.n).toBe(expected.length);
  expected.forEach((row, i) =>
    row.forEach((v, c) => expect(actual.data[i * actual.d + c]).toBeCloseTo(v, digits)),
  );
}

function padColumn(m: Matrix): Matrix {
  return matrixFromRows(Array.from({ length: m.n }, (_, i) => [m.data[2 * i], m.data[2 * i + 1], 0]));
}

describe('procrustes', () => {
  const a = matrixFromRows([[1, 3], [1, 2], [1, 1], [2, 1]]);
  const b = matrixFromRows([[4, -2], [4, -4], [4, -6], [2, -6]]);

  it('gives disparity 0 for the rotated, shifted, scaled and mirrored square of the scipy 1.10.1 docstring', () => {
    const r = procrustes(a, b);
    // scipy.spatial.procrustes docstring: round(disparity) == 0.0; raw value 1.6e-32 (computed).
    expect(r.disparity).toBeLessThan(1e-28);
    // mtx1 of the same call (scipy 1.10.1, computed).
    expectMatrixClose(r.standardizedA, [
      [-0.133630621, 0.6681531048],
      [-0.133630621, 0.133630621],
      [-0.133630621, -0.4008918629],
      [0.4008918629, -0.4008918629],
    ], 9);
  });

  it("gives 0.03647416413373859 for scipy's test configuration data3, in either order", () => {
    // scipy 1.10.1 tests compare data3 with the square above; value computed with scipy.spatial.procrustes.
    const data3 = matrixFromRows([[2, 4], [2, 3], [2, 2], [3, 2.5]]);
    expect(procrustes(a, data3).disparity).toBeCloseTo(0.03647416413373859, 14);
    expect(procrustes(data3, a).disparity).toBeCloseTo(0.03647416413373859, 14);
  });

  it('matches scipy 1.10.1 on S10: disparity, rotation (transpose of orthogonal_procrustes R) and scale', () => {
    const r = procrustes(S10.Y, S10.Y2);
    // scipy.spatial.procrustes(Y, Y2) and orthogonal_procrustes(Ã, B̃), computed.
    expect(r.disparity).toBeCloseTo(0.013049088524350619, 14);
    expect(r.scale).toBeCloseTo(0.9934540308819777, 14);
    const R = [0.8465995036, 0.5322304769, -0.5322304769, 0.8465995036];
    expect(r.rotation[0]).toBeCloseTo(R[0], 9);
    expect(r.rotation[1]).toBeCloseTo(R[2], 9);
    expect(r.rotation[2]).toBeCloseTo(R[1], 9);
    expect(r.rotation[3]).toBeCloseTo(R[3], 9);
    // The closed form 1 − (Σσ)² of the same fit.
    expect(r.disparity).toBeCloseTo(1 - r.scale * r.scale, 14);
  });

  it('absorbs a mirror image: S10 with one axis flipped keeps disparity 0.013049088524350619', () => {
    const mirrored = similarity(S10.Y, [1, 0, 0, -1], 1, [0, 0]);
    const r = procrustes(mirrored, S10.Y2);
    // scipy 1.10.1, computed (reflections allowed); a rotation-only fit would give 0.8227511803586831.
    expect(r.disparity).toBeCloseTo(0.013049088524350619, 14);
    const R = r.rotation;
    expect(R[0] * R[3] - R[1] * R[2]).toBeCloseTo(-1, 14);
  });

  it('gives 0.0814720640868248 for the two PCA maps of D500 (scipy 1.10.1, computed)', () => {
    const { E1, E2 } = loadDigits500();
    expect(procrustes(E1, E2).disparity).toBeCloseTo(0.0814720640868248, 13);
  });

  it('reproduces scipy 1.10.1 output matrices on the mixture fixture', () => {
    const fx = readFixtureJson('metrics-mixture300.json');
    const Y = matrixFromRows(fx.Y);
    const Y2 = matrixFromRows(fx.Y2);
    const r = procrustes(Y, Y2);
    expect(r.disparity).toBeCloseTo(fx.procrustes.disparity, 13);
    expect(procrustes(Y2, Y).disparity).toBeCloseTo(fx.procrustes.disparity_reversed, 13);
    expectMatrixClose(r.standardizedA, fx.procrustes.standardized_Y, 13);
    expectMatrixClose(r.aligned, fx.procrustes.aligned_Y2, 13);
    const wine = readFixtureJson('metrics-wine.json');
    expect(procrustes(matrixFromRows(wine.Y), matrixFromRows(wine.Yraw)).disparity).toBeCloseTo(
      wine.procrustes.disparity,
      13,
    );
  });

  it('gives the same disparity in three dimensions when a zero column is added (general SVD path)', () => {
    // scipy documents zero-padding for configurations of different dimension.
    const r2 = procrustes(S10.Y, S10.Y2);
    const r3 = procrustes(padColumn(S10.Y), padColumn(S10.Y2));
    expect(r3.disparity).toBeCloseTo(r2.disparity, 13);
    expect(r3.scale).toBeCloseTo(r2.scale, 13);
  });

  it('gives disparity ~0 for similarity transforms in 2 and 3 dimensions, reflections included', () => {
    const rng = new Rng(9);
    const A2 = gaussianMatrix(rng, 50, 2);
    const c = Math.cos(2.1);
    const s = Math.sin(2.1);
    expect(procrustes(A2, similarity(A2, [c, s, -s, c], 0.01, [100, -3])).disparity).toBeLessThan(1e-20);
    expect(procrustes(A2, similarity(A2, [c, s, s, -c], 70, [1, 2])).disparity).toBeLessThan(1e-20);
    const A3 = gaussianMatrix(rng, 40, 3);
    // a rotation about z followed by a mirror in x
    const Q = [-c, s, 0, s, c, 0, 0, 0, 1];
    const r = procrustes(A3, similarity(A3, Q, 2.5, [1, 1, 1]));
    expect(r.disparity).toBeLessThan(1e-20);
    expectMatrixClose(r.aligned, Array.from({ length: 40 }, (_, i) => Array.from(r.standardizedA.data.subarray(3 * i, 3 * i + 3))), 12);
  });

  it('is symmetric in its arguments up to rounding', () => {
    const rng = new Rng(4);
    const A = gaussianMatrix(rng, 30, 2);
    const B = gaussianMatrix(rng, 30, 2);
    expect(procrustes(A, B).disparity).toBeCloseTo(procrustes(B, A).disparity, 14);
  });

  it('rejects different shapes, fewer than two points and configurations whose points all coincide', () => {
    expect(() => procrustes(S10.Y, S10.X)).toThrow(/same shape/);
    expect(() => procrustes(matrixFromRows([[1, 2]]), matrixFromRows([[3, 4]]))).toThrow(/at least 2 points/);
    const same = matrixFromRows([[1, 1], [1, 1], [1, 1]]);
    expect(() => procrustes(matrixFromRows([[0, 0], [1, 0], [0, 1]]), same)).toThrow(/identical/);
    expect(() => procrustes(matrixFromRows([[0, 0], [1, NaN]]), matrixFromRows([[0, 0], [1, 1]]))).toThrow(RangeError);
  });

  it('leaves its inputs untouched', () => {
    const y = S10.Y.data.slice();
    const y2 = S10.Y2.data.slice();
    procrustes(S10.Y, S10.Y2);
    alignTo(S10.Y, S10.Y2);
    expect(S10.Y.data).toEqual(y);
    expect(S10.Y2.data).toEqual(y2);
  });
});

describe('alignTo', () => {
  it('maps a transformed copy back onto the reference in the reference coordinates', () => {
    const rng = new Rng(12);
    const ref = gaussianMatrix(rng, 25, 2);
    const c = Math.cos(-0.4);
    const s = Math.sin(-0.4);
    const moved = similarity(ref, [c, s, s, -c], 4, [10, 20]);
    const back = alignTo(ref, moved);
    for (let t = 0; t < ref.data.length; t++) expect(back.data[t]).toBeCloseTo(ref.data[t], 12);
  });

  it("equals scipy's fitted matrix with the reference's centring and scaling undone", () => {
    const fx = readFixtureJson('metrics-mixture300.json');
    const Y = matrixFromRows(fx.Y);
    const out = alignTo(Y, matrixFromRows(fx.Y2));
    const n = Y.n;
    const mean = [0, 0];
    for (let i = 0; i < n; i++) for (let c = 0; c < 2; c++) mean[c] += Y.data[2 * i + c] / n;
    let ss = 0;
    for (let i = 0; i < n; i++) for (let c = 0; c < 2; c++) ss += (Y.data[2 * i + c] - mean[c]) ** 2;
    const norm = Math.sqrt(ss);
    fx.procrustes.aligned_Y2.forEach((row: number[], i: number) =>
      row.forEach((v, c) => expect(out.data[2 * i + c]).toBeCloseTo(v * norm + mean[c], 11)),
    );
  });
});

import { describe, expect, it } from 'vitest';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { exactKnn } from '../../src/neighbors/exact.js';
import { densityCorrelation, logLocalRadius } from '../../src/metrics/density.js';
import { S10, gaussianMatrix, loadDigits500, readFixtureJson, similarity } from './testdata.js';

const fixture = readFixtureJson('structure-metrics.json');

/**
 * A dense Gaussian cluster (sd 0.1) nested at the centre of a sparse one
 * (sd 1), 250 points each in 6-D; `faithful` keeps the first two coordinates,
 * `equalised` draws the dense cluster with the sparse one's spread (×10) beside it.
 */
function nestedClusters(): { X: Matrix; faithful: Matrix; equalised: Matrix } {
  const rng = new Rng(21);
  const m = 250;
  const D = 6;
  const X = new Float64Array(2 * m * D);
  const faithful = new Float64Array(2 * m * 2);
  const equalised = new Float64Array(2 * m * 2);
  for (let i = 0; i < 2 * m; i++) {
    const dense = i >= m;
    for (let c = 0; c < D; c++) X[i * D + c] = rng.normal() * (dense ? 0.1 : 1);
    for (let c = 0; c < 2; c++) {
      faithful[i * 2 + c] = X[i * D + c];
      equalised[i * 2 + c] = dense ? 10 * X[i * D + c] + (c === 0 ? 8 : 0) : X[i * D + c];
    }
  }
  return {
    X: { n: 2 * m, d: D, data: X },
    faithful: { n: 2 * m, d: 2, data: faithful },
    equalised: { n: 2 * m, d: 2, data: equalised },
  };
}

describe('logLocalRadius', () => {
  it('is the log mean squared distance to the k nearest points (S10, k = 2, numpy 1.24.2)', () => {
    // log R_X for S10 with k = 2, numpy 1.24.2 (computed).
    const expected = [1.8931119635, 1.4206957878, 1.3029127522, 1.1631508098, 2.5545104457, 2.4960938392, 2.263324379,
      1.5800091017, 1.9810014689, 2.1627481478];
    const r = logLocalRadius(S10.X, exactKnn(S10.X, 2), 2);
    expected.forEach((v, i) => expect(r[i]).toBeCloseTo(v, 9));
  });

  it('raises a zero radius to the smallest positive one instead of returning −∞', () => {
    const M: Matrix = { n: 5, d: 1, data: Float64Array.of(0, 0, 3, 4, 6) };
    const r = logLocalRadius(M, exactKnn(M, 1), 1);
    expect(r[0]).toBe(Math.log(1));
    expect(r[1]).toBe(Math.log(1));
    expect(r[2]).toBe(Math.log(1));
    expect(r[4]).toBe(Math.log(4));
  });
});

describe('densityCorrelation', () => {
  it('matches the k-NN-radius Pearson correlation on S10 and D500 (numpy 1.24.2, computed)', () => {
    expect(densityCorrelation(S10.X, S10.Y, 2)).toBeCloseTo(0.43905445362625173, 14);
    expect(densityCorrelation(S10.X, S10.Y, 3)).toBeCloseTo(0.5491187610275322, 14);
    const { X, E1, E2 } = loadDigits500();
    expect(densityCorrelation(X, E1, 10)).toBeCloseTo(-0.02044516501175936, 14);
    expect(densityCorrelation(X, E2, 10)).toBeCloseTo(fixture.density.D500_E2_k10, 14);
  });

  it('is 1 within 1e-12 for a rotated and scaled copy', () => {
    const X = gaussianMatrix(new Rng(3), 300, 2);
    const Y = similarity(X, [0, 1, -1, 0], 0.01, [4, 4]);
    expect(Math.abs(densityCorrelation(X, Y, 7) - 1)).toBeLessThan(1e-12);
  });

  it('flags a map that draws a dense cluster nested in a sparse one with the same spread', () => {
    const { X, faithful, equalised } = nestedClusters();
    const good = densityCorrelation(X, faithful, 10);
    const flat = densityCorrelation(X, equalised, 10);
    expect(good).toBeGreaterThan(0.8);
    expect(flat).toBeLessThan(0.3);
  });

  it('reuses given kNN graphs with more columns than k', () => {
    const { X, E1 } = loadDigits500();
    const a = densityCorrelation(X, E1, 10, { knnX: exactKnn(X, 25), knnY: exactKnn(E1, 12) });
    expect(a).toBe(densityCorrelation(X, E1, 10));
  });
});

import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { INIT_SCALE, pcaInit, randomInit } from '../../../src/embed/tsne/init.js';
import { loadDigits500, loadDigitsE1, maxAbs } from './helpers.js';

describe('pcaInit', () => {
  it('is the digits PCA layout E1 (NumPy 1.24.2 SVD, largest-loading-positive signs) scaled to SD 1e-4 along PC1', () => {
    // E1: test/fixtures/digits500_pca2.csv, first two principal components of the first
    // 500 rows of scikit-learn 1.2.1's bundled UCI digits.
    const { X } = loadDigits500();
    const E1 = loadDigitsE1();
    let ss = 0;
    for (let i = 0; i < 500; i++) ss += E1[2 * i] ** 2;
    const scale = INIT_SCALE / Math.sqrt(ss / 500);
    const expected = E1.map((v) => v * scale);
    const y = pcaInit(X);
    expect(maxAbs(y.map((v, e) => v - expected[e])) / maxAbs(expected)).toBeLessThan(1e-9);
  });

  it('gives the first coordinate a population standard deviation of 1e-4 and mean 0', () => {
    const { X } = loadDigits500();
    const y = pcaInit(X);
    let m = 0;
    let ss = 0;
    for (let i = 0; i < 500; i++) m += y[2 * i] / 500;
    for (let i = 0; i < 500; i++) ss += (y[2 * i] - m) ** 2;
    expect(Math.abs(m)).toBeLessThan(1e-18);
    expect(Math.sqrt(ss / 500)).toBeCloseTo(1e-4, 15);
  });

  it('handles one-column data by leaving the second coordinate at zero', () => {
    const X = { n: 4, d: 1, data: Float64Array.from([1, 2, 4, 9]) };
    const y = pcaInit(X);
    expect([y[1], y[3], y[5], y[7]]).toEqual([0, 0, 0, 0]);
    expect(y[6]).toBeGreaterThan(0);
  });
});

describe('randomInit', () => {
  it('draws normal coordinates with SD about 1e-4 from the given generator, reproducibly', () => {
    const a = randomInit(5000, new Rng(8));
    const b = randomInit(5000, new Rng(8));
    expect(Array.from(a)).toEqual(Array.from(b));
    let ss = 0;
    for (const v of a) ss += v * v;
    expect(Math.sqrt(ss / a.length) / 1e-4).toBeGreaterThan(0.97);
    expect(Math.sqrt(ss / a.length) / 1e-4).toBeLessThan(1.03);
  });
});

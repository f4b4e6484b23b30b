import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { connectedComponents, laplacianEigenvectors } from '../../../src/embed/init/index.js';
import { jointFromKnn } from '../../../src/embed/tsne/affinities.js';
import { INIT_SCALE, pcaInit, randomInit, spectralInit } from '../../../src/embed/tsne/init.js';
import { runTsne } from '../../../src/embed/tsne/index.js';
import { fixture, gaussianMixture, loadDigits500, loadDigitsE1, maxAbs, naiveKnn } from './helpers.js';

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

describe('spectralInit (Laplacian eigenmaps of P)', () => {
  // Reference: test/fixtures/tsne-spectral.json from test/fixtures/scripts/tsne_spectral.py —
  // scikit-learn 1.2.1's sparse joint P of the digits rows (perplexity 30, 91 neighbours),
  // eigenvectors of I − D^−½ P D^−½ by numpy 1.24.2 eigh.
  const ref = JSON.parse(readFileSync(fixture('tsne-spectral.json'), 'utf8')) as { k: number; eigenvalues: number[]; vectors: number[][] };
  const { X } = loadDigits500();
  const P = jointFromKnn(naiveKnn(X, ref.k), 30, ref.k);

  // scikit-learn computes the conditional P in float32 (relative error ~1e-7), which moves
  // the eigenvalues by ~1e-6 and, over eigengaps of 0.0085 and 0.0155, the vectors by ~1e-4
  // (entries up to 0.15); measured here: 1.8e-6 and 7e-5. A wrong or swapped vector is off by ~0.1.
  it('finds the eigenpairs numpy finds for the normalised Laplacian of P (eigenvalues to 1e-5, vectors to 5e-4)', () => {
    expect(connectedComponents({ n: P.n, indptr: P.indptr, indices: P.indices, weights: P.values }).count).toBe(1);
    const all = Int32Array.from({ length: 500 }, (_, i) => i);
    const r = laplacianEigenvectors({ n: P.n, indptr: P.indptr, indices: P.indices, weights: P.values }, all, 2, 1e-11);
    expect(r.converged).toBe(true);
    for (let c = 0; c < 2; c++) {
      expect(Math.abs(r.values[c] - ref.eigenvalues[c + 1])).toBeLessThan(1e-5);
      const v = r.vectors.subarray(c * 500, (c + 1) * 500);
      expect(maxAbs(Array.from(v, (x, i) => x - ref.vectors[c][i]))).toBeLessThan(5e-4);
    }
  });

  it('is those two eigenvectors as x and y, scaled so x has standard deviation 1e-4', () => {
    const y = spectralInit(P, X, new Rng(1));
    const [u, w] = ref.vectors;
    let m = 0;
    for (let i = 0; i < 500; i++) m += u[i] / 500;
    let ss = 0;
    for (let i = 0; i < 500; i++) ss += (u[i] - m) ** 2;
    const scale = INIT_SCALE / Math.sqrt(ss / 500);
    let worst = 0;
    for (let i = 0; i < 500; i++) {
      worst = Math.max(worst, Math.abs(y[2 * i] - scale * u[i]), Math.abs(y[2 * i + 1] - scale * w[i]));
    }
    // As above (float32 P in the reference), plus the default residual tolerance 1e-6.
    expect(worst / (scale * maxAbs(u))).toBeLessThan(5e-3);
  });

  it('is the same for every seed on a connected graph', () => {
    const a = spectralInit(P, X, new Rng(1));
    const b = spectralInit(P, X, new Rng(2));
    expect(Buffer.from(a.buffer).equals(Buffer.from(b.buffer))).toBe(true);
  });

  it('starts t-SNE from it: runTsne with init spectral gives the same bytes for two seeds and differs from init pca', () => {
    const { X: Xm } = gaussianMixture(new Rng(5), 300, 5, 3, 6);
    const knn = naiveKnn(Xm, 31);
    const opts = { perplexity: 10, iterations: 300, init: 'spectral' as const };
    const a = runTsne(Xm, knn, opts, new Rng(1));
    const b = runTsne(Xm, knn, opts, new Rng(2));
    const c = runTsne(Xm, knn, { ...opts, init: 'pca' }, new Rng(1));
    expect(Buffer.from(a.embedding.data.buffer).equals(Buffer.from(b.embedding.data.buffer))).toBe(true);
    expect(maxAbs(a.embedding.data.map((v, e) => v - c.embedding.data[e]))).toBeGreaterThan(1e-3);
    expect(Number.isFinite(a.klDivergence)).toBe(true);
  });
});

import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import type { Embedding, KnnGraph, Matrix } from '../../../src/core/types.js';
import { jointExact, jointFromKnn, neighboursForPerplexity } from '../../../src/embed/tsne/affinities.js';
import { pcaInit } from '../../../src/embed/tsne/init.js';
import { klDivergence } from '../../../src/embed/tsne/kl.js';
import { runTsne } from '../../../src/embed/tsne/index.js';
import { gaussianMixture, naiveKnn } from './helpers.js';

/**
 * Trustworthiness T(k) (Venna & Kaski 2001), as scikit-learn 1.2.1
 * `sklearn.manifold.trustworthiness` defines it: penalise embedded
 * neighbours by their excess input-space rank.
 */
function trustworthiness(X: Matrix, Y: Embedding, k: number): number {
  const n = X.n;
  const inputRank = new Int32Array(n * n);
  const full = naiveKnn(X, n - 1);
  for (let i = 0; i < n; i++) for (let r = 0; r < n - 1; r++) inputRank[i * n + full.indices[i * (n - 1) + r]] = r + 1;
  const emb = naiveKnn({ n, d: 2, data: Y.data }, k);
  let penalty = 0;
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < k; t++) {
      const r = inputRank[i * n + emb.indices[i * k + t]];
      if (r > k) penalty += r - k;
    }
  }
  return 1 - (2 / (n * k * (2 * n - 3 * k - 1))) * penalty;
}

function mixture(seed: number, n = 300): { X: Matrix; labels: Int32Array; knn: KnnGraph } {
  const { X, labels } = gaussianMixture(new Rng(seed), n, 10, 3, 5);
  return { X, labels, knn: naiveKnn(X, neighboursForPerplexity(30, n)) };
}

const sameBytes = (a: Float64Array, b: Float64Array): boolean => Buffer.from(a.buffer).equals(Buffer.from(b.buffer));

describe('runTsne', () => {
  it('separates three well-separated 10-D Gaussian clusters with trustworthiness T(10) > 0.9 and lowers the KL divergence', () => {
    const { X, labels, knn } = mixture(7);
    const result = runTsne(X, knn, { perplexity: 30 }, new Rng(1));
    const Y = result.embedding;
    expect(trustworthiness(X, Y, 10)).toBeGreaterThan(0.9);

    // Every point's 10 nearest embedded neighbours share its cluster.
    const emb = naiveKnn({ n: X.n, d: 2, data: Y.data }, 10);
    let agree = 0;
    for (let e = 0; e < emb.indices.length; e++) if (labels[emb.indices[e]] === labels[Math.floor(e / 10)]) agree++;
    expect(agree / emb.indices.length).toBeGreaterThan(0.99);

    const P = jointFromKnn(knn, 30);
    const initialKl = klDivergence(P, { n: X.n, data: pcaInit(X) });
    expect(result.klDivergence).toBeLessThan(initialKl);
    expect(result.klDivergence).toBeCloseTo(klDivergence(P, Y), 12);
  });

  it('returns identical bytes for the same seed and different layouts for different seeds with random init', () => {
    const { X, knn } = mixture(3, 200);
    const opts = { perplexity: 20, iterations: 300, init: 'random' as const };
    const a = runTsne(X, knn, opts, new Rng(42));
    const b = runTsne(X, knn, opts, new Rng(42));
    const c = runTsne(X, knn, opts, new Rng(43));
    expect(sameBytes(a.embedding.data, b.embedding.data)).toBe(true);
    expect(a.klDivergence).toBe(b.klDivergence);
    expect(sameBytes(a.embedding.data, c.embedding.data)).toBe(false);
  });

  it('gives the same layout for every seed with PCA init, which draws no random numbers', () => {
    const { X, knn } = mixture(3, 200);
    const opts = { perplexity: 20, iterations: 300 };
    const a = runTsne(X, knn, opts, new Rng(1));
    const b = runTsne(X, knn, opts, new Rng(2));
    expect(sameBytes(a.embedding.data, b.embedding.data)).toBe(true);
  });

  it('computes its own exact neighbours when none are passed, with the same result', () => {
    const { X, knn } = mixture(5, 150);
    const opts = { perplexity: 10, iterations: 120 };
    const given = runTsne(X, knn, opts, new Rng(0));
    const own = runTsne(X, null, opts, new Rng(0));
    expect(sameBytes(given.embedding.data, own.embedding.data)).toBe(true);
  });

  it('runs the exact mode and reports the KL of the dense P', () => {
    const { X, knn } = mixture(5, 120);
    const bh = runTsne(X, knn, { perplexity: 10, iterations: 400 }, new Rng(0));
    const exact = runTsne(X, knn, { perplexity: 10, iterations: 400, exact: true }, new Rng(0));
    expect(exact.klDivergence).toBeCloseTo(klDivergence(jointExact(X, 10), exact.embedding), 12);
    expect(sameBytes(bh.embedding.data, exact.embedding.data)).toBe(false);
    // Same data, same schedule: the two optimised objectives end close together.
    expect(Math.abs(exact.klDivergence - bh.klDivergence)).toBeLessThan(0.2);
  });

  it("reports the learning rate 'auto' = max(n / earlyExaggeration, 200) in the bhtsne/openTSNE scale", () => {
    const { X, knn } = mixture(5, 150);
    expect(runTsne(X, knn, { perplexity: 10, iterations: 1 }, new Rng(0)).learningRate).toBe(200);
    expect(runTsne(X, knn, { perplexity: 10, iterations: 1, earlyExaggeration: 0.5 }, new Rng(0)).learningRate).toBe(300);
    expect(runTsne(X, knn, { perplexity: 10, iterations: 1, learningRate: 75 }, new Rng(0)).learningRate).toBe(75);
  });

  it('reports progress after every iteration and the number of iterations run', () => {
    const { X, knn } = mixture(5, 100);
    const seen: number[] = [];
    const r = runTsne(X, knn, { perplexity: 10, iterations: 25, onProgress: (i, total) => { expect(total).toBe(25); seen.push(i); } }, new Rng(0));
    expect(seen).toEqual(Array.from({ length: 25 }, (_, i) => i + 1));
    expect(r.iterations).toBe(25);
  });

  it('does not modify its input', () => {
    const { X, knn } = mixture(5, 100);
    const copy = X.data.slice();
    const idx = knn.indices.slice();
    runTsne(X, knn, { perplexity: 10, iterations: 20 }, new Rng(0));
    expect(sameBytes(X.data, copy)).toBe(true);
    expect(Array.from(knn.indices)).toEqual(Array.from(idx));
  });

  it('rejects a perplexity of (n − 1)/3 or more with a RangeError that names the limit', () => {
    const { X } = mixture(5, 31);
    expect(() => runTsne(X, null, { perplexity: 10 }, new Rng(0))).toThrow(RangeError);
    expect(() => runTsne(X, null, { perplexity: 10 }, new Rng(0))).toThrow(/less than \(n − 1\)\/3 = 10 for n = 31/);
    expect(() => runTsne(X, null, { perplexity: 9.99, iterations: 1 }, new Rng(0))).not.toThrow();
  });

  it('rejects exact mode above 2000 points, short neighbour graphs and bad options', () => {
    const big = { n: 2001, d: 1, data: Float64Array.from({ length: 2001 }, (_, i) => i) };
    expect(() => runTsne(big, null, { perplexity: 30, exact: true }, new Rng(0))).toThrow(/n ≤ 2000/);
    const { X, knn } = mixture(5, 100);
    const short = { ...knn, k: 20, indices: knn.indices.slice(0, 100 * 20), distances: knn.distances.slice(0, 100 * 20) };
    expect(() => runTsne(X, short, { perplexity: 10 }, new Rng(0))).toThrow(/needs 31 neighbours/);
    expect(() => runTsne(X, knn, { perplexity: 10, theta: 2 }, new Rng(0))).toThrow(RangeError);
    expect(() => runTsne(X, knn, { perplexity: 10, iterations: 0 }, new Rng(0))).toThrow(RangeError);
    expect(() => runTsne(X, knn, { perplexity: 10, learningRate: -1 }, new Rng(0))).toThrow(RangeError);
    const bad = { ...X, data: X.data.slice() };
    bad.data[5] = NaN;
    expect(() => runTsne(bad, knn, { perplexity: 10 }, new Rng(0))).toThrow(/non-finite/);
  });
});

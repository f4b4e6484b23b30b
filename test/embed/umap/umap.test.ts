import { describe, expect, it } from 'vitest';
import { embeddingAsMatrix } from '../../../src/core/matrix.js';
import { Rng } from '../../../src/core/rng.js';
import { defaultEpochs, fuzzySimplicialSet, runUmap } from '../../../src/embed/umap/index.js';
import { runUmap as runUmapJs } from '../../../src/embed/umap/umapjs.js';
import { trustworthiness } from '../../../src/metrics/neighbourhood.js';
import { exactKnn } from '../../../src/neighbors/exact.js';
import { mixture, nearestCentroidAgreement, sameBytes } from './testdata.js';

describe('runUmap: behaviour against umap-js 1.4 on a 3-cluster mixture', () => {
  // 600 points, 3 unit Gaussians in 10-D with centres ~ N(0, 3²I).
  const { X, labels } = mixture(new Rng(2024), 600, 10, 3, 3);
  const knn = exactKnn(X, 14);
  const ours = runUmap(X, knn, { nNeighbors: 15, minDist: 0.1 }, new Rng(1));
  const theirs = runUmapJs(X, knn, { nNeighbors: 15, minDist: 0.1 }, new Rng(1));
  const tOurs = trustworthiness(X, embeddingAsMatrix(ours.embedding), 10);
  const tTheirs = trustworthiness(X, embeddingAsMatrix(theirs.embedding), 10);

  it('is at least as trustworthy (k = 10) as umap-js 1.4 given the same neighbours, to within 0.01', () => {
    expect(tOurs).toBeGreaterThan(tTheirs - 0.01);
    expect(tOurs).toBeGreaterThan(0.9);
  });

  it('keeps the three clusters apart: every point is nearest its own cluster centroid in the map', () => {
    expect(nearestCentroidAgreement(ours.embedding.data, labels, 3)).toBe(1);
  });

  it('runs umap-learn’s default 500 epochs from a spectral start for n ≤ 10 000', () => {
    expect(ours.epochs).toBe(500);
    expect(ours.init).toBe('spectral');
    expect(defaultEpochs(10_000)).toBe(500);
    expect(defaultEpochs(10_001)).toBe(200);
    for (const v of ours.embedding.data) expect(Number.isFinite(v)).toBe(true);
  });
});

describe('runUmap: determinism and seeds', () => {
  const { X } = mixture(new Rng(77), 300, 8, 4, 4);
  const knn = exactKnn(X, 14);
  const base = { nNeighbors: 12, minDist: 0.1, epochs: 120 };

  it.each(['spectral', 'pca', 'random'] as const)('gives the same bytes for the same seed (init %s)', (init) => {
    const a = runUmap(X, knn, { ...base, init }, new Rng(5));
    const b = runUmap(X, knn, { ...base, init }, new Rng(5));
    expect(sameBytes(a.embedding.data, b.embedding.data)).toBe(true);
    expect(a.init).toBe(init);
  });

  it('gives different maps for different seeds: random init moves the whole start, spectral init only its 1e-4 jitter, and the negative samples differ in both', () => {
    const r1 = runUmap(X, knn, { ...base, init: 'random' }, new Rng(1));
    const r2 = runUmap(X, knn, { ...base, init: 'random' }, new Rng(2));
    expect(sameBytes(r1.embedding.data, r2.embedding.data)).toBe(false);
    const s1 = runUmap(X, knn, { ...base, init: 'spectral' }, new Rng(1));
    const s2 = runUmap(X, knn, { ...base, init: 'spectral' }, new Rng(2));
    expect(sameBytes(s1.embedding.data, s2.embedding.data)).toBe(false);
  });

  it('gives the same bytes when the fuzzy graph is passed in, and reuses one graph across seeds and min_dist values', () => {
    const graph = fuzzySimplicialSet(knn, base.nNeighbors);
    for (const [seed, minDist] of [[3, 0.1], [4, 0.5]] as const) {
      const inside = runUmap(X, knn, { ...base, minDist }, new Rng(seed));
      const given = runUmap(X, knn, { ...base, minDist, graph }, new Rng(seed));
      expect(sameBytes(inside.embedding.data, given.embedding.data)).toBe(true);
    }
  });

  it('does not modify its inputs', () => {
    const graph = fuzzySimplicialSet(knn, base.nNeighbors);
    const copies = [X.data.slice(), knn.indices.slice(), knn.distances.slice(), graph.weights.slice()];
    runUmap(X, knn, { ...base, graph }, new Rng(1));
    expect(sameBytes(copies[0] as Float64Array, X.data)).toBe(true);
    expect(Array.from(copies[1])).toEqual(Array.from(knn.indices));
    expect(sameBytes(copies[2] as Float64Array, knn.distances)).toBe(true);
    expect(sameBytes(copies[3] as Float64Array, graph.weights)).toBe(true);
  });

  it('reports progress after the first epoch, every 25 epochs, and at the end', () => {
    const seen: Array<[number, number]> = [];
    runUmap(X, knn, { ...base, epochs: 60, onProgress: (e, t) => seen.push([e, t]) }, new Rng(1));
    expect(seen).toEqual([[1, 60], [26, 60], [51, 60], [60, 60]]);
  });

  it('spreads points more with a larger min_dist (the curve fitted by fitAB)', () => {
    const meanNnDistance = (y: Float64Array): number => {
      const g = exactKnn({ n: X.n, d: 2, data: y }, 1);
      return g.distances.reduce((s, v) => s + v, 0) / X.n;
    };
    const tight = runUmap(X, knn, { ...base, minDist: 0 }, new Rng(1));
    const loose = runUmap(X, knn, { ...base, minDist: 0.8 }, new Rng(1));
    expect(meanNnDistance(loose.embedding.data)).toBeGreaterThan(1.5 * meanNnDistance(tight.embedding.data));
  });

  it('rejects bad settings with RangeError', () => {
    expect(() => runUmap(X, knn, { ...base, nNeighbors: 1 }, new Rng(1))).toThrow(RangeError);
    expect(() => runUmap(X, knn, { ...base, nNeighbors: 16 }, new Rng(1))).toThrow(/neighbour graph/);
    expect(() => runUmap(X, knn, { ...base, minDist: 1.5 }, new Rng(1))).toThrow(/minDist/);
    expect(() => runUmap(X, knn, { ...base, epochs: 0 }, new Rng(1))).toThrow(/epochs/);
    expect(() => runUmap(X, knn, { ...base, init: 'tsne' as 'pca' }, new Rng(1))).toThrow(/init/);
    const other = fuzzySimplicialSet(exactKnn(mixture(new Rng(1), 50, 3, 2, 3).X, 5), 5);
    expect(() => runUmap(X, knn, { ...base, graph: other }, new Rng(1))).toThrow(/graph/);
  });
});

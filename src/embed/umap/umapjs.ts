/**
 * UMAP (McInnes, Healy & Melville 2018) through umap-js 1.4, made
 * reproducible: a seeded generator replaces its default random source, and
 * the exact neighbour graph computed once per dataset is handed in, so the
 * library never runs its own randomised neighbour search.
 */
import { UMAP } from 'umap-js';
import { assert } from '../../core/errors.js';
import type { Rng } from '../../core/rng.js';
import type { Embedding, KnnGraph, Matrix } from '../../core/types.js';

export interface UmapOptions {
  /** Neighbourhood size including the point itself, as in umap-learn; ≥ 2, < n. Default 15. */
  nNeighbors: number;
  /** Minimum distance between embedded points, [0, 1]. Default 0.1. */
  minDist: number;
  /** Optimisation epochs; default: umap-js's rule by n (500 / 400 / 300 / 200). */
  epochs?: number;
  onProgress?: (epoch: number, total: number) => void;
}

export interface UmapResult {
  embedding: Embedding;
  epochs: number;
}

/**
 * Embed X (n × d) in 2-D. `knn` must hold at least nNeighbors − 1 neighbours
 * per point (self excluded, sorted), as produced by the neighbours stage.
 */
export function runUmap(X: Matrix, knn: KnnGraph, opts: UmapOptions, rng: Rng): UmapResult {
  const { n } = X;
  const kk = opts.nNeighbors;
  if (!(kk >= 2 && kk < n)) throw new RangeError(`n_neighbors must be in [2, n − 1] = [2, ${n - 1}], got ${kk}`);
  assert(knn.n === n && knn.k >= kk - 1, `neighbour graph has ${knn.k} columns, UMAP needs ${kk - 1}`);

  // umap-js expects each row to start with the point itself at distance 0.
  const indices: number[][] = new Array(n);
  const distances: number[][] = new Array(n);
  for (let i = 0; i < n; i++) {
    const idx = new Array<number>(kk);
    const dst = new Array<number>(kk);
    idx[0] = i;
    dst[0] = 0;
    for (let j = 1; j < kk; j++) {
      idx[j] = knn.indices[i * knn.k + j - 1];
      dst[j] = knn.distances[i * knn.k + j - 1];
    }
    indices[i] = idx;
    distances[i] = dst;
  }
  const rows: number[][] = new Array(n);
  for (let i = 0; i < n; i++) rows[i] = Array.from(X.data.subarray(i * X.d, (i + 1) * X.d));

  const umap = new UMAP({
    nComponents: 2,
    nNeighbors: kk,
    minDist: opts.minDist,
    spread: 1,
    nEpochs: opts.epochs,
    random: rng.asFunction(),
  });
  umap.setPrecomputedKNN(indices, distances);
  const total = umap.initializeFit(rows);
  for (let e = 0; e < total; e++) {
    umap.step();
    if (opts.onProgress && (e % 25 === 0 || e === total - 1)) opts.onProgress(e + 1, total);
  }
  const out = umap.getEmbedding();
  const data = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    data[2 * i] = out[i][0];
    data[2 * i + 1] = out[i][1];
  }
  return { embedding: { n, data }, epochs: total };
}

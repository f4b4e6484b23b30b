/**
 * UMAP (McInnes, Healy & Melville, "UMAP: Uniform Manifold Approximation and
 * Projection for Dimension Reduction", arXiv 1802.03426, 2018) on typed
 * arrays, following umap-learn's defaults: fuzzy simplicial set from the
 * given exact neighbours, spectral initialisation, (a, b) from a converged
 * curve fit, and its SGD schedule, single-threaded and seeded.
 */
import type { Rng } from '../../core/rng.js';
import type { Embedding, KnnGraph, Matrix } from '../../core/types.js';
import { pcaLayout } from '../init/pca.js';
import { randomLayout } from '../init/random.js';
import { noisyScaleInPlace, rescaleToBox } from '../init/scale.js';
import { spectralLayout } from '../init/spectral.js';
import { fitAB } from './curve.js';
import { fuzzySimplicialSet, maxWeight, pruneGraph, type FuzzyGraph } from './graph.js';
import { optimizeLayoutInPlace } from './sgd.js';

export type UmapInit = 'spectral' | 'pca' | 'random';

export interface UmapOptions {
  /** umap-learn's n_neighbors: neighbourhood size counting the point itself; integer in [2, n − 1]. Default in the method table 15. */
  nNeighbors: number;
  /** Minimum distance between embedded points, [0, 1] (spread is 1). Default in the method table 0.1. */
  minDist: number;
  /** Starting layout. Default 'spectral' (umap-learn's default). */
  init?: UmapInit;
  /** Optimisation epochs; default umap-learn's rule: 500 when n ≤ 10 000, else 200. */
  epochs?: number;
  /** Negative samples per positive sample. Default 5 (umap-learn). */
  negativeSampleRate?: number;
  /** Progress callback: (epochs done, total). */
  onProgress?: (epoch: number, total: number) => void;
  /**
   * The fuzzy graph of `knn` for this nNeighbors, from `fuzzySimplicialSet`,
   * to reuse across seeds and min_dist values; built here when absent. The
   * result is identical either way.
   */
  graph?: FuzzyGraph;
}

export interface UmapResult {
  embedding: Embedding;
  /** Epochs run. */
  epochs: number;
  /** Starting layout used. */
  init: UmapInit;
}

/** umap-learn's default epoch count: 500 for up to 10 000 points, 200 above. */
export function defaultEpochs(n: number): number {
  return n <= 10_000 ? 500 : 200;
}

/**
 * Embed X (n × d) in 2-D.
 *
 * Steps: fuzzy graph (or `opts.graph`); drop edges with w < max(w)/epochs
 * (umap-learn uses the default epoch count for this threshold when epochs ≤ 10);
 * starting layout on the pruned graph — spectral (`spectralLayout`, component
 * centres from X), PCA (`pcaLayout` plus N(0, 1e-4²) jitter) or uniform random
 * in [−10, 10] — with each axis then mapped to [0, 10]; (a, b) = `fitAB(minDist, 1)`;
 * SGD (`optimizeLayoutInPlace`) with learning rate 1, repulsion 1 and
 * `negativeSampleRate` negatives.
 *
 * Randomness, all from `rng` in this order: the start (spectral: the 1e-4
 * jitter and positions of components under four points; PCA: the jitter;
 * random: the whole layout), then the negative samples. A spectral or PCA
 * start is therefore the same for every seed up to the jitter, and runs with
 * different seeds differ through the jitter and the negative samples.
 *
 * @param X n × d data (used for PCA init and to place disconnected components).
 * @param knn neighbours of X, self excluded, sorted, at least nNeighbors − 1 columns.
 * @returns the n × 2 embedding, the epochs run and the start used.
 */
export function runUmap(X: Matrix, knn: KnnGraph, opts: UmapOptions, rng: Rng): UmapResult {
  const { n } = X;
  const kk = opts.nNeighbors;
  if (!(Number.isInteger(kk) && kk >= 2 && kk < n)) {
    throw new RangeError(`nNeighbors must be an integer in [2, n − 1] = [2, ${n - 1}], got ${kk}`);
  }
  if (knn.n !== n || knn.k < kk - 1) {
    throw new RangeError(`neighbour graph has ${knn.n} rows × ${knn.k} columns; UMAP needs ${n} × ${kk - 1}`);
  }
  if (!(opts.minDist >= 0 && opts.minDist <= 1)) throw new RangeError(`minDist must be in [0, 1], got ${opts.minDist}`);
  const epochs = opts.epochs ?? defaultEpochs(n);
  if (!(Number.isInteger(epochs) && epochs >= 1)) throw new RangeError(`epochs must be a positive integer, got ${epochs}`);
  const rate = opts.negativeSampleRate ?? 5;
  if (!(rate >= 0 && Number.isFinite(rate))) throw new RangeError(`negativeSampleRate must be ≥ 0, got ${rate}`);
  const init: UmapInit = opts.init ?? 'spectral';

  let graph: FuzzyGraph;
  if (opts.graph) {
    if (opts.graph.n !== n) throw new RangeError(`graph has ${opts.graph.n} vertices, data have ${n} rows`);
    graph = opts.graph;
  } else {
    graph = fuzzySimplicialSet(knn, kk);
  }
  const pruneEpochs = epochs > 10 ? epochs : defaultEpochs(n);
  const pruned = pruneGraph(graph, maxWeight(graph) / pruneEpochs);

  let start: Float64Array;
  switch (init) {
    case 'spectral':
      start = spectralLayout(pruned, rng, { X });
      break;
    case 'pca':
      start = noisyScaleInPlace(pcaLayout(X), rng);
      break;
    case 'random':
      start = randomLayout(n, rng);
      break;
    default:
      throw new RangeError(`init must be 'spectral', 'pca' or 'random', got '${String(init)}'`);
  }
  const y = rescaleToBox(start, 10);
  const { a, b } = fitAB(opts.minDist, 1);
  optimizeLayoutInPlace(y, pruned, { a, b, epochs, negativeSampleRate: rate, onProgress: opts.onProgress }, rng);
  return { embedding: { n, data: y }, epochs, init };
}

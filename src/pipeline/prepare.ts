/**
 * Load → preprocess → neighbours: everything computed once per dataset and
 * shared by all runs.
 */
import { InputError } from '../core/errors.js';
import { Rng, deriveSeed, sampleIndices } from '../core/rng.js';
import { RANK_EXACT_LIMIT, RANK_SAMPLE_ROWS } from '../metrics/neighbourhood.js';
import type { Dataset, KnnGraph, Matrix } from '../core/types.js';
import type { DataOptions } from '../config/sweep.js';
import { DEFAULTS } from '../config/sweep.js';
import { readTable } from '../io/csv.js';
import { exactKnn, knnOf } from '../neighbors/exact.js';
import { randomizedPca } from '../preprocess/pca.js';
import { zScore } from '../preprocess/scale.js';

export interface Prepared {
  dataset: Dataset;
  warnings: string[];
  /** Data as the methods see it (after scaling and PCA). */
  X: Matrix;
  /** Data the scores are measured against: after scaling, before PCA. */
  reference: Matrix;
  /** PCA components kept, or null when PCA was not applied. */
  pcaDims: number | null;
  explainedVarianceRatio: number[];
}

/** Fixed seed for data-level randomness (randomized SVD), independent of the embedding seeds. */
export const DATA_SEED = 20_240_917;

export async function loadData(path: string, opts: DataOptions): Promise<{ dataset: Dataset; warnings: string[] }> {
  return readTable(path, { delimiter: opts.delimiter, label: opts.label, id: opts.id, missing: opts.missing });
}

export function preprocess(dataset: Dataset, warnings: string[], opts: DataOptions, threads = 1): Prepared {
  let X = dataset.matrix;
  if (opts.scale) X = zScore(X);
  const reference = X;
  let dims: number | null = null;
  if (opts.pcaDims === 'auto') dims = X.d > DEFAULTS.pcaDimsAuto ? DEFAULTS.pcaDimsAuto : null;
  else if (opts.pcaDims !== null) {
    if (opts.pcaDims > X.d) {
      throw new InputError('data.pca-dims', `--pca-dims ${opts.pcaDims} is more than the ${X.d} feature columns of ${dataset.path}; use at most ${X.d}, or 'none'`);
    }
    dims = opts.pcaDims;
  }
  if (dims !== null && dims > Math.min(X.n, X.d)) dims = Math.min(X.n, X.d);
  let evr: number[] = [];
  if (dims !== null) {
    const pca = randomizedPca(X, dims, new Rng(deriveSeed(DATA_SEED, 'pca')), { threads });
    X = pca.scores;
    evr = Array.from(pca.explainedVarianceRatio);
  }
  return { dataset, warnings, X, reference, pcaDims: dims, explainedVarianceRatio: evr };
}

/**
 * The dataset's neighbour graph: exact up to 20,000 rows, NN-descent above
 * with a data-level seed that stays fixed across embedding seeds, so
 * neighbour noise never masquerades as embedding instability.
 */
export function neighbours(X: Matrix, k: number, threads = 1): KnnGraph {
  return knnOf(X, k, { rng: new Rng(deriveSeed(DATA_SEED, 'knn')), threads });
}

/**
 * Neighbour graph for scoring: always exact, whatever n. Trustworthiness and
 * continuity read ranks off these lists, and an approximate list (a missed
 * true neighbour shifts every later rank) would bias them; the embedding
 * methods, which only need good neighbours, use `neighbours`.
 */
export function scoringNeighbours(X: Matrix, k: number, threads = 1): KnnGraph {
  return exactKnn(X, k, { threads });
}

/**
 * Rows trustworthiness and continuity average over for n rows: all of them
 * (undefined) up to RANK_EXACT_LIMIT, else RANK_SAMPLE_ROWS drawn uniformly
 * with a data-level seed, the same for every run of that size. Each sampled
 * row's intruder ranks are exact among all n rows; the full scores cost about
 * n² distance evaluations, which at 50,000 rows took a minute per run.
 */
export function rankRowsFor(n: number): Int32Array | undefined {
  return n <= RANK_EXACT_LIMIT ? undefined : rankSample(n);
}

/** The seeded sample of min(n, RANK_SAMPLE_ROWS) rows `rankRowsFor` uses above the limit. */
export function rankSample(n: number): Int32Array {
  return sampleIndices(n, Math.min(n, RANK_SAMPLE_ROWS), new Rng(deriveSeed(DATA_SEED, 'rank-rows', n)));
}

/**
 * Seeded t-SNE (van der Maaten & Hinton 2008, JMLR 9:2579) with Barnes-Hut
 * repulsion (van der Maaten 2014, JMLR 15:3221) or an exact O(n²) gradient,
 * on typed arrays. Defaults follow scikit-learn 1.2.1 `TSNE` (perplexity
 * from the caller, 1000 iterations of which 250 with early exaggeration 12,
 * θ = 0.5, PCA initialisation, learning rate max(n / 12, 200) in the
 * bhtsne/openTSNE scale; see optimize.ts for the learning-rate convention).
 * With `threads` > 1 the per-point work runs on worker threads as well
 * (team.ts), with byte-identical results.
 */
import type { Rng } from '../../core/rng.js';
import type { Embedding, KnnGraph, Matrix } from '../../core/types.js';
import { InternalError } from '../../core/errors.js';
import { exactKnn } from '../../neighbors/exact.js';
import { jointExactWith, jointFromKnnWith, neighboursForPerplexity } from './affinities.js';
import type { SparseAffinities } from './affinities.js';
import { pcaInit, randomInit, spectralInit } from './init.js';
import { klDivergenceWith } from './kl.js';
import { optimizeWith } from './optimize.js';
import { Team } from './team.js';

export interface TsneOptions {
  /** Effective number of neighbours; must be ≥ 1 and < (n − 1) / 3. Callers default to 30. */
  perplexity: number;
  /** Total iterations including the exaggeration phase; default 1000. */
  iterations?: number;
  /** Factor on P during the first phase; default 12. */
  earlyExaggeration?: number;
  /** Length of the exaggeration phase; default 250. */
  exaggerationIterations?: number;
  /**
   * Step size in the bhtsne/openTSNE scale (gradient without the factor 4;
   * scikit-learn's value is this divided by 4). Default 'auto' =
   * max(n / earlyExaggeration, 200).
   */
  learningRate?: number | 'auto';
  /**
   * 'pca' (default): first two principal components of X scaled so the
   * first has standard deviation 1e-4 (seed-independent);
   * 'random': 1e-4 × N(0, 1) coordinates from `rng`;
   * 'spectral': Laplacian eigenmaps of P scaled the same way (seed-independent
   * except for components under four points; see `spectralInit`).
   */
  init?: TsneInit;
  /** Barnes-Hut opening angle in [0, 1]; default 0.5. */
  theta?: number;
  /** Exact O(n²) gradient with the dense P over all pairs; allowed for n ≤ 2000; default false. */
  exact?: boolean;
  /**
   * Threads to use, the calling thread included (default 1). With more than
   * one, worker threads share the perplexity calibration, the Barnes-Hut
   * gradient and the final KL divergence; the result is byte-for-byte the
   * same as with one thread. Below `PARALLEL_MIN_POINTS` points, and for the
   * gradient in exact mode, one thread is used whatever is asked.
   */
  threads?: number;
  /** Called after every iteration with (iterations done, total). */
  onProgress?: (iteration: number, total: number) => void;
}

export type TsneInit = 'pca' | 'random' | 'spectral';
export const TSNE_INITS: readonly TsneInit[] = ['pca', 'random', 'spectral'];

export interface TsneResult {
  embedding: Embedding;
  /**
   * Exact KL(P‖Q) in nats of the returned embedding, with the P used for the
   * optimisation (sparse kNN P in Barnes-Hut mode, dense P in exact mode) and
   * Q over all pairs.
   */
  klDivergence: number;
  /** Iterations run (always the requested number: there is no early stop). */
  iterations: number;
  /** Learning rate used, in the bhtsne/openTSNE scale (scikit-learn's × 4). */
  learningRate: number;
}

/** Largest n for which `exact: true` is accepted (memory 12·n² bytes for P). */
export const EXACT_MAX_POINTS = 2000;

/**
 * Smallest n for which `threads` > 1 starts worker threads. Below it the
 * start-up of a worker (tens of milliseconds) and the per-iteration
 * hand-over cost about what they save: on a 2-core machine, 1000
 * Barnes-Hut iterations took 0.31 s with one thread and 0.32 s with two at
 * n = 500, 0.67 s and 0.49 s at n = 1000, 1.70 s and 1.08 s at n = 2000.
 */
export const PARALLEL_MIN_POINTS = 1000;

/** Upper limit of `threads`. */
export const MAX_THREADS = 64;

/**
 * Embed the rows of X in 2-D.
 *
 * @param X n × d data (usually already reduced by PCA); not modified.
 * @param knn exact neighbours of X (self excluded, sorted, Euclidean) with at
 *   least min(n − 1, ⌊3·perplexity + 1⌋) columns, of which only that many are
 *   used; null to compute them here with the exact search of
 *   src/neighbors/exact.ts. Ignored when `exact`.
 * @param rng used only by the random initialisation (and by the spectral one
 *   for components of fewer than four points).
 * @throws RangeError for options out of range, including
 *   perplexity ≥ (n − 1)/3 and `exact` with n > 2000.
 */
export function runTsne(X: Matrix, knn: KnnGraph | null, opts: TsneOptions, rng: Rng): TsneResult {
  const n = X.n;
  const perplexity = opts.perplexity;
  const iterations = opts.iterations ?? 1000;
  const earlyExaggeration = opts.earlyExaggeration ?? 12;
  const exaggerationIterations = opts.exaggerationIterations ?? 250;
  const theta = opts.theta ?? 0.5;
  const exact = opts.exact ?? false;
  const init = opts.init ?? 'pca';

  if (X.data.length !== n * X.d || X.d < 1) throw new RangeError(`X must be n × d with d ≥ 1; received ${n} × ${X.d} with ${X.data.length} values`);
  for (let e = 0; e < X.data.length; e++) {
    if (!Number.isFinite(X.data[e])) throw new RangeError(`X contains a non-finite value at row ${Math.floor(e / X.d)}`);
  }
  const limit = (n - 1) / 3;
  if (!Number.isFinite(perplexity) || perplexity < 1 || perplexity >= limit) {
    throw new RangeError(
      `perplexity must be at least 1 and less than (n − 1)/3 = ${formatLimit(limit)} for n = ${n} points; received ${perplexity}`,
    );
  }
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError(`iterations must be a positive integer; received ${iterations}`);
  if (!Number.isInteger(exaggerationIterations) || exaggerationIterations < 0) {
    throw new RangeError(`exaggerationIterations must be a non-negative integer; received ${exaggerationIterations}`);
  }
  if (!Number.isFinite(earlyExaggeration) || earlyExaggeration <= 0) {
    throw new RangeError(`earlyExaggeration must be a positive number; received ${earlyExaggeration}`);
  }
  if (!Number.isFinite(theta) || theta < 0 || theta > 1) throw new RangeError(`theta must be in [0, 1]; received ${theta}`);
  if (!TSNE_INITS.includes(init)) throw new RangeError(`init must be 'pca', 'random' or 'spectral'; received ${String(init)}`);
  const learningRate = opts.learningRate === undefined || opts.learningRate === 'auto'
    ? Math.max(n / earlyExaggeration, 200)
    : opts.learningRate;
  if (!Number.isFinite(learningRate) || learningRate <= 0) {
    throw new RangeError(`learningRate must be a positive number or 'auto'; received ${String(opts.learningRate)}`);
  }
  if (exact && n > EXACT_MAX_POINTS) {
    throw new RangeError(`exact t-SNE is limited to n ≤ ${EXACT_MAX_POINTS} points; received n = ${n}`);
  }
  const threads = opts.threads ?? 1;
  if (!Number.isInteger(threads) || threads < 1 || threads > MAX_THREADS) {
    throw new RangeError(`threads must be an integer from 1 to ${MAX_THREADS}; received ${threads}`);
  }

  const k = neighboursForPerplexity(perplexity, n);
  if (!exact && knn !== null) {
    if (knn.n !== n) throw new RangeError(`the neighbour graph has ${knn.n} points but X has ${n}`);
    if (knn.k < k) throw new RangeError(`perplexity ${perplexity} needs ${k} neighbours per point; the neighbour graph has ${knn.k}`);
  }

  // Workers start now and join in whenever they are ready.
  const team = new Team(n >= PARALLEL_MIN_POINTS ? threads : 1);
  try {
    const graph = exact ? null : knn ?? exactKnn(X, k);
    const y0pre = init === 'pca' ? pcaInit(X) : init === 'random' ? randomInit(n, rng) : null;
    const P: SparseAffinities = graph === null
      ? jointExactWith(X, perplexity, team)
      : jointFromKnnWith(graph, perplexity, k, team);
    const y0 = y0pre ?? spectralInit(P, X, rng);
    const y = optimizeWith(P, y0, {
      iterations,
      exaggerationIterations,
      earlyExaggeration,
      learningRate,
      theta,
      exact,
      onProgress: opts.onProgress,
    }, team);
    for (let e = 0; e < y.length; e++) {
      if (!Number.isFinite(y[e])) throw new InternalError(`t-SNE produced a non-finite coordinate (point ${e >> 1})`);
    }
    const kl = klDivergenceWith(P, { n, data: y }, team);
    // A plain copy: the working array may live in shared memory.
    const embedding: Embedding = { n, data: y.slice() };
    return { embedding, klDivergence: kl, iterations, learningRate };
  } finally {
    team.close();
  }
}

function formatLimit(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toFixed(3).replace(/0+$/, '');
}

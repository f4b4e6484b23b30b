/**
 * Exact k-nearest-neighbour graphs by blocked brute force, and `knnOf`, the
 * entry point that picks exact or approximate search by size.
 *
 * Tie rule: neighbours are ordered by (squared distance, index) ascending, so
 * of two points at the same distance the lower index comes first and enters
 * the k-set first. Squared distances are summed term by term as Σ_t (a_t − b_t)²
 * in column order — the same arithmetic as `sqDist` in src/core/matrix.ts — so
 * equal distances stay exactly equal (the ‖a‖² + ‖b‖² − 2a·b shortcut would
 * break such ties by rounding).
 */
import { Rng } from '../core/rng.js';
import type { KnnGraph, Matrix } from '../core/types.js';
import { runTasks, sharedFloat64, sharedInt32, startWorkers, toSharedFloat64 } from '../preprocess/parallel.js';
import type { ThreadTask } from '../preprocess/tasks.js';
import { BLOCK, checkKnnInput, mergeRows, scanBlocks, splitBlocks } from './exact-tiles.js';
import { gridKnn2d } from './grid2d.js';
import { nnDescent } from './nndescent.js';

/** From this many rows, 2-D inputs go to the grid search of ./grid2d.ts (same result, about O(n·k)). */
export const GRID_MIN_ROWS = 500;

/** Below this many rows a multi-threaded exact search runs on one thread (start-up would cost more than it saves). */
const PARALLEL_MIN_ROWS = 2_000;

export interface ExactKnnOptions {
  /**
   * Threads to use, counting the calling thread (default 1). With more than
   * one, the block pairs are split into contiguous ranges of equal work, each
   * thread keeps its own heaps, and the heaps are merged; the result is the
   * same bytes as with one thread. Inputs under 2 000 rows use one thread.
   */
  threads?: number;
}

/**
 * The k nearest neighbours of every row of `m` (n × d) among the other rows,
 * self excluded, in Euclidean distance, sorted by (distance, index) ascending.
 * Returns n × k indices (Int32Array) and the matching distances (not squared).
 * Requires 1 ≤ k ≤ n − 1 (RangeError otherwise) and finite entries.
 *
 * Two-column inputs of at least `GRID_MIN_ROWS` rows (maps) go to the grid
 * search of ./grid2d.ts, which returns the same bytes in about O(n·k) time.
 *
 * Cost: n²·d/2 subtract-multiply-adds (each pair once, offered to both rows),
 * memory O(n·k) per thread. Rows are processed in blocks of 64 against blocks
 * of 64, with a 4 × 4 register tile in the distance loop; each row keeps its
 * best k in a bounded max-heap whose top (the current k-th distance) rejects
 * most candidates with one comparison; the heaps are sorted at the end.
 */
export function exactKnn(m: Matrix, k: number, opts: ExactKnnOptions = {}): KnnGraph {
  const { n, d, data } = m;
  checkKnnInput(m, k);
  const threads = checkThreads(opts.threads);
  if (d === 2 && n >= GRID_MIN_ROWS) return gridKnn2d(m, k);
  const blocks = Math.ceil(n / BLOCK);
  const parts = n >= PARALLEL_MIN_ROWS ? Math.min(threads, blocks) : 1;

  if (parts === 1) {
    const idx = new Int32Array(n * k);
    const dist = new Float64Array(n * k); // squared while searching
    const count = new Int32Array(n);
    const worst = new Float64Array(n).fill(Number.POSITIVE_INFINITY);
    scanBlocks(data, n, d, k, 0, blocks, idx, dist, count, worst);
    const outIdx = new Int32Array(n * k);
    const outDist = new Float64Array(n * k);
    mergeRows(0, n, k, [idx], [dist], [count], outIdx, outDist);
    return { n, k, indices: outIdx, distances: outDist };
  }

  startWorkers(parts - 1);
  const shared = toSharedFloat64(data);
  const bounds = splitBlocks(blocks, parts);
  const idxs: Int32Array[] = [];
  const dists: Float64Array[] = [];
  const counts: Int32Array[] = [];
  const scans: ThreadTask[] = [];
  for (let p = 0; p < parts; p++) {
    const idx = sharedInt32(n * k);
    const dist = sharedFloat64(n * k);
    const count = sharedInt32(n);
    const worst = sharedFloat64(n).fill(Number.POSITIVE_INFINITY);
    idxs.push(idx);
    dists.push(dist);
    counts.push(count);
    scans.push({ kind: 'knn-scan', data: shared, n, d, k, aFrom: bounds[p], aTo: bounds[p + 1], idx, dist, count, worst });
  }
  runTasks(scans);
  const outIdx = sharedInt32(n * k);
  const outDist = sharedFloat64(n * k);
  const merges: ThreadTask[] = [];
  for (let p = 0; p < parts; p++) {
    const r0 = Math.floor((n * p) / parts);
    const r1 = Math.floor((n * (p + 1)) / parts);
    merges.push({ kind: 'knn-merge', r0, r1, k, idxs, dists, counts, outIdx, outDist });
  }
  runTasks(merges);
  // Plain (non-shared) copies, like the single-thread result.
  return { n, k, indices: outIdx.slice(), distances: outDist.slice() };
}

/** Above this many rows `knnOf` switches from exact search to NN-descent (unless told otherwise). */
export const EXACT_KNN_LIMIT = 20_000;

/**
 * Seed (0x5eed4e4e = 1 592 610 382) of the random-projection forest and
 * NN-descent sampling when `knnOf` searches approximately and the caller
 * passes no generator.
 */
export const DEFAULT_KNN_SEED = 0x5eed_4e4e;

export interface KnnOfOptions {
  /**
   * Generator for the approximate search (random-projection trees and
   * NN-descent sampling). Pass one seeded from the data, not from the
   * embedding seed, so that a seed sweep does not mix neighbour-search noise
   * into embedding stability. Default: `new Rng(DEFAULT_KNN_SEED)`. Unused by
   * the exact search.
   */
  rng?: Rng;
  /** Largest n searched exactly (default `EXACT_KNN_LIMIT` = 20 000). */
  exactLimit?: number;
  /** Threads for the exact search, counting the calling thread (default 1); the approximate search uses one. */
  threads?: number;
}

/**
 * The k nearest neighbours of every row of `m` (n × d), self excluded, sorted
 * by (distance, index), in the `KnnGraph` form of `exactKnn`.
 *
 * n ≤ exactLimit (default 20 000): `exactKnn` on `threads` threads, exact
 * and seed-free (the generator is not touched).
 * n > exactLimit: `nnDescent` (NN-descent, Dong, Charikar & Li 2011, started
 * from a random-projection forest) with default settings, on one thread:
 * approximate — recall@15 between 0.96 and 0.99 against the exact graph at
 * n = 10 000–50 000, d = 50 on the data of bench/pca-knn.ts — and the same
 * bytes for the same generator state.
 * Callers that need exactness at any size should call `exactKnn` directly.
 */
export function knnOf(m: Matrix, k: number, opts: KnnOfOptions = {}): KnnGraph {
  const limit = opts.exactLimit ?? EXACT_KNN_LIMIT;
  if (!(limit >= 0)) throw new RangeError(`exactLimit must be a non-negative number, got ${limit}`);
  const threads = checkThreads(opts.threads);
  if (m.n <= limit) return exactKnn(m, k, { threads });
  return nnDescent(m, k, opts.rng ?? new Rng(DEFAULT_KNN_SEED));
}

/**
 * The first k neighbours of each row of `g` (a copy), 1 ≤ k ≤ g.k. Because
 * rows are sorted by (distance, index), this equals a fresh k-NN search with
 * the smaller k.
 */
export function knnPrefix(g: KnnGraph, k: number): KnnGraph {
  if (!Number.isInteger(k) || k < 1 || k > g.k) {
    throw new RangeError(`prefix k must be an integer in 1..${g.k}, got ${k}`);
  }
  const indices = new Int32Array(g.n * k);
  const distances = new Float64Array(g.n * k);
  for (let i = 0; i < g.n; i++) {
    indices.set(g.indices.subarray(i * g.k, i * g.k + k), i * k);
    distances.set(g.distances.subarray(i * g.k, i * g.k + k), i * k);
  }
  return { n: g.n, k, indices, distances };
}

function checkThreads(t: number | undefined): number {
  const threads = t ?? 1;
  if (!Number.isInteger(threads) || threads < 1) throw new RangeError(`threads must be a positive integer, got ${t}`);
  return threads;
}

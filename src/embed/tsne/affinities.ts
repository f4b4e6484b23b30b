/**
 * Input-space affinities for t-SNE (van der Maaten & Hinton 2008, JMLR 9:2579;
 * sparse version: van der Maaten 2014, JMLR 15:3221).
 *
 * Each point i gets a Gaussian precision β_i (β = 1/(2σ²), multiplying
 * squared Euclidean distances) such that the Shannon entropy of its
 * conditional distribution p_{j|i} ∝ exp(−β_i d²_ij) equals log(perplexity)
 * in nats. The search follows scikit-learn 1.2.1 `_binary_search_perplexity`
 * (β starts at 1; double or halve until the root is bracketed, then bisect;
 * at most 100 steps; stop when |H − log perplexity| ≤ 1e-5), but runs in
 * float64 throughout (scikit-learn casts the distances to float32 first).
 *
 * The joint P is (P_cond + P_condᵀ) divided by its total (which is 2n, as
 * every conditional row sums to 1), stored as CSR.
 */
import type { KnnGraph, Matrix } from '../../core/types.js';
import { C_M, C_TARGET, JOB_CALIBRATE, R_N, R_ROWS_PER_ITEM, rowItems } from './jobs.js';
import { Team } from './team.js';

/**
 * Symmetric joint affinities in compressed sparse row form. Row i holds the
 * columns `indices[indptr[i] .. indptr[i+1])` in ascending order and their
 * values; the diagonal is never stored. Values sum to 1.
 */
export interface SparseAffinities {
  readonly n: number;
  /** Length n + 1. */
  readonly indptr: Int32Array;
  /** Column of each stored entry, ascending within a row. */
  readonly indices: Int32Array;
  /** p_ij of each stored entry. */
  readonly values: Float64Array;
}

export { PERPLEXITY_MAX_STEPS, PERPLEXITY_TOLERANCE } from './kernels.js';
/** Float64 machine epsilon: floor of the exact joint P (as scikit-learn 1.2.1 exact t-SNE). */
export const MACHINE_EPSILON = 2.220446049250313e-16;

/**
 * Number of neighbours the sparse P uses: min(n − 1, ⌊3·perplexity + 1⌋)
 * (van der Maaten 2014, §4.1; scikit-learn 1.2.1 uses the same count).
 */
export function neighboursForPerplexity(perplexity: number, n: number): number {
  return Math.min(n - 1, Math.floor(3 * perplexity + 1));
}

/** Per-row precisions and conditional probabilities. */
export interface Calibration {
  /** β_i per row (length n), in 1 / (squared distance units). */
  readonly beta: Float64Array;
  /** p_{j|i} for the m candidates of each row, n × m row-major; every row sums to 1. */
  readonly conditional: Float64Array;
}

/**
 * Find β_i and p_{j|i} for every row of an n × m matrix of squared distances
 * (row i = squared distances from point i to its m candidate neighbours, self
 * not included). Pure: `sqDist` is not modified.
 *
 * @param sqDist n × m squared Euclidean distances, row-major.
 * @param perplexity target perplexity, 0 < perplexity ≤ m.
 */
export function calibrate(sqDist: Float64Array, n: number, m: number, perplexity: number): Calibration {
  const team = new Team(1);
  try {
    return calibrateWith(sqDist, n, m, perplexity, team);
  } finally {
    team.close();
  }
}

/**
 * `calibrate` with the rows spread over the threads of `team` (same bytes
 * for any number of threads). `sqDist` must come from `team.arrays`; the
 * results are allocated there.
 */
export function calibrateWith(sqDist: Float64Array, n: number, m: number, perplexity: number, team: Team): Calibration {
  if (!(perplexity > 0) || !Number.isFinite(perplexity)) {
    throw new RangeError(`perplexity must be a positive number; received ${perplexity}`);
  }
  if (m < 1 || perplexity > m) {
    throw new RangeError(`perplexity must not exceed the number of candidate neighbours (${m}); received ${perplexity}`);
  }
  if (sqDist.length !== n * m) throw new RangeError(`sqDist has ${sqDist.length} values, expected n × m = ${n * m}`);
  const beta = team.arrays.f64(n);
  const conditional = team.arrays.f64(n * m);
  const rows = Math.max(1, Math.floor(CALIBRATE_ITEM_ENTRIES / m));
  team.share({ sq: sqDist, cond: conditional, beta });
  team.params[R_N] = n;
  team.params[R_ROWS_PER_ITEM] = rows;
  team.params[C_M] = m;
  team.params[C_TARGET] = Math.log(perplexity);
  team.run(JOB_CALIBRATE, rowItems(n, rows));
  team.release(['sq', 'cond', 'beta']);
  return { beta, conditional };
}

/** Distances per work item of the calibration (rows of m distances are grouped up to about this many). */
const CALIBRATE_ITEM_ENTRIES = 4096;

/**
 * Sparse joint P from exact nearest neighbours (Barnes-Hut t-SNE input side).
 * Uses the first `k` columns of `knn` (default min(n − 1, ⌊3·perplexity + 1⌋));
 * P is the union of both neighbour sets, p_ij = (p_{j|i} + p_{i|j}) / Σ.
 *
 * @param knn exact neighbours, self excluded, sorted by distance (Euclidean, not squared).
 * @param perplexity 0 < perplexity ≤ k.
 * @returns CSR with between k and 2k entries per row.
 */
export function jointFromKnn(knn: KnnGraph, perplexity: number, k = neighboursForPerplexity(perplexity, knn.n)): SparseAffinities {
  const team = new Team(1);
  try {
    return jointFromKnnWith(knn, perplexity, k, team);
  } finally {
    team.close();
  }
}

/** `jointFromKnn` with the calibration on the threads of `team`; P is allocated in `team.arrays`. */
export function jointFromKnnWith(knn: KnnGraph, perplexity: number, k: number, team: Team): SparseAffinities {
  const n = knn.n;
  const stride = knn.k;
  if (!Number.isInteger(k) || k < 1 || k > stride) {
    throw new RangeError(`the neighbour graph has ${stride} columns; ${k} are needed (perplexity ${perplexity})`);
  }
  const sq = team.arrays.f64(n * k);
  const cols = new Int32Array(n * k);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < k; t++) {
      const j = knn.indices[i * stride + t];
      if (j === i || j < 0 || j >= n) {
        throw new RangeError(`neighbour ${t} of point ${i} is ${j}; expected another point's index (self excluded)`);
      }
      const dist = knn.distances[i * stride + t];
      sq[i * k + t] = dist * dist;
      cols[i * k + t] = j;
    }
  }
  const { conditional } = calibrateWith(sq, n, k, perplexity, team);
  return symmetrise(n, k, cols, conditional, team);
}

/** (C + Cᵀ) / Σ as CSR, for an n × k conditional matrix C with column indices `cols`. */
function symmetrise(n: number, k: number, cols: Int32Array, cond: Float64Array, team: Team): SparseAffinities {
  // Unmerged row lengths: k own entries plus one per appearance in another row.
  const rowLen = new Int32Array(n);
  for (let e = 0; e < n * k; e++) rowLen[cols[e]]++;
  const tmpPtr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) tmpPtr[i + 1] = tmpPtr[i] + k + rowLen[i];
  const tmpCol = new Int32Array(tmpPtr[n]);
  const tmpVal = new Float64Array(tmpPtr[n]);
  const fill = tmpPtr.slice(0, n);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < k; t++) {
      const j = cols[i * k + t];
      const v = cond[i * k + t];
      tmpCol[fill[i]] = j;
      tmpVal[fill[i]++] = v;
      tmpCol[fill[j]] = i;
      tmpVal[fill[j]++] = v;
    }
  }
  // Merge duplicates per row with a dense accumulator, then sort the columns.
  const acc = new Float64Array(n);
  const seen = new Uint8Array(n);
  const indptr = new Int32Array(n + 1);
  const outCol = new Int32Array(tmpPtr[n]);
  const outVal = new Float64Array(tmpPtr[n]);
  let nnz = 0;
  let total = 0;
  for (let i = 0; i < n; i++) {
    const start = nnz;
    for (let e = tmpPtr[i]; e < tmpPtr[i + 1]; e++) {
      const c = tmpCol[e];
      if (seen[c] === 0) {
        seen[c] = 1;
        outCol[nnz++] = c;
      }
      acc[c] += tmpVal[e];
    }
    outCol.subarray(start, nnz).sort();
    for (let e = start; e < nnz; e++) {
      const c = outCol[e];
      outVal[e] = acc[c];
      total += acc[c];
      acc[c] = 0;
      seen[c] = 0;
    }
    indptr[i + 1] = nnz;
  }
  const scale = 1 / Math.max(total, MACHINE_EPSILON);
  const values = team.arrays.f64(nnz);
  for (let e = 0; e < nnz; e++) values[e] = outVal[e] * scale;
  const indices = team.arrays.i32(nnz);
  indices.set(outCol.subarray(0, nnz));
  const sharedPtr = team.arrays.i32(n + 1);
  sharedPtr.set(indptr);
  return { n, indptr: sharedPtr, indices, values };
}

/**
 * Exact (dense) joint P over all n − 1 other points of every row, stored as
 * CSR with n − 1 entries per row; entries are floored at 2.22e-16 as in
 * scikit-learn 1.2.1 `_joint_probabilities`. Memory 12·n² bytes: meant for
 * n ≤ a few thousand.
 *
 * @param X n × d data; squared distances are summed term by term.
 * @param perplexity 0 < perplexity ≤ n − 1.
 */
export function jointExact(X: Matrix, perplexity: number): SparseAffinities {
  const team = new Team(1);
  try {
    return jointExactWith(X, perplexity, team);
  } finally {
    team.close();
  }
}

/** `jointExact` with the calibration on the threads of `team`; P is allocated in `team.arrays`. */
export function jointExactWith(X: Matrix, perplexity: number, team: Team): SparseAffinities {
  const { n, d, data } = X;
  if (n < 2) throw new RangeError(`exact affinities need at least 2 points; received ${n}`);
  const m = n - 1;
  const sq = team.arrays.f64(n * m);
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      let s = 0;
      for (let t = 0; t < d; t++) {
        const diff = data[i * d + t] - data[j * d + t];
        s += diff * diff;
      }
      // Row i stores j at position j − 1 (j > i); row j stores i at position i (i < j).
      sq[i * m + j - 1] = s;
      sq[j * m + i] = s;
    }
  }
  const { conditional } = calibrateWith(sq, n, m, perplexity, team);
  let total = 0;
  for (let e = 0; e < n * m; e++) total += conditional[e];
  total *= 2;
  const scale = 1 / Math.max(total, MACHINE_EPSILON);
  const indptr = team.arrays.i32(n + 1);
  const indices = team.arrays.i32(n * m);
  const values = team.arrays.f64(n * m);
  for (let i = 0; i < n; i++) {
    indptr[i + 1] = (i + 1) * m;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      const a = i * m + (j < i ? j : j - 1);
      const b = j * m + (i < j ? i : i - 1);
      indices[a] = j;
      values[a] = Math.max((conditional[a] + conditional[b]) * scale, MACHINE_EPSILON);
    }
  }
  return { n, indptr, indices, values };
}

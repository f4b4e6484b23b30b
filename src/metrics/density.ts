/**
 * Local density preservation (Narayan, Berger & Cho, "Assessing single-cell
 * transcriptomic variability through density-preserving data
 * visualization", Nature Biotechnology 39 (2021) 765–774).
 *
 * The paper's local radius is an affinity-weighted mean of squared
 * distances. This module uses the simple, reproducible k-NN variant: the
 * local radius of point i is
 *
 *   R_i = (1/k) Σ_{j ∈ kNN(i)} ‖x_i − x_j‖²
 *
 * — uniform weights over the k nearest other points, chosen in each space
 * separately (ties by index), squared distances summed term by term — and the
 * score is the Pearson correlation of log R in the data and log R in the map.
 * The map's scale does not matter (it shifts every log R equally).
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { exactKnn } from '../neighbors/exact.js';
import { pearson } from './global.js';

/**
 * log R_i for every point (see the module comment), from an exact kNN graph.
 *
 * A radius of 0 (a point whose k neighbours all coincide with it) would give
 * log 0 = −∞; such radii are raised to the smallest positive radius of the
 * same space. If every radius is 0 the result is all NaN.
 *
 * @param M n × d points.
 * @param knn exact kNN graph of M with at least k columns ((distance, index) order).
 * @param k neighbours per point, 1 ≤ k ≤ knn.k.
 * @returns Float64Array(n) of natural-log radii.
 */
export function logLocalRadius(M: Matrix, knn: KnnGraph, k: number): Float64Array {
  const { n, d, data } = M;
  if (knn.n !== n) throw new RangeError(`the kNN graph describes ${knn.n} points but the matrix has ${n}`);
  if (!Number.isInteger(k) || k < 1 || k > knn.k) {
    throw new RangeError(`k must be an integer from 1 to ${knn.k} (the graph's neighbours per point); received ${k}`);
  }
  const R = new Float64Array(n);
  let smallest = Infinity;
  for (let i = 0; i < n; i++) {
    const oi = i * d;
    let sum = 0;
    for (let p = 0; p < k; p++) {
      const oj = knn.indices[i * knn.k + p] * d;
      let s = 0;
      for (let c = 0; c < d; c++) {
        const diff = data[oi + c] - data[oj + c];
        s += diff * diff;
      }
      sum += s;
    }
    const r = sum / k;
    R[i] = r;
    if (r > 0 && r < smallest) smallest = r;
  }
  for (let i = 0; i < n; i++) R[i] = smallest === Infinity ? NaN : Math.log(R[i] > 0 ? R[i] : smallest);
  return R;
}

/**
 * Density preservation: Pearson correlation of log local radius in the data
 * X and the map Y (same rows), k-NN variant (see the module comment).
 *
 * @param X n × D data.
 * @param Y n × d map.
 * @param k neighbours per point, 1 ≤ k ≤ n − 1.
 * @param opts exact kNN graphs with ≥ k columns to reuse (computed when absent).
 * @returns a value in [−1, 1]; NaN when the radii of one space are all equal.
 */
export function densityCorrelation(
  X: Matrix,
  Y: Matrix,
  k: number,
  opts: { knnX?: KnnGraph; knnY?: KnnGraph } = {},
): number {
  if (X.n !== Y.n) throw new RangeError(`X has ${X.n} rows but the map has ${Y.n}`);
  const gX = opts.knnX ?? exactKnn(X, k);
  const gY = opts.knnY ?? exactKnn(Y, k);
  return pearson(logLocalRadius(X, gX, k), logLocalRadius(Y, gY, k));
}

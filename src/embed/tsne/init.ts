/**
 * Starting layouts for t-SNE. All three are tiny (standard deviation 1e-4 along
 * the first axis) so that the early-exaggeration phase starts from an almost
 * collapsed map, as recommended by Kobak & Berens 2019 (Nat. Commun.
 * 10:5416) and done by scikit-learn 1.2.1.
 */
import { EigenvalueDecomposition, Matrix as DenseMatrix } from 'ml-matrix';
import type { Rng } from '../../core/rng.js';
import type { Matrix } from '../../core/types.js';
import { spectralCoordinates } from '../init/spectral.js';
import type { SparseAffinities } from './affinities.js';

/** Standard deviation of the first coordinate of either initial layout. */
export const INIT_SCALE = 1e-4;

/**
 * Projection on the first two principal components of X (eigenvectors of
 * the covariance matrix, largest eigenvalue first; each vector's entry of
 * largest magnitude made positive), scaled so the first coordinate has
 * population standard deviation 1e-4; the second keeps its relative scale.
 * Deterministic: uses no random numbers, so every seed gets the same start.
 * Costs O(n·d² + d³); X is expected to be reduced to a few dozen columns.
 *
 * @returns interleaved n × 2 coordinates.
 */
export function pcaInit(X: Matrix): Float64Array {
  const { n, d, data } = X;
  const mean = new Float64Array(d);
  for (let i = 0; i < n; i++) for (let t = 0; t < d; t++) mean[t] += data[i * d + t];
  for (let t = 0; t < d; t++) mean[t] /= n;
  const cov = new Float64Array(d * d);
  const row = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < d; t++) row[t] = data[i * d + t] - mean[t];
    for (let a = 0; a < d; a++) {
      const ra = row[a];
      for (let b = a; b < d; b++) cov[a * d + b] += ra * row[b];
    }
  }
  const rows: number[][] = [];
  for (let a = 0; a < d; a++) {
    const r = new Array<number>(d);
    for (let b = 0; b < d; b++) r[b] = a <= b ? cov[a * d + b] : cov[b * d + a];
    rows.push(r);
  }
  const evd = new EigenvalueDecomposition(new DenseMatrix(rows), { assumeSymmetric: true });
  const lambda = evd.realEigenvalues;
  const vectors = evd.eigenvectorMatrix;
  const order = Array.from({ length: d }, (_, t) => t).sort((p, q) => lambda[q] - lambda[p] || p - q);
  const components: Float64Array[] = [];
  for (let c = 0; c < Math.min(2, d); c++) {
    const v = new Float64Array(d);
    for (let t = 0; t < d; t++) v[t] = vectors.get(t, order[c]);
    let big = 0;
    for (let t = 1; t < d; t++) if (Math.abs(v[t]) > Math.abs(v[big])) big = t;
    if (v[big] < 0) for (let t = 0; t < d; t++) v[t] = -v[t];
    components.push(v);
  }
  const out = new Float64Array(2 * n);
  let ss = 0;
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < components.length; c++) {
      const v = components[c];
      let s = 0;
      for (let t = 0; t < d; t++) s += (data[i * d + t] - mean[t]) * v[t];
      out[2 * i + c] = s;
    }
    ss += out[2 * i] * out[2 * i];
  }
  const sd = Math.sqrt(ss / n);
  const scale = sd > 0 ? INIT_SCALE / sd : 0;
  for (let e = 0; e < 2 * n; e++) out[e] *= scale;
  return out;
}

/**
 * Independent normal coordinates with standard deviation 1e-4, drawn from
 * `rng` in the order x0, y0, x1, y1, ….
 *
 * @returns interleaved n × 2 coordinates.
 */
export function randomInit(n: number, rng: Rng): Float64Array {
  const out = new Float64Array(2 * n);
  for (let e = 0; e < 2 * n; e++) out[e] = INIT_SCALE * rng.normal();
  return out;
}

/**
 * Laplacian eigenmaps of the t-SNE affinities P (the initialisation Kobak &
 * Linderman 2021, Nat. Biotechnol. 39:156–157, compare with PCA and random
 * starts): `spectralCoordinates` of P read as a weighted graph — the two
 * smallest non-trivial eigenvectors of its normalised Laplacian, one connected
 * component at a time, components placed as for UMAP (centroids from X) —
 * scaled like `pcaInit` so the first coordinate has population standard
 * deviation 1e-4 and the second keeps its relative scale.
 *
 * The eigenvectors come from a fixed start vector, so for a given P the start
 * is the same for every seed; `rng` only places components of fewer than four
 * points.
 *
 * @returns interleaved n × 2 coordinates.
 */
export function spectralInit(P: SparseAffinities, X: Matrix, rng: Rng): Float64Array {
  const out = spectralCoordinates({ n: P.n, indptr: P.indptr, indices: P.indices, weights: P.values }, rng, { X });
  const n = P.n;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += out[2 * i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (out[2 * i] - mean) ** 2;
  const sd = Math.sqrt(ss / n);
  const scale = sd > 0 ? INIT_SCALE / sd : 0;
  for (let e = 0; e < 2 * n; e++) out[e] *= scale;
  return out;
}

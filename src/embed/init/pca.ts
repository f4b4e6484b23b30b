/**
 * PCA starting layout: the data projected on its first two principal axes
 * (Pearson 1901; Hotelling 1933), scaled like the other starting layouts.
 */
import type { Matrix } from '../../core/types.js';
import { fixSignInPlace, fixedStartVector, largestEigenpairs } from './eigen.js';
import { scaleToMaxAbsInPlace } from './scale.js';

/**
 * Scores of the r rows of the r × d row-major matrix A on its first two
 * principal axes (after centring the columns), interleaved r × 2. Each axis
 * (a unit loading vector of length d) has its entry of largest magnitude
 * positive. The axes are the top eigenvectors of the d × d scatter matrix,
 * or come from the r × r Gram matrix when r < d; either way they are found by
 * Lanczos on the implicit product, never forming more than a copy of A, and
 * exactly (the Krylov space is exhausted) when min(r, d) ≤ 48. When the data
 * span fewer than two directions the missing axis scores 0.
 */
export function principalScores2(A: Float64Array, r: number, d: number): Float64Array {
  const out = new Float64Array(2 * r);
  if (r < 2 || d < 1) return out;
  const mean = new Float64Array(d);
  for (let i = 0; i < r; i++) for (let t = 0; t < d; t++) mean[t] += A[i * d + t];
  for (let t = 0; t < d; t++) mean[t] /= r;
  const Ac = new Float64Array(r * d);
  for (let i = 0; i < r; i++) for (let t = 0; t < d; t++) Ac[i * d + t] = A[i * d + t] - mean[t];

  const useGram = r < d;
  const dim = useGram ? r : d;
  const tmp = new Float64Array(useGram ? d : r);
  // Scatter: y = Acᵀ(Ac x) on R^d.  Gram: y = Ac(Acᵀ x) on R^r.
  const apply = useGram
    ? (x: Float64Array, y: Float64Array): void => {
        tmp.fill(0);
        for (let i = 0; i < r; i++) {
          const xi = x[i];
          if (xi !== 0) for (let t = 0; t < d; t++) tmp[t] += xi * Ac[i * d + t];
        }
        for (let i = 0; i < r; i++) {
          let s = 0;
          for (let t = 0; t < d; t++) s += Ac[i * d + t] * tmp[t];
          y[i] = s;
        }
      }
    : (x: Float64Array, y: Float64Array): void => {
        for (let i = 0; i < r; i++) {
          let s = 0;
          for (let t = 0; t < d; t++) s += Ac[i * d + t] * x[t];
          tmp[i] = s;
        }
        y.fill(0);
        for (let i = 0; i < r; i++) {
          const s = tmp[i];
          if (s !== 0) for (let t = 0; t < d; t++) y[t] += s * Ac[i * d + t];
        }
      };
  const want = Math.min(2, dim);
  const eig = largestEigenpairs(apply, dim, want, fixedStartVector(dim), { tol: 1e-10, maxBasis: 48 });
  for (let c = 0; c < want; c++) {
    if (!(eig.values[c] > 0)) continue;
    let v: Float64Array;
    if (useGram) {
      // Loading vector v = Acᵀu / ‖Acᵀu‖.
      const u = eig.vectors.subarray(c * r, (c + 1) * r);
      v = new Float64Array(d);
      for (let i = 0; i < r; i++) for (let t = 0; t < d; t++) v[t] += u[i] * Ac[i * d + t];
      let nrm = 0;
      for (let t = 0; t < d; t++) nrm += v[t] * v[t];
      nrm = Math.sqrt(nrm);
      if (!(nrm > 0)) continue;
      for (let t = 0; t < d; t++) v[t] /= nrm;
    } else {
      v = eig.vectors.slice(c * d, (c + 1) * d);
    }
    fixSignInPlace(v);
    for (let i = 0; i < r; i++) {
      let s = 0;
      for (let t = 0; t < d; t++) s += Ac[i * d + t] * v[t];
      out[2 * i + c] = s;
    }
  }
  return out;
}

/**
 * PCA starting layout of X (n × d): scores on the first two principal axes
 * (each axis's loading of largest magnitude positive, so the result is
 * deterministic), scaled so the largest |coordinate| is 10 — the box of the
 * spectral and random layouts. Uses no random numbers. Callers rescale as
 * their optimiser needs (UMAP adds umap-learn's 1e-4 jitter and maps each axis
 * to [0, 10]).
 *
 * @returns interleaved n × 2 coordinates.
 */
export function pcaLayout(X: Matrix): Float64Array {
  return scaleToMaxAbsInPlace(principalScores2(X.data, X.n, X.d));
}

/**
 * Largest eigenpairs of a symmetric linear operator by thick-restart Lanczos
 * (Wu & Simon, "Thick-restart Lanczos method for large symmetric eigenvalue
 * problems", SIAM J. Matrix Anal. Appl. 22:602–616, 2000), with full
 * reorthogonalisation (classical Gram–Schmidt applied twice) so that the
 * basis stays orthogonal to working precision and no ghost eigenvalues
 * appear. The projected matrix is small and dense; it is diagonalised with
 * ml-matrix's symmetric eigen-decomposition (Householder + QL).
 *
 * Deterministic: the start vector is an argument and every loop runs in a
 * fixed order, so the same input gives the same bytes.
 */
import { EigenvalueDecomposition, Matrix as DenseMatrix } from 'ml-matrix';

/** y ← A·x for a symmetric operator A on vectors of length n (x must not be modified). */
export type SymmetricOperator = (x: Float64Array, y: Float64Array) => void;

export interface LanczosOptions {
  /** Largest Krylov basis kept between restarts. Default 48 (capped at the dimension left after deflation). */
  maxBasis?: number;
  /**
   * A Ritz pair (θ, v) counts as converged when ‖A·v − θ·v‖ ≤ tol · max(|θ_max|, tiny).
   * Default 1e-8.
   */
  tol?: number;
  /** Most operator applications before giving up and returning the best Ritz pairs. Default 20 000. */
  maxMatvecs?: number;
  /**
   * Orthonormal vectors (each of length n) whose span is excluded from the
   * search, e.g. a known eigenvector. The operator should map their orthogonal
   * complement into itself (true for eigenvectors of a symmetric A).
   */
  deflate?: readonly Float64Array[];
}

export interface EigenResult {
  /** The `count` largest eigenvalues found, descending. */
  values: Float64Array;
  /** Matching unit eigenvectors, `count` × n row-major (vector i at [i·n, (i+1)·n)). Signs as they came out. */
  vectors: Float64Array;
  /** Residual norm ‖A·v − θ·v‖ of each pair. */
  residuals: Float64Array;
  /** Whether every pair met the tolerance. */
  converged: boolean;
  /** Operator applications used. */
  matvecs: number;
}

/**
 * The `count` largest (algebraic) eigenvalues of the symmetric operator `apply`
 * on R^n, restricted to the orthogonal complement of `opts.deflate`, and their
 * eigenvectors.
 *
 * @param apply y ← A·x.
 * @param n vector length.
 * @param count number of eigenpairs wanted, 1 ≤ count ≤ n − deflate.length.
 * @param start start vector (length n, not all zero after deflation); it is copied.
 */
export function largestEigenpairs(
  apply: SymmetricOperator,
  n: number,
  count: number,
  start: Float64Array,
  opts: LanczosOptions = {},
): EigenResult {
  const deflate = opts.deflate ?? [];
  const dim = n - deflate.length;
  if (!(count >= 1 && count <= dim)) throw new RangeError(`count must be in 1..${dim}, got ${count}`);
  if (start.length !== n) throw new RangeError(`start vector has length ${start.length}, expected ${n}`);
  const tol = opts.tol ?? 1e-8;
  const maxMatvecs = opts.maxMatvecs ?? 20_000;
  const m = Math.min(dim, Math.max(opts.maxBasis ?? 48, 2 * count + 2));

  // Basis vectors V[0..m] (one extra slot for the residual direction), row-major.
  const V = new Float64Array((m + 1) * n);
  const H = new Float64Array(m * m);
  const w = new Float64Array(n);
  const h = new Float64Array(m + 1);

  const v0 = V.subarray(0, n);
  v0.set(start);
  projectOut(v0, deflate);
  projectOut(v0, deflate);
  let nrm = norm(v0);
  if (!(nrm > 0)) throw new RangeError('start vector lies in the deflated subspace');
  scale(v0, 1 / nrm);

  let kept = 0;
  let matvecs = 0;
  let theta: Float64Array = new Float64Array(0);
  let S: Float64Array = new Float64Array(0);
  let size = 0;
  let beta = 0;
  let order: number[] = [];
  let exhausted = false;
  // A fresh direction started in the last slot has not been explored yet.
  let freshPending = false;

  for (;;) {
    // Extend the basis from `kept` to m vectors (or until the whole space is spanned).
    size = m;
    beta = 0;
    freshPending = false;
    for (let j = kept; j < m; j++) {
      const vj = V.subarray(j * n, (j + 1) * n);
      apply(vj, w);
      matvecs++;
      projectOut(w, deflate);
      const before = norm(w);
      // Classical Gram–Schmidt twice against V[0..j].
      h.fill(0, 0, j + 1);
      for (let pass = 0; pass < 2; pass++) {
        for (let i = 0; i <= j; i++) {
          const vi = V.subarray(i * n, (i + 1) * n);
          const c = dot(vi, w);
          h[i] += c;
          axpy(-c, vi, w);
        }
      }
      for (let i = 0; i <= j; i++) {
        // Rows < kept of column `kept` carry the restart couplings; the rest is the tridiagonal band.
        H[i * m + j] = h[i];
        H[j * m + i] = h[i];
      }
      beta = norm(w);
      const next = V.subarray((j + 1) * n, (j + 2) * n);
      if (beta <= 1e-12 * before || beta === 0) {
        // V[0..j] spans an invariant subspace (exact in exact arithmetic; happens
        // when the start vector misses part of a repeated eigenvalue's space).
        // Go on from a fresh direction orthogonal to everything so far, with
        // coupling 0, unless the whole space is spanned.
        beta = 0;
        let fresh = 0;
        if (j + 1 < dim) {
          next.set(fixedStartVector(n, j + 1));
          projectOut(next, deflate);
          for (let pass = 0; pass < 2; pass++) {
            for (let i = 0; i <= j; i++) {
              const vi = V.subarray(i * n, (i + 1) * n);
              axpy(-dot(vi, next), vi, next);
            }
          }
          fresh = norm(next);
        }
        if (!(fresh > 1e-8)) {
          size = j + 1;
          exhausted = true;
          break;
        }
        scale(next, 1 / fresh);
        freshPending = j === m - 1;
        continue;
      }
      for (let t = 0; t < n; t++) next[t] = w[t] / beta;
    }

    // Rayleigh–Ritz on the projected matrix.
    ({ theta, S, order } = symmetricEigen(H, m, size));
    const top = order.slice(0, Math.min(count, size));
    const ref = Math.max(Math.abs(theta[order[0]]), 1e-300);
    let allConverged = top.length === count;
    for (const c of top) if (Math.abs(beta * S[(size - 1) * size + c]) > tol * ref) allConverged = false;
    if ((allConverged && !freshPending) || exhausted || matvecs >= maxMatvecs) break;

    // Thick restart: keep p Ritz vectors (the wanted ones and a buffer), then the residual direction.
    const p = Math.min(size - 1, Math.max(count + 1, Math.floor((m + count) / 2)));
    const keep = order.slice(0, p);
    const Y = new Float64Array(p * n);
    for (let r = 0; r < p; r++) {
      const col = keep[r];
      const yr = Y.subarray(r * n, (r + 1) * n);
      for (let l = 0; l < size; l++) {
        const s = S[l * size + col];
        if (s !== 0) axpy(s, V.subarray(l * n, (l + 1) * n), yr);
      }
    }
    // The residual direction V[size] moves to slot p before slot p is overwritten (p < size).
    V.copyWithin(p * n, size * n, (size + 1) * n);
    V.set(Y, 0);
    // Re-orthonormalise the kept vectors and the new direction once more against rounding.
    for (let r = 0; r <= p; r++) {
      const vr = V.subarray(r * n, (r + 1) * n);
      for (let i = 0; i < r; i++) axpy(-dot(V.subarray(i * n, (i + 1) * n), vr), V.subarray(i * n, (i + 1) * n), vr);
      nrm = norm(vr);
      scale(vr, 1 / nrm);
    }
    H.fill(0);
    for (let r = 0; r < p; r++) H[r * m + r] = theta[keep[r]];
    kept = p;
  }

  const got = Math.min(count, size);
  const values = new Float64Array(count);
  const vectors = new Float64Array(count * n);
  const residuals = new Float64Array(count).fill(Number.POSITIVE_INFINITY);
  let converged = got === count;
  const ref = Math.max(Math.abs(theta[order[0]]), 1e-300);
  for (let r = 0; r < got; r++) {
    const col = order[r];
    values[r] = theta[col];
    const out = vectors.subarray(r * n, (r + 1) * n);
    for (let l = 0; l < size; l++) {
      const s = S[l * size + col];
      if (s !== 0) axpy(s, V.subarray(l * n, (l + 1) * n), out);
    }
    scale(out, 1 / norm(out));
    residuals[r] = Math.abs(beta * S[(size - 1) * size + col]);
    if (residuals[r] > tol * ref) converged = false;
  }
  return { values, vectors, residuals, converged, matvecs };
}

/**
 * Eigen-decomposition of the leading size × size block of the symmetric m × m
 * matrix H. Returns eigenvalues, eigenvectors as columns of a size × size
 * row-major S, and the column order by descending eigenvalue (ties by index).
 */
function symmetricEigen(H: Float64Array, m: number, size: number): { theta: Float64Array; S: Float64Array; order: number[] } {
  const rows: number[][] = [];
  for (let i = 0; i < size; i++) {
    const r = new Array<number>(size);
    for (let j = 0; j < size; j++) r[j] = 0.5 * (H[i * m + j] + H[j * m + i]);
    rows.push(r);
  }
  const evd = new EigenvalueDecomposition(new DenseMatrix(rows), { assumeSymmetric: true });
  const theta = Float64Array.from(evd.realEigenvalues);
  const E = evd.eigenvectorMatrix;
  const S = new Float64Array(size * size);
  for (let i = 0; i < size; i++) for (let j = 0; j < size; j++) S[i * size + j] = E.get(i, j);
  const order = Array.from({ length: size }, (_, i) => i).sort((a, b) => theta[b] - theta[a] || a - b);
  return { theta, S, order };
}

/** Dense symmetric eigen-decomposition (ml-matrix), eigenvalues descending; vectors as rows of an m × m array. */
export function denseSymmetricEigen(A: Float64Array, m: number): { values: Float64Array; vectors: Float64Array } {
  const { theta, S, order } = symmetricEigen(A, m, m);
  const values = new Float64Array(m);
  const vectors = new Float64Array(m * m);
  for (let r = 0; r < m; r++) {
    values[r] = theta[order[r]];
    for (let i = 0; i < m; i++) vectors[r * m + i] = S[i * m + order[r]];
  }
  return { values, vectors };
}

/**
 * Flip v in place so that its entry of largest magnitude is positive (the
 * first such entry when several tie), the usual way to make an eigenvector's
 * arbitrary sign deterministic.
 */
export function fixSignInPlace(v: Float64Array): void {
  let big = 0;
  for (let i = 1; i < v.length; i++) if (Math.abs(v[i]) > Math.abs(v[big])) big = i;
  if (v[big] < 0) for (let i = 0; i < v.length; i++) v[i] = -v[i];
}

/**
 * A fixed, seed-independent start vector for Krylov methods: entries in
 * [−0.5, 0.5) from an integer hash of the index (and of `salt`, for further
 * independent vectors) through murmur3's finaliser, so it has no structure
 * that could align with a graph's eigenvectors and is the same for every run.
 */
export function fixedStartVector(n: number, salt = 0): Float64Array {
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let z = (i + 0x9e3779b9 + Math.imul(salt, 0x632be5ab)) >>> 0;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    z = (z ^ (z >>> 16)) >>> 0;
    v[i] = z / 4294967296 - 0.5;
  }
  return v;
}

function projectOut(x: Float64Array, basis: readonly Float64Array[]): void {
  for (const q of basis) axpy(-dot(q, x), q, x);
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function axpy(alpha: number, x: Float64Array, y: Float64Array): void {
  for (let i = 0; i < y.length; i++) y[i] += alpha * x[i];
}

function norm(x: Float64Array): number {
  return Math.sqrt(dot(x, x));
}

function scale(x: Float64Array, s: number): void {
  for (let i = 0; i < x.length; i++) x[i] *= s;
}

/**
 * Gradient of the t-SNE objective KL(P‖Q) with a Student-t kernel of one
 * degree of freedom in 2-D (van der Maaten & Hinton 2008, eq. 5):
 *
 *   ∂KL/∂y_i = 4 Σ_j (p_ij − q_ij) w_ij (y_i − y_j),  w_ij = 1/(1 + ‖y_i − y_j‖²),
 *   q_ij = w_ij / Z,  Z = Σ_{k≠l} w_kl,
 *
 * split as 4·(F_attr,i − F_rep,i / Z) with F_attr,i = Σ_j p_ij w_ij (y_i − y_j)
 * over the stored entries of P and F_rep,i = Σ_j w_ij² (y_i − y_j) over all
 * pairs, computed exactly or by Barnes-Hut (van der Maaten 2014, JMLR 15:3221).
 * The factor 4 is kept, so these functions return the true gradient of the
 * KL divergence (the convention of scikit-learn 1.2.1 `_kl_divergence`).
 */
import type { Embedding } from '../../core/types.js';
import type { SparseAffinities } from './affinities.js';
import { attractionRows } from './kernels.js';
import { QuadTree } from './quadtree.js';

/** Gradient of KL(P‖Q) at Y and the normalisation Z of Q. */
export interface GradientResult {
  /** ∂KL/∂Y, interleaved like the embedding (length 2n). */
  readonly grad: Float64Array;
  /** Z = Σ_{i≠j} 1 / (1 + ‖y_i − y_j‖²) over ordered pairs (approximate in Barnes-Hut mode). */
  readonly z: number;
}

/**
 * Attractive forces F_attr,i = s · Σ_j p_ij w_ij (y_i − y_j) over the CSR
 * entries of P, written into `out` (length 2n). `s` scales P (early
 * exaggeration). P must be symmetric with ascending columns in every row, as
 * `jointFromKnn` and `jointExact` build it: each unordered pair is visited
 * once, from its lower index, and applied to both points.
 */
export function attractiveForcesInto(P: SparseAffinities, y: Float64Array, s: number, out: Float64Array): void {
  const { n, indptr, indices, values } = P;
  out.fill(0, 0, 2 * n);
  for (let i = 0; i < n; i++) {
    const xi = y[2 * i];
    const yi = y[2 * i + 1];
    const end = indptr[i + 1];
    let e = indptr[i];
    while (e < end && indices[e] < i) e++;
    let fx = 0;
    let fy = 0;
    for (; e < end; e++) {
      const j = indices[e];
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      const pw = values[e] / (1 + dx * dx + dy * dy);
      const gx = pw * dx;
      const gy = pw * dy;
      fx += gx;
      fy += gy;
      out[2 * j] -= gx;
      out[2 * j + 1] -= gy;
    }
    out[2 * i] += fx;
    out[2 * i + 1] += fy;
  }
  if (s !== 1) for (let t = 0; t < 2 * n; t++) out[t] *= s;
}

/**
 * Exact unnormalised repulsion F_rep,i = Σ_{j≠i} w_ij² (y_i − y_j) by a
 * symmetric loop over the n(n − 1)/2 unordered pairs, written into `out`
 * (length 2n). Returns Z over ordered pairs. O(n²) time.
 */
export function exactRepulsionInto(y: Float64Array, n: number, out: Float64Array): number {
  out.fill(0, 0, 2 * n);
  let zHalf = 0;
  for (let i = 0; i < n; i++) {
    const xi = y[2 * i];
    const yi = y[2 * i + 1];
    let fx = 0;
    let fy = 0;
    for (let j = i + 1; j < n; j++) {
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      const w = 1 / (1 + dx * dx + dy * dy);
      zHalf += w;
      const w2 = w * w;
      const gx = w2 * dx;
      const gy = w2 * dy;
      fx += gx;
      fy += gy;
      out[2 * j] -= gx;
      out[2 * j + 1] -= gy;
    }
    out[2 * i] += fx;
    out[2 * i + 1] += fy;
  }
  return 2 * zHalf;
}

/**
 * Exact attraction and repulsion in one pass over unordered pairs, for a
 * dense P stored as `jointExact` stores it (row i holds every j ≠ i in
 * ascending order, and P is symmetric). Writes F_attr (scaled by `s`) and
 * F_rep and returns Z.
 */
export function denseForcesInto(P: SparseAffinities, y: Float64Array, s: number, attr: Float64Array, rep: Float64Array): number {
  const n = P.n;
  const values = P.values;
  const m = n - 1;
  attr.fill(0, 0, 2 * n);
  rep.fill(0, 0, 2 * n);
  let zHalf = 0;
  for (let i = 0; i < n; i++) {
    const xi = y[2 * i];
    const yi = y[2 * i + 1];
    // Row i stores j > i at offset j − 1.
    const row = i * m - 1;
    let ax = 0;
    let ay = 0;
    let rx = 0;
    let ry = 0;
    for (let j = i + 1; j < n; j++) {
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      const w = 1 / (1 + dx * dx + dy * dy);
      zHalf += w;
      const pw = s * values[row + j] * w;
      const w2 = w * w;
      const axj = pw * dx;
      const ayj = pw * dy;
      const rxj = w2 * dx;
      const ryj = w2 * dy;
      ax += axj;
      ay += ayj;
      rx += rxj;
      ry += ryj;
      attr[2 * j] -= axj;
      attr[2 * j + 1] -= ayj;
      rep[2 * j] -= rxj;
      rep[2 * j + 1] -= ryj;
    }
    attr[2 * i] += ax;
    attr[2 * i + 1] += ay;
    rep[2 * i] += rx;
    rep[2 * i + 1] += ry;
  }
  return 2 * zHalf;
}

/** grad = 4·(attr − rep / Z), written into `grad`. */
export function combineInto(attr: Float64Array, rep: Float64Array, z: number, n: number, grad: Float64Array): void {
  const invZ = 1 / z;
  for (let t = 0; t < 2 * n; t++) grad[t] = 4 * (attr[t] - rep[t] * invZ);
}

/** True when P has the dense layout of `jointExact` (all n − 1 others per row). */
export function isDenseLayout(P: SparseAffinities): boolean {
  return P.indices.length === P.n * (P.n - 1);
}

/**
 * Exact gradient of KL(P‖Q) at Y: attraction over the entries of P,
 * repulsion over all pairs. O(n² + nnz) time.
 *
 * @param P symmetric joint affinities (sparse or dense layout, ascending
 *   columns per row, as built by `jointFromKnn` or `jointExact`), n points.
 * @param Y embedding with the same n.
 */
export function exactGradient(P: SparseAffinities, Y: Embedding): GradientResult {
  checkShapes(P, Y);
  const n = Y.n;
  const attr = new Float64Array(2 * n);
  const rep = new Float64Array(2 * n);
  attractiveForcesInto(P, Y.data, 1, attr);
  const z = exactRepulsionInto(Y.data, n, rep);
  const grad = new Float64Array(2 * n);
  combineInto(attr, rep, z, n, grad);
  return { grad, z };
}

/**
 * Barnes-Hut gradient of KL(P‖Q) at Y, computed as the optimiser computes
 * it: exact attraction over the entries of P, row by row; repulsion and Z
 * from a quadtree with opening angle θ (θ = 0 is exact; 0.5 is the usual
 * setting). O(nnz + n log n) time for fixed θ > 0.
 */
export function bhGradient(P: SparseAffinities, Y: Embedding, theta = 0.5): GradientResult {
  checkShapes(P, Y);
  if (!(theta >= 0) || !Number.isFinite(theta)) throw new RangeError(`theta must be a finite number ≥ 0; received ${theta}`);
  const n = Y.n;
  const attr = new Float64Array(2 * n);
  const rep = new Float64Array(2 * n);
  attractionRows(P.indptr, P.indices, P.values, Y.data, 0, n, attr);
  const tree = new QuadTree();
  tree.build(Y.data, n);
  const z = tree.repulsion(theta, rep);
  const grad = new Float64Array(2 * n);
  combineInto(attr, rep, z, n, grad);
  return { grad, z };
}

function checkShapes(P: SparseAffinities, Y: Embedding): void {
  if (P.n !== Y.n) throw new RangeError(`P has ${P.n} points but the embedding has ${Y.n}`);
  if (Y.data.length !== 2 * Y.n) throw new RangeError(`embedding data has ${Y.data.length} values, expected 2n = ${2 * Y.n}`);
}

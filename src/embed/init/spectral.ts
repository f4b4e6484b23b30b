/**
 * Spectral starting layout (Laplacian eigenmaps: Belkin & Niyogi, "Laplacian
 * eigenmaps for dimensionality reduction and data representation", Neural
 * Computation 15:1373–1396, 2003), arranged as umap-learn's
 * `spectral_layout` does for UMAP (McInnes, Healy & Melville 2018,
 * arXiv 1802.03426): the two smallest non-trivial eigenvectors of the
 * normalised Laplacian L = I − D^−½ W D^−½, one connected component at a time.
 */
import type { Rng } from '../../core/rng.js';
import type { Matrix } from '../../core/types.js';
import { fixSignInPlace, fixedStartVector, largestEigenpairs } from './eigen.js';
import { principalScores2 } from './pca.js';
import { noisyScaleInPlace } from './scale.js';

/**
 * A symmetric weighted graph on n vertices in CSR form: the neighbours of
 * vertex i are indices[indptr[i] .. indptr[i+1]) with positive weights; every
 * edge is stored in both directions with the same weight; no self-loops.
 * (UMAP's `FuzzyGraph` has exactly this shape.)
 */
export interface WeightedGraph {
  readonly n: number;
  readonly indptr: Int32Array;
  readonly indices: Int32Array;
  readonly weights: Float64Array;
}

/** Connected components: `labels[i]` in 0..count−1, numbered in order of their lowest vertex. */
export interface Components {
  count: number;
  labels: Int32Array;
  /** Vertices of each component, ascending: component c is members[start[c] .. start[c+1]). */
  members: Int32Array;
  start: Int32Array;
}

/** Components smaller than this get random positions instead of eigenvectors (umap-learn: fewer than 2·dim points). */
export const MIN_SPECTRAL_COMPONENT = 4;

export interface SpectralOptions {
  /**
   * The data the graph was built from (n × d). When the graph has more than
   * four components, their centroids in this space decide where the
   * components go (see `spectralCoordinates`). Optional.
   */
  X?: Matrix;
  /**
   * Residual tolerance ‖Mv − θv‖ of the eigenvectors of M = D^−½WD^−½ (whose
   * largest eigenvalue is 1). Default 1e-6 (umap-learn asks ARPACK for 1e-4).
   */
  tol?: number;
}

/** Connected components by breadth-first search from the lowest unvisited vertex. */
export function connectedComponents(g: WeightedGraph): Components {
  const { n, indptr, indices } = g;
  const labels = new Int32Array(n).fill(-1);
  const members = new Int32Array(n);
  const startList: number[] = [];
  let tail = 0;
  let count = 0;
  for (let s = 0; s < n; s++) {
    if (labels[s] >= 0) continue;
    const head0 = tail;
    startList.push(head0);
    labels[s] = count;
    members[tail++] = s;
    for (let q = head0; q < tail; q++) {
      const i = members[q];
      for (let e = indptr[i]; e < indptr[i + 1]; e++) {
        const j = indices[e];
        if (labels[j] < 0) {
          labels[j] = count;
          members[tail++] = j;
        }
      }
    }
    members.subarray(head0, tail).sort();
    count++;
  }
  startList.push(n);
  return { count, labels, members, start: Int32Array.from(startList) };
}

/**
 * The `count` smallest non-trivial eigenpairs of the normalised Laplacian of
 * the subgraph induced by `nodes` (which must be a union of connected
 * components, i.e. have no edges leaving it), ascending by eigenvalue.
 * Eigenvectors have unit length, are indexed like `nodes`, and each has its
 * entry of largest magnitude positive.
 *
 * Computed as the largest eigenpairs of D^−½ W D^−½ by thick-restart Lanczos
 * (basis of 32 vectors) with the trivial eigenvector D^½·1 deflated, from a
 * fixed start vector, so the result does not depend on any seed. `tol` bounds
 * the residual ‖Mv − θv‖ (default 1e-8); an eigenvector's error is about
 * tol divided by the gap to the next eigenvalue. If the iteration limit
 * (max(5·size, 2000) products) is reached first, the best vectors found are
 * returned with `converged` false.
 *
 * @returns eigenvalues of L and `count` × nodes.length eigenvectors (row-major).
 */
export function laplacianEigenvectors(
  g: WeightedGraph,
  nodes: Int32Array,
  count: number,
  tol = 1e-8,
): { values: Float64Array; vectors: Float64Array; converged: boolean } {
  const c = nodes.length;
  if (!(count >= 1 && count <= c - 1)) throw new RangeError(`count must be in 1..${c - 1}, got ${count}`);
  const local = new Map<number, number>();
  for (let a = 0; a < c; a++) local.set(nodes[a], a);
  const { indptr, indices, weights } = g;

  const deg = new Float64Array(c);
  let nnz = 0;
  for (let a = 0; a < c; a++) {
    const i = nodes[a];
    let s = 0;
    for (let e = indptr[i]; e < indptr[i + 1]; e++) s += weights[e];
    deg[a] = s;
    nnz += indptr[i + 1] - indptr[i];
  }
  // Local CSR of D^−½ W D^−½.
  const lp = new Int32Array(c + 1);
  const li = new Int32Array(nnz);
  const lw = new Float64Array(nnz);
  const isq = new Float64Array(c);
  for (let a = 0; a < c; a++) isq[a] = deg[a] > 0 ? 1 / Math.sqrt(deg[a]) : 0;
  let t = 0;
  for (let a = 0; a < c; a++) {
    const i = nodes[a];
    for (let e = indptr[i]; e < indptr[i + 1]; e++) {
      const b = local.get(indices[e]);
      if (b === undefined) throw new RangeError(`vertex ${i} has an edge leaving the node set`);
      li[t] = b;
      lw[t] = weights[e] * isq[a] * isq[b];
      t++;
    }
    lp[a + 1] = t;
  }
  const apply = (x: Float64Array, y: Float64Array): void => {
    for (let a = 0; a < c; a++) {
      let s = 0;
      for (let e = lp[a]; e < lp[a + 1]; e++) s += lw[e] * x[li[e]];
      y[a] = s;
    }
  };
  // Trivial eigenvector of D^−½WD^−½ (eigenvalue 1): D^½·1, normalised.
  const trivial = new Float64Array(c);
  let nrm = 0;
  for (let a = 0; a < c; a++) nrm += deg[a];
  nrm = Math.sqrt(nrm);
  for (let a = 0; a < c; a++) trivial[a] = Math.sqrt(deg[a]) / nrm;

  const r = largestEigenpairs(apply, c, count, fixedStartVector(c), {
    deflate: [trivial],
    tol,
    maxMatvecs: Math.max(5 * c, 2000),
    maxBasis: 32,
  });
  const values = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    values[k] = 1 - r.values[k];
    fixSignInPlace(r.vectors.subarray(k * c, (k + 1) * c));
  }
  return { values, vectors: r.vectors, converged: r.converged };
}

/**
 * The spectral layout before umap-learn's final scaling: interleaved n × 2.
 *
 * - One component: the two smallest non-trivial eigenvectors of its
 *   normalised Laplacian (unit length, largest-magnitude entry positive).
 * - Several components, as umap-learn's `multi_component_layout`: each
 *   component c gets a centre m_c; with at most four components these are
 *   ±e1, ±e2 in component order (e1, e2, −e1, −e2); with more they are a
 *   layout of the components scaled to max |coordinate| 1 — from the first two
 *   principal axes of the component centroids in `opts.X` when given (umap-learn
 *   instead embeds the centroids spectrally with affinity exp(−d²), which
 *   degenerates to a solver-dependent arbitrary placement once centroids are
 *   more than a few units apart; principal axes keep the centroids' global
 *   arrangement and are deterministic), or evenly spaced on the unit circle
 *   when no data are given. Each component's two eigenvectors are scaled so
 *   its points lie in the disc around m_c of radius half the distance to the
 *   nearest other centre (the farthest point on the circle), and shifted to
 *   m_c; discs of different components do not overlap. (umap-learn scales by
 *   the largest |coordinate| instead, which lets neighbouring components'
 *   square boxes overlap at their corners.) Components with fewer than four
 *   points get uniform random positions in the square inscribed in their
 *   disc, drawn from `rng` (x then y, points ascending, components in order).
 *
 * `rng` is used only for those small components.
 */
export function spectralCoordinates(graph: WeightedGraph, rng: Rng, opts: SpectralOptions = {}): Float64Array {
  const n = graph.n;
  const out = new Float64Array(2 * n);
  if (n === 0) return out;
  const comps = connectedComponents(graph);
  const tol = opts.tol ?? 1e-6;
  if (comps.count === 1) {
    if (n < MIN_SPECTRAL_COMPONENT) {
      for (let e = 0; e < 2 * n; e++) out[e] = 2 * rng.next() - 1;
      return out;
    }
    const { vectors } = laplacianEigenvectors(graph, comps.members, 2, tol);
    for (let i = 0; i < n; i++) {
      out[2 * i] = vectors[i];
      out[2 * i + 1] = vectors[n + i];
    }
    return out;
  }
  const C = comps.count;
  const meta = componentCentres(comps, opts.X);
  for (let c = 0; c < C; c++) {
    const mx = meta[2 * c];
    const my = meta[2 * c + 1];
    let nearest = Number.POSITIVE_INFINITY;
    for (let o = 0; o < C; o++) {
      const dd = Math.hypot(meta[2 * o] - mx, meta[2 * o + 1] - my);
      if (dd > 0 && dd < nearest) nearest = dd;
    }
    const range = Number.isFinite(nearest) ? nearest / 2 : 1;
    const nodes = comps.members.subarray(comps.start[c], comps.start[c + 1]);
    const size = nodes.length;
    if (size < MIN_SPECTRAL_COMPONENT) {
      // Uniform in the square inscribed in the component's disc.
      const half = range * Math.SQRT1_2;
      for (let a = 0; a < size; a++) {
        const i = nodes[a];
        out[2 * i] = mx + half * (2 * rng.next() - 1);
        out[2 * i + 1] = my + half * (2 * rng.next() - 1);
      }
      continue;
    }
    const { vectors } = laplacianEigenvectors(graph, nodes, 2, tol);
    let big = 0;
    for (let a = 0; a < size; a++) big = Math.max(big, Math.hypot(vectors[a], vectors[size + a]));
    const s = big > 0 ? range / big : 0;
    for (let a = 0; a < size; a++) {
      const i = nodes[a];
      out[2 * i] = mx + s * vectors[a];
      out[2 * i + 1] = my + s * vectors[size + a];
    }
  }
  return out;
}

/**
 * Spectral starting layout as umap-learn builds it: `spectralCoordinates`,
 * then scaled so the largest |coordinate| is 10, plus N(0, 1e-4²) noise per
 * coordinate from `rng` (umap-learn's `noisy_scale_coords`). Interleaved n × 2.
 *
 * The eigenvectors come from a fixed start vector, so for a given graph only
 * the noise (and the positions of components under four points) depends on
 * `rng`. Callers that optimise from this layout rescale it to their own range
 * (UMAP maps each axis to [0, 10] with `rescaleToBox`; t-SNE would shrink it).
 *
 * @param graph symmetric weighted graph (e.g. UMAP's fuzzy graph).
 * @param rng source of the noise.
 * @param opts optional data for placing components, eigenvector tolerance.
 */
export function spectralLayout(graph: WeightedGraph, rng: Rng, opts: SpectralOptions = {}): Float64Array {
  return noisyScaleInPlace(spectralCoordinates(graph, rng, opts), rng);
}

/**
 * Centres of the components (interleaved C × 2): ±unit vectors for up to
 * four components; principal axes of the centroids (or a circle without data)
 * for more, scaled to max |coordinate| 1.
 */
function componentCentres(comps: Components, X: Matrix | undefined): Float64Array {
  const C = comps.count;
  const meta = new Float64Array(2 * C);
  if (C <= 4) {
    // umap-learn: k = ⌈C/2⌉ unit vectors, then their negatives, first C rows.
    const k = Math.ceil(C / 2);
    for (let c = 0; c < C; c++) {
      const axis = c % k;
      const sign = c < k ? 1 : -1;
      meta[2 * c + axis] = sign;
    }
    return meta;
  }
  if (!X) {
    for (let c = 0; c < C; c++) {
      meta[2 * c] = Math.cos((2 * Math.PI * c) / C);
      meta[2 * c + 1] = Math.sin((2 * Math.PI * c) / C);
    }
    return meta;
  }
  const d = X.d;
  const cent = new Float64Array(C * d);
  for (let c = 0; c < C; c++) {
    const a0 = comps.start[c];
    const a1 = comps.start[c + 1];
    for (let a = a0; a < a1; a++) {
      const i = comps.members[a];
      for (let t = 0; t < d; t++) cent[c * d + t] += X.data[i * d + t];
    }
    for (let t = 0; t < d; t++) cent[c * d + t] /= a1 - a0;
  }
  const proj = principalScores2(cent, C, d);
  let big = 0;
  for (let e = 0; e < 2 * C; e++) big = Math.max(big, Math.abs(proj[e]));
  if (!(big > 0)) {
    for (let c = 0; c < C; c++) {
      meta[2 * c] = Math.cos((2 * Math.PI * c) / C);
      meta[2 * c + 1] = Math.sin((2 * Math.PI * c) / C);
    }
    return meta;
  }
  for (let e = 0; e < 2 * C; e++) meta[e] = proj[e] / big;
  return meta;
}

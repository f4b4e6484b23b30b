/**
 * Neighbourhood preservation of an embedding: trustworthiness and continuity
 * (Venna & Kaski 2001) and the overlap of k-nearest-neighbour sets.
 *
 * Tie rule everywhere: neighbours are ordered by (distance, index), so of two
 * points at the same distance the one with the lower index ranks first.
 * Squared distances are summed term by term, which keeps exact ties exact.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { exactKnn } from '../neighbors/exact.js';

/** Precomputed neighbour graphs that the rank metrics may reuse. */
/** Up to this many rows trustworthiness and continuity average over every row in an audit. */
export const RANK_EXACT_LIMIT = 10_000;
/** Rows they average over above that (a seeded uniform sample; ranks stay exact among all rows). */
export const RANK_SAMPLE_ROWS = 5_000;

export interface NeighbourhoodOptions {
  /**
   * Exact kNN graph of the high-dimensional points X with at least k columns.
   * More columns (e.g. the largest k of a sweep) make intruder ranks cheaper.
   */
  readonly knnX?: KnnGraph;
  /** Exact kNN graph of the embedding Y with at least k columns. */
  readonly knnY?: KnnGraph;
  /**
   * Rows to average over (distinct, ascending); default all. With a subset of
   * m rows the penalty sum over them is scaled by n/m — an unbiased estimate
   * of the full score when the rows are a uniform sample. Ranks are still
   * exact, among all n points.
   */
  readonly rows?: Int32Array;
  /**
   * Trustworthiness only: keep, per row, the points found within a little
   * more than its farthest intruder (in a cache tied to X's data array), and
   * answer later calls on the same X from it when their intruders fall inside
   * — a sweep scores many maps of the same data, whose intruders are mostly
   * the same points. Results are identical with and without. Default false.
   */
  readonly reuseRanks?: boolean;
}

/**
 * Trustworthiness T(k) of the embedding Y of the points X (Venna & Kaski,
 * "Neighborhood preservation in nonlinear projection methods: an experimental
 * study", ICANN 2001).
 *
 * T(k) = 1 − (2 / G_k) · Σ_i Σ_{j ∈ U_k(i)} (ρ(i,j) − k), where U_k(i) are
 * the points among i's k nearest neighbours in Y but not in X, ρ(i,j) is the
 * rank of j among i's neighbours in X (1 = nearest other point), and
 * G_k = n·k·(2n − 3k − 1) for k < n/2, n·(n − k)·(n − k − 1) otherwise.
 * For k < n/2 this equals scikit-learn's `trustworthiness(X, Y, n_neighbors=k)`
 * on data without distance ties.
 *
 * No n × n matrix is formed: memory is O(n·(k + D)). The X rank of an
 * intruder is read from `knnX` when it lies in that list; otherwise it is
 * counted exactly, visiting only points that a projection bound cannot rule
 * out (so a longer `knnX` and a better map both make the call faster).
 * `knnX` and `knnY` must be exact and follow the (distance, index) rule.
 *
 * @param X n × D points in the original space.
 * @param Y n × d embedding of the same points (same row order).
 * @param k neighbourhood size, an integer from 1 to n − 2.
 * @param opts precomputed exact kNN graphs (computed here when absent).
 * @returns a number in [0, 1]; 1 means no intrusions.
 */
export function trustworthiness(X: Matrix, Y: Matrix, k: number, opts: NeighbourhoodOptions = {}): number {
  checkRankInputs(X, Y, k);
  const gX = graphFor(opts.knnX, X, k, 'knnX');
  const gY = graphFor(opts.knnY, Y, k, 'knnY');
  return rankPenaltyScore(X, gX, gY, k, checkRows(opts.rows, X.n), opts.reuseRanks === true ? rowCacheFor(X) : null);
}

/**
 * Continuity C(k) of the embedding Y of X (Venna & Kaski 2001): the same
 * formula as trustworthiness with the two spaces swapped, penalising points
 * that are among i's k nearest neighbours in X but not in Y by their rank in
 * Y. Equals scikit-learn's `trustworthiness(Y, X, n_neighbors=k)` for k < n/2
 * on tie-free data.
 *
 * @param X n × D points in the original space.
 * @param Y n × d embedding of the same points.
 * @param k neighbourhood size, an integer from 1 to n − 2.
 * @param opts precomputed exact kNN graphs (computed here when absent).
 * @returns a number in [0, 1].
 */
export function continuity(X: Matrix, Y: Matrix, k: number, opts: NeighbourhoodOptions = {}): number {
  checkRankInputs(X, Y, k);
  const gX = graphFor(opts.knnX, X, k, 'knnX');
  const gY = graphFor(opts.knnY, Y, k, 'knnY');
  return rankPenaltyScore(Y, gY, gX, k, checkRows(opts.rows, X.n), null);
}

function checkRows(rows: Int32Array | undefined, n: number): Int32Array | null {
  if (rows === undefined) return null;
  if (rows.length === 0) throw new RangeError('rows must not be empty');
  for (let t = 0; t < rows.length; t++) {
    if (!(rows[t] >= 0 && rows[t] < n) || (t > 0 && rows[t] <= rows[t - 1])) {
      throw new RangeError(`rows must be distinct ascending indices in 0..${n - 1}; entry ${t} is ${rows[t]}`);
    }
  }
  return rows;
}

/** Result of comparing two k-nearest-neighbour graphs of the same points. */
export interface KnnOverlap {
  /**
   * Mean over points of s_i / k, where s_i is the number of shared neighbours.
   * For a high-dimensional graph against an embedding graph this is Q_NX(k)
   * of Lee & Verleysen (2009).
   */
  readonly fraction: number;
  /** Mean over points of the Jaccard index s_i / (2k − s_i). */
  readonly jaccard: number;
  /** s_i / k for each point, length n. */
  readonly perPoint: Float64Array;
}

/**
 * Overlap of the k nearest neighbours of each point in two graphs of the same
 * n points (e.g. data vs embedding, or the embeddings of two seeds). Only the
 * first k columns of each graph are used.
 *
 * @param a kNN graph with at least k columns.
 * @param b kNN graph of the same points with at least k columns.
 * @param k neighbourhood size, an integer from 1 to min(a.k, b.k).
 */
export function knnOverlap(a: KnnGraph, b: KnnGraph, k: number): KnnOverlap {
  if (a.n !== b.n) {
    throw new RangeError(`the two kNN graphs describe different numbers of points (${a.n} and ${b.n})`);
  }
  const maxK = Math.min(a.k, b.k);
  if (!Number.isInteger(k) || k < 1 || k > maxK) {
    throw new RangeError(
      `k must be an integer from 1 to ${maxK} (the smaller number of columns of the two graphs); received ${k}`,
    );
  }
  const n = a.n;
  const stamp = new Int32Array(n).fill(-1);
  const perPoint = new Float64Array(n);
  let sumFraction = 0;
  let sumJaccard = 0;
  for (let i = 0; i < n; i++) {
    const ba = i * a.k;
    for (let p = 0; p < k; p++) stamp[a.indices[ba + p]] = i;
    const bb = i * b.k;
    let s = 0;
    for (let p = 0; p < k; p++) if (stamp[b.indices[bb + p]] === i) s++;
    const f = s / k;
    perPoint[i] = f;
    sumFraction += f;
    sumJaccard += s / (2 * k - s);
  }
  return { fraction: sumFraction / n, jaccard: sumJaccard / n, perPoint };
}

/**
 * `knnOverlap` of the exact k-nearest-neighbour graphs of two matrices with
 * the same rows (any dimensions).
 *
 * @param A n × d₁ points.
 * @param B n × d₂ points, same row order.
 * @param k neighbourhood size, an integer from 1 to n − 1.
 */
export function knnOverlapMatrices(A: Matrix, B: Matrix, k: number): KnnOverlap {
  if (A.n !== B.n) throw new RangeError(`the two matrices have different numbers of rows (${A.n} and ${B.n})`);
  checkFinite(A, 'first matrix');
  checkFinite(B, 'second matrix');
  if (!Number.isInteger(k) || k < 1 || k > A.n - 1) {
    throw new RangeError(`k must be an integer from 1 to n − 1 = ${A.n - 1}; received ${k}`);
  }
  return knnOverlap(exactKnn(A, k), exactKnn(B, k), k);
}

// ---------------------------------------------------------------------------

function checkRankInputs(X: Matrix, Y: Matrix, k: number): void {
  if (X.n !== Y.n) {
    throw new RangeError(`X has ${X.n} rows but the embedding has ${Y.n}; they must describe the same points`);
  }
  const n = X.n;
  if (n < 3) throw new RangeError(`at least 3 points are needed; received ${n}`);
  if (!Number.isInteger(k) || k < 1 || k > n - 2) {
    throw new RangeError(`k must be an integer from 1 to n − 2 = ${n - 2} (n = ${n} points); received ${k}`);
  }
  checkFinite(X, 'X');
  checkFinite(Y, 'the embedding');
}

function checkFinite(m: Matrix, name: string): void {
  const data = m.data;
  for (let t = 0; t < m.n * m.d; t++) {
    if (!Number.isFinite(data[t])) {
      throw new RangeError(
        `${name} has a non-finite value (${data[t]}) at row ${Math.floor(t / m.d)}, column ${t % m.d}`,
      );
    }
  }
}

function graphFor(g: KnnGraph | undefined, m: Matrix, k: number, name: string): KnnGraph {
  if (g === undefined) return exactKnn(m, k);
  if (g.n !== m.n) throw new RangeError(`${name} describes ${g.n} points but the matrix has ${m.n}`);
  if (g.k < k) throw new RangeError(`${name} has ${g.k} neighbours per point; at least k = ${k} are needed`);
  return g;
}

/**
 * Shared core of T and C. `H` is the space whose ranks are penalised, `gH` its
 * exact kNN graph (≥ k columns, prefix by (distance, index)); `gL` is the
 * graph whose k-neighbourhoods are checked against H.
 */
function rankPenaltyScore(H: Matrix, gH: KnnGraph, gL: KnnGraph, k: number, rows: Int32Array | null, cache: RowCache | null): number {
  const n = H.n;
  const kh = gH.k;
  const kl = gL.k;
  const hIdx = gH.indices;
  const lIdx = gL.indices;
  const stamp = new Int32Array(n).fill(-1);
  const rankInList = new Int32Array(n);
  const misses = new Int32Array(k);
  const work = new MissRankWork(k, n, cache);
  let penalty = 0;
  const m = rows === null ? n : rows.length;
  for (let t = 0; t < m; t++) {
    const i = rows === null ? t : rows[t];
    const bh = i * kh;
    for (let p = 0; p < kh; p++) {
      const j = hIdx[bh + p];
      stamp[j] = i;
      rankInList[j] = p + 1;
    }
    const bl = i * kl;
    let nm = 0;
    for (let q = 0; q < k; q++) {
      const j = lIdx[bl + q];
      if (stamp[j] === i) {
        const r = rankInList[j];
        if (r > k) penalty += r - k;
      } else {
        misses[nm++] = j;
      }
    }
    if (nm > 0) penalty += work.penalty(H, i, misses, nm, k);
  }
  const G = k < n / 2 ? n * k * (2 * n - 3 * k - 1) : n * (n - k) * (n - k - 1);
  // Same operation order as scikit-learn 1.2.1, so tie-free data agree to the last bit.
  if (rows === null) return 1 - penalty * (2 / G);
  return 1 - ((penalty * n) / m) * (2 / G);
}

/**
 * Exact ranks of points outside a row's cached neighbour list.
 *
 * Counting how many points are closer to i than a miss j needs, in principle,
 * every distance from i. Most points are far away, so they are discarded with
 * a lower bound on their distance first: the points are projected onto a few
 * orthonormal directions (the leading principal axes, or the coordinate axes
 * of largest variance when d ≤ 8); the distance between projections never
 * exceeds the true distance. Points are sorted along the first direction, so
 * only a window of them is visited at all, and the rest of the projection
 * prunes most of that window. Survivors get their exact term-by-term distance.
 * The bounds carry a safety margin far above rounding error, so a point is
 * only skipped when it is certainly farther than every miss.
 */
class MissRankWork {
  /** Squared distances of the misses, sorted by (distance, index). */
  private readonly missD: Float64Array;
  private readonly missJ: Int32Array;
  /** diff[p] = number of points that precede exactly the misses p, p+1, … */
  private readonly diff: Float64Array;
  private frame: PruneFrame | null = null;
  /** Points found within the scan radius of the current row (filled only when caching). */
  private foundJ: Int32Array | null = null;
  private foundD: Float64Array | null = null;

  constructor(
    k: number,
    private readonly n: number,
    private readonly cache: RowCache | null,
  ) {
    this.missD = new Float64Array(k);
    this.missJ = new Int32Array(k);
    this.diff = new Float64Array(k + 1);
    if (cache !== null) this.frame = cache.frame;
  }

  /** Σ (rank − k) over the sorted misses, given diff[p] = points preceding exactly misses p, p+1, …. */
  private total(nm: number, k: number): number {
    const diff = this.diff;
    let total = 0;
    let before = 0;
    for (let t = 0; t < nm; t++) {
      before += diff[t];
      total += before + 1 - k;
    }
    return total;
  }

  /** Count point (s, m) against the sorted misses: it precedes misses lo … nm−1. */
  private place(s: number, m: number, nm: number): void {
    const missD = this.missD;
    const missJ = this.missJ;
    let lo = 0;
    let hi = nm;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      const md = missD[mid];
      if (md < s || (md === s && missJ[mid] < m)) lo = mid + 1;
      else hi = mid;
    }
    // (s, m) equals a miss only when m is that miss; it does not precede itself.
    if (lo < nm && missJ[lo] === m) lo++;
    this.diff[lo]++;
  }

  /**
   * Σ over the given points j of (ρ(i,j) − k), where
   * ρ(i,j) = 1 + #{m ≠ i : (dist(i,m), m) < (dist(i,j), j)} in H.
   */
  penalty(H: Matrix, i: number, misses: Int32Array, nm: number, k: number): number {
    const d = H.d;
    const data = H.data;
    const oi = i * d;
    const missD = this.missD;
    const missJ = this.missJ;
    // Insertion sort of the misses by (squared distance, index).
    for (let t = 0; t < nm; t++) {
      const j = misses[t];
      const oj = j * d;
      let s = 0;
      for (let c = 0; c < d; c++) {
        const dv = data[oi + c] - data[oj + c];
        s += dv * dv;
      }
      let p = t;
      while (p > 0 && (missD[p - 1] > s || (missD[p - 1] === s && missJ[p - 1] > j))) {
        missD[p] = missD[p - 1];
        missJ[p] = missJ[p - 1];
        p--;
      }
      missD[p] = s;
      missJ[p] = j;
    }
    const thr = missD[nm - 1];
    const diff = this.diff;
    diff.fill(0, 0, nm + 1);
    const cache = this.cache;
    if (cache !== null && cache.radius2[i] >= thr) {
      // Every point that can precede a miss lies within the cached radius.
      const found = cache.points[i]!;
      const dist = cache.dists[i]!;
      for (let e = 0; e < found.length; e++) {
        const sv = dist[e];
        if (sv <= thr) this.place(sv, found[e], nm);
      }
      return this.total(nm, k);
    }
    // With a cache, scan a little farther than this row needs, so that later maps'
    // intruders of this row usually fall inside what is kept.
    const reach = cache !== null ? thr * ROW_CACHE_REACH2 : thr;
    let nFound = 0;
    if (cache !== null && this.foundJ === null) {
      this.foundJ = new Int32Array(this.n);
      this.foundD = new Float64Array(this.n);
    }
    const foundJ = this.foundJ;
    const foundD = this.foundD;
    const frame = (this.frame ??= buildPruneFrame(H));
    if (cache !== null) cache.frame ??= frame;
    const r = frame.r;
    const P = frame.proj;
    const sortedP = frame.sortedProj;
    const sortedX = frame.sortedData;
    const order = frame.order;
    const key = frame.key;
    const bound = Math.sqrt(reach) * (1 + 1e-9) + frame.margin;
    const pruneThr = bound * bound;
    const pi = i * r;
    const centre = P[pi];
    const lo0 = lowerBound(key, centre - bound);
    const hi0 = upperBound(key, centre + bound, lo0);

    for (let w = lo0; w < hi0; w++) {
      const m = order[w];
      if (m === i) continue;
      const pm = w * r;
      let lb = 0;
      for (let q = 0; q < r; q++) {
        const dv = P[pi + q] - sortedP[pm + q];
        lb += dv * dv;
      }
      if (lb > pruneThr) continue;
      const om = w * d;
      // Exact distance (same values and order of summation as from the
      // original rows), abandoned once it exceeds the farthest miss: partial
      // sums of non-negative terms never decrease, also in floating point.
      let s = 0;
      let c = 0;
      while (c < d) {
        const end = c + 8 < d ? c + 8 : d;
        for (; c < end; c++) {
          const dv = data[oi + c] - sortedX[om + c];
          s += dv * dv;
        }
        if (s > reach) break;
      }
      if (s > reach) continue;
      if (foundJ !== null && foundD !== null) {
        foundJ[nFound] = m;
        foundD[nFound] = s;
        nFound++;
      }
      if (s <= thr) this.place(s, m, nm);
    }
    if (cache !== null && foundJ !== null && foundD !== null) cache.keep(i, reach, foundJ, foundD, nFound);
    return this.total(nm, k);
  }
}

/** Squared factor by which a cached row's scan reaches past its farthest intruder (1.2 in distance). */
const ROW_CACHE_REACH2 = 1.44;
/** Most point entries one row cache keeps (12 bytes each: about 200 MB). */
export const ROW_CACHE_BUDGET = 16_000_000;

/**
 * Per row of one matrix H: every other point within a squared radius of it
 * (unsorted, with its squared distance), for answering later rank queries
 * without a scan; plus H's prune frame. Tied to H's data array, so it lives
 * as long as the data and is never stale (the data are not modified).
 */
class RowCache {
  /** Squared radius covered per row (−1: nothing kept). */
  readonly radius2: Float64Array;
  readonly points: Array<Int32Array | null>;
  readonly dists: Array<Float64Array | null>;
  frame: PruneFrame | null = null;
  private entries = 0;

  constructor(n: number) {
    this.radius2 = new Float64Array(n).fill(-1);
    this.points = new Array<Int32Array | null>(n).fill(null);
    this.dists = new Array<Float64Array | null>(n).fill(null);
  }

  /** Keep row i's points found within squared radius `reach` (the first `count` of the arrays), budget permitting. */
  keep(i: number, reach: number, found: Int32Array, dist: Float64Array, count: number): void {
    const old = this.points[i]?.length ?? 0;
    if (this.entries - old + count > ROW_CACHE_BUDGET) return;
    this.entries += count - old;
    this.points[i] = found.slice(0, count);
    this.dists[i] = dist.slice(0, count);
    this.radius2[i] = reach;
  }
}

const rowCaches = new WeakMap<Float64Array, RowCache>();

function rowCacheFor(H: Matrix): RowCache {
  let c = rowCaches.get(H.data);
  if (c === undefined || c.radius2.length !== H.n) {
    c = new RowCache(H.n);
    rowCaches.set(H.data, c);
  }
  return c;
}

/** Projections used to skip far points; see `MissRankWork`. */
interface PruneFrame {
  /** Number of directions. */
  readonly r: number;
  /** n × r projections. */
  readonly proj: Float64Array;
  /** Points sorted by their first projection … */
  readonly order: Int32Array;
  /** … and those first projections, ascending. */
  readonly key: Float64Array;
  /** Projections in `order` (n × r), so a window is read sequentially. */
  readonly sortedProj: Float64Array;
  /** The rows of H in `order` (n × d), likewise. */
  readonly sortedData: Float64Array;
  /** Absolute slack added to distance bounds to cover rounding in the projections. */
  readonly margin: number;
}

const PRUNE_DIRECTIONS = 8;

function buildPruneFrame(H: Matrix): PruneFrame {
  const { n, d, data } = H;
  const mean = new Float64Array(d);
  for (let i = 0; i < n; i++) for (let c = 0; c < d; c++) mean[c] += data[i * d + c];
  for (let c = 0; c < d; c++) mean[c] /= n;
  const variance = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < d; c++) {
      const v = data[i * d + c] - mean[c];
      variance[c] += v * v;
    }
  }
  const byVariance = Array.from({ length: d }, (_, c) => c).sort((a, b) => variance[b] - variance[a] || a - b);

  let r: number;
  let proj: Float64Array;
  let margin: number;
  if (d <= PRUNE_DIRECTIONS) {
    // Coordinate axes: each projected difference is exactly one term of the
    // distance sum, so the bound is exact up to the order of summation.
    r = d;
    proj = new Float64Array(n * r);
    for (let i = 0; i < n; i++) for (let q = 0; q < r; q++) proj[i * r + q] = data[i * d + byVariance[q]];
    margin = 0;
  } else {
    const V = leadingAxes(H, mean, byVariance.slice(0, PRUNE_DIRECTIONS));
    r = V.length / d;
    proj = new Float64Array(n * r);
    let maxNorm2 = 0;
    for (let i = 0; i < n; i++) {
      let norm2 = 0;
      for (let c = 0; c < d; c++) {
        const v = data[i * d + c] - mean[c];
        norm2 += v * v;
      }
      if (norm2 > maxNorm2) maxNorm2 = norm2;
      for (let q = 0; q < r; q++) {
        let s = 0;
        for (let c = 0; c < d; c++) s += (data[i * d + c] - mean[c]) * V[q * d + c];
        proj[i * r + q] = s;
      }
    }
    // Rounding in a projection is below d·ε·‖x − mean‖ per coordinate; the
    // margin is many orders of magnitude above that.
    margin = 1e-9 * Math.sqrt(maxNorm2);
  }
  const order = Int32Array.from({ length: n }, (_, i) => i);
  order.sort((a, b) => proj[a * r] - proj[b * r] || a - b);
  const key = new Float64Array(n);
  const sortedProj = new Float64Array(n * r);
  const sortedData = new Float64Array(n * d);
  for (let w = 0; w < n; w++) {
    const m = order[w];
    key[w] = proj[m * r];
    sortedProj.set(proj.subarray(m * r, (m + 1) * r), w * r);
    sortedData.set(data.subarray(m * d, (m + 1) * d), w * d);
  }
  return { r, proj, order, key, margin, sortedProj, sortedData };
}

/**
 * Up to `start.length` orthonormal directions (rows of the result, each of
 * length d) spanning approximately the leading principal subspace of H:
 * a few steps of subspace iteration from the coordinate axes of largest
 * variance, orthonormalised by Gram–Schmidt (twice). Only orthonormality
 * matters for the distance bound; accuracy of the subspace only affects speed.
 */
function leadingAxes(H: Matrix, mean: Float64Array, start: number[]): Float64Array {
  const { n, d, data } = H;
  let r = start.length;
  let V: Float64Array = new Float64Array(r * d);
  start.forEach((c, q) => {
    V[q * d + c] = 1;
  });
  const Z = new Float64Array(n * r);
  for (let iter = 0; iter < 4; iter++) {
    // Z = (X − mean) Vᵀ, then W = (X − mean)ᵀ Z
    for (let i = 0; i < n; i++) {
      for (let q = 0; q < r; q++) {
        let s = 0;
        for (let c = 0; c < d; c++) s += (data[i * d + c] - mean[c]) * V[q * d + c];
        Z[i * r + q] = s;
      }
    }
    const W = new Float64Array(r * d);
    for (let i = 0; i < n; i++) {
      for (let c = 0; c < d; c++) {
        const x = data[i * d + c] - mean[c];
        for (let q = 0; q < r; q++) W[q * d + c] += x * Z[i * r + q];
      }
    }
    const kept = orthonormalRows(W, r, d);
    r = kept.length / d;
    V = kept;
    if (r === 0) break;
  }
  if (r === 0) {
    // Degenerate data (all points equal): fall back to one coordinate axis.
    V = new Float64Array(d);
    V[start[0]] = 1;
  }
  return V;
}

/** Modified Gram–Schmidt, applied twice; rows that vanish are dropped. */
function orthonormalRows(W: Float64Array, r: number, d: number): Float64Array {
  const rows: Float64Array[] = [];
  let firstNorm = 0;
  for (let q = 0; q < r; q++) {
    const v = W.slice(q * d, (q + 1) * d);
    let norm0 = 0;
    for (let c = 0; c < d; c++) norm0 += v[c] * v[c];
    norm0 = Math.sqrt(norm0);
    if (q === 0) firstNorm = norm0;
    for (let pass = 0; pass < 2; pass++) {
      for (const u of rows) {
        let dot = 0;
        for (let c = 0; c < d; c++) dot += u[c] * v[c];
        for (let c = 0; c < d; c++) v[c] -= dot * u[c];
      }
    }
    let norm = 0;
    for (let c = 0; c < d; c++) norm += v[c] * v[c];
    norm = Math.sqrt(norm);
    if (!(norm > 1e-10 * firstNorm) || norm === 0) continue;
    for (let c = 0; c < d; c++) v[c] /= norm;
    rows.push(v);
  }
  const out = new Float64Array(rows.length * d);
  rows.forEach((v, q) => out.set(v, q * d));
  return out;
}

/** First position whose value is ≥ x. */
function lowerBound(a: Float64Array, x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First position from `from` on whose value is > x. */
function upperBound(a: Float64Array, x: number, from: number): number {
  let lo = from;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Rank-based quality curves of an embedding: the co-ranking matrix, Q_NX(K),
 * R_NX(K) and the area under R_NX against log K (Lee & Verleysen, "Quality
 * assessment of dimensionality reduction: rank-based criteria",
 * Neurocomputing 72 (2009) 1431–1443; Lee, Peluffo-Ordóñez & Verleysen,
 * "Multi-scale similarities in stochastic neighbour embedding: reducing
 * dimensionality while preserving both local and global structure",
 * Neurocomputing 169 (2015) 246–261).
 *
 * Ranks: for a query point i the other n − 1 points are ordered by
 * (squared distance, index), squared distances summed term by term, so of two
 * points at the same distance the lower index ranks first; ρ(i,j) ∈ 1..n−1 in
 * the data, r(i,j) in the map.
 *
 * Q_NX(K) = (1/(K·q)) Σ_i |{j : ρ(i,j) ≤ K and r(i,j) ≤ K}| over q query
 * points (q = n when every point is a query: the exact value). A point pair
 * is inside both K-neighbourhoods exactly when max(ρ, r) ≤ K, so one pass per
 * query gives the whole curve. Memory is one data rank row per query (a
 * `RankTable`, 4·q·n bytes) plus O(n) work space; with sampled queries no
 * n × n array is formed, and the co-ranking matrix itself is only built for
 * small n (`coRankingMatrix`). Each map rank row is O(n) (`RankWork`).
 */
import type { Matrix } from '../core/types.js';
import type { Rng } from '../core/rng.js';
import { HIGH_WORD, radixOrder } from './sorting.js';

/** n at or below which every point is a query point (exact curves) by default. */
export const RNX_EXACT_LIMIT = 2000;
/** Query points sampled above `RNX_EXACT_LIMIT` by default. */
export const RNX_SAMPLE_ROWS = 1000;

/** Data-space ranks of some query rows against all points. */
export interface RankTable {
  /** Number of points ranked. */
  readonly n: number;
  /** The m query rows, ascending. */
  readonly rows: Int32Array;
  /**
   * m × n, row-major: ranks[t·n + j] = ρ(rows[t], j) ∈ 1..n−1, and 0 at
   * j = rows[t] (the query itself).
   */
  readonly ranks: Int32Array;
}

/** Q_NX and R_NX curves over all neighbourhood sizes, and their AUC. */
export interface RnxCurves {
  /** Number of points ranked (the map's rows). */
  readonly n: number;
  /** Number of query points the curves average over (n when exact). */
  readonly queries: number;
  /** Length n − 1: qnx[K − 1] = Q_NX(K), K = 1..n−1. */
  readonly qnx: Float64Array;
  /** Length n − 2: rnx[K − 1] = R_NX(K) = ((n−1)·Q_NX(K) − K)/(n − 1 − K), K = 1..n−2. */
  readonly rnx: Float64Array;
  /** AUC_logK = Σ_K R_NX(K)/K / Σ_K 1/K over K = 1..n−2. */
  readonly auc: number;
  /**
   * Standard error of `auc` as an estimate of the all-points value: the AUC is
   * a mean of per-query values, so SE = sd/√q · √(1 − q/n) (sampling without
   * replacement). 0 when every point is a query.
   */
  readonly aucStandardError: number;
}

/**
 * `queries` distinct rows out of n, drawn by a partial Fisher–Yates shuffle
 * with `rng` (advanced `queries` times), returned ascending.
 */
export function sampleRows(n: number, queries: number, rng: Rng): Int32Array {
  if (!Number.isInteger(queries) || queries < 1 || queries > n) {
    throw new RangeError(`the sample size must be an integer from 1 to n = ${n}; received ${queries}`);
  }
  const perm = Int32Array.from({ length: n }, (_, i) => i);
  for (let t = 0; t < queries; t++) {
    const u = t + rng.int(n - t);
    const tmp = perm[t];
    perm[t] = perm[u];
    perm[u] = tmp;
  }
  return perm.slice(0, queries).sort();
}

/**
 * Ranks of all points around each query row of X (see `RankTable`).
 * Cost O(m·n·(d + log n)) time, 4·m·n bytes.
 *
 * @param X n × d points.
 * @param rows ascending query rows (default: every row, the exact case).
 */
export function rankTable(X: Matrix, rows?: Int32Array): RankTable {
  const n = X.n;
  checkFinite(X, 'the data');
  const q = rows ?? Int32Array.from({ length: n }, (_, i) => i);
  let prev = -1;
  for (const r of q) {
    if (r <= prev || r >= n) throw new RangeError(`query rows must be strictly ascending rows of 0..${n - 1}`);
    prev = r;
  }
  const ranks = new Int32Array(q.length * n);
  const work = new RankWork(n);
  for (let t = 0; t < q.length; t++) work.rankRow(X, q[t], ranks.subarray(t * n, (t + 1) * n));
  return { n, rows: q, ranks };
}

/**
 * Q_NX / R_NX curves of the map Y against a data-space `RankTable`.
 *
 * Without `rows`, Y has the table's n rows in the same order and the table's
 * query rows are the queries. With `rows` (the ascending dataset rows Y
 * covers, Y row t = dataset row rows[t]) the curves are those of the data
 * restricted to these rows: the queries are the table's query rows that Y
 * covers, and their data ranks among the covered rows are read off the
 * stored ranks (O(n) per query, no distances recomputed).
 *
 * Cost per query O(m·(d + log m)) for the map ranks, m = Y.n.
 *
 * @throws RangeError when no query row is covered, or shapes disagree.
 */
export function rnxFromTable(table: RankTable, Y: Matrix, rows?: Int32Array): RnxCurves {
  const N = table.n;
  const m = Y.n;
  checkFinite(Y, 'the map');
  if (rows === undefined && m !== N) {
    throw new RangeError(`the map has ${m} rows but the rank table ranks ${N} points; pass the rows the map covers`);
  }
  if (rows !== undefined && rows.length !== m) {
    throw new RangeError(`the map has ${m} rows but ${rows.length} dataset rows were given`);
  }
  if (m < 3) throw new RangeError(`at least 3 points are needed; received ${m}`);
  const posY = new Int32Array(N).fill(-1);
  if (rows === undefined) for (let j = 0; j < N; j++) posY[j] = j;
  else {
    let prev = -1;
    for (let t = 0; t < m; t++) {
      if (rows[t] <= prev || rows[t] >= N) throw new RangeError(`rows must be strictly ascending rows of 0..${N - 1}`);
      prev = rows[t];
      posY[rows[t]] = t;
    }
  }
  const subset = rows !== undefined && m < N;

  const totals = new Float64Array(m); // totals[K] = Σ_queries |shared K-neighbourhood|
  const counts = new Int32Array(m);
  const dataRank = subset ? new Int32Array(m) : null;
  const order = subset ? new Int32Array(N) : null;
  const work = new RankWork(m);
  // Per-query AUC: with q_K shared members, R(K)/K = (m−1)·q_K / (K²(m−1−K)) − 1/(m−1−K),
  // and Σ_K 1/(m−1−K) = Σ_K 1/K = H, so AUC_query = Σ_K q_K·w[K] / H − 1.
  const w = new Float64Array(m);
  let H = 0;
  for (let K = 1; K <= m - 2; K++) {
    w[K] = (m - 1) / (K * K * (m - 1 - K));
    H += 1 / K;
  }
  let queries = 0;
  let aucSum = 0;
  let aucSq = 0;
  for (let t = 0; t < table.rows.length; t++) {
    const g = table.rows[t];
    const r = posY[g];
    if (r < 0) continue;
    const full = table.ranks.subarray(t * N, (t + 1) * N);
    let rho: Int32Array;
    if (dataRank !== null && order !== null) {
      for (let j = 0; j < N; j++) order[full[j]] = j;
      let c = 0;
      dataRank[r] = 0;
      for (let p = 1; p < N; p++) {
        const local = posY[order[p]];
        if (local >= 0) dataRank[local] = ++c;
      }
      rho = dataRank;
    } else {
      rho = full;
    }
    // Walk the map order: the p-th other point has map rank p + 1.
    const byMap = work.sortedOthers(Y, r);
    counts.fill(0);
    for (let p = 0; p < m - 1; p++) {
      const a = rho[byMap[p]];
      const b = p + 1;
      counts[a > b ? a : b]++;
    }
    let cum = 0;
    let s = 0;
    for (let K = 1; K < m; K++) {
      cum += counts[K];
      totals[K] += cum;
      s += cum * w[K];
    }
    const a = s / H - 1;
    aucSum += a;
    aucSq += a * a;
    queries++;
  }
  if (queries === 0) throw new RangeError('none of the query rows is covered by the map');

  const qnx = new Float64Array(m - 1);
  const rnx = new Float64Array(m - 2);
  for (let K = 1; K < m; K++) qnx[K - 1] = totals[K] / (K * queries);
  for (let K = 1; K <= m - 2; K++) rnx[K - 1] = ((m - 1) * qnx[K - 1] - K) / (m - 1 - K);
  const auc = aucLogK(rnx);
  let se = 0;
  if (queries < m && queries > 1) {
    const mean = aucSum / queries;
    const variance = Math.max(0, (aucSq - queries * mean * mean) / (queries - 1));
    se = Math.sqrt(variance / queries) * Math.sqrt(1 - queries / m);
  }
  return { n: m, queries, qnx, rnx, auc, aucStandardError: se };
}

/**
 * Q_NX / R_NX curves of the embedding Y of X (same rows), exact when
 * `queryRows` is absent (every point a query; O(n²) time, 4n² bytes for the
 * data ranks), otherwise estimated from the given query rows with ranks
 * still taken against all n points.
 */
export function rnxCurves(X: Matrix, Y: Matrix, queryRows?: Int32Array): RnxCurves {
  if (X.n !== Y.n) throw new RangeError(`X has ${X.n} rows but the map has ${Y.n}`);
  return rnxFromTable(rankTable(X, queryRows), Y);
}

/**
 * AUC of an R_NX curve on a log K axis (Lee, Peluffo-Ordóñez & Verleysen
 * 2015): Σ_K R_NX(K)/K / Σ_K 1/K, K = 1..L, with rnx[K − 1] = R_NX(K).
 */
export function aucLogK(rnx: Float64Array): number {
  let num = 0;
  let den = 0;
  for (let K = 1; K <= rnx.length; K++) {
    num += rnx[K - 1] / K;
    den += 1 / K;
  }
  return num / den;
}

/**
 * About `count` neighbourhood sizes spaced evenly on a log scale from 1 to
 * maxK (rounded to integers, duplicates removed, both ends included).
 */
export function logSpacedK(maxK: number, count = 40): number[] {
  if (!Number.isInteger(maxK) || maxK < 1) throw new RangeError(`maxK must be a positive integer; received ${maxK}`);
  const out: number[] = [];
  const top = Math.log(maxK);
  for (let t = 0; t < count; t++) {
    const K = t === count - 1 ? maxK : Math.max(1, Math.round(Math.exp((top * t) / Math.max(1, count - 1))));
    if (out.length === 0 || K > out[out.length - 1]) out.push(K);
  }
  return out;
}

/**
 * The co-ranking matrix (Lee & Verleysen 2009): (n−1) × (n−1), row-major,
 * Q[(k−1)(n−1) + (l−1)] = number of ordered pairs (i, j), i ≠ j, with data
 * rank ρ(i,j) = k and map rank r(i,j) = l. Every row and column sums to n.
 * Builds full rank rows for both spaces: O(n²) memory, so n is limited to
 * `RNX_EXACT_LIMIT` (use `rnxCurves` for the curves at any size).
 */
export function coRankingMatrix(X: Matrix, Y: Matrix): Int32Array {
  const n = X.n;
  if (Y.n !== n) throw new RangeError(`X has ${n} rows but the map has ${Y.n}`);
  if (n < 2 || n > RNX_EXACT_LIMIT) {
    throw new RangeError(`the co-ranking matrix is built for 2 to ${RNX_EXACT_LIMIT} points; received ${n}`);
  }
  checkFinite(X, 'the data');
  checkFinite(Y, 'the map');
  const Q = new Int32Array((n - 1) * (n - 1));
  const wx = new RankWork(n);
  const wy = new RankWork(n);
  const rx = new Int32Array(n);
  const ry = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    wx.rankRow(X, i, rx);
    wy.rankRow(Y, i, ry);
    for (let j = 0; j < n; j++) if (j !== i) Q[(rx[j] - 1) * (n - 1) + (ry[j] - 1)]++;
  }
  return Q;
}

/**
 * Trustworthiness T(K) from a co-ranking matrix (Lee & Verleysen 2009 show
 * it is a weighted block sum): T(K) = 1 − (2/G_K) Σ_{k>K} Σ_{l≤K} (k − K)·Q_kl,
 * G_K = n·K·(2n − 3K − 1) for K < n/2, n·(n − K)·(n − K − 1) otherwise.
 *
 * @param Q co-ranking matrix of n points ((n−1)², as `coRankingMatrix`).
 * @param K neighbourhood size, 1..n−2.
 */
export function trustworthinessFromCoRanking(Q: Int32Array, K: number): number {
  const n = pointsOf(Q, K);
  let penalty = 0;
  for (let k = K + 1; k <= n - 1; k++) {
    for (let l = 1; l <= K; l++) penalty += (k - K) * Q[(k - 1) * (n - 1) + (l - 1)];
  }
  return 1 - penalty * (2 / normaliser(n, K));
}

/**
 * Continuity C(K) from a co-ranking matrix (Lee & Verleysen 2009):
 * C(K) = 1 − (2/G_K) Σ_{k≤K} Σ_{l>K} (l − K)·Q_kl, G_K as for T(K).
 */
export function continuityFromCoRanking(Q: Int32Array, K: number): number {
  const n = pointsOf(Q, K);
  let penalty = 0;
  for (let k = 1; k <= K; k++) {
    for (let l = K + 1; l <= n - 1; l++) penalty += (l - K) * Q[(k - 1) * (n - 1) + (l - 1)];
  }
  return 1 - penalty * (2 / normaliser(n, K));
}

// ---------------------------------------------------------------------------

function pointsOf(Q: Int32Array, K: number): number {
  const side = Math.round(Math.sqrt(Q.length));
  if (side * side !== Q.length) throw new RangeError('the co-ranking matrix must be square');
  const n = side + 1;
  if (!Number.isInteger(K) || K < 1 || K > n - 2) {
    throw new RangeError(`K must be an integer from 1 to n − 2 = ${n - 2}; received ${K}`);
  }
  return n;
}

function normaliser(n: number, K: number): number {
  return K < n / 2 ? n * K * (2 * n - 3 * K - 1) : n * (n - K) * (n - K - 1);
}

function checkFinite(m: Matrix, name: string): void {
  const data = m.data;
  for (let t = 0; t < m.n * m.d; t++) {
    if (!Number.isFinite(data[t])) {
      throw new RangeError(`${name} has a non-finite value (${data[t]}) at row ${Math.floor(t / m.d)}`);
    }
  }
}

/**
 * Work space for ranking all points around one of them by (squared distance,
 * index), with the linear-time `radixOrder` of ./sorting.ts (keys = high 32
 * bits of the squared distances, which for non-negative doubles order like
 * the values; exact order inside equal keys). Ties go to the lower index.
 */
export class RankWork {
  private readonly d64: Float64Array;
  private readonly words: Uint32Array;
  private readonly keys: Uint32Array;
  private readonly a: Int32Array;
  private readonly b: Int32Array;
  private readonly hist = new Int32Array(3 * 2048);

  constructor(n: number) {
    this.d64 = new Float64Array(n);
    this.words = new Uint32Array(this.d64.buffer);
    this.keys = new Uint32Array(n);
    this.a = new Int32Array(n);
    this.b = new Int32Array(n);
  }

  /** out[j] = rank of j around i among the rows of M (1 = nearest), out[i] = 0. */
  rankRow(M: Matrix, i: number, out: Int32Array): void {
    const order = this.sortedOthers(M, i);
    out[i] = 0;
    for (let p = 0; p < order.length; p++) out[order[p]] = p + 1;
  }

  /**
   * The other rows of M ordered by (squared distance to row i, index).
   * Returns a view into the work space (length M.n − 1), valid until the next call.
   */
  sortedOthers(M: Matrix, i: number): Int32Array {
    const { n, d, data } = M;
    const d64 = this.d64;
    const oi = i * d;
    if (d === 2) {
      const x = data[oi];
      const y = data[oi + 1];
      for (let j = 0; j < n; j++) {
        const dx = x - data[2 * j];
        const dy = y - data[2 * j + 1];
        d64[j] = dx * dx + dy * dy;
      }
    } else {
      for (let j = 0; j < n; j++) {
        const oj = j * d;
        let s = 0;
        for (let c = 0; c < d; c++) {
          const diff = data[oi + c] - data[oj + c];
          s += diff * diff;
        }
        d64[j] = s;
      }
    }
    const keys = this.keys;
    const words = this.words;
    for (let j = 0; j < n; j++) keys[j] = words[2 * j + HIGH_WORD];
    const idx = this.a;
    let m = 0;
    for (let j = 0; j < n; j++) if (j !== i) idx[m++] = j;
    return radixOrder(this.keys, d64, idx, this.b, m, this.hist).subarray(0, m);
  }
}

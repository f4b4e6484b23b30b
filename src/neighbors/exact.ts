/**
 * Exact k-nearest-neighbour graphs by blocked brute force.
 *
 * Tie rule: neighbours are ordered by (squared distance, index) ascending, so
 * of two points at the same distance the lower index comes first and enters
 * the k-set first. Squared distances are summed term by term as Σ_t (a_t − b_t)²
 * in column order — the same arithmetic as `sqDist` in src/core/matrix.ts — so
 * equal distances stay exactly equal (the ‖a‖² + ‖b‖² − 2a·b shortcut would
 * break such ties by rounding).
 */
import type { KnnGraph, Matrix } from '../core/types.js';

/** Rows per block: two blocks of 64 rows at d = 50 plus the 64 × 64 distance tile fit in L1/L2. */
const BLOCK = 64;

/**
 * The k nearest neighbours of every row of `m` (n × d) among the other rows,
 * self excluded, in Euclidean distance, sorted by (distance, index) ascending.
 * Returns n × k indices (Int32Array) and the matching distances (not squared).
 * Requires 1 ≤ k ≤ n − 1 (RangeError otherwise) and finite entries.
 *
 * Cost: n²·d/2 subtract-multiply-adds (each pair once, offered to both rows),
 * memory O(n·k). Rows are processed in blocks of 64 against blocks of 64, with a
 * 4 × 4 register tile in the distance loop; each row keeps its best k in a
 * bounded max-heap whose top (the current k-th distance) rejects most
 * candidates with one comparison; the heaps are sorted at the end.
 */
export function exactKnn(m: Matrix, k: number): KnnGraph {
  const { n, d, data } = m;
  if (!Number.isInteger(k) || k < 1 || k > n - 1) {
    throw new RangeError(`k must be an integer in 1..n−1 = 1..${n - 1}, got ${k}`);
  }
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i])) {
      throw new RangeError(`kNN input has a non-finite value at row ${Math.floor(i / d)}, column ${i % d}`);
    }
  }

  const idx = new Int32Array(n * k);
  const dist = new Float64Array(n * k); // squared while searching
  const count = new Int32Array(n);
  // Entry threshold per row: +∞ until the row holds k candidates, then its k-th squared distance.
  const worst = new Float64Array(n).fill(Number.POSITIVE_INFINITY);
  const tile = new Float64Array(BLOCK * BLOCK);

  // Offers reach each row in increasing candidate index: for query block a,
  // blocks b ≥ a are visited in order; a row of block b hears from block a
  // (a < b) while a is the query block, from its own block when a = b, and
  // from later blocks afterwards. So an incoming candidate that ties with the
  // current k-th distance always has the higher index and is rejected.
  for (let a0 = 0; a0 < n; a0 += BLOCK) {
    const na = Math.min(BLOCK, n - a0);
    for (let b0 = a0; b0 < n; b0 += BLOCK) {
      const nb = Math.min(BLOCK, n - b0);
      if (b0 === a0) {
        diagonalTile(data, d, a0, na, tile);
        for (let i = 0; i < na; i++) {
          const row = a0 + i;
          const to = i * BLOCK;
          for (let j = 0; j < nb; j++) {
            if (j !== i && tile[to + j] < worst[row]) offer(row, a0 + j, tile[to + j], k, idx, dist, count, worst);
          }
        }
      } else {
        distanceTile(data, d, a0, na, b0, nb, tile);
        for (let i = 0; i < na; i++) {
          const row = a0 + i;
          const to = i * BLOCK;
          let w = worst[row];
          for (let j = 0; j < nb; j++) {
            const v = tile[to + j];
            if (v < w) {
              offer(row, b0 + j, v, k, idx, dist, count, worst);
              w = worst[row];
            }
          }
        }
        for (let j = 0; j < nb; j++) {
          const row = b0 + j;
          let w = worst[row];
          for (let i = 0; i < na; i++) {
            const v = tile[i * BLOCK + j];
            if (v < w) {
              offer(row, a0 + i, v, k, idx, dist, count, worst);
              w = worst[row];
            }
          }
        }
      }
    }
  }
  for (let row = 0; row < n; row++) sortHeap(row * k, k, idx, dist);
  for (let i = 0; i < dist.length; i++) dist[i] = Math.sqrt(dist[i]);
  return { n, k, indices: idx, distances: dist };
}

/**
 * The k nearest neighbours of every row, by whichever search suits the size.
 * Today this is always `exactKnn` (exact, deterministic). It is the single
 * entry point that may switch to an approximate search (e.g. NN-descent)
 * above about 20 000 rows; callers that need exactness should call
 * `exactKnn` directly.
 */
export function knnOf(m: Matrix, k: number): KnnGraph {
  return exactKnn(m, k);
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

/**
 * Each row's candidates live in a binary max-heap over (squared distance,
 * index), compared lexicographically, in dist/idx[row·k .. row·k + k).
 * Candidates arrive in increasing index order and only when v < worst[row],
 * so a candidate that ties with the current maximum never enters: among equal
 * distances the lower indices are kept.
 */
function offer(
  row: number,
  cand: number,
  v: number,
  k: number,
  idx: Int32Array,
  dist: Float64Array,
  count: Int32Array,
  worst: Float64Array,
): void {
  const base = row * k;
  const c = count[row];
  if (c < k) {
    // Sift up from the new leaf.
    let p = c;
    while (p > 0) {
      const parent = (p - 1) >> 1;
      const pd = dist[base + parent];
      if (pd > v || (pd === v && idx[base + parent] > cand)) break;
      dist[base + p] = pd;
      idx[base + p] = idx[base + parent];
      p = parent;
    }
    dist[base + p] = v;
    idx[base + p] = cand;
    count[row] = c + 1;
    if (c + 1 === k) worst[row] = dist[base];
    return;
  }
  siftDown(base, k, v, cand, idx, dist);
  worst[row] = dist[base];
}

/** Put (v, cand) at the root of the max-heap at `base` of size `size` and sift it down. */
function siftDown(base: number, size: number, v: number, cand: number, idx: Int32Array, dist: Float64Array): void {
  let p = 0;
  for (;;) {
    let child = 2 * p + 1;
    if (child >= size) break;
    let cd = dist[base + child];
    let ci = idx[base + child];
    const right = child + 1;
    if (right < size) {
      const rd = dist[base + right];
      const ri = idx[base + right];
      if (rd > cd || (rd === cd && ri > ci)) {
        child = right;
        cd = rd;
        ci = ri;
      }
    }
    if (cd < v || (cd === v && ci < cand)) break;
    dist[base + p] = cd;
    idx[base + p] = ci;
    p = child;
  }
  dist[base + p] = v;
  idx[base + p] = cand;
}

/** Heapsort a full max-heap in place into ascending (distance, index) order. */
function sortHeap(base: number, size: number, idx: Int32Array, dist: Float64Array): void {
  for (let end = size - 1; end > 0; end--) {
    const topD = dist[base];
    const topI = idx[base];
    const lastD = dist[base + end];
    const lastI = idx[base + end];
    siftDown(base, end, lastD, lastI, idx, dist);
    dist[base + end] = topD;
    idx[base + end] = topI;
  }
}

/**
 * Squared distances between rows a0..a0+na−1 and b0..b0+nb−1 of `x` (n × d)
 * into tile[i·BLOCK + j]. Each pair is summed in column order, as `sqDist`.
 */
function distanceTile(
  x: Float64Array,
  d: number,
  a0: number,
  na: number,
  b0: number,
  nb: number,
  tile: Float64Array,
): void {
  const na4 = na - (na % 4);
  const nb4 = nb - (nb % 4);
  for (let i = 0; i < na4; i += 4) {
    const p0 = (a0 + i) * d;
    const p1 = p0 + d;
    const p2 = p1 + d;
    const p3 = p2 + d;
    for (let j = 0; j < nb4; j += 4) {
      const q0 = (b0 + j) * d;
      const q1 = q0 + d;
      const q2 = q1 + d;
      const q3 = q2 + d;
      let s00 = 0, s01 = 0, s02 = 0, s03 = 0;
      let s10 = 0, s11 = 0, s12 = 0, s13 = 0;
      let s20 = 0, s21 = 0, s22 = 0, s23 = 0;
      let s30 = 0, s31 = 0, s32 = 0, s33 = 0;
      for (let t = 0; t < d; t++) {
        const y0 = x[q0 + t];
        const y1 = x[q1 + t];
        const y2 = x[q2 + t];
        const y3 = x[q3 + t];
        let v = x[p0 + t];
        let e0 = v - y0, e1 = v - y1, e2 = v - y2, e3 = v - y3;
        s00 += e0 * e0; s01 += e1 * e1; s02 += e2 * e2; s03 += e3 * e3;
        v = x[p1 + t];
        e0 = v - y0; e1 = v - y1; e2 = v - y2; e3 = v - y3;
        s10 += e0 * e0; s11 += e1 * e1; s12 += e2 * e2; s13 += e3 * e3;
        v = x[p2 + t];
        e0 = v - y0; e1 = v - y1; e2 = v - y2; e3 = v - y3;
        s20 += e0 * e0; s21 += e1 * e1; s22 += e2 * e2; s23 += e3 * e3;
        v = x[p3 + t];
        e0 = v - y0; e1 = v - y1; e2 = v - y2; e3 = v - y3;
        s30 += e0 * e0; s31 += e1 * e1; s32 += e2 * e2; s33 += e3 * e3;
      }
      let o = i * BLOCK + j;
      tile[o] = s00; tile[o + 1] = s01; tile[o + 2] = s02; tile[o + 3] = s03;
      o += BLOCK;
      tile[o] = s10; tile[o + 1] = s11; tile[o + 2] = s12; tile[o + 3] = s13;
      o += BLOCK;
      tile[o] = s20; tile[o + 1] = s21; tile[o + 2] = s22; tile[o + 3] = s23;
      o += BLOCK;
      tile[o] = s30; tile[o + 1] = s31; tile[o + 2] = s32; tile[o + 3] = s33;
    }
    for (let j = nb4; j < nb; j++) {
      const q = (b0 + j) * d;
      let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
      for (let t = 0; t < d; t++) {
        const y = x[q + t];
        const e0 = x[p0 + t] - y;
        const e1 = x[p1 + t] - y;
        const e2 = x[p2 + t] - y;
        const e3 = x[p3 + t] - y;
        s0 += e0 * e0; s1 += e1 * e1; s2 += e2 * e2; s3 += e3 * e3;
      }
      tile[i * BLOCK + j] = s0;
      tile[(i + 1) * BLOCK + j] = s1;
      tile[(i + 2) * BLOCK + j] = s2;
      tile[(i + 3) * BLOCK + j] = s3;
    }
  }
  for (let i = na4; i < na; i++) {
    const p = (a0 + i) * d;
    for (let j = 0; j < nb; j++) {
      const q = (b0 + j) * d;
      let s = 0;
      for (let t = 0; t < d; t++) {
        const e = x[p + t] - x[q + t];
        s += e * e;
      }
      tile[i * BLOCK + j] = s;
    }
  }
}

/**
 * Squared distances within rows a0..a0+na−1 into tile[i·BLOCK + j]: the upper
 * triangle computed, the lower one mirrored ((a − b)² = (b − a)² exactly).
 */
function diagonalTile(x: Float64Array, d: number, a0: number, na: number, tile: Float64Array): void {
  for (let i = 0; i < na; i++) {
    const p = (a0 + i) * d;
    tile[i * BLOCK + i] = 0;
    for (let j = i + 1; j < na; j++) {
      const q = (a0 + j) * d;
      let s = 0;
      for (let t = 0; t < d; t++) {
        const e = x[p + t] - x[q + t];
        s += e * e;
      }
      tile[i * BLOCK + j] = s;
      tile[j * BLOCK + i] = s;
    }
  }
}

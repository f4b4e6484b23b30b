/**
 * Kernels of the exact k-nearest-neighbour search (see exact.ts): 64 × 64
 * distance tiles, per-row bounded max-heaps, and the scan over block pairs
 * that a thread runs on its share of query blocks. Internal to src/neighbors
 * and the worker-thread tasks.
 */
import { InternalError } from '../core/errors.js';
import type { Matrix } from '../core/types.js';

/** Rows per block: two blocks of 64 rows at d = 50 plus the 64 × 64 distance tile fit in L1/L2. */
export const BLOCK = 64;

/** RangeError unless 1 ≤ k ≤ n − 1 and every entry is finite. */
export function checkKnnInput(m: Matrix, k: number): void {
  const { n, d, data } = m;
  if (!Number.isInteger(k) || k < 1 || k > n - 1) {
    throw new RangeError(`k must be an integer in 1..n−1 = 1..${n - 1}, got ${k}`);
  }
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i])) {
      throw new RangeError(`kNN input has a non-finite value at row ${Math.floor(i / d)}, column ${i % d}`);
    }
  }
}

/**
 * Offer every pair (query row, candidate) with the query in blocks
 * aFrom..aTo−1 (block a = rows a·BLOCK …) and the candidate in the same or a
 * later block to both rows' heaps. Heaps are n × k (`idx`, `dist` holding
 * squared distances, `count`, and `worst` = the entry threshold per row: +∞
 * until the row holds k candidates, then its k-th squared distance).
 *
 * Offers reach each row in increasing candidate index: for query block a,
 * blocks b ≥ a are visited in order; a row of block b hears from block a
 * (a < b) while a is the query block, from its own block when a = b, and
 * from later blocks afterwards. So an incoming candidate that ties with the
 * current k-th distance always has the higher index and is rejected. This
 * holds for any contiguous range of query blocks, so a thread that scans
 * aFrom..aTo−1 keeps, for each row, the true best k among the candidates it
 * saw, with the (distance, index) tie rule.
 */
export function scanBlocks(
  data: Float64Array,
  n: number,
  d: number,
  k: number,
  aFrom: number,
  aTo: number,
  idx: Int32Array,
  dist: Float64Array,
  count: Int32Array,
  worst: Float64Array,
): void {
  const tile = new Float64Array(BLOCK * BLOCK);
  for (let a0 = aFrom * BLOCK; a0 < Math.min(n, aTo * BLOCK); a0 += BLOCK) {
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
}

/**
 * Split the query blocks 0..blocks−1 into `parts` contiguous ranges of about
 * equal work (query block a costs blocks − a tiles). Returns parts + 1
 * boundaries, first 0 and last `blocks`; ranges may be empty.
 */
export function splitBlocks(blocks: number, parts: number): number[] {
  const total = (blocks * (blocks + 1)) / 2;
  const bounds = [0];
  let acc = 0;
  let a = 0;
  for (let p = 1; p < parts; p++) {
    const target = (total * p) / parts;
    while (a < blocks && acc + (blocks - a) / 2 <= target) {
      acc += blocks - a;
      a++;
    }
    bounds.push(a);
  }
  bounds.push(blocks);
  return bounds;
}

/**
 * Final neighbour lists of rows r0..r1−1 from one or more partial heap sets
 * (each n × k, as filled by `scanBlocks` over disjoint block ranges): each
 * heap is sorted in place into ascending (squared distance, index), the lists
 * are merged, and the first k entries go to outIdx/outDist with distances
 * square-rooted.
 */
export function mergeRows(
  r0: number,
  r1: number,
  k: number,
  idxs: readonly Int32Array[],
  dists: readonly Float64Array[],
  counts: readonly Int32Array[],
  outIdx: Int32Array,
  outDist: Float64Array,
): void {
  const parts = idxs.length;
  const pos = new Int32Array(parts);
  for (let row = r0; row < r1; row++) {
    const base = row * k;
    for (let p = 0; p < parts; p++) {
      sortHeap(base, counts[p][row], idxs[p], dists[p]);
      pos[p] = 0;
    }
    for (let t = 0; t < k; t++) {
      let best = -1;
      let bd = 0;
      let bi = 0;
      for (let p = 0; p < parts; p++) {
        if (pos[p] >= counts[p][row]) continue;
        const v = dists[p][base + pos[p]];
        const c = idxs[p][base + pos[p]];
        if (best < 0 || v < bd || (v === bd && c < bi)) {
          best = p;
          bd = v;
          bi = c;
        }
      }
      if (best < 0) throw new InternalError(`row ${row} has fewer than ${k} candidates`);
      pos[best]++;
      outIdx[base + t] = bi;
      outDist[base + t] = Math.sqrt(bd);
    }
  }
}

/**
 * Each row's candidates live in a binary max-heap over (squared distance,
 * index), compared lexicographically, in dist/idx[row·k .. row·k + k).
 * Candidates arrive in increasing index order and only when v < worst[row],
 * so a candidate that ties with the current maximum never enters: among equal
 * distances the lower indices are kept. The heap itself orders by (distance,
 * index) throughout, so a caller offering in another order keeps the same
 * rule by gating on that order instead (./grid2d.ts).
 */
export function offer(
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
export function sortHeap(base: number, size: number, idx: Int32Array, dist: Float64Array): void {
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

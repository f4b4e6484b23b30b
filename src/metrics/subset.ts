/**
 * Row lists for maps that cover a subset of the dataset rows (row
 * resampling), and exact k-nearest neighbours within such a subset derived
 * from a neighbour graph of all rows.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { exactKnn } from '../neighbors/exact.js';

/**
 * Check a list of dataset rows: integers in [0, n), strictly ascending.
 *
 * @param rows the row list.
 * @param n number of dataset rows.
 * @param name how to call the list in the error message.
 * @throws RangeError when the list is not strictly ascending or out of range.
 */
export function checkRowList(rows: Int32Array, n: number, name = 'rows'): void {
  let prev = -1;
  for (let t = 0; t < rows.length; t++) {
    const r = rows[t];
    if (r <= prev || r >= n) {
      throw new RangeError(
        `${name} must be strictly ascending dataset rows in 0..${n - 1}; entry ${t} is ${r} (previous ${prev})`,
      );
    }
    prev = r;
  }
}

/** The rows 0..n−1. */
export function allRows(n: number): Int32Array {
  return Int32Array.from({ length: n }, (_, i) => i);
}

/**
 * Position of every dataset row in an ascending row list.
 *
 * @returns Int32Array(n): position t with rows[t] = row, or −1 for rows not in the list.
 */
export function positionsOf(rows: Int32Array, n: number): Int32Array {
  const pos = new Int32Array(n).fill(-1);
  for (let t = 0; t < rows.length; t++) pos[rows[t]] = t;
  return pos;
}

/** Ascending intersection of two ascending row lists (linear merge). */
export function sharedRows(a: Int32Array, b: Int32Array): Int32Array {
  const out = new Int32Array(Math.min(a.length, b.length));
  let p = 0;
  let q = 0;
  let m = 0;
  while (p < a.length && q < b.length) {
    if (a[p] < b[q]) p++;
    else if (a[p] > b[q]) q++;
    else {
      out[m++] = a[p];
      p++;
      q++;
    }
  }
  return out.slice(0, m);
}

/**
 * Exact k nearest neighbours among a subset of the rows of `points`.
 *
 * `keep` lists rows of `points` (ascending). The result is a kNN graph of the
 * kept rows only: its row t is `points` row keep[t] and its neighbour indices
 * are positions in `keep`. Because `keep` is ascending, the (distance, index)
 * tie rule of the full graph carries over unchanged.
 *
 * With a graph of all rows of `points` (exact, (distance, index) order, any
 * number of columns), each row's neighbours within the subset are the first k
 * kept entries of its full list; a row whose list holds fewer than k kept
 * entries is searched directly over the kept rows (O(m·d) for that row). With
 * no graph, or when `keep` is every row and the graph is long enough, the
 * work is one exact search or a prefix copy. Distances are Euclidean (not
 * squared), summed term by term as in `exactKnn`.
 *
 * @param points the full set of rows (n × d).
 * @param graph exact kNN graph of all n rows of `points`, or null.
 * @param keep ascending rows of `points` to keep (m of them, m ≥ k + 1).
 * @param k neighbours per kept row.
 */
export function knnWithin(points: Matrix, graph: KnnGraph | null, keep: Int32Array, k: number): KnnGraph {
  const n = points.n;
  const m = keep.length;
  if (!Number.isInteger(k) || k < 1 || k > m - 1) {
    throw new RangeError(`k must be an integer from 1 to ${m - 1} (one less than the ${m} kept rows); received ${k}`);
  }
  if (graph !== null && graph.n !== n) {
    throw new RangeError(`the kNN graph describes ${graph.n} points but the matrix has ${n}`);
  }
  if (graph === null) {
    return exactKnn(m === n ? points : pickRows(points, keep), k);
  }
  const pos = positionsOf(keep, n);
  const gk = graph.k;
  const indices = new Int32Array(m * k);
  const distances = new Float64Array(m * k);
  const d = points.d;
  const data = points.data;
  let heap: Heap | null = null;
  for (let t = 0; t < m; t++) {
    const row = keep[t];
    const base = row * gk;
    let got = 0;
    for (let p = 0; p < gk && got < k; p++) {
      const local = pos[graph.indices[base + p]];
      if (local < 0) continue;
      indices[t * k + got] = local;
      distances[t * k + got] = graph.distances[base + p];
      got++;
    }
    if (got === k) continue;
    // The cached list ran out: scan every kept row.
    heap ??= new Heap(k);
    heap.clear();
    const oi = row * d;
    for (let u = 0; u < m; u++) {
      if (u === t) continue;
      const oj = keep[u] * d;
      let s = 0;
      for (let c = 0; c < d; c++) {
        const diff = data[oi + c] - data[oj + c];
        s += diff * diff;
      }
      heap.offer(s, u);
    }
    heap.drainSorted(indices, distances, t * k);
  }
  return { n: m, k, indices, distances };
}

function pickRows(points: Matrix, keep: Int32Array): Matrix {
  const d = points.d;
  const out = new Float64Array(keep.length * d);
  for (let t = 0; t < keep.length; t++) out.set(points.data.subarray(keep[t] * d, (keep[t] + 1) * d), t * d);
  return { n: keep.length, d, data: out };
}

/** Bounded max-heap over (squared distance, index) keeping the k smallest. */
class Heap {
  private readonly dist: Float64Array;
  private readonly idx: Int32Array;
  private size = 0;

  constructor(private readonly cap: number) {
    this.dist = new Float64Array(cap);
    this.idx = new Int32Array(cap);
  }

  clear(): void {
    this.size = 0;
  }

  private greater(d1: number, i1: number, d2: number, i2: number): boolean {
    return d1 > d2 || (d1 === d2 && i1 > i2);
  }

  offer(v: number, j: number): void {
    const dist = this.dist;
    const idx = this.idx;
    if (this.size < this.cap) {
      // Sift up: a parent must not be smaller than its child.
      let p = this.size++;
      while (p > 0) {
        const parent = (p - 1) >> 1;
        if (this.greater(dist[parent], idx[parent], v, j)) break;
        dist[p] = dist[parent];
        idx[p] = idx[parent];
        p = parent;
      }
      dist[p] = v;
      idx[p] = j;
      return;
    }
    if (!this.greater(dist[0], idx[0], v, j)) return;
    this.siftDown(v, j, this.size);
  }

  private siftDown(v: number, j: number, size: number): void {
    const dist = this.dist;
    const idx = this.idx;
    let p = 0;
    for (;;) {
      let c = 2 * p + 1;
      if (c >= size) break;
      if (c + 1 < size && this.greater(dist[c + 1], idx[c + 1], dist[c], idx[c])) c++;
      if (!this.greater(dist[c], idx[c], v, j)) break;
      dist[p] = dist[c];
      idx[p] = idx[c];
      p = c;
    }
    dist[p] = v;
    idx[p] = j;
  }

  /** Write the contents in ascending order (Euclidean distances) and empty the heap. */
  drainSorted(indices: Int32Array, distances: Float64Array, at: number): void {
    for (let end = this.size - 1; end >= 0; end--) {
      const topD = this.dist[0];
      const topI = this.idx[0];
      indices[at + end] = topI;
      distances[at + end] = Math.sqrt(topD);
      if (end > 0) this.siftDown(this.dist[end], this.idx[end], end);
    }
    this.size = 0;
  }
}

/**
 * Approximate k-nearest-neighbour graphs by NN-descent (W. Dong, M. Charikar
 * & K. Li, "Efficient k-nearest neighbor graph construction for generic
 * similarity measures", WWW 2011), started from a forest of random-projection
 * trees (S. Dasgupta & Y. Freund, "Random projection trees and low
 * dimensional manifolds", STOC 2008).
 *
 * Deterministic for a given generator state: every random choice is drawn
 * from the `Rng` passed in, in a fixed loop order, on one thread.
 */
import type { Rng } from '../core/rng.js';
import type { KnnGraph, Matrix } from '../core/types.js';
import { checkKnnInput, sortHeap } from './exact-tiles.js';

export interface NnDescentOptions {
  /** Random-projection trees in the initial forest. Default min(32, 5 + round(√n / 20)). */
  trees?: number;
  /** Largest leaf of a tree; each leaf's points are all compared with each other. Default max(k + 1, 24). */
  leafSize?: number;
  /**
   * Candidates sampled per point and iteration, separately among new and old
   * neighbours (forward and reverse together). Default max(50, k).
   */
  maxCandidates?: number;
  /**
   * Neighbours kept per point while searching (≥ k); the closest k are
   * returned. Longer lists explore more and raise recall. Default
   * k + max(5, ⌈k/3⌉) (20 for k = 15).
   */
  listSize?: number;
  /** Most NN-descent iterations. Default max(5, round(log₂ n)). */
  maxIterations?: number;
  /** Stop once an iteration changes fewer than δ·n·listSize list entries. Default 0.001. */
  delta?: number;
}

/** Bounded max-heaps over (squared distance, index) per row, with a "new" flag per entry. */
interface Heaps {
  k: number;
  idx: Int32Array;
  dist: Float64Array;
  fresh: Uint8Array;
  count: Int32Array;
  /** +∞ until the row is full, then its largest squared distance. */
  worst: Float64Array;
}

/**
 * The k nearest neighbours of every row of `m` (n × d), approximately, self
 * excluded, sorted by (distance, index) ascending, as n × k indices and
 * Euclidean distances. Squared distances are summed term by term in column
 * order, exactly as in `exactKnn`, so a neighbour found by both searches has
 * the same distance bits.
 *
 * 0. Order: the rows are copied in the leaf order of one extra tree, so that
 *    points close in space mostly sit close in memory (fewer cache misses in
 *    the random row accesses that follow); indices are mapped back at the end.
 * 1. Forest: each tree splits its point set recursively at the median of
 *    the projections on the direction between two randomly chosen points of
 *    the set, down to leaves of at most `leafSize` points; all pairs within a
 *    leaf are offered to both points' lists. Rows still short of a full list
 *    get random points.
 * 2. NN-descent with the new/old bookkeeping and sampling of the paper, on
 *    lists of `listSize` ≥ k entries: each iteration draws a uniform sample
 *    of at most `maxCandidates` new and of old candidates per point from its
 *    list and its reverse list, marks sampled new entries old, and compares
 *    new–new and new–old candidate pairs of every point, offering each result
 *    to both lists (a distance is abandoned once its partial sum exceeds what
 *    either list would accept). It stops after `maxIterations` or when fewer
 *    than δ·n·listSize entries changed.
 * 3. Each list is ordered by (distance, original row) and cut to k.
 *
 * Requires 1 ≤ k ≤ n − 1 and finite entries (RangeError otherwise).
 */
export function nnDescent(m: Matrix, k: number, rng: Rng, opts: NnDescentOptions = {}): KnnGraph {
  checkKnnInput(m, k);
  const { n, d, data } = m;
  const trees = opts.trees ?? Math.min(32, 5 + Math.round(Math.sqrt(n) / 20));
  const leafSize = opts.leafSize ?? Math.max(k + 1, 24);
  const maxCandidates = opts.maxCandidates ?? Math.max(50, k);
  const maxIterations = opts.maxIterations ?? Math.max(5, Math.round(Math.log2(n)));
  const delta = opts.delta ?? 0.001;
  const L = Math.min(n - 1, opts.listSize ?? k + Math.max(5, Math.ceil(k / 3)));
  if (!Number.isInteger(L) || L < k) throw new RangeError(`listSize must be an integer ≥ k = ${k}, got ${opts.listSize}`);
  checkCount('trees', trees, 0);
  checkCount('leafSize', leafSize, 2);
  checkCount('maxCandidates', maxCandidates, 1);
  checkCount('maxIterations', maxIterations, 0);
  if (!(delta >= 0)) throw new RangeError(`delta must be a non-negative number, got ${delta}`);

  const h: Heaps = {
    k: L,
    idx: new Int32Array(n * L),
    dist: new Float64Array(n * L),
    fresh: new Uint8Array(n * L),
    count: new Int32Array(n),
    worst: new Float64Array(n).fill(Number.POSITIVE_INFINITY),
  };
  const scratch = new Float64Array(Math.max(leafSize, 2 * maxCandidates));

  // Work on a copy whose rows follow the leaf order of one extra tree: points
  // that are close in space then mostly sit close in memory, which keeps the
  // random row accesses below in cache. Indices are mapped back at the end.
  const order = plantTree(data, n, d, leafSize, rng, null, scratch);
  const x = new Float64Array(n * d);
  for (let r = 0; r < n; r++) x.set(data.subarray(order[r] * d, (order[r] + 1) * d), r * d);

  for (let t = 0; t < trees; t++) plantTree(x, n, d, leafSize, rng, h, scratch);
  for (let i = 0; i < n; i++) {
    while (h.count[i] < L) {
      const j = rng.int(n);
      if (j !== i) push(h, i, j, sqDistRows(x, d, i, j));
    }
  }

  const C = maxCandidates;
  const newSets = new CandidateSets(n, L, C);
  const oldSets = new CandidateSets(n, L, C);
  const qs = new Int32Array(2 * C);
  const mark = new Int32Array(n).fill(-1);
  for (let it = 0; it < maxIterations; it++) {
    newSets.build(h, 1, rng);
    oldSets.build(h, 0, rng);
    const newC = newSets.cand;
    const newN = newSets.size;
    // Entries sampled as new candidates of their own row are old from now on.
    for (let i = 0; i < n; i++) {
      const cb = i * C;
      for (let t = 0; t < newN[i]; t++) mark[newC[cb + t]] = i;
      const base = i * L;
      for (let s = 0; s < h.count[i]; s++) {
        if (h.fresh[base + s] === 1 && mark[h.idx[base + s]] === i) h.fresh[base + s] = 0;
      }
    }
    const oldC = oldSets.cand;
    const oldN = oldSets.size;
    let updates = 0;
    for (let i = 0; i < n; i++) {
      const nn = newN[i];
      const no = oldN[i];
      const cb = i * C;
      for (let a = 0; a < nn; a++) {
        const p = newC[cb + a];
        let m2 = 0;
        for (let b = a + 1; b < nn; b++) qs[m2++] = newC[cb + b];
        for (let b = 0; b < no; b++) {
          const q = oldC[cb + b];
          if (q !== p) qs[m2++] = q;
        }
        distancesBelow(x, d, p, qs, m2, h.worst, scratch);
        for (let b = 0; b < m2; b++) {
          const v = scratch[b];
          const q = qs[b];
          if (v <= h.worst[p]) updates += push(h, p, q, v);
          if (v <= h.worst[q]) updates += push(h, q, p, v);
        }
      }
    }
    if (updates <= delta * n * L) break;
  }

  // Back to the caller's row numbers: each list is ordered by (distance,
  // original row) before its first k entries are kept.
  const indices = new Int32Array(n * k);
  const distances = new Float64Array(n * k);
  const li = new Int32Array(L);
  const ld = new Float64Array(L);
  for (let r = 0; r < n; r++) {
    const base = r * L;
    sortHeap(base, L, h.idx, h.dist);
    for (let s = 0; s < L; s++) {
      const j = order[h.idx[base + s]];
      const v = h.dist[base + s];
      let t = s;
      while (t > 0 && ld[t - 1] === v && li[t - 1] > j) {
        li[t] = li[t - 1];
        ld[t] = ld[t - 1];
        t--;
      }
      li[t] = j;
      ld[t] = v;
    }
    const o = order[r] * k;
    for (let s = 0; s < k; s++) {
      indices[o + s] = li[s];
      distances[o + s] = Math.sqrt(ld[s]);
    }
  }
  return { n, k, indices, distances };
}

function checkCount(name: string, v: number, min: number): void {
  if (!Number.isInteger(v) || v < min) throw new RangeError(`${name} must be an integer ≥ ${min}, got ${v}`);
}

/** Squared distance between rows i and j, summed term by term in column order (as `sqDist`). */
function sqDistRows(x: Float64Array, d: number, i: number, j: number): number {
  const p = i * d;
  const q = j * d;
  let s = 0;
  for (let t = 0; t < d; t++) {
    const e = x[p + t] - x[q + t];
    s += e * e;
  }
  return s;
}

/**
 * Squared distances from row p to rows qs[0..count−1] into out[0..count−1],
 * four rows at a time so that four independent sums are in flight; each sum
 * still runs term by term in column order.
 */
function distancesFrom(x: Float64Array, d: number, p: number, qs: Int32Array, count: number, out: Float64Array): void {
  const po = p * d;
  let b = 0;
  for (; b + 4 <= count; b += 4) {
    const q0 = qs[b] * d;
    const q1 = qs[b + 1] * d;
    const q2 = qs[b + 2] * d;
    const q3 = qs[b + 3] * d;
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    for (let t = 0; t < d; t++) {
      const v = x[po + t];
      const e0 = v - x[q0 + t];
      const e1 = v - x[q1 + t];
      const e2 = v - x[q2 + t];
      const e3 = v - x[q3 + t];
      s0 += e0 * e0;
      s1 += e1 * e1;
      s2 += e2 * e2;
      s3 += e3 * e3;
    }
    out[b] = s0;
    out[b + 1] = s1;
    out[b + 2] = s2;
    out[b + 3] = s3;
  }
  for (; b < count; b++) {
    const q = qs[b] * d;
    let s = 0;
    for (let t = 0; t < d; t++) {
      const e = x[po + t] - x[q + t];
      s += e * e;
    }
    out[b] = s;
  }
}

/**
 * As `distancesFrom`, but a group of four rows whose partial sums all exceed
 * max(worst[p], worst[q]) after a multiple of 16 columns is abandoned and
 * reported as +∞: sums of squares only grow, so neither row's list could take
 * it. Completed sums are bit-identical to `distancesFrom`.
 */
function distancesBelow(
  x: Float64Array,
  d: number,
  p: number,
  qs: Int32Array,
  count: number,
  worst: Float64Array,
  out: Float64Array,
): void {
  const po = p * d;
  const wp = worst[p];
  let b = 0;
  for (; b + 4 <= count; b += 4) {
    const q0 = qs[b] * d;
    const q1 = qs[b + 1] * d;
    const q2 = qs[b + 2] * d;
    const q3 = qs[b + 3] * d;
    const w0 = Math.max(wp, worst[qs[b]]);
    const w1 = Math.max(wp, worst[qs[b + 1]]);
    const w2 = Math.max(wp, worst[qs[b + 2]]);
    const w3 = Math.max(wp, worst[qs[b + 3]]);
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    let t = 0;
    while (t < d) {
      const end = Math.min(d, t + 16);
      for (; t < end; t++) {
        const v = x[po + t];
        const e0 = v - x[q0 + t];
        const e1 = v - x[q1 + t];
        const e2 = v - x[q2 + t];
        const e3 = v - x[q3 + t];
        s0 += e0 * e0;
        s1 += e1 * e1;
        s2 += e2 * e2;
        s3 += e3 * e3;
      }
      if (t < d && s0 > w0 && s1 > w1 && s2 > w2 && s3 > w3) {
        s0 = s1 = s2 = s3 = Number.POSITIVE_INFINITY;
        break;
      }
    }
    out[b] = s0;
    out[b + 1] = s1;
    out[b + 2] = s2;
    out[b + 3] = s3;
  }
  for (; b < count; b++) {
    const q = qs[b] * d;
    let s = 0;
    for (let t = 0; t < d; t++) {
      const e = x[po + t] - x[q + t];
      s += e * e;
    }
    out[b] = s;
  }
}

/**
 * Offer candidate `cand` at squared distance v to row `row`, flagged new.
 * Accepted when the list is not full, or when (v, cand) is below the list's
 * largest (distance, index) pair, and `cand` is not listed yet. Returns 1 if
 * the list changed, else 0.
 */
function push(h: Heaps, row: number, cand: number, v: number): number {
  const { k, idx, dist, fresh } = h;
  const base = row * k;
  const c = h.count[row];
  if (c === k) {
    const top = dist[base];
    if (v > top || (v === top && cand >= idx[base])) return 0;
  }
  for (let s = 0; s < c; s++) if (idx[base + s] === cand) return 0;
  if (c < k) {
    let p = c;
    while (p > 0) {
      const parent = (p - 1) >> 1;
      const pd = dist[base + parent];
      if (pd > v || (pd === v && idx[base + parent] > cand)) break;
      dist[base + p] = pd;
      idx[base + p] = idx[base + parent];
      fresh[base + p] = fresh[base + parent];
      p = parent;
    }
    dist[base + p] = v;
    idx[base + p] = cand;
    fresh[base + p] = 1;
    h.count[row] = c + 1;
    if (c + 1 === k) h.worst[row] = dist[base];
    return 1;
  }
  // Replace the root and sift down.
  let p = 0;
  for (;;) {
    let child = 2 * p + 1;
    if (child >= k) break;
    let cd = dist[base + child];
    let ci = idx[base + child];
    const right = child + 1;
    if (right < k) {
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
    fresh[base + p] = fresh[base + child];
    p = child;
  }
  dist[base + p] = v;
  idx[base + p] = cand;
  fresh[base + p] = 1;
  h.worst[row] = dist[base];
  return 1;
}

/**
 * Per row, a uniform random sample of at most `cap` of the row's candidates
 * with a given flag: its own list entries with that flag and the rows whose
 * lists hold it with that flag (reverse neighbours), without repeats.
 */
class CandidateSets {
  /** n × cap sampled candidates; size[i] of them are valid in row i. */
  readonly cand: Int32Array;
  readonly size: Int32Array;
  private readonly seenBy: Int32Array;
  private readonly revStart: Int32Array;
  private readonly rev: Int32Array;
  private readonly pool: Int32Array;

  constructor(
    private readonly n: number,
    private readonly k: number,
    private readonly cap: number,
  ) {
    this.cand = new Int32Array(n * cap);
    this.size = new Int32Array(n);
    this.seenBy = new Int32Array(n).fill(-1);
    this.revStart = new Int32Array(n + 1);
    this.rev = new Int32Array(n * k);
    this.pool = new Int32Array(k + cap);
  }

  /** Draw the samples for list entries flagged `flag` (1 = new, 0 = old). */
  build(h: Heaps, flag: number, rng: Rng): void {
    const { n, k, cap, cand, size, seenBy, revStart, rev, pool } = this;
    // Reverse lists in CSR form, sources in increasing row order.
    revStart.fill(0);
    for (let i = 0; i < n; i++) {
      const base = i * k;
      for (let s = 0; s < h.count[i]; s++) if (h.fresh[base + s] === flag) revStart[h.idx[base + s] + 1]++;
    }
    for (let j = 0; j < n; j++) revStart[j + 1] += revStart[j];
    const fill = revStart.slice(0, n);
    for (let i = 0; i < n; i++) {
      const base = i * k;
      for (let s = 0; s < h.count[i]; s++) if (h.fresh[base + s] === flag) rev[fill[h.idx[base + s]]++] = i;
    }
    seenBy.fill(-1);
    for (let i = 0; i < n; i++) {
      let m = 0;
      const base = i * k;
      for (let s = 0; s < h.count[i]; s++) {
        const j = h.idx[base + s];
        if (h.fresh[base + s] === flag && seenBy[j] !== i) {
          seenBy[j] = i;
          pool[m++] = j;
        }
      }
      // Add at most `cap` reverse neighbours (a uniform sample when there are more).
      const r0 = revStart[i];
      const r1 = revStart[i + 1];
      const nr = r1 - r0;
      for (let t = 0; t < nr; t++) {
        const src = r0 + t;
        if (nr > cap) {
          if (t >= cap) break;
          // Partial Fisher–Yates over the reverse list, in place.
          const pick = src + rng.int(nr - t);
          const tmp = rev[pick];
          rev[pick] = rev[src];
          rev[src] = tmp;
        }
        const j = rev[src];
        if (seenBy[j] !== i) {
          seenBy[j] = i;
          pool[m++] = j;
        }
      }
      // A uniform sample of `cap` from the pool.
      const keep = Math.min(m, cap);
      for (let t = 0; t < keep; t++) {
        if (m > cap) {
          const pick = t + rng.int(m - t);
          const tmp = pool[pick];
          pool[pick] = pool[t];
          pool[t] = tmp;
        }
        cand[i * cap + t] = pool[t];
      }
      size[i] = keep;
    }
  }
}

/**
 * One random-projection tree over all n rows: each node projects its points on
 * the direction between two of them drawn at random and splits at the median
 * projection (ties by position), so every leaf holds between leafSize/2 and
 * leafSize points; nodes are split depth first, lower half first. All pairs of
 * each leaf are offered to the lists when `h` is given. Returns the rows in
 * leaf order.
 */
function plantTree(
  x: Float64Array,
  n: number,
  d: number,
  leafSize: number,
  rng: Rng,
  h: Heaps | null,
  scratch: Float64Array,
): Int32Array {
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  const proj = new Float64Array(n);
  const sel = new Float64Array(n);
  const tmp = new Int32Array(n);
  const dir = new Float64Array(d);
  const stack: number[] = [0, n];
  const qs = new Int32Array(leafSize);
  while (stack.length > 0) {
    const hi = stack.pop() as number;
    const lo = stack.pop() as number;
    const size = hi - lo;
    if (size <= leafSize) {
      if (h === null) continue;
      for (let a = 0; a + 1 < size; a++) {
        const p = perm[lo + a];
        let m2 = 0;
        for (let b = a + 1; b < size; b++) qs[m2++] = perm[lo + b];
        distancesFrom(x, d, p, qs, m2, scratch);
        for (let b = 0; b < m2; b++) {
          const v = scratch[b];
          const q = qs[b];
          if (v <= h.worst[p]) push(h, p, q, v);
          if (v <= h.worst[q]) push(h, q, p, v);
        }
      }
      continue;
    }
    const ia = perm[lo + rng.int(size)];
    let ib = perm[lo + rng.int(size - 1)];
    if (ib === ia) ib = perm[hi - 1];
    const oa = ia * d;
    const ob = ib * d;
    for (let t = 0; t < d; t++) dir[t] = x[oa + t] - x[ob + t];
    for (let s = lo; s < hi; s++) {
      const v = projection(x, perm[s] * d, dir, d);
      proj[s] = v;
      sel[s - lo] = v;
    }
    const half = size >> 1;
    const median = selectKth(sel, size, half);
    // Lower half: projections below the median, then ties at the median in position order.
    let below = 0;
    for (let s = lo; s < hi; s++) if (proj[s] < median) below++;
    let tiesLeft = half - below;
    let wa = lo;
    let wb = lo + half;
    for (let s = lo; s < hi; s++) {
      const v = proj[s];
      if (v < median || (v === median && tiesLeft-- > 0)) tmp[wa++] = perm[s];
      else tmp[wb++] = perm[s];
    }
    perm.set(tmp.subarray(lo, hi), lo);
    stack.push(lo + half, hi, lo, lo + half);
  }
  return perm;
}

/** Σ_t dir[t]·x[o + t] with four partial sums. */
function projection(x: Float64Array, o: number, dir: Float64Array, d: number): number {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  let t = 0;
  for (; t + 4 <= d; t += 4) {
    s0 += dir[t] * x[o + t];
    s1 += dir[t + 1] * x[o + t + 1];
    s2 += dir[t + 2] * x[o + t + 2];
    s3 += dir[t + 3] * x[o + t + 3];
  }
  for (; t < d; t++) s0 += dir[t] * x[o + t];
  return s0 + s1 + (s2 + s3);
}

/**
 * The value of rank r (0-based, ascending) among a[0..size−1], by quickselect
 * with the middle element as pivot; reorders `a`.
 */
function selectKth(a: Float64Array, size: number, r: number): number {
  let lo = 0;
  let hi = size - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (r <= j) hi = j;
    else if (r >= i) lo = i;
    else return a[r];
  }
  return a[r];
}

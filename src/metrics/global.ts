/**
 * Global structure of an embedding: rank correlation of pairwise distances
 * (the "Shepard goodness" of DR surveys, e.g. Espadoto et al., IEEE TVCG 27
 * (2021)) and of distances between group centroids.
 *
 * Distances are Euclidean (square roots of term-by-term sums, as
 * scipy.spatial.distance.pdist). Spearman's ρ is the Pearson correlation of
 * average ranks (tied values share the mean of their positions), as
 * scipy.stats.spearmanr 1.10.1.
 */
import type { Matrix } from '../core/types.js';
import type { Rng } from '../core/rng.js';
import { orderByValue } from './sorting.js';

/** Unordered point pairs (i < j), as parallel arrays. */
export interface PairList {
  readonly i: Int32Array;
  readonly j: Int32Array;
}

/**
 * 1-based average ranks (scipy.stats.rankdata(method='average')): a run of
 * equal values at sorted positions lo..hi−1 (0-based) all get (lo + hi + 1)/2.
 * O(n) via `orderByValue`.
 *
 * @param values finite numbers.
 */
export function averageRanks(values: Float64Array): Float64Array {
  const n = values.length;
  const order = orderByValue(values);
  const ranks = new Float64Array(n);
  let lo = 0;
  while (lo < n) {
    const v = values[order[lo]];
    let hi = lo + 1;
    while (hi < n && values[order[hi]] === v) hi++;
    const r = (lo + hi + 1) / 2;
    for (let p = lo; p < hi; p++) ranks[order[p]] = r;
    lo = hi;
  }
  return ranks;
}

/**
 * Pearson correlation of two equally long vectors, clipped to [−1, 1] (as
 * numpy.corrcoef). NaN when either vector is constant or shorter than 2.
 */
export function pearson(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const n = a.length;
  if (b.length !== n) throw new RangeError(`the vectors have different lengths (${n} and ${b.length})`);
  if (n < 2) return NaN;
  let ma = 0;
  let mb = 0;
  for (let t = 0; t < n; t++) {
    ma += a[t];
    mb += b[t];
  }
  ma /= n;
  mb /= n;
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let t = 0; t < n; t++) {
    const x = a[t] - ma;
    const y = b[t] - mb;
    sab += x * y;
    saa += x * x;
    sbb += y * y;
  }
  if (saa === 0 || sbb === 0) return NaN;
  const r = sab / Math.sqrt(saa) / Math.sqrt(sbb);
  return r > 1 ? 1 : r < -1 ? -1 : r;
}

/**
 * Spearman's rank correlation with average ranks for ties (as
 * scipy.stats.spearmanr 1.10.1). NaN when either vector is constant.
 */
export function spearman(a: Float64Array, b: Float64Array): number {
  if (a.length !== b.length) throw new RangeError(`the vectors have different lengths (${a.length} and ${b.length})`);
  return pearson(averageRanks(a), averageRanks(b));
}

/** All n(n−1)/2 pairs i < j, in row-major order ((0,1), (0,2), …, (n−2, n−1)). */
export function allPairs(n: number): PairList {
  const total = (n * (n - 1)) / 2;
  if (total > 2 ** 31 - 1) throw new RangeError(`too many pairs for n = ${n}; sample them instead`);
  const i = new Int32Array(total);
  const j = new Int32Array(total);
  let t = 0;
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      i[t] = a;
      j[t] = b;
      t++;
    }
  }
  return { i, j };
}

/**
 * `count` distinct unordered pairs of 0..n−1, uniform over all pairs, drawn
 * with `rng` (each draw: a first point, then a different second point;
 * repeats are drawn again). Returned sorted by (i, j) with i < j.
 */
export function samplePairs(n: number, count: number, rng: Rng): PairList {
  const total = (n * (n - 1)) / 2;
  if (!Number.isInteger(count) || count < 1 || count > total) {
    throw new RangeError(`the number of pairs must be an integer from 1 to ${total}; received ${count}`);
  }
  if (count > total / 2) {
    throw new RangeError(`${count} of ${total} pairs is more than half of them; use all pairs instead`);
  }
  const seen = new Set<number>();
  const keys = new Float64Array(count);
  let t = 0;
  while (t < count) {
    const a = rng.int(n);
    let b = rng.int(n - 1);
    if (b >= a) b++;
    const key = a < b ? a * n + b : b * n + a;
    if (seen.has(key)) continue;
    seen.add(key);
    keys[t++] = key;
  }
  keys.sort();
  const i = new Int32Array(count);
  const j = new Int32Array(count);
  for (let p = 0; p < count; p++) {
    const a = Math.floor(keys[p] / n);
    i[p] = a;
    j[p] = keys[p] - a * n;
  }
  return { i, j };
}

/**
 * Euclidean distances of the listed pairs of rows of M (√ of the
 * term-by-term sum of squares, as scipy pdist).
 */
export function pairDistances(M: Matrix, pairs: PairList): Float64Array {
  const { d, data } = M;
  const P = pairs.i.length;
  const out = new Float64Array(P);
  for (let t = 0; t < P; t++) {
    const oi = pairs.i[t] * d;
    const oj = pairs.j[t] * d;
    let s = 0;
    for (let c = 0; c < d; c++) {
      const diff = data[oi + c] - data[oj + c];
      s += diff * diff;
    }
    out[t] = Math.sqrt(s);
  }
  return out;
}

/**
 * Spearman correlation between the data and map distances of all pairs
 * (scipy.stats.spearmanr(pdist(X), pdist(Y)) with scipy 1.10.1), or of the
 * given pairs. O(P·d) time and memory for P pairs: use a pair sample for
 * large n.
 */
export function distanceSpearman(X: Matrix, Y: Matrix, pairs?: PairList): number {
  if (X.n !== Y.n) throw new RangeError(`X has ${X.n} rows but the map has ${Y.n}`);
  const p = pairs ?? allPairs(X.n);
  return spearman(pairDistances(X, p), pairDistances(Y, p));
}

/**
 * Group means: k × d, row g = mean of the rows of M whose group is g, with
 * groups 0..k−1 (negative = in no group). A group with no row gets NaN.
 *
 * @param M n × d points.
 * @param groups n group numbers.
 * @param k number of groups.
 */
export function groupCentroids(M: Matrix, groups: Int32Array, k: number): { centroids: Float64Array; sizes: Int32Array } {
  const { n, d, data } = M;
  if (groups.length !== n) throw new RangeError(`there are ${groups.length} group numbers for ${n} points`);
  const centroids = new Float64Array(k * d);
  const sizes = new Int32Array(k);
  for (let i = 0; i < n; i++) {
    const g = groups[i];
    if (g < 0) continue;
    if (g >= k) throw new RangeError(`group number ${g} at row ${i} is not below k = ${k}`);
    sizes[g]++;
    for (let c = 0; c < d; c++) centroids[g * d + c] += data[i * d + c];
  }
  for (let g = 0; g < k; g++) {
    for (let c = 0; c < d; c++) centroids[g * d + c] = sizes[g] > 0 ? centroids[g * d + c] / sizes[g] : NaN;
  }
  return { centroids, sizes };
}

/**
 * Spearman correlation between the distances of group centroids in the data
 * and in the map, over all pairs of groups that have at least one point.
 * Groups are numbered 0..k−1 per point (negative = in no group): typically
 * the labels, else a partition of the data.
 *
 * @returns ρ, or null with fewer than 3 non-empty groups (fewer than 3 pairs);
 *   NaN when the distances of one side are all equal.
 */
export function centroidSpearman(X: Matrix, Y: Matrix, groups: Int32Array): number | null {
  if (X.n !== Y.n) throw new RangeError(`X has ${X.n} rows but the map has ${Y.n}`);
  let k = 0;
  for (let i = 0; i < groups.length; i++) if (groups[i] + 1 > k) k = groups[i] + 1;
  const cx = groupCentroids(X, groups, k);
  const cy = groupCentroids(Y, groups, k);
  return centroidSpearmanFrom(cx.centroids, X.d, cy.centroids, Y.d, cx.sizes);
}

/** `centroidSpearman` from centroids already computed (k × dX and k × dY; empty groups skipped). */
export function centroidSpearmanFrom(
  cx: Float64Array,
  dX: number,
  cy: Float64Array,
  dY: number,
  sizes: Int32Array,
): number | null {
  const present: number[] = [];
  for (let g = 0; g < sizes.length; g++) if (sizes[g] > 0) present.push(g);
  const G = present.length;
  if (G < 3) return null;
  const C = Float64Array.from(present.flatMap((g) => Array.from(cx.subarray(g * dX, (g + 1) * dX))));
  const D = Float64Array.from(present.flatMap((g) => Array.from(cy.subarray(g * dY, (g + 1) * dY))));
  const pairs = allPairs(G);
  return spearman(pairDistances({ n: G, d: dX, data: C }, pairs), pairDistances({ n: G, d: dY, data: D }, pairs));
}

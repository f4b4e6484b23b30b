/**
 * Agreement between partitions and quality of a partition: adjusted Rand
 * index, seeded k-means labels, silhouette, and Hennig's per-cluster Jaccard.
 */
import { Rng } from '../core/rng.js';
import type { Matrix } from '../core/types.js';
import { kmeansOnce } from './kmeans.js';

/** Cluster labels, one integer per point. */
export type Labels = Int32Array | readonly number[];

/**
 * Adjusted Rand index of two partitions of the same points (Hubert & Arabie,
 * "Comparing partitions", J. Classification 2 (1985) 193–218), with the same
 * conventions as scikit-learn 1.2.1 `adjusted_rand_score`.
 *
 * ARI = (Index − Expected) / (Max − Expected) over exact pair counts:
 * Index = Σ C(n_ij, 2), Expected = Σ C(a_i, 2) · Σ C(b_j, 2) / C(n, 2),
 * Max = (Σ C(a_i, 2) + Σ C(b_j, 2)) / 2. Partitions with no discordant pair
 * (identical up to renaming, including both all-in-one and both
 * all-singletons) give exactly 1.
 *
 * @param a labels of n points (any integers; only equality matters).
 * @param b labels of the same n points.
 * @returns a value in [−0.5, 1]; about 0 for unrelated partitions.
 */
export function adjustedRandIndex(a: Labels, b: Labels): number {
  if (a.length !== b.length) {
    throw new RangeError(`the two labelings have different lengths (${a.length} and ${b.length})`);
  }
  const n = a.length;
  const ca = compactLabels(a, 'first labeling');
  const cb = compactLabels(b, 'second labeling');
  const sizeA = new Float64Array(ca.count);
  const sizeB = new Float64Array(cb.count);
  const cells = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const x = ca.ids[i];
    const y = cb.ids[i];
    sizeA[x]++;
    sizeB[y]++;
    const key = x * cb.count + y;
    cells.set(key, (cells.get(key) ?? 0) + 1);
  }
  let index = 0;
  for (const c of cells.values()) index += pairs(c);
  let sumA = 0;
  for (let x = 0; x < ca.count; x++) sumA += pairs(sizeA[x]);
  let sumB = 0;
  for (let y = 0; y < cb.count; y++) sumB += pairs(sizeB[y]);
  // No pair is together in one partition and apart in the other.
  if (index === sumA && index === sumB) return 1;
  const total = pairs(n);
  const expected = (sumA * sumB) / total;
  const max = (sumA + sumB) / 2;
  return (index - expected) / (max - expected);
}

/** Options of `kmeansLabels`. */
export interface KmeansOptions {
  /** Number of k-means++ starts; the partition with the smallest inertia wins. Default 10. */
  readonly restarts?: number;
  /** Iteration cap per start. Default 100. */
  readonly maxIterations?: number;
}

/**
 * Seeded k-means (Lloyd's algorithm with greedy k-means++ starts, Arthur &
 * Vassilvitskii 2007; ./kmeans.ts). Each start gets a 32-bit seed drawn from
 * `rng`; the start with the lowest inertia (within-cluster sum of squared
 * distances to the cluster means) is kept, ties going to the earlier start.
 * Labels are then renumbered 0, 1, 2, … in order of first appearance, so equal
 * partitions give equal arrays.
 *
 * When the points have at most k distinct positions, each distinct position is
 * its own cluster (zero inertia) and fewer than k labels are used.
 *
 * @param Y n × d points (typically an embedding, d = 2).
 * @param k number of clusters, 1 ≤ k ≤ n.
 * @param rng source of the per-start seeds (advanced by `restarts` draws).
 * @returns n labels in 0..k−1.
 */
export function kmeansLabels(Y: Matrix, k: number, rng: Rng, opts: KmeansOptions = {}): Int32Array {
  const { n, d, data } = Y;
  const restarts = opts.restarts ?? 10;
  const maxIterations = opts.maxIterations ?? 100;
  if (!Number.isInteger(k) || k < 1 || k > n) {
    throw new RangeError(`the number of clusters must be an integer from 1 to n = ${n}; received ${k}`);
  }
  if (!Number.isInteger(restarts) || restarts < 1) {
    throw new RangeError(`restarts must be a positive integer; received ${restarts}`);
  }
  if (!Number.isInteger(maxIterations) || maxIterations < 1) {
    throw new RangeError(`maxIterations must be a positive integer; received ${maxIterations}`);
  }
  for (let t = 0; t < n * d; t++) {
    if (!Number.isFinite(data[t])) {
      throw new RangeError(`the points have a non-finite value (${data[t]}) at row ${Math.floor(t / d)}`);
    }
  }
  // Seeds are drawn up front so the rng advances the same way on every path.
  const seeds = new Uint32Array(restarts);
  for (let r = 0; r < restarts; r++) seeds[r] = rng.nextU32();

  const distinct = distinctRows(Y, k);
  if (distinct !== null) return canonical(distinct.ids);

  let best: Int32Array | null = null;
  let bestInertia = Infinity;
  for (let r = 0; r < restarts; r++) {
    const run = kmeansOnce(Y, k, new Rng(seeds[r]), maxIterations);
    if (run.inertia < bestInertia) {
      bestInertia = run.inertia;
      best = run.labels;
    }
  }
  if (best === null) throw new RangeError('k-means produced no finite partition');
  return canonical(best);
}

/**
 * Mean silhouette width (Rousseeuw, "Silhouettes: a graphical aid to the
 * interpretation and validation of cluster analysis", J. Comput. Appl. Math.
 * 20 (1987) 53–65), as scikit-learn 1.2.1 `silhouette_score` with Euclidean
 * distances: s(i) = (b − a) / max(a, b), a = mean distance to the other
 * members of i's cluster, b = smallest mean distance to another cluster.
 * A point alone in its cluster has s = 0 and still counts; a = b = 0 gives 0.
 *
 * Time O(n²·d), memory O(n + clusters).
 *
 * @param X n × d points.
 * @param labels n cluster labels (any integers), with 2 ≤ #clusters ≤ n − 1.
 * @returns the mean of s(i) over all points, in [−1, 1].
 */
export function silhouette(X: Matrix, labels: Labels): number {
  const { n, d, data } = X;
  if (labels.length !== n) throw new RangeError(`there are ${labels.length} labels for ${n} points`);
  const c = compactLabels(labels, 'labels');
  if (c.count < 2 || c.count > n - 1) {
    throw new RangeError(`the silhouette needs from 2 to n − 1 = ${n - 1} clusters; the labels have ${c.count}`);
  }
  for (let t = 0; t < n * d; t++) {
    if (!Number.isFinite(data[t])) {
      throw new RangeError(`the points have a non-finite value (${data[t]}) at row ${Math.floor(t / d)}`);
    }
  }
  const ids = c.ids;
  const size = new Float64Array(c.count);
  for (let i = 0; i < n; i++) size[ids[i]]++;
  const sums = new Float64Array(c.count);
  let total = 0;
  for (let i = 0; i < n; i++) {
    sums.fill(0);
    const oi = i * d;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      const oj = j * d;
      let s = 0;
      for (let t = 0; t < d; t++) {
        const diff = data[oi + t] - data[oj + t];
        s += diff * diff;
      }
      sums[ids[j]] += Math.sqrt(s);
    }
    const own = ids[i];
    if (size[own] < 2) continue; // singleton: s(i) = 0
    const a = sums[own] / (size[own] - 1);
    let b = Infinity;
    for (let q = 0; q < c.count; q++) {
      if (q === own) continue;
      const m = sums[q] / size[q];
      if (m < b) b = m;
    }
    const denom = Math.max(a, b);
    if (denom > 0) total += (b - a) / denom;
  }
  return total / n;
}

/**
 * Cluster-wise Jaccard stability (Hennig, "Cluster-wise assessment of cluster
 * stability", Comput. Stat. Data Anal. 52 (2007) 258–271): for every cluster
 * C of `reference`, the best Jaccard similarity |C∩S ∩ D| / |C∩S ∪ D| over the
 * clusters D of `other`, where S is the set of points present in `other`.
 *
 * A negative label in `other` marks a point absent from the comparison (as in
 * a subsample); with all points present S is everything.
 *
 * @param reference n labels, non-negative integers.
 * @param other n labels of the same points; −1 (any negative) = absent.
 * @returns one value per reference cluster, in ascending order of the
 *   reference label values (for labels 0..K−1, entry c is cluster c);
 *   NaN for a cluster none of whose points is present.
 */
export function clusterJaccard(reference: Labels, other: Labels): Float64Array {
  const n = reference.length;
  if (other.length !== n) {
    throw new RangeError(`the two labelings have different lengths (${n} and ${other.length})`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isInteger(reference[i]) || reference[i] < 0) {
      throw new RangeError(`reference labels must be non-negative integers; found ${reference[i]} at position ${i}`);
    }
    if (!Number.isInteger(other[i])) {
      throw new RangeError(`labels must be integers; found ${other[i]} at position ${i} of the other labeling`);
    }
  }
  const ref = compactLabels(reference, 'reference', true);
  const present: number[] = [];
  for (let i = 0; i < n; i++) if (other[i] >= 0) present.push(other[i]);
  const oth = compactLabels(present, 'other', false);
  const K = ref.count;
  const M = oth.count;
  const inter = new Float64Array(K * M);
  const refPresent = new Float64Array(K);
  const otherSize = new Float64Array(M);
  let p = 0;
  for (let i = 0; i < n; i++) {
    if (other[i] < 0) continue;
    const x = ref.ids[i];
    const y = oth.ids[p++];
    inter[x * M + y]++;
    refPresent[x]++;
    otherSize[y]++;
  }
  const out = new Float64Array(K);
  for (let x = 0; x < K; x++) {
    if (refPresent[x] === 0) {
      out[x] = NaN;
      continue;
    }
    let best = 0;
    for (let y = 0; y < M; y++) {
      const s = inter[x * M + y];
      if (s === 0) continue;
      const jac = s / (refPresent[x] + otherSize[y] - s);
      if (jac > best) best = jac;
    }
    out[x] = best;
  }
  return out;
}

// ---------------------------------------------------------------------------

function pairs(m: number): number {
  return (m * (m - 1)) / 2;
}

interface Compact {
  /** 0..count−1 per point. */
  ids: Int32Array;
  count: number;
}

/**
 * Renumber labels to 0..count−1: in ascending label order when `sorted`,
 * else in order of first appearance.
 */
function compactLabels(labels: Labels, name: string, sorted = false): Compact {
  const n = labels.length;
  const map = new Map<number, number>();
  const ids = new Int32Array(n);
  if (sorted) {
    const values = Array.from(new Set(Array.from(labels))).sort((x, y) => x - y);
    values.forEach((v, t) => map.set(v, t));
  }
  for (let i = 0; i < n; i++) {
    const v = labels[i];
    if (!Number.isInteger(v)) throw new RangeError(`${name} must be integers; found ${v} at position ${i}`);
    let id = map.get(v);
    if (id === undefined) {
      id = map.size;
      map.set(v, id);
    }
    ids[i] = id;
  }
  return { ids, count: map.size };
}

/** Renumber labels by order of first appearance. */
function canonical(labels: Int32Array): Int32Array {
  return compactLabels(labels, 'labels').ids;
}

/**
 * Id of each row's distinct position (first appearance order) and how many
 * there are — or null as soon as there are more than `limit`.
 */
function distinctRows(m: Matrix, limit: number): Compact | null {
  const { n, d, data } = m;
  const seen = new Map<string, number>();
  const ids = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let key = '';
    for (let c = 0; c < d; c++) key += (c > 0 ? ',' : '') + String(data[i * d + c] + 0); // + 0 maps −0 to 0
    let id = seen.get(key);
    if (id === undefined) {
      id = seen.size;
      if (id >= limit) return null;
      seen.set(key, id);
    }
    ids[i] = id;
  }
  return { ids, count: seen.size };
}


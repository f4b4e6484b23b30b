/**
 * k-means on typed arrays: Lloyd's algorithm (Lloyd 1982, IEEE Trans. Inf.
 * Theory 28:129–137) from a greedy k-means++ start (Arthur & Vassilvitskii,
 * "k-means++: the advantages of careful seeding", SODA 2007; the greedy
 * variant with 2 + ⌊ln k⌋ candidates per centre is the one scikit-learn 1.2
 * uses). One start per call; `kmeansLabels` in ./clustering.ts runs several
 * and keeps the best.
 *
 * Deterministic for a given generator state: candidates are drawn from `rng`
 * in a fixed order, ties between equal distances go to the lower index.
 *
 * Flat typed arrays throughout: 10 starts with 10 clusters on 10,000 × 50
 * take about 0.4 s (bench/scores.ts), where the nested-array ml-kmeans 7.0.1
 * used before spent about 3 s in its k-means++ distance matrices (CPU
 * profile of a 10,000-row audit).
 */
import { sqDist } from '../core/matrix.js';
import type { Rng } from '../core/rng.js';
import type { Matrix } from '../core/types.js';

export interface KmeansRun {
  /** Cluster of each point, 0..k−1. */
  labels: Int32Array;
  /** Σ squared distance of each point to the mean of its cluster. */
  inertia: number;
  /** Lloyd iterations run. */
  iterations: number;
}

/**
 * One k-means run: greedy k-means++ start, then Lloyd iterations until no
 * label changes or `maxIterations` is reached. A cluster that empties takes
 * the point farthest from its current centre (lowest index on ties).
 *
 * @param X n × d points, finite; k in 1..n.
 */
export function kmeansOnce(X: Matrix, k: number, rng: Rng, maxIterations: number): KmeansRun {
  const { n, d, data } = X;
  const centres = seedCentres(X, k, rng);
  const labels = new Int32Array(n).fill(-1);
  const dist = new Float64Array(n);
  const sums = new Float64Array(k * d);
  const size = new Int32Array(k);
  let iterations = 0;
  for (let it = 0; it < maxIterations; it++) {
    iterations = it + 1;
    let changed = 0;
    for (let i = 0; i < n; i++) {
      const oi = i * d;
      let best = 0;
      let bestD = Infinity;
      for (let c = 0; c < k; c++) {
        const oc = c * d;
        let s = 0;
        for (let t = 0; t < d; t++) {
          const v = data[oi + t] - centres[oc + t];
          s += v * v;
        }
        if (s < bestD) {
          bestD = s;
          best = c;
        }
      }
      dist[i] = bestD;
      if (labels[i] !== best) {
        labels[i] = best;
        changed++;
      }
    }
    if (changed === 0 && it > 0) break;
    meansInto(X, labels, k, sums, size, centres);
    // Refill empty clusters with the points farthest from their centres.
    for (let c = 0; c < k; c++) {
      if (size[c] > 0) continue;
      let far = -1;
      let farD = -1;
      for (let i = 0; i < n; i++) {
        if (size[labels[i]] > 1 && dist[i] > farD) {
          farD = dist[i];
          far = i;
        }
      }
      if (far < 0) break;
      size[labels[far]]--;
      labels[far] = c;
      size[c] = 1;
      dist[far] = 0;
      for (let t = 0; t < d; t++) centres[c * d + t] = data[far * d + t];
    }
  }
  meansInto(X, labels, k, sums, size, centres);
  let inertia = 0;
  for (let i = 0; i < n; i++) {
    const oi = i * d;
    const oc = labels[i] * d;
    for (let t = 0; t < d; t++) {
      const v = data[oi + t] - centres[oc + t];
      inertia += v * v;
    }
  }
  return { labels, inertia, iterations };
}

/** Cluster means into `centres` (a cluster with no points keeps its centre). */
function meansInto(X: Matrix, labels: Int32Array, k: number, sums: Float64Array, size: Int32Array, centres: Float64Array): void {
  const { n, d, data } = X;
  sums.fill(0);
  size.fill(0);
  for (let i = 0; i < n; i++) {
    const c = labels[i];
    size[c]++;
    const oi = i * d;
    const oc = c * d;
    for (let t = 0; t < d; t++) sums[oc + t] += data[oi + t];
  }
  for (let c = 0; c < k; c++) {
    if (size[c] === 0) continue;
    const inv = 1 / size[c];
    for (let t = 0; t < d; t++) centres[c * d + t] = sums[c * d + t] * inv;
  }
}

/**
 * Greedy k-means++: the first centre is a uniformly drawn point; each next
 * one is the best (smallest resulting potential Σ min D²) of 2 + ⌊ln k⌋
 * candidates drawn with probability ∝ D² to the centres so far.
 */
function seedCentres(X: Matrix, k: number, rng: Rng): Float64Array {
  const { n, d, data } = X;
  const centres = new Float64Array(k * d);
  const minD = new Float64Array(n);
  const trialD = new Float64Array(n);
  const bestD = new Float64Array(n);
  const trials = 2 + Math.floor(Math.log(k));
  const first = rng.int(n);
  centres.set(data.subarray(first * d, first * d + d), 0);
  let potential = 0;
  for (let i = 0; i < n; i++) {
    minD[i] = sqDist(X, i, X, first);
    potential += minD[i];
  }
  for (let c = 1; c < k; c++) {
    let bestCandidate = -1;
    let bestPotential = Infinity;
    for (let t = 0; t < trials; t++) {
      const candidate = potential > 0 ? drawByWeight(minD, potential, rng) : rng.int(n);
      let p = 0;
      for (let i = 0; i < n; i++) {
        const v = Math.min(minD[i], sqDist(X, i, X, candidate));
        trialD[i] = v;
        p += v;
      }
      if (p < bestPotential) {
        bestPotential = p;
        bestCandidate = candidate;
        bestD.set(trialD);
      }
    }
    centres.set(data.subarray(bestCandidate * d, bestCandidate * d + d), c * d);
    minD.set(bestD);
    potential = bestPotential;
  }
  return centres;
}

/** Index i drawn with probability w[i] / total. */
function drawByWeight(w: Float64Array, total: number, rng: Rng): number {
  const target = rng.next() * total;
  let acc = 0;
  let last = -1;
  for (let i = 0; i < w.length; i++) {
    if (w[i] <= 0) continue;
    acc += w[i];
    last = i;
    if (acc > target) return i;
  }
  return last;
}

/**
 * How well a map separates known labels: silhouette of the labels in the map
 * and leave-one-out k-nearest-neighbour label accuracy.
 *
 * Labels are non-negative integers per point; a negative label marks a point
 * without a label, which is left out of both scores (and casts no vote).
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { silhouette } from './clustering.js';

/**
 * Leave-one-out k-NN accuracy of the labels in a map: each labelled point is
 * classified by a majority vote of the labels of its k nearest other points
 * (the kNN graph excludes the point itself, so this is leave-one-out) and
 * the score is the fraction classified correctly.
 *
 * Vote ties: among the labels with the most votes, the one whose first vote
 * comes from the nearest neighbour wins (for k = 2 with two different labels,
 * the nearest neighbour's label). Neighbours are in the graph's (distance,
 * index) order. Unlabelled neighbours cast no vote; a point with no labelled
 * neighbour among its k counts as misclassified.
 *
 * @param knn exact kNN graph of the map with at least k columns.
 * @param labels label per point (negative = unlabelled).
 * @param k neighbours per vote, 1 ≤ k ≤ knn.k.
 * @returns accuracy in [0, 1], or null when no point is labelled.
 */
export function labelKnnAccuracy(knn: KnnGraph, labels: Int32Array, k: number): number | null {
  const n = knn.n;
  if (labels.length !== n) throw new RangeError(`there are ${labels.length} labels for ${n} points`);
  if (!Number.isInteger(k) || k < 1 || k > knn.k) {
    throw new RangeError(`k must be an integer from 1 to ${knn.k} (the graph's neighbours per point); received ${k}`);
  }
  let maxLabel = -1;
  for (let i = 0; i < n; i++) if (labels[i] > maxLabel) maxLabel = labels[i];
  if (maxLabel < 0) return null;
  const votes = new Int32Array(maxLabel + 1);
  const seen: number[] = [];
  let labelled = 0;
  let correct = 0;
  for (let i = 0; i < n; i++) {
    const own = labels[i];
    if (own < 0) continue;
    labelled++;
    seen.length = 0;
    let top = 0;
    for (let p = 0; p < k; p++) {
      const lab = labels[knn.indices[i * knn.k + p]];
      if (lab < 0) continue;
      if (votes[lab] === 0) seen.push(lab); // `seen` is in order of first (nearest) vote
      const v = ++votes[lab];
      if (v > top) top = v;
    }
    let best = -1;
    for (const lab of seen) {
      if (votes[lab] === top) {
        best = lab;
        break;
      }
    }
    for (const lab of seen) votes[lab] = 0;
    if (best === own) correct++;
  }
  return correct / labelled;
}

/**
 * Silhouette of the labels in the map (Rousseeuw 1987; `silhouette` of
 * ./clustering.ts, as scikit-learn 1.2.1 silhouette_score), over the
 * labelled points only. O(m²·d) for m labelled points.
 *
 * @param Y n × d map.
 * @param labels label per point (negative = unlabelled).
 * @returns the mean silhouette, or null when the labelled points carry fewer
 *   than 2 distinct labels or as many labels as points (silhouette undefined).
 */
export function labelSilhouette(Y: Matrix, labels: Int32Array): number | null {
  const n = Y.n;
  if (labels.length !== n) throw new RangeError(`there are ${labels.length} labels for ${n} points`);
  const keep: number[] = [];
  const distinct = new Set<number>();
  for (let i = 0; i < n; i++) {
    if (labels[i] < 0) continue;
    keep.push(i);
    distinct.add(labels[i]);
  }
  const m = keep.length;
  if (distinct.size < 2 || distinct.size > m - 1) return null;
  if (m === n) return silhouette(Y, labels);
  const d = Y.d;
  const data = new Float64Array(m * d);
  const lab = new Int32Array(m);
  keep.forEach((i, t) => {
    data.set(Y.data.subarray(i * d, (i + 1) * d), t * d);
    lab[t] = labels[i];
  });
  return silhouette({ n: m, d, data }, lab);
}

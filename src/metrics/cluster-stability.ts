/**
 * Cluster-wise stability across the maps of one setting (Hennig,
 * "Cluster-wise assessment of cluster stability", Comput. Stat. Data Anal.
 * 52 (2007) 258–271): every cluster of the first map's partition is matched
 * to its best counterpart in each other map by Jaccard similarity.
 */
import { clusterJaccard } from './clustering.js';
import { checkRowList, positionsOf } from './subset.js';

/**
 * Hennig's reading of a mean Jaccard value, with the cut-offs given in the
 * documentation of `clusterboot` in Hennig's R package fpc (formulated for
 * bootstrap resampling): ≤ 0.5 dissolved, < 0.6 not trustworthy, < 0.75
 * doubtful, < 0.85 stable, otherwise highly stable.
 */
export type HennigReading = 'dissolved' | 'not trustworthy' | 'doubtful' | 'stable' | 'highly stable';

/** Hennig's reading of a mean Jaccard value in [0, 1] (see `HennigReading`). */
export function hennigReading(meanJaccard: number): HennigReading {
  if (Number.isNaN(meanJaccard)) throw new RangeError('a mean Jaccard value is needed; received NaN');
  if (meanJaccard <= 0.5) return 'dissolved';
  if (meanJaccard < 0.6) return 'not trustworthy';
  if (meanJaccard < 0.75) return 'doubtful';
  if (meanJaccard < 0.85) return 'stable';
  return 'highly stable';
}

/** Stability of one cluster of the first map. */
export interface ClusterStabilityEntry {
  /** The cluster's label value in the first partition. */
  readonly cluster: number;
  /** Number of points in it (in the first map). */
  readonly size: number;
  /**
   * Mean over the other maps of the best-match Jaccard similarity; maps that
   * contain none of the cluster's points are skipped. NaN if every map was skipped.
   */
  readonly meanJaccard: number;
  /** Hennig's reading of `meanJaccard`; 'not compared' when it is NaN. */
  readonly reading: HennigReading | 'not compared';
  /** Best-match Jaccard in each other map, in map order (NaN = skipped). */
  readonly perMap: Float64Array;
  /**
   * Most common label among the cluster's points (ties: the smaller label),
   * when labels are given; null otherwise or when none of its points is labelled.
   */
  readonly majorityLabel: number | null;
}

/** Options of `clusterStability`. */
export interface ClusterStabilityOptions {
  /**
   * Dataset rows each partition covers (ascending; entry t of partition s is
   * dataset row rows[s][t]); null / absent = all rows in order.
   */
  readonly rows?: ReadonlyArray<Int32Array | null>;
  /** Number of dataset rows. Default: the length of the first partition (required with row lists). */
  readonly n?: number;
  /** Label per dataset row (negative = none), for the majority label. */
  readonly labels?: Int32Array | null;
}

/**
 * Hennig's cluster-wise stability of the first partition against the others
 * (typically the k-means partitions of the maps of the seeds).
 *
 * For cluster C of partitions[0] and another partition on rows S, the
 * similarity is max over its clusters D of |C∩S ∩ D| / |C∩S ∪ D|, with D
 * also restricted to the rows the first map covers (`clusterJaccard`); the
 * cluster's value is the mean over the other partitions that share at least
 * one of its points.
 *
 * @param partitions S ≥ 2 labelings; partitions[0] non-negative integers.
 * @returns one entry per cluster of partitions[0], ascending label value.
 */
export function clusterStability(
  partitions: readonly Int32Array[],
  opts: ClusterStabilityOptions = {},
): ClusterStabilityEntry[] {
  const S = partitions.length;
  if (S < 2) throw new RangeError(`cluster stability needs at least 2 partitions; received ${S}`);
  const n = opts.n ?? partitions[0].length;
  const rowLists = partitions.map((p, s) => {
    const r = opts.rows?.[s] ?? null;
    if (r === null) {
      if (p.length !== n) throw new RangeError(`partition ${s} has ${p.length} entries; pass its row list (n = ${n})`);
      return null;
    }
    if (r.length !== p.length) throw new RangeError(`partition ${s} has ${p.length} entries but its row list ${r.length}`);
    checkRowList(r, n, `the row list of partition ${s}`);
    return r;
  });
  const first = partitions[0];
  const firstRows = rowLists[0];
  const m0 = first.length;
  const perMap: Float64Array[] = [];
  for (let s = 1; s < S; s++) {
    // The other partition's labels on the first map's points; −1 = absent.
    const other = new Int32Array(m0).fill(-1);
    const pos = rowLists[s] === null ? null : positionsOf(rowLists[s] as Int32Array, n);
    for (let t = 0; t < m0; t++) {
      const row = firstRows === null ? t : firstRows[t];
      const q = pos === null ? row : pos[row];
      if (q >= 0) other[t] = partitions[s][q];
    }
    perMap.push(clusterJaccard(first, other));
  }
  const values = Array.from(new Set(Array.from(first))).sort((a, b) => a - b);
  const sizes = new Map<number, number>();
  for (let t = 0; t < m0; t++) sizes.set(first[t], (sizes.get(first[t]) ?? 0) + 1);
  const labels = opts.labels ?? null;
  if (labels !== null && labels.length !== n) throw new RangeError(`there are ${labels.length} labels for ${n} rows`);
  return values.map((cluster, c) => {
    const per = Float64Array.from(perMap, (v) => v[c]);
    let sum = 0;
    let used = 0;
    for (const v of per) {
      if (Number.isNaN(v)) continue;
      sum += v;
      used++;
    }
    const meanJaccard = used > 0 ? sum / used : NaN;
    let majorityLabel: number | null = null;
    if (labels !== null) {
      const tally = new Map<number, number>();
      for (let t = 0; t < m0; t++) {
        if (first[t] !== cluster) continue;
        const lab = labels[firstRows === null ? t : firstRows[t]];
        if (lab >= 0) tally.set(lab, (tally.get(lab) ?? 0) + 1);
      }
      let best = 0;
      for (const [lab, count] of tally) {
        if (count > best || (count === best && majorityLabel !== null && lab < majorityLabel)) {
          best = count;
          majorityLabel = lab;
        }
      }
    }
    return {
      cluster,
      size: sizes.get(cluster) ?? 0,
      meanJaccard,
      reading: Number.isNaN(meanJaccard) ? 'not compared' : hennigReading(meanJaccard),
      perMap: per,
      majorityLabel,
    };
  });
}

/**
 * Structure scores of one map against the data, split into a per-dataset
 * index (everything that depends only on the data, built once) and a cheap
 * per-run evaluation:
 *
 * - auc_rnx, rnx_curve — co-ranking R_NX(K) and its AUC on log K
 *   (./coranking.ts), exact up to `rnxExactLimit` points, else estimated from
 *   a seeded sample of query rows ranked against all points;
 * - distance_spearman — Spearman ρ of data vs map pairwise distances
 *   (./global.ts), over all pairs up to `pairExactLimit` points, else a seeded
 *   sample of pairs (the same pairs for every run);
 * - centroid_spearman — Spearman ρ of distances between group centroids
 *   (groups = labels, else the given partition);
 * - density_correlation — Pearson correlation of log k-NN radius
 *   (./density.ts);
 * - label_silhouette, label_knn_accuracy (./labels.ts).
 */
import { selectRows } from '../core/matrix.js';
import { Rng, deriveSeed } from '../core/rng.js';
import type { KnnGraph, Matrix } from '../core/types.js';
import type { RankTable } from './coranking.js';
import { RNX_EXACT_LIMIT, RNX_SAMPLE_ROWS, logSpacedK, rankTable, rnxFromTable, sampleRows } from './coranking.js';
import { logLocalRadius } from './density.js';
import type { PairList } from './global.js';
import {
  allPairs,
  averageRanks,
  centroidSpearmanFrom,
  groupCentroids,
  pairDistances,
  pearson,
  samplePairs,
} from './global.js';
import { labelKnnAccuracy, labelSilhouette } from './labels.js';
import { checkRowList, knnWithin, positionsOf } from './subset.js';

/** n at or below which distance_spearman uses every pair (n = 1000: 499,500 pairs). */
export const PAIR_EXACT_LIMIT = 1000;
/** Pairs sampled above `PAIR_EXACT_LIMIT`. */
export const PAIR_SAMPLE = 500_000;
/** Points of the R_NX curve kept for figures. */
export const RNX_CURVE_POINTS = 40;

/**
 * Everything data-side that the structure scores need, as plain typed
 * arrays (so it can be handed to worker threads). Build with
 * `buildScoringIndex`; memory is dominated by the rank table (4·q·n bytes for
 * q query rows: 16 MB at n = q = 2000, 40 MB at n = 10,000 with 1000 query
 * rows) and the pairs (24 bytes per pair, 12 MB for 500,000).
 */
export interface ScoringIndex {
  /** Dataset rows. */
  readonly n: number;
  /** Neighbourhood size for density and kNN label accuracy. */
  readonly k: number;
  readonly seed: number;
  /** The scored space (n × D), kept for scoring row subsets. */
  readonly reference: Matrix;
  /** Its exact kNN graph (≥ k columns). */
  readonly knnReference: KnnGraph;
  /** Label per row, compacted to 0..L−1 (−1 = none), or null. */
  readonly labels: Int32Array | null;
  /** Groups for the centroid correlation (the labels, else the given partition), compacted; or null. */
  readonly groups: Int32Array | null;
  readonly groupCount: number;
  /** groupCount × D centroids of the groups in the reference, and group sizes. */
  readonly groupCentroids: Float64Array;
  readonly groupSizes: Int32Array;
  /** True when every row is a co-ranking query (exact curves). */
  readonly rnxExact: boolean;
  /** Data ranks around the co-ranking query rows. */
  readonly rnx: RankTable;
  /** True when the pairs are all n(n−1)/2 pairs. */
  readonly allPairs: boolean;
  readonly pairI: Int32Array;
  readonly pairJ: Int32Array;
  /** Euclidean data distance of each pair. */
  readonly pairDistance: Float64Array;
  /** Average ranks of `pairDistance`. */
  readonly pairRank: Float64Array;
  /** log k-NN radius of every row in the reference (./density.ts). */
  readonly logRadius: Float64Array;
}

/** Options of `buildScoringIndex`. */
export interface ScoringIndexOptions {
  /** Neighbourhood size for density and kNN label accuracy (1 ≤ k ≤ knnReference.k). */
  readonly k: number;
  /** Label per row (any integers, negative = none), or null. */
  readonly labels: Int32Array | null;
  /** Base seed; the row and pair samples use streams derived from it. */
  readonly seed: number;
  /** Partition per row used for centroid_spearman when there are no labels (e.g. k-means of the data). */
  readonly groups?: Int32Array | null;
  /** Every row is a co-ranking query up to this n. Default `RNX_EXACT_LIMIT` (2000). */
  readonly rnxExactLimit?: number;
  /** Query rows sampled above the limit. Default `RNX_SAMPLE_ROWS` (1000). */
  readonly rnxSampleRows?: number;
  /** All pairs up to this n. Default `PAIR_EXACT_LIMIT` (1000). */
  readonly pairExactLimit?: number;
  /**
   * Pairs sampled above the limit. Default `PAIR_SAMPLE` (500,000). When the
   * sample would be at least half of all pairs, all pairs are used instead.
   */
  readonly pairSample?: number;
}

/**
 * Build the data-side index once per dataset: co-ranking query rows and
 * their data ranks, the distance pairs with their data distances and
 * ranks, group centroids and log k-NN radii.
 *
 * Cost: O(q·n·(D + 1)) for the rank table (q query rows), O(P·D) for P
 * pairs, O(n·k·D) for the radii.
 *
 * @param reference n × D points of the scored space.
 * @param knnReference exact kNN graph of `reference` with ≥ k columns. When
 *   maps will cover row subsets, give it spare columns (about 2k + 10): the
 *   data-side radii of a subset come from this graph filtered to the covered
 *   rows, and a row whose list runs out is scanned directly. At n = 10,000,
 *   D = 50, k = 15 and 90 % of rows covered, a 15-column graph sends most rows
 *   to a scan (about 5 s per run) where a 40-column graph needs almost none.
 */
export function buildScoringIndex(reference: Matrix, knnReference: KnnGraph, opts: ScoringIndexOptions): ScoringIndex {
  const { n } = reference;
  const { k, seed } = opts;
  if (n < 4) throw new RangeError(`structure scores need at least 4 points; received ${n}`);
  if (knnReference.n !== n) {
    throw new RangeError(`the kNN graph describes ${knnReference.n} points but the data has ${n}`);
  }
  if (!Number.isInteger(k) || k < 1 || k > knnReference.k) {
    throw new RangeError(`k must be an integer from 1 to ${knnReference.k} (the kNN graph's columns); received ${k}`);
  }
  const labels = opts.labels === null ? null : compact(opts.labels, n, 'labels');
  const partition = opts.groups ?? null;
  const groups = labels ?? (partition === null ? null : compact(partition, n, 'groups'));
  let groupCount = 0;
  if (groups !== null) for (const g of groups) if (g + 1 > groupCount) groupCount = g + 1;
  const cent = groups === null ? { centroids: new Float64Array(0), sizes: new Int32Array(0) } : groupCentroids(reference, groups, groupCount);

  const rnxExactLimit = opts.rnxExactLimit ?? RNX_EXACT_LIMIT;
  const rnxSampleRows = opts.rnxSampleRows ?? RNX_SAMPLE_ROWS;
  positiveInteger(rnxSampleRows, 'rnxSampleRows');
  const rnxExact = n <= rnxExactLimit || rnxSampleRows >= n;
  const queryRows = rnxExact ? undefined : sampleRows(n, rnxSampleRows, new Rng(deriveSeed(seed, 'scoring', 'rnx-rows')));
  const rnx = rankTable(reference, queryRows);

  const pairExactLimit = opts.pairExactLimit ?? PAIR_EXACT_LIMIT;
  const pairSample = opts.pairSample ?? PAIR_SAMPLE;
  positiveInteger(pairSample, 'pairSample');
  const total = (n * (n - 1)) / 2;
  const usesAll = n <= pairExactLimit || pairSample >= total / 2;
  const pairs: PairList = usesAll
    ? allPairs(n)
    : samplePairs(n, pairSample, new Rng(deriveSeed(seed, 'scoring', 'distance-pairs')));
  const pairDistance = pairDistances(reference, pairs);
  const pairRank = averageRanks(pairDistance);

  return {
    n,
    k,
    seed,
    reference,
    knnReference,
    labels,
    groups,
    groupCount,
    groupCentroids: cent.centroids,
    groupSizes: cent.sizes,
    rnxExact,
    rnx,
    allPairs: usesAll,
    pairI: pairs.i,
    pairJ: pairs.j,
    pairDistance,
    pairRank,
    logRadius: logLocalRadius(reference, knnReference, k),
  };
}

/** The per-run structure scores (field names as in results.json). */
export interface StructureScores {
  auc_rnx: number;
  rnx_curve: { K: number[]; values: number[] };
  distance_spearman: number;
  centroid_spearman: number | null;
  density_correlation: number;
  label_silhouette: number | null;
  label_knn_accuracy: number | null;
}

/**
 * Score one map against the index.
 *
 * With `rows` (the ascending dataset rows the map covers, map row t = dataset
 * row rows[t]) the map is scored against the data restricted to those rows:
 * co-ranking queries are the index's query rows that the map covers, with
 * their data ranks among the covered rows re-read from the table (O(q·n));
 * the pair set is the index's pairs with both ends covered, re-ranked
 * (O(P)); centroids are recomputed over the covered rows (O(m·D), one copy
 * of the covered reference rows); the data k-NN radii come from the
 * reference kNN graph filtered to the covered rows, with a direct O(m·D) scan
 * for each row whose cached list runs out of covered neighbours.
 *
 * NaN marks a score that is undefined for this map (e.g. all map distances
 * equal); null marks a score that does not apply (no labels, fewer than 3
 * groups).
 *
 * @param index from `buildScoringIndex`.
 * @param Y m × d map.
 * @param knnY exact kNN graph of Y with ≥ index.k columns.
 * @param rows dataset rows Y covers (default: all n, in order).
 */
export function scoreStructure(index: ScoringIndex, Y: Matrix, knnY: KnnGraph, rows?: Int32Array): StructureScores {
  const m = Y.n;
  const { n, k } = index;
  if (rows === undefined) {
    if (m !== n) throw new RangeError(`the map has ${m} rows but the dataset ${n}; pass the rows it covers`);
  } else {
    if (rows.length !== m) throw new RangeError(`the map has ${m} rows but ${rows.length} dataset rows were given`);
    checkRowList(rows, n, 'rows');
  }
  if (knnY.n !== m || knnY.k < k) {
    throw new RangeError(`the map's kNN graph must cover its ${m} rows with at least k = ${k} columns (has ${knnY.n} × ${knnY.k})`);
  }
  if (m < Math.max(4, k + 1)) throw new RangeError(`the map has ${m} rows; at least ${Math.max(4, k + 1)} are needed`);
  const subset = rows !== undefined && m < n;
  const sub = subset ? (rows as Int32Array) : null;

  // Co-ranking.
  const curves = rnxFromTable(index.rnx, Y, sub ?? undefined);
  const K = logSpacedK(m - 2, RNX_CURVE_POINTS);
  const rnxCurve = { K, values: K.map((x) => curves.rnx[x - 1]) };

  // Pairwise distances.
  let distanceSpearman: number;
  if (sub === null) {
    const dY = pairDistances(Y, { i: index.pairI, j: index.pairJ });
    distanceSpearman = pearson(index.pairRank, averageRanks(dY));
  } else {
    const pos = positionsOf(sub, n);
    const P = index.pairI.length;
    const keep: number[] = [];
    for (let t = 0; t < P; t++) if (pos[index.pairI[t]] >= 0 && pos[index.pairJ[t]] >= 0) keep.push(t);
    const local: PairList = {
      i: Int32Array.from(keep, (t) => pos[index.pairI[t]]),
      j: Int32Array.from(keep, (t) => pos[index.pairJ[t]]),
    };
    const dX = Float64Array.from(keep, (t) => index.pairDistance[t]);
    distanceSpearman = keep.length < 2 ? NaN : pearson(averageRanks(dX), averageRanks(pairDistances(Y, local)));
  }

  // Group centroids.
  let centroidSpearman: number | null = null;
  const groups = index.groups;
  if (groups !== null && index.groupCount >= 3) {
    const D = index.reference.d;
    if (sub === null) {
      const cy = groupCentroids(Y, groups, index.groupCount);
      centroidSpearman = centroidSpearmanFrom(index.groupCentroids, D, cy.centroids, Y.d, index.groupSizes);
    } else {
      const g = Int32Array.from(sub, (row) => groups[row]);
      const cx = groupCentroids(selectRows(index.reference, sub), g, index.groupCount);
      const cy = groupCentroids(Y, g, index.groupCount);
      centroidSpearman = centroidSpearmanFrom(cx.centroids, D, cy.centroids, Y.d, cx.sizes);
    }
  }

  // Local density.
  let logRX = index.logRadius;
  if (sub !== null) {
    const gX = knnWithin(index.reference, index.knnReference, sub, k);
    logRX = logLocalRadius(selectRows(index.reference, sub), gX, k);
  }
  const densityCorrelation = pearson(logRX, logLocalRadius(Y, knnY, k));

  // Labels.
  let labelSil: number | null = null;
  let labelAcc: number | null = null;
  if (index.labels !== null) {
    const lab = sub === null ? index.labels : Int32Array.from(sub, (row) => (index.labels as Int32Array)[row]);
    labelSil = labelSilhouette(Y, lab);
    labelAcc = labelKnnAccuracy(knnY, lab, k);
  }

  return {
    auc_rnx: curves.auc,
    rnx_curve: rnxCurve,
    distance_spearman: distanceSpearman,
    centroid_spearman: centroidSpearman,
    density_correlation: densityCorrelation,
    label_silhouette: labelSil,
    label_knn_accuracy: labelAcc,
  };
}

/** Sample sizes behind the costlier scores (results.json `dataset.scoring`). */
export function scoringSummary(index: ScoringIndex): { rnx_rows: number; distance_pairs: number; distance_all_pairs: boolean } {
  return { rnx_rows: index.rnx.rows.length, distance_pairs: index.pairI.length, distance_all_pairs: index.allPairs };
}

/**
 * A seeded sample of the index's pairs with their data distances, for
 * Shepard-style figures (results.json `dataset.distance_sample`): `size`
 * pairs drawn without replacement from the scoring pairs (all of them when
 * size ≥ their number), in the index's (i, j) order. The same index and size
 * always give the same pairs.
 */
export function distanceSample(index: ScoringIndex, size: number): { i: number[]; j: number[]; distance: number[] } {
  if (!Number.isInteger(size) || size < 0) throw new RangeError(`size must be a non-negative integer; received ${size}`);
  const P = index.pairI.length;
  let picked: Int32Array;
  if (size >= P) picked = Int32Array.from({ length: P }, (_, t) => t);
  else picked = size === 0 ? new Int32Array(0) : sampleRows(P, size, new Rng(deriveSeed(index.seed, 'scoring', 'distance-sample')));
  return {
    i: Array.from(picked, (t) => index.pairI[t]),
    j: Array.from(picked, (t) => index.pairJ[t]),
    distance: Array.from(picked, (t) => index.pairDistance[t]),
  };
}

// ---------------------------------------------------------------------------

/** Renumber non-negative values 0..G−1 in ascending order; negatives become −1. */
function compact(values: Int32Array, n: number, name: string): Int32Array {
  if (values.length !== n) throw new RangeError(`there are ${values.length} ${name} for ${n} rows`);
  const distinct = Array.from(new Set(Array.from(values).filter((v) => v >= 0))).sort((a, b) => a - b);
  const map = new Map<number, number>();
  distinct.forEach((v, t) => map.set(v, t));
  return Int32Array.from(values, (v) => (v >= 0 ? (map.get(v) as number) : -1));
}

function positiveInteger(v: number, name: string): void {
  if (!Number.isInteger(v) || v < 1) throw new RangeError(`${name} must be a positive integer; received ${v}`);
}

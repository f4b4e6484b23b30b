/**
 * Per-point stability across the maps of one setting (one map per seed):
 * how much each point's k-neighbourhood in the map changes between seeds.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { exactKnn } from '../neighbors/exact.js';
import { checkRowList, knnWithin, sharedRows } from './subset.js';

/** Options of `pointStability`. */
export interface PointStabilityOptions {
  /** Neighbourhood size, 1 ≤ k. */
  readonly k: number;
  /**
   * Dataset rows each map covers (ascending Int32Array; map row t = dataset
   * row rows[t]); null or absent = all n rows. Default: every map covers all rows.
   */
  readonly rows?: ReadonlyArray<Int32Array | null>;
  /** Number of dataset rows. Default: the rows of the first map (required with row lists). */
  readonly n?: number;
  /**
   * Exact kNN graphs of the maps, to reuse (any number of columns ≥ k; more
   * columns make subset comparisons cheaper). Computed when absent.
   */
  readonly knn?: ReadonlyArray<KnnGraph | null | undefined>;
}

/**
 * Stability of every point: the mean, over all pairs of maps that both
 * contain it, of the Jaccard overlap |A ∩ B| / |A ∪ B| of its k nearest
 * other points in the two maps (ties by index).
 *
 * Maps may cover different rows (resampling). A pair of maps is then
 * compared on the rows both cover, with each map's neighbourhoods recomputed
 * among those shared rows only; a pair sharing k rows or fewer is skipped.
 * A point that no compared pair shares gets NaN (leave it out of summaries).
 *
 * Cost: per pair O(m·k) when the maps' kNN graphs are long enough (else a
 * direct scan for the rows whose cached list runs out); S(S − 1)/2 pairs.
 *
 * @param maps S ≥ 2 maps (any dimension).
 * @returns Float64Array(n), values in [0, 1] or NaN.
 */
export function pointStability(maps: readonly Matrix[], opts: PointStabilityOptions): Float64Array {
  const S = maps.length;
  if (S < 2) throw new RangeError(`point stability needs at least 2 maps; received ${S}`);
  const { k } = opts;
  const rows = maps.map((m, s) => {
    const r = opts.rows?.[s] ?? null;
    if (r !== null && r.length !== m.n) {
      throw new RangeError(`map ${s} has ${m.n} rows but its row list has ${r.length}`);
    }
    return r;
  });
  const n = opts.n ?? maps[0].n;
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`k must be a positive integer; received ${k}`);
  const full = Int32Array.from({ length: n }, (_, i) => i);
  const rowList = rows.map((r, s) => {
    if (r === null) {
      if (maps[s].n !== n) throw new RangeError(`map ${s} has ${maps[s].n} rows; pass its row list (n = ${n})`);
      return full;
    }
    checkRowList(r, n, `the row list of map ${s}`);
    return r;
  });
  const sameRows = rowList.every((r) => r.length === n);
  // Cached neighbour lists; with subsets, spare columns so that most rows
  // find k shared neighbours without a scan.
  const graphs = maps.map((m, s) => {
    const given = opts.knn?.[s] ?? null;
    if (given !== null) {
      if (given.n !== m.n) throw new RangeError(`the kNN graph of map ${s} has ${given.n} points, the map ${m.n}`);
      if (given.k < k) throw new RangeError(`the kNN graph of map ${s} has ${given.k} columns; at least k = ${k} are needed`);
      return given;
    }
    if (m.n - 1 < k) return null;
    return exactKnn(m, Math.min(sameRows ? k : 2 * k + 10, m.n - 1));
  });

  const sum = new Float64Array(n);
  const count = new Int32Array(n);
  const stamp = new Int32Array(n).fill(-1);
  for (let a = 0; a < S; a++) {
    for (let b = a + 1; b < S; b++) {
      const shared = sharedRows(rowList[a], rowList[b]);
      const m = shared.length;
      if (m <= k) continue;
      const ga = neighboursOnShared(maps[a], graphs[a], rowList[a], shared, k);
      const gb = neighboursOnShared(maps[b], graphs[b], rowList[b], shared, k);
      for (let t = 0; t < m; t++) {
        for (let p = 0; p < k; p++) stamp[ga.indices[t * k + p]] = t;
        let s = 0;
        for (let p = 0; p < k; p++) if (stamp[gb.indices[t * k + p]] === t) s++;
        const row = shared[t];
        sum[row] += s / (2 * k - s);
        count[row]++;
      }
      stamp.fill(-1, 0, m);
    }
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = count[i] > 0 ? sum[i] / count[i] : NaN;
  return out;
}

/** kNN graph of a map restricted to `shared` (ascending dataset rows), indices = positions in `shared`. */
function neighboursOnShared(
  map: Matrix,
  graph: KnnGraph | null,
  rows: Int32Array,
  shared: Int32Array,
  k: number,
): KnnGraph {
  if (shared.length === map.n && graph !== null && graph.k === k) return graph;
  // Positions of the shared rows among the map's own rows (both ascending).
  const keep = new Int32Array(shared.length);
  let p = 0;
  for (let t = 0; t < shared.length; t++) {
    while (rows[p] < shared[t]) p++;
    keep[t] = p;
  }
  return knnWithin(map, graph, keep, k);
}

/** Summary of per-point stability values (NaN entries are left out). */
export interface PointStabilityStats {
  /** Mean over the points with a value. */
  readonly mean: number;
  /** 10th percentile, linear interpolation between order statistics (numpy's default). */
  readonly p10: number;
  /** Number of points with a value. */
  readonly count: number;
}

/**
 * Mean and 10th percentile of per-point stability values, NaN excluded.
 * The percentile interpolates linearly at position 0.1·(count − 1) of the
 * sorted values (numpy.percentile's default method). NaN for both when no
 * point has a value.
 */
export function pointStabilityStats(values: Float64Array): PointStabilityStats {
  const kept = values.filter((v) => !Number.isNaN(v)).sort();
  const c = kept.length;
  if (c === 0) return { mean: NaN, p10: NaN, count: 0 };
  let s = 0;
  for (let t = 0; t < c; t++) s += kept[t];
  const pos = 0.1 * (c - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, c - 1);
  const p10 = kept[lo] + (kept[hi] - kept[lo]) * (pos - lo);
  return { mean: s / c, p10, count: c };
}

/**
 * The m least stable points: rows sorted by value ascending, ties by row,
 * NaN entries skipped.
 *
 * @returns up to m entries {row, value}.
 */
export function leastStablePoints(values: Float64Array, m: number): Array<{ row: number; value: number }> {
  const rows: number[] = [];
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) rows.push(i);
  rows.sort((a, b) => values[a] - values[b] || a - b);
  return rows.slice(0, Math.max(0, m)).map((row) => ({ row, value: values[row] }));
}

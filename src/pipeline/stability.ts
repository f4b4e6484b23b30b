/**
 * Stability of one setting across its runs (seeds, and row resamples when
 * asked): every pair of runs is compared on the rows both embedded, by
 * Procrustes disparity, k-NN overlap and the adjusted Rand index of their
 * k-means partitions. Each map is clustered once; with every row present the
 * neighbour graph of each map is also computed once.
 */
import type { Rng } from '../core/rng.js';
import type { Embedding, KnnGraph, Matrix } from '../core/types.js';
import { selectRows } from '../core/matrix.js';
import { adjustedRandIndex, kmeansLabels } from '../metrics/clustering.js';
import { knnOverlap } from '../metrics/neighbourhood.js';
import { procrustes } from '../metrics/procrustes.js';
import { pointStability } from '../metrics/points.js';
import { clusterStability, type ClusterStabilityEntry } from '../metrics/cluster-stability.js';
import { knnOf } from '../neighbors/exact.js';
import { sharedRows } from './resample.js';

export interface PairComparison {
  a: number;
  b: number;
  sharedRows: number;
  procrustes: number;
  knnOverlap: number;
  ari: number;
}

export interface SettingStability {
  pairs: PairComparison[];
  procrustesMean: number | null;
  procrustesMax: number | null;
  seedKnnOverlap: number | null;
  ariMean: number | null;
  /** Every run embedded the same rows and produced the same bytes. */
  identicalMaps: boolean;
  /** k-means labels of each map, over that map's own points. */
  labels: Int32Array[];
  /** Per dataset row: mean Jaccard overlap of its k-neighbourhood across pairs of maps (NaN where never compared). */
  points: Float64Array;
  /** Hennig (2007) cluster-wise stability of the first map's k-means clusters. */
  clusters: ClusterStabilityEntry[];
}

const asMatrix = (e: Embedding): Matrix => ({ n: e.n, d: 2, data: e.data });

export function settingStability(
  maps: readonly Embedding[],
  n: number,
  opts: { k: number; clusters: number; rng: Rng; labels?: Int32Array | null },
): SettingStability {
  const S = maps.length;
  const labels = maps.map((e) => kmeansLabels(asMatrix(e), Math.min(opts.clusters, e.n - 1), opts.rng));
  const fullKnn: Array<KnnGraph | null> = maps.map((e) => (e.rows ? null : knnOf(asMatrix(e), opts.k)));
  const pairs: PairComparison[] = [];
  for (let a = 0; a < S; a++) {
    for (let b = a + 1; b < S; b++) {
      const ea = maps[a];
      const eb = maps[b];
      let A = asMatrix(ea);
      let B = asMatrix(eb);
      let la = labels[a];
      let lb = labels[b];
      let ka = fullKnn[a];
      let kb = fullKnn[b];
      const shared = ea.rows || eb.rows ? sharedRows(ea.rows ?? null, eb.rows ?? null, n) : null;
      if (shared) {
        A = selectRows(A, shared.inA);
        B = selectRows(B, shared.inB);
        la = pick(la, shared.inA);
        lb = pick(lb, shared.inB);
        ka = knnOf(A, Math.min(opts.k, A.n - 1));
        kb = knnOf(B, Math.min(opts.k, B.n - 1));
      }
      pairs.push({
        a,
        b,
        sharedRows: A.n,
        procrustes: procrustes(A, B).disparity,
        knnOverlap: knnOverlap(ka!, kb!, Math.min(opts.k, ka!.k)).fraction,
        ari: adjustedRandIndex(la, lb),
      });
    }
  }
  const mean = (f: (p: PairComparison) => number): number | null => (pairs.length ? pairs.reduce((s, p) => s + f(p), 0) / pairs.length : null);
  return {
    pairs,
    procrustesMean: mean((p) => p.procrustes),
    procrustesMax: pairs.length ? Math.max(...pairs.map((p) => p.procrustes)) : null,
    seedKnnOverlap: mean((p) => p.knnOverlap),
    ariMean: mean((p) => p.ari),
    identicalMaps: S >= 2 && maps.every((e) => sameMap(e, maps[0])),
    labels,
    points: pointStability(maps.map(asMatrix), { k: opts.k, n, rows: maps.map((e) => e.rows ?? null), knn: fullKnn }),
    clusters: clusterStability(labels, { n, rows: maps.map((e) => e.rows ?? null), labels: opts.labels ?? null }),
  };
}

function pick(a: Int32Array, idx: Int32Array): Int32Array {
  const out = new Int32Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = a[idx[i]];
  return out;
}

function sameMap(a: Embedding, b: Embedding): boolean {
  if (a.n !== b.n || a.data.length !== b.data.length) return false;
  if ((a.rows === undefined) !== (b.rows === undefined)) return false;
  if (a.rows && b.rows) for (let i = 0; i < a.rows.length; i++) if (a.rows[i] !== b.rows[i]) return false;
  for (let i = 0; i < a.data.length; i++) if (!Object.is(a.data[i], b.data[i])) return false;
  return true;
}

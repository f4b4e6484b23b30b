/**
 * Stability of one setting across its runs (seeds, and row resamples when
 * asked): pairwise scores (seedStability), per-point neighbourhood stability
 * and Hennig's cluster-wise stability, all on the rows the runs share.
 */
import type { Rng } from '../core/rng.js';
import type { Embedding, Matrix } from '../core/types.js';
import { clusterStability, type ClusterStabilityEntry } from '../metrics/cluster-stability.js';
import { pointStability } from '../metrics/points.js';
import { seedStability, type SeedStability } from '../metrics/stability.js';

export interface SettingStability extends SeedStability {
  /** Per dataset row: mean Jaccard overlap of its k-neighbourhood across pairs of maps (NaN where never compared). */
  points: Float64Array;
  /** Hennig (2007) cluster-wise stability of the first map's k-means clusters. */
  clusters: ClusterStabilityEntry[];
}

const asMatrix = (e: Embedding): Matrix => ({ n: e.n, d: 2, data: e.data });

/** Needs at least two maps. */
export function settingStability(
  maps: readonly Embedding[],
  n: number,
  opts: { k: number; clusters: number; rng: Rng; labels?: Int32Array | null },
): SettingStability {
  const matrices = maps.map(asMatrix);
  const rows = maps.map((e) => e.rows ?? null);
  const minN = Math.min(...maps.map((e) => e.n));
  const pairwise = seedStability(matrices, { k: opts.k, clusters: Math.min(opts.clusters, minN), rng: opts.rng, rows });
  return {
    ...pairwise,
    points: pointStability(matrices, { k: opts.k, n, rows }),
    clusters: clusterStability(pairwise.labels, { n, rows, labels: opts.labels ?? null }),
  };
}

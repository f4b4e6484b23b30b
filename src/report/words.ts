/**
 * Sentences of the summary: how each setting is judged, with its numbers
 * and the thresholds they are compared with. Plain text; the renderers
 * escape it.
 */
import type { ClusterStability, ResultsJson, SettingRecord } from '../core/results.js';
import { AGREEMENT_BANDS } from '../rank/rank.js';
import { fixed, methodName, settingLabel } from './format.js';

/**
 * Cluster-wise stability thresholds of Hennig (2007), "Cluster-wise
 * assessment of cluster stability", Computational Statistics & Data
 * Analysis 52: a cluster whose mean Jaccard similarity to its best match is
 * at least 0.75 is stable, at most 0.5 dissolved (values as given in the
 * documentation of Hennig's R package fpc, function clusterboot).
 */
export const HENNIG_STABLE = 0.75;
export const HENNIG_DISSOLVED = 0.5;

/** The attribution required wherever the thresholds are used. */
export const HENNIG_NOTE =
  'Hennig (2007), thresholds stated for bootstrap resampling; here the seeds (and row resamples, if any) are the resampling.';

/** How the cluster stability of a setting reads, in counts and named clusters. */
export interface ClusterReading {
  total: number;
  stable: ClusterStability[];
  dissolved: ClusterStability[];
  between: ClusterStability[];
}

export function readClusters(clusters: readonly ClusterStability[]): ClusterReading {
  const byNumber = [...clusters].sort((a, b) => a.cluster - b.cluster);
  return {
    total: clusters.length,
    stable: byNumber.filter((c) => c.mean_jaccard >= HENNIG_STABLE),
    dissolved: byNumber.filter((c) => c.mean_jaccard <= HENNIG_DISSOLVED),
    between: byNumber.filter((c) => c.mean_jaccard > HENNIG_DISSOLVED && c.mean_jaccard < HENNIG_STABLE),
  };
}

/** "cluster 3, mostly calm, 0.97" or "cluster 3, 0.97". */
export function clusterName(c: ClusterStability): string {
  const label = c.majority_label === undefined || c.majority_label === null ? '' : `, mostly ${c.majority_label}`;
  return `cluster ${c.cluster}${label}, ${fixed(c.mean_jaccard, 2)}`;
}

/** Named clusters separated by semicolons, at most `max` of them ("… and 3 more"). */
export function clusterList(list: readonly ClusterStability[], max: number): string {
  const shown = list.slice(0, max).map(clusterName).join('; ');
  return list.length > max ? `${shown}; and ${list.length - max} more` : shown;
}

/**
 * Clusters that held and dissolved, e.g. "k-means clusters of the first
 * seed's map: 2 of 3 stable across seeds (mean Jaccard ≥ 0.75 — cluster 0,
 * mostly calm, 0.97; cluster 1, 0.80), 1 dissolved (≤ 0.5 — cluster 2, 0.42)".
 */
export function clusterPhrase(clusters: readonly ClusterStability[], maxNames = 8): string {
  const r = readClusters(clusters);
  if (r.total === 0) return 'no k-means clusters to follow';
  const parts: string[] = [];
  parts.push(
    `${r.stable.length} of ${r.total} stable across seeds` +
      (r.stable.length > 0 ? ` (mean Jaccard ≥ ${HENNIG_STABLE} — ${clusterList(r.stable, maxNames)})` : ` (none reaches a mean Jaccard of ${HENNIG_STABLE})`),
  );
  parts.push(
    r.dissolved.length === 0
      ? `none dissolved (≤ ${HENNIG_DISSOLVED})`
      : `${r.dissolved.length} dissolved (≤ ${HENNIG_DISSOLVED} — ${clusterList(r.dissolved, maxNames)})`,
  );
  if (r.between.length > 0) parts.push(`${r.between.length} in between (${clusterList(r.between, maxNames)})`);
  return `k-means clusters of the first seed's map: ${parts.join(', ')}`;
}

/** "2 of 3 k-means clusters stable, 1 dissolved". */
export function clusterCounts(clusters: readonly ClusterStability[]): string {
  const r = readClusters(clusters);
  return `${r.stable.length} of ${r.total} k-means clusters stable (≥ ${HENNIG_STABLE}), ${r.dissolved.length} dissolved (≤ ${HENNIG_DISSOLVED})`;
}

/** ARI wording with its bands (Steinley 2004), for results without cluster-wise stability. */
export function ariPhrase(ari: number | null): string {
  if (ari === null || !Number.isFinite(ari)) return 'whether its k-means clusters held across seeds is unknown';
  const band =
    ari >= AGREEMENT_BANDS.good
      ? `held (≥ ${fixed(AGREEMENT_BANDS.good, 2)})`
      : ari >= AGREEMENT_BANDS.moderate
        ? `partly held (${fixed(AGREEMENT_BANDS.moderate, 2)}–${fixed(AGREEMENT_BANDS.good, 2)})`
        : `did not hold (< ${fixed(AGREEMENT_BANDS.moderate, 2)})`;
  return `its k-means clusters ${band} across seeds by the adjusted Rand index (ARI mean ${fixed(ari)}; bands of Steinley 2004)`;
}

/** What was varied between the runs of a setting. */
export function perturbationPhrase(s: SettingRecord, results: ResultsJson): string {
  const list = s.stability.perturbations;
  if (list && list.length > 0) return `perturbed by ${list.join('; ')}`;
  const resample = results.sweep.resample;
  const parts = [`seed (${s.seeds.length} seeds)`];
  if (resample !== undefined && resample < 1) parts.push(`row resample ${resample}`);
  return `perturbed by ${parts.join('; ')}`;
}

/**
 * One sentence per setting: rank and composite, the cluster stability read
 * against Hennig's thresholds (or the ARI bands when the results have no
 * cluster-wise stability), point stability when known, the perturbations,
 * and a warning when every seed gave the same map.
 */
export function settingSentence(s: SettingRecord, rankedCount: number, results: ResultsJson): string {
  const label = settingLabel(s.method, s.params);
  const head =
    s.rank === null ? `${label} (not ranked)` : `${label} (rank ${s.rank} of ${rankedCount}, composite ${fixed(s.score)})`;
  const st = s.stability;
  if (st.identical_maps) {
    return (
      `${head}: warning, every seed produced the identical map, so the seeds tested nothing and its stability is unknown; ` +
      `${perturbationPhrase(s, results)}.`
    );
  }
  if (s.method === 'pca') return `${head}: the linear baseline, one run; PCA is deterministic, so there is no stability across seeds to measure.`;
  if (st.pairs === 0) return `${head}: only one run succeeded, so its stability across seeds was not measured; ${perturbationPhrase(s, results)}.`;
  const parts: string[] = [];
  parts.push(st.clusters && st.clusters.length > 0 ? clusterPhrase(st.clusters, 4) : ariPhrase(st.ari_mean));
  if (st.points) {
    parts.push(`point stability mean ${fixed(st.points.mean, 2)} (10th percentile ${fixed(st.points.p10, 2)})`);
  }
  parts.push(perturbationPhrase(s, results));
  return `${head}: ${parts.join('; ')}.`;
}

/**
 * The top of the summary: which setting to use and whether its clusters
 * survive seed changes. Null fields when nothing was ranked.
 */
export function headline(ranked: readonly SettingRecord[]): { pick: string; clusters: string } | null {
  const best = ranked[0];
  if (!best) return null;
  const label = settingLabel(best.method, best.params);
  const pick = `Use ${label}: rank 1 of ${ranked.length}, composite score ${fixed(best.score)} (best ${methodName(best.method)} setting).`;
  const st = best.stability;
  let clusters: string;
  if (st.clusters && st.clusters.length > 0) {
    const r = readClusters(st.clusters);
    const verdict =
      r.stable.length === r.total
        ? `All ${r.total} of its k-means clusters survive seed changes`
        : r.stable.length === 0
          ? `None of its ${r.total} k-means clusters survives seed changes reliably`
          : `${r.stable.length} of its ${r.total} k-means clusters survive seed changes`;
    const parts = [`${verdict} (Hennig 2007 thresholds on the mean Jaccard over the other seeds).`];
    if (r.stable.length > 0) parts.push(`Stable (≥ ${HENNIG_STABLE}): ${clusterList(r.stable, 8)}.`);
    parts.push(r.dissolved.length > 0 ? `Dissolved (≤ ${HENNIG_DISSOLVED}): ${clusterList(r.dissolved, 8)}.` : `None dissolved (≤ ${HENNIG_DISSOLVED}).`);
    if (r.between.length > 0) parts.push(`In between: ${clusterList(r.between, 8)}.`);
    clusters = parts.join(' ');
  } else {
    const a = ariPhrase(st.ari_mean);
    clusters = `${a.charAt(0).toUpperCase()}${a.slice(1)}.`;
  }
  return { pick, clusters };
}

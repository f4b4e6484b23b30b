/**
 * The results.json contract. Field names are snake_case and stable: users'
 * scripts read them. Add fields; never rename or remove one without bumping
 * `format`.
 */

export const RESULTS_FORMAT = 'steadyfold.results/1';

export interface MeanSd {
  mean: number | null;
  sd: number | null;
}

export interface RunMetrics {
  trustworthiness: number | null;
  continuity: number | null;
  knn_overlap: number | null;
  /** Exact KL(P‖Q) of the returned t-SNE embedding; absent for other methods. */
  kl_divergence?: number | null;
  /** Area under R_NX(K) against log K, weights 1/K (Lee, Peluffo-Ordóñez & Verleysen 2015). */
  auc_rnx?: number | null;
  /** Spearman correlation of pairwise distances, data vs map (all pairs or a seeded sample, see dataset.scoring). */
  distance_spearman?: number | null;
  /** Spearman correlation of distances between label/cluster centroids, data vs map. */
  centroid_spearman?: number | null;
  /** Pearson correlation of log local radius, data vs map (Narayan, Berger & Cho 2021). */
  density_correlation?: number | null;
  /** Silhouette of the labels in the map (only with --label). */
  label_silhouette?: number | null;
  /** Leave-one-out kNN label accuracy in the map (only with --label). */
  label_knn_accuracy?: number | null;
}

/** A curve sampled at neighbourhood sizes K. */
export interface Curve {
  K: number[];
  values: number[];
}

export interface RunRecord {
  id: string;
  setting: string;
  method: string;
  params: Record<string, number | string>;
  seed: number;
  /** Seconds the embedding took (wall clock, in its worker). */
  seconds: number;
  /** Seconds scoring it took (wall clock, in its worker). */
  score_seconds?: number;
  cache: 'computed' | 'reused';
  status: 'ok' | 'failed';
  error?: string;
  /** Path of the embedding CSV relative to results.json, or null when the run failed. */
  embedding: string | null;
  metrics: RunMetrics;
  /** R_NX(K) at log-spaced K (for the curve figure). */
  rnx_curve?: Curve | null;
  /** Number of rows this run embedded (less than dataset.n when rows were resampled). */
  rows?: number;
}

export interface StabilityRecord {
  /** Mean over seed pairs of scipy-style standardised Procrustes disparity. */
  procrustes_mean: number | null;
  procrustes_max: number | null;
  /** Mean over seed pairs of the mean fraction of shared k nearest neighbours. */
  seed_knn_overlap: number | null;
  /** Mean over seed pairs of the adjusted Rand index of k-means clusterings. */
  ari_mean: number | null;
  /** Number of seed pairs compared. */
  pairs: number;
  /** True when every seed produced the same map (seeds tested nothing). */
  identical_maps: boolean;
  /** What differed between the runs of this setting, e.g. ["seed: random initialisation", "row resample 0.9"]. */
  perturbations?: string[];
  /** Cluster-wise stability (Hennig 2007): each cluster of the first seed's k-means partition, best-match Jaccard in the other seeds. */
  clusters?: ClusterStability[];
  /** Per-point stability summary; the full per-point values are in `points_file`. */
  points?: PointStabilitySummary | null;
}

export interface ClusterStability {
  /** Cluster number in the first seed's k-means partition (0-based, numbered by first appearance). */
  cluster: number;
  size: number;
  /** Mean over the other seeds of the best-match Jaccard similarity. */
  mean_jaccard: number;
  /** Hennig's reading: 'dissolved' (≤ 0.5), 'not trustworthy' (< 0.6), 'doubtful' (0.6–0.75), 'stable' (≥ 0.75), 'highly stable' (≥ 0.85). */
  reading: string;
  /** Most common label among its points, when labels exist. */
  majority_label?: string | null;
}

export interface PointStabilitySummary {
  /** Mean over points of the mean Jaccard overlap of each point's k-neighbourhood across seed pairs. */
  mean: number;
  /** 10th percentile over points. */
  p10: number;
  /** The least stable points, worst first. */
  least_stable: Array<{ row: number; id: string; label: string | null; value: number }>;
  /** CSV (row,id,stability) with one line per point, relative to results.json. */
  points_file: string;
}

export interface SettingRecord {
  id: string;
  method: string;
  params: Record<string, number | string>;
  seeds: number[];
  /** 1 = best; null when the setting is not ranked (seeds tested nothing, or every run failed). */
  rank: number | null;
  /** Composite score in [0, 1], or null when not ranked. */
  score: number | null;
  /** The components the score was built from. */
  score_parts: { faithfulness: number | null; stability: number | null };
  metrics: Record<string, MeanSd>;
  stability: StabilityRecord;
  /** One plain-language sentence with the setting's numbers. */
  verdict: string;
}

export interface ResultsJson {
  format: typeof RESULTS_FORMAT;
  steadyfold: { version: string };
  provenance: {
    command: string;
    created: string;
    cores: number;
    node: string;
  };
  dataset: {
    path: string;
    n: number;
    d: number;
    sha256: string;
    label: string | null;
    id: string | null;
    dropped_rows: number;
    dropped_columns: string[];
    preprocess: {
      scale: boolean;
      pca_dims: number | null;
      /** Explained-variance ratio of each kept principal component (empty without PCA). */
      explained_variance_ratio: number[];
      input_dims: number;
      /** The space trustworthiness, continuity and kNN overlap are measured against. */
      scored_against: string;
    };
    /** Label of each row (for colouring), or null. */
    labels: string[] | null;
    /** Id of each row, or null (then ids are 1-based row numbers). */
    ids: string[] | null;
    /**
     * A seeded sample of row pairs with their distance in the scored space,
     * for Shepard-style figures (map distances come from the embeddings).
     */
    distance_sample?: { i: number[]; j: number[]; distance: number[] };
    /** How the costlier scores were computed (sample sizes). */
    scoring?: {
      /** Rows used as query points for the co-ranking curves (all rows up to a limit, else a seeded sample). */
      rnx_rows: number;
      /** Pairs used for the distance Spearman correlation. */
      distance_pairs: number;
      /** Whether the distance pairs are all pairs (false: a seeded sample). */
      distance_all_pairs: boolean;
      /**
       * Rows trustworthiness and continuity average over: all rows up to 10,000,
       * else a seeded sample of 5,000 (each with exact ranks among all rows).
       */
      rank_rows?: number;
    };
  };
  sweep: {
    k: number;
    clusters: number;
    clusters_source: string;
    seeds: number[];
    rank_by: string;
    workers: number;
    /** Fraction of rows each run sees (1 = all rows; below 1 a seeded resample per seed). */
    resample?: number;
    /** Seconds the whole audit took (wall clock). */
    seconds?: number;
    /**
     * Wall-clock seconds of the stages after loading and preprocessing:
     * neighbours, scoring_index, runs (embedding and scoring on the workers)
     * and stability (per-setting scores and ranking).
     */
    stage_seconds?: Record<string, number>;
    /** The time `plan` estimated for it. */
    estimated_seconds?: number;
  };
  runs: RunRecord[];
  settings: SettingRecord[];
}

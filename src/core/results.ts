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
}

export interface RunRecord {
  id: string;
  setting: string;
  method: string;
  params: Record<string, number | string>;
  seed: number;
  seconds: number;
  cache: 'computed' | 'reused';
  status: 'ok' | 'failed';
  error?: string;
  /** Path of the embedding CSV relative to results.json, or null when the run failed. */
  embedding: string | null;
  metrics: RunMetrics;
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
  };
  sweep: {
    k: number;
    clusters: number;
    clusters_source: string;
    seeds: number[];
    rank_by: string;
    workers: number;
  };
  runs: RunRecord[];
  settings: SettingRecord[];
}

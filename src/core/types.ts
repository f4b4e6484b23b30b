/**
 * Plain data passed between pipeline stages. Every numeric block is a flat,
 * row-major typed array with its shape stored beside it.
 */

/** Row-major n × d matrix of doubles. */
export interface Matrix {
  readonly n: number;
  readonly d: number;
  readonly data: Float64Array;
}

/** A loaded table: numeric features plus optional label and id columns. */
export interface Dataset {
  /** Path as given by the user. */
  readonly path: string;
  /** File name without directory and extension; used for default output folders. */
  readonly name: string;
  /** sha256 of the file's bytes, hex. */
  readonly sha256: string;
  readonly matrix: Matrix;
  /** Names of the feature columns kept, in matrix column order. */
  readonly columns: string[];
  /** Label per row (categorical, as text) or null when no label column was named. */
  readonly labels: string[] | null;
  /** Id per row or null; when null, ids are the 1-based data row numbers. */
  readonly ids: string[] | null;
  /** Rows dropped because of missing or non-finite values (`--missing drop`). */
  readonly droppedRows: number;
  /** Feature columns dropped because their variance is zero. */
  readonly droppedColumns: string[];
}

/**
 * k nearest neighbours of every point, self excluded, sorted by
 * (distance, index) ascending. Distances are Euclidean (not squared).
 */
export interface KnnGraph {
  readonly n: number;
  readonly k: number;
  /** n × k neighbour indices. */
  readonly indices: Int32Array;
  /** n × k distances, matching `indices`. */
  readonly distances: Float64Array;
}

/** A 2-D embedding: n points, coordinates interleaved (x0, y0, x1, y1, …). */
export interface Embedding {
  readonly n: number;
  readonly data: Float64Array;
  /**
   * The dataset rows (0-based, ascending) the points stand for, when the run
   * embedded a subset of the rows; absent when it embedded every row in order.
   */
  readonly rows?: Int32Array;
}

export type MethodName = 'tsne' | 'umap' | 'pca';

/** Parameters of one embedding run, already validated and with defaults filled in. */
export interface MethodParams {
  perplexity?: number;
  nNeighbors?: number;
  minDist?: number;
  init?: string;
  iterations?: number;
}

/** One planned embedding run. `id` is stable: it depends only on the setting and the seed. */
export interface RunSpec {
  readonly id: string;
  readonly settingId: string;
  readonly method: MethodName;
  readonly params: MethodParams;
  readonly seed: number;
}

/** One setting of the grid: a method and its parameters, run once per seed. */
export interface SettingSpec {
  readonly id: string;
  readonly method: MethodName;
  readonly params: MethodParams;
  readonly seeds: number[];
}

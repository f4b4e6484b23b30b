/**
 * One run, start to finish: embed, then score against the shared neighbour
 * graph. The local worker pool, the in-process executor and any future
 * remote executor all call this same function.
 */
import type { KnnGraph, Matrix, RunSpec } from '../core/types.js';
import { embeddingAsMatrix, selectRows } from '../core/matrix.js';
import { resampleRows } from './resample.js';
import { neighbours, rankRowsFor, scoringNeighbours } from './prepare.js';
import { embedOne, type EmbedContext, type Progress } from '../embed/run.js';
import { EXACT_KNN_LIMIT, knnPrefix } from '../neighbors/exact.js';
import { continuity, knnOverlap, trustworthiness } from '../metrics/neighbourhood.js';
import { scoreStructure, type ScoringIndex } from '../metrics/scoring.js';
import type { Curve, RunMetrics } from '../core/results.js';

/** Undefined scores (a degenerate map) are recorded as null, never as NaN. */
function finiteOrNull(x: number | null): number | null {
  return x === null || !Number.isFinite(x) ? null : x;
}

export interface RunContext extends EmbedContext {
  /** Neighbourhood size for the scores. */
  k: number;
  /**
   * The space the scores measure faithfulness to: the input features after
   * optional scaling, before PCA (the same object as X when no PCA ran).
   */
  reference: Matrix;
  /** Exact k nearest neighbours of `reference` (k columns). */
  knnReference: KnnGraph;
  /** Fraction of rows each seed embeds (1 = all; see resample.ts). */
  resample: number;
  /** Data-side part of the structure scores, built once per dataset. */
  scoring: ScoringIndex;
}

export interface RunOutput {
  id: string;
  /** Dataset rows embedded (0-based, ascending) when the run saw a resample; absent for all rows. */
  rows?: Int32Array;
  /** Interleaved x, y of every point in input order. */
  embedding: Float64Array;
  /** Seconds spent embedding (resample included). */
  seconds: number;
  /** Seconds spent scoring the embedding. */
  scoreSeconds: number;
  info: Record<string, number>;
  metrics: RunMetrics;
  rnxCurve: Curve;
}

/** The context restricted to a subset of rows: neighbours recomputed exactly within the subset. */
export function subsetContext(ctx: RunContext, rows: Int32Array): RunContext {
  const X = selectRows(ctx.X, rows);
  const knn = neighbours(X, Math.min(ctx.knn.k, X.n - 1));
  const sameSpace = ctx.reference === ctx.X;
  const reference = sameSpace ? X : selectRows(ctx.reference, rows);
  const knnReference = sameSpace && X.n <= EXACT_KNN_LIMIT ? knnPrefix(knn, Math.min(ctx.k, knn.k)) : scoringNeighbours(reference, ctx.k);
  return { X, knn, k: ctx.k, reference, knnReference, resample: 1, scoring: ctx.scoring };
}

export function runOne(full: RunContext, spec: RunSpec, onProgress?: Progress): RunOutput {
  const t0 = performance.now();
  const rows = resampleRows(full.X.n, full.resample, spec.seed);
  const ctx = rows ? subsetContext(full, rows) : full;
  const { embedding, info } = embedOne(ctx, spec, onProgress);
  const t1 = performance.now();
  const seconds = (t1 - t0) / 1000;
  const Y = embeddingAsMatrix(embedding);
  const knnX: KnnGraph = ctx.knnReference.k === ctx.k ? ctx.knnReference : knnPrefix(ctx.knnReference, ctx.k);
  const knnY = scoringNeighbours(Y, ctx.k);
  const structure = scoreStructure(full.scoring, Y, knnY, rows ?? undefined);
  const rankRows = rankRowsFor(Y.n);
  const metrics: RunMetrics = {
    // Without a resample every run shares ctx.reference, so its row cache carries over from run to run.
    trustworthiness: trustworthiness(ctx.reference, Y, ctx.k, { knnX, knnY, rows: rankRows, reuseRanks: rows === null }),
    continuity: continuity(ctx.reference, Y, ctx.k, { knnX, knnY, rows: rankRows }),
    knn_overlap: knnOverlap(knnX, knnY, ctx.k).fraction,
    auc_rnx: finiteOrNull(structure.auc_rnx),
    distance_spearman: finiteOrNull(structure.distance_spearman),
    centroid_spearman: finiteOrNull(structure.centroid_spearman),
    density_correlation: finiteOrNull(structure.density_correlation),
    label_silhouette: finiteOrNull(structure.label_silhouette),
    label_knn_accuracy: finiteOrNull(structure.label_knn_accuracy),
  };
  if (spec.method === 'tsne') metrics.kl_divergence = finiteOrNull(info.kl_divergence ?? null);
  const scoreSeconds = (performance.now() - t1) / 1000;
  const out: RunOutput = { id: spec.id, embedding: embedding.data, seconds, scoreSeconds, info, metrics, rnxCurve: structure.rnx_curve };
  if (rows) out.rows = rows;
  return out;
}

/**
 * One run, start to finish: embed, then score against the shared neighbour
 * graph. The local worker pool, the in-process executor and any future
 * remote executor all call this same function.
 */
import type { KnnGraph, Matrix, RunSpec } from '../core/types.js';
import { embeddingAsMatrix } from '../core/matrix.js';
import { embedOne, type EmbedContext, type Progress } from '../embed/run.js';
import { knnOf, knnPrefix } from '../neighbors/exact.js';
import { continuity, knnOverlap, trustworthiness } from '../metrics/neighbourhood.js';

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
}

export interface RunOutput {
  id: string;
  /** Interleaved x, y of every point in input order. */
  embedding: Float64Array;
  seconds: number;
  info: Record<string, number>;
  metrics: { trustworthiness: number; continuity: number; knn_overlap: number };
}

export function runOne(ctx: RunContext, spec: RunSpec, onProgress?: Progress): RunOutput {
  const t0 = performance.now();
  const { embedding, info } = embedOne(ctx, spec, onProgress);
  const seconds = (performance.now() - t0) / 1000;
  const Y = embeddingAsMatrix(embedding);
  const knnX: KnnGraph = ctx.knnReference.k === ctx.k ? ctx.knnReference : knnPrefix(ctx.knnReference, ctx.k);
  const knnY = knnOf(Y, ctx.k);
  const metrics = {
    trustworthiness: trustworthiness(ctx.reference, Y, ctx.k, { knnX, knnY }),
    continuity: continuity(ctx.reference, Y, ctx.k, { knnX, knnY }),
    knn_overlap: knnOverlap(knnX, knnY, ctx.k).fraction,
  };
  return { id: spec.id, embedding: embedding.data, seconds, info, metrics };
}

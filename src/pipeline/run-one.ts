/**
 * One run, start to finish: embed, then score against the shared neighbour
 * graph. The local worker pool, the in-process executor and any future
 * remote executor all call this same function.
 */
import type { KnnGraph, RunSpec } from '../core/types.js';
import { embeddingAsMatrix } from '../core/matrix.js';
import { embedOne, type EmbedContext, type Progress } from '../embed/run.js';
import { knnOf, knnPrefix } from '../neighbors/exact.js';
import { continuity, knnOverlap, trustworthiness } from '../metrics/neighbourhood.js';

export interface RunContext extends EmbedContext {
  /** Neighbourhood size for the scores. */
  k: number;
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
  const knnX: KnnGraph = ctx.knn.k === ctx.k ? ctx.knn : knnPrefix(ctx.knn, ctx.k);
  const knnY = knnOf(Y, ctx.k);
  const metrics = {
    trustworthiness: trustworthiness(ctx.X, Y, ctx.k, { knnX, knnY }),
    continuity: continuity(ctx.X, Y, ctx.k, { knnX, knnY }),
    knn_overlap: knnOverlap(knnX, knnY, ctx.k).fraction,
  };
  return { id: spec.id, embedding: embedding.data, seconds, info, metrics };
}

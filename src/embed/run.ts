/**
 * Dispatch one run to its method. Each run gets its own generator derived
 * from (seed, setting id, 'embed'), so its result does not depend on which
 * worker ran it or in what order.
 */
import { Rng, deriveSeed } from '../core/rng.js';
import type { Embedding, KnnGraph, Matrix, RunSpec } from '../core/types.js';
import { pca2 } from '../preprocess/pca.js';
import { runTsne, type TsneInit } from './tsne/index.js';
import { fuzzySimplicialSet, runUmap, type FuzzyGraph, type UmapInit } from './umap/index.js';

export interface EmbedContext {
  /** Data as the methods see it (after scaling and PCA), n × d. */
  X: Matrix;
  /** Exact neighbours of X, enough columns for every run. */
  knn: KnnGraph;
  /**
   * UMAP fuzzy graphs by n_neighbors, built on first use and reused by every
   * seed and min_dist of this context (the result is identical either way).
   */
  fuzzyGraphs?: Map<number, FuzzyGraph>;
  /**
   * Threads one embedding may use (t-SNE splits its work by fixed ranges, so
   * the bytes do not depend on it). 1 inside a pool worker, where the sweep
   * already fills the cores; the core count when one embedding runs alone.
   */
  threads?: number;
}

export interface EmbedOutcome {
  embedding: Embedding;
  /** Method-specific facts about the run (snake_case, numbers only). */
  info: Record<string, number>;
}

export type Progress = (done: number, total: number) => void;

export function embedOne(ctx: EmbedContext, spec: RunSpec, onProgress?: Progress): EmbedOutcome {
  const rng = new Rng(deriveSeed(spec.seed, spec.settingId, 'embed'));
  switch (spec.method) {
    case 'tsne': {
      const r = runTsne(
        ctx.X,
        ctx.knn,
        {
          perplexity: spec.params.perplexity ?? 30,
          iterations: spec.params.iterations ?? 1000,
          init: (spec.params.init as TsneInit | undefined) ?? 'pca',
          threads: ctx.threads ?? 1,
          onProgress,
        },
        rng,
      );
      return {
        embedding: r.embedding,
        info: { kl_divergence: r.klDivergence, iterations: r.iterations, learning_rate: r.learningRate },
      };
    }
    case 'umap': {
      const nNeighbors = spec.params.nNeighbors ?? 15;
      let graph = ctx.fuzzyGraphs?.get(nNeighbors);
      if (!graph) {
        graph = fuzzySimplicialSet(ctx.knn, nNeighbors);
        ctx.fuzzyGraphs?.set(nNeighbors, graph);
      }
      const init = (spec.params.init as UmapInit | undefined) ?? 'spectral';
      const r = runUmap(ctx.X, ctx.knn, { nNeighbors, minDist: spec.params.minDist ?? 0.1, init, graph, onProgress }, rng);
      return { embedding: r.embedding, info: { epochs: r.epochs } };
    }
    case 'pca':
      return { embedding: pca2(ctx.X, rng), info: {} };
  }
}

/**
 * t-SNE on typed arrays: affinities, exact and Barnes-Hut gradients, the
 * optimiser and the exact KL divergence of a layout.
 */
export { runTsne, EXACT_MAX_POINTS, MAX_THREADS, PARALLEL_MIN_POINTS } from './tsne.js';
export type { TsneOptions, TsneResult, TsneInit } from './tsne.js';
export { TSNE_INITS } from './tsne.js';
export {
  calibrate,
  jointExact,
  jointFromKnn,
  neighboursForPerplexity,
  MACHINE_EPSILON,
  PERPLEXITY_MAX_STEPS,
  PERPLEXITY_TOLERANCE,
} from './affinities.js';
export type { Calibration, SparseAffinities } from './affinities.js';
export { bhGradient, exactGradient } from './gradient.js';
export type { GradientResult } from './gradient.js';
export { klDivergence } from './kl.js';
export { pcaInit, randomInit, spectralInit, INIT_SCALE } from './init.js';
export { optimizeEmbedding } from './optimize.js';
export type { OptimizeOptions } from './optimize.js';
export { QuadTree, LEAF_CAPACITY, MAX_DEPTH } from './quadtree.js';

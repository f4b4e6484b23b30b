/**
 * UMAP on typed arrays (McInnes, Healy & Melville 2018, arXiv 1802.03426),
 * as umap-learn computes it: the default engine. The umap-js wrapper in
 * `umapjs.ts` stays as the reference implementation for tests and benchmarks
 * and is not re-exported here.
 */
export { runUmap, defaultEpochs } from './umap.js';
export type { UmapOptions, UmapResult, UmapInit } from './umap.js';
export {
  fuzzySimplicialSet,
  smoothKnnDistances,
  pruneGraph,
  maxWeight,
  SMOOTH_K_STEPS,
  SMOOTH_K_TOLERANCE,
  MIN_K_DIST_SCALE,
} from './graph.js';
export type { FuzzyGraph, SmoothDistances } from './graph.js';
export { fitAB, CURVE_POINTS } from './curve.js';
export type { CurveParams } from './curve.js';
export { optimizeLayoutInPlace, GRADIENT_CLIP, REPULSION_EPSILON } from './sgd.js';
export { powTables, powWith, powChecked, MIN_NORMAL } from './fastpow.js';
export type { PowTables } from './fastpow.js';
export type { SgdOptions } from './sgd.js';

/**
 * Starting layouts shared by the embedding engines: spectral (Laplacian
 * eigenmaps of a neighbour graph, arranged as umap-learn does), PCA and
 * uniform random. All return interleaved n × 2 arrays in a box of about
 * ±10; callers rescale to what their optimiser expects (UMAP maps each axis to
 * [0, 10] with `rescaleToBox`; t-SNE shrinks its start to a standard deviation
 * of 1e-4), so a t-SNE run can start from the spectral layout of its own
 * affinity graph too.
 */
export { spectralLayout, spectralCoordinates, laplacianEigenvectors, connectedComponents, MIN_SPECTRAL_COMPONENT } from './spectral.js';
export type { WeightedGraph, Components, SpectralOptions } from './spectral.js';
export { pcaLayout, principalScores2 } from './pca.js';
export { randomLayout } from './random.js';
export { noisyScaleInPlace, rescaleToBox, scaleToMaxAbsInPlace, LAYOUT_MAX_COORD, LAYOUT_NOISE_SD } from './scale.js';
export { largestEigenpairs, denseSymmetricEigen, fixSignInPlace, fixedStartVector } from './eigen.js';
export type { EigenResult, LanczosOptions, SymmetricOperator } from './eigen.js';

/**
 * Scaling steps shared by the starting layouts (interleaved n × 2 arrays).
 */
import type { Rng } from '../../core/rng.js';

/** Largest |coordinate| of a starting layout after `noisyScaleInPlace` (umap-learn's `noisy_scale_coords`). */
export const LAYOUT_MAX_COORD = 10;

/** Standard deviation of the Gaussian jitter umap-learn adds to spectral and PCA starts. */
export const LAYOUT_NOISE_SD = 1e-4;

/**
 * Multiply every coordinate by `maxCoord / max|y|` (nothing when y is all
 * zero). Mutates and returns y.
 */
export function scaleToMaxAbsInPlace(y: Float64Array, maxCoord = LAYOUT_MAX_COORD): Float64Array {
  let big = 0;
  for (let e = 0; e < y.length; e++) big = Math.max(big, Math.abs(y[e]));
  if (big > 0) {
    const s = maxCoord / big;
    for (let e = 0; e < y.length; e++) y[e] *= s;
  }
  return y;
}

/**
 * umap-learn's `noisy_scale_coords`: scale so max |coordinate| = `maxCoord`,
 * then add independent N(0, sd²) noise drawn from `rng` in the order
 * x0, y0, x1, y1, …. Mutates and returns y.
 */
export function noisyScaleInPlace(y: Float64Array, rng: Rng, maxCoord = LAYOUT_MAX_COORD, sd = LAYOUT_NOISE_SD): Float64Array {
  scaleToMaxAbsInPlace(y, maxCoord);
  for (let e = 0; e < y.length; e++) y[e] += sd * rng.normal();
  return y;
}

/**
 * A copy of the n × 2 layout with each axis mapped affinely onto [0, size]
 * (10·(x − min)/(max − min)), as umap-learn does to every starting layout just
 * before its optimisation. An axis with no spread is set to 0.
 */
export function rescaleToBox(y: Float64Array, size = 10): Float64Array {
  const out = new Float64Array(y.length);
  const n = y.length >> 1;
  for (let c = 0; c < 2; c++) {
    let lo = Number.POSITIVE_INFINITY;
    let hi = Number.NEGATIVE_INFINITY;
    for (let i = 0; i < n; i++) {
      const v = y[2 * i + c];
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    const range = hi - lo;
    for (let i = 0; i < n; i++) out[2 * i + c] = range > 0 ? (size * (y[2 * i + c] - lo)) / range : 0;
  }
  return out;
}

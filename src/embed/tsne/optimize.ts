/**
 * Gradient descent for t-SNE with momentum and per-coordinate gains
 * (Jacobs 1988 "delta-bar-delta" gains as used by van der Maaten & Hinton
 * 2008), following the schedule of scikit-learn 1.2.1 `TSNE._tsne`:
 *
 * - phase 1 (`exaggerationIterations` steps): P multiplied by the early
 *   exaggeration, momentum 0.5;
 * - phase 2 (the rest): plain P, momentum 0.8;
 * - per coordinate: gain + 0.2 when the previous step and the gradient have
 *   opposite signs (the descent direction persists), × 0.8 otherwise,
 *   floored at 0.01;
 *   step = momentum · step − η · gain · gradient;
 * - velocities and gains restart (0 and 1) at the start of each phase.
 *
 * Learning-rate convention. `learningRate` is in the scale of bhtsne and
 * openTSNE, whose gradient omits the factor 4 of ∂KL/∂y. The gradient used
 * here is the true ∂KL/∂y (with the 4, like scikit-learn), so the step uses
 * η = learningRate / 4. Thus learningRate 200 here equals scikit-learn's
 * learning_rate = 50, and 'auto' = max(n / 12, 200) equals scikit-learn
 * 1.2.1's max(n / 12 / 4, 50).
 *
 * Differences from scikit-learn: all arithmetic is float64; the embedding
 * is re-centred (mean subtracted) after every step — the per-coordinate
 * gains and the small Barnes-Hut force imbalance otherwise let the map
 * drift, and since the gradient, steps and gains do not depend on position
 * this changes the trajectory only by a translation; there is no early
 * stopping, every requested iteration runs.
 *
 * Deterministic: fixed loop orders everywhere, no randomness.
 */
import type { SparseAffinities } from './affinities.js';
import { attractiveForcesInto, combineInto, denseForcesInto, isDenseLayout, exactRepulsionInto } from './gradient.js';
import { QuadTree } from './quadtree.js';

export interface OptimizeOptions {
  /** Total number of iterations, both phases together. */
  readonly iterations: number;
  /** Length of phase 1 (capped at `iterations`). */
  readonly exaggerationIterations: number;
  /** Factor applied to P in phase 1. */
  readonly earlyExaggeration: number;
  /** Learning rate in the bhtsne/openTSNE scale (see the module comment). */
  readonly learningRate: number;
  /** Barnes-Hut opening angle; ignored when `exact`. */
  readonly theta: number;
  /** Exact O(n²) repulsion instead of Barnes-Hut. */
  readonly exact: boolean;
  readonly onProgress?: (iteration: number, total: number) => void;
}

const MOMENTUM_EXAGGERATED = 0.5;
const MOMENTUM_FINAL = 0.8;
const GAIN_UP = 0.2;
const GAIN_DOWN = 0.8;
const MIN_GAIN = 0.01;

/**
 * Run the optimisation from `y0` (interleaved n × 2; not modified) and
 * return the final interleaved coordinates.
 */
export function optimizeEmbedding(P: SparseAffinities, y0: Float64Array, opts: OptimizeOptions): Float64Array {
  const n = P.n;
  const len = 2 * n;
  const y = Float64Array.from(y0);
  const attr = new Float64Array(len);
  const rep = new Float64Array(len);
  const grad = new Float64Array(len);
  const update = new Float64Array(len);
  const gains = new Float64Array(len);
  const dense = opts.exact && isDenseLayout(P);
  const tree = opts.exact ? null : new QuadTree(Math.max(64, (n >> 1) | 0));
  const eta = opts.learningRate / 4;
  const phase1 = Math.min(opts.exaggerationIterations, opts.iterations);
  const total = opts.iterations;

  for (let it = 0; it < total; it++) {
    if (it === 0 || it === phase1) {
      update.fill(0);
      gains.fill(1);
    }
    const exaggerated = it < phase1;
    const s = exaggerated ? opts.earlyExaggeration : 1;
    const momentum = exaggerated ? MOMENTUM_EXAGGERATED : MOMENTUM_FINAL;

    let z: number;
    if (dense) {
      z = denseForcesInto(P, y, s, attr, rep);
    } else {
      attractiveForcesInto(P, y, s, attr);
      if (tree === null) {
        z = exactRepulsionInto(y, n, rep);
      } else {
        tree.build(y, n);
        z = tree.repulsion(opts.theta, rep);
      }
    }
    combineInto(attr, rep, z, n, grad);

    for (let t = 0; t < len; t++) {
      const g = grad[t];
      const u = update[t];
      let gain = gains[t];
      gain = u * g < 0 ? gain + GAIN_UP : gain * GAIN_DOWN;
      if (gain < MIN_GAIN) gain = MIN_GAIN;
      gains[t] = gain;
      const step = momentum * u - eta * gain * g;
      update[t] = step;
      y[t] += step;
    }
    let mx = 0;
    let my = 0;
    for (let i = 0; i < n; i++) {
      mx += y[2 * i];
      my += y[2 * i + 1];
    }
    mx /= n;
    my /= n;
    for (let i = 0; i < n; i++) {
      y[2 * i] -= mx;
      y[2 * i + 1] -= my;
    }
    opts.onProgress?.(it + 1, total);
  }
  return y;
}

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
 * Deterministic: fixed loop orders everywhere, no randomness. The
 * Barnes-Hut gradient is formed point by point — attraction over each row
 * of P, repulsion per quadtree leaf (kernels.ts) — and Z is summed from
 * per-point values in a fixed order (the quadtree's), so the work can be
 * spread over threads (team.ts) without changing a single bit of the result.
 */
import type { SparseAffinities } from './affinities.js';
import { sharedF64, sharedI32 } from './arrays.js';
import { denseForcesInto, exactRepulsionInto, attractiveForcesInto, isDenseLayout } from './gradient.js';
import { G_ATTR_CHUNK, G_ATTR_ITEMS, G_LEAVES, G_LEAVES_PER_ITEM, G_N, G_NODES, G_THETA2, JOB_GRADIENT } from './jobs.js';
import { sumInOrder } from './kernels.js';
import { QuadTree } from './quadtree.js';
import { Team } from './team.js';

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
  /**
   * Threads for the Barnes-Hut gradient, the calling thread included
   * (default 1); the result is the same bytes for every value. Ignored in
   * exact mode.
   */
  readonly threads?: number;
  readonly onProgress?: (iteration: number, total: number) => void;
}

const MOMENTUM_EXAGGERATED = 0.5;
const MOMENTUM_FINAL = 0.8;
const GAIN_UP = 0.2;
const GAIN_DOWN = 0.8;
const MIN_GAIN = 0.01;
/** Points per attraction work item. */
const ATTRACTION_CHUNK = 256;
/** Quadtree leaves per repulsion work item (about 60–120 points at 16 points per leaf). */
const LEAVES_PER_ITEM = 8;

/**
 * Run the optimisation from `y0` (interleaved n × 2; not modified) and
 * return the final interleaved coordinates.
 */
export function optimizeEmbedding(P: SparseAffinities, y0: Float64Array, opts: OptimizeOptions): Float64Array {
  const team = new Team(opts.exact ? 1 : opts.threads ?? 1);
  try {
    return optimizeWith(P, y0, opts, team).slice();
  } finally {
    team.close();
  }
}

/**
 * `optimizeEmbedding` on the threads of `team`. Returns the coordinates in
 * an array from `team.arrays` (shared memory when the team has workers).
 */
export function optimizeWith(P: SparseAffinities, y0: Float64Array, opts: OptimizeOptions, team: Team): Float64Array {
  const n = P.n;
  const len = 2 * n;
  if (y0.length !== len) throw new RangeError(`the starting layout has ${y0.length} values, expected 2n = ${len}`);
  const arrays = team.arrays;
  const y = arrays.f64(len);
  y.set(y0);
  const attr = arrays.f64(len);
  const rep = arrays.f64(len);
  const update = new Float64Array(len);
  const gains = new Float64Array(len);
  const dense = opts.exact && isDenseLayout(P);
  const eta = opts.learningRate / 4;
  const phase1 = Math.min(opts.exaggerationIterations, opts.iterations);
  const total = opts.iterations;

  let tree: QuadTree | null = null;
  let zTree: Float64Array | null = null;
  let treeVersion = -1;
  const attrItems = Math.ceil(n / ATTRACTION_CHUNK);
  if (!opts.exact) {
    const shared = arrays.shared;
    tree = new QuadTree(Math.max(64, (n >> 2) | 0), arrays);
    zTree = arrays.f64(n);
    team.share({
      indptr: shared ? sharedI32(P.indptr) : P.indptr,
      indices: shared ? sharedI32(P.indices) : P.indices,
      values: shared ? sharedF64(P.values) : P.values,
      y,
      attr,
      rep,
      zTree,
    });
    const p = team.params;
    p[G_N] = n;
    p[G_ATTR_CHUNK] = ATTRACTION_CHUNK;
    p[G_ATTR_ITEMS] = attrItems;
    p[G_LEAVES_PER_ITEM] = LEAVES_PER_ITEM;
    p[G_THETA2] = opts.theta * opts.theta;
  }

  for (let it = 0; it < total; it++) {
    if (it === 0 || it === phase1) {
      update.fill(0);
      gains.fill(1);
    }
    const exaggerated = it < phase1;
    const s = exaggerated ? opts.earlyExaggeration : 1;
    const momentum = exaggerated ? MOMENTUM_EXAGGERATED : MOMENTUM_FINAL;

    let z: number;
    // Position of point i's repulsion in `rep` (tree order in Barnes-Hut mode).
    let repAt: Int32Array | null = null;
    if (tree !== null && zTree !== null) {
      // Workers start on the attraction while this thread builds the tree.
      team.post(JOB_GRADIENT, attrItems, attrItems);
      tree.build(y, n);
      if (tree.version !== treeVersion) {
        treeVersion = tree.version;
        const t = tree;
        team.share({
          firstChild: t.firstChild, start: t.start, count: t.count, comX: t.comX, comY: t.comY, side: t.side,
          perm: t.perm, px: t.px, py: t.py, leaves: t.leaves,
        });
      }
      team.params[G_NODES] = tree.nodeCount;
      team.params[G_LEAVES] = tree.leafCount;
      team.open(attrItems + Math.ceil(tree.leafCount / LEAVES_PER_ITEM));
      team.work();
      z = sumInOrder(zTree, n);
      repAt = tree.pos;
    } else if (dense) {
      z = denseForcesInto(P, y, 1, attr, rep);
    } else {
      attractiveForcesInto(P, y, 1, attr);
      z = exactRepulsionInto(y, n, rep);
    }

    // ∂KL/∂y = 4·(s·F_attr − F_rep / Z), then the gains and momentum step.
    const invZ = 1 / z;
    for (let t = 0; t < len; t++) {
      const r = repAt === null ? t : 2 * repAt[t >> 1] + (t & 1);
      const g = 4 * (s * attr[t] - rep[r] * invZ);
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
  if (tree !== null) {
    team.release(['attr', 'rep', 'zTree', 'firstChild', 'start', 'count', 'comX', 'comY', 'side', 'perm', 'px', 'py', 'leaves']);
  }
  return y;
}

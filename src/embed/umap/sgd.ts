/**
 * UMAP's layout optimisation: stochastic gradient descent on the fuzzy
 * cross-entropy with edge sampling and negative sampling (McInnes, Healy &
 * Melville 2018, arXiv 1802.03426, §3.2 and Algorithm 5), with the schedule
 * of umap-learn's `optimize_layout_euclidean` run single-threaded.
 */
import type { Rng } from '../../core/rng.js';
import { MIN_NORMAL, powTables, powWith } from './fastpow.js';
import type { FuzzyGraph } from './graph.js';

/** Per-coordinate gradient bound (umap-learn `clip`). */
export const GRADIENT_CLIP = 4;
/** Added to d² in the repulsive coefficient so that it stays finite (umap-learn: 0.001). */
export const REPULSION_EPSILON = 0.001;

export interface SgdOptions {
  /** Curve parameters from `fitAB`. */
  a: number;
  b: number;
  /** Number of epochs, ≥ 1. */
  epochs: number;
  /** Negative samples per positive sample. Default 5. */
  negativeSampleRate?: number;
  /** Weight of the repulsive term γ. Default 1. */
  repulsionStrength?: number;
  /** Initial learning rate α₀, decayed linearly to 0. Default 1. */
  learningRate?: number;
  /** Called after epochs 1, 26, 51, … and after the last one with (epochs done, total). */
  onProgress?: (epoch: number, total: number) => void;
}

/**
 * Optimise the interleaved n × 2 layout `y` in place for the edges of `graph`
 * (every stored entry (i, j) is one directed edge, visited in CSR order:
 * rows ascending, columns ascending).
 *
 * Schedule (umap-learn): edge e has epochs_per_sample = max(w)/w_e and is
 * processed in epoch t when its next due epoch is ≤ t (first due at
 * epochs_per_sample, so epoch 0 does nothing). A processed edge (j, k) pulls
 * y_j and y_k together by α·clip(−2ab·d^(2b−2)/(1 + a·d^(2b)) · (y_j − y_k)),
 * then y_j is pushed away from ⌊(t − next negative epoch)/(epochs_per_sample/rate)⌋
 * vertices drawn uniformly by α·clip(2γb/((0.001 + d²)(1 + a·d^(2b))) · (y_j − y_l))
 * (+4 per coordinate when y_l coincides with y_j, nothing when l = j; a pair
 * closer than √MIN_NORMAL ≈ 1.5e-154 counts as coincident, so every power is
 * taken of a normal double).
 * α = α₀ in epochs 0 and 1 and α₀·(1 − (t − 1)/epochs) in epoch t ≥ 1, as umap-learn
 * updates it after each epoch. Clip bounds each coordinate to ±4.
 *
 * d^(2b) is computed once per pair from tables built for this b (`powWith`:
 * exponent split, two table loads and a binomial series, within 1e-14 of
 * `Math.pow` for the distances that occur) and reused for the attractive
 * numerator (d^(2b−2) = d^(2b)/d²), so no step calls `Math.pow`.
 *
 * Negative samples: l = ⌊u·n / 2³²⌋ for 32-bit words u of a xoshiro128**
 * stream (Blackman & Vigna 2018) whose state is four `rng.nextU32()` draws
 * taken at the start — the seeded `Rng` decides every sample, while the hot
 * loop keeps the generator in local integer variables (a method call per draw
 * would cost as much as the gradient step). The multiply-shift reduction has
 * a bias of at most n / 2³² in probability per vertex, negligible for
 * n ≪ 2³², as for umap-learn's `tau_rand_int(state) % n`.
 *
 * Single-threaded with a fixed visiting order, so the same layout, graph
 * and generator state give the same bytes.
 */
export function optimizeLayoutInPlace(y: Float64Array, graph: FuzzyGraph, opts: SgdOptions, rng: Rng): void {
  const { n, indptr, indices, weights } = graph;
  if (y.length !== 2 * n) throw new RangeError(`layout has ${y.length} entries, expected 2·n = ${2 * n}`);
  const nEpochs = opts.epochs;
  if (!(Number.isInteger(nEpochs) && nEpochs >= 1)) throw new RangeError(`epochs must be a positive integer, got ${nEpochs}`);
  const a = opts.a;
  const b = opts.b;
  const rate = opts.negativeSampleRate ?? 5;
  const gamma = opts.repulsionStrength ?? 1;
  const alpha0 = opts.learningRate ?? 1;
  const nEdges = weights.length;

  const head = new Int32Array(nEdges);
  const tail = new Int32Array(nEdges);
  const eps = new Float64Array(nEdges);
  let wMax = 0;
  for (let e = 0; e < nEdges; e++) if (weights[e] > wMax) wMax = weights[e];
  for (let i = 0; i < n; i++) {
    for (let e = indptr[i]; e < indptr[i + 1]; e++) {
      head[e] = i;
      tail[e] = indices[e];
    }
  }
  // umap-learn `make_epochs_per_sample`: n_epochs / (n_epochs · w / max w); −1 (never) for w = 0.
  for (let e = 0; e < nEdges; e++) {
    const samples = nEpochs * (weights[e] / wMax);
    eps[e] = samples > 0 ? nEpochs / samples : -1;
  }
  const nextSample = eps.slice();
  const epsNeg = new Float64Array(nEdges);
  for (let e = 0; e < nEdges; e++) epsNeg[e] = eps[e] / rate;
  const nextNeg = epsNeg.slice();

  const pow = powTables(b);
  const twoAB = 2 * a * b;
  const twoGB = 2 * gamma * b;
  const clip = GRADIENT_CLIP;
  const scaleU = n / 4294967296;
  let alpha = alpha0;
  // Negative-sampling stream: xoshiro128** in local int32 variables, seeded by four draws from rng.
  let s0 = rng.nextU32() | 0;
  let s1 = rng.nextU32() | 0;
  let s2 = rng.nextU32() | 0;
  let s3 = rng.nextU32() | 0;
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1;

  for (let epoch = 0; epoch < nEpochs; epoch++) {
    for (let e = 0; e < nEdges; e++) {
      const due = nextSample[e];
      if (due > epoch || due < 0) continue;
      const j = head[e];
      const k = tail[e];
      const jx = 2 * j;
      const kx = 2 * k;
      let yjx = y[jx];
      let yjy = y[jx + 1];
      const dx = yjx - y[kx];
      const dy = yjy - y[kx + 1];
      const d2 = dx * dx + dy * dy;
      if (d2 >= MIN_NORMAL) {
        const pw = powWith(pow, d2);
        const coeff = (-twoAB * pw) / (d2 * (a * pw + 1));
        let gx = coeff * dx;
        let gy = coeff * dy;
        gx = gx > clip ? clip : gx < -clip ? -clip : gx;
        gy = gy > clip ? clip : gy < -clip ? -clip : gy;
        yjx += gx * alpha;
        yjy += gy * alpha;
        y[kx] -= gx * alpha;
        y[kx + 1] -= gy * alpha;
      }
      nextSample[e] = due + eps[e];

      const en = epsNeg[e];
      const nNeg = rate > 0 ? Math.floor((epoch - nextNeg[e]) / en) : 0;
      for (let p = 0; p < nNeg; p++) {
        const m5 = Math.imul(s1, 5);
        const u = Math.imul((m5 << 7) | (m5 >>> 25), 9) >>> 0;
        const t9 = s1 << 9;
        s2 ^= s0;
        s3 ^= s1;
        s1 ^= s2;
        s0 ^= s3;
        s2 ^= t9;
        s3 = (s3 << 11) | (s3 >>> 21);
        const l = Math.floor(u * scaleU);
        if (l === j) continue;
        const lx = 2 * l;
        const ex = yjx - y[lx];
        const ey = yjy - y[lx + 1];
        const q2 = ex * ex + ey * ey;
        let gx: number;
        let gy: number;
        if (q2 >= MIN_NORMAL) {
          const pw = powWith(pow, q2);
          const coeff = twoGB / ((REPULSION_EPSILON + q2) * (a * pw + 1));
          gx = coeff * ex;
          gy = coeff * ey;
          gx = gx > clip ? clip : gx < -clip ? -clip : gx;
          gy = gy > clip ? clip : gy < -clip ? -clip : gy;
        } else {
          gx = clip;
          gy = clip;
        }
        yjx += gx * alpha;
        yjy += gy * alpha;
      }
      y[jx] = yjx;
      y[jx + 1] = yjy;
      if (nNeg > 0) nextNeg[e] += nNeg * en;
    }
    alpha = alpha0 * (1 - epoch / nEpochs);
    if (opts.onProgress && (epoch % 25 === 0 || epoch === nEpochs - 1)) opts.onProgress(epoch + 1, nEpochs);
  }
}

/** Uniform random starting layout. */
import type { Rng } from '../../core/rng.js';

/**
 * n points with independent coordinates uniform in [−10, 10), drawn from
 * `rng` in the order x0, y0, x1, y1, … — umap-learn's `init='random'` and
 * umap-js's only initialisation. Interleaved n × 2.
 */
export function randomLayout(n: number, rng: Rng): Float64Array {
  const out = new Float64Array(2 * n);
  for (let e = 0; e < 2 * n; e++) out[e] = 20 * rng.next() - 10;
  return out;
}

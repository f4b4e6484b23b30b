/**
 * How many k-means clusters the cluster-agreement score uses: the user's
 * number, else the number of labels, else the count in 2..10 with the best
 * silhouette (Rousseeuw 1987) of k-means on the data itself.
 */
import { Rng, deriveSeed, sampleIndices } from '../core/rng.js';
import type { Matrix } from '../core/types.js';
import { selectRows } from '../core/matrix.js';
import { kmeansLabels, silhouette } from '../metrics/clustering.js';
import { DATA_SEED } from './prepare.js';

export interface ClusterChoice {
  clusters: number;
  source: string;
}

/** Rows used for the silhouette search (seeded subsample above this). */
const SILHOUETTE_ROWS = 1000;

export function chooseClusters(X: Matrix, labels: string[] | null, labelColumn: string | undefined, requested: number | null): ClusterChoice {
  if (requested !== null) return { clusters: Math.min(requested, X.n - 1), source: 'given by the user' };
  if (labels) {
    const c = new Set(labels).size;
    if (c >= 2 && c <= X.n / 2) return { clusters: c, source: `number of distinct labels in column '${labelColumn ?? 'label'}'` };
  }
  const rng = new Rng(deriveSeed(DATA_SEED, 'clusters'));
  const rows = X.n > SILHOUETTE_ROWS ? sampleIndices(X.n, SILHOUETTE_ROWS, rng) : Int32Array.from({ length: X.n }, (_, i) => i);
  const S = selectRows(X, rows);
  let best = 2;
  let bestScore = -Infinity;
  for (let c = 2; c <= Math.min(10, S.n - 1); c++) {
    const labels = kmeansLabels(S, c, new Rng(deriveSeed(DATA_SEED, 'clusters', c)));
    const s = silhouette(S, labels);
    if (s > bestScore + 1e-12) {
      bestScore = s;
      best = c;
    }
  }
  return {
    clusters: best,
    source: `best silhouette (${bestScore.toFixed(3)}) of k-means on the data for 2..10 clusters${X.n > SILHOUETTE_ROWS ? `, on a seeded sample of ${SILHOUETTE_ROWS} rows` : ''}`,
  };
}

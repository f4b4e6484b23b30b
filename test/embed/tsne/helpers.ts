/** Shared inputs for the t-SNE tests. */
import { readFileSync } from 'node:fs';
import type { Rng } from '../../../src/core/rng.js';
import type { KnnGraph, Matrix } from '../../../src/core/types.js';

export const fixture = (name: string): string => new URL(`../../fixtures/${name}`, import.meta.url).pathname;

export interface S10Perplexity {
  beta_root: number[];
  sklearn_conditional: number[][];
  sklearn_perplexity: number[];
  kl_sklearn_p: number;
  kl_root_p: number;
  grad_root_p: number[];
}

/** Values written by test/fixtures/scripts/tsne_reference.py (scikit-learn 1.2.1, SciPy 1.10.1, NumPy 1.24.2). */
export interface TsneReference {
  versions: Record<string, string>;
  s10: {
    X: number[][];
    Y: number[][];
    perplexities: Record<string, S10Perplexity>;
    optimised: {
      perplexity: number;
      learning_rate_sklearn: number;
      n_iter: number;
      exaggeration_iterations: number;
      early_exaggeration: number;
      /** The dense joint P (n × n) handed to scikit-learn's optimiser. */
      P: number[][];
      embedding: number[][];
    };
  };
  d500: { perplexity: number; k: number; kl_exact: number; kl_sparse: number; beta_rows: number[]; beta_root: number[] };
}

export function loadReference(): TsneReference {
  return JSON.parse(readFileSync(fixture('tsne_reference.json'), 'utf8')) as TsneReference;
}

/** First 500 rows of scikit-learn 1.2.1's bundled UCI digits (64 pixel columns) and their labels. */
export function loadDigits500(): { X: Matrix; labels: Int32Array } {
  const lines = readFileSync(fixture('digits500_X.csv'), 'utf8').trim().split('\n').slice(1);
  const n = lines.length;
  const data = new Float64Array(n * 64);
  const labels = new Int32Array(n);
  lines.forEach((line, i) => {
    const cells = line.split(',').map(Number);
    labels[i] = cells[0];
    for (let t = 0; t < 64; t++) data[i * 64 + t] = cells[t + 1];
  });
  return { X: { n, d: 64, data }, labels };
}

/** The fixed 2-D PCA layout E1 of the digits rows (interleaved x, y). */
export function loadDigitsE1(): Float64Array {
  const lines = readFileSync(fixture('digits500_pca2.csv'), 'utf8').trim().split('\n').slice(1);
  const out = new Float64Array(2 * lines.length);
  lines.forEach((line, i) => {
    const cells = line.split(',');
    out[2 * i] = Number(cells[2]);
    out[2 * i + 1] = Number(cells[3]);
  });
  return out;
}

/** Exact kNN by sorting every row (self excluded, ties by index): a deliberately naive reference. */
export function naiveKnn(X: Matrix, k: number): KnnGraph {
  const { n, d, data } = X;
  const indices = new Int32Array(n * k);
  const distances = new Float64Array(n * k);
  for (let i = 0; i < n; i++) {
    const row: Array<[number, number]> = [];
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      let s = 0;
      for (let t = 0; t < d; t++) s += (data[i * d + t] - data[j * d + t]) ** 2;
      row.push([s, j]);
    }
    row.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    for (let t = 0; t < k; t++) {
      indices[i * k + t] = row[t][1];
      distances[i * k + t] = Math.sqrt(row[t][0]);
    }
  }
  return { n, k, indices, distances };
}

/** n points from a mixture of `clusters` isotropic Gaussians in d dimensions. */
export function gaussianMixture(
  rng: Rng,
  n: number,
  d: number,
  clusters: number,
  separation: number,
): { X: Matrix; labels: Int32Array } {
  const centres = new Float64Array(clusters * d);
  for (let e = 0; e < centres.length; e++) centres[e] = separation * rng.normal();
  const data = new Float64Array(n * d);
  const labels = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const c = i % clusters;
    labels[i] = c;
    for (let t = 0; t < d; t++) data[i * d + t] = centres[c * d + t] + rng.normal();
  }
  return { X: { n, d, data }, labels };
}

/** Points scattered like a finished t-SNE map: `clusters` blobs spread over roughly ±span/2. */
export function spreadLayout(rng: Rng, n: number, clusters: number, span: number): Float64Array {
  const cx = new Float64Array(clusters);
  const cy = new Float64Array(clusters);
  for (let c = 0; c < clusters; c++) {
    cx[c] = (rng.next() - 0.5) * span;
    cy[c] = (rng.next() - 0.5) * span;
  }
  const y = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const c = i % clusters;
    y[2 * i] = cx[c] + 2.5 * rng.normal();
    y[2 * i + 1] = cy[c] + 2.5 * rng.normal();
  }
  return y;
}

export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

export function relativeL2(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < a.length; i++) {
    num += (a[i] - b[i]) ** 2;
    den += b[i] ** 2;
  }
  return Math.sqrt(num / den);
}

/**
 * Shared fixtures and slow-but-obvious reference implementations for the
 * metric tests. The naive versions build full n × n rank matrices straight
 * from the definitions; they are only used on small inputs.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { matrixFromRows } from '../../src/core/matrix.js';
import type { Matrix } from '../../src/core/types.js';

const FIXTURES = fileURLToPath(new URL('../fixtures/', import.meta.url));

export function readFixtureJson<T = any>(name: string): T {
  return JSON.parse(readFileSync(FIXTURES + name, 'utf8')) as T;
}

function readCsvNumbers(name: string): number[][] {
  const lines = readFileSync(FIXTURES + name, 'utf8').trim().split(/\r?\n/);
  return lines.slice(1).map((line) => line.split(',').map(Number));
}

/**
 * D500: the first 500 rows of scikit-learn 1.2.1's bundled copy of the UCI
 * optical-recognition handwritten digits (load_digits), with two fixed 2-D
 * PCA embeddings: E1 of the pixels, E2 of their element-wise square roots.
 */
export interface Digits500 {
  X: Matrix;
  y: Int32Array;
  E1: Matrix;
  E2: Matrix;
}

let digitsCache: Digits500 | null = null;

export function loadDigits500(): Digits500 {
  if (digitsCache) return digitsCache;
  const xRows = readCsvNumbers('digits500_X.csv');
  const y = Int32Array.from(xRows.map((r) => r[0]));
  const X = matrixFromRows(xRows.map((r) => r.slice(1)));
  const e1 = readCsvNumbers('digits500_pca2.csv');
  const e2 = readCsvNumbers('digits500_sqrtpca2.csv');
  digitsCache = {
    X,
    y,
    E1: matrixFromRows(e1.map((r) => r.slice(2))),
    E2: matrixFromRows(e2.map((r) => r.slice(2))),
  };
  return digitsCache;
}

/** Label of the nearest class centroid (centroids = class means of `labels` over `rows`). */
export function nearestCentroidLabels(E: Matrix, labels: ArrayLike<number>, rows?: number[]): Int32Array {
  const use = rows ?? Array.from({ length: E.n }, (_, i) => i);
  const classes = Array.from(new Set(use.map((i) => labels[i]))).sort((a, b) => a - b);
  const cent = classes.map((c) => {
    const members = use.filter((i) => labels[i] === c);
    const m = new Array(E.d).fill(0);
    for (const i of members) for (let t = 0; t < E.d; t++) m[t] += E.data[i * E.d + t];
    return m.map((v) => v / members.length);
  });
  return Int32Array.from(use, (i) => {
    let best = -1;
    let bestD = Infinity;
    cent.forEach((c, q) => {
      let s = 0;
      for (let t = 0; t < E.d; t++) s += (E.data[i * E.d + t] - c[t]) ** 2;
      if (s < bestD) {
        bestD = s;
        best = q;
      }
    });
    return classes[best];
  });
}

/** Full rank matrix: R[i*n + j] = rank of j among i's neighbours (1 = nearest), ties by index; 0 on the diagonal. */
export function naiveRanks(M: Matrix): Int32Array {
  const { n, d, data } = M;
  const R = new Int32Array(n * n);
  for (let i = 0; i < n; i++) {
    const dist: Array<[number, number]> = [];
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      let s = 0;
      for (let t = 0; t < d; t++) s += (data[i * d + t] - data[j * d + t]) ** 2;
      dist.push([s, j]);
    }
    dist.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
    dist.forEach(([, j], r) => {
      R[i * n + j] = r + 1;
    });
  }
  return R;
}

/** Trustworthiness straight from the Venna–Kaski definition with both normalisation branches. */
export function naiveTrust(RX: Int32Array, RY: Int32Array, n: number, k: number): number {
  let sum = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      if (RY[i * n + j] <= k && RX[i * n + j] > k) sum += RX[i * n + j] - k;
    }
  }
  const G = k < n / 2 ? n * k * (2 * n - 3 * k - 1) : n * (n - k) * (n - k - 1);
  return 1 - (2 / G) * sum;
}

/** The S10 data set: 10 points in 4-D, two 2-D embeddings and two partitions (fully written out). */
export const S10 = {
  X: matrixFromRows([
    [1.1, 0.7, -0.8, 2.0],
    [0.1, 1.0, 0.1, 0.2],
    [-0.4, -0.8, -0.7, -0.5],
    [-0.8, 0.5, -1.5, 0.0],
    [2.4, 3.9, -0.3, 1.9],
    [5.4, 0.7, -0.8, 2.3],
    [5.1, 1.9, 1.2, 1.9],
    [2.1, 4.2, 3.9, 0.9],
    [3.5, 4.1, 5.1, 0.9],
    [0.9, 5.1, 4.8, -0.9],
  ]),
  Y: matrixFromRows([
    [0.9, 0.1], [1.0, 0.7], [-0.8, -1.6], [-1.3, -0.2], [0.1, 2.6],
    [4.4, 0.3], [2.4, 0.9], [1.6, 4.5], [1.9, 5.5], [0.1, 5.9],
  ]),
  Y2: matrixFromRows([
    [3.8, 0.0], [2.8, -0.1], [2.0, -3.8], [0.4, -2.5], [0.2, 2.3],
    [7.0, 3.0], [4.8, 2.7], [0.7, 5.9], [0.1, 7.0], [-1.9, 6.3],
  ]),
  lab: Int32Array.of(0, 0, 0, 0, 1, 1, 1, 2, 2, 2),
  predY: Int32Array.of(0, 0, 0, 0, 2, 1, 1, 2, 2, 2),
};

/** n × d matrix of standard normal values from a seeded generator. */
export function gaussianMatrix(rng: { normal(): number }, n: number, d: number): Matrix {
  const data = new Float64Array(n * d);
  for (let t = 0; t < n * d; t++) data[t] = rng.normal();
  return { n, d, data };
}

/** Apply x ↦ s·x·Q + shift to every row (Q row-major d × d). */
export function similarity(M: Matrix, Q: number[], s: number, shift: number[]): Matrix {
  const { n, d, data } = M;
  const out = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    for (let q = 0; q < d; q++) {
      let v = 0;
      for (let p = 0; p < d; p++) v += data[i * d + p] * Q[p * d + q];
      out[i * d + q] = s * v + shift[q];
    }
  }
  return { n, d, data: out };
}

/** Within-cluster sum of squared distances to the cluster means (labels 0..k−1). */
export function inertia(Y: Matrix, labels: Int32Array): number {
  const k = Math.max(...labels) + 1;
  const sums = new Float64Array(k * Y.d);
  const size = new Float64Array(k);
  for (let i = 0; i < Y.n; i++) {
    size[labels[i]]++;
    for (let c = 0; c < Y.d; c++) sums[labels[i] * Y.d + c] += Y.data[i * Y.d + c];
  }
  let total = 0;
  for (let i = 0; i < Y.n; i++) {
    for (let c = 0; c < Y.d; c++) total += (Y.data[i * Y.d + c] - sums[labels[i] * Y.d + c] / size[labels[i]]) ** 2;
  }
  return total;
}

/**
 * Benchmark of the preprocessing and neighbour stages.
 * Build with `npm run build`, then run
 *   node dist/bench/pca-knn.js [--repeat N] [--check] [--sizes 10000,20000,50000] [--skip-pca] [--skip-knn] [--skip-map]
 *
 * PCA: randomized block Krylov PCA of 3000 × 1280 matrices down to 50
 * components, on one and two threads. `--check` also compares the top-10
 * explained-variance ratios with a full ml-matrix SVD (about 40 s per matrix).
 * Matrices: (a) the 10-centre Gaussian mixture of bench/mixture.ts, whose 10th
 * and 11th ratios differ by 5e-7; (b) one Gaussian blob whose column j has
 * standard deviation 1/√(1 + j), a slowly decaying spectrum.
 *
 * kNN (k = 15, d = 50): exact blocked search on one and two threads against
 * NN-descent (the approximate path of `knnOf`), with recall@15 against the
 * exact graph, on the mixture and on a 50-dimensional blob with the same
 * slowly decaying spread (no clusters).
 *
 * Times are wall-clock medians over the repeats (exact searches at n > 20 000
 * run once); the machine's load average is printed before and after, since
 * other jobs share the cores.
 */
import { loadavg } from 'node:os';

import { Rng } from '../src/core/rng.js';
import type { KnnGraph, Matrix } from '../src/core/types.js';
import { exactKnn } from '../src/neighbors/exact.js';
import { nnDescent } from '../src/neighbors/nndescent.js';
import { workerThreadsAvailable } from '../src/preprocess/parallel.js';
import { fullPcaEvr, randomizedPca } from '../src/preprocess/pca.js';
import { mixture } from './mixture.js';

/** n × d Gaussian blob, column j scaled by 1/√(1 + j). */
function blob(seed: number, n: number, d: number): Matrix {
  const rng = new Rng(seed);
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) data[i * d + j] = rng.normal() / Math.sqrt(1 + j);
  return { n, d, data };
}

function median(xs: number[]): number {
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function timeIt<T>(repeat: number, f: () => T): { seconds: number; all: number[]; value: T } {
  const all: number[] = [];
  let value: T | undefined;
  for (let r = 0; r < repeat; r++) {
    const t0 = process.hrtime.bigint();
    value = f();
    all.push(Number(process.hrtime.bigint() - t0) / 1e9);
  }
  return { seconds: median(all), all, value: value as T };
}

function recall(approx: KnnGraph, exact: KnnGraph): number {
  const k = exact.k;
  let hit = 0;
  for (let i = 0; i < exact.n; i++) {
    const truth = new Set(exact.indices.subarray(i * k, (i + 1) * k));
    for (let t = 0; t < k; t++) if (truth.has(approx.indices[i * k + t])) hit++;
  }
  return hit / (exact.n * k);
}

function sameBytes(a: KnnGraph, b: KnnGraph): boolean {
  return (
    Buffer.from(a.indices.buffer).equals(Buffer.from(b.indices.buffer)) &&
    Buffer.from(a.distances.buffer).equals(Buffer.from(b.distances.buffer))
  );
}

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (r: string[]): string => r.map((v, c) => v.padEnd(widths[c])).join(' | ');
  return [line(header), widths.map((w) => '-'.repeat(w)).join('-|-'), ...rows.map(line)].join('\n') + '\n';
}

function load(): string {
  return loadavg()
    .map((v) => v.toFixed(2))
    .join(' ');
}

function pcaBench(repeat: number, check: boolean): void {
  const cases: Array<[string, Matrix]> = [
    ['mixture(3000, 1280, 2)', mixture(3000, 1280, 2).X],
    ['blob 3000 × 1280, sd 1/√(1+j)', blob(3, 3000, 1280)],
  ];
  const rows: string[][] = [];
  for (const [name, X] of cases) {
    const full = check ? fullPcaEvr(X) : null;
    for (const threads of [1, 2]) {
      const t = timeIt(repeat, () => randomizedPca(X, 50, new Rng(7), { threads }));
      let err = 'not checked';
      if (full !== null) {
        let worst = 0;
        for (let c = 0; c < 10; c++) worst = Math.max(worst, Math.abs(t.value.explainedVarianceRatio[c] - full[c]));
        err = worst.toExponential(2);
      }
      const sum = t.value.explainedVarianceRatio.reduce((a, b) => a + b, 0);
      rows.push([name, String(threads), t.seconds.toFixed(3), t.all.map((s) => s.toFixed(2)).join(' '), err, sum.toFixed(6)]);
    }
  }
  process.stdout.write('\nPCA 3000 × 1280 → 50 components (default block Krylov settings: block 10, depth 12)\n');
  process.stdout.write(table(['matrix', 'threads', 'median s', 'all s', 'max |ΔEVR| top 10 vs ml-matrix SVD', 'Σ EVR(50)'], rows));
}

function knnBench(repeat: number, sizes: number[]): void {
  const k = 15;
  const d = 50;
  const header = ['n', 'data', 'exact 1 thr s', 'exact 2 thr s', 'NN-descent s', 'recall@15', 'exact 1 thr / NN-descent'];
  const widths = header.map((h) => Math.max(h.length, 7));
  const line = (r: string[]): string => r.map((v, c) => v.padEnd(widths[c])).join(' | ') + '\n';
  process.stdout.write(`\nk-nearest neighbours, k = ${k}, d = ${d} (NN-descent with default settings)\n`);
  process.stdout.write(line(header) + widths.map((w) => '-'.repeat(w)).join('-|-') + '\n');
  for (const n of sizes) {
    const cases: Array<[string, Matrix]> = [
      ['mixture', mixture(n, d, 5).X],
      ['blob', blob(9, n, d)],
    ];
    for (const [name, X] of cases) {
      const exactRepeat = n > 20_000 ? 1 : repeat;
      const e1 = timeIt(exactRepeat, () => exactKnn(X, k));
      const e2 = timeIt(exactRepeat, () => exactKnn(X, k, { threads: 2 }));
      if (!sameBytes(e1.value, e2.value)) throw new Error(`exact search on 2 threads differs from 1 thread at n = ${n}`);
      const a = timeIt(repeat, () => nnDescent(X, k, new Rng(20_240_917)));
      process.stdout.write(
        line([
          String(n),
          name,
          e1.seconds.toFixed(2),
          e2.seconds.toFixed(2),
          a.seconds.toFixed(2),
          recall(a.value, e1.value).toFixed(4),
          (e1.seconds / a.seconds).toFixed(1),
        ]),
      );
    }
  }
}

/** Maps (2-D): the grid search that exactKnn uses for them against the brute force (a zero third column). */
function mapKnnBench(repeat: number, sizes: number[]): void {
  const k = 15;
  process.stdout.write(`\nk-nearest neighbours in a 2-D map, k = ${k}: grid search (exactKnn on 2 columns) vs brute force\n`);
  const header = ['n', 'grid s', 'brute force s', 'same bytes'];
  const widths = header.map((h) => Math.max(h.length, 7));
  const line = (r: string[]): string => r.map((v, c) => v.padEnd(widths[c])).join(' | ') + '\n';
  process.stdout.write(line(header) + widths.map((w) => '-'.repeat(w)).join('-|-') + '\n');
  for (const n of sizes) {
    const rng = new Rng(3);
    const map = new Float64Array(2 * n);
    const wide = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) {
      // Ten blobs on a circle, as a t-SNE map of ten clusters looks.
      const c = i % 10;
      map[2 * i] = wide[3 * i] = 30 * Math.cos(c) + rng.normal();
      map[2 * i + 1] = wide[3 * i + 1] = 30 * Math.sin(c) + rng.normal();
    }
    const g = timeIt(repeat, () => exactKnn({ n, d: 2, data: map }, k));
    const b = timeIt(n > 20_000 ? 1 : repeat, () => exactKnn({ n, d: 3, data: wide }, k));
    process.stdout.write(line([String(n), g.seconds.toFixed(3), b.seconds.toFixed(2), String(sameBytes(g.value, b.value))]));
  }
}

function main(): void {
  const args = process.argv.slice(2);
  const ri = args.indexOf('--repeat');
  const repeat = ri >= 0 ? Number(args[ri + 1]) : 3;
  const si = args.indexOf('--sizes');
  const sizes = si >= 0 ? args[si + 1].split(',').map(Number) : [10_000, 20_000, 50_000];
  process.stdout.write(`node ${process.version}, worker thread ${workerThreadsAvailable() ? 'available' : 'NOT available'}\n`);
  process.stdout.write(`load average before: ${load()}\n`);
  if (!args.includes('--skip-pca')) pcaBench(repeat, args.includes('--check'));
  if (!args.includes('--skip-knn')) knnBench(repeat, sizes);
  if (!args.includes('--skip-map')) mapKnnBench(repeat, sizes);
  process.stdout.write(`\nload average after: ${load()} (${repeat} repeats; medians)\n`);
}

main();

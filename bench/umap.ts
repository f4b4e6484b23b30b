/**
 * UMAP engine benchmark: our typed-array UMAP against umap-js 1.4 `fit` on the
 * 10-centre Gaussian mixture (50 columns), single thread, same process.
 *
 *   node dist/bench/umap.js [--sizes 1000,3000,10000] [--seed 1]
 *
 * Rows per size: umap-js `fit` (its own NN-descent, its epoch rule); umap-js
 * with our exact kNN handed in; ours at umap-learn's epoch rule (graph + init +
 * SGD, kNN given); ours at umap-js's epoch count; ours inside a sweep (graph
 * passed in); and the phase split. T(10) = trustworthiness with k = 10.
 * Times are CPU seconds of this process (user + system), which other load on
 * the machine disturbs far less than wall-clock time; wall seconds are shown
 * beside them. A last line times x^b by `Math.pow` and by `powWith`, in a loop
 * of independent calls and in a chain where each call waits for the previous
 * one (as the SGD's steps do). Nothing is asserted.
 */
import os from 'node:os';
import { UMAP } from 'umap-js';
import { embeddingAsMatrix, matrixToRows } from '../src/core/matrix.js';
import { Rng } from '../src/core/rng.js';
import type { Matrix } from '../src/core/types.js';
import { spectralLayout } from '../src/embed/init/index.js';
import { defaultEpochs, fitAB, fuzzySimplicialSet, maxWeight, optimizeLayoutInPlace, powTables, powWith, pruneGraph, runUmap } from '../src/embed/umap/index.js';
import { runUmap as runUmapJs } from '../src/embed/umap/umapjs.js';
import { trustworthiness } from '../src/metrics/neighbourhood.js';
import { knnOf } from '../src/neighbors/exact.js';
import { mixture } from './mixture.js';

const args = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? args[i + 1] : undefined;
};
const sizes = (opt('sizes') ?? '1000,3000,10000').split(',').map(Number);
const seed = Number(opt('seed') ?? 1);
const NN = 15;
const MIN_DIST = 0.1;

function time<T>(f: () => T): { value: T; seconds: number; wall: number } {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const value = f();
  const c = process.cpuUsage(c0);
  return { value, seconds: (c.user + c.system) / 1e6, wall: (performance.now() - t0) / 1000 };
}

/** umap-js 1.4's epoch rule (its `getNEpochs`). */
function umapJsEpochs(n: number): number {
  return n <= 2500 ? 500 : n <= 5000 ? 400 : n <= 7500 ? 300 : 200;
}

interface Row {
  engine: string;
  n: number;
  epochs: number;
  seconds: number;
  wall: number;
  trust: number | null;
  note: string;
}
const rows: Row[] = [];

for (const n of sizes) {
  const { X } = mixture(n, 50);
  process.stderr.write(`n = ${n}: exact kNN…\n`);
  const knn = knnOf(X, NN - 1);
  const t10 = (Y: Matrix): number => trustworthiness(X, Y, 10);

  process.stderr.write(`n = ${n}: umap-js fit…\n`);
  const rowsX = matrixToRows(X);
  const refRng = new Rng(seed);
  const ref = time(() => new UMAP({ nNeighbors: NN, minDist: MIN_DIST, random: refRng.asFunction() }).fit(rowsX));
  const refT = t10({ n, d: 2, data: Float64Array.from(ref.value.flat()) });
  rows.push({ engine: 'umap-js fit (own NN-descent)', n, epochs: umapJsEpochs(n), seconds: ref.seconds, wall: ref.wall, trust: refT, note: 'reference' });

  process.stderr.write(`n = ${n}: umap-js with exact kNN…\n`);
  const refK = time(() => runUmapJs(X, knn, { nNeighbors: NN, minDist: MIN_DIST }, new Rng(seed)));
  rows.push({ engine: 'umap-js, exact kNN given', n, epochs: refK.value.epochs, seconds: refK.seconds, wall: refK.wall, trust: t10(embeddingAsMatrix(refK.value.embedding)), note: '' });

  process.stderr.write(`n = ${n}: ours…\n`);
  const ours = time(() => runUmap(X, knn, { nNeighbors: NN, minDist: MIN_DIST }, new Rng(seed)));
  rows.push({
    engine: 'ours (graph + spectral + SGD)',
    n,
    epochs: ours.value.epochs,
    seconds: ours.seconds,
    wall: ours.wall,
    trust: t10(embeddingAsMatrix(ours.value.embedding)),
    note: `${(ours.seconds / ref.seconds).toFixed(2)} × umap-js fit`,
  });

  const eq = umapJsEpochs(n);
  const oursEq = time(() => runUmap(X, knn, { nNeighbors: NN, minDist: MIN_DIST, epochs: eq }, new Rng(seed)));
  rows.push({
    engine: 'ours at umap-js epochs',
    n,
    epochs: eq,
    seconds: oursEq.seconds,
    wall: oursEq.wall,
    trust: t10(embeddingAsMatrix(oursEq.value.embedding)),
    note: `${(oursEq.seconds / ref.seconds).toFixed(2)} × umap-js fit, ${(oursEq.seconds / refK.seconds).toFixed(2)} × umap-js with kNN`,
  });

  // Sweep: the graph once, then runs that reuse it.
  const g = time(() => fuzzySimplicialSet(knn, NN));
  const sweep = time(() => runUmap(X, knn, { nNeighbors: NN, minDist: MIN_DIST, graph: g.value }, new Rng(seed + 1)));
  rows.push({
    engine: 'ours in a sweep (graph given)',
    n,
    epochs: sweep.value.epochs,
    seconds: sweep.seconds,
    wall: sweep.wall,
    trust: t10(embeddingAsMatrix(sweep.value.embedding)),
    note: `${(sweep.seconds / ref.seconds).toFixed(2)} × umap-js fit`,
  });

  // Phase split.
  const epochs = defaultEpochs(n);
  const pruned = time(() => pruneGraph(g.value, maxWeight(g.value) / epochs));
  const init = time(() => spectralLayout(pruned.value, new Rng(seed), { X }));
  const ab = fitAB(MIN_DIST);
  const y = init.value.slice();
  let samples = 0;
  for (let e = 0; e < pruned.value.weights.length; e++) samples += pruned.value.weights[e];
  const wMax = maxWeight(pruned.value);
  const positive = (samples / wMax) * epochs;
  const sgd = time(() => optimizeLayoutInPlace(y, pruned.value, { ...ab, epochs }, new Rng(seed)));
  rows.push({
    engine: 'phases',
    n,
    epochs,
    seconds: g.seconds + init.seconds + sgd.seconds,
    wall: g.wall + init.wall + sgd.wall,
    trust: null,
    note:
      `graph ${g.seconds.toFixed(3)} s, spectral ${init.seconds.toFixed(3)} s, SGD ${sgd.seconds.toFixed(2)} s ` +
      `(${pruned.value.weights.length} edges, ≈${(positive / 1e6).toFixed(2)} M positive samples, ${((sgd.seconds / positive) * 1e9).toFixed(0)} ns each)`,
  });
}

const header = ['engine', 'n', 'epochs', 'CPU s', 'wall s', 'T(10)', 'note'];
const table = rows.map((r) => [
  r.engine, String(r.n), String(r.epochs), r.seconds.toFixed(2), r.wall.toFixed(2), r.trust === null ? '—' : r.trust.toFixed(4), r.note,
]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((t) => t[i].length)));
const line = (cells: string[]): string => '| ' + cells.map((c, i) => c.padEnd(widths[i])).join(' | ') + ' |';
console.log(`machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, Node ${process.version}; 10-centre mixture, d = 50, n_neighbors ${NN}, min_dist ${MIN_DIST}, seed ${seed}`);
console.log(line(header));
console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
for (const t of table) console.log(line(t));

/** ns per x^b: independent calls, and a dependent chain x ← f(x)·k. */
function powTimes(f: (x: number) => number): { independent: number; chained: number } {
  const N = 4_000_000;
  const xs = new Float64Array(N);
  const r = new Rng(7);
  for (let i = 0; i < N; i++) xs[i] = Math.exp(12 * (r.next() - 0.5));
  let acc = 0;
  let t0 = performance.now();
  for (let i = 0; i < N; i++) acc += f(xs[i]);
  const independent = ((performance.now() - t0) / N) * 1e6;
  let x = 1.5;
  t0 = performance.now();
  for (let i = 0; i < N; i++) x = f(x) * xs[i] + 0.5;
  const chained = ((performance.now() - t0) / N) * 1e6;
  if (!Number.isFinite(acc + x)) throw new Error('non-finite power');
  return { independent, chained };
}
const bPow = fitAB(MIN_DIST).b;
const tables = powTables(bPow);
const lib = (x: number): number => Math.pow(x, bPow);
const tab = (x: number): number => powWith(tables, x);
powTimes(lib);
powTimes(tab);
const pl = powTimes(lib);
const pt = powTimes(tab);
console.log(
  `x^${bPow.toFixed(4)}: Math.pow ${pl.independent.toFixed(1)} ns independent, ${pl.chained.toFixed(1)} ns chained; ` +
    `powWith ${pt.independent.toFixed(1)} ns independent, ${pt.chained.toFixed(1)} ns chained`,
);

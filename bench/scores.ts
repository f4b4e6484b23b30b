/**
 * Where a run's scoring time goes, on the 10-centre mixture (50 columns) and a
 * map of it (a UMAP run with default settings):
 *
 *   node dist/bench/scores.js [--sizes 10000,50000]
 *
 * Rows: trustworthiness and continuity over every row and over the seeded
 * 5,000-row sample the audit uses above 10,000 rows (with the difference
 * between the two); the map's exact kNN (grid search); k-means with 10
 * starts on the data (the scoring index's groups) and on the map (ARI and
 * cluster stability). Times are wall seconds of one call. Nothing is
 * asserted.
 */
import os from 'node:os';
import { Rng } from '../src/core/rng.js';
import type { Matrix } from '../src/core/types.js';
import { runUmap } from '../src/embed/umap/index.js';
import { kmeansLabels } from '../src/metrics/clustering.js';
import { continuity, trustworthiness } from '../src/metrics/neighbourhood.js';
import { exactKnn, knnOf } from '../src/neighbors/exact.js';
import { rankSample } from '../src/pipeline/prepare.js';
import { mixture } from './mixture.js';

const args = process.argv.slice(2);
const at = args.indexOf('--sizes');
const sizes = (at >= 0 ? args[at + 1] : '10000,50000').split(',').map(Number);
const K = 15;

function time<T>(f: () => T): { value: T; seconds: number } {
  const t0 = performance.now();
  const value = f();
  return { value, seconds: (performance.now() - t0) / 1000 };
}

const rows: string[][] = [];
for (const n of sizes) {
  const { X } = mixture(n, 50);
  process.stderr.write(`n = ${n}: neighbours and a UMAP map…\n`);
  const knnX = exactKnn(X, 2 * K + 10, { threads: 2 });
  const map = runUmap(X, knnOf(X, K - 1), { nNeighbors: K, minDist: 0.1 }, new Rng(1)).embedding;
  const Y: Matrix = { n, d: 2, data: map.data };
  const knnY = time(() => exactKnn(Y, K));
  rows.push([String(n), 'map kNN (grid search)', knnY.seconds.toFixed(3), '']);
  const sample = rankSample(n);
  const opts = { knnX, knnY: knnY.value };
  process.stderr.write(`n = ${n}: trustworthiness and continuity…\n`);
  const tFull = time(() => trustworthiness(X, Y, K, opts));
  const tSample = time(() => trustworthiness(X, Y, K, { ...opts, rows: sample }));
  const cFull = time(() => continuity(X, Y, K, opts));
  const cSample = time(() => continuity(X, Y, K, { ...opts, rows: sample }));
  rows.push([String(n), 'trustworthiness, all rows', tFull.seconds.toFixed(2), tFull.value.toFixed(5)]);
  rows.push([String(n), `trustworthiness, ${sample.length} rows`, tSample.seconds.toFixed(2), `${tSample.value.toFixed(5)} (Δ ${(tSample.value - tFull.value).toExponential(1)})`]);
  rows.push([String(n), 'continuity, all rows', cFull.seconds.toFixed(2), cFull.value.toFixed(5)]);
  rows.push([String(n), `continuity, ${sample.length} rows`, cSample.seconds.toFixed(2), `${cSample.value.toFixed(5)} (Δ ${(cSample.value - cFull.value).toExponential(1)})`]);
  process.stderr.write(`n = ${n}: k-means…\n`);
  const kmData = time(() => kmeansLabels(X, 10, new Rng(2)));
  const kmMap = time(() => kmeansLabels(Y, 10, new Rng(3)));
  rows.push([String(n), 'k-means, 10 clusters × 10 starts, data (50 columns)', kmData.seconds.toFixed(2), '']);
  rows.push([String(n), 'k-means, 10 clusters × 10 starts, map', kmMap.seconds.toFixed(2), '']);
}

const header = ['n', 'step', 'seconds', 'value'];
const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
const line = (r: string[]): string => '| ' + r.map((v, c) => v.padEnd(widths[c])).join(' | ') + ' |';
console.log(`machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, Node ${process.version}; 10-centre mixture, d = 50, k = ${K}`);
console.log(line(header));
console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
for (const r of rows) console.log(line(r));

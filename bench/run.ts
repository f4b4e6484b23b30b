/**
 * `npm run bench`: speed and quality of each engine on the 10-centre mixture,
 * beside a reference run on the same data and machine — umap-js `fit` in this
 * process, scikit-learn's TSNE through /usr/bin/python3 when it is installed.
 *
 *   node dist/bench/run.js [--sizes 1000,3000] [--no-sklearn]
 *
 * Single thread per engine. Prints a table; nothing here is asserted.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { UMAP } from 'umap-js';
import { Rng } from '../src/core/rng.js';
import { embeddingAsMatrix, matrixToRows } from '../src/core/matrix.js';
import type { Matrix } from '../src/core/types.js';
import { runTsne } from '../src/embed/tsne/index.js';
import { fuzzySimplicialSet, runUmap } from '../src/embed/umap/index.js';
import { trustworthiness } from '../src/metrics/neighbourhood.js';
import { knnOf } from '../src/neighbors/exact.js';
import { fullPcaEvr, randomizedPca } from '../src/preprocess/pca.js';
import { mixture, writeRaw } from './mixture.js';

interface Row {
  engine: string;
  n: number;
  d: number;
  seconds: number;
  trust: number | null;
  ref: string;
  ratio: number | null;
  note?: string;
}

const args = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? args[i + 1] : undefined;
};
const sizes = (opt('sizes') ?? '1000,3000').split(',').map(Number);
const useSklearn = !args.includes('--no-sklearn');
const PY = '/usr/bin/python3';
const here = path.dirname(fileURLToPath(import.meta.url));
const pyScript = path.resolve(here, '../../bench/sklearn_tsne.py');

const rows: Row[] = [];
const tmp = mkdtempSync(path.join(os.tmpdir(), 'steadyfold-bench-'));

function time<T>(f: () => T): { value: T; seconds: number } {
  const t0 = performance.now();
  const value = f();
  return { value, seconds: (performance.now() - t0) / 1000 };
}

function trust10(X: Matrix, Y: Matrix): number {
  return trustworthiness(X, Y, 10);
}

function sklearnAvailable(): boolean {
  if (!useSklearn || !existsSync(PY)) return false;
  return spawnSync(PY, ['-c', 'import sklearn'], { encoding: 'utf8' }).status === 0;
}

const haveSklearn = sklearnAvailable();
if (!haveSklearn) process.stderr.write(`scikit-learn reference skipped: ${useSklearn ? `${PY} with scikit-learn not found` : '--no-sklearn'}\n`);

for (const n of sizes) {
  const d = 50;
  const { X } = mixture(n, d);
  process.stderr.write(`n = ${n}: neighbours…\n`);
  const knnT = time(() => knnOf(X, Math.min(n - 1, 91)));
  rows.push({ engine: 'exact kNN (k = 91)', n, d, seconds: knnT.seconds, trust: null, ref: '—', ratio: null });

  process.stderr.write(`n = ${n}: t-SNE…\n`);
  const ts = time(() => runTsne(X, knnT.value, { perplexity: 30, threads: 2 }, new Rng(1)));
  const tsTrust = trust10(X, embeddingAsMatrix(ts.value.embedding));
  let ref = '—';
  let ratio: number | null = null;
  if (haveSklearn) {
    const file = path.join(tmp, `x${n}.f64`);
    writeRaw(file, X);
    const r = spawnSync(PY, [pyScript, file, String(n), String(d)], { encoding: 'utf8', env: { ...process.env, OMP_WAIT_POLICY: 'PASSIVE' } });
    if (r.status === 0) {
      const s = JSON.parse(r.stdout.trim().split('\n').pop()!) as { seconds: number; trustworthiness: number | null; sklearn: string };
      ref = `scikit-learn ${s.sklearn} TSNE: ${s.seconds.toFixed(2)} s, T(10) ${s.trustworthiness?.toFixed(4) ?? 'n/a'}`;
      ratio = (ts.seconds + knnT.seconds) / s.seconds;
    } else {
      ref = `scikit-learn failed: ${r.stderr.trim().split('\n').pop()}`;
    }
  }
  rows.push({ engine: 't-SNE Barnes-Hut (ours, 2 threads) + kNN', n, d, seconds: ts.seconds + knnT.seconds, trust: tsTrust, ref, ratio, note: `KL ${ts.value.klDivergence.toFixed(3)}` });

  process.stderr.write(`n = ${n}: UMAP…\n`);
  const knn15 = knnOf(X, 14);
  const um = time(() => runUmap(X, knn15, { nNeighbors: 15, minDist: 0.1 }, new Rng(1)));
  const graph = fuzzySimplicialSet(knn15, 15);
  const umSweep = time(() => runUmap(X, knn15, { nNeighbors: 15, minDist: 0.1, graph }, new Rng(2)));
  const rowsX = matrixToRows(X);
  const rng = new Rng(1);
  const refFit = time(() => new UMAP({ nNeighbors: 15, minDist: 0.1, random: rng.asFunction() }).fit(rowsX));
  const refY: Matrix = { n, d: 2, data: Float64Array.from(refFit.value.flat()) };
  const umapRef = `umap-js 1.4 fit: ${refFit.seconds.toFixed(2)} s, T(10) ${trust10(X, refY).toFixed(4)}`;
  rows.push({
    engine: 'UMAP (ours, spectral init) + kNN',
    n, d,
    seconds: um.seconds + knnT.seconds,
    trust: trust10(X, embeddingAsMatrix(um.value.embedding)),
    ref: umapRef,
    ratio: (um.seconds + knnT.seconds) / refFit.seconds,
    note: `${um.value.epochs} epochs (umap-js: ${n <= 2500 ? 500 : n <= 5000 ? 400 : n <= 7500 ? 300 : 200})`,
  });
  rows.push({
    engine: 'UMAP per run in a sweep (graph shared)',
    n, d,
    seconds: umSweep.seconds,
    trust: trust10(X, embeddingAsMatrix(umSweep.value.embedding)),
    ref: umapRef,
    ratio: umSweep.seconds / refFit.seconds,
  });
}

{
  process.stderr.write('PCA 3000 × 1280 → 50…\n');
  const { X: base } = mixture(3000, 1280, 2);
  const p = time(() => randomizedPca(base, 50, new Rng(1)));
  const full = time(() => fullPcaEvr(base));
  let maxErr = 0;
  for (let i = 0; i < 10; i++) maxErr = Math.max(maxErr, Math.abs(p.value.explainedVarianceRatio[i] - full.value[i]));
  rows.push({ engine: 'randomized PCA → 50', n: 3000, d: 1280, seconds: p.seconds, trust: null, ref: `exact SVD (ml-matrix): ${full.seconds.toFixed(2)} s`, ratio: p.seconds / full.seconds, note: `max |ΔEVR| top 10 = ${maxErr.toExponential(1)}` });
}

rmSync(tmp, { recursive: true, force: true });

const header = ['engine', 'n', 'd', 'seconds', 'T(10)', 'reference', 'ratio', 'note'];
const table = rows.map((r) => [
  r.engine, String(r.n), String(r.d), r.seconds.toFixed(2), r.trust === null ? '—' : r.trust.toFixed(4), r.ref, r.ratio === null ? '—' : r.ratio.toFixed(2), r.note ?? '',
]);
const widths = header.map((h, i) => Math.max(h.length, ...table.map((t) => t[i].length)));
const line = (cells: string[]): string => '| ' + cells.map((c, i) => c.padEnd(widths[i])).join(' | ') + ' |';
console.log(`machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}`);
console.log(line(header));
console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
for (const t of table) console.log(line(t));

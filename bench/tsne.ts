/**
 * One t-SNE (Barnes-Hut, perplexity 30, 1000 iterations, PCA init) on the
 * 10-centre mixture of bench/mixture.ts, d = 50, with the exact kNN given.
 *
 *   node dist/bench/tsne.js [--n 3000] [--threads 1] [--repeat 1] [--perplexity 30]
 *                           [--no-trust | --trust] [--sklearn]
 *
 * Prints the kNN time, then per repeat: wall seconds and CPU seconds (all
 * threads) of `runTsne`, split into affinities + first iteration /
 * remaining iterations / final exact KL; the KL divergence;
 * trustworthiness T(10) of the first repeat (src/metrics/neighbourhood.ts;
 * by default only for n ≤ 10 000); the peak RSS of the process so far;
 * and the median time with the load average.
 * `--sklearn` then runs bench/sklearn_tsne.py (scikit-learn's Barnes-Hut
 * TSNE through /usr/bin/python3, OMP_WAIT_POLICY=PASSIVE) on the same
 * numbers and prints its JSON line (seconds, T(10), KL).
 * Memory check: `--n 50000 --threads 2 --no-trust` (peak RSS of one run,
 * kNN included); run it under `/usr/bin/time -v` for the kernel's figure.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { embeddingAsMatrix } from '../src/core/matrix.js';
import { Rng } from '../src/core/rng.js';
import { runTsne } from '../src/embed/tsne/index.js';
import { trustworthiness } from '../src/metrics/neighbourhood.js';
import { exactKnn } from '../src/neighbors/exact.js';
import { mixture, writeRaw } from './mixture.js';

const args = process.argv.slice(2);
const opt = (name: string, fallback: string): string => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 && i + 1 < args.length ? args[i + 1] : fallback;
};
const flag = (name: string): boolean => args.includes(`--${name}`);

const n = Number(opt('n', '3000'));
const d = Number(opt('d', '50'));
const threads = Number(opt('threads', '1'));
const repeat = Number(opt('repeat', '1'));
const perplexity = Number(opt('perplexity', '30'));
const wantTrust = flag('trust') || (!flag('no-trust') && n <= 10_000);

const gib = (kib: number): string => `${(kib / 2 ** 20).toFixed(2)} GiB`;
const peakRss = (): number => process.resourceUsage().maxRSS; // KiB

const { X } = mixture(n, d);
const k = Math.min(n - 1, Math.floor(3 * perplexity + 1));
let t0 = performance.now();
const knn = exactKnn(X, k);
const knnSeconds = (performance.now() - t0) / 1000;
process.stdout.write(`n = ${n}, d = ${d}, perplexity ${perplexity}, threads ${threads}; exact kNN (k = ${k}) ${knnSeconds.toFixed(2)} s; peak RSS ${gib(peakRss())}\n`);

const times: number[] = [];
for (let r = 0; r < repeat; r++) {
  let firstIter = 0;
  let lastIter = 0;
  const cpu0 = process.cpuUsage();
  t0 = performance.now();
  const result = runTsne(X, knn, {
    perplexity,
    threads,
    onProgress: (i, total) => {
      if (i === 1) firstIter = performance.now();
      if (i === total) lastIter = performance.now();
    },
  }, new Rng(1));
  const t1 = performance.now();
  const cpu = process.cpuUsage(cpu0);
  const seconds = (t1 - t0) / 1000;
  times.push(seconds);
  let line = `run ${r + 1}: ${seconds.toFixed(2)} s, CPU ${((cpu.user + cpu.system) / 1e6).toFixed(2)} s (P + iteration 1 ${((firstIter - t0) / 1000).toFixed(2)} s, iterations 2…${result.iterations} ${((lastIter - firstIter) / 1000).toFixed(2)} s, `
    + `final KL ${((t1 - lastIter) / 1000).toFixed(2)} s); KL ${result.klDivergence.toFixed(4)}`;
  if (wantTrust && r === 0) {
    const tt = performance.now();
    const trust = trustworthiness(X, embeddingAsMatrix(result.embedding), 10, { knnX: knn });
    line += `; T(10) ${trust.toFixed(4)} (${((performance.now() - tt) / 1000).toFixed(2)} s)`;
  }
  line += `; peak RSS ${gib(peakRss())}`;
  process.stdout.write(`${line}\n`);
}
const sorted = times.slice().sort((a, b) => a - b);
process.stdout.write(`runTsne median ${sorted[Math.floor((sorted.length - 1) / 2)].toFixed(2)} s over ${repeat}; `
  + `machine ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, load average ${os.loadavg().map((v) => v.toFixed(2)).join(' ')}, Node ${process.version}\n`);

if (flag('sklearn')) {
  const here = path.dirname(fileURLToPath(import.meta.url));
  const script = path.resolve(here, '../../bench/sklearn_tsne.py');
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'tsne-bench-'));
  try {
    const file = path.join(tmp, `x${n}.f64`);
    writeRaw(file, X);
    const r = spawnSync('/usr/bin/python3', [script, file, String(n), String(d), String(perplexity)], {
      encoding: 'utf8',
      env: { ...process.env, OMP_WAIT_POLICY: 'PASSIVE' },
    });
    process.stdout.write(r.status === 0 ? `scikit-learn: ${r.stdout.trim().split('\n').pop()}\n` : `scikit-learn failed: ${r.stderr.trim()}\n`);
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

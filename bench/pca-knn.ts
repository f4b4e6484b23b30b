/**
 * Micro-benchmark of the preprocessing and neighbour stages, single thread.
 * Build with `npm run build`, then run `node dist/bench/pca-knn.js [--repeat N] [--check]`.
 * `--check` also compares the randomized explained-variance ratios with a full
 * SVD (slow: tens of seconds at 3000 × 1280).
 */
import { Rng } from '../src/core/rng.js';
import type { Matrix } from '../src/core/types.js';
import { exactKnn } from '../src/neighbors/exact.js';
import { fullPcaEvr, randomizedPca } from '../src/preprocess/pca.js';

/**
 * n points around `clusters` Gaussian centres in d dimensions, lifted to `dOut`
 * columns by a random linear map plus noise. Latent direction t is scaled by
 * 1/√(1 + t), so the spectrum decays slowly (a fair test for randomized SVD).
 */
function syntheticData(rng: Rng, n: number, d: number, dOut: number, clusters: number): Matrix {
  const centres = new Float64Array(clusters * d);
  for (let i = 0; i < centres.length; i++) centres[i] = 4 * rng.normal();
  const latent = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    const c = i % clusters;
    for (let j = 0; j < d; j++) latent[i * d + j] = (centres[c * d + j] + rng.normal()) / Math.sqrt(1 + j);
  }
  if (dOut === d) return { n, d, data: latent };
  const map = new Float64Array(d * dOut);
  for (let i = 0; i < map.length; i++) map[i] = rng.normal() / Math.sqrt(d);
  const out = new Float64Array(n * dOut);
  for (let i = 0; i < n; i++) {
    for (let t = 0; t < d; t++) {
      const v = latent[i * d + t];
      for (let j = 0; j < dOut; j++) out[i * dOut + j] += v * map[t * dOut + j];
    }
    for (let j = 0; j < dOut; j++) out[i * dOut + j] += 0.3 * rng.normal();
  }
  return { n, d: dOut, data: out };
}

/** Wall-clock and CPU seconds (best and median of `repeat`); CPU time is the steadier figure on a busy machine. */
function timeIt(repeat: number, f: () => void): { best: number; median: number; cpu: number } {
  const times: number[] = [];
  const cpus: number[] = [];
  for (let r = 0; r < repeat; r++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    f();
    times.push(Number(process.hrtime.bigint() - t0) / 1e9);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1e6);
  }
  times.sort((a, b) => a - b);
  cpus.sort((a, b) => a - b);
  return { best: times[0], median: times[Math.floor(times.length / 2)], cpu: cpus[0] };
}

function main(): void {
  const args = process.argv.slice(2);
  const ri = args.indexOf('--repeat');
  const repeat = ri >= 0 ? Number(args[ri + 1]) : 3;
  const check = args.includes('--check');

  const rows: Array<[string, string, string, string, string]> = [];
  const wide = syntheticData(new Rng(1), 3000, 200, 1280, 10);
  for (const q of [undefined, 4]) {
    let evr: Float64Array = new Float64Array(0);
    const t = timeIt(repeat, () => {
      evr = randomizedPca(wide, 50, new Rng(7), { powerIterations: q }).explainedVarianceRatio;
    });
    let note = `Σ EVR = ${evr.reduce((a, b) => a + b, 0).toFixed(5)}`;
    if (check) {
      const full = fullPcaEvr(wide);
      let worst = 0;
      for (let i = 0; i < 50; i++) worst = Math.max(worst, Math.abs(full[i] - evr[i]));
      note += `, max |ΔEVR| vs full SVD = ${worst.toExponential(2)}`;
    }
    rows.push([`PCA 3000 × 1280 → 50, q = ${q ?? 'auto (7)'}`, t.best.toFixed(3), t.median.toFixed(3), t.cpu.toFixed(3), note]);
  }
  const knnCases: Array<[number, number]> = [
    [3000, 91],
    [10000, 30],
  ];
  for (const [n, k] of knnCases) {
    const m = syntheticData(new Rng(2), n, 50, 50, 10);
    let first = 0;
    const t = timeIt(repeat, () => {
      first = exactKnn(m, k).distances[0];
    });
    rows.push([`exact kNN ${n} × 50, k = ${k}`, t.best.toFixed(3), t.median.toFixed(3), t.cpu.toFixed(3), `d(0, nn1) = ${first.toFixed(4)}`]);
  }
  const header: [string, string, string, string, string] = ['case', 'best s', 'median s', 'best CPU s', 'note'];
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (r: string[]): string => r.map((v, c) => v.padEnd(widths[c])).join(' | ');
  process.stdout.write(`${line(header)}\n${widths.map((w) => '-'.repeat(w)).join('-|-')}\n`);
  for (const r of rows) process.stdout.write(`${line(r)}\n`);
  process.stdout.write(`(${repeat} repeats, node ${process.version}, single thread)\n`);
}

main();

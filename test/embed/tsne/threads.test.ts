/**
 * Multi-threaded t-SNE: the worker thread runs the compiled module under
 * dist/ (`npm test` builds first), so these tests exercise the real worker.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import type { KnnGraph, Matrix } from '../../../src/core/types.js';
import { calibrate, calibrateWith, jointFromKnn, neighboursForPerplexity } from '../../../src/embed/tsne/affinities.js';
import { klDivergence, klDivergenceWith } from '../../../src/embed/tsne/kl.js';
import { optimizeEmbedding, optimizeWith } from '../../../src/embed/tsne/optimize.js';
import { Team, workerThreadStats } from '../../../src/embed/tsne/team.js';
import { PARALLEL_MIN_POINTS, runTsne } from '../../../src/embed/tsne/tsne.js';
import { exactKnn } from '../../../src/neighbors/exact.js';
import { gaussianMixture, spreadLayout } from './helpers.js';

const sameBytes = (a: Float64Array, b: Float64Array): boolean =>
  Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));

function mixture(seed: number, n: number, k: number): { X: Matrix; knn: KnnGraph } {
  const { X } = gaussianMixture(new Rng(seed), n, 10, 6, 4);
  return { X, knn: exactKnn(X, k) };
}

/** Resolves once every worker thread started so far has exited (the 'exit' events need the event loop). */
async function allWorkersExited(timeoutMs = 10_000): Promise<boolean> {
  const t0 = Date.now();
  for (;;) {
    const s = workerThreadStats();
    if (s.exited === s.started) return true;
    if (Date.now() - t0 > timeoutMs) return false;
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Block this thread (no event loop) until `ready()` or the time runs out. */
function blockUntil(ready: () => boolean, timeoutMs: number): boolean {
  const cell = new Int32Array(new SharedArrayBuffer(4));
  const t0 = Date.now();
  while (!ready()) {
    if (Date.now() - t0 > timeoutMs) return false;
    Atomics.wait(cell, 0, 0, 5);
  }
  return true;
}

describe('worker threads', () => {
  it('start while the main thread is blocked in Atomics.wait and never returns to the event loop', () => {
    const team = new Team(2);
    try {
      expect(blockUntil(() => team.workersReady === 1, 15_000)).toBe(true);
    } finally {
      team.close();
    }
  });

  it('give the same bytes as one thread for a Barnes-Hut optimisation, and do part of the work', () => {
    const n = 600;
    const { knn } = mixture(1, n, neighboursForPerplexity(20, n));
    const P = jointFromKnn(knn, 20);
    const y0 = spreadLayout(new Rng(2), n, 6, 1e-3);
    const opts = { iterations: 120, exaggerationIterations: 40, earlyExaggeration: 12, learningRate: 200, theta: 0.5, exact: false };
    const one = optimizeEmbedding(P, y0, opts);
    // Workers join whenever they are up; wait for them here so that they surely take part.
    const team = new Team(3);
    const before = workerThreadStats();
    let three: Float64Array;
    try {
      expect(blockUntil(() => team.workersReady === 2, 15_000)).toBe(true);
      three = optimizeWith(P, y0, opts, team);
    } finally {
      team.close();
    }
    expect(sameBytes(one, three)).toBe(true);
    expect(workerThreadStats().items).toBeGreaterThan(before.items);
    const two = optimizeEmbedding(P, y0, { ...opts, threads: 2 });
    expect(sameBytes(one, two)).toBe(true);
  });

  it('give the same bytes as one thread for runTsne in Barnes-Hut mode (calibration, gradient and KL)', () => {
    const n = PARALLEL_MIN_POINTS;
    const { X, knn } = mixture(3, n, neighboursForPerplexity(30, n));
    const opts = { perplexity: 30, iterations: 300 };
    const before = workerThreadStats();
    const one = runTsne(X, knn, opts, new Rng(1));
    const two = runTsne(X, knn, { ...opts, threads: 2 }, new Rng(1));
    expect(sameBytes(one.embedding.data, two.embedding.data)).toBe(true);
    expect(two.klDivergence).toBe(one.klDivergence);
    expect(workerThreadStats().started - before.started).toBe(1);
  });

  it('give the same bytes as one thread for runTsne in exact mode (calibration and KL threaded)', () => {
    const n = PARALLEL_MIN_POINTS;
    const { X, knn } = mixture(4, n, neighboursForPerplexity(10, n));
    const opts = { perplexity: 10, iterations: 60, exact: true };
    const one = runTsne(X, knn, opts, new Rng(1));
    const two = runTsne(X, knn, { ...opts, threads: 2 }, new Rng(1));
    expect(sameBytes(one.embedding.data, two.embedding.data)).toBe(true);
    expect(two.klDivergence).toBe(one.klDivergence);
  });

  it('give the same perplexity calibration and KL divergence as one thread', () => {
    const n = 700;
    const k = 40;
    const { knn } = mixture(5, n, k);
    const team = new Team(2);
    try {
      const sq = team.arrays.f64(n * k);
      for (let e = 0; e < n * k; e++) sq[e] = knn.distances[e] ** 2;
      const a = calibrate(sq.slice(), n, k, 12);
      const b = calibrateWith(sq, n, k, 12, team);
      expect(sameBytes(a.beta, b.beta)).toBe(true);
      expect(sameBytes(a.conditional, b.conditional)).toBe(true);
      const P = jointFromKnn(knn, 12, k);
      const Y = { n, data: spreadLayout(new Rng(6), n, 6, 40) };
      expect(klDivergenceWith(P, Y, team)).toBe(klDivergence(P, Y));
    } finally {
      team.close();
    }
  });

  it('are not started below PARALLEL_MIN_POINTS points, with the same result', () => {
    const n = 200;
    const { X, knn } = mixture(7, n, neighboursForPerplexity(10, n));
    const before = workerThreadStats().started;
    const one = runTsne(X, knn, { perplexity: 10, iterations: 50 }, new Rng(1));
    const two = runTsne(X, knn, { perplexity: 10, iterations: 50, threads: 2 }, new Rng(1));
    expect(workerThreadStats().started).toBe(before);
    expect(sameBytes(one.embedding.data, two.embedding.data)).toBe(true);
  });

  it('are terminated when the run fails in the middle', async () => {
    const n = PARALLEL_MIN_POINTS;
    const { X, knn } = mixture(8, n, neighboursForPerplexity(10, n));
    const before = workerThreadStats().started;
    const stop = (i: number): void => {
      if (i === 5) throw new Error('stopped at iteration 5');
    };
    expect(() => runTsne(X, knn, { perplexity: 10, threads: 2, onProgress: stop }, new Rng(1))).toThrow('stopped at iteration 5');
    expect(workerThreadStats().started).toBe(before + 1);
    expect(await allWorkersExited()).toBe(true);
  });

  it('have all exited after the runs above', async () => {
    expect(workerThreadStats().started).toBeGreaterThan(0);
    expect(await allWorkersExited()).toBe(true);
    expect(workerThreadStats().lastError).toBeNull();
  });

  it('reject a thread count that is not a positive integer', () => {
    const { X, knn } = mixture(9, 100, 31);
    expect(() => runTsne(X, knn, { perplexity: 10, threads: 0 }, new Rng(1))).toThrow(RangeError);
    expect(() => runTsne(X, knn, { perplexity: 10, threads: 1.5 }, new Rng(1))).toThrow(/threads/);
  });
});

describe('a process running a two-thread t-SNE', () => {
  const entry = fileURLToPath(new URL('../../../dist/src/embed/tsne/index.js', import.meta.url));

  it.runIf(existsSync(entry))('exits on its own when the run is over, and when it fails', () => {
    const script = `
      import { runTsne } from ${JSON.stringify(entry)};
      const n = 1200, d = 5, data = new Float64Array(n * d);
      for (let i = 0; i < n * d; i++) data[i] = Math.sin(i * 12.9898) * 43758.5453 % 1 + (i % (d * 4) < d ? 3 : 0);
      const X = { n, d, data };
      const r = runTsne(X, null, { perplexity: 10, iterations: 60, threads: 2 }, null);
      if (!Number.isFinite(r.klDivergence)) process.exit(3);
      try {
        runTsne(X, null, { perplexity: 10, threads: 2, onProgress: (i) => { if (i === 3) throw new Error('x'); } }, null);
      } catch { process.stdout.write('ok'); }
    `;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', timeout: 60_000 });
    expect(r.error).toBeUndefined();
    expect(r.stderr).toBe('');
    expect(r.stdout).toBe('ok');
    expect(r.status).toBe(0);
  });
});

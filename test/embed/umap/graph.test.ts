import { UMAP } from 'umap-js';
import { describe, expect, it } from 'vitest';
import { matrixToRows } from '../../../src/core/matrix.js';
import { Rng } from '../../../src/core/rng.js';
import type { KnnGraph } from '../../../src/core/types.js';
import { fuzzySimplicialSet, maxWeight, pruneGraph, smoothKnnDistances, type FuzzyGraph } from '../../../src/embed/umap/index.js';
import { exactKnn } from '../../../src/neighbors/exact.js';
import { denseOf, mixture } from './testdata.js';

const NN = 10;
const { X } = mixture(new Rng(31), 150, 5, 3, 3);
const knn = exactKnn(X, NN - 1);

/** umap-js 1.4 fed the same neighbours (self first at distance 0, as it expects). */
function umapJsOn(k: KnnGraph, nNeighbors: number): UMAP {
  const indices: number[][] = [];
  const distances: number[][] = [];
  for (let i = 0; i < k.n; i++) {
    const idx = [i];
    const dst = [0];
    for (let j = 0; j < nNeighbors - 1; j++) {
      idx.push(k.indices[i * k.k + j]);
      dst.push(k.distances[i * k.k + j]);
    }
    indices.push(idx);
    distances.push(dst);
  }
  const umap = new UMAP({ nNeighbors, minDist: 0.1, random: new Rng(1).asFunction() });
  umap.setPrecomputedKNN(indices, distances);
  umap.initializeFit(matrixToRows(X));
  return umap;
}

interface UmapJsInternals {
  graph: { getAll(): Array<{ row: number; col: number; value: number }> };
  knnDistances: number[][];
  smoothKNNDistance(d: number[][], k: number, localConnectivity: number): { sigmas: number[]; rhos: number[] };
}

describe('fuzzySimplicialSet', () => {
  const g = fuzzySimplicialSet(knn, NN);

  it('equals the fuzzy graph umap-js 1.4 builds from the same neighbours (its private `graph` after initializeFit), to 1e-12', () => {
    const theirs = (umapJsOn(knn, NN) as unknown as UmapJsInternals).graph.getAll().filter((e) => e.value !== 0);
    const ours = denseOf(g);
    let worst = 0;
    for (const e of theirs) worst = Math.max(worst, Math.abs(ours[e.row * g.n + e.col] - e.value));
    expect(worst).toBeLessThan(1e-12);
    expect(theirs.length).toBe(g.weights.length);
  });

  it('computes the same ρ and σ as umap-js 1.4 smoothKNNDistance (same 64-step bisection)', () => {
    const umap = umapJsOn(knn, NN) as unknown as UmapJsInternals;
    const theirs = umap.smoothKNNDistance(umap.knnDistances, NN, 1);
    const ours = smoothKnnDistances(knn, NN);
    for (let i = 0; i < X.n; i++) {
      expect(ours.rhos[i]).toBe(theirs.rhos[i]);
      expect(Math.abs(ours.sigmas[i] - theirs.sigmas[i])).toBeLessThanOrEqual(1e-12 * theirs.sigmas[i]);
    }
  });

  it('solves Σ_j exp(−(d_ij − ρ_i)/σ_i) = log2(n_neighbors) for every row to the bisection tolerance 1e-5', () => {
    const { rhos, sigmas } = smoothKnnDistances(knn, NN);
    for (let i = 0; i < X.n; i++) {
      let s = 0;
      for (let j = 0; j < NN - 1; j++) s += Math.exp(-Math.max(0, knn.distances[i * knn.k + j] - rhos[i]) / sigmas[i]);
      expect(Math.abs(s - Math.log2(NN))).toBeLessThan(1e-5);
      expect(rhos[i]).toBe(knn.distances[i * knn.k]);
    }
  });

  it('is symmetric, has weights in (0, 1], no diagonal and ascending columns', () => {
    const dense = denseOf(g);
    for (let i = 0; i < g.n; i++) {
      expect(dense[i * g.n + i]).toBe(0);
      for (let e = g.indptr[i]; e < g.indptr[i + 1]; e++) {
        const j = g.indices[e];
        expect(g.weights[e]).toBeGreaterThan(0);
        expect(g.weights[e]).toBeLessThanOrEqual(1);
        expect(dense[j * g.n + i]).toBe(g.weights[e]);
        if (e > g.indptr[i]) expect(j).toBeGreaterThan(g.indices[e - 1]);
      }
    }
  });

  it('gives every point membership 1 with its nearest neighbour (d = ρ)', () => {
    const dense = denseOf(g);
    // 1 + b − 1·b may round to 1 − 2⁻⁵³.
    for (let i = 0; i < g.n; i++) expect(dense[i * g.n + knn.indices[i * knn.k]]).toBeCloseTo(1, 15);
  });

  it('uses only the first n_neighbors − 1 columns of a longer neighbour graph', () => {
    const longer = fuzzySimplicialSet(exactKnn(X, 20), NN);
    expect(Buffer.from(longer.weights.buffer).equals(Buffer.from(g.weights.buffer))).toBe(true);
    expect(Buffer.from(longer.indices.buffer).equals(Buffer.from(g.indices.buffer))).toBe(true);
  });

  it('takes the fuzzy union a + b − a·b of the two directed memberships', () => {
    // Three points on a line: 0 —1— 1 —2— 2; n_neighbors 2 uses each point's single nearest neighbour.
    const k: KnnGraph = { n: 3, k: 1, indices: Int32Array.of(1, 0, 1), distances: Float64Array.of(1, 1, 2) };
    const h = fuzzySimplicialSet(k, 2);
    // Directed: 0→1, 1→0, 2→1 all at d = ρ, so membership 1; union keeps 1.
    expect(Array.from(h.indptr)).toEqual([0, 1, 3, 4]);
    expect(Array.from(h.indices)).toEqual([1, 0, 2, 1]);
    expect(Array.from(h.weights)).toEqual([1, 1, 1, 1]);
  });

  it('equals a + aᵀ − a∘aᵀ of the directed memberships a_ij = exp(−max(0, d_ij − ρ_i)/σ_i)', () => {
    const { rhos, sigmas } = smoothKnnDistances(knn, NN);
    const n = X.n;
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < NN - 1; j++) {
        const d = knn.distances[i * knn.k + j];
        a[i * n + knn.indices[i * knn.k + j]] = Math.exp(-Math.max(0, d - rhos[i]) / sigmas[i]);
      }
    }
    const dense = denseOf(g);
    let worst = 0;
    let below = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const x = a[i * n + j];
        const y = a[j * n + i];
        worst = Math.max(worst, Math.abs(dense[i * n + j] - (x + y - x * y)));
        if (dense[i * n + j] > 0 && dense[i * n + j] < 0.5) below++;
      }
    }
    expect(worst).toBeLessThan(1e-15);
    expect(below).toBeGreaterThan(100); // the check covers memberships well below 1
  });

  it('rejects n_neighbors below 2 or beyond the neighbour graph', () => {
    expect(() => fuzzySimplicialSet(knn, 1)).toThrow(RangeError);
    expect(() => fuzzySimplicialSet(knn, NN + 1)).toThrow(/columns/);
  });
});

describe('pruneGraph', () => {
  it('drops the edges below the threshold and keeps the graph symmetric', () => {
    const g = fuzzySimplicialSet(knn, NN);
    const threshold = maxWeight(g) / 3;
    const p: FuzzyGraph = pruneGraph(g, threshold);
    let kept = 0;
    for (const w of g.weights) if (w >= threshold) kept++;
    expect(p.weights.length).toBe(kept);
    const dense = denseOf(p);
    for (let i = 0; i < p.n; i++) for (let j = 0; j < p.n; j++) expect(dense[i * p.n + j]).toBe(dense[j * p.n + i]);
    for (const w of p.weights) expect(w).toBeGreaterThanOrEqual(threshold);
  });
});

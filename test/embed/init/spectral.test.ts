import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { exactKnn } from '../../../src/neighbors/exact.js';
import {
  connectedComponents,
  fixSignInPlace,
  laplacianEigenvectors,
  spectralCoordinates,
  spectralLayout,
  type WeightedGraph,
} from '../../../src/embed/init/index.js';
import { fuzzySimplicialSet } from '../../../src/embed/umap/index.js';
import { maxAbsDiff, mixture, nearestCentroidAgreement, readJson, sameBytes } from '../umap/testdata.js';

/** Written by test/fixtures/scripts/umap_spectral.py (numpy 1.24.2, scipy 1.10.1). */
interface SpectralFixture {
  versions: Record<string, string>;
  n: number;
  indptr: number[];
  indices: number[];
  weights: number[];
  eigenvalues: number[];
  eigenvalue_4: number;
  eigenvectors: number[][];
  arpack_eigenvalues: number[];
}

const fx = readJson<SpectralFixture>('umap-spectral.json');
const fixtureGraph: WeightedGraph = {
  n: fx.n,
  indptr: Int32Array.from(fx.indptr),
  indices: Int32Array.from(fx.indices),
  weights: Float64Array.from(fx.weights),
};
const all = (n: number): Int32Array => Int32Array.from({ length: n }, (_, i) => i);

/** Disjoint union of graphs, vertex numbers shifted block by block. */
function union(parts: WeightedGraph[]): WeightedGraph {
  const n = parts.reduce((s, g) => s + g.n, 0);
  const nnz = parts.reduce((s, g) => s + g.weights.length, 0);
  const indptr = new Int32Array(n + 1);
  const indices = new Int32Array(nnz);
  const weights = new Float64Array(nnz);
  let row = 0;
  let at = 0;
  for (const g of parts) {
    const offset = row;
    for (let i = 0; i < g.n; i++) {
      for (let e = g.indptr[i]; e < g.indptr[i + 1]; e++) {
        indices[at] = g.indices[e] + offset;
        weights[at] = g.weights[e];
        at++;
      }
      indptr[++row] = at;
    }
  }
  return { n, indptr, indices, weights };
}

describe('laplacianEigenvectors', () => {
  it('matches numpy.linalg.eigh of the normalised Laplacian (numpy 1.24.2, fixture umap-spectral.json) up to sign to 1e-6', () => {
    const { values, vectors, converged } = laplacianEigenvectors(fixtureGraph, all(fx.n), 2);
    expect(converged).toBe(true);
    for (let k = 0; k < 2; k++) {
      // Fixture eigenpair k + 1: the 0th is the trivial one.
      expect(Math.abs(values[k] - fx.eigenvalues[k + 1])).toBeLessThan(1e-9);
      const ref = Float64Array.from(fx.eigenvectors[k + 1]);
      const ours = vectors.subarray(k * fx.n, (k + 1) * fx.n);
      let dotp = 0;
      for (let i = 0; i < fx.n; i++) dotp += ours[i] * ref[i];
      const s = Math.sign(dotp);
      expect(maxAbsDiff(ours, ref.map((v) => s * v))).toBeLessThan(1e-6);
    }
  });

  it('agrees with ARPACK (scipy.sparse.linalg.eigsh, which="SM", as umap-learn calls it) on the eigenvalues', () => {
    const { values } = laplacianEigenvectors(fixtureGraph, all(fx.n), 2);
    expect(Math.abs(values[0] - fx.arpack_eigenvalues[1])).toBeLessThan(1e-9);
    expect(Math.abs(values[1] - fx.arpack_eigenvalues[2])).toBeLessThan(1e-9);
  });

  it('makes each eigenvector entry of largest magnitude positive', () => {
    const { vectors } = laplacianEigenvectors(fixtureGraph, all(fx.n), 2);
    for (let k = 0; k < 2; k++) {
      const v = vectors.slice(k * fx.n, (k + 1) * fx.n);
      const flipped = v.slice();
      fixSignInPlace(flipped);
      expect(sameBytes(v, flipped)).toBe(true);
    }
  });
});

describe('laplacianEigenvectors on a graph with repeated eigenvalues', () => {
  it('lays a ring out as a circle: its second eigenvalue is double, and both eigenvectors are found', () => {
    // Cycle on 40 vertices: L has eigenvalues 1 − cos(2πk/40), each k ≠ 0, 20 twice.
    const n = 40;
    const indptr = new Int32Array(n + 1);
    const indices = new Int32Array(2 * n);
    for (let i = 0; i < n; i++) {
      const nb = [(i + n - 1) % n, (i + 1) % n].sort((p, q) => p - q);
      indices[2 * i] = nb[0];
      indices[2 * i + 1] = nb[1];
      indptr[i + 1] = 2 * (i + 1);
    }
    const ring: WeightedGraph = { n, indptr, indices, weights: new Float64Array(2 * n).fill(1) };
    const { values } = laplacianEigenvectors(ring, all(n), 2, 1e-10);
    const expected = 1 - Math.cos((2 * Math.PI) / n);
    expect(Math.abs(values[0] - expected)).toBeLessThan(1e-10);
    expect(Math.abs(values[1] - expected)).toBeLessThan(1e-10);
    const y = spectralCoordinates(ring, new Rng(1), { tol: 1e-10 });
    for (let i = 0; i < n; i++) expect(Math.hypot(y[2 * i], y[2 * i + 1])).toBeCloseTo(Math.sqrt(2 / n), 8);
  });
});

describe('connectedComponents', () => {
  it('labels components in order of their lowest vertex and lists their members ascending', () => {
    // Edges 0–3, 1–2, 3–4; vertex 5 alone.
    const g: WeightedGraph = {
      n: 6,
      indptr: Int32Array.of(0, 1, 2, 3, 5, 6, 6),
      indices: Int32Array.of(3, 2, 1, 0, 4, 3),
      weights: Float64Array.of(1, 1, 1, 1, 1, 1),
    };
    const c = connectedComponents(g);
    expect(c.count).toBe(3);
    expect(Array.from(c.labels)).toEqual([0, 1, 1, 0, 0, 2]);
    expect(Array.from(c.members)).toEqual([0, 3, 4, 1, 2, 5]);
    expect(Array.from(c.start)).toEqual([0, 3, 5, 6]);
  });
});

describe('spectralCoordinates and spectralLayout', () => {
  it('returns the two eigenvectors themselves for a connected graph', () => {
    const coords = spectralCoordinates(fixtureGraph, new Rng(1), { tol: 1e-9 });
    const { vectors } = laplacianEigenvectors(fixtureGraph, all(fx.n), 2, 1e-9);
    for (let i = 0; i < fx.n; i++) {
      expect(coords[2 * i]).toBe(vectors[i]);
      expect(coords[2 * i + 1]).toBe(vectors[fx.n + i]);
    }
  });

  it('scales to max |coordinate| 10 and adds noise of standard deviation 1e-4 (umap-learn noisy_scale_coords)', () => {
    const coords = spectralCoordinates(fixtureGraph, new Rng(1));
    const layout = spectralLayout(fixtureGraph, new Rng(1));
    let big = 0;
    for (const v of coords) big = Math.max(big, Math.abs(v));
    const diffs = Array.from(layout, (v, e) => v - (10 / big) * coords[e]);
    const sd = Math.sqrt(diffs.reduce((s, v) => s + v * v, 0) / diffs.length);
    expect(sd).toBeGreaterThan(0.5e-4);
    expect(sd).toBeLessThan(2e-4);
  });

  it('gives the same bytes for the same seed, and for another seed differs only by the noise', () => {
    const a = spectralLayout(fixtureGraph, new Rng(5));
    const b = spectralLayout(fixtureGraph, new Rng(5));
    const c = spectralLayout(fixtureGraph, new Rng(6));
    expect(sameBytes(a, b)).toBe(true);
    expect(sameBytes(a, c)).toBe(false);
    expect(maxAbsDiff(a, c)).toBeLessThan(2e-3); // two N(0, 1e-4²) draws differ by < 10 SD
  });

  it('places three disconnected components as three separated groups around ±unit-vector centres (as umap-learn)', () => {
    const rng = new Rng(11);
    const { X, labels } = mixture(rng, 150, 5, 3, 30);
    const g = fuzzySimplicialSet(exactKnn(X, 9), 10);
    const comps = connectedComponents(g);
    expect(comps.count).toBe(3);
    const y = spectralCoordinates(g, new Rng(1), { X });
    // Each component's points are nearer its own centroid than any other's.
    expect(nearestCentroidAgreement(y, comps.labels, 3)).toBe(1);
    // Centres at e1, e2, −e1 in component order (umap-learn's multi_component_layout for ≤ 4 components).
    const centres = [[1, 0], [0, 1], [-1, 0]];
    for (let c = 0; c < 3; c++) {
      let sx = 0;
      let sy = 0;
      let cnt = 0;
      for (let i = 0; i < g.n; i++) {
        if (comps.labels[i] !== c) continue;
        sx += y[2 * i];
        sy += y[2 * i + 1];
        cnt++;
      }
      expect(Math.hypot(sx / cnt - centres[c][0], sy / cnt - centres[c][1])).toBeLessThan(0.35);
    }
    // The mixture clusters are the components.
    for (let i = 0; i < g.n; i++) expect(comps.labels[i]).toBe(comps.labels[labels[i]]);
  });

  it('keeps more than four components apart when they are placed from the data centroids', () => {
    const rng = new Rng(12);
    const { X } = mixture(rng, 240, 6, 8, 40);
    const g = fuzzySimplicialSet(exactKnn(X, 7), 8);
    const comps = connectedComponents(g);
    expect(comps.count).toBe(8);
    const withData = spectralCoordinates(g, new Rng(1), { X });
    const withoutData = spectralCoordinates(g, new Rng(1));
    expect(nearestCentroidAgreement(withData, comps.labels, 8)).toBe(1);
    expect(nearestCentroidAgreement(withoutData, comps.labels, 8)).toBe(1);
  });

  it('gives components of fewer than four points random positions from the generator', () => {
    const pair: WeightedGraph = { n: 2, indptr: Int32Array.of(0, 1, 2), indices: Int32Array.of(1, 0), weights: Float64Array.of(1, 1) };
    const g = union([fixtureGraph, pair]);
    expect(connectedComponents(g).count).toBe(2);
    const a = spectralCoordinates(g, new Rng(1));
    const b = spectralCoordinates(g, new Rng(2));
    // The big component is the same for both seeds; the pair moves.
    expect(maxAbsDiff(a.subarray(0, 2 * fx.n), b.subarray(0, 2 * fx.n))).toBe(0);
    expect(maxAbsDiff(a.subarray(2 * fx.n), b.subarray(2 * fx.n))).toBeGreaterThan(0);
    // The pair sits in the square inscribed in the disc of radius 1 (half the centre distance) around −e1.
    for (let i = fx.n; i < fx.n + 2; i++) {
      expect(Math.abs(a[2 * i] + 1)).toBeLessThanOrEqual(Math.SQRT1_2);
      expect(Math.abs(a[2 * i + 1])).toBeLessThanOrEqual(Math.SQRT1_2);
    }
  });
});

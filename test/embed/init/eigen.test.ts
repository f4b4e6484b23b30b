import { EigenvalueDecomposition, Matrix as DenseMatrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { fixSignInPlace, fixedStartVector, largestEigenpairs } from '../../../src/embed/init/index.js';

/** A random symmetric n × n matrix with entries N(0, 1) (row-major) and y ← A·x. */
function randomSymmetric(seed: number, n: number): { A: Float64Array; apply: (x: Float64Array, y: Float64Array) => void } {
  const rng = new Rng(seed);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const v = rng.normal();
      A[i * n + j] = v;
      A[j * n + i] = v;
    }
  }
  const apply = (x: Float64Array, y: Float64Array): void => {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += A[i * n + j] * x[j];
      y[i] = s;
    }
  };
  return { A, apply };
}

/** Eigenpairs from ml-matrix 6.15's dense symmetric solver (Householder + QL), descending. */
function denseReference(A: Float64Array, n: number): { values: number[]; vectors: number[][] } {
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) rows.push(Array.from(A.subarray(i * n, (i + 1) * n)));
  const evd = new EigenvalueDecomposition(new DenseMatrix(rows), { assumeSymmetric: true });
  const order = evd.realEigenvalues.map((v, i) => [v, i]).sort((p, q) => q[0] - p[0]);
  return {
    values: order.map(([v]) => v),
    vectors: order.map(([, i]) => evd.eigenvectorMatrix.getColumn(i)),
  };
}

function alignedError(v: ArrayLike<number>, ref: number[]): number {
  let dotp = 0;
  for (let i = 0; i < ref.length; i++) dotp += v[i] * ref[i];
  const s = dotp < 0 ? -1 : 1;
  let worst = 0;
  for (let i = 0; i < ref.length; i++) worst = Math.max(worst, Math.abs(s * v[i] - ref[i]));
  return worst;
}

describe('largestEigenpairs (thick-restart Lanczos)', () => {
  const n = 200;
  const { A, apply } = randomSymmetric(7, n);
  const ref = denseReference(A, n);

  it('finds the three largest eigenpairs of a random symmetric matrix as a dense solver does (ml-matrix 6.15)', () => {
    const r = largestEigenpairs(apply, n, 3, fixedStartVector(n), { tol: 1e-12, maxBasis: 40 });
    expect(r.converged).toBe(true);
    for (let k = 0; k < 3; k++) {
      expect(Math.abs(r.values[k] - ref.values[k])).toBeLessThan(1e-9);
      expect(alignedError(r.vectors.subarray(k * n, (k + 1) * n), ref.vectors[k])).toBeLessThan(1e-6);
    }
    // Restarts were needed: a 40-vector basis cannot reach 1e-12 in one pass here.
    expect(r.matvecs).toBeGreaterThan(40);
  });

  it('reports residual norms that match ‖A·v − θ·v‖ computed directly', () => {
    const r = largestEigenpairs(apply, n, 2, fixedStartVector(n), { tol: 1e-4, maxBasis: 30 });
    const av = new Float64Array(n);
    for (let k = 0; k < 2; k++) {
      const v = r.vectors.subarray(k * n, (k + 1) * n);
      apply(v, av);
      let s = 0;
      for (let i = 0; i < n; i++) s += (av[i] - r.values[k] * v[i]) ** 2;
      expect(Math.abs(Math.sqrt(s) - r.residuals[k])).toBeLessThan(1e-8 + 1e-6 * r.residuals[k]);
    }
  });

  it('skips a deflated direction: with the top eigenvector deflated, it returns the next ones', () => {
    const top = Float64Array.from(ref.vectors[0]);
    const r = largestEigenpairs(apply, n, 2, fixedStartVector(n), { tol: 1e-12, deflate: [top] });
    expect(Math.abs(r.values[0] - ref.values[1])).toBeLessThan(1e-9);
    expect(Math.abs(r.values[1] - ref.values[2])).toBeLessThan(1e-9);
  });

  it('is exact on a small operator whose Krylov space it exhausts', () => {
    const diag = [3, -1, 2, 0.5, 7];
    const apply5 = (x: Float64Array, y: Float64Array): void => {
      for (let i = 0; i < 5; i++) y[i] = diag[i] * x[i];
    };
    const r = largestEigenpairs(apply5, 5, 2, Float64Array.of(1, 1, 1, 1, 1));
    expect(Array.from(r.values)).toEqual([expect.closeTo(7, 12), expect.closeTo(3, 12)]);
    expect(Math.abs(r.vectors[4])).toBeCloseTo(1, 12);
    expect(Math.abs(r.vectors[5 + 0])).toBeCloseTo(1, 12);
  });

  it('finds every copy of a repeated eigenvalue even when the start vector sees only one of them', () => {
    // diag(5, 5, 5, 1, 1) from (1, 1, 1, 1, 1): the Krylov space of the start vector is two-dimensional.
    const diag = [5, 5, 5, 1, 1];
    const apply5 = (x: Float64Array, y: Float64Array): void => {
      for (let i = 0; i < 5; i++) y[i] = diag[i] * x[i];
    };
    const r = largestEigenpairs(apply5, 5, 3, Float64Array.of(1, 1, 1, 1, 1));
    expect(Array.from(r.values).map((v) => Math.round(v * 1e10) / 1e10)).toEqual([5, 5, 5]);
    for (let k = 0; k < 3; k++) {
      expect(Math.abs(r.vectors[k * 5 + 3]) + Math.abs(r.vectors[k * 5 + 4])).toBeLessThan(1e-10);
    }
  });

  it('keeps searching when the Krylov space runs out exactly at a restart', () => {
    // Eight distinct eigenvalues, 10 five times: from (1, …, 1) the space is exhausted after 8 vectors = the basis size.
    const diag = [10, 10, 10, 10, 10, 9, 8, 7, 6, 5, 4, 3];
    const apply12 = (x: Float64Array, y: Float64Array): void => {
      for (let i = 0; i < 12; i++) y[i] = diag[i] * x[i];
    };
    const r = largestEigenpairs(apply12, 12, 3, new Float64Array(12).fill(1), { maxBasis: 8, tol: 1e-12 });
    expect(Array.from(r.values).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([10, 10, 10]);
    expect(r.converged).toBe(true);
  });

  it('gives the same bytes on repeated calls', () => {
    const a = largestEigenpairs(apply, n, 2, fixedStartVector(n), { tol: 1e-8 });
    const b = largestEigenpairs(apply, n, 2, fixedStartVector(n), { tol: 1e-8 });
    expect(Buffer.from(a.vectors.buffer).equals(Buffer.from(b.vectors.buffer))).toBe(true);
  });

  it('rejects a count beyond the dimension and a start vector inside the deflated space', () => {
    const e0 = Float64Array.of(1, 0, 0);
    const id = (x: Float64Array, y: Float64Array): void => y.set(x);
    expect(() => largestEigenpairs(id, 3, 3, Float64Array.of(1, 1, 1), { deflate: [e0] })).toThrow(RangeError);
    expect(() => largestEigenpairs(id, 3, 1, Float64Array.of(2, 0, 0), { deflate: [e0] })).toThrow(/deflated/);
  });
});

describe('fixSignInPlace', () => {
  it('makes the entry of largest magnitude positive, the first one on ties', () => {
    const v = Float64Array.of(0.1, -0.7, 0.3);
    fixSignInPlace(v);
    expect(Array.from(v)).toEqual([-0.1, 0.7, -0.3]);
    const w = Float64Array.of(-0.5, 0.5);
    fixSignInPlace(w);
    expect(Array.from(w)).toEqual([0.5, -0.5]);
  });
});

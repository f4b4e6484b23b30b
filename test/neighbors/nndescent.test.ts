import { describe, expect, it } from 'vitest';

import { sqDist } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { KnnGraph, Matrix } from '../../src/core/types.js';
import { exactKnn, knnOf } from '../../src/neighbors/exact.js';
import { nnDescent } from '../../src/neighbors/nndescent.js';

/** 10 centres drawn from N(0, 5²·I) in d dimensions, unit Gaussian noise, row i around centre i mod 10. */
function mixture(seed: number, n: number, d: number): Matrix {
  const rng = new Rng(seed);
  const centres = new Float64Array(10 * d);
  for (let i = 0; i < centres.length; i++) centres[i] = 5 * rng.normal();
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) data[i * d + j] = centres[(i % 10) * d + j] + rng.normal();
  return { n, d, data };
}

/** One Gaussian blob whose column j has standard deviation 1/√(1 + j): no clusters, slowly decaying spread. */
function blob(seed: number, n: number, d: number): Matrix {
  const rng = new Rng(seed);
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) data[i * d + j] = rng.normal() / Math.sqrt(1 + j);
  return { n, d, data };
}

/** Fraction of the exact k-sets recovered (recall@k). */
function recall(approx: KnnGraph, exact: KnnGraph): number {
  const k = exact.k;
  let hit = 0;
  for (let i = 0; i < exact.n; i++) {
    const truth = new Set(exact.indices.subarray(i * k, (i + 1) * k));
    for (let t = 0; t < k; t++) if (truth.has(approx.indices[i * k + t])) hit++;
  }
  return hit / (exact.n * k);
}

/** Every row: k distinct in-range indices without itself, sqrt(sqDist) distances to the bit, sorted by (distance, index). */
function expectWellFormed(g: KnnGraph, m: Matrix): void {
  const k = g.k;
  const problems: string[] = [];
  for (let i = 0; i < g.n && problems.length < 5; i++) {
    const row = Array.from(g.indices.subarray(i * k, (i + 1) * k));
    if (row.includes(i)) problems.push(`row ${i} lists itself`);
    if (new Set(row).size !== k) problems.push(`row ${i} repeats a neighbour`);
    for (let t = 0; t < k; t++) {
      const j = row[t];
      if (!(j >= 0 && j < g.n)) problems.push(`row ${i} has index ${j}`);
      // Same arithmetic as the exact search: the square root of sqDist, to the bit.
      else if (g.distances[i * k + t] !== Math.sqrt(sqDist(m, i, m, j))) problems.push(`row ${i}: distance to ${j} is off`);
      if (t > 0) {
        const a = g.distances[i * k + t - 1];
        const b = g.distances[i * k + t];
        if (!(a < b || (a === b && row[t - 1] < j))) problems.push(`row ${i} is out of order at ${t}`);
      }
    }
  }
  expect(problems).toEqual([]);
}

function sameGraphBytes(a: KnnGraph, b: KnnGraph): boolean {
  return (
    Buffer.from(a.indices.buffer).equals(Buffer.from(b.indices.buffer)) &&
    Buffer.from(a.distances.buffer).equals(Buffer.from(b.distances.buffer))
  );
}

describe('knnOf above its exact limit (NN-descent from a random-projection forest)', () => {
  const m = mixture(1, 3000, 50);
  const exact = exactKnn(m, 15);
  const approx = knnOf(m, 15, { exactLimit: 1000, rng: new Rng(42) });

  it('recovers at least 95 % of the exact 15-nearest-neighbour sets on 50-dimensional mixture data', () => {
    expect(recall(approx, exact)).toBeGreaterThanOrEqual(0.95);
  });

  it('returns rows sorted by (distance, index), without self or repeats, with exact distances', () => {
    expect(approx.n).toBe(3000);
    expect(approx.k).toBe(15);
    expectWellFormed(approx, m);
  });

  it('returns the same bytes for the same generator seed', () => {
    expect(sameGraphBytes(knnOf(m, 15, { exactLimit: 1000, rng: new Rng(42) }), approx)).toBe(true);
  });

  it('returns a different graph for another data seed, with the same recall bound', () => {
    const other = knnOf(m, 15, { exactLimit: 1000, rng: new Rng(43) });
    expect(sameGraphBytes(other, approx)).toBe(false);
    expect(recall(other, exact)).toBeGreaterThanOrEqual(0.95);
  });

  it('leaves its input untouched', () => {
    const copy = m.data.slice();
    nnDescent(m, 5, new Rng(1), { maxIterations: 1 });
    expect(Buffer.from(m.data.buffer).equals(Buffer.from(copy.buffer))).toBe(true);
  });
});

describe('nnDescent on other data', () => {
  it('recovers at least 95 % of the exact sets on an unclustered blob with slowly decaying spread', () => {
    const m = blob(2, 3000, 50);
    expect(recall(nnDescent(m, 15, new Rng(7)), exactKnn(m, 15))).toBeGreaterThanOrEqual(0.95);
  });

  it('finds the exact k-th distances on data full of duplicate points', () => {
    // 64 distinct points with ~23 copies each: every true neighbour list is at distance 0 or 1.
    const rng = new Rng(3);
    const n = 1500;
    const data = new Float64Array(n * 3);
    for (let i = 0; i < data.length; i++) data[i] = rng.int(4);
    const m: Matrix = { n, d: 3, data };
    const g = nnDescent(m, 15, new Rng(8));
    const e = exactKnn(m, 15);
    expectWellFormed(g, m);
    let same = 0;
    for (let i = 0; i < n; i++) if (g.distances[i * 15 + 14] === e.distances[i * 15 + 14]) same++;
    expect(same / n).toBeGreaterThanOrEqual(0.99);
  });

  it('works for tiny inputs, down to k = n − 1 (then it must find everything)', () => {
    const m = blob(4, 12, 3);
    const g = nnDescent(m, 11, new Rng(1));
    expectWellFormed(g, m);
    expect(Array.from(g.indices)).toEqual(Array.from(exactKnn(m, 11).indices));
  });

  it('rejects bad k, non-finite input and bad options with a RangeError', () => {
    const m = blob(5, 30, 2);
    expect(() => nnDescent(m, 0, new Rng(1))).toThrow(RangeError);
    expect(() => nnDescent(m, 30, new Rng(1))).toThrow(RangeError);
    const bad = m.data.slice();
    bad[3] = Number.NaN;
    expect(() => nnDescent({ n: 30, d: 2, data: bad }, 3, new Rng(1))).toThrow(/non-finite/);
    expect(() => nnDescent(m, 3, new Rng(1), { trees: -1 })).toThrow(RangeError);
    expect(() => nnDescent(m, 3, new Rng(1), { leafSize: 1 })).toThrow(RangeError);
    expect(() => nnDescent(m, 3, new Rng(1), { maxCandidates: 0 })).toThrow(RangeError);
    expect(() => nnDescent(m, 3, new Rng(1), { delta: -0.1 })).toThrow(RangeError);
  });
});

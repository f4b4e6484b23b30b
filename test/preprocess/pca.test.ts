import { readFileSync } from 'node:fs';

import { Matrix as MlMatrix, SingularValueDecomposition } from 'ml-matrix';
import { describe, expect, it } from 'vitest';

import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import { workerThreadsAvailable } from '../../src/preprocess/parallel.js';
import { fullPcaEvr, pca2, randomizedPca, type PcaResult } from '../../src/preprocess/pca.js';

function readCsv(name: string): number[][] {
  const text = readFileSync(new URL(`../fixtures/${name}`, import.meta.url), 'utf8');
  return text
    .trim()
    .split('\n')
    .slice(1)
    .map((line) => line.split(',').map(Number));
}

/** digits500: the 64 pixel columns (label column dropped) of test/fixtures/digits500_X.csv. */
function digits(): Matrix {
  const rows = readCsv('digits500_X.csv');
  const data = new Float64Array(rows.length * 64);
  rows.forEach((r, i) => {
    for (let j = 0; j < 64; j++) data[i * 64 + j] = r[j + 1];
  });
  return { n: rows.length, d: 64, data };
}

/** n × d matrix of rank `rank` with singular values falling as 1/(t+1), plus small Gaussian noise. */
function lowRankPlusNoise(seed: number, n: number, d: number, rank: number, noise: number): Matrix {
  const rng = new Rng(seed);
  const a = new Float64Array(n * rank);
  for (let i = 0; i < a.length; i++) a[i] = rng.normal();
  const w = new Float64Array(rank * d);
  for (let i = 0; i < w.length; i++) w[i] = rng.normal();
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < d; j++) {
      let s = 5 + 0.01 * j; // a non-zero mean, so centring matters
      for (let t = 0; t < rank; t++) s += (a[i * rank + t] * w[t * d + j] * 20) / (t + 1);
      data[i * d + j] = s + noise * rng.normal();
    }
  }
  return { n, d, data };
}

/**
 * Independent reference: thin SVD of the centred matrix by ml-matrix 6.15.1,
 * done here directly. Returns singular values, EVR and U·S (absolute values
 * are compared, so its sign convention does not matter).
 */
function mlMatrixReference(m: Matrix, k: number): { s: number[]; evr: number[]; us: number[][] } {
  const rows: number[][] = [];
  const mean = new Array<number>(m.d).fill(0);
  for (let i = 0; i < m.n; i++) for (let j = 0; j < m.d; j++) mean[j] += m.data[i * m.d + j] / m.n;
  let frob2 = 0;
  for (let i = 0; i < m.n; i++) {
    const r: number[] = [];
    for (let j = 0; j < m.d; j++) {
      const v = m.data[i * m.d + j] - mean[j];
      r.push(v);
      frob2 += v * v;
    }
    rows.push(r);
  }
  const svd = new SingularValueDecomposition(new MlMatrix(rows), { autoTranspose: true });
  const s = svd.diagonal.slice(0, k);
  const u = svd.leftSingularVectors;
  const us = rows.map((_, i) => s.map((sv, c) => u.get(i, c) * sv));
  return { s, evr: s.map((v) => (v * v) / frob2), us };
}

/**
 * n rows around 10 centres drawn from N(0, spread²·I) in d dimensions, plus unit
 * Gaussian noise; row i belongs to centre i mod 10. After centring, nine strong
 * directions are followed by a noise bulk whose leading values are only a few
 * per cent apart — the hard case for a truncated SVD.
 */
function mixtureLike(seed: number, n: number, d: number, spread: number): Matrix {
  const rng = new Rng(seed);
  const centres = new Float64Array(10 * d);
  for (let i = 0; i < centres.length; i++) centres[i] = spread * rng.normal();
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) data[i * d + j] = centres[(i % 10) * d + j] + rng.normal();
  return { n, d, data };
}

/** Explained-variance ratios of all components from an ml-matrix 6.15.1 thin SVD (no vectors) of the centred data. */
function mlMatrixEvr(m: Matrix): number[] {
  const rows: number[][] = [];
  const mean = new Array<number>(m.d).fill(0);
  for (let i = 0; i < m.n; i++) for (let j = 0; j < m.d; j++) mean[j] += m.data[i * m.d + j] / m.n;
  let frob2 = 0;
  for (let i = 0; i < m.n; i++) {
    const r: number[] = [];
    for (let j = 0; j < m.d; j++) {
      const v = m.data[i * m.d + j] - mean[j];
      r.push(v);
      frob2 += v * v;
    }
    rows.push(r);
  }
  const svd = new SingularValueDecomposition(new MlMatrix(rows), {
    autoTranspose: true,
    computeLeftSingularVectors: false,
    computeRightSingularVectors: false,
  });
  return svd.diagonal.map((v) => (v * v) / frob2);
}

function sameBytes(a: Float64Array, b: Float64Array): boolean {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}

function maxAbsScoreDiff(res: PcaResult, us: number[][]): number {
  let worst = 0;
  const k = res.scores.d;
  for (let i = 0; i < res.scores.n; i++) {
    for (let c = 0; c < k; c++) {
      worst = Math.max(worst, Math.abs(Math.abs(res.scores.data[i * k + c]) - Math.abs(us[i][c])));
    }
  }
  return worst;
}

function maxOrthonormalityError(res: PcaResult): number {
  const { n: k, d, data } = res.components;
  let worst = 0;
  for (let a = 0; a < k; a++) {
    for (let b = 0; b < k; b++) {
      let s = 0;
      for (let t = 0; t < d; t++) s += data[a * d + t] * data[b * d + t];
      worst = Math.max(worst, Math.abs(s - (a === b ? 1 : 0)));
    }
  }
  return worst;
}

function expectSignRule(res: PcaResult): void {
  const { n: k, d, data } = res.components;
  for (let c = 0; c < k; c++) {
    let best = 0;
    for (let t = 1; t < d; t++) if (Math.abs(data[c * d + t]) > Math.abs(data[c * d + best])) best = t;
    expect(data[c * d + best]).toBeGreaterThan(0);
  }
}

describe('randomizedPca on a random low-rank-plus-noise matrix', () => {
  const m = lowRankPlusNoise(11, 300, 120, 6, 0.05);
  const ref = mlMatrixReference(m, 6);

  it('matches an exact ml-matrix SVD in explained-variance ratio and |scores| to 1e-6 (randomized path)', () => {
    const res = randomizedPca(m, 6, new Rng(1), { solver: 'randomized' });
    for (let c = 0; c < 6; c++) {
      expect(Math.abs(res.explainedVarianceRatio[c] - ref.evr[c])).toBeLessThan(1e-6);
      expect(Math.abs(res.singularValues[c] - ref.s[c]) / ref.s[c]).toBeLessThan(1e-6);
    }
    expect(maxAbsScoreDiff(res, ref.us)).toBeLessThan(1e-6);
  });

  it('matches the same reference on the exact path', () => {
    const res = randomizedPca(m, 6, new Rng(1), { solver: 'exact' });
    for (let c = 0; c < 6; c++) expect(Math.abs(res.explainedVarianceRatio[c] - ref.evr[c])).toBeLessThan(1e-10);
    expect(maxAbsScoreDiff(res, ref.us)).toBeLessThan(1e-8);
  });

  it('returns orthonormal, sign-fixed components and consistent variances', () => {
    for (const solver of ['randomized', 'exact'] as const) {
      const res = randomizedPca(m, 6, new Rng(2), { solver });
      expect(res.components.n).toBe(6);
      expect(res.components.d).toBe(120);
      expect(res.scores.n).toBe(300);
      expect(res.scores.d).toBe(6);
      expect(maxOrthonormalityError(res)).toBeLessThan(1e-12);
      expectSignRule(res);
      for (let c = 0; c < 6; c++) {
        const s2 = res.singularValues[c] ** 2;
        expect(res.explainedVariance[c]).toBeCloseTo(s2 / 299, 9);
        if (c > 0) expect(res.singularValues[c]).toBeLessThanOrEqual(res.singularValues[c - 1]);
      }
      // Mean: the column means of the input.
      let mean0 = 0;
      for (let i = 0; i < 300; i++) mean0 += m.data[i * 120];
      expect(res.mean[0]).toBeCloseTo(mean0 / 300, 10);
    }
  });

  it('gives scores equal to the centred data times the components', () => {
    const res = randomizedPca(m, 3, new Rng(3), { solver: 'randomized' });
    for (const i of [0, 17, 299]) {
      for (let c = 0; c < 3; c++) {
        let s = 0;
        for (let t = 0; t < 120; t++) s += (m.data[i * 120 + t] - res.mean[t]) * res.components.data[c * 120 + t];
        expect(res.scores.data[i * 3 + c]).toBeCloseTo(s, 9);
      }
    }
  });

  it('returns the same bytes for the same seed', () => {
    const a = randomizedPca(m, 4, new Rng(99), { solver: 'randomized' });
    const b = randomizedPca(m, 4, new Rng(99), { solver: 'randomized' });
    expect(Buffer.from(a.scores.data.buffer).equals(Buffer.from(b.scores.data.buffer))).toBe(true);
    expect(Buffer.from(a.components.data.buffer).equals(Buffer.from(b.components.data.buffer))).toBe(true);
    expect(Buffer.from(a.singularValues.buffer).equals(Buffer.from(b.singularValues.buffer))).toBe(true);
  });

  it('gives the same components for different seeds once converged, thanks to the sign rule', () => {
    const a = randomizedPca(m, 4, new Rng(1), { solver: 'randomized' });
    const b = randomizedPca(m, 4, new Rng(2), { solver: 'randomized' });
    for (let i = 0; i < a.components.data.length; i++) {
      expect(Math.abs(a.components.data[i] - b.components.data[i])).toBeLessThan(1e-8);
    }
  });

  it('leaves its input untouched', () => {
    const copy = m.data.slice();
    randomizedPca(m, 3, new Rng(4), { solver: 'randomized' });
    randomizedPca(m, 3, new Rng(4), { solver: 'exact' });
    expect(m.data).toEqual(copy);
  });
});

describe('randomizedPca with the automatic solver choice', () => {
  it('takes the randomized path above 250 000 entries and still matches ml-matrix to 1e-6', () => {
    const m = lowRankPlusNoise(12, 2600, 100, 8, 0.1); // 260 000 entries
    const ref = mlMatrixReference(m, 5);
    const res = randomizedPca(m, 5, new Rng(5));
    for (let c = 0; c < 5; c++) expect(Math.abs(res.explainedVarianceRatio[c] - ref.evr[c])).toBeLessThan(1e-6);
    expect(maxAbsScoreDiff(res, ref.us)).toBeLessThan(1e-6);
    // The exact path draws nothing from the generator; the randomized one does.
    const rng = new Rng(5);
    randomizedPca(m, 5, rng);
    expect(rng.nextU32()).not.toBe(new Rng(5).nextU32());
  });

  it('takes the exact path for small inputs, drawing nothing from the generator', () => {
    const m = lowRankPlusNoise(13, 60, 10, 3, 0.1);
    const rng = new Rng(6);
    randomizedPca(m, 2, rng);
    expect(rng.nextU32()).toBe(new Rng(6).nextU32());
  });

  it('handles more columns than rows', () => {
    const m = lowRankPlusNoise(14, 40, 90, 4, 0.01);
    const ref = mlMatrixReference(m, 4);
    for (const solver of ['exact', 'randomized'] as const) {
      const res = randomizedPca(m, 4, new Rng(7), { solver });
      for (let c = 0; c < 4; c++) expect(Math.abs(res.explainedVarianceRatio[c] - ref.evr[c])).toBeLessThan(1e-6);
      expect(maxAbsScoreDiff(res, ref.us)).toBeLessThan(1e-6);
      expect(maxOrthonormalityError(res)).toBeLessThan(1e-12);
    }
  });

  it('still returns orthonormal components when the data have lower rank than the sketch', () => {
    // Rank 3 exactly (no noise), sketch of 5 + 10 directions.
    const m = lowRankPlusNoise(15, 200, 60, 3, 0);
    const res = randomizedPca(m, 5, new Rng(8), { solver: 'randomized' });
    expect(maxOrthonormalityError(res)).toBeLessThan(1e-10);
    const top3 = res.explainedVarianceRatio[0] + res.explainedVarianceRatio[1] + res.explainedVarianceRatio[2];
    expect(top3).toBeCloseTo(1, 10);
    expect(res.singularValues[3]).toBeLessThan(1e-9 * res.singularValues[0]);
  });
});

describe('randomizedPca on digits500 (UCI optical digits, first 500 rows, as bundled in scikit-learn 1.2.1)', () => {
  const m = digits();
  const e1 = readCsv('digits500_pca2.csv');

  it('reproduces numpy 1.24.2 singular values and explained-variance ratios', () => {
    const res = randomizedPca(m, 4, new Rng(1));
    // numpy 1.24.2 thin SVD of the centred 500 × 64 matrix (test/fixtures/scripts/digits500.py prints them).
    const s = [298.23671745, 292.64800096, 263.19955204, 255.74596067];
    for (let c = 0; c < 4; c++) expect(Math.abs(res.singularValues[c] - s[c])).toBeLessThan(1e-8);
    expect(Math.abs(res.explainedVarianceRatio[0] - 0.15082358)).toBeLessThan(1e-8);
    expect(Math.abs(res.explainedVarianceRatio[1] - 0.14522392)).toBeLessThan(1e-8);
  });

  it('gives the numpy 2-D PCA embedding with the same sign rule, all 500 rows to 1e-8', () => {
    const emb = pca2(m, new Rng(1));
    expect(emb.n).toBe(500);
    expect(emb.data.length).toBe(1000);
    // Rows 0..2 as printed by numpy 1.24.2 (8 decimals).
    const first = [
      [15.07356372, -6.93918015],
      [-14.96774275, 11.03793175],
      [-6.66876497, 9.1992752],
    ];
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(emb.data[2 * i] - first[i][0])).toBeLessThan(1e-7);
      expect(Math.abs(emb.data[2 * i + 1] - first[i][1])).toBeLessThan(1e-7);
    }
    // Full embedding from test/fixtures/digits500_pca2.csv (numpy 1.24.2; columns row,label,pc1,pc2).
    let worst = 0;
    for (let i = 0; i < 500; i++) {
      worst = Math.max(worst, Math.abs(emb.data[2 * i] - e1[i][2]), Math.abs(emb.data[2 * i + 1] - e1[i][3]));
    }
    expect(worst).toBeLessThan(1e-8);
  });

  it('matches the same embedding on the randomized path with the default Krylov depth', () => {
    // σ1 and σ2 of the digits are close (298 vs 293) and the spectrum decays slowly; the Krylov basis
    // (4 directions × 13 = 52 of 64 dimensions) pins the scores down to 1e-6 without extra settings.
    const res = randomizedPca(m, 2, new Rng(3), { solver: 'randomized' });
    let worst = 0;
    for (let i = 0; i < 500; i++) {
      worst = Math.max(worst, Math.abs(res.scores.data[2 * i] - e1[i][2]), Math.abs(res.scores.data[2 * i + 1] - e1[i][3]));
    }
    expect(worst).toBeLessThan(1e-6);
    expect(Math.abs(res.explainedVarianceRatio[0] - 0.15082358)).toBeLessThan(1e-8);
    expect(Math.abs(res.explainedVarianceRatio[1] - 0.14522392)).toBeLessThan(1e-8);
  });

  it('captures more variance as the Krylov depth grows from the same start, never more than numpy', () => {
    // Same seed and block size: the depth-q basis contains the shallower ones, so by the Courant–Fischer
    // theorem each Ritz value can only grow with q, up to the exact value (numpy 1.24.2, see above).
    let prev = [0, 0];
    for (const depth of [0, 1, 2, 4, 8]) {
      const res = randomizedPca(m, 2, new Rng(3), { solver: 'randomized', blockSize: 2, powerIterations: depth });
      for (let c = 0; c < 2; c++) {
        expect(res.explainedVarianceRatio[c]).toBeGreaterThanOrEqual(prev[c] * (1 - 1e-12));
        expect(res.explainedVarianceRatio[c]).toBeLessThanOrEqual([0.15082358, 0.14522392][c] + 1e-8);
      }
      prev = [res.explainedVarianceRatio[0], res.explainedVarianceRatio[1]];
    }
    expect(Math.abs(prev[0] - 0.15082358)).toBeLessThan(1e-6);
  });

  it('agrees with an ml-matrix SVD of the same data on |scores| to 1e-6 for 10 components', () => {
    const ref = mlMatrixReference(m, 10);
    const res = randomizedPca(m, 10, new Rng(4));
    for (let c = 0; c < 10; c++) expect(Math.abs(res.explainedVarianceRatio[c] - ref.evr[c])).toBeLessThan(1e-6);
    expect(maxAbsScoreDiff(res, ref.us)).toBeLessThan(1e-6);
  });
});

describe('randomizedPca on a 600 × 300 mixture with a small gap after the 9th component, 50 components', () => {
  const m = mixtureLike(3, 600, 300, 2);
  const ref = mlMatrixEvr(m);
  const res = randomizedPca(m, 50, new Rng(1), { solver: 'randomized' });

  it('has the small gap it is meant to test', () => {
    // The 10th and 11th ratios (first two noise directions) differ by under 5 %.
    expect(ref[9] - ref[10]).toBeGreaterThan(0);
    expect((ref[9] - ref[10]) / ref[9]).toBeLessThan(0.05);
  });

  it('gets the top 10 explained-variance ratios within 1e-6 of an exact ml-matrix 6.15.1 SVD', () => {
    for (let c = 0; c < 10; c++) expect(Math.abs(res.explainedVarianceRatio[c] - ref[c])).toBeLessThan(1e-6);
  });

  it('never reports more variance than the exact SVD (Ritz values are lower bounds), up to rounding', () => {
    for (let c = 0; c < 50; c++) expect(res.explainedVarianceRatio[c]).toBeLessThanOrEqual(ref[c] * (1 + 1e-12));
  });

  it('returns orthonormal, sign-fixed components with scores equal to the centred data times them', () => {
    expect(maxOrthonormalityError(res)).toBeLessThan(1e-12);
    expectSignRule(res);
    for (const i of [0, 299, 599]) {
      for (const c of [0, 9, 49]) {
        let s = 0;
        for (let t = 0; t < 300; t++) s += (m.data[i * 300 + t] - res.mean[t]) * res.components.data[c * 300 + t];
        expect(Math.abs(res.scores.data[i * 50 + c] - s)).toBeLessThan(1e-9);
      }
    }
  });

  it('returns the same bytes for the same seed, and other bytes but the same top-10 ratios for another seed', () => {
    const again = randomizedPca(m, 50, new Rng(1), { solver: 'randomized' });
    expect(sameBytes(again.scores.data, res.scores.data)).toBe(true);
    expect(sameBytes(again.components.data, res.components.data)).toBe(true);
    expect(sameBytes(again.singularValues, res.singularValues)).toBe(true);
    const other = randomizedPca(m, 50, new Rng(2), { solver: 'randomized' });
    expect(sameBytes(other.scores.data, res.scores.data)).toBe(false);
    for (let c = 0; c < 10; c++) expect(Math.abs(other.explainedVarianceRatio[c] - ref[c])).toBeLessThan(1e-6);
  });

  it('is unaffected, to 1e-6, by adding 10 000 to every entry (centring is part of the method)', () => {
    const shifted: Matrix = { n: m.n, d: m.d, data: m.data.map((v) => v + 1e4) };
    const res2 = randomizedPca(shifted, 50, new Rng(1), { solver: 'randomized' });
    for (let c = 0; c < 10; c++) expect(Math.abs(res2.explainedVarianceRatio[c] - ref[c])).toBeLessThan(1e-6);
    let worst = 0;
    for (let i = 0; i < 600 * 10; i++) {
      const c = i % 50;
      if (c < 10) worst = Math.max(worst, Math.abs(res2.scores.data[i] - res.scores.data[i]));
    }
    expect(worst).toBeLessThan(1e-6);
  });

  it('returns the same bytes on two threads as on one', () => {
    // Without a loadable worker thread the two-thread call would quietly run on one.
    expect(workerThreadsAvailable()).toBe(true);
    const two = randomizedPca(m, 50, new Rng(1), { solver: 'randomized', threads: 2 });
    expect(sameBytes(two.scores.data, res.scores.data)).toBe(true);
    expect(sameBytes(two.components.data, res.components.data)).toBe(true);
    expect(sameBytes(two.singularValues, res.singularValues)).toBe(true);
    expect(sameBytes(two.explainedVarianceRatio, res.explainedVarianceRatio)).toBe(true);
  });
});

describe('fullPcaEvr', () => {
  it('returns all min(n, d) ratios, descending, summing to 1, led by the numpy values on digits500', () => {
    const evr = fullPcaEvr(digits());
    expect(evr.length).toBe(64);
    let sum = 0;
    for (let i = 0; i < evr.length; i++) {
      sum += evr[i];
      if (i > 0) expect(evr[i]).toBeLessThanOrEqual(evr[i - 1]);
    }
    expect(sum).toBeCloseTo(1, 12);
    // numpy 1.24.2 (see test/fixtures/scripts/digits500.py).
    expect(Math.abs(evr[0] - 0.15082358)).toBeLessThan(1e-8);
    expect(Math.abs(evr[1] - 0.14522392)).toBeLessThan(1e-8);
  });
});

describe('randomizedPca argument checks', () => {
  const m = lowRankPlusNoise(16, 20, 5, 2, 0.1);
  it('rejects k outside 1..min(n, d) with a RangeError', () => {
    expect(() => randomizedPca(m, 0, new Rng(1))).toThrow(RangeError);
    expect(() => randomizedPca(m, 6, new Rng(1))).toThrow(/1\.\.5/);
    expect(() => randomizedPca(m, 1.5, new Rng(1))).toThrow(RangeError);
  });

  it('rejects bad options and degenerate data with a RangeError', () => {
    expect(() => randomizedPca(m, 2, new Rng(1), { blockSize: 0 })).toThrow(RangeError);
    expect(() => randomizedPca(m, 2, new Rng(1), { powerIterations: 0.5 })).toThrow(RangeError);
    expect(() => randomizedPca(m, 2, new Rng(1), { threads: 0 })).toThrow(RangeError);
    expect(() => randomizedPca({ n: 1, d: 3, data: new Float64Array(3) }, 1, new Rng(1))).toThrow(RangeError);
    expect(() => randomizedPca({ n: 3, d: 2, data: new Float64Array(6).fill(2) }, 1, new Rng(1))).toThrow(/no variance/);
    const bad = m.data.slice();
    bad[7] = Number.NaN;
    expect(() => randomizedPca({ n: 20, d: 5, data: bad }, 2, new Rng(1))).toThrow(/non-finite/);
  });

  it('pca2 needs two columns', () => {
    expect(() => pca2({ n: 4, d: 1, data: new Float64Array([1, 2, 3, 4]) }, new Rng(1))).toThrow(RangeError);
  });
});

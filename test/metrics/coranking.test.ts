import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { selectRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import type { Matrix } from '../../src/core/types.js';
import {
  RankWork,
  coRankingMatrix,
  continuityFromCoRanking,
  logSpacedK,
  rankTable,
  rnxCurves,
  rnxFromTable,
  sampleRows,
  trustworthinessFromCoRanking,
} from '../../src/metrics/coranking.js';
import { continuity, trustworthiness } from '../../src/metrics/neighbourhood.js';
import { S10, gaussianMatrix, loadDigits500, naiveRanks, similarity } from './testdata.js';

/** Q_NX and R_NX of D500 X → E1, K = 1..498 (numpy 1.24.2, stable (distance, index) tie rule). */
function digitsRnxCsv(): { q: number[]; r: number[] } {
  const path = fileURLToPath(new URL('../fixtures/digits500_pca2_rnx.csv', import.meta.url));
  const lines = readFileSync(path, 'utf8').trim().split(/\r?\n/).slice(1);
  const rows = lines.map((l) => l.split(',').map(Number));
  rows.forEach((row, t) => expect(row[0]).toBe(t + 1));
  return { q: rows.map((row) => row[1]), r: rows.map((row) => row[2]) };
}

function permuteRows(M: Matrix, rng: Rng): Matrix {
  const perm = Int32Array.from({ length: M.n }, (_, i) => i);
  for (let t = M.n - 1; t > 0; t--) {
    const u = rng.int(t + 1);
    [perm[t], perm[u]] = [perm[u], perm[t]];
  }
  return selectRows(M, perm);
}

describe('coRankingMatrix', () => {
  it('reproduces the S10 co-ranking matrix, whose rows and columns each sum to n', () => {
    // Reference: numpy 1.24.2 with stable (distance, index) ranks on the tie-free S10 set (computed).
    const expected = [
      [6, 1, 2, 1, 0, 0, 0, 0, 0],
      [1, 2, 4, 2, 1, 0, 0, 0, 0],
      [2, 3, 2, 3, 0, 0, 0, 0, 0],
      [0, 2, 2, 3, 3, 0, 0, 0, 0],
      [0, 0, 0, 0, 3, 3, 2, 1, 1],
      [1, 2, 0, 1, 2, 2, 2, 0, 0],
      [0, 0, 0, 0, 1, 3, 6, 0, 0],
      [0, 0, 0, 0, 0, 1, 0, 6, 3],
      [0, 0, 0, 0, 0, 1, 0, 3, 6],
    ];
    const Q = coRankingMatrix(S10.X, S10.Y);
    expect(Array.from(Q)).toEqual(expected.flat());
    for (let r = 0; r < 9; r++) {
      let row = 0;
      let col = 0;
      for (let c = 0; c < 9; c++) {
        row += Q[r * 9 + c];
        col += Q[c * 9 + r];
      }
      expect([row, col]).toEqual([10, 10]);
    }
  });

  it('gives T(K) and C(K) as block sums equal to trustworthiness() and continuity() (Lee & Verleysen 2009)', () => {
    const Q = coRankingMatrix(S10.X, S10.Y);
    for (let K = 1; K <= 8; K++) {
      expect(trustworthinessFromCoRanking(Q, K)).toBeCloseTo(trustworthiness(S10.X, S10.Y, K), 14);
      expect(continuityFromCoRanking(Q, K)).toBeCloseTo(continuity(S10.X, S10.Y, K), 14);
    }
    // D500 has many exact distance ties; both sides use the (distance, index) rule.
    const { X, E1 } = loadDigits500();
    const QD = coRankingMatrix(X, E1);
    for (const K of [5, 10, 15, 30]) {
      expect(trustworthinessFromCoRanking(QD, K)).toBeCloseTo(trustworthiness(X, E1, K), 13);
      expect(continuityFromCoRanking(QD, K)).toBeCloseTo(continuity(X, E1, K), 13);
    }
    // Stable-tie values at K = 5 (numpy 1.24.2, computed): T = 0.8538617886178862, C = 0.9577.
    expect(trustworthinessFromCoRanking(QD, 5)).toBeCloseTo(0.8538617886178862, 13);
    expect(continuityFromCoRanking(QD, 5)).toBeCloseTo(0.9577, 13);
  });

  it('refuses more points than the exact limit', () => {
    const big = { n: 2001, d: 1, data: new Float64Array(2001) };
    expect(() => coRankingMatrix(big, big)).toThrow(/2 to 2000 points/);
  });
});

describe('rnxCurves', () => {
  it('gives the S10 Q_NX, R_NX, LCMC and AUC values', () => {
    // numpy 1.24.2, stable ties (computed); AUC as Lee, Peluffo-Ordóñez & Verleysen 2015 with weights 1/K.
    const c = rnxCurves(S10.X, S10.Y);
    const q = [0.6, 0.5, 0.766666666667, 0.9, 0.86, 0.9, 0.971428571429, 0.95, 1.0];
    const r = [0.55, 0.357142857143, 0.65, 0.82, 0.685, 0.7, 0.871428571429, 0.55];
    const lcmc = [0.488888888889, 0.277777777778, 0.433333333333, 0.455555555556, 0.304444444444, 0.233333333333,
      0.193650793651, 0.061111111111, 0];
    expect(c.qnx).toHaveLength(9);
    expect(c.rnx).toHaveLength(8);
    q.forEach((v, t) => expect(c.qnx[t]).toBeCloseTo(v, 11));
    r.forEach((v, t) => expect(c.rnx[t]).toBeCloseTo(v, 11));
    // LCMC(K) = Q_NX(K) − K/(n − 1) (Chen & Buja 2009).
    lcmc.forEach((v, t) => expect(c.qnx[t] - (t + 1) / 9).toBeCloseTo(v, 11));
    expect(c.auc).toBeCloseTo(0.5876484575433326, 15);
    expect(c.queries).toBe(10);
    expect(c.aucStandardError).toBe(0);
  });

  it('reproduces the whole D500 X → E1 curve and AUC 0.30333682252620214 (numpy 1.24.2, stable ties)', () => {
    const { X, E1 } = loadDigits500();
    const c = rnxCurves(X, E1);
    const ref = digitsRnxCsv();
    expect(c.qnx).toHaveLength(499);
    expect(c.rnx).toHaveLength(498);
    ref.q.forEach((v, t) => expect(Math.abs(c.qnx[t] - v)).toBeLessThan(1e-14));
    ref.r.forEach((v, t) => expect(Math.abs(c.rnx[t] - v)).toBeLessThan(1e-14));
    expect(c.qnx[498]).toBe(1);
    const at = (K: number): [number, number] => [c.qnx[K - 1], c.rnx[K - 1]];
    const table: Array<[number, number, number]> = [
      [1, 0.076, 0.07414457831325301],
      [5, 0.2004, 0.19230688259109313],
      [10, 0.2954, 0.2809910020449897],
      [15, 0.3556, 0.3356289256198347],
      [30, 0.46386666666666665, 0.42957242359630415],
    ];
    for (const [K, q, r] of table) {
      expect(at(K)[0]).toBeCloseTo(q, 14);
      expect(at(K)[1]).toBeCloseTo(r, 14);
    }
    expect(c.auc).toBeCloseTo(0.30333682252620214, 14);
  });

  it('equals the exact curves when the query sample is every row', () => {
    const { X, E1 } = loadDigits500();
    const all = Int32Array.from({ length: 500 }, (_, i) => i);
    const exact = rnxCurves(X, E1);
    const sampled = rnxCurves(X, E1, all);
    expect(sampled.auc).toBe(exact.auc);
    expect(Array.from(sampled.rnx)).toEqual(Array.from(exact.rnx));
    expect(sampled.aucStandardError).toBe(0);
  });

  it('estimates the AUC from a seeded row sample within 0.02 and four standard errors of the exact value', () => {
    const { X, E1, E2 } = loadDigits500();
    for (const [Y, seed] of [[E1, 1], [E2, 2]] as const) {
      const exact = rnxCurves(X, Y).auc;
      const rows = sampleRows(500, 150, new Rng(seed));
      const est = rnxCurves(X, Y, rows);
      expect(est.queries).toBe(150);
      expect(est.aucStandardError).toBeGreaterThan(0);
      expect(Math.abs(est.auc - exact)).toBeLessThan(0.02);
      expect(Math.abs(est.auc - exact)).toBeLessThan(4 * est.aucStandardError);
    }
  });

  it('is 1 at every K for a rotated, scaled and shifted copy and near 0 for a shuffled map', () => {
    const X = gaussianMatrix(new Rng(11), 300, 2);
    const c = Math.cos(0.7);
    const s = Math.sin(0.7);
    const Y = similarity(X, [c, s, -s, c], 3.5, [10, -4]);
    const same = rnxCurves(X, Y);
    expect(Math.abs(same.auc - 1)).toBeLessThan(1e-12);
    for (const v of same.rnx) expect(Math.abs(v - 1)).toBeLessThan(1e-12);
    const { X: D, E1 } = loadDigits500();
    const shuffled = rnxCurves(D, permuteRows(E1, new Rng(3)));
    expect(Math.abs(shuffled.auc)).toBeLessThan(0.03);
  });

  it('scores a row subset like the restricted data, from ranks of all rows', () => {
    const { X, E1 } = loadDigits500();
    const rows = Int32Array.from({ length: 500 }, (_, i) => i).filter((i) => i % 7 !== 2);
    const Xs = selectRows(X, rows);
    const Ys = selectRows(E1, rows);
    const direct = rnxCurves(Xs, Ys);
    const fromTable = rnxFromTable(rankTable(X), Ys, rows);
    expect(fromTable.queries).toBe(rows.length);
    expect(fromTable.auc).toBeCloseTo(direct.auc, 14);
    direct.rnx.forEach((v, t) => expect(fromTable.rnx[t]).toBeCloseTo(v, 14));
    // With a sampled table the queries are the sampled rows that the subset keeps.
    const q = sampleRows(500, 120, new Rng(9));
    const kept = q.filter((r) => rows.includes(r));
    const localQueries = Int32Array.from(kept, (r) => rows.indexOf(r));
    const viaSample = rnxFromTable(rankTable(X, q), Ys, rows);
    const directSample = rnxCurves(Xs, Ys, localQueries);
    expect(viaSample.queries).toBe(kept.length);
    expect(viaSample.auc).toBeCloseTo(directSample.auc, 14);
  });

  it('throws when the map covers none of the query rows', () => {
    const table = rankTable(S10.X, Int32Array.of(0, 1));
    const Ys = selectRows(S10.Y, [2, 3, 4, 5]);
    expect(() => rnxFromTable(table, Ys, Int32Array.of(2, 3, 4, 5))).toThrow(/none of the query rows/);
  });
});

describe('rankTable', () => {
  it('ranks by (distance, index) exactly as a full sort on heavily tied data', () => {
    const { X } = loadDigits500();
    const expected = naiveRanks(X);
    const rows = Int32Array.of(0, 1, 77, 250, 499);
    const table = rankTable(X, rows);
    rows.forEach((i, t) => {
      expect(Array.from(table.ranks.subarray(t * 500, (t + 1) * 500))).toEqual(
        Array.from(expected.subarray(i * 500, (i + 1) * 500)),
      );
    });
  });

  it('resolves distances that share their leading bits by their exact values', () => {
    // Squared distances 1, 1 + 2^-40, 1 (exact tie) and 1 − 2^-40 from point 0 on a line.
    const e = 2 ** -40;
    const M: Matrix = { n: 5, d: 1, data: Float64Array.of(0, 1, Math.sqrt(1 + e), -1, -Math.sqrt(1 - e)) };
    const dist = [1, 2, 3, 4].map((j) => [(0 - M.data[j]) * (0 - M.data[j]), j]);
    dist.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    const out = new Int32Array(5);
    new RankWork(5).rankRow(M, 0, out);
    const expected = new Int32Array(5);
    dist.forEach(([, j], r) => (expected[j] = r + 1));
    expect(Array.from(out)).toEqual(Array.from(expected));
  });
});

describe('logSpacedK', () => {
  it('spans 1..maxK in at most `count` increasing integer steps', () => {
    for (const maxK of [1, 2, 8, 498, 9998]) {
      const K = logSpacedK(maxK, 40);
      expect(K[0]).toBe(1);
      expect(K[K.length - 1]).toBe(maxK);
      expect(K.length).toBeLessThanOrEqual(40);
      for (let t = 1; t < K.length; t++) expect(K[t]).toBeGreaterThan(K[t - 1]);
    }
    expect(logSpacedK(9998, 40).length).toBeGreaterThan(30);
  });
});

import { describe, expect, it } from 'vitest';
import { matrixFromRows } from '../../../src/core/matrix.js';
import type { Matrix } from '../../../src/core/types.js';
import {
  calibrate,
  jointExact,
  jointFromKnn,
  MACHINE_EPSILON,
  neighboursForPerplexity,
} from '../../../src/embed/tsne/affinities.js';
import type { SparseAffinities } from '../../../src/embed/tsne/affinities.js';
import { loadDigits500, loadReference, naiveKnn } from './helpers.js';

// Reference values: test/fixtures/tsne_reference.json, written by
// test/fixtures/scripts/tsne_reference.py with scikit-learn 1.2.1 / SciPy 1.10.1.
const ref = loadReference();
const S10: Matrix = matrixFromRows(ref.s10.X);

/** Squared distances from each point to every other point, others in index order (n × (n − 1)). */
function othersSquared(X: Matrix): Float64Array {
  const { n, d, data } = X;
  const out = new Float64Array(n * (n - 1));
  for (let i = 0; i < n; i++) {
    let c = 0;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      let s = 0;
      for (let t = 0; t < d; t++) s += (data[i * d + t] - data[j * d + t]) ** 2;
      out[i * (n - 1) + c++] = s;
    }
  }
  return out;
}

function rowEntropy(p: Float64Array, off: number, m: number): number {
  let h = 0;
  for (let t = 0; t < m; t++) if (p[off + t] > 0) h -= p[off + t] * Math.log(p[off + t]);
  return h;
}

function dense(P: SparseAffinities): Float64Array {
  const out = new Float64Array(P.n * P.n);
  for (let i = 0; i < P.n; i++) {
    for (let e = P.indptr[i]; e < P.indptr[i + 1]; e++) out[i * P.n + P.indices[e]] = P.values[e];
  }
  return out;
}

describe('calibrate', () => {
  for (const perp of ['2', '3', '5']) {
    const r = ref.s10.perplexities[perp];
    it(`finds the precision that gives perplexity ${perp} on S10 (root β from SciPy 1.10.1 brentq, to 1e-4 relative)`, () => {
      const { beta } = calibrate(othersSquared(S10), 10, 9, Number(perp));
      for (let i = 0; i < 10; i++) expect(Math.abs(beta[i] / r.beta_root[i] - 1)).toBeLessThan(1e-4);
    });

    it(`reaches perplexity ${perp} per row within 1e-4 and rows sum to 1`, () => {
      const { conditional } = calibrate(othersSquared(S10), 10, 9, Number(perp));
      for (let i = 0; i < 10; i++) {
        const achieved = Math.exp(rowEntropy(conditional, i * 9, 9));
        expect(Math.abs(achieved / Number(perp) - 1)).toBeLessThan(1e-4);
        let s = 0;
        for (let t = 0; t < 9; t++) s += conditional[i * 9 + t];
        expect(s).toBeCloseTo(1, 14);
      }
    });

    it(`matches scikit-learn 1.2.1 _binary_search_perplexity's conditional P at perplexity ${perp} (float32 there, 2e-5)`, () => {
      const { conditional } = calibrate(othersSquared(S10), 10, 9, Number(perp));
      for (let i = 0; i < 10; i++) {
        let c = 0;
        for (let j = 0; j < 10; j++) {
          if (j === i) continue;
          expect(Math.abs(conditional[i * 9 + c++] - r.sklearn_conditional[i][j])).toBeLessThan(2e-5);
        }
      }
    });
  }

  it('finds the digits (D500) precisions at perplexity 30 over all 499 others (root β from SciPy 1.10.1, 1e-4 relative)', () => {
    const { X } = loadDigits500();
    const sq = othersSquared(X);
    const { beta } = calibrate(sq, 500, 499, 30);
    ref.d500.beta_rows.forEach((row, t) => {
      expect(Math.abs(beta[row] / ref.d500.beta_root[t] - 1)).toBeLessThan(1e-4);
    });
  });

  it('does not modify the distances it is given', () => {
    const sq = othersSquared(S10);
    const copy = sq.slice();
    calibrate(sq, 10, 9, 3);
    expect(sq).toEqual(copy);
  });

  it('rejects a perplexity above the number of candidates', () => {
    expect(() => calibrate(othersSquared(S10), 10, 9, 9.5)).toThrow(RangeError);
    expect(() => calibrate(othersSquared(S10), 10, 9, 0)).toThrow(/positive/);
  });
});

describe('neighboursForPerplexity', () => {
  it('uses ⌊3·perplexity + 1⌋ neighbours capped at n − 1 (van der Maaten 2014; scikit-learn 1.2.1 gives 91 for perplexity 30)', () => {
    expect(neighboursForPerplexity(30, 3000)).toBe(91);
    expect(neighboursForPerplexity(30, 50)).toBe(49);
    expect(neighboursForPerplexity(2.5, 100)).toBe(8);
  });
});

describe('jointExact', () => {
  it('is symmetric, sums to 1, stores every other point in ascending order and floors at machine epsilon', () => {
    const P = jointExact(S10, 3);
    expect(Array.from(P.indptr)).toEqual(Array.from({ length: 11 }, (_, i) => 9 * i));
    const D = dense(P);
    let s = 0;
    for (let i = 0; i < 10; i++) {
      const cols = Array.from(P.indices.subarray(P.indptr[i], P.indptr[i + 1]));
      expect(cols).toEqual(Array.from({ length: 10 }, (_, j) => j).filter((j) => j !== i));
      for (let j = 0; j < 10; j++) {
        expect(D[i * 10 + j]).toBe(D[j * 10 + i]);
        s += D[i * 10 + j];
      }
    }
    expect(s).toBeCloseTo(1, 14);
    for (const v of P.values) expect(v).toBeGreaterThanOrEqual(MACHINE_EPSILON);
  });
});

describe('jointFromKnn', () => {
  it('equals the exact P when every other point is a neighbour', () => {
    const exact = jointExact(S10, 3);
    const sparse = jointFromKnn(naiveKnn(S10, 9), 3, 9);
    expect(Array.from(sparse.indptr)).toEqual(Array.from(exact.indptr));
    expect(Array.from(sparse.indices)).toEqual(Array.from(exact.indices));
    for (let e = 0; e < exact.values.length; e++) expect(Math.abs(sparse.values[e] - exact.values[e])).toBeLessThan(1e-15);
  });

  it('stores the union of both neighbour sets, symmetric, with ascending columns and unit total', () => {
    const { X } = loadDigits500();
    const k = neighboursForPerplexity(10, X.n);
    const knn = naiveKnn(X, k);
    const P = jointFromKnn(knn, 10);
    const n = X.n;
    const member = new Set<number>();
    for (let i = 0; i < n; i++) for (let t = 0; t < k; t++) {
      const j = knn.indices[i * k + t];
      member.add(i * n + j);
      member.add(j * n + i);
    }
    expect(P.indices.length).toBe(member.size);
    const D = dense(P);
    let s = 0;
    for (let i = 0; i < n; i++) {
      for (let e = P.indptr[i]; e < P.indptr[i + 1]; e++) {
        const j = P.indices[e];
        if (e > P.indptr[i]) expect(j).toBeGreaterThan(P.indices[e - 1]);
        expect(member.has(i * n + j)).toBe(true);
        expect(D[j * n + i]).toBe(P.values[e]);
        s += P.values[e];
      }
    }
    expect(s).toBeCloseTo(1, 13);
  });

  it('uses only the first ⌊3·perplexity + 1⌋ columns of a wider graph', () => {
    const { X } = loadDigits500();
    const narrow = jointFromKnn(naiveKnn(X, 31), 10);
    const wide = jointFromKnn(naiveKnn(X, 60), 10);
    expect(Array.from(wide.indices)).toEqual(Array.from(narrow.indices));
    expect(Array.from(wide.values)).toEqual(Array.from(narrow.values));
  });

  it('rejects a graph with too few columns or one that lists a point as its own neighbour', () => {
    const knn = naiveKnn(S10, 4);
    expect(() => jointFromKnn(knn, 3)).toThrow(/10 are needed|4 columns/);
    const selfish = { ...knn, indices: knn.indices.slice() };
    selfish.indices[0] = 0;
    expect(() => jointFromKnn(selfish, 1, 4)).toThrow(/self excluded/);
  });
});

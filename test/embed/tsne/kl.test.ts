import { describe, expect, it } from 'vitest';
import { embeddingFromRows, matrixFromRows } from '../../../src/core/matrix.js';
import { Rng } from '../../../src/core/rng.js';
import { jointExact, jointFromKnn } from '../../../src/embed/tsne/affinities.js';
import type { SparseAffinities } from '../../../src/embed/tsne/affinities.js';
import { klDivergence } from '../../../src/embed/tsne/kl.js';
import { loadDigits500, loadDigitsE1, loadReference, naiveKnn } from './helpers.js';

// Reference values: test/fixtures/tsne_reference.json, written by
// test/fixtures/scripts/tsne_reference.py with scikit-learn 1.2.1
// (sklearn.manifold._t_sne._kl_divergence), SciPy 1.10.1, NumPy 1.24.2.
const ref = loadReference();
const S10 = matrixFromRows(ref.s10.X);
const Y = embeddingFromRows(ref.s10.Y);

/** KL by the textbook formula with an explicit n × n Q (naive reference). */
function naiveKl(P: SparseAffinities, y: Float64Array): number {
  const n = P.n;
  const w = new Float64Array(n * n);
  let z = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    if (i === j) continue;
    w[i * n + j] = 1 / (1 + (y[2 * i] - y[2 * j]) ** 2 + (y[2 * i + 1] - y[2 * j + 1]) ** 2);
    z += w[i * n + j];
  }
  let kl = 0;
  for (let i = 0; i < n; i++) for (let e = P.indptr[i]; e < P.indptr[i + 1]; e++) {
    const p = P.values[e];
    kl += p * Math.log(p / (w[i * n + P.indices[e]] / z));
  }
  return kl;
}

describe('klDivergence', () => {
  for (const perp of ['2', '3', '5']) {
    const r = ref.s10.perplexities[perp];
    it(`gives scikit-learn 1.2.1's KL of the S10 layout at perplexity ${perp} with exact P (1e-5)`, () => {
      const kl = klDivergence(jointExact(S10, Number(perp)), Y);
      // Root-β P (float64) and scikit-learn's own float32 P: both within 1e-5.
      expect(Math.abs(kl - r.kl_root_p)).toBeLessThan(1e-5);
      expect(Math.abs(kl - r.kl_sklearn_p)).toBeLessThan(1e-5);
    });
  }

  it("gives scikit-learn 1.2.1's exact KL of the digits PCA layout E1 at perplexity 30 (1e-6)", () => {
    const { X } = loadDigits500();
    const E1 = { n: 500, data: loadDigitsE1() };
    expect(Math.abs(klDivergence(jointExact(X, 30), E1) - ref.d500.kl_exact)).toBeLessThan(1e-6);
  });

  it("gives scikit-learn 1.2.1's KL of E1 with the sparse 91-neighbour P (1e-4: digits distances tie at the 91st neighbour)", () => {
    const { X } = loadDigits500();
    const E1 = { n: 500, data: loadDigitsE1() };
    const P = jointFromKnn(naiveKnn(X, 91), 30);
    expect(Math.abs(klDivergence(P, E1) - ref.d500.kl_sparse)).toBeLessThan(1e-4);
  });

  it('agrees with the textbook formula on a random layout and sparse P', () => {
    const rng = new Rng(11);
    const n = 60;
    const data = new Float64Array(n * 3);
    for (let e = 0; e < data.length; e++) data[e] = rng.normal();
    const X = { n, d: 3, data };
    const P = jointFromKnn(naiveKnn(X, 16), 5);
    const y = new Float64Array(2 * n);
    for (let e = 0; e < y.length; e++) y[e] = 3 * rng.normal();
    expect(Math.abs(klDivergence(P, { n, data: y }) - naiveKl(P, y))).toBeLessThan(1e-12);
  });

  it('is invariant to translating the layout and changes with its scale', () => {
    const P = jointExact(S10, 3);
    const moved = Y.data.map((v, e) => v + (e % 2 === 0 ? 7 : -3));
    expect(klDivergence(P, { n: 10, data: moved })).toBeCloseTo(klDivergence(P, Y), 12);
    const shrunk = Y.data.map((v) => v / 10);
    expect(Math.abs(klDivergence(P, { n: 10, data: shrunk }) - klDivergence(P, Y))).toBeGreaterThan(1e-3);
  });
});

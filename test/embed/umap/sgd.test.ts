import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { fitAB, optimizeLayoutInPlace, type FuzzyGraph } from '../../../src/embed/umap/index.js';

/** Two vertices joined by one edge of weight w (stored in both directions). */
const pair = (w: number): FuzzyGraph => ({ n: 2, indptr: Int32Array.of(0, 1, 2), indices: Int32Array.of(1, 0), weights: Float64Array.of(w, w) });

/** One attractive step of UMAP's gradient (McInnes et al. 2018, eq. for the attractive term), written out with Math.pow. */
function attract(y: number[], j: number, k: number, a: number, b: number, alpha: number): void {
  const dx = y[2 * j] - y[2 * k];
  const dy = y[2 * j + 1] - y[2 * k + 1];
  const d2 = dx * dx + dy * dy;
  const coeff = (-2 * a * b * Math.pow(d2, b - 1)) / (1 + a * Math.pow(d2, b));
  const clip = (v: number): number => Math.max(-4, Math.min(4, v));
  const gx = clip(coeff * dx);
  const gy = clip(coeff * dy);
  y[2 * j] += alpha * gx;
  y[2 * j + 1] += alpha * gy;
  y[2 * k] -= alpha * gx;
  y[2 * k + 1] -= alpha * gy;
}

describe('optimizeLayoutInPlace', () => {
  const { a, b } = fitAB(0.1);

  it('does nothing in epoch 0 and moves both ends of each edge by the attractive gradient from epoch 1 on (umap-learn schedule)', () => {
    const y = Float64Array.of(0, 0, 3, 4);
    optimizeLayoutInPlace(y, pair(1), { a, b, epochs: 1, negativeSampleRate: 0 }, new Rng(1));
    expect(Array.from(y)).toEqual([0, 0, 3, 4]);

    const z = Float64Array.of(0, 0, 3, 4);
    optimizeLayoutInPlace(z, pair(1), { a, b, epochs: 3, negativeSampleRate: 0 }, new Rng(1));
    const expected = [0, 0, 3, 4];
    // Epoch 1 at α = 1, epoch 2 at α = 1 − 1/3; edge (0, 1) then edge (1, 0) each time.
    for (const alpha of [1, 1 - 1 / 3]) {
      attract(expected, 0, 1, a, b, alpha);
      attract(expected, 1, 0, a, b, alpha);
    }
    for (let e = 0; e < 4; e++) expect(z[e]).toBeCloseTo(expected[e], 12);
  });

  it('samples an edge of weight w about w / max(w) times per epoch', () => {
    // A path 0–1–2 with weights 1 and 0.25: the weak edge moves its ends only every fourth epoch.
    const g: FuzzyGraph = {
      n: 3,
      indptr: Int32Array.of(0, 1, 3, 4),
      indices: Int32Array.of(1, 0, 2, 1),
      weights: Float64Array.of(1, 1, 0.25, 0.25),
    };
    const moves: number[] = [];
    for (let epochs = 2; epochs <= 9; epochs++) {
      const y = Float64Array.of(0, 0, 1, 0, 1, 5);
      optimizeLayoutInPlace(y, g, { a, b, epochs, negativeSampleRate: 0 }, new Rng(1));
      moves.push(y[4] === 1 && y[5] === 5 ? 0 : 1);
    }
    // Vertex 2 first moves in epoch 4 (epochs_per_sample = 4), i.e. once 5 epochs are run.
    expect(moves).toEqual([0, 0, 0, 1, 1, 1, 1, 1]);
  });

  it('pushes a vertex away from others through negative samples', () => {
    // Two separate edges far from each other; with negatives the pairs drift apart, without they do not.
    const g: FuzzyGraph = {
      n: 4,
      indptr: Int32Array.of(0, 1, 2, 3, 4),
      indices: Int32Array.of(1, 0, 3, 2),
      weights: Float64Array.of(1, 1, 1, 1),
    };
    const start = Float64Array.of(0, 0, 0.5, 0, 1, 0, 1.5, 0);
    const spread = (y: Float64Array): number => Math.hypot(y[4] + y[6] - y[0] - y[2], y[5] + y[7] - y[1] - y[3]) / 2;
    const without = start.slice();
    optimizeLayoutInPlace(without, g, { a, b, epochs: 50, negativeSampleRate: 0 }, new Rng(1));
    const withNeg = start.slice();
    optimizeLayoutInPlace(withNeg, g, { a, b, epochs: 50, negativeSampleRate: 5 }, new Rng(1));
    expect(spread(withNeg)).toBeGreaterThan(2 * spread(without));
  });

  it('rejects a layout of the wrong length and a non-integer epoch count', () => {
    expect(() => optimizeLayoutInPlace(new Float64Array(3), pair(1), { a, b, epochs: 5 }, new Rng(1))).toThrow(RangeError);
    expect(() => optimizeLayoutInPlace(new Float64Array(4), pair(1), { a, b, epochs: 2.5 }, new Rng(1))).toThrow(/epochs/);
  });
});

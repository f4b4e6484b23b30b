import { describe, expect, it } from 'vitest';
import { matrixFromRows, selectRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import { adjustedRandIndex, kmeansLabels } from '../../src/metrics/clustering.js';
import { seedStability } from '../../src/metrics/stability.js';
import { procrustes } from '../../src/metrics/procrustes.js';
import { S10, loadDigits500, similarity } from './testdata.js';

describe('seedStability', () => {
  it('compares every unordered pair of seeds with Procrustes, k-NN overlap and k-means ARI', () => {
    const mirrored = similarity(S10.Y, [1, 0, 0, -1], 2, [5, 5]);
    const r = seedStability([S10.Y, S10.Y2, mirrored], { k: 3, clusters: 3, rng: new Rng(8) });
    expect(r.pairs).toBe(3);
    expect(r.perPairs.map((p) => [p.a, p.b])).toEqual([[0, 1], [0, 2], [1, 2]]);
    // scipy 1.10.1 procrustes(Y, Y2), computed; the mirrored, scaled, shifted copy of Y fits Y exactly.
    expect(r.perPairs[0].procrustes).toBeCloseTo(0.013049088524350619, 14);
    expect(r.perPairs[1].procrustes).toBeLessThan(1e-20);
    expect(r.perPairs[2].procrustes).toBeCloseTo(0.013049088524350619, 14);
    // Shared 3-NN fraction of Y and Y2 (numpy, computed); a similarity transform keeps every neighbour.
    expect(r.perPairs[0].knnOverlap).toBeCloseTo(0.933333333333333, 14);
    expect(r.perPairs[1].knnOverlap).toBe(1);
    expect(r.identicalMaps).toBe(false);
    expect(r.labels).toHaveLength(3);
    for (const p of r.perPairs) expect(p.ari).toBe(adjustedRandIndex(r.labels[p.a], r.labels[p.b]));
    const mean = (f: (p: (typeof r.perPairs)[number]) => number): number =>
      r.perPairs.reduce((s, p) => s + f(p), 0) / 3;
    expect(r.procrustesMean).toBeCloseTo(mean((p) => p.procrustes), 15);
    expect(r.procrustesMax).toBe(Math.max(...r.perPairs.map((p) => p.procrustes)));
    expect(r.seedKnnOverlap).toBeCloseTo(mean((p) => p.knnOverlap), 15);
    expect(r.ariMean).toBeCloseTo(mean((p) => p.ari), 15);
  });

  it('matches the D500 references for two fixed maps (scipy 1.10.1 disparity; numpy k-NN overlap)', () => {
    const { E1, E2 } = loadDigits500();
    const r = seedStability([E1, E2], { k: 10, clusters: 10, rng: new Rng(3), restarts: 2 });
    expect(r.procrustesMean).toBeCloseTo(0.0814720640868248, 13);
    expect(r.seedKnnOverlap).toBeCloseTo(0.377, 13);
  });

  it('flags maps that are bytewise identical and then shows perfect agreement', () => {
    const copy = matrixFromRows(Array.from({ length: 10 }, (_, i) => [S10.Y.data[2 * i], S10.Y.data[2 * i + 1]]));
    const r = seedStability([S10.Y, copy, S10.Y], { k: 2, clusters: 3, rng: new Rng(1) });
    expect(r.identicalMaps).toBe(true);
    expect(r.seedKnnOverlap).toBe(1);
    expect(r.procrustesMax).toBeLessThan(1e-20);
  });

  it('treats −0 and 0 as different bytes, so such maps are not identical', () => {
    const a = matrixFromRows([[0, 1], [2, 3], [4, 6], [1, 1]]);
    const b = matrixFromRows([[-0, 1], [2, 3], [4, 6], [1, 1]]);
    expect(seedStability([a, b], { k: 1, clusters: 2, rng: new Rng(1) }).identicalMaps).toBe(false);
  });

  it('returns null pairwise summaries for a single map, with its k-means labels', () => {
    const r = seedStability([S10.Y], { k: 3, clusters: 3, rng: new Rng(5) });
    expect(r).toMatchObject({
      procrustesMean: null,
      procrustesMax: null,
      seedKnnOverlap: null,
      ariMean: null,
      pairs: 0,
      identicalMaps: false,
      perPairs: [],
    });
    expect(r.labels).toHaveLength(1);
  });

  it('clusters each map with its own generator stream drawn in order from the given one', () => {
    const seedRng = new Rng(99);
    const r = seedStability([S10.Y, S10.Y2], { k: 2, clusters: 3, rng: new Rng(99) });
    const first = kmeansLabels(S10.Y, 3, new Rng(seedRng.nextU32()));
    const second = kmeansLabels(S10.Y2, 3, new Rng(seedRng.nextU32()));
    expect(r.labels[0]).toEqual(first);
    expect(r.labels[1]).toEqual(second);
  });

  it('rejects an empty list, maps of different sizes and out-of-range k or cluster counts', () => {
    expect(() => seedStability([], { k: 2, clusters: 2, rng: new Rng(1) })).toThrow(/at least one/);
    expect(() => seedStability([S10.Y, matrixFromRows([[0, 0], [1, 1], [2, 0]])], { k: 1, clusters: 2, rng: new Rng(1) })).toThrow(
      /embedding 1/,
    );
    expect(() => seedStability([S10.Y], { k: 10, clusters: 2, rng: new Rng(1) })).toThrow(/from 1 to n − 1 = 9/);
    expect(() => seedStability([S10.Y], { k: 2, clusters: 11, rng: new Rng(1) })).toThrow(/clusters/);
  });
});

describe('seedStability on row subsets', () => {
  it('compares each pair on the rows both maps cover, as if those rows were all there is', () => {
    // Map a covers rows 0..8 of S10, map b covers rows 1..9: they share rows 1..8.
    const rowsA = Int32Array.from([0, 1, 2, 3, 4, 5, 6, 7, 8]);
    const rowsB = Int32Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    const A = selectRows(S10.Y, rowsA);
    const B = selectRows(S10.Y2, rowsB);
    const r = seedStability([A, B], { k: 2, clusters: 2, rng: new Rng(4), rows: [rowsA, rowsB] });
    const shared = Int32Array.from([1, 2, 3, 4, 5, 6, 7, 8]);
    const direct = procrustes(selectRows(S10.Y, shared), selectRows(S10.Y2, shared)).disparity;
    expect(r.perPairs[0].sharedRows).toBe(8);
    expect(r.perPairs[0].procrustes).toBeCloseTo(direct, 14);
    expect(r.identicalMaps).toBe(false);
  });
});

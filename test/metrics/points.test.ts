import { describe, expect, it } from 'vitest';
import { matrixFromRows, selectRows } from '../../src/core/matrix.js';
import { Rng } from '../../src/core/rng.js';
import { exactKnn } from '../../src/neighbors/exact.js';
import { knnOverlap } from '../../src/metrics/neighbourhood.js';
import { leastStablePoints, pointStability, pointStabilityStats } from '../../src/metrics/points.js';
import { S10, gaussianMatrix, loadDigits500, readFixtureJson } from './testdata.js';

const fixture = readFixtureJson('structure-metrics.json');
const ps = fixture.point_stability;
const Y3 = matrixFromRows(fixture.S10_Y3 as number[][]);

/** Compare per-point values with a fixture list where null stands for "never shared" (NaN). */
function expectValues(actual: Float64Array, expected: Array<number | null>): void {
  expect(actual).toHaveLength(expected.length);
  expected.forEach((v, i) => {
    if (v === null) expect(actual[i]).toBeNaN();
    else expect(actual[i]).toBeCloseTo(v, 15);
  });
}

describe('pointStability', () => {
  it('gives each point its k-NN Jaccard between two maps (S10 Y vs Y2, numpy 1.24.2 fixture)', () => {
    for (const k of [2, 3]) expectValues(pointStability([S10.Y, S10.Y2], { k }), ps.S10_Y_Y2[String(k)]);
  });

  it('averages over all pairs of three maps (numpy 1.24.2 fixture)', () => {
    for (const k of [2, 3]) expectValues(pointStability([S10.Y, S10.Y2, Y3], { k }), ps.S10_Y_Y2_Y3[String(k)]);
  });

  it('compares maps on shared rows only, with neighbourhoods among those rows; unshared rows get NaN', () => {
    const rows = (ps.S10_subsets.rows as number[][]).map((r) => Int32Array.from(r));
    const maps = [S10.Y, selectRows(S10.Y2, rows[1]), selectRows(Y3, rows[2])];
    const v = pointStability(maps, { k: 2, rows, n: 10 });
    expectValues(v, ps.S10_subsets.k2);
    expect(v[6]).toBeNaN();
    // The same with cached kNN graphs of every map (spare columns are filtered to the shared rows).
    const knn = maps.map((m) => exactKnn(m, 5));
    expectValues(pointStability(maps, { k: 2, rows, n: 10, knn }), ps.S10_subsets.k2);
    // And with graphs exactly k long, so most rows need the direct scan.
    const short = maps.map((m) => exactKnn(m, 2));
    expectValues(pointStability(maps, { k: 2, rows, n: 10, knn: short }), ps.S10_subsets.k2);
  });

  it('has a mean equal to the mean k-NN Jaccard of the two maps (D500 E1 vs E2, k = 10)', () => {
    const { E1, E2 } = loadDigits500();
    const v = pointStability([E1, E2], { k: 10 });
    expectValues(v, ps.D500_E1_E2_k10);
    // Mean Jaccard of the 10-NN sets of E1 and E2: 0.25609246481073106 (numpy 1.24.2, stable ties, computed).
    expect(pointStabilityStats(v).mean).toBeCloseTo(0.25609246481073106, 14);
    expect(pointStabilityStats(v).mean).toBeCloseTo(knnOverlap(exactKnn(E1, 10), exactKnn(E2, 10), 10).jaccard, 14);
  });

  it('is 1 for every point when the maps are identical', () => {
    const Y = gaussianMatrix(new Rng(4), 100, 2);
    expect(Array.from(pointStability([Y, Y, Y], { k: 5 })).every((v) => v === 1)).toBe(true);
  });

  it('rejects a single map and row lists that do not match their maps', () => {
    expect(() => pointStability([S10.Y], { k: 2 })).toThrow(/at least 2 maps/);
    expect(() => pointStability([S10.Y, S10.Y2], { k: 2, rows: [null, Int32Array.of(1, 2)], n: 10 })).toThrow(
      /map 1 has 10 rows but its row list has 2/,
    );
    const bad = Int32Array.of(0, 1, 2, 3, 4, 5, 6, 7, 9, 8);
    expect(() => pointStability([S10.Y, S10.Y2], { k: 2, rows: [null, bad], n: 10 })).toThrow(/strictly ascending/);
  });
});

describe('pointStabilityStats and leastStablePoints', () => {
  it('give the mean and numpy-style 10th percentile, ignoring NaN', () => {
    // numpy.percentile(arange(1, 11), 10) = 1.9 (linear interpolation, numpy 1.24.2).
    const v = Float64Array.of(10, NaN, 1, 2, 3, 4, 5, 6, 7, 8, 9);
    const s = pointStabilityStats(v);
    expect(s.count).toBe(10);
    expect(s.mean).toBeCloseTo(5.5, 15);
    expect(s.p10).toBeCloseTo(1.9, 15);
    expect(pointStabilityStats(Float64Array.of(NaN)).count).toBe(0);
  });

  it('list the least stable rows by value, ties by row, NaN skipped', () => {
    const v = Float64Array.of(0.5, NaN, 0.2, 0.5, 0.1, 0.2);
    expect(leastStablePoints(v, 4)).toEqual([
      { row: 4, value: 0.1 },
      { row: 2, value: 0.2 },
      { row: 5, value: 0.2 },
      { row: 0, value: 0.5 },
    ]);
    expect(leastStablePoints(v, 10)).toHaveLength(5);
  });
});

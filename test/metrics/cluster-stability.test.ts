import { describe, expect, it } from 'vitest';
import { clusterStability, hennigReading } from '../../src/metrics/cluster-stability.js';
import { S10, loadDigits500, nearestCentroidLabels } from './testdata.js';

describe('hennigReading', () => {
  it('uses the cut-offs of the fpc clusterboot documentation (0.5 / 0.6 / 0.75 / 0.85)', () => {
    expect(hennigReading(0.2)).toBe('dissolved');
    expect(hennigReading(0.5)).toBe('dissolved');
    expect(hennigReading(0.55)).toBe('not trustworthy');
    expect(hennigReading(0.6)).toBe('doubtful');
    expect(hennigReading(0.7499)).toBe('doubtful');
    expect(hennigReading(0.75)).toBe('stable');
    expect(hennigReading(0.85)).toBe('highly stable');
    expect(hennigReading(1)).toBe('highly stable');
  });
});

describe('clusterStability', () => {
  it('matches best-match Jaccard values on S10 (lab vs predY) with their readings', () => {
    // Hennig 2007 best-match Jaccard, numpy 1.24.2 (computed): {1, 2/3, 0.75}.
    const r = clusterStability([S10.lab, S10.predY]);
    expect(r.map((c) => c.cluster)).toEqual([0, 1, 2]);
    expect(r.map((c) => c.size)).toEqual([4, 3, 3]);
    expect(r[0].meanJaccard).toBe(1);
    expect(r[1].meanJaccard).toBeCloseTo(2 / 3, 15);
    expect(r[2].meanJaccard).toBeCloseTo(0.75, 15);
    expect(r.map((c) => c.reading)).toEqual(['highly stable', 'doubtful', 'stable']);
  });

  it('restricts each comparison to the rows both partitions cover (S10 subset example)', () => {
    // Points 3 and 6 absent from the second map, clustered [5,5,6,6,6,7,7,7] (numpy 1.24.2, computed): 2/3, 2/3, 1.
    const r = clusterStability([S10.lab, Int32Array.of(5, 5, 6, 6, 6, 7, 7, 7)], {
      rows: [null, Int32Array.of(0, 1, 2, 4, 5, 7, 8, 9)],
      n: 10,
    });
    expect(r.map((c) => c.meanJaccard)).toEqual([2 / 3, 2 / 3, 1].map((v) => expect.closeTo(v, 15)));
    // The first map may itself cover a subset: the same comparison seen from rows 0..9 without 3 and 6.
    const firstRows = Int32Array.of(0, 1, 2, 4, 5, 6, 7, 8, 9);
    const first = Int32Array.from(firstRows, (i) => S10.lab[i]);
    const r2 = clusterStability([first, Int32Array.of(5, 5, 6, 6, 6, 7, 7, 7)], {
      rows: [firstRows, Int32Array.of(0, 1, 2, 4, 5, 7, 8, 9)],
      n: 10,
    });
    expect(r2.map((c) => c.size)).toEqual([3, 3, 3]);
    expect(r2[0].meanJaccard).toBeCloseTo(2 / 3, 15);
  });

  it('matches the D500 values for pE1 against pE2 and against an even-row re-clustering of E2', () => {
    const { y, E1, E2 } = loadDigits500();
    const pE1 = nearestCentroidLabels(E1, y);
    const pE2 = nearestCentroidLabels(E2, y);
    const even = Array.from({ length: 250 }, (_, t) => 2 * t);
    const pEven = nearestCentroidLabels(E2, y, even);
    // numpy 1.24.2 (computed), Hennig 2007 best-match Jaccard per cluster 0..9.
    const vsE2 = [0.75, 0.582089552239, 0.376470588235, 0.843137254902, 0.781818181818, 0.409090909091, 0.827586206897,
      0.616438356164, 0.578125, 0.283018867925];
    const vsEven = [0.8, 0.653846153846, 0.457142857143, 0.818181818182, 0.787878787879, 0.190476190476, 0.857142857143,
      0.677419354839, 0.609756097561, 0.25];
    const a = clusterStability([pE1, pE2]);
    a.forEach((c, t) => expect(c.meanJaccard).toBeCloseTo(vsE2[t], 11));
    expect(a.reduce((s, c) => s + c.meanJaccard, 0) / 10).toBeCloseTo(0.6047774917270615, 14);
    const b = clusterStability([pE1, pEven], { rows: [null, Int32Array.from(even)], n: 500 });
    b.forEach((c, t) => expect(c.meanJaccard).toBeCloseTo(vsEven[t], 11));
    // Both other maps at once: the mean of the two.
    const both = clusterStability([pE1, pE2, pEven], { rows: [null, null, Int32Array.from(even)], n: 500 });
    both.forEach((c, t) => {
      expect(c.meanJaccard).toBeCloseTo((vsE2[t] + vsEven[t]) / 2, 11);
      expect(Array.from(c.perMap)).toEqual([a[t].meanJaccard, b[t].meanJaccard]);
    });
  });

  it('names the most common label of each cluster and marks clusters never compared', () => {
    const labels = Int32Array.of(3, 3, 1, 1, 1, 2, 2, 0, -1, -1);
    const first = Int32Array.of(0, 0, 0, 0, 1, 1, 1, 2, 2, 2);
    const r = clusterStability([first, Int32Array.of(0, 0, 0, 0, 1, 1, 1)], {
      rows: [null, Int32Array.of(0, 1, 2, 3, 4, 5, 6)],
      n: 10,
      labels,
    });
    // Cluster 0 = rows 0..3: labels 3,3,1,1 → tie, the smaller label 1.
    expect(r.map((c) => c.majorityLabel)).toEqual([1, 2, 0]);
    expect(r[2].meanJaccard).toBeNaN();
    expect(r[2].reading).toBe('not compared');
  });
});

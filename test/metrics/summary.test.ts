import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { meanSd } from '../../src/metrics/summary.js';

describe('meanSd', () => {
  it('gives the mean and the n − 1 standard deviation, as simple-statistics 7.12.1 does', () => {
    const values = [0.91, 0.87, 0.95, 0.9];
    const r = meanSd(values);
    expect(r.mean).toBeCloseTo(ssMean(values), 15);
    expect(r.sd).toBeCloseTo(sampleStandardDeviation(values), 15);
    // textbook: sd of 1, 2, 3, 4 = sqrt(5/3)
    expect(meanSd([1, 2, 3, 4]).sd).toBeCloseTo(Math.sqrt(5 / 3), 15);
  });

  it('skips nulls', () => {
    expect(meanSd([null, 1, null, 3])).toEqual({ mean: 2, sd: Math.SQRT2 });
  });

  it('returns nulls when nothing is left and a null sd for a single value', () => {
    expect(meanSd([])).toEqual({ mean: null, sd: null });
    expect(meanSd([null, null])).toEqual({ mean: null, sd: null });
    expect(meanSd([0.5, null])).toEqual({ mean: 0.5, sd: null });
  });

  it('refuses NaN and infinities instead of skipping them', () => {
    expect(() => meanSd([1, NaN])).toThrow(/value 1 is NaN/);
    expect(() => meanSd([Infinity])).toThrow(RangeError);
  });
});

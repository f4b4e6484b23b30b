import { describe, expect, it } from 'vitest';
import { bandScale, linearScale, logScale, niceDomain, niceTicks } from '../../src/report/axes.js';

describe('axis scales and ticks', () => {
  it('puts ticks at 1, 2 or 5 × 10^k steps inside the range', () => {
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(0.13, 0.91, 4)).toEqual([0.2, 0.4, 0.6, 0.8]);
    expect(niceTicks(3, 97, 5)).toEqual([20, 40, 60, 80]);
    expect(niceTicks(5, 5)).toEqual([5]);
    expect(niceTicks(NaN, 1)).toEqual([]);
  });

  it('widens a domain outward to whole steps, and pads a single value', () => {
    expect(niceDomain(0.13, 0.91, 4)).toEqual([0, 1]);
    expect(niceDomain(0.903, 0.917, 4)).toEqual([0.9, 0.92]);
    expect(niceDomain(2, 2)).toEqual([1.8, 2.2]);
    expect(niceDomain(0, 0)).toEqual([-1, 1]);
  });

  it('maps a linear domain onto a range that may point upward, with tick text at the step precision', () => {
    const y = linearScale(0, 1, 200, 0, 5);
    expect(y.at(0)).toBe(200);
    expect(y.at(1)).toBe(0);
    expect(y.at(0.25)).toBe(150);
    expect(y.ticks.map((t) => y.tickText(t))).toEqual(['0.0', '0.2', '0.4', '0.6', '0.8', '1.0']);
  });

  it('maps a log domain so that each decade has the same length, ticks at 1, 2, 5 per decade', () => {
    const x = logScale(1, 100, 0, 300);
    expect(x.at(1)).toBeCloseTo(0, 12);
    expect(x.at(10)).toBeCloseTo(150, 12);
    expect(x.at(100)).toBeCloseTo(300, 12);
    expect(x.ticks).toEqual([1, 2, 5, 10, 20, 50, 100]);
    // More than two decades: powers of ten only.
    expect(logScale(1, 5000, 0, 1).ticks).toEqual([1, 10, 100, 1000]);
  });

  it('centres categories in equal bands', () => {
    const b = bandScale(4, 0, 100);
    expect(b.width).toBe(25);
    expect([0, 1, 2, 3].map((i) => b.at(i))).toEqual([12.5, 37.5, 62.5, 87.5]);
  });
});

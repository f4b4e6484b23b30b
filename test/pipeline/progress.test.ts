import { describe, expect, it } from 'vitest';
import { workFraction } from '../../src/pipeline/progress.js';

describe('workFraction', () => {
  it('counts finished work in full and the running units (the first unfinished ones) at half', () => {
    // Two long runs and a short one on two workers; the first long run has finished,
    // so the second long run and the short one are running.
    expect(workFraction([60, 60, 1], [true, false, false], 2)).toBeCloseTo((60 + 30.5) / 121, 12);
    // One worker: only the next unfinished unit is running.
    expect(workFraction([10, 10, 10, 10], [true, false, false, false], 1)).toBeCloseTo(15 / 40, 12);
  });

  it('is 0 before anything runs on zero cost, 1 when all is done, and never above 1', () => {
    expect(workFraction([0, 0], [false, false], 2)).toBe(0);
    expect(workFraction([3, 4], [true, true], 2)).toBe(1);
    expect(workFraction([], [], 2)).toBe(0);
  });

  it('treats finished units anywhere in the order as done, and running slots as the earliest unfinished', () => {
    expect(workFraction([5, 5, 5, 5], [false, true, false, true], 1)).toBeCloseTo((10 + 2.5) / 20, 12);
  });
});

import { describe, expect, it } from 'vitest';
import { scatterPoints } from '../../src/report/scatter.js';
import type { PlotBox } from '../../src/report/scatter.js';

const box: PlotBox = { left: 10, top: 20, width: 200, height: 100 };

describe('scatterPoints', () => {
  it('uses the largest single scale that fits both axes, flips the second axis upward and centres the points', () => {
    // u spans 4, v spans 1. Inside the box less a 5-unit inset: width allows 190/4 = 47.5 per unit,
    // height 90/1 = 90, so the scale is 47.5 on both axes (worked out by hand).
    const e = { n: 3, data: Float64Array.from([0, 0, 4, 1, 2, 0.5]) };
    const p = scatterPoints([e], [0, 1, 2], box, 5);
    expect(p.scale).toBe(47.5);
    expect(Array.from(p.layers[0])).toEqual([15, 93.75, 205, 46.25, 110, 70]);
  });

  it('shares one scaling across layers, so the union of all layers fits the box', () => {
    const a = { n: 2, data: Float64Array.from([0, 0, 1, 1]) };
    const b = { n: 2, data: Float64Array.from([-1, -1, 3, 3]) };
    const p = scatterPoints([a, b], [0, 1], box, 0);
    // Union spans 4 on both axes; height limits: 100 / 4 = 25.
    expect(p.scale).toBe(25);
    expect(Array.from(p.layers[1])).toEqual([60, 120, 160, 20]);
    expect(Array.from(p.layers[0])).toEqual([85, 95, 110, 70]);
  });

  it('preserves ratios of distances (a similarity map) and rounds to 2 decimals', () => {
    const e = { n: 3, data: Float64Array.from([0.123456, 7.654321, 3.3333333, -2.1111111, -5.5, 1.25]) };
    const p = scatterPoints([e], [0, 1, 2], box, 3);
    const xy = p.layers[0];
    for (const v of xy) expect(Math.round(v * 100) / 100).toBe(v);
    const d = (i: number, j: number, arr: ArrayLike<number>): number =>
      Math.hypot(arr[2 * i] - arr[2 * j], arr[2 * i + 1] - arr[2 * j + 1]);
    expect(d(0, 1, xy) / d(0, 2, xy)).toBeCloseTo(d(0, 1, e.data) / d(0, 2, e.data), 3);
  });

  it('plots only the requested rows, in the requested order', () => {
    const e = { n: 3, data: Float64Array.from([0, 0, 4, 1, 2, 0.5]) };
    const full = scatterPoints([e], [0, 1, 2], box, 5);
    const some = scatterPoints([e], [2, 0], box, 5);
    // Rows 0 and 2 span only 2 × 0.5, so the scale changes: the bounds come from the drawn rows.
    expect(some.layers[0]).toHaveLength(4);
    expect(some.scale).toBe(95);
    expect(full.layers[0][4]).toBe(110);
  });

  it('gives NaN for a non-finite point and ignores it when scaling', () => {
    const e = { n: 3, data: Float64Array.from([0, 0, NaN, 1, 4, 1]) };
    const p = scatterPoints([e], [0, 1, 2], box, 5);
    expect(Number.isNaN(p.layers[0][2])).toBe(true);
    expect(p.scale).toBe(47.5);
  });

  it('places a single repeated point at the centre of the box', () => {
    const e = { n: 2, data: Float64Array.from([3, 3, 3, 3]) };
    const p = scatterPoints([e], [0, 1], box, 5);
    expect(Array.from(p.layers[0])).toEqual([110, 70, 110, 70]);
  });
});

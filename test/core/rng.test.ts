import { describe, expect, it } from 'vitest';
import { Rng, deriveSeed, sampleIndices } from '../../src/core/rng.js';

describe('Rng', () => {
  it('gives the same stream for the same seed and a different one for another seed', () => {
    const a = new Rng(42);
    const b = new Rng(42);
    const c = new Rng(43);
    const xa = Array.from({ length: 100 }, () => a.nextU32());
    const xb = Array.from({ length: 100 }, () => b.nextU32());
    const xc = Array.from({ length: 100 }, () => c.nextU32());
    expect(xa).toEqual(xb);
    expect(xa).not.toEqual(xc);
  });

  it('draws uniform doubles in [0, 1) with mean near 1/2 and variance near 1/12', () => {
    const r = new Rng(7);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    let min = 1;
    let max = 0;
    for (let i = 0; i < n; i++) {
      const x = r.next();
      s += x;
      s2 += x * x;
      if (x < min) min = x;
      if (x > max) max = x;
    }
    const mean = s / n;
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(s2 / n - mean * mean - 1 / 12)).toBeLessThan(0.002);
  });

  it('draws standard normals with mean 0 and variance 1', () => {
    const r = new Rng(3);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const x = r.normal();
      s += x;
      s2 += x * x;
    }
    expect(Math.abs(s / n)).toBeLessThan(0.01);
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.02);
  });

  it('int(n) covers 0..n−1 evenly', () => {
    const r = new Rng(11);
    const counts = new Array(6).fill(0);
    for (let i = 0; i < 60_000; i++) counts[r.int(6)]++;
    for (const c of counts) expect(Math.abs(c - 10_000)).toBeLessThan(400);
  });
});

describe('deriveSeed', () => {
  it('depends on every part and on the base seed', () => {
    const s = deriveSeed(1, 'tsne-p30', 'embed');
    expect(deriveSeed(1, 'tsne-p30', 'embed')).toBe(s);
    expect(deriveSeed(2, 'tsne-p30', 'embed')).not.toBe(s);
    expect(deriveSeed(1, 'tsne-p31', 'embed')).not.toBe(s);
    expect(deriveSeed(1, 'tsne-p30', 'init')).not.toBe(s);
    expect(deriveSeed(1, 'ab', 'c')).not.toBe(deriveSeed(1, 'a', 'bc'));
  });
});

describe('sampleIndices', () => {
  it('draws m distinct indices in ascending order, each index about equally often', () => {
    const r = new Rng(5);
    const counts = new Array(10).fill(0);
    for (let t = 0; t < 5000; t++) {
      const s = sampleIndices(10, 3, r);
      expect(s).toHaveLength(3);
      expect(s[0] < s[1] && s[1] < s[2]).toBe(true);
      for (const i of s) counts[i]++;
    }
    for (const c of counts) expect(Math.abs(c - 1500)).toBeLessThan(150);
  });

  it('refuses to draw more than n', () => {
    expect(() => sampleIndices(3, 4, new Rng(1))).toThrow(RangeError);
  });
});

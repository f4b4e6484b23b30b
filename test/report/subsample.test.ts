import { describe, expect, it } from 'vitest';
import { MAX_POINTS_PER_SEED, subsampleRows } from '../../src/report/subsample.js';

function labelsOf(n: number, sizes: number[]): string[] {
  // Interleaved so that label order and row order differ.
  const out: string[] = [];
  const left = [...sizes];
  while (out.length < n) {
    for (let g = 0; g < left.length && out.length < n; g++) {
      if (left[g] > 0) {
        out.push(`g${g}`);
        left[g]--;
      }
    }
  }
  return out;
}

describe('subsampleRows', () => {
  it('keeps every row, in order, when there are at most 3,000', () => {
    expect(MAX_POINTS_PER_SEED).toBe(3000);
    const rows = subsampleRows(3000, null);
    expect(rows).toHaveLength(3000);
    expect(Array.from(rows.subarray(0, 3))).toEqual([0, 1, 2]);
    expect(rows[2999]).toBe(2999);
  });

  it('keeps exactly 3,000 distinct rows in ascending order above 3,000', () => {
    const rows = subsampleRows(5000, null, 3000, 7);
    expect(rows).toHaveLength(3000);
    let ascending = true;
    for (let i = 1; i < rows.length; i++) if (!(rows[i] > rows[i - 1])) ascending = false;
    expect(ascending).toBe(true);
    expect(rows[0]).toBeGreaterThanOrEqual(0);
    expect(rows[rows.length - 1]).toBeLessThan(5000);
  });

  it('keeps each label at its share of the rows (within one) and at least one row of a rare label', () => {
    const sizes = [6000, 2500, 1495, 5];
    const n = sizes.reduce((a, b) => a + b, 0);
    const labels = labelsOf(n, sizes);
    const rows = subsampleRows(n, labels, 3000, 11);
    expect(rows).toHaveLength(3000);
    const kept = new Map<string, number>();
    for (const r of rows) kept.set(labels[r], (kept.get(labels[r]) ?? 0) + 1);
    for (let g = 0; g < sizes.length; g++) {
      const share = (3000 * sizes[g]) / n;
      expect(Math.abs(kept.get(`g${g}`)! - share)).toBeLessThanOrEqual(1.01);
    }
    const rare = subsampleRows(n + 1, [...labels, 'lonely'], 3000, 11);
    expect(Array.from(rare)).toContain(n);
  });

  it('is deterministic for a seed and draws other rows for another seed', () => {
    const labels = labelsOf(4000, [2000, 2000]);
    const a = subsampleRows(4000, labels, 3000, 5);
    const b = subsampleRows(4000, labels, 3000, 5);
    const c = subsampleRows(4000, labels, 3000, 6);
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(Array.from(a)).not.toEqual(Array.from(c));
  });

  it('keeps one row of each of the first labels when there are more labels than places', () => {
    const labels = Array.from({ length: 10 }, (_, i) => `l${i}`);
    expect(Array.from(subsampleRows(10, labels, 4, 1))).toEqual([0, 1, 2, 3]);
  });
});

/**
 * Row resampling as a perturbation (in the spirit of Hennig 2007's
 * subsetting): seed s embeds a seeded random subset of ⌊fraction·n⌋ rows,
 * the same subset for every setting, so settings are compared on equal
 * footing and two seeds share about fraction² of the rows.
 */
import { Rng, deriveSeed, sampleIndices } from '../core/rng.js';

/** The rows (0-based, ascending) seed `seed` embeds, or null for fraction 1. */
export function resampleRows(n: number, fraction: number, seed: number): Int32Array | null {
  if (!(fraction > 0 && fraction <= 1)) throw new RangeError(`resample fraction must be in (0, 1], got ${fraction}`);
  if (fraction === 1) return null;
  const m = Math.max(3, Math.floor(fraction * n));
  if (m >= n) return null;
  return sampleIndices(n, m, new Rng(deriveSeed(seed, 'resample')));
}

/** Rows present in both ascending lists, with their positions in each. */
export function sharedRows(a: Int32Array | null, b: Int32Array | null, n: number): { rows: Int32Array; inA: Int32Array; inB: Int32Array } {
  const ra = a ?? Int32Array.from({ length: n }, (_, i) => i);
  const rb = b ?? Int32Array.from({ length: n }, (_, i) => i);
  const rows: number[] = [];
  const inA: number[] = [];
  const inB: number[] = [];
  let i = 0;
  let j = 0;
  while (i < ra.length && j < rb.length) {
    if (ra[i] === rb[j]) {
      rows.push(ra[i]);
      inA.push(i);
      inB.push(j);
      i++;
      j++;
    } else if (ra[i] < rb[j]) i++;
    else j++;
  }
  return { rows: Int32Array.from(rows), inA: Int32Array.from(inA), inB: Int32Array.from(inB) };
}

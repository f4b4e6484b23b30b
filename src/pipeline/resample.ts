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

/** Summaries of a metric over the seeds of one setting. */
import type { MeanSd } from '../core/results.js';

/**
 * Mean and sample standard deviation (ddof = 1) of the values that are not
 * null. Nulls stand for runs without the metric (e.g. failed runs) and are
 * skipped; NaN or an infinity is not a missing value but a fault upstream, so
 * it raises instead of being skipped.
 *
 * @param values metric values, one per run; null = not available.
 * @returns mean of the non-null values (null when there are none) and their
 *   standard deviation with n − 1 in the denominator (null for fewer than two).
 * @throws RangeError on a non-finite number.
 */
export function meanSd(values: ReadonlyArray<number | null>): MeanSd {
  let count = 0;
  let sum = 0;
  for (let t = 0; t < values.length; t++) {
    const v = values[t];
    if (v === null) continue;
    if (!Number.isFinite(v)) {
      throw new RangeError(`value ${t} is ${v}; pass null for a missing value`);
    }
    count++;
    sum += v;
  }
  if (count === 0) return { mean: null, sd: null };
  const mean = sum / count;
  if (count < 2) return { mean, sd: null };
  let ss = 0;
  for (const v of values) {
    if (v === null) continue;
    const diff = v - mean;
    ss += diff * diff;
  }
  return { mean, sd: Math.sqrt(ss / (count - 1)) };
}

/**
 * Linear-time ordering of many doubles, for the rank-based scores.
 *
 * The key of a value is the high 32 bits of its IEEE-754 pattern (sign,
 * exponent and 20 mantissa bits), mapped to an unsigned number that orders
 * like the value; it is monotone over the whole double range, so nothing
 * overflows or underflows. The keys are radix-sorted in three stable passes
 * of 11, 11 and 10 bits; then runs of equal keys — values within about one
 * part in a million of each other — are put in exact (value, index) order by
 * insertion. The result is the exact (value, index) order; equal values keep
 * ascending index order.
 */

/** Position of the high 32-bit word of a double in a Uint32Array view (1 on little-endian hosts). */
export const HIGH_WORD = new Uint32Array(Float64Array.of(1).buffer)[1] === 0x3ff00000 ? 1 : 0;

/**
 * Sort `idx[0..m)` by `keys` (stable), then by (values, index) inside runs
 * of equal keys. `tmp` is scratch of at least m entries, `hist` of 3·2048.
 * Returns whichever of `idx` / `tmp` holds the result.
 */
export function radixOrder(
  keys: Uint32Array,
  values: Float64Array,
  idx: Int32Array,
  tmp: Int32Array,
  m: number,
  hist: Int32Array,
): Int32Array {
  hist.fill(0);
  for (let t = 0; t < m; t++) {
    const u = keys[idx[t]];
    hist[u & 2047]++;
    hist[2048 + ((u >>> 11) & 2047)]++;
    hist[4096 + (u >>> 22)]++;
  }
  let src = idx;
  let dst = tmp;
  for (let pass = 0; pass < 3; pass++) {
    const h0 = pass * 2048;
    const shift = pass * 11;
    let sum = 0;
    let single = false;
    for (let v = 0; v < 2048; v++) {
      const c = hist[h0 + v];
      if (c === m) single = true;
      hist[h0 + v] = sum;
      sum += c;
    }
    // A digit shared by every key leaves the order unchanged.
    if (single) continue;
    for (let t = 0; t < m; t++) {
      const j = src[t];
      dst[hist[h0 + ((keys[j] >>> shift) & 2047)]++] = j;
    }
    const swap = src;
    src = dst;
    dst = swap;
  }
  for (let p = 1; p < m; p++) {
    const cur = src[p];
    const key = keys[cur];
    if (keys[src[p - 1]] !== key) continue;
    const v = values[cur];
    let q = p;
    while (q > 0) {
      const prev = src[q - 1];
      if (keys[prev] !== key) break;
      const pv = values[prev];
      if (pv < v || (pv === v && prev < cur)) break;
      src[q] = prev;
      q--;
    }
    src[q] = cur;
  }
  return src;
}

/**
 * Positions 0..n−1 of `values` in ascending (value, index) order.
 *
 * @param values finite numbers (RangeError otherwise).
 * @returns a new Int32Array of length n.
 */
export function orderByValue(values: Float64Array): Int32Array {
  const n = values.length;
  const copy = Float64Array.from(values);
  const words = new Uint32Array(copy.buffer);
  const keys = new Uint32Array(n);
  for (let t = 0; t < n; t++) {
    const v = values[t];
    if (!Number.isFinite(v)) throw new RangeError(`value ${t} is ${v}; only finite numbers can be ranked`);
    const u = words[2 * t + HIGH_WORD];
    // Negative doubles order reversed: flip all bits; non-negative: set the top bit.
    keys[t] = u & 0x80000000 ? ~u >>> 0 : (u | 0x80000000) >>> 0;
  }
  const idx = Int32Array.from({ length: n }, (_, t) => t);
  const tmp = new Int32Array(n);
  return radixOrder(keys, values, idx, tmp, n, new Int32Array(3 * 2048));
}

import { InternalError } from '../core/errors.js';
import type { Matrix } from '../core/types.js';

/**
 * Column means of an n × d matrix (length d), by a plain left-to-right sum
 * over the rows divided by n. An empty matrix (n = 0) gives NaN means.
 */
export function columnMeans(m: Matrix): Float64Array {
  const { n, d, data } = m;
  const mean = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let j = 0; j < d; j++) mean[j] += data[o + j];
  }
  for (let j = 0; j < d; j++) mean[j] /= n;
  return mean;
}

/**
 * Subtract each column's mean. Returns a new n × d matrix (the input is not
 * touched; written into `out`, of length n·d, when given) and the d column
 * means that were subtracted.
 */
export function centerColumns(m: Matrix, out: Float64Array = new Float64Array(m.n * m.d)): { centered: Matrix; mean: Float64Array } {
  const { n, d, data } = m;
  if (out.length !== n * d) throw new RangeError(`output has length ${out.length}, expected ${n * d}`);
  const mean = columnMeans(m);
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let j = 0; j < d; j++) out[o + j] = data[o + j] - mean[j];
  }
  return { centered: { n, d, data: out }, mean };
}

/**
 * Standardise every column to mean 0 and standard deviation 1, the standard
 * deviation taken with n − 1 in the denominator (ddof = 1). Returns a new
 * n × d matrix.
 *
 * Throws `InternalError` when a column is constant (or when n < 2, where
 * every column is): the data loader drops zero-variance columns before this
 * stage, so reaching one here is a bug.
 */
export function zScore(m: Matrix): Matrix {
  const { n, d, data } = m;
  if (n < 2) throw new InternalError(`zScore needs at least 2 rows, got ${n}`);
  for (let j = 0; j < d; j++) {
    const first = data[j];
    let constant = true;
    for (let i = 1; i < n && constant; i++) constant = data[i * d + j] === first;
    if (constant) throw new InternalError(`zScore: column ${j} is constant; it should have been dropped on load`);
  }
  const { centered } = centerColumns(m);
  const c = centered.data;
  const ss = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let j = 0; j < d; j++) ss[j] += c[o + j] * c[o + j];
  }
  const sd = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    sd[j] = Math.sqrt(ss[j] / (n - 1));
    if (!(sd[j] > 0) || !Number.isFinite(sd[j])) {
      throw new InternalError(`zScore: column ${j} has standard deviation ${sd[j]}`);
    }
  }
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let j = 0; j < d; j++) c[o + j] /= sd[j];
  }
  return centered;
}

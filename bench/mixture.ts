/**
 * The benchmark input: a 10-centre Gaussian mixture (centres ~ N(0, 5²I),
 * unit isotropic noise, labels i mod 10) in d columns, from a seeded Rng.
 * Written as raw little-endian float64 so the scikit-learn script reads the
 * identical numbers.
 */
import { writeFileSync } from 'node:fs';
import { Rng } from '../src/core/rng.js';
import type { Matrix } from '../src/core/types.js';

export function mixture(n: number, d: number, seed = 1): { X: Matrix; labels: Int32Array } {
  const rng = new Rng(seed);
  const centres = new Float64Array(10 * d);
  for (let i = 0; i < centres.length; i++) centres[i] = 5 * rng.normal();
  const data = new Float64Array(n * d);
  const labels = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const c = i % 10;
    labels[i] = c;
    for (let j = 0; j < d; j++) data[i * d + j] = centres[c * d + j] + rng.normal();
  }
  return { X: { n, d, data }, labels };
}

export function writeRaw(path: string, X: Matrix): void {
  writeFileSync(path, new Uint8Array(X.data.buffer, X.data.byteOffset, X.data.byteLength));
}

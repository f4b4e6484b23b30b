/** Shared inputs for the UMAP and starting-layout tests. */
import { readFileSync } from 'node:fs';
import type { FuzzyGraph } from '../../../src/embed/umap/index.js';

export const fixturePath = (name: string): string => new URL(`../../fixtures/${name}`, import.meta.url).pathname;

export function readJson<T>(name: string): T {
  return JSON.parse(readFileSync(fixturePath(name), 'utf8')) as T;
}

/** n points from `clusters` isotropic unit Gaussians in d dimensions (the t-SNE tests' generator). */
export { gaussianMixture as mixture } from '../tsne/helpers.js';

/** Dense n × n copy of a CSR graph (tests only). */
export function denseOf(g: FuzzyGraph): Float64Array {
  const out = new Float64Array(g.n * g.n);
  for (let i = 0; i < g.n; i++) for (let e = g.indptr[i]; e < g.indptr[i + 1]; e++) out[i * g.n + g.indices[e]] = g.weights[e];
  return out;
}

/** Fraction of points whose nearest centroid (of the groups given by `labels`, in the 2-D layout) is their own group's. */
export function nearestCentroidAgreement(y: Float64Array, labels: Int32Array, groups: number): number {
  const n = labels.length;
  const cx = new Float64Array(groups);
  const cy = new Float64Array(groups);
  const cnt = new Float64Array(groups);
  for (let i = 0; i < n; i++) {
    cx[labels[i]] += y[2 * i];
    cy[labels[i]] += y[2 * i + 1];
    cnt[labels[i]]++;
  }
  for (let c = 0; c < groups; c++) {
    cx[c] /= cnt[c];
    cy[c] /= cnt[c];
  }
  let ok = 0;
  for (let i = 0; i < n; i++) {
    let best = -1;
    let bestD = Number.POSITIVE_INFINITY;
    for (let c = 0; c < groups; c++) {
      const dd = (y[2 * i] - cx[c]) ** 2 + (y[2 * i + 1] - cy[c]) ** 2;
      if (dd < bestD) {
        bestD = dd;
        best = c;
      }
    }
    if (best === labels[i]) ok++;
  }
  return ok / n;
}

export function sameBytes(a: Float64Array, b: Float64Array): boolean {
  return Buffer.compare(Buffer.from(a.buffer, a.byteOffset, a.byteLength), Buffer.from(b.buffer, b.byteOffset, b.byteLength)) === 0;
}

export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

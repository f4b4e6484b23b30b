/**
 * The dataset and its neighbour graph placed once in shared memory, so
 * worker threads read them without a copy per task.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import type { RunContext } from '../pipeline/run-one.js';
import type { ScoringIndex } from '../metrics/scoring.js';

export interface SharedContext {
  n: number;
  d: number;
  k: number;
  knnK: number;
  resample: number;
  x: SharedArrayBuffer;
  knnIndices: SharedArrayBuffer;
  knnDistances: SharedArrayBuffer;
  /** Scoring space; null when it is the same matrix as x. */
  reference: { d: number; data: SharedArrayBuffer } | null;
  knnReference: { k: number; indices: SharedArrayBuffer; distances: SharedArrayBuffer };
  /** Plain typed arrays; structured-cloned once per worker. */
  scoring: ScoringIndex;
}

function share<T extends Float64Array | Int32Array>(a: T): SharedArrayBuffer {
  const sab = new SharedArrayBuffer(a.byteLength);
  new Uint8Array(sab).set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  return sab;
}

export function toShared(ctx: RunContext): SharedContext {
  return {
    n: ctx.X.n,
    d: ctx.X.d,
    k: ctx.k,
    knnK: ctx.knn.k,
    resample: ctx.resample,
    x: share(ctx.X.data),
    knnIndices: share(ctx.knn.indices),
    knnDistances: share(ctx.knn.distances),
    reference: ctx.reference === ctx.X ? null : { d: ctx.reference.d, data: share(ctx.reference.data) },
    knnReference: { k: ctx.knnReference.k, indices: share(ctx.knnReference.indices), distances: share(ctx.knnReference.distances) },
    scoring: ctx.scoring,
  };
}

export function fromShared(s: SharedContext): RunContext {
  const X: Matrix = { n: s.n, d: s.d, data: new Float64Array(s.x) };
  const knn: KnnGraph = { n: s.n, k: s.knnK, indices: new Int32Array(s.knnIndices), distances: new Float64Array(s.knnDistances) };
  const reference: Matrix = s.reference === null ? X : { n: s.n, d: s.reference.d, data: new Float64Array(s.reference.data) };
  const r = s.knnReference;
  const knnReference: KnnGraph = { n: s.n, k: r.k, indices: new Int32Array(r.indices), distances: new Float64Array(r.distances) };
  return { X, knn, k: s.k, reference, knnReference, resample: s.resample, scoring: s.scoring, fuzzyGraphs: new Map() };
}

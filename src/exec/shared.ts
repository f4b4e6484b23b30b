/**
 * The dataset and its neighbour graph placed once in shared memory, so
 * worker threads read them without a copy per task.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import type { RunContext } from '../pipeline/run-one.js';

export interface SharedContext {
  n: number;
  d: number;
  k: number;
  knnK: number;
  x: SharedArrayBuffer;
  knnIndices: SharedArrayBuffer;
  knnDistances: SharedArrayBuffer;
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
    x: share(ctx.X.data),
    knnIndices: share(ctx.knn.indices),
    knnDistances: share(ctx.knn.distances),
  };
}

export function fromShared(s: SharedContext): RunContext {
  const X: Matrix = { n: s.n, d: s.d, data: new Float64Array(s.x) };
  const knn: KnnGraph = { n: s.n, k: s.knnK, indices: new Int32Array(s.knnIndices), distances: new Float64Array(s.knnDistances) };
  return { X, knn, k: s.k };
}

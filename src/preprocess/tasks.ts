/**
 * The pieces of work a worker thread can run (see parallel.ts). Each task
 * reads and writes typed arrays only, so it runs the same on any thread.
 */
import { mergeRows, scanBlocks } from '../neighbors/exact-tiles.js';
import { multiplyABtBlock } from './dense.js';

/** out[i·ldc + j] = Σ_t a[i·len + t]·b[j·len + t] for i0 ≤ i < i1, j0 ≤ j < j1. */
export interface GemmTask {
  kind: 'gemm';
  a: Float64Array;
  i0: number;
  i1: number;
  b: Float64Array;
  j0: number;
  j1: number;
  len: number;
  out: Float64Array;
  ldc: number;
}

/** Exact-kNN scan of query blocks aFrom..aTo−1 into one set of partial heaps. */
export interface KnnScanTask {
  kind: 'knn-scan';
  data: Float64Array;
  n: number;
  d: number;
  k: number;
  aFrom: number;
  aTo: number;
  idx: Int32Array;
  dist: Float64Array;
  count: Int32Array;
  worst: Float64Array;
}

/** Merge partial heaps into the final sorted lists of rows r0..r1−1. */
export interface KnnMergeTask {
  kind: 'knn-merge';
  r0: number;
  r1: number;
  k: number;
  idxs: Int32Array[];
  dists: Float64Array[];
  counts: Int32Array[];
  outIdx: Int32Array;
  outDist: Float64Array;
}

export type ThreadTask = GemmTask | KnnScanTask | KnnMergeTask;

export function runTask(t: ThreadTask): void {
  switch (t.kind) {
    case 'gemm':
      multiplyABtBlock(t.a, t.i0, t.i1, t.b, t.j0, t.j1, t.len, t.out, t.ldc);
      return;
    case 'knn-scan':
      scanBlocks(t.data, t.n, t.d, t.k, t.aFrom, t.aTo, t.idx, t.dist, t.count, t.worst);
      return;
    case 'knn-merge':
      mergeRows(t.r0, t.r1, t.k, t.idxs, t.dists, t.counts, t.outIdx, t.outDist);
      return;
  }
}

/**
 * Tasks computing C = A·Bᵀ (rA × rB, row-major, into `out`) split into
 * `parts` pieces of whole rows or whole columns of C — along its longer side,
 * in multiples of 4 so the register tiles stay aligned — one task per piece.
 */
export function gemmTasks(
  a: Float64Array,
  rA: number,
  b: Float64Array,
  rB: number,
  len: number,
  out: Float64Array,
  parts: number,
): GemmTask[] {
  const byRows = rA >= rB;
  const size = byRows ? rA : rB;
  const tasks: GemmTask[] = [];
  let start = 0;
  for (let p = 0; p < parts; p++) {
    const end = p === parts - 1 ? size : Math.min(size, start + 4 * Math.ceil((size - start) / (4 * (parts - p))));
    if (end > start || p === 0) {
      tasks.push(
        byRows
          ? { kind: 'gemm', a, i0: start, i1: end, b, j0: 0, j1: rB, len, out, ldc: rB }
          : { kind: 'gemm', a, i0: 0, i1: rA, b, j0: start, j1: end, len, out, ldc: rB },
      );
    }
    start = end;
  }
  return tasks;
}

/**
 * Embeddings brought into the data set's row order and Procrustes-aligned
 * onto a reference seed, for the maps. A run that embedded only some rows
 * (a row resample) leaves the others as NaN.
 */
import { InternalError } from '../core/errors.js';
import type { Embedding } from '../core/types.js';
import { alignTo, procrustes } from '../metrics/procrustes.js';

/**
 * The embedding as n data rows: point i of a full embedding is row i; a run
 * that embedded a subset (`e.rows`) puts point t at row `rows[t]` and leaves
 * the other rows NaN.
 *
 * @param e the run's embedding
 * @param n rows in the data set
 * @param runId used in the error message
 * @throws InternalError when the shape does not match the data set
 */
export function asRowLayout(e: Embedding, n: number, runId: string): Embedding {
  const rows = e.rows;
  if (!rows) {
    if (e.n !== n) throw new InternalError(`embedding of run ${runId} has ${e.n} points, the data set has ${n}`);
    return e;
  }
  if (rows.length !== e.n) throw new InternalError(`embedding of run ${runId} lists ${rows.length} rows for ${e.n} points`);
  const data = new Float64Array(2 * n).fill(NaN);
  for (let t = 0; t < e.n; t++) {
    const r = rows[t];
    if (!(r >= 0 && r < n)) throw new InternalError(`embedding of run ${runId} names row ${r}, outside 0..${n - 1}`);
    data[2 * r] = e.data[2 * t];
    data[2 * r + 1] = e.data[2 * t + 1];
  }
  return { n, data };
}

export interface Aligned {
  /** `moving` (all n rows, NaN kept) in the reference's coordinates. */
  layout: Embedding;
  /** scipy-style standardised Procrustes disparity over the rows present in both. */
  disparity: number;
  /** Rows present in both maps. */
  shared: number;
}

/**
 * Align `moving` onto `reference` (both in row layout, NaN = absent) by the
 * Procrustes fit over the rows present in both: translation, rotation or
 * reflection, and uniform scaling (Gower 1975; the conventions of
 * scipy.spatial.procrustes, scipy 1.10.1). With every row present this is
 * exactly `alignTo(reference, moving)`; otherwise the fit from the shared
 * rows is applied to every row of `moving`.
 *
 * @throws RangeError when fewer than 2 rows are shared or a map's shared
 *   points all coincide (the map cannot be aligned)
 */
export function alignLayout(reference: Embedding, moving: Embedding): Aligned {
  const n = reference.n;
  const shared: number[] = [];
  for (let i = 0; i < n; i++) {
    if (
      Number.isFinite(reference.data[2 * i]) &&
      Number.isFinite(reference.data[2 * i + 1]) &&
      Number.isFinite(moving.data[2 * i]) &&
      Number.isFinite(moving.data[2 * i + 1])
    ) {
      shared.push(i);
    }
  }
  if (shared.length === n) {
    const A = { n, d: 2, data: reference.data };
    const B = { n, d: 2, data: moving.data };
    const moved = alignTo(A, B);
    return { layout: { n, data: moved.data }, disparity: procrustes(A, B).disparity, shared: n };
  }
  const m = shared.length;
  const a = new Float64Array(2 * m);
  const b = new Float64Array(2 * m);
  for (let t = 0; t < m; t++) {
    const i = shared[t];
    a[2 * t] = reference.data[2 * i];
    a[2 * t + 1] = reference.data[2 * i + 1];
    b[2 * t] = moving.data[2 * i];
    b[2 * t + 1] = moving.data[2 * i + 1];
  }
  const fit = procrustes({ n: m, d: 2, data: a }, { n: m, d: 2, data: b });
  const sa = centreAndNorm(a);
  const sb = centreAndNorm(b);
  const R = fit.rotation;
  const out = new Float64Array(2 * n).fill(NaN);
  for (let i = 0; i < n; i++) {
    const u = moving.data[2 * i];
    const v = moving.data[2 * i + 1];
    if (!Number.isFinite(u) || !Number.isFinite(v)) continue;
    const x = (u - sb.mx) / sb.norm;
    const y = (v - sb.my) / sb.norm;
    out[2 * i] = (x * R[0] + y * R[2]) * fit.scale * sa.norm + sa.mx;
    out[2 * i + 1] = (x * R[1] + y * R[3]) * fit.scale * sa.norm + sa.my;
  }
  return { layout: { n, data: out }, disparity: fit.disparity, shared: m };
}

function centreAndNorm(xy: Float64Array): { mx: number; my: number; norm: number } {
  const m = xy.length / 2;
  let mx = 0;
  let my = 0;
  for (let t = 0; t < m; t++) {
    mx += xy[2 * t];
    my += xy[2 * t + 1];
  }
  mx /= m;
  my /= m;
  let ss = 0;
  for (let t = 0; t < m; t++) ss += (xy[2 * t] - mx) ** 2 + (xy[2 * t + 1] - my) ** 2;
  return { mx, my, norm: Math.sqrt(ss) };
}

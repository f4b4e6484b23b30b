import type { Embedding, Matrix } from './types.js';

/** Build a Matrix from nested rows (tests and small inputs only). */
export function matrixFromRows(rows: ArrayLike<ArrayLike<number>>): Matrix {
  const n = rows.length;
  const d = n > 0 ? rows[0].length : 0;
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    if (r.length !== d) throw new RangeError(`row ${i} has ${r.length} values, expected ${d}`);
    for (let j = 0; j < d; j++) data[i * d + j] = r[j];
  }
  return { n, d, data };
}

/** Nested rows from a Matrix (for libraries that want number[][]). */
export function matrixToRows(m: Matrix): number[][] {
  const out: number[][] = new Array(m.n);
  for (let i = 0; i < m.n; i++) out[i] = Array.from(m.data.subarray(i * m.d, (i + 1) * m.d));
  return out;
}

/** An Embedding from nested 2-D rows. */
export function embeddingFromRows(rows: ArrayLike<ArrayLike<number>>): Embedding {
  const m = matrixFromRows(rows);
  if (m.d !== 2 && m.n > 0) throw new RangeError(`embedding rows have ${m.d} columns, expected 2`);
  return { n: m.n, data: m.data };
}

/** View an Embedding as an n × 2 Matrix (shares the buffer). */
export function embeddingAsMatrix(e: Embedding): Matrix {
  return { n: e.n, d: 2, data: e.data };
}

/** Keep the given rows of a matrix, in the given order. */
export function selectRows(m: Matrix, rows: ArrayLike<number>): Matrix {
  const out = new Float64Array(rows.length * m.d);
  for (let r = 0; r < rows.length; r++) {
    out.set(m.data.subarray(rows[r] * m.d, (rows[r] + 1) * m.d), r * m.d);
  }
  return { n: rows.length, d: m.d, data: out };
}

/** Squared Euclidean distance between row i of a and row j of b, summed term by term. */
export function sqDist(a: Matrix, i: number, b: Matrix, j: number): number {
  const d = a.d;
  const ad = a.data;
  const bd = b.data;
  let s = 0;
  const oi = i * d;
  const oj = j * d;
  for (let t = 0; t < d; t++) {
    const diff = ad[oi + t] - bd[oj + t];
    s += diff * diff;
  }
  return s;
}

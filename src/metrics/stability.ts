/**
 * Seed stability: how much the maps of one setting differ when only the
 * random seed changes. Every unordered pair of seeds is compared by
 * Procrustes disparity, k-NN overlap and the agreement of k-means clusterings.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { Rng } from '../core/rng.js';
import { selectRows } from '../core/matrix.js';
import { adjustedRandIndex, kmeansLabels } from './clustering.js';
import { exactKnn } from '../neighbors/exact.js';
import { knnOverlap } from './neighbourhood.js';
import { procrustes } from './procrustes.js';

/** Options of `seedStability`. */
export interface SeedStabilityOptions {
  /** Neighbourhood size for the k-NN overlap, 1 ≤ k ≤ n − 1. */
  readonly k: number;
  /** Number of k-means clusters per embedding, 1 ≤ clusters ≤ n. */
  readonly clusters: number;
  /** Source of the k-means seeds (one child stream per embedding, drawn in order). */
  readonly rng: Rng;
  /** k-means++ starts per embedding. Default 10. */
  readonly restarts?: number;
  /**
   * Dataset rows each map covers (ascending; map row t = dataset row
   * rows[s][t]); null / absent = all rows. With row lists, maps may differ in
   * size and every pair is compared on the rows both cover.
   */
  readonly rows?: ReadonlyArray<Int32Array | null>;
}

/** Comparison of one pair of seeds. */
export interface SeedPair {
  /** Index of the first embedding (a < b). */
  readonly a: number;
  readonly b: number;
  /** Standardised Procrustes disparity (scipy convention), in [0, 1]. */
  readonly procrustes: number;
  /** Mean fraction of shared k nearest neighbours, in [0, 1]. */
  readonly knnOverlap: number;
  /** Adjusted Rand index of the two k-means partitions. */
  readonly ari: number;
  /** Number of rows the pair was compared on. */
  readonly sharedRows: number;
}

/** Result of `seedStability`. Pairwise summaries are null with fewer than two embeddings. */
export interface SeedStability {
  readonly procrustesMean: number | null;
  readonly procrustesMax: number | null;
  /** Mean over pairs of the k-NN overlap fraction. */
  readonly seedKnnOverlap: number | null;
  readonly ariMean: number | null;
  /** Number of unordered pairs, S(S − 1)/2. */
  readonly pairs: number;
  /**
   * True when there are at least two embeddings and all are bytewise equal to
   * the first: the seed changed nothing, so the pairwise numbers say nothing.
   */
  readonly identicalMaps: boolean;
  readonly perPairs: SeedPair[];
  /** k-means labels of each embedding (canonical numbering by first appearance). */
  readonly labels: Int32Array[];
}

/**
 * Compare S embeddings of the same n points (one per seed) over all
 * S(S − 1)/2 unordered pairs: Procrustes disparity (Gower 1975, as
 * scipy.spatial.procrustes), fraction of shared k nearest neighbours, and the
 * adjusted Rand index (Hubert & Arabie 1985) of k-means partitions. Each
 * embedding's kNN graph and k-means labels are computed once.
 *
 * @param embeddings S ≥ 1 matrices of identical shape n × d (normally d = 2).
 * @throws RangeError for an empty list, mismatched shapes, k / clusters out of
 *   range, or a map whose points all coincide (Procrustes is undefined then).
 */
export function seedStability(embeddings: readonly Matrix[], opts: SeedStabilityOptions): SeedStability {
  const S = embeddings.length;
  if (S === 0) throw new RangeError('at least one embedding is needed');
  const { n, d } = embeddings[0];
  const rowLists = opts.rows ?? null;
  for (let s = 1; s < S; s++) {
    const e = embeddings[s];
    if ((e.n !== n && rowLists === null) || e.d !== d) {
      throw new RangeError(`embedding ${s} is ${e.n} × ${e.d} but embedding 0 is ${n} × ${d}`);
    }
  }
  const { k, clusters, rng } = opts;
  if (!Number.isInteger(k) || k < 1 || k > n - 1) {
    throw new RangeError(`k must be an integer from 1 to n − 1 = ${n - 1}; received ${k}`);
  }
  if (!Number.isInteger(clusters) || clusters < 1 || clusters > n) {
    throw new RangeError(`clusters must be an integer from 1 to n = ${n}; received ${clusters}`);
  }

  const labels: Int32Array[] = [];
  for (let s = 0; s < S; s++) {
    const child = new Rng(rng.nextU32());
    labels.push(kmeansLabels(embeddings[s], clusters, child, { restarts: opts.restarts ?? 10 }));
  }

  let identicalMaps = S >= 2;
  for (let s = 1; s < S && identicalMaps; s++) {
    identicalMaps = sameBytes(embeddings[0].data, embeddings[s].data) && sameRows(rowLists?.[0] ?? null, rowLists?.[s] ?? null);
  }

  if (S < 2) {
    return {
      procrustesMean: null,
      procrustesMax: null,
      seedKnnOverlap: null,
      ariMean: null,
      pairs: 0,
      identicalMaps,
      perPairs: [],
      labels,
    };
  }

  const rowsOf = (s: number): Int32Array | null => rowLists?.[s] ?? null;
  const graphs: Array<KnnGraph | null> = embeddings.map((e, s) => (rowsOf(s) === null ? exactKnn(e, k) : null));
  const perPairs: SeedPair[] = [];
  let sumP = 0;
  let maxP = -Infinity;
  let sumK = 0;
  let sumA = 0;
  for (let a = 0; a < S; a++) {
    for (let b = a + 1; b < S; b++) {
      let A = embeddings[a];
      let B = embeddings[b];
      let la = labels[a];
      let lb = labels[b];
      let ga = graphs[a];
      let gb = graphs[b];
      if (rowsOf(a) !== null || rowsOf(b) !== null) {
        const shared = sharedPositions(rowsOf(a), A.n, rowsOf(b), B.n);
        A = selectRows(A, shared.inA);
        B = selectRows(B, shared.inB);
        la = pick(la, shared.inA);
        lb = pick(lb, shared.inB);
        const kk = Math.min(k, A.n - 1);
        ga = exactKnn(A, kk);
        gb = exactKnn(B, kk);
      }
      const p = procrustes(A, B).disparity;
      const o = knnOverlap(ga!, gb!, ga!.k).fraction;
      const r = adjustedRandIndex(la, lb);
      perPairs.push({ a, b, procrustes: p, knnOverlap: o, ari: r, sharedRows: A.n });
      sumP += p;
      if (p > maxP) maxP = p;
      sumK += o;
      sumA += r;
    }
  }
  const m = perPairs.length;
  return {
    procrustesMean: sumP / m,
    procrustesMax: maxP,
    seedKnnOverlap: sumK / m,
    ariMean: sumA / m,
    pairs: m,
    identicalMaps,
    perPairs,
    labels,
  };
}

function sameRows(a: Int32Array | null, b: Int32Array | null): boolean {
  if (a === null || b === null) return a === b;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function pick(a: Int32Array, idx: Int32Array): Int32Array {
  const out = new Int32Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = a[idx[i]];
  return out;
}

/** Positions, in each map, of the dataset rows both maps cover (a null row list = rows 0..m−1). */
function sharedPositions(ra: Int32Array | null, na: number, rb: Int32Array | null, nb: number): { inA: Int32Array; inB: Int32Array } {
  const rowA = (i: number): number => (ra ? ra[i] : i);
  const rowB = (j: number): number => (rb ? rb[j] : j);
  const inA: number[] = [];
  const inB: number[] = [];
  let i = 0;
  let j = 0;
  while (i < na && j < nb) {
    const x = rowA(i);
    const y = rowB(j);
    if (x === y) {
      inA.push(i++);
      inB.push(j++);
    } else if (x < y) i++;
    else j++;
  }
  return { inA: Int32Array.from(inA), inB: Int32Array.from(inB) };
}

function sameBytes(x: Float64Array, y: Float64Array): boolean {
  if (x.length !== y.length) return false;
  const bx = new Uint8Array(x.buffer, x.byteOffset, x.byteLength);
  const by = new Uint8Array(y.buffer, y.byteOffset, y.byteLength);
  for (let t = 0; t < bx.length; t++) if (bx[t] !== by[t]) return false;
  return true;
}

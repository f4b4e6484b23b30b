/**
 * Exact Kullback-Leibler divergence of a fixed embedding (van der Maaten &
 * Hinton 2008, eq. 4 with the Student-t Q of §3.3).
 */
import type { Embedding } from '../../core/types.js';
import type { SparseAffinities } from './affinities.js';
import { sharedF64, sharedI32 } from './arrays.js';
import { JOB_KL, R_N, R_ROWS_PER_ITEM, rowItems } from './jobs.js';
import { sumInOrder } from './kernels.js';
import { Team } from './team.js';

/**
 * KL(P‖Q) = Σ_{i≠j} p_ij log(p_ij / q_ij) in nats, with
 * q_ij = w_ij / Σ_{k≠l} w_kl and w_ij = 1 / (1 + ‖y_i − y_j‖²) over all
 * pairs. Entries of P that are 0 contribute 0. O(n²) time, O(n) extra
 * memory (one to two seconds at n = 20 000 on one thread). Sums are formed per row
 * and then added in row order.
 *
 * @param P joint affinities (CSR, n points); the sum over P is used as is.
 * @param Y 2-D embedding of the same n points.
 */
export function klDivergence(P: SparseAffinities, Y: Embedding): number {
  const team = new Team(1);
  try {
    return klDivergenceWith(P, Y, team);
  } finally {
    team.close();
  }
}

/** `klDivergence` with the rows spread over the threads of `team` (same value for any number of threads). */
export function klDivergenceWith(P: SparseAffinities, Y: Embedding, team: Team): number {
  const n = Y.n;
  if (P.n !== n) throw new RangeError(`P has ${P.n} points but the embedding has ${n}`);
  const shared = team.arrays.shared;
  const zRow = team.arrays.f64(n);
  const accRow = team.arrays.f64(n);
  const pRow = team.arrays.f64(n);
  team.share({
    indptr: shared ? sharedI32(P.indptr) : P.indptr,
    indices: shared ? sharedI32(P.indices) : P.indices,
    values: shared ? sharedF64(P.values) : P.values,
    y: shared ? sharedF64(Y.data) : Y.data,
    zRow,
    accRow,
    pRow,
  });
  // Row i costs n − 1 − i pair terms; small items keep the threads' last items short.
  const rows = Math.max(4, Math.ceil(n / 512));
  team.params[R_N] = n;
  team.params[R_ROWS_PER_ITEM] = rows;
  team.run(JOB_KL, rowItems(n, rows));
  team.release(['zRow', 'accRow', 'pRow']);
  const logZ = Math.log(2 * sumInOrder(zRow, n));
  return sumInOrder(accRow, n) + sumInOrder(pRow, n) * logZ;
}

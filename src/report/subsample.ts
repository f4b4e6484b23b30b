/**
 * Deterministic stratified subsampling of rows for drawing large maps.
 */
import { Rng } from '../core/rng.js';

/** Most points drawn per seed in one map. */
export const MAX_POINTS_PER_SEED = 3000;

/**
 * Pick at most `cap` of `n` rows, stratified by label, reproducibly.
 *
 * Rule: when n ≤ cap every row is kept. Otherwise each label (all rows form
 * one group when `labels` is null) first keeps one row, and the remaining
 * cap − (number of labels) places are shared in proportion to each label's
 * other rows, rounded by largest remainder (ties to the label seen first in
 * row order). Within a label, rows are drawn uniformly without replacement
 * by a partial Fisher–Yates shuffle driven by `Rng(seed)`, labels visited in
 * order of first appearance. If there are more labels than `cap`, the first
 * `cap` labels by first appearance keep one row each.
 *
 * @param n number of rows
 * @param labels label per row (length n) or null
 * @param cap maximum rows kept (default 3000)
 * @param seed 32-bit seed for the draw
 * @returns kept row indices, ascending, no duplicates
 */
export function subsampleRows(
  n: number,
  labels: readonly string[] | null,
  cap: number = MAX_POINTS_PER_SEED,
  seed = 0,
): Int32Array {
  if (n <= cap) {
    const all = new Int32Array(n);
    for (let i = 0; i < n; i++) all[i] = i;
    return all;
  }
  // Group rows by label, groups in order of first appearance.
  const groupOf = new Map<string, number>();
  const groupRows: number[][] = [];
  for (let i = 0; i < n; i++) {
    const key = labels === null ? '' : labels[i];
    let g = groupOf.get(key);
    if (g === undefined) {
      g = groupRows.length;
      groupOf.set(key, g);
      groupRows.push([]);
    }
    groupRows[g].push(i);
  }
  const groups = groupRows.length;
  const take = new Int32Array(groups);
  if (groups >= cap) {
    for (let g = 0; g < cap; g++) take[g] = 1;
  } else {
    const spare = cap - groups;
    const others = n - groups;
    const remainders = new Float64Array(groups);
    let given = 0;
    for (let g = 0; g < groups; g++) {
      const share = (spare * (groupRows[g].length - 1)) / others;
      const whole = Math.floor(share);
      take[g] = 1 + whole;
      remainders[g] = share - whole;
      given += 1 + whole;
    }
    const order = Array.from({ length: groups }, (_, g) => g).sort(
      (a, b) => remainders[b] - remainders[a] || a - b,
    );
    for (let r = 0; given < cap && r < order.length; r++) {
      const g = order[r];
      if (take[g] < groupRows[g].length) {
        take[g]++;
        given++;
      }
    }
  }
  const rng = new Rng(seed);
  const kept: number[] = [];
  for (let g = 0; g < groups; g++) {
    const rows = Int32Array.from(groupRows[g]);
    const m = take[g];
    for (let t = 0; t < m; t++) {
      const j = t + rng.int(rows.length - t);
      const tmp = rows[t];
      rows[t] = rows[j];
      rows[j] = tmp;
      kept.push(rows[t]);
    }
  }
  const out = Int32Array.from(kept);
  out.sort();
  return out;
}

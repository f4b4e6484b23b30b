/**
 * The per-point loops of t-SNE, written so that any contiguous range of
 * points (or rows, or quadtree leaves) can be computed on its own: every
 * result is a per-point (per-row) value whose arithmetic does not depend on
 * which other ranges are computed, by which thread, or in what order. Global
 * sums (Z, the KL divergence) are reduced afterwards from the per-point
 * values in a fixed order (`sumInOrder`), so one thread and several
 * threads give the same bytes.
 *
 * This module is loaded by the worker thread too, so it imports nothing.
 */

/** Row entropy tolerance in nats (scikit-learn 1.2.1 `PERPLEXITY_TOLERANCE`). */
export const PERPLEXITY_TOLERANCE = 1e-5;
/** Step limit of the β search (scikit-learn 1.2.1 `n_steps`). */
export const PERPLEXITY_MAX_STEPS = 100;
/** Replaces a row sum that underflowed to 0 (scikit-learn 1.2.1 `EPSILON_DBL`). */
const ROW_SUM_FLOOR = 1e-8;

/** Depth limit of the quadtree; stops endless splitting of coincident points. */
export const MAX_TREE_DEPTH = 48;

/** a[0] + a[1] + … + a[n − 1], left to right. */
export function sumInOrder(a: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += a[i];
  return s;
}

/**
 * β search of scikit-learn 1.2.1 `_binary_search_perplexity` (in float64)
 * for rows [lo, hi) of an n × m matrix of squared distances: writes p_{j|i}
 * into `out` (same layout) and β_i into `beta`.
 */
export function calibrateRows(
  d2: Float64Array, m: number, target: number, lo: number, hi: number, out: Float64Array, beta: Float64Array,
): void {
  for (let i = lo; i < hi; i++) beta[i] = calibrateRow(d2, i * m, m, target, out);
}

/**
 * Bisection for one row (β from 1; double or halve until the root is
 * bracketed, then bisect); writes p_{j|i} into out[off .. off + m) and
 * returns the β those probabilities were computed with.
 */
function calibrateRow(d2: Float64Array, off: number, m: number, target: number, out: Float64Array): number {
  let beta = 1;
  let betaMin = -Infinity;
  let betaMax = Infinity;
  let used = beta;
  for (let step = 0; step < PERPLEXITY_MAX_STEPS; step++) {
    used = beta;
    let sum = 0;
    for (let t = 0; t < m; t++) {
      const v = Math.exp(-d2[off + t] * beta);
      out[off + t] = v;
      sum += v;
    }
    if (sum === 0) sum = ROW_SUM_FLOOR;
    let sumDP = 0;
    for (let t = 0; t < m; t++) {
      const p = out[off + t] / sum;
      out[off + t] = p;
      sumDP += d2[off + t] * p;
    }
    const entropy = Math.log(sum) + beta * sumDP;
    const diff = entropy - target;
    if (Math.abs(diff) <= PERPLEXITY_TOLERANCE) break;
    if (diff > 0) {
      betaMin = beta;
      beta = betaMax === Infinity ? beta * 2 : (beta + betaMax) / 2;
    } else {
      betaMax = beta;
      beta = betaMin === -Infinity ? beta / 2 : (beta + betaMin) / 2;
    }
  }
  return used;
}

/**
 * Unscaled attraction F_attr,i = Σ_j p_ij (y_i − y_j) / (1 + ‖y_i − y_j‖²)
 * over all stored entries of row i of P (CSR; entries in stored order), for
 * points [lo, hi); written into out[2i], out[2i + 1]. Each pair is evaluated
 * from both ends, which costs twice the kernel evaluations of a symmetric
 * loop but makes every row independent.
 */
export function attractionRows(
  indptr: Int32Array, indices: Int32Array, values: Float64Array, y: Float64Array, lo: number, hi: number, out: Float64Array,
): void {
  for (let i = lo; i < hi; i++) {
    const xi = y[2 * i];
    const yi = y[2 * i + 1];
    let fx = 0;
    let fy = 0;
    const end = indptr[i + 1];
    for (let e = indptr[i]; e < end; e++) {
      const j = indices[e];
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      const pw = values[e] / (1 + dx * dx + dy * dy);
      fx += pw * dx;
      fy += pw * dy;
    }
    out[2 * i] = fx;
    out[2 * i + 1] = fy;
  }
}

/** The arrays of a built quadtree that the repulsion reads (see quadtree.ts). */
export interface TreeArrays {
  /** First of the four children, −1 for a leaf. */
  readonly firstChild: Int32Array;
  /** Start of the node's points in tree order. */
  readonly start: Int32Array;
  /** Points in the node. */
  readonly count: Int32Array;
  /** Centre of mass. */
  readonly comX: Float64Array;
  readonly comY: Float64Array;
  /** Side length of the node's square cell. */
  readonly side: Float64Array;
  /** Point index at each tree-order position. */
  readonly perm: Int32Array;
  /** Coordinates in tree order. */
  readonly px: Float64Array;
  readonly py: Float64Array;
  /** Non-empty leaves in tree order (their point ranges follow each other). */
  readonly leaves: Int32Array;
}

/** Per-thread work space of `repulsionLeaves`, sized for a tree of `nodes` nodes and `leaves` leaves. */
export class RepulsionScratch {
  /** Accepted cells: x, y, point count, interleaved. */
  cells: Float64Array;
  /** Leaves visited point by point: start, end, interleaved. */
  ranges: Int32Array;
  readonly stack: Int32Array;

  constructor(nodes: number, leaves: number, maxDepth: number) {
    this.cells = new Float64Array(3 * Math.max(16, nodes));
    this.ranges = new Int32Array(2 * Math.max(16, leaves));
    this.stack = new Int32Array(3 * maxDepth + 8);
  }

  /** Make room for a tree with this many nodes and leaves. */
  ensure(nodes: number, leaves: number): void {
    if (this.cells.length < 3 * nodes) this.cells = new Float64Array(3 * nodes);
    if (this.ranges.length < 2 * leaves) this.ranges = new Int32Array(2 * leaves);
  }
}

/**
 * Barnes-Hut repulsion for the points of leaves [leafLo, leafHi) of a built
 * quadtree, one interaction list per leaf (the grouping of Barnes 1990,
 * J. Comput. Phys. 87:161): a cell is summarised by its centre of mass when
 * side² < θ² · d², where d is the distance from the centre of mass to the
 * bounding box of the leaf's points — so the cell is accepted for every
 * point of the leaf by the per-point criterion of van der Maaten 2014 and
 * scikit-learn 1.2.1 (side² < θ² · ‖y_i − com‖²), and the result is at
 * least as fine as theirs. Cells that fail and are leaves are visited point
 * by point; the leaf itself is always visited point by point, skipping i.
 * θ = 0 gives the exact sums.
 *
 * For the point i at every tree position e of those leaves writes
 * out[2e], out[2e + 1] = Σ_j w_ij² (y_i − y_j) and z[e] = Σ_{j≠i} w_ij,
 * w_ij = 1 / (1 + ‖y_i − y_j‖²) — in tree order, so that the threads write
 * to separate stretches of memory.
 */
export function repulsionLeaves(
  t: TreeArrays, theta2: number, leafLo: number, leafHi: number, out: Float64Array, z: Float64Array, scratch: RepulsionScratch,
): void {
  const { firstChild, start, count, comX, comY, side, px, py, leaves } = t;
  const { cells, ranges, stack } = scratch;
  for (let li = leafLo; li < leafHi; li++) {
    const g = leaves[li];
    const gs = start[g];
    const ge = gs + count[g];
    let bx0 = px[gs];
    let bx1 = bx0;
    let by0 = py[gs];
    let by1 = by0;
    for (let e = gs + 1; e < ge; e++) {
      const a = px[e];
      const b = py[e];
      if (a < bx0) bx0 = a;
      if (a > bx1) bx1 = a;
      if (b < by0) by0 = b;
      if (b > by1) by1 = b;
    }
    // Interaction list of the leaf.
    let nc = 0;
    let nr = 0;
    let sp = 0;
    stack[sp++] = 0;
    while (sp > 0) {
      const node = stack[--sp];
      const fc = firstChild[node];
      if (node === g) {
        ranges[nr++] = gs;
        ranges[nr++] = ge;
        continue;
      }
      const mx = comX[node];
      const my = comY[node];
      const ddx = mx < bx0 ? bx0 - mx : mx > bx1 ? mx - bx1 : 0;
      const ddy = my < by0 ? by0 - my : my > by1 ? my - by1 : 0;
      const sd = side[node];
      if (sd * sd < theta2 * (ddx * ddx + ddy * ddy)) {
        cells[nc++] = mx;
        cells[nc++] = my;
        cells[nc++] = count[node];
      } else if (fc < 0) {
        ranges[nr++] = start[node];
        ranges[nr++] = start[node] + count[node];
      } else {
        for (let q = 3; q >= 0; q--) if (count[fc + q] > 0) stack[sp++] = fc + q;
      }
    }
    // Sums for each point of the leaf, two points at a time (each point's
    // terms are added in the same order as one at a time).
    let ei = gs;
    for (; ei + 1 < ge; ei += 2) {
      const xa = px[ei];
      const ya = py[ei];
      const xb = px[ei + 1];
      const yb = py[ei + 1];
      let fxa = 0;
      let fya = 0;
      let za = 0;
      let fxb = 0;
      let fyb = 0;
      let zb = 0;
      for (let c = 0; c < nc; c += 3) {
        const cx = cells[c];
        const cy = cells[c + 1];
        const m = cells[c + 2];
        const dxa = xa - cx;
        const dya = ya - cy;
        const dxb = xb - cx;
        const dyb = yb - cy;
        const wa = 1 / (1 + dxa * dxa + dya * dya);
        const wb = 1 / (1 + dxb * dxb + dyb * dyb);
        const cwa = m * wa;
        const cwb = m * wb;
        za += cwa;
        zb += cwb;
        const cwa2 = cwa * wa;
        const cwb2 = cwb * wb;
        fxa += cwa2 * dxa;
        fya += cwa2 * dya;
        fxb += cwb2 * dxb;
        fyb += cwb2 * dyb;
      }
      for (let r = 0; r < nr; r += 2) {
        const end = ranges[r + 1];
        for (let e = ranges[r]; e < end; e++) {
          const qx = px[e];
          const qy = py[e];
          if (e !== ei) {
            const dx = xa - qx;
            const dy = ya - qy;
            const w = 1 / (1 + dx * dx + dy * dy);
            za += w;
            const w2 = w * w;
            fxa += w2 * dx;
            fya += w2 * dy;
          }
          if (e !== ei + 1) {
            const dx = xb - qx;
            const dy = yb - qy;
            const w = 1 / (1 + dx * dx + dy * dy);
            zb += w;
            const w2 = w * w;
            fxb += w2 * dx;
            fyb += w2 * dy;
          }
        }
      }
      out[2 * ei] = fxa;
      out[2 * ei + 1] = fya;
      z[ei] = za;
      out[2 * ei + 2] = fxb;
      out[2 * ei + 3] = fyb;
      z[ei + 1] = zb;
    }
    for (; ei < ge; ei++) {
      const xi = px[ei];
      const yi = py[ei];
      let fx = 0;
      let fy = 0;
      let zi = 0;
      for (let c = 0; c < nc; c += 3) {
        const dx = xi - cells[c];
        const dy = yi - cells[c + 1];
        const w = 1 / (1 + dx * dx + dy * dy);
        const cw = cells[c + 2] * w;
        zi += cw;
        const cw2 = cw * w;
        fx += cw2 * dx;
        fy += cw2 * dy;
      }
      for (let r = 0; r < nr; r += 2) {
        const end = ranges[r + 1];
        for (let e = ranges[r]; e < end; e++) {
          if (e === ei) continue;
          const dx = xi - px[e];
          const dy = yi - py[e];
          const w = 1 / (1 + dx * dx + dy * dy);
          zi += w;
          const w2 = w * w;
          fx += w2 * dx;
          fy += w2 * dy;
        }
      }
      out[2 * ei] = fx;
      out[2 * ei + 1] = fy;
      z[ei] = zi;
    }
  }
}

/**
 * Per-row parts of the exact KL divergence for rows [lo, hi):
 * zRow[i] = Σ_{j>i} 1 / (1 + ‖y_i − y_j‖²) (j ascending),
 * accRow[i] = Σ_e p_e log(p_e (1 + d²_e)) and pRow[i] = Σ_e p_e over the
 * positive stored entries of row i of P, in stored order.
 */
export function klRows(
  indptr: Int32Array, indices: Int32Array, values: Float64Array, y: Float64Array, n: number, lo: number, hi: number,
  zRow: Float64Array, accRow: Float64Array, pRow: Float64Array,
): void {
  for (let i = lo; i < hi; i++) {
    const xi = y[2 * i];
    const yi = y[2 * i + 1];
    let zi = 0;
    for (let j = i + 1; j < n; j++) {
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      zi += 1 / (1 + dx * dx + dy * dy);
    }
    zRow[i] = zi;
    let acc = 0;
    let sp = 0;
    for (let e = indptr[i]; e < indptr[i + 1]; e++) {
      const p = values[e];
      if (!(p > 0)) continue;
      const j = indices[e];
      const dx = xi - y[2 * j];
      const dy = yi - y[2 * j + 1];
      // log(p / q) = log(p · (1 + d²)) + log Z
      acc += p * Math.log(p * (1 + dx * dx + dy * dy));
      sp += p;
    }
    accRow[i] = acc;
    pRow[i] = sp;
  }
}

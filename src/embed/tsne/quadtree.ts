/**
 * Point-region quadtree over a 2-D embedding on flat typed arrays, for the
 * Barnes-Hut approximation of the t-SNE repulsion (van der Maaten 2014,
 * JMLR 15:3221). The arrays are kept between builds and only grow, so
 * rebuilding it every iteration allocates nothing once it has reached its
 * working size.
 *
 * Cells are squares. The root is the bounding square of the points; a cell
 * with more than `LEAF_CAPACITY` points is split into four equal quadrants
 * (order: low-x/low-y, high-x/low-y, low-x/high-y, high-x/high-y), except at
 * depth `MAX_DEPTH`, which only coincident or nearly coincident points reach.
 * The points of a node are the contiguous range `perm[start .. start+count)`.
 */

/** Points a leaf may hold before it is split. */
export const LEAF_CAPACITY = 16;
/** Depth limit; stops endless splitting of coincident points. */
export const MAX_DEPTH = 48;

export class QuadTree {
  /** Number of nodes in use; node 0 is the root. */
  nodeCount = 0;
  /** Number of points of the last build. */
  size = 0;
  /** Index of the first of the four consecutive children, or −1 for a leaf. */
  firstChild: Int32Array;
  /** Start of the node's points in `perm`. */
  start: Int32Array;
  /** Number of points in the node (0 for an empty quadrant). */
  count: Int32Array;
  /** Centre of mass (mean position of the node's points). */
  comX: Float64Array;
  comY: Float64Array;
  /** Lower-left corner and side length of the node's square cell. */
  x0: Float64Array;
  y0: Float64Array;
  side: Float64Array;
  /** Point indices grouped by node. */
  perm: Int32Array;
  /** Coordinates in `perm` order, so a leaf's points are contiguous in memory. */
  private px: Float64Array;
  private py: Float64Array;
  private stack: Int32Array;

  constructor(capacityHint = 64) {
    const c = Math.max(16, capacityHint | 0);
    this.firstChild = new Int32Array(c);
    this.start = new Int32Array(c);
    this.count = new Int32Array(c);
    this.comX = new Float64Array(c);
    this.comY = new Float64Array(c);
    this.x0 = new Float64Array(c);
    this.y0 = new Float64Array(c);
    this.side = new Float64Array(c);
    this.perm = new Int32Array(0);
    this.px = new Float64Array(0);
    this.py = new Float64Array(0);
    this.stack = new Int32Array(4 * (MAX_DEPTH + 2));
  }

  /**
   * Build the tree over n points with interleaved coordinates
   * y = (x0, y0, x1, y1, …). Reuses and, if needed, enlarges the arrays.
   */
  build(y: Float64Array, n: number): void {
    if (this.perm.length < n) {
      this.perm = new Int32Array(n);
      this.px = new Float64Array(n);
      this.py = new Float64Array(n);
    }
    const perm = this.perm;
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (let i = 0; i < n; i++) {
      perm[i] = i;
      const a = y[2 * i];
      const b = y[2 * i + 1];
      if (a < minX) minX = a;
      if (a > maxX) maxX = a;
      if (b < minY) minY = b;
      if (b > maxY) maxY = b;
    }
    this.nodeCount = 0;
    this.size = n;
    const root = this.allocate(1);
    const side = n > 0 ? Math.max(maxX - minX, maxY - minY) : 0;
    this.initNode(root, 0, n, n > 0 ? minX : 0, n > 0 ? minY : 0, side);
    this.split(root, y, 0);
    const { px, py } = this;
    for (let e = 0; e < n; e++) {
      const p = perm[e];
      px[e] = y[2 * p];
      py[e] = y[2 * p + 1];
    }
  }

  /** Reserve `k` consecutive nodes and return the first index. */
  private allocate(k: number): number {
    const need = this.nodeCount + k;
    if (need > this.firstChild.length) this.grow(Math.max(need, 2 * this.firstChild.length));
    const first = this.nodeCount;
    this.nodeCount = need;
    return first;
  }

  private grow(capacity: number): void {
    const growI = (a: Int32Array): Int32Array => {
      const b = new Int32Array(capacity);
      b.set(a);
      return b;
    };
    const growF = (a: Float64Array): Float64Array => {
      const b = new Float64Array(capacity);
      b.set(a);
      return b;
    };
    this.firstChild = growI(this.firstChild);
    this.start = growI(this.start);
    this.count = growI(this.count);
    this.comX = growF(this.comX);
    this.comY = growF(this.comY);
    this.x0 = growF(this.x0);
    this.y0 = growF(this.y0);
    this.side = growF(this.side);
  }

  private initNode(node: number, start: number, count: number, x0: number, y0: number, side: number): void {
    this.firstChild[node] = -1;
    this.start[node] = start;
    this.count[node] = count;
    this.x0[node] = x0;
    this.y0[node] = y0;
    this.side[node] = side;
    this.comX[node] = 0;
    this.comY[node] = 0;
  }

  /** Split `node` recursively and fill in centres of mass. */
  private split(node: number, y: Float64Array, depth: number): void {
    const s = this.start[node];
    const c = this.count[node];
    if (c === 0) return;
    if (c <= LEAF_CAPACITY || depth >= MAX_DEPTH) {
      const perm = this.perm;
      let sx = 0;
      let sy = 0;
      for (let e = s; e < s + c; e++) {
        const p = perm[e];
        sx += y[2 * p];
        sy += y[2 * p + 1];
      }
      this.comX[node] = sx / c;
      this.comY[node] = sy / c;
      return;
    }
    const half = this.side[node] / 2;
    const x0 = this.x0[node];
    const y0 = this.y0[node];
    const mx = x0 + half;
    const my = y0 + half;
    const e = s + c;
    const a = this.partition(y, s, e, 1, my);
    const b1 = this.partition(y, s, a, 0, mx);
    const b2 = this.partition(y, a, e, 0, mx);
    const fc = this.allocate(4);
    this.firstChild[node] = fc;
    this.initNode(fc, s, b1 - s, x0, y0, half);
    this.initNode(fc + 1, b1, a - b1, mx, y0, half);
    this.initNode(fc + 2, a, b2 - a, x0, my, half);
    this.initNode(fc + 3, b2, e - b2, mx, my, half);
    let sx = 0;
    let sy = 0;
    for (let q = 0; q < 4; q++) {
      const child = fc + q;
      this.split(child, y, depth + 1);
      const k = this.count[child];
      sx += k * this.comX[child];
      sy += k * this.comY[child];
    }
    this.comX[node] = sx / c;
    this.comY[node] = sy / c;
  }

  /**
   * Reorder perm[lo .. hi) so that points with coordinate `axis` below
   * `pivot` come first; returns the first index of the upper part.
   */
  private partition(y: Float64Array, lo: number, hi: number, axis: number, pivot: number): number {
    const perm = this.perm;
    let i = lo;
    let j = hi - 1;
    for (;;) {
      while (i <= j && y[2 * perm[i] + axis] < pivot) i++;
      while (i <= j && !(y[2 * perm[j] + axis] < pivot)) j--;
      if (i >= j) break;
      const t = perm[i];
      perm[i] = perm[j];
      perm[j] = t;
      i++;
      j--;
    }
    return i;
  }

  /**
   * Barnes-Hut sums for every point i of the last build (positions as they
   * were at that build):
   * writes the unnormalised repulsion Σ_j w_ij² (y_i − y_j), with
   * w_ij = 1 / (1 + ‖y_i − y_j‖²), into out[2i], out[2i+1] and returns
   * Z = Σ_i Σ_{j≠i} w_ij. A non-leaf cell is summarised by its centre of
   * mass when side² < θ² · ‖y_i − com‖² (the criterion of scikit-learn 1.2.1);
   * the points of a leaf are always visited one by one, so θ = 0 gives the
   * exact sums. For θ < 1/√2 a cell containing i is never summarised.
   */
  repulsion(theta: number, out: Float64Array): number {
    const n = this.size;
    const theta2 = theta * theta;
    const { firstChild, start, count, comX, comY, side, perm, px, py, stack } = this;
    let z = 0;
    // Points are visited in tree order: consecutive points walk similar paths.
    for (let ei = 0; ei < n; ei++) {
      const i = perm[ei];
      const xi = px[ei];
      const yi = py[ei];
      let fx = 0;
      let fy = 0;
      let zi = 0;
      let sp = 0;
      stack[sp++] = 0;
      while (sp > 0) {
        const node = stack[--sp];
        const fc = firstChild[node];
        if (fc < 0) {
          const s = start[node];
          const end = s + count[node];
          for (let e = s; e < end; e++) {
            if (e === ei) continue;
            const dx = xi - px[e];
            const dy = yi - py[e];
            const w = 1 / (1 + dx * dx + dy * dy);
            zi += w;
            const w2 = w * w;
            fx += w2 * dx;
            fy += w2 * dy;
          }
          continue;
        }
        const dx = xi - comX[node];
        const dy = yi - comY[node];
        const d2 = dx * dx + dy * dy;
        const sd = side[node];
        if (sd * sd < theta2 * d2) {
          const w = 1 / (1 + d2);
          const cw = count[node] * w;
          zi += cw;
          const cw2 = cw * w;
          fx += cw2 * dx;
          fy += cw2 * dy;
        } else {
          for (let q = 3; q >= 0; q--) {
            if (count[fc + q] > 0) stack[sp++] = fc + q;
          }
        }
      }
      out[2 * i] = fx;
      out[2 * i + 1] = fy;
      z += zi;
    }
    return z;
  }
}

/**
 * Point-region quadtree over a 2-D embedding on flat typed arrays, for the
 * Barnes-Hut approximation of the t-SNE repulsion (van der Maaten 2014,
 * JMLR 15:3221). The arrays are kept between builds and only grow, so
 * rebuilding it every iteration allocates nothing once it has reached its
 * working size. They can live in shared memory (see arrays.ts), so that a
 * worker thread reads the tree the main thread built.
 *
 * Cells are squares. The root is the bounding square of the points; a cell
 * with more than `leafCapacity` points is split into four equal quadrants
 * (order: low-x/low-y, high-x/low-y, low-x/high-y, high-x/high-y), except at
 * depth `MAX_DEPTH`, which only coincident or nearly coincident points reach.
 * The points of a node are the contiguous range `perm[start .. start+count)`
 * ("tree order"); `px`, `py` hold their coordinates in that order. Every
 * build starts from the points in index order, so the tree depends only on
 * the coordinates, not on earlier builds.
 */
import { heapArrays } from './arrays.js';
import type { ArrayFactory } from './arrays.js';
import { MAX_TREE_DEPTH, RepulsionScratch, repulsionLeaves, sumInOrder } from './kernels.js';
import type { TreeArrays } from './kernels.js';

/** Points a leaf may hold before it is split (default). */
export const LEAF_CAPACITY = 16;
/** Depth limit; stops endless splitting of coincident points. */
export const MAX_DEPTH = MAX_TREE_DEPTH;

export class QuadTree implements TreeArrays {
  /** Number of nodes in use; node 0 is the root. */
  nodeCount = 0;
  /** Number of non-empty leaves, listed in tree order in `leaves`. */
  leafCount = 0;
  /** Number of points of the last build. */
  size = 0;
  /** Incremented whenever the arrays are replaced by larger ones. */
  version = 0;
  /** Points a leaf may hold before it is split. */
  readonly leafCapacity: number;
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
  /** Non-empty leaves in tree order. */
  leaves: Int32Array;
  /** Point indices grouped by node. */
  perm: Int32Array;
  /** Coordinates in `perm` order, so a node's points are contiguous in memory. */
  px: Float64Array;
  py: Float64Array;
  /** Tree-order position of each point (the inverse of `perm`). */
  pos: Int32Array = new Int32Array(0);
  private readonly arrays: ArrayFactory;
  private scratch: RepulsionScratch | null = null;
  private zTree: Float64Array = new Float64Array(0);
  private forceTree: Float64Array = new Float64Array(0);

  /**
   * @param capacityHint initial number of nodes (grown on demand).
   * @param arrays where the arrays live (default: ordinary heap arrays).
   * @param leafCapacity points a leaf may hold (default `LEAF_CAPACITY`).
   */
  constructor(capacityHint = 64, arrays: ArrayFactory = heapArrays, leafCapacity = LEAF_CAPACITY) {
    if (!Number.isInteger(leafCapacity) || leafCapacity < 1) throw new RangeError(`leafCapacity must be a positive integer; received ${leafCapacity}`);
    this.arrays = arrays;
    this.leafCapacity = leafCapacity;
    const c = Math.max(16, capacityHint | 0);
    this.firstChild = arrays.i32(c);
    this.start = arrays.i32(c);
    this.count = arrays.i32(c);
    this.comX = arrays.f64(c);
    this.comY = arrays.f64(c);
    this.x0 = new Float64Array(c);
    this.y0 = new Float64Array(c);
    this.side = arrays.f64(c);
    this.leaves = arrays.i32(c);
    this.perm = arrays.i32(0);
    this.px = arrays.f64(0);
    this.py = arrays.f64(0);
  }

  /**
   * Build the tree over n points with interleaved coordinates
   * y = (x0, y0, x1, y1, …). Reuses and, if needed, enlarges the arrays.
   */
  build(y: Float64Array, n: number): void {
    if (this.perm.length < n) {
      this.perm = this.arrays.i32(n);
      this.px = this.arrays.f64(n);
      this.py = this.arrays.f64(n);
      this.version++;
    }
    const { perm, px, py } = this;
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (let i = 0; i < n; i++) {
      perm[i] = i;
      const a = y[2 * i];
      const b = y[2 * i + 1];
      px[i] = a;
      py[i] = b;
      if (a < minX) minX = a;
      if (a > maxX) maxX = a;
      if (b < minY) minY = b;
      if (b > maxY) maxY = b;
    }
    this.nodeCount = 0;
    this.leafCount = 0;
    this.size = n;
    const root = this.allocate(1);
    const side = n > 0 ? Math.max(maxX - minX, maxY - minY) : 0;
    this.initNode(root, 0, n, n > 0 ? minX : 0, n > 0 ? minY : 0, side);
    this.split(root, 0);
    if (this.pos.length < n) this.pos = new Int32Array(n);
    const pos = this.pos;
    for (let e = 0; e < n; e++) pos[perm[e]] = e;
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
    const a = this.arrays;
    const growI = (old: Int32Array): Int32Array => {
      const b = a.i32(capacity);
      b.set(old);
      return b;
    };
    const growF = (old: Float64Array): Float64Array => {
      const b = a.f64(capacity);
      b.set(old);
      return b;
    };
    this.firstChild = growI(this.firstChild);
    this.start = growI(this.start);
    this.count = growI(this.count);
    this.comX = growF(this.comX);
    this.comY = growF(this.comY);
    this.side = growF(this.side);
    this.leaves = growI(this.leaves);
    const x0 = new Float64Array(capacity);
    x0.set(this.x0);
    this.x0 = x0;
    const y0 = new Float64Array(capacity);
    y0.set(this.y0);
    this.y0 = y0;
    this.version++;
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
  private split(node: number, depth: number): void {
    const s = this.start[node];
    const c = this.count[node];
    if (c === 0) return;
    if (c <= this.leafCapacity || depth >= MAX_DEPTH) {
      const { px, py } = this;
      let sx = 0;
      let sy = 0;
      for (let e = s; e < s + c; e++) {
        sx += px[e];
        sy += py[e];
      }
      this.comX[node] = sx / c;
      this.comY[node] = sy / c;
      this.leaves[this.leafCount++] = node;
      return;
    }
    const half = this.side[node] / 2;
    const x0 = this.x0[node];
    const y0 = this.y0[node];
    const mx = x0 + half;
    const my = y0 + half;
    const e = s + c;
    const a = this.partition(this.py, this.px, s, e, my);
    const b1 = this.partition(this.px, this.py, s, a, mx);
    const b2 = this.partition(this.px, this.py, a, e, mx);
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
      this.split(child, depth + 1);
      const k = this.count[child];
      sx += k * this.comX[child];
      sy += k * this.comY[child];
    }
    this.comX[node] = sx / c;
    this.comY[node] = sy / c;
  }

  /**
   * Reorder positions [lo, hi) (perm and both coordinate arrays together) so
   * that points whose `key` coordinate is below `pivot` come first; returns
   * the first position of the upper part.
   */
  private partition(key: Float64Array, other: Float64Array, lo: number, hi: number, pivot: number): number {
    const perm = this.perm;
    let i = lo;
    let j = hi - 1;
    for (;;) {
      while (i <= j && key[i] < pivot) i++;
      while (i <= j && !(key[j] < pivot)) j--;
      if (i >= j) break;
      const t = perm[i];
      perm[i] = perm[j];
      perm[j] = t;
      const k = key[i];
      key[i] = key[j];
      key[j] = k;
      const o = other[i];
      other[i] = other[j];
      other[j] = o;
      i++;
      j--;
    }
    return i;
  }

  /**
   * Barnes-Hut sums for every point i of the last build (positions as they
   * were at that build), by `repulsionLeaves` (one interaction list per
   * leaf): writes the unnormalised repulsion Σ_j w_ij² (y_i − y_j), with
   * w_ij = 1 / (1 + ‖y_i − y_j‖²), into out[2i], out[2i+1] and returns
   * Z = Σ_i Σ_{j≠i} w_ij, summed over i in index order. θ = 0 gives the
   * exact sums; for θ < 1/√2 a cell containing i is never summarised.
   * Z is summed over the points in tree order, as the optimiser sums it.
   */
  repulsion(theta: number, out: Float64Array): number {
    const n = this.size;
    if (this.zTree.length < n) {
      this.zTree = new Float64Array(n);
      this.forceTree = new Float64Array(2 * n);
    }
    if (this.scratch === null) this.scratch = new RepulsionScratch(this.nodeCount, this.leafCount, MAX_DEPTH);
    this.scratch.ensure(this.nodeCount, this.leafCount);
    const f = this.forceTree;
    repulsionLeaves(this, theta * theta, 0, this.leafCount, f, this.zTree, this.scratch);
    const perm = this.perm;
    for (let e = 0; e < n; e++) {
      const i = perm[e];
      out[2 * i] = f[2 * e];
      out[2 * i + 1] = f[2 * e + 1];
    }
    return sumInOrder(this.zTree, n);
  }
}

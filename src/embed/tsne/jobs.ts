/**
 * Work shared between the main thread and worker threads during one t-SNE
 * run. A job is a numbered list of items (ranges of points, rows or
 * quadtree leaves); any thread may compute any item, and an item's results
 * depend only on its index, so the outcome does not depend on who computed
 * what (see kernels.ts).
 *
 * Synchronisation, all through shared memory (no event loop needed, so the
 * main thread may block in `Atomics.wait`):
 * - `control` (Int32Array, slots below) and `params` (Float64Array) describe
 *   the current job; a new job is announced by incrementing GEN.
 * - `claim` (BigInt64Array[1]) holds (generation << 32) | next item. A thread
 *   takes an item with a compare-and-swap that also checks the generation,
 *   so a thread still finishing one job can never take an item of the next.
 * - DONE counts finished items; the main thread waits until it reaches the
 *   item count.
 * - Items from OPEN_FROM on may only start once GATE equals the generation
 *   (the gradient job opens them when the quadtree is built).
 * - Arrays are published by name through a MessagePort that the worker reads
 *   synchronously (`receiveMessageOnPort`) whenever BUFVER changes.
 *
 * This module is loaded by the worker thread; it imports only kernels.ts.
 */
import { attractionRows, calibrateRows, klRows, RepulsionScratch, repulsionLeaves } from './kernels.js';
import type { TreeArrays } from './kernels.js';

/** Slots of the control array. */
export const GEN = 0;
export const JOB = 1;
export const DONE = 2;
export const LIMIT = 3;
export const OPEN_FROM = 4;
export const GATE = 5;
export const BUFVER = 6;
export const READY = 7;
export const WORKER_ITEMS = 8;
export const FAILED = 9;
export const CONTROL_SLOTS = 16;
export const PARAM_SLOTS = 16;

/** Job kinds. */
export const JOB_QUIT = -1;
/** Attraction by point chunks, then (gated) Barnes-Hut repulsion by leaf chunks. */
export const JOB_GRADIENT = 1;
/** Per-row parts of the exact KL divergence. */
export const JOB_KL = 2;
/** Perplexity calibration of row chunks. */
export const JOB_CALIBRATE = 3;

/** Gradient parameters. */
export const G_N = 0;
export const G_ATTR_CHUNK = 1;
export const G_ATTR_ITEMS = 2;
export const G_LEAVES_PER_ITEM = 3;
export const G_THETA2 = 4;
export const G_NODES = 5;
export const G_LEAVES = 6;
/** KL and calibration parameters. */
export const R_N = 0;
export const R_ROWS_PER_ITEM = 1;
export const C_M = 2;
export const C_TARGET = 3;

/** Message carrying newly published arrays. */
export interface BufferMessage {
  readonly version: number;
  /** Name, buffer (null: forget the name) and element type. */
  readonly entries: ReadonlyArray<readonly [string, SharedArrayBuffer | null, 'f64' | 'i32']>;
}

/** What the worker thread receives at start. */
export interface WorkerSetup {
  readonly control: SharedArrayBuffer;
  readonly params: SharedArrayBuffer;
  readonly claim: SharedArrayBuffer;
}

/** Arrays by name, as published for the current run. */
export type Workspace = Map<string, Float64Array | Int32Array>;

export function f64(ws: Workspace, name: string): Float64Array {
  const a = ws.get(name);
  if (!(a instanceof Float64Array)) throw new Error(`t-SNE work space has no Float64Array '${name}'`);
  return a;
}

export function i32(ws: Workspace, name: string): Int32Array {
  const a = ws.get(name);
  if (!(a instanceof Int32Array)) throw new Error(`t-SNE work space has no Int32Array '${name}'`);
  return a;
}

/** The quadtree arrays of a work space (names as published by the optimiser). */
export function treeOf(ws: Workspace): TreeArrays {
  return {
    firstChild: i32(ws, 'firstChild'),
    start: i32(ws, 'start'),
    count: i32(ws, 'count'),
    comX: f64(ws, 'comX'),
    comY: f64(ws, 'comY'),
    side: f64(ws, 'side'),
    perm: i32(ws, 'perm'),
    px: f64(ws, 'px'),
    py: f64(ws, 'py'),
    leaves: i32(ws, 'leaves'),
  };
}

/** One thread's cached views and scratch space. */
export interface ThreadState {
  ws: Workspace;
  tree: TreeArrays | null;
  scratch: RepulsionScratch;
}

export function newThreadState(ws: Workspace, maxDepth: number): ThreadState {
  return { ws, tree: null, scratch: new RepulsionScratch(16, 16, maxDepth) };
}

/** Number of items of a row job over n rows. */
export function rowItems(n: number, rowsPerItem: number): number {
  return Math.ceil(n / rowsPerItem);
}

/** Compute item `item` of job `job` with parameters `p`. */
export function runItem(job: number, item: number, p: Float64Array, st: ThreadState): void {
  const ws = st.ws;
  if (job === JOB_GRADIENT) {
    const n = p[G_N];
    const attrItems = p[G_ATTR_ITEMS];
    if (item < attrItems) {
      const lo = item * p[G_ATTR_CHUNK];
      const hi = Math.min(n, lo + p[G_ATTR_CHUNK]);
      attractionRows(i32(ws, 'indptr'), i32(ws, 'indices'), f64(ws, 'values'), f64(ws, 'y'), lo, hi, f64(ws, 'attr'));
      return;
    }
    if (st.tree === null) st.tree = treeOf(ws);
    st.scratch.ensure(p[G_NODES], p[G_LEAVES]);
    const lo = (item - attrItems) * p[G_LEAVES_PER_ITEM];
    const hi = Math.min(p[G_LEAVES], lo + p[G_LEAVES_PER_ITEM]);
    repulsionLeaves(st.tree, p[G_THETA2], lo, hi, f64(ws, 'rep'), f64(ws, 'zTree'), st.scratch);
    return;
  }
  const n = p[R_N];
  const lo = item * p[R_ROWS_PER_ITEM];
  const hi = Math.min(n, lo + p[R_ROWS_PER_ITEM]);
  if (job === JOB_KL) {
    klRows(i32(ws, 'indptr'), i32(ws, 'indices'), f64(ws, 'values'), f64(ws, 'y'), n, lo, hi, f64(ws, 'zRow'), f64(ws, 'accRow'), f64(ws, 'pRow'));
  } else if (job === JOB_CALIBRATE) {
    calibrateRows(f64(ws, 'sq'), p[C_M], p[C_TARGET], lo, hi, f64(ws, 'cond'), f64(ws, 'beta'));
  } else {
    throw new Error(`unknown t-SNE job ${job}`);
  }
}

/**
 * Take the next item of generation `gen` below `limit`, or return −1 when
 * the job is finished or replaced.
 */
export function claimItem(claim: BigInt64Array, gen: number, limit: number): number {
  const g = BigInt(gen) << 32n;
  for (;;) {
    const v = Atomics.load(claim, 0);
    if ((v & ~0xffffffffn) !== g) return -1;
    const idx = Number(v & 0xffffffffn);
    if (idx >= limit) return -1;
    if (Atomics.compareExchange(claim, 0, v, v + 1n) === v) return idx;
  }
}

/** Index of the next unclaimed item if the claim word still belongs to `gen`, else −1. */
export function peekItem(claim: BigInt64Array, gen: number): number {
  const v = Atomics.load(claim, 0);
  if ((v & ~0xffffffffn) !== BigInt(gen) << 32n) return -1;
  return Number(v & 0xffffffffn);
}

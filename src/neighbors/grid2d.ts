/**
 * Exact k nearest neighbours of points in the plane through a uniform grid:
 * the same graph as the blocked brute force of exact.ts, bytes included, in
 * about O(n·k) time instead of O(n²). Every map the scores look at is 2-D,
 * and the brute force spends n²/2 distance evaluations on it (about 0.3 s at
 * n = 10,000 and 8 s at n = 50,000 per map).
 *
 * Method: points are bucketed into square cells of side h, chosen so that
 * the bounding box holds about two points per cell; each cell lists its
 * points in ascending index. A query visits the rings of cells around its own
 * cell, nearest ring first, offering every point to a bounded max-heap
 * ordered by (squared distance, index), and stops once the heap is full and
 * its k-th squared distance is below the squared distance from the query to
 * the edge of the block of cells visited so far: every point outside the
 * block is farther than that edge, so strictly farther than the k-th
 * neighbour and unable to enter, whatever its index.
 *
 * Squared distances are computed as (x_i − x_j)² + (y_i − y_j)², the
 * arithmetic of `sqDist` and of the brute force, so ties are exactly the
 * same ties, and the (distance, index) rule picks the same neighbours.
 */
import type { KnnGraph, Matrix } from '../core/types.js';
import { offer, sortHeap } from './exact-tiles.js';

/** Target mean number of points per cell over the bounding box. */
const POINTS_PER_CELL = 2;

/**
 * Exact kNN of n points in 2-D (m.d must be 2), self excluded, sorted by
 * (distance, index); distances are Euclidean (not squared). Input checks are
 * the caller's (see `exactKnn`).
 */
export function gridKnn2d(m: Matrix, k: number): KnnGraph {
  const { n, data } = m;
  if (m.d !== 2) throw new RangeError(`gridKnn2d needs 2 columns, got ${m.d}`);
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = data[2 * i];
    const y = data[2 * i + 1];
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  const rx = maxX - minX;
  const ry = maxY - minY;
  // Side h: about POINTS_PER_CELL points per cell over the box; for a box that is
  // (nearly) a line, spread the points along its long side instead.
  let h = Math.max(Math.sqrt((rx * ry * POINTS_PER_CELL) / n), (Math.max(rx, ry) * POINTS_PER_CELL) / n);
  if (!(h > 0) || !Number.isFinite(h)) h = 1;
  // At most about 1.5·n + 1 cells: rx/h and ry/h are each at most n/2, and their product at most n/2.
  const gx = Math.floor(rx / h) + 1;
  const gy = Math.floor(ry / h) + 1;
  // Cell edges are computed as min + c·h; a point's cell comes from a rounded division, so it
  // may sit a few ulps of the coordinates' magnitude outside its cell. The stopping test
  // subtracts this much from the edge distance.
  const slack = 1e-12 * (Math.abs(minX) + Math.abs(maxX) + Math.abs(minY) + Math.abs(maxY) + h);
  const cellOf = (x: number, y: number): number => {
    let cx = Math.floor((x - minX) / h);
    let cy = Math.floor((y - minY) / h);
    if (cx >= gx) cx = gx - 1;
    if (cy >= gy) cy = gy - 1;
    return cy * gx + cx;
  };
  // Counting sort of the points by cell; within a cell, ascending index.
  const cells = gx * gy;
  const start = new Int32Array(cells + 1);
  const cellIdx = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const c = cellOf(data[2 * i], data[2 * i + 1]);
    cellIdx[i] = c;
    start[c + 1]++;
  }
  for (let c = 0; c < cells; c++) start[c + 1] += start[c];
  const fill = start.slice(0, cells);
  const members = new Int32Array(n);
  for (let i = 0; i < n; i++) members[fill[cellIdx[i]]++] = i;

  // Row i's candidates live in the bounded max-heap of exact-tiles.ts at idx/dist[i·k …].
  const idx = new Int32Array(n * k);
  const dist = new Float64Array(n * k); // squared while searching
  const count = new Int32Array(n);
  const worst = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const xi = data[2 * i];
    const yi = data[2 * i + 1];
    const base = i * k;
    const c = cellIdx[i];
    const cx = c % gx;
    const cy = (c - cx) / gx;
    const maxRing = Math.max(cx, gx - 1 - cx, cy, gy - 1 - cy);
    for (let r = 0; r <= maxRing; r++) {
      const x0 = cx - r;
      const x1 = cx + r;
      const y0 = cy - r;
      const y1 = cy + r;
      for (let yy = y0; yy <= y1; yy++) {
        if (yy < 0 || yy >= gy) continue;
        const edgeRow = yy === y0 || yy === y1;
        const step = edgeRow ? 1 : x1 - x0;
        for (let xx = x0; xx <= x1; xx += step > 0 ? step : 1) {
          if (xx < 0 || xx >= gx) continue;
          const cell = yy * gx + xx;
          for (let p = start[cell]; p < start[cell + 1]; p++) {
            const j = members[p];
            if (j === i) continue;
            const dx = xi - data[2 * j];
            const dy = yi - data[2 * j + 1];
            const s = dx * dx + dy * dy;
            // Cells are not visited in index order, so a tie with the current k-th
            // (the heap's root) enters when its index is lower.
            if (count[i] < k || s < dist[base] || (s === dist[base] && j < idx[base])) offer(i, j, s, k, idx, dist, count, worst);
          }
        }
      }
      if (count[i] === k) {
        // Distance from the query to the nearest edge of the visited block (cells x0..x1, y0..y1).
        const left = xi - (minX + Math.max(x0, 0) * h);
        const right = minX + (Math.min(x1, gx - 1) + 1) * h - xi;
        const down = yi - (minY + Math.max(y0, 0) * h);
        const up = minY + (Math.min(y1, gy - 1) + 1) * h - yi;
        let edge = Infinity;
        if (x0 > 0) edge = Math.min(edge, left);
        if (x1 < gx - 1) edge = Math.min(edge, right);
        if (y0 > 0) edge = Math.min(edge, down);
        if (y1 < gy - 1) edge = Math.min(edge, up);
        const safe = edge - slack;
        if (safe > 0 && dist[base] < safe * safe) break;
      }
    }
    sortHeap(base, k, idx, dist);
    for (let q = 0; q < k; q++) dist[base + q] = Math.sqrt(dist[base + q]);
  }
  return { n, k, indices: idx, distances: dist };
}

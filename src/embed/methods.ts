/**
 * One declarative table per method: the parameters it takes, their defaults
 * (with where the default comes from), the allowed range and the sweep keys.
 * Validation, --help text, setting ids and the report's parameter echo all
 * read this table, so adding a parameter means adding one row here.
 */
import type { MethodName, MethodParams } from '../core/types.js';

export interface ParamDef {
  /** Key inside MethodParams. */
  key: keyof MethodParams;
  /** Name in sweep files and results.json (snake_case). */
  fileKey: string;
  /** Command-line flag (kebab-case, without dashes). */
  flag: string;
  kind: 'number' | 'integer' | 'choice';
  default: number | string;
  /** Why this default: the source, or "common practice". */
  source: string;
  min?: number;
  max?: number;
  /** Lower bound is exclusive. */
  minExclusive?: boolean;
  choices?: readonly string[];
  /** Short token used in setting ids, e.g. 'p' → tsne-p30. */
  idToken: string;
}

export const METHOD_PARAMS: Record<MethodName, readonly ParamDef[]> = {
  tsne: [
    {
      key: 'perplexity', fileKey: 'perplexity', flag: 'perplexity', kind: 'number', default: 30,
      source: 'van der Maaten & Hinton 2008; scikit-learn 1.2 default', min: 1, idToken: 'p',
    },
    {
      key: 'init', fileKey: 'init', flag: 'tsne-init', kind: 'choice', default: 'pca', choices: ['pca', 'random', 'spectral'],
      source: 'Kobak & Linderman 2021 (informative initialisation); scikit-learn 1.2 default', idToken: '',
    },
    {
      key: 'iterations', fileKey: 'iterations', flag: 'iterations', kind: 'integer', default: 1000, min: 251, max: 100000,
      source: 'scikit-learn 1.2 default (250 exaggerated + 750)', idToken: 'it',
    },
  ],
  umap: [
    {
      key: 'nNeighbors', fileKey: 'n_neighbors', flag: 'neighbors', kind: 'integer', default: 15, min: 2,
      source: 'McInnes, Healy & Melville 2018; umap-js 1.4 default', idToken: 'n',
    },
    {
      key: 'minDist', fileKey: 'min_dist', flag: 'min-dist', kind: 'number', default: 0.1, min: 0, max: 1,
      source: 'McInnes, Healy & Melville 2018; umap-js 1.4 default', idToken: 'd',
    },
    {
      key: 'init', fileKey: 'init', flag: 'umap-init', kind: 'choice', default: 'spectral', choices: ['spectral', 'pca', 'random'],
      source: 'McInnes, Healy & Melville 2018 (spectral initialisation, umap-learn default); Kobak & Linderman 2021', idToken: '',
    },
  ],
  pca: [],
};

export const METHOD_NAMES: readonly MethodName[] = ['tsne', 'umap', 'pca'];

/** Stable setting id, e.g. `tsne-p30-pca`, `umap-n15-d0.1`, `pca`. Only non-default iterations appear. */
export function settingId(method: MethodName, params: MethodParams): string {
  const parts: string[] = [method];
  for (const def of METHOD_PARAMS[method]) {
    const v = params[def.key];
    if (v === undefined) continue;
    if (def.key === 'iterations' && v === def.default) continue;
    parts.push(`${def.idToken}${v}`);
  }
  return parts.join('-');
}

/** Parameters as they appear in results.json and the report (snake_case keys). */
export function paramsForFile(method: MethodName, params: MethodParams): Record<string, number | string> {
  const out: Record<string, number | string> = {};
  for (const def of METHOD_PARAMS[method]) {
    const v = params[def.key];
    if (v !== undefined) out[def.fileKey] = v;
  }
  return out;
}

/** Fill in every default of a method. */
export function withDefaults(method: MethodName, params: MethodParams): MethodParams {
  const out: MethodParams = { ...params };
  for (const def of METHOD_PARAMS[method]) {
    if (out[def.key] === undefined) (out as Record<string, unknown>)[def.key] = def.default;
  }
  return out;
}

/**
 * Data-dependent limits: the largest value a setting may take for n rows.
 * Returns a one-line problem description, or null when the setting fits.
 */
export function checkAgainstRows(method: MethodName, params: MethodParams, n: number): string | null {
  if (method === 'tsne') {
    const p = params.perplexity ?? 30;
    const limit = (n - 1) / 3;
    if (!(p < limit)) {
      return `perplexity ${p} needs more rows: t-SNE requires perplexity < (n − 1)/3 = ${fmt(limit)} for n = ${n}`;
    }
  }
  if (method === 'umap') {
    const k = params.nNeighbors ?? 15;
    if (!(k < n)) return `neighbors ${k} needs more rows: UMAP requires n_neighbors < n = ${n}`;
  }
  if (method === 'pca' && n < 3) return `PCA needs at least 3 rows, got ${n}`;
  return null;
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toFixed(2);
}

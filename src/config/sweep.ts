/**
 * Sweep definitions: a YAML file (sweeps/*.yaml) and/or command-line flags,
 * validated into one SweepConfig. Flags override the file key by key.
 */
import { LineCounter, parseDocument, isMap, isSeq, isScalar, type Node as YamlNode } from 'yaml';
import { z } from 'zod';
import { InputError } from '../core/errors.js';
import type { MethodName } from '../core/types.js';
import { METHOD_NAMES, METHOD_PARAMS } from '../embed/methods.js';

export interface DataOptions {
  label?: string;
  id?: string;
  delimiter?: string;
  missing: 'error' | 'drop';
  scale: boolean;
  /** Number of principal components kept before embedding; null = no PCA; 'auto' = 50 when there are more columns. */
  pcaDims: number | null | 'auto';
}

export interface SweepConfig {
  methods: MethodName[];
  tsne: { perplexity: number[]; init: string[]; iterations: number[] };
  umap: { nNeighbors: number[]; minDist: number[]; init: string[] };
  seeds: number[];
  /** Neighbourhood size used by the scores. */
  k: number;
  /** Number of k-means clusters for cluster agreement; null = number of labels, or chosen from the data. */
  clusters: number | null;
  /** 'composite' or one metric name. */
  rankBy: string;
  /**
   * Fraction of rows each run sees; 1 = all rows. Below 1, seed s embeds a
   * seeded random subset of rows (the same subset for every setting), and
   * stability is measured on the rows two runs share.
   */
  resample: number;
  data: DataOptions;
}

/** Partial config as read from a file or from flags, before defaults. */
export interface SweepOverrides {
  methods?: MethodName[];
  tsne?: { perplexity?: number[]; init?: string[]; iterations?: number[] };
  umap?: { n_neighbors?: number[]; min_dist?: number[]; init?: string[] };
  resample?: number;
  seeds?: number | number[];
  k?: number;
  clusters?: number;
  rank_by?: string;
  data?: Partial<{ label: string; id: string; delimiter: string; missing: 'error' | 'drop'; scale: boolean; pca_dims: number | 'none' | 'auto' }>;
}

/** Metrics that `rank_by` accepts besides 'composite'. */
export const RANKABLE = [
  'composite', 'faithfulness', 'stability', 'trustworthiness', 'continuity', 'knn_overlap',
  'procrustes_mean', 'seed_knn_overlap', 'ari_mean',
] as const;

export const DEFAULTS = {
  methods: ['tsne', 'umap', 'pca'] as MethodName[],
  seeds: 3,
  /** k = 15 neighbours for scoring: common practice for local-structure scores (not from a single source). */
  k: 15,
  rankBy: 'composite',
  pcaDimsAuto: 50,
};

const numList = (min: number, exclusive: boolean, int: boolean): z.ZodType<number[]> => {
  let n = int ? z.number().int() : z.number();
  n = exclusive ? n.gt(min) : n.gte(min);
  return z.array(n).min(1).transform((v) => [...new Set(v)]);
};
const oneOrList = <T extends z.ZodTypeAny>(s: T) => z.union([s, z.array(s).min(1)]);

function initList(method: MethodName) {
  const init = METHOD_PARAMS[method].find((p) => p.key === 'init')!;
  return z.preprocess(asList, z.array(z.enum(init.choices as [string, ...string[]])).min(1)).optional();
}

function tsneSchema() {
  return z
    .object({
      perplexity: z.preprocess(asList, numList(1, false, false)).optional(),
      init: initList('tsne'),
      iterations: z.preprocess(asList, numList(251, false, true)).optional(),
    })
    .strict();
}

function asList(v: unknown): unknown {
  return Array.isArray(v) ? v : v === undefined ? v : [v];
}

export const overridesSchema = z
  .object({
    methods: z.preprocess(asList, z.array(z.enum(METHOD_NAMES as unknown as [MethodName, ...MethodName[]])).min(1)).optional(),
    tsne: tsneSchema().optional(),
    umap: z
      .object({
        n_neighbors: z.preprocess(asList, numList(2, false, true)).optional(),
        min_dist: z.preprocess(asList, z.array(z.number().gte(0).lte(1)).min(1)).optional(),
        init: initList('umap'),
      })
      .strict()
      .optional(),
    seeds: oneOrList(z.number().int().gte(0).lte(4294967295)).optional(),
    k: z.number().int().gte(1).optional(),
    clusters: z.number().int().gte(2).optional(),
    rank_by: z.enum(RANKABLE).optional(),
    resample: z.number().gt(0).lte(1).optional(),
    data: z
      .object({
        label: z.string().min(1).optional(),
        id: z.string().min(1).optional(),
        delimiter: z.string().length(1).optional(),
        missing: z.enum(['error', 'drop']).optional(),
        scale: z.boolean().optional(),
        pca_dims: z.union([z.number().int().gte(2), z.literal('none'), z.literal('auto')]).optional(),
      })
      .strict()
      .optional(),
  })
  .strict();

/**
 * Parse and validate a sweep file's text. Errors name the file, line and
 * column of the offending key or value.
 */
export function parseSweepFile(path: string, text: string): SweepOverrides {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    const pos = e.linePos?.[0];
    throw new InputError('sweep.yaml-syntax', `${path}:${pos?.line ?? 1}:${pos?.col ?? 1}: ${firstLine(e.message)}; the sweep file must be valid YAML`);
  }
  const raw = doc.toJS() ?? {};
  const result = overridesSchema.safeParse(raw);
  if (!result.success) {
    const issue = result.error.issues[0];
    const path0 = issue.path as Array<string | number>;
    let node = locate(doc.contents as YamlNode | null, path0);
    if (issue.code === 'unrecognized_keys') {
      const key = (issue as { keys: string[] }).keys[0];
      node = locateKey(doc.contents as YamlNode | null, path0, key) ?? node;
      const where = position(path, node, lineCounter);
      throw new InputError('sweep.unknown-key', `${where}: unknown key '${[...path0, key].join('.')}'; allowed here: ${allowedKeys(path0).join(', ')}`);
    }
    const where = position(path, node, lineCounter);
    throw new InputError('sweep.invalid', `${where}: ${describePath(path0)} ${explain(issue)}`);
  }
  return result.data as SweepOverrides;
}

/** Validate overrides that came from flags (already split into lists). */
export function validateFlagOverrides(o: unknown): SweepOverrides {
  const result = overridesSchema.safeParse(o);
  if (!result.success) {
    const issue = result.error.issues[0];
    const flag = flagName(issue.path as Array<string | number>);
    throw new InputError('flags.invalid', `--${flag}: ${explain(issue)}`);
  }
  return result.data as SweepOverrides;
}

/** Merge file values, then flag values, then defaults, into a complete SweepConfig. */
export function resolveSweep(file: SweepOverrides | null, flags: SweepOverrides): SweepConfig {
  const pick = <T>(a: T | undefined, b: T | undefined, d: T): T => (b !== undefined ? b : a !== undefined ? a : d);
  const f = file ?? {};
  const def = (m: MethodName, key: string): number | string => METHOD_PARAMS[m].find((p) => p.key === key)!.default;
  const seedsRaw = pick(f.seeds, flags.seeds, DEFAULTS.seeds);
  const seeds = typeof seedsRaw === 'number' ? Array.from({ length: seedsRaw }, (_, i) => i + 1) : [...new Set(seedsRaw)];
  if (seeds.length === 0) throw new InputError('sweep.seeds', 'seeds: at least one seed is needed; give a count (e.g. 3) or a list (e.g. 1,2,3)');
  const pcaDimsRaw = pick(f.data?.pca_dims, flags.data?.pca_dims, 'auto' as const);
  return {
    methods: pick(f.methods, flags.methods, DEFAULTS.methods),
    tsne: {
      perplexity: pick(f.tsne?.perplexity, flags.tsne?.perplexity, [def('tsne', 'perplexity') as number]),
      init: pick(f.tsne?.init, flags.tsne?.init, [def('tsne', 'init') as string]),
      iterations: pick(f.tsne?.iterations, flags.tsne?.iterations, [def('tsne', 'iterations') as number]),
    },
    umap: {
      nNeighbors: pick(f.umap?.n_neighbors, flags.umap?.n_neighbors, [def('umap', 'nNeighbors') as number]),
      minDist: pick(f.umap?.min_dist, flags.umap?.min_dist, [def('umap', 'minDist') as number]),
      init: pick(f.umap?.init, flags.umap?.init, [def('umap', 'init') as string]),
    },
    resample: pick(f.resample, flags.resample, 1),
    seeds,
    k: pick(f.k, flags.k, DEFAULTS.k),
    clusters: pick<number | null>(f.clusters, flags.clusters, null),
    rankBy: pick(f.rank_by, flags.rank_by, DEFAULTS.rankBy),
    data: {
      label: pick(f.data?.label, flags.data?.label, undefined),
      id: pick(f.data?.id, flags.data?.id, undefined),
      delimiter: pick(f.data?.delimiter, flags.data?.delimiter, undefined),
      missing: pick(f.data?.missing, flags.data?.missing, 'error'),
      scale: pick(f.data?.scale, flags.data?.scale, false),
      pcaDims: pcaDimsRaw === 'none' ? null : pcaDimsRaw,
    },
  };
}

// ---------- error helpers ----------

function firstLine(s: string): string {
  return s.split('\n')[0].replace(/ at line \d+, column \d+:?$/, '');
}

function explain(issue: z.core.$ZodIssue): string {
  switch (issue.code) {
    case 'invalid_type':
      return `must be ${article(issue.expected)}`;
    case 'too_small':
      if (issue.origin === 'array') return 'needs at least one value';
      return `must be ${issue.inclusive ? 'at least' : 'greater than'} ${String(issue.minimum)}`;
    case 'too_big':
      return `must be ${issue.inclusive ? 'at most' : 'less than'} ${String(issue.maximum)}`;
    case 'invalid_value':
      return `must be one of ${issue.values.map((v) => String(v)).join(', ')}`;
    case 'invalid_union':
      return 'has a value of the wrong kind (see the README for the sweep file format)';
    default:
      return issue.message;
  }
}

function article(expected: string): string {
  if (expected === 'int') return 'a whole number';
  return /^[aeiou]/.test(expected) ? `an ${expected}` : `a ${expected}`;
}

function describePath(p: Array<string | number>): string {
  if (p.length === 0) return 'the file';
  return p.map((s, i) => (typeof s === 'number' ? `[${s}]` : i === 0 ? s : `.${s}`)).join('');
}

function flagName(p: Array<string | number>): string {
  const keys = p.filter((s) => typeof s === 'string') as string[];
  const last = keys[keys.length - 1] ?? 'value';
  if (last === 'init') return `${keys[0]}-init`;
  const map: Record<string, string> = { n_neighbors: 'neighbors', min_dist: 'min-dist', rank_by: 'rank-by', pca_dims: 'pca-dims' };
  return map[last] ?? last;
}

function allowedKeys(p: Array<string | number>): string[] {
  let shape: z.ZodTypeAny = overridesSchema;
  for (const seg of p) {
    const inner = unwrap(shape);
    if (inner instanceof z.ZodObject && typeof seg === 'string') shape = inner.shape[seg] as z.ZodTypeAny;
  }
  const obj = unwrap(shape);
  return obj instanceof z.ZodObject ? Object.keys(obj.shape) : [];
}

function unwrap(s: z.ZodTypeAny): z.ZodTypeAny {
  let cur: z.ZodTypeAny = s;
  while (cur instanceof z.ZodOptional) cur = cur.unwrap() as z.ZodTypeAny;
  return cur;
}

function locate(node: YamlNode | null, path: Array<string | number>): YamlNode | null {
  let cur: YamlNode | null = node;
  for (const seg of path) {
    if (cur && isMap(cur)) {
      const pair = cur.items.find((it) => isScalar(it.key) && String(it.key.value) === String(seg));
      if (!pair) return cur;
      cur = (pair.value as YamlNode | null) ?? (pair.key as YamlNode);
    } else if (cur && isSeq(cur) && typeof seg === 'number') {
      cur = (cur.items[seg] as YamlNode | undefined) ?? cur;
    } else {
      return cur;
    }
  }
  return cur;
}

function locateKey(node: YamlNode | null, path: Array<string | number>, key: string): YamlNode | null {
  const parent = locate(node, path);
  if (parent && isMap(parent)) {
    const pair = parent.items.find((it) => isScalar(it.key) && String(it.key.value) === key);
    if (pair) return pair.key as YamlNode;
  }
  return null;
}

function position(file: string, node: YamlNode | null, lc: LineCounter): string {
  const offset = node?.range?.[0];
  if (offset === undefined) return `${file}:1:1`;
  const pos = lc.linePos(offset);
  return `${file}:${pos.line}:${pos.col}`;
}

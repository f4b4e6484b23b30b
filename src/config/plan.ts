/**
 * Grid expansion: a SweepConfig becomes settings (method × parameter
 * combinations) and runs (setting × seed) with stable ids, plus a time
 * estimate. No computation of embeddings happens here.
 */
import type { MethodName, MethodParams, RunSpec, SettingSpec } from '../core/types.js';
import { checkAgainstRows, settingId, withDefaults } from '../embed/methods.js';
import { RNX_EXACT_LIMIT, RNX_SAMPLE_ROWS } from '../metrics/coranking.js';
import type { SweepConfig } from './sweep.js';

export interface Plan {
  settings: SettingSpec[];
  runs: RunSpec[];
  /** Largest neighbour count any stage needs (t-SNE 3·perplexity+1, UMAP n_neighbors, scoring k), capped at n − 1. */
  kMax: number;
}

/** Expand the grid. PCA is deterministic, so it gets one run whatever the seeds; it is always included as the linear baseline. */
export function expandGrid(cfg: SweepConfig): { settings: SettingSpec[]; runs: RunSpec[] } {
  const settings: SettingSpec[] = [];
  const methods: MethodName[] = cfg.methods.includes('pca') ? [...cfg.methods] : [...cfg.methods, 'pca'];
  for (const method of methods) {
    for (const params of combos(method, cfg)) {
      const full = withDefaults(method, params);
      const seeds = method === 'pca' ? [cfg.seeds[0]] : cfg.seeds;
      settings.push({ id: settingId(method, full), method, params: full, seeds });
    }
  }
  const runs: RunSpec[] = [];
  for (const s of settings) {
    for (const seed of s.seeds) {
      runs.push({ id: `${s.id}-s${seed}`, settingId: s.id, method: s.method, params: s.params, seed });
    }
  }
  return { settings, runs };
}

function combos(method: MethodName, cfg: SweepConfig): MethodParams[] {
  if (method === 'tsne') {
    const out: MethodParams[] = [];
    for (const perplexity of cfg.tsne.perplexity)
      for (const init of cfg.tsne.init)
        for (const iterations of cfg.tsne.iterations) out.push({ perplexity, init, iterations });
    return out;
  }
  if (method === 'umap') {
    const out: MethodParams[] = [];
    for (const nNeighbors of cfg.umap.nNeighbors)
      for (const minDist of cfg.umap.minDist) for (const init of cfg.umap.init) out.push({ nNeighbors, minDist, init });
    return out;
  }
  return [{}];
}

/** Every setting that does not fit n rows, as one-line messages. */
export function rowLimitProblems(settings: SettingSpec[], n: number, k: number): string[] {
  const problems: string[] = [];
  for (const s of settings) {
    const p = checkAgainstRows(s.method, s.params, n);
    if (p) problems.push(`setting ${s.id}: ${p}`);
  }
  if (!(k < n - 1)) problems.push(`k ${k} needs more rows: scoring requires k < n − 1 = ${n - 1}`);
  return problems;
}

/** Neighbour columns needed by the runs and the scores. */
export function neighboursNeeded(settings: SettingSpec[], k: number, n: number): number {
  let kMax = k;
  for (const s of settings) {
    if (s.method === 'tsne') kMax = Math.max(kMax, Math.floor(3 * (s.params.perplexity ?? 30)) + 1);
    if (s.method === 'umap') kMax = Math.max(kMax, (s.params.nNeighbors ?? 15) - 1);
  }
  return Math.min(kMax, n - 1);
}

/**
 * Seconds one run is expected to take on one core, from a cost model fitted
 * to timings of this version on the reference machine (2-core x86-64, Node 20;
 * see README "Performance"). Used only for `plan` and the ETA.
 */
export function estimateRunSeconds(method: MethodName, params: MethodParams, n: number): number {
  const nlogn = n * Math.log2(Math.max(n, 2));
  if (method === 'tsne') {
    const it = params.iterations ?? 1000;
    const perp = params.perplexity ?? 30;
    return 0.05 + COST.tsnePerNlognIter * nlogn * it + COST.tsnePerEdgeIter * n * 3 * perp * it;
  }
  if (method === 'umap') {
    const epochs = n <= 10_000 ? 500 : 200; // umap-learn's rule, as the engine uses
    const k = params.nNeighbors ?? 15;
    return 0.05 + COST.umapPerEdgeEpoch * n * k * epochs + COST.umapPerPoint * n;
  }
  return 0.01 + COST.pcaPerCell * n;
}

/** Cost constants (seconds per unit of work). */
export const COST = {
  tsnePerNlognIter: 0.85e-7,
  tsnePerEdgeIter: 1.5e-9,
  umapPerEdgeEpoch: 3.6e-8,
  umapPerPoint: 4.0e-4,
  pcaPerCell: 1e-6,
  /** Exact neighbour search on 2 threads: 0.27 s at 1,500 × 150, 1.4 s at 10,000 × 50, 24 s at 50,000 × 50. */
  knnPerPairDim: 2.2e-10,
  /** Scoring index: per (query row × row × (reference column + 1)); demo: 1.0 s at 1,500 × 100. */
  scoringIndexPerCell: 4.4e-9,
  /** Setting stability, main thread: per (seed pair × row); demo: 0.48 s for 21 pairs at 1,500 rows. */
  stabilityPerPairRow: 1.5e-5,
  /** Scoring one run, per 1,000 rows: 0.3–0.4 s at 1,500 rows, 2.2–2.7 s at 10,000, 8–10 s at 50,000 (measured). */
  scorePerRun: 0.22,
};

/**
 * Whole-sweep estimate: one-off neighbour search and scoring index, then
 * runs spread over the workers, then the per-setting stability scores (on
 * the main thread, one seed pair at a time).
 */
export function estimateSweepSeconds(
  runs: RunSpec[],
  n: number,
  d: number,
  workers: number,
  kMax: number,
  dReference: number = d,
): { total: number; neighbours: number; scoringIndex: number; runs: number; stability: number } {
  const neighbours = 0.15 + COST.knnPerPairDim * n * n * (d + (dReference !== d ? dReference : 0)) + 1e-7 * n * kMax;
  const queries = n <= RNX_EXACT_LIMIT ? n : Math.min(n, RNX_SAMPLE_ROWS);
  const scoringIndex = COST.scoringIndexPerCell * queries * n * (dReference + 1);
  const perRun = runs.map((r) => estimateRunSeconds(r.method, r.params, n) + COST.scorePerRun * (n / 1000));
  // Longest-first greedy assignment to workers, as the pool roughly behaves.
  const loads = new Array<number>(Math.max(1, workers)).fill(0);
  for (const t of [...perRun].sort((a, b) => b - a)) {
    let m = 0;
    for (let w = 1; w < loads.length; w++) if (loads[w] < loads[m]) m = w;
    loads[m] += t * (workers > 1 ? 1.15 : 1); // two busy cores run ~15% slower each (measured)
  }
  const runsTime = Math.max(...loads);
  const seedsPerSetting = new Map<string, number>();
  for (const r of runs) seedsPerSetting.set(r.settingId, (seedsPerSetting.get(r.settingId) ?? 0) + 1);
  let pairs = 0;
  for (const s of seedsPerSetting.values()) pairs += (s * (s - 1)) / 2;
  const stability = COST.stabilityPerPairRow * n * pairs;
  return { total: neighbours + scoringIndex + runsTime + stability, neighbours, scoringIndex, runs: runsTime, stability };
}

/**
 * The whole audit: load → preprocess → neighbours → runs (executor) →
 * scores → rank → results. Returns everything to be written; writing is
 * left to the caller so a failure part-way leaves earlier outputs intact.
 */
import os from 'node:os';
import { InputError } from '../core/errors.js';
import { RESULTS_FORMAT, type ResultsJson, type RunRecord, type StabilityRecord } from '../core/results.js';
import { Rng, deriveSeed } from '../core/rng.js';
import type { Dataset, Embedding, KnnGraph, RunSpec, SettingSpec } from '../core/types.js';
import { VERSION } from '../core/version.js';
import { estimateRunSeconds, expandGrid, neighboursNeeded, rowLimitProblems, estimateSweepSeconds } from '../config/plan.js';
import type { SweepConfig } from '../config/sweep.js';
import { paramsForFile } from '../embed/methods.js';
import { InlineExecutor, PoolExecutor } from '../exec/pool.js';
import type { Executor, RunOutcome } from '../exec/executor.js';
import { settingStability } from './stability.js';
import { labelCodes as codesOf, labelOrder } from './labels.js';
import { kmeansLabels } from '../metrics/clustering.js';
import { leastStablePoints, pointStabilityStats } from '../metrics/points.js';
import { buildScoringIndex, distanceSample, scoringSummary } from '../metrics/scoring.js';
import { rankSettings } from '../rank/rank.js';
import { chooseClusters } from './clusters.js';
import { loadData, neighbours, preprocess, rankRowsFor, scoringNeighbours, DATA_SEED } from './prepare.js';
import { knnPrefix } from '../neighbors/exact.js';
import { workFraction, type ProgressSink } from './progress.js';
import { runOne, type RunContext } from './run-one.js';

export interface AuditRequest {
  dataPath: string;
  sweep: SweepConfig;
  /** Worker threads; 0 runs everything on the main thread. */
  workers: number;
  /** The command line, for provenance. */
  command: string;
  /** ISO date for provenance (passed in so tests can fix it). */
  created: string;
}

export interface AuditOutput {
  results: ResultsJson;
  /** run id → embedding, for successful runs. */
  embeddings: Map<string, Embedding>;
  /** setting id → per-row point stability (NaN where not compared). */
  points: Map<string, Float64Array>;
  warnings: string[];
}

export function defaultWorkers(): number {
  return Math.max(1, typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length);
}

export async function runAudit(req: AuditRequest, progress: ProgressSink): Promise<AuditOutput> {
  const cfg = req.sweep;
  const started = performance.now();
  progress.stage('loading', 1);
  const { dataset, warnings } = await loadData(req.dataPath, cfg.data);
  for (const w of warnings) progress.warn(w);

  const { settings, runs } = expandGrid(cfg);
  const problems = rowLimitProblems(settings, dataset.matrix.n, cfg.k);
  if (problems.length > 0) {
    throw new InputError('sweep.too-few-rows', `${dataset.path}: ${dataset.matrix.n} rows are too few for ${problems[0]}${problems.length > 1 ? ` (and ${problems.length - 1} more)` : ''}`);
  }

  progress.stage('preprocessing', 1);
  const threads = Math.max(1, req.workers);
  const prep = preprocess(dataset, warnings, cfg.data, threads);
  const X = prep.X;
  const kMax = neighboursNeeded(settings, cfg.k, X.n);
  const est = estimateSweepSeconds(runs, X.n, X.d, Math.max(1, req.workers), kMax, prep.reference.d);
  const clock = stageClock();
  progress.stage('neighbours', 1, est.neighbours);
  // Scores measure faithfulness to the features before PCA; without PCA that is the same space.
  // Spare columns let subsets (--resample) find their neighbours without a rescan.
  const refK = Math.min(X.n - 1, 2 * cfg.k + 10);
  let knn: KnnGraph;
  let knnReference: KnnGraph;
  if (prep.reference === X) {
    // One exact search serves the methods and the scores (above EXACT_KNN_LIMIT rows too:
    // the scores need it exact, and the methods then need no search of their own).
    const both = scoringNeighbours(X, Math.max(kMax, refK), threads);
    knn = both.k === kMax ? both : knnPrefix(both, kMax);
    knnReference = both.k === refK ? both : knnPrefix(both, refK);
  } else {
    // Different spaces (PCA in front): the methods' graph is exact up to EXACT_KNN_LIMIT rows,
    // NN-descent above; the scores' graph is always exact.
    knn = neighbours(X, kMax, threads);
    knnReference = scoringNeighbours(prep.reference, refK, threads);
  }
  progress.tick(1);
  clock.lap('neighbours');

  progress.stage('scoring index', 1, est.scoringIndex);
  const choice = chooseClusters(X, dataset.labels, cfg.data.label, cfg.clusters);
  const labelCodes = dataset.labels ? codesOf(dataset.labels) : null;
  const groups = labelCodes ? null : kmeansLabels(X, choice.clusters, new Rng(deriveSeed(DATA_SEED, 'groups')));
  const scoring = buildScoringIndex(prep.reference, knnReference, { k: cfg.k, labels: labelCodes, groups, seed: DATA_SEED });
  progress.tick(1);
  clock.lap('scoring_index');

  const ctx: RunContext = { X, knn, k: cfg.k, reference: prep.reference, knnReference, resample: cfg.resample, scoring, fuzzyGraphs: new Map() };
  const executor: Executor = req.workers > 0 ? new PoolExecutor(ctx, req.workers) : new InlineExecutor(ctx, runOne);
  progress.stage('runs', runs.length, est.runs);
  let done = 0;
  const costs = runs.map((r) => estimateRunSeconds(r.method, r.params, X.n));
  const finished = runs.map(() => false);
  const position = new Map(runs.map((r, i) => [r.id, i]));
  let outcomes: RunOutcome[];
  try {
    outcomes = await executor.runAll(runs, (o) => {
      done++;
      finished[position.get(o.id) ?? 0] = true;
      if (!o.ok) progress.warn(`run ${o.id} failed: ${o.error}`);
      progress.tick(done, o.id, workFraction(costs, finished, Math.max(1, req.workers)));
    });
  } finally {
    await executor.close();
  }

  const embeddings = new Map<string, Embedding>();
  const points = new Map<string, Float64Array>();
  const records: RunRecord[] = runs.map((spec, i) => toRecord(spec, outcomes[i], X.n, embeddings));
  clock.lap('runs');

  progress.stage('stability', settings.length, est.stability);
  const inputs = settings.map((spec, si) => {
    const mine = records.filter((r) => r.setting === spec.id);
    const embs = mine.filter((r) => r.status === 'ok').map((r) => embeddings.get(r.id)!);
    const stability = stabilityOf(embs, cfg.k, choice.clusters, spec.id, perturbations(spec, cfg.resample), labelCodes, dataset, points);
    progress.tick(si + 1, spec.id);
    return { spec, runs: mine, stability };
  });
  const settingRecords = rankSettings(inputs, cfg.rankBy);
  clock.lap('stability');

  const results: ResultsJson = {
    format: RESULTS_FORMAT,
    steadyfold: { version: VERSION },
    provenance: { command: req.command, created: req.created, cores: os.cpus().length, node: process.version },
    dataset: {
      path: dataset.path,
      n: dataset.matrix.n,
      d: dataset.matrix.d,
      sha256: dataset.sha256,
      label: cfg.data.label ?? null,
      id: cfg.data.id ?? null,
      dropped_rows: dataset.droppedRows,
      dropped_columns: dataset.droppedColumns,
      preprocess: {
        scale: cfg.data.scale,
        pca_dims: prep.pcaDims,
        explained_variance_ratio: prep.explainedVarianceRatio,
        input_dims: dataset.matrix.d,
        scored_against: cfg.data.scale ? 'the input features after z-scoring, before PCA' : 'the input features, before PCA',
      },
      labels: dataset.labels,
      ids: dataset.ids,
      scoring: { ...scoringSummary(scoring), rank_rows: rankRowsFor(X.n)?.length ?? X.n },
      distance_sample: distanceSample(scoring, SHEPARD_PAIRS),
    },
    sweep: {
      k: cfg.k,
      clusters: choice.clusters,
      clusters_source: choice.source,
      seeds: cfg.seeds,
      rank_by: cfg.rankBy,
      workers: req.workers,
      resample: cfg.resample,
      estimated_seconds: Math.round(est.total * 10) / 10,
      seconds: Math.round((performance.now() - started) / 100) / 10,
      stage_seconds: clock.laps,
    },
    runs: records,
    settings: settingRecords,
  };
  return { results, embeddings, points, warnings };
}

/** Wall-clock seconds between successive laps, by stage name (rounded to 0.01 s). */
function stageClock(): { lap(name: string): void; laps: Record<string, number> } {
  let last = performance.now();
  const laps: Record<string, number> = {};
  return {
    laps,
    lap(name: string) {
      const now = performance.now();
      laps[name] = Math.round((now - last) / 10) / 100;
      last = now;
    },
  };
}

function toRecord(spec: RunSpec, o: RunOutcome, n: number, embeddings: Map<string, Embedding>): RunRecord {
  const base = {
    id: spec.id,
    setting: spec.settingId,
    method: spec.method,
    params: paramsForFile(spec.method, spec.params),
    seed: spec.seed,
    cache: 'computed' as const,
  };
  if (!o.ok) {
    return { ...base, seconds: 0, status: 'failed', error: o.error, embedding: null, metrics: { trustworthiness: null, continuity: null, knn_overlap: null } };
  }
  const out = o.output;
  embeddings.set(spec.id, out.rows ? { n: out.rows.length, data: out.embedding, rows: out.rows } : { n, data: out.embedding });
  const rec: RunRecord = { ...base, seconds: round3(out.seconds), score_seconds: round3(out.scoreSeconds), status: 'ok', embedding: embeddingPath(spec.id), metrics: out.metrics, rnx_curve: out.rnxCurve };
  if (out.rows) rec.rows = out.rows.length;
  return rec;
}

/** Pairs kept in results.json for Shepard-style figures. */
const SHEPARD_PAIRS = 2000;

export function embeddingPath(runId: string): string {
  return `embeddings/${runId}.csv`;
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/** What differs between the runs of a setting, in words for the report. */
export function perturbations(spec: SettingSpec, resample: number): string[] {
  if (spec.method === 'pca' || spec.seeds.length < 2) return [];
  const out: string[] = [];
  const init = spec.params.init;
  if (spec.method === 'tsne') {
    out.push(init === 'random' ? 'seed: random initialisation' : `seed: nothing (${init} initialisation and the neighbour graph do not depend on it)`);
  } else {
    out.push(`seed: negative sampling${init === 'random' ? ' and random initialisation' : `, ${init} initialisation (tiny noise only)`}`);
  }
  if (resample < 1) out.push(`row resample: each seed embeds a different ${Math.round(resample * 100)} % of the rows`);
  return out;
}

function stabilityOf(
  embs: Embedding[],
  k: number,
  clusters: number,
  settingId: string,
  perturbed: string[],
  labelCodes: Int32Array | null,
  dataset: Dataset,
  points: Map<string, Float64Array>,
): StabilityRecord {
  if (embs.length < 2) {
    return { procrustes_mean: null, procrustes_max: null, seed_knn_overlap: null, ari_mean: null, pairs: 0, identical_maps: false, perturbations: perturbed };
  }
  const n = dataset.matrix.n;
  const s = settingStability(embs, n, { k, clusters, rng: new Rng(deriveSeed(DATA_SEED, settingId, 'stability')), labels: labelCodes });
  const labelText = dataset.labels ? labelOrder(dataset.labels) : null;
  const idOf = (row: number): string => (dataset.ids ? dataset.ids[row] : String(row + 1));
  let pointSummary: StabilityRecord['points'] = null;
  if (!s.identicalMaps && s.points.some((v) => Number.isFinite(v))) {
    points.set(settingId, s.points);
    const st = pointStabilityStats(s.points);
    pointSummary = {
      mean: st.mean,
      p10: st.p10,
      least_stable: leastStablePoints(s.points, LEAST_STABLE_LISTED).map((p) => ({
        row: p.row + 1,
        id: idOf(p.row),
        label: dataset.labels ? dataset.labels[p.row] : null,
        value: p.value,
      })),
      points_file: pointsPath(settingId),
    };
  }
  return {
    procrustes_mean: s.procrustesMean,
    procrustes_max: s.procrustesMax,
    seed_knn_overlap: s.seedKnnOverlap,
    ari_mean: s.ariMean,
    pairs: s.pairs,
    identical_maps: s.identicalMaps,
    perturbations: perturbed,
    clusters: s.clusters
      .filter((c) => Number.isFinite(c.meanJaccard))
      .map((c) => ({
        cluster: c.cluster,
        size: c.size,
        mean_jaccard: c.meanJaccard,
        reading: c.reading,
        majority_label: labelText && c.majorityLabel !== null ? labelText[c.majorityLabel] : null,
      })),
    points: pointSummary,
  };
}

/** How many of the least stable points results.json lists per setting. */
const LEAST_STABLE_LISTED = 20;

export function pointsPath(settingId: string): string {
  return `points/${settingId}.csv`;
}

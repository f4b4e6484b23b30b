/**
 * `steadyfold score <data> <embedding.csv>`: scores for an embedding made
 * anywhere, against the features as loaded (z-scored with --scale), never
 * after PCA — the same space `audit` scores in — so the numbers match
 * scikit-learn's trustworthiness on the same two tables.
 */
import { InputError } from '../../core/errors.js';
import { embeddingAsMatrix } from '../../core/matrix.js';
import { readEmbeddingCsv } from '../../io/embedding-csv.js';
import { exactKnn } from '../../neighbors/exact.js';
import { defaultWorkers } from '../../pipeline/audit.js';
import { continuity, knnOverlap, trustworthiness } from '../../metrics/neighbourhood.js';
import { procrustes } from '../../metrics/procrustes.js';
import { DATA_SEED, loadData, preprocess, rankRowsFor } from '../../pipeline/prepare.js';
import { buildScoringIndex, scoreStructure, scoringSummary } from '../../metrics/scoring.js';
import { labelCodes } from '../../pipeline/labels.js';
import { sweepFromArgv } from './common.js';

export async function run(argv: Record<string, unknown>): Promise<void> {
  const cfg = await sweepFromArgv({ ...argv, k: undefined, 'pca-dims': 'none' });
  const k = Number(argv.k);
  const { dataset, warnings } = await loadData(String(argv.data), cfg.data);
  for (const w of warnings) process.stderr.write(`warning: ${w}\n`);
  if (dataset.droppedRows > 0) {
    throw new InputError('score.dropped-rows', `${dataset.path}: ${dataset.droppedRows} rows were dropped, so rows no longer line up with the embedding; fix the missing values instead of --missing drop`);
  }
  const X = preprocess(dataset, warnings, cfg.data).reference;
  const embPath = String(argv.embedding);
  const emb = await readEmbeddingCsv(embPath);
  if (emb.n !== X.n) throw new InputError('score.row-count', `${embPath}: has ${emb.n} rows but ${dataset.path} has ${X.n}; the embedding must have one row per data row, in the same order`);
  if (!Number.isInteger(k) || k < 1 || k > X.n - 2) throw new InputError('flags.k', `--k: ${String(argv.k)} is not allowed; give a whole number from 1 to n − 2 = ${X.n - 2}`);
  const Y = embeddingAsMatrix(emb);
  const knnX = exactKnn(X, Math.min(X.n - 1, k), { threads: defaultWorkers() });
  const knnY = exactKnn(Y, k);
  const labels = dataset.labels ? labelCodes(dataset.labels) : null;
  const index = buildScoringIndex(X, knnX, { k, labels, seed: DATA_SEED });
  const structure = scoreStructure(index, Y, knnY);
  const rankRows = rankRowsFor(X.n);
  const scores: Record<string, number | null> = {
    trustworthiness: trustworthiness(X, Y, k, { knnX, knnY, rows: rankRows }),
    continuity: continuity(X, Y, k, { knnX, knnY, rows: rankRows }),
    knn_overlap: knnOverlap(knnX, knnY, k).fraction,
    auc_rnx: structure.auc_rnx,
    distance_spearman: structure.distance_spearman,
    centroid_spearman: structure.centroid_spearman,
    density_correlation: structure.density_correlation,
    label_silhouette: structure.label_silhouette,
    label_knn_accuracy: structure.label_knn_accuracy,
  };
  const sampling = { ...scoringSummary(index), rank_rows: rankRows?.length ?? X.n };
  if (typeof argv.against === 'string') {
    const other = await readEmbeddingCsv(argv.against);
    if (other.n !== X.n) throw new InputError('score.row-count', `${argv.against}: has ${other.n} rows but ${embPath} has ${X.n}; both embeddings must cover the same rows in the same order`);
    const Z = embeddingAsMatrix(other);
    scores.procrustes_disparity = procrustes(Y, Z).disparity;
    scores.knn_overlap_between = knnOverlap(knnY, exactKnn(Z, k), k).fraction;
  }
  if (argv.json === true) {
    process.stdout.write(JSON.stringify({ data: dataset.path, embedding: embPath, n: X.n, k, scores, sampling }, null, 2) + '\n');
    return;
  }
  const lines = [`${embPath} against ${dataset.path} (n = ${X.n}, k = ${k})`];
  for (const [name, v] of Object.entries(scores)) lines.push(`  ${name.padEnd(22)} ${v === null || !Number.isFinite(v) ? 'n/a' : v.toFixed(6)}`);
  if (!sampling.distance_all_pairs) lines.push(`  (distance_spearman on a seeded sample of ${sampling.distance_pairs} pairs)`);
  if (sampling.rnx_rows < X.n) lines.push(`  (auc_rnx estimated from ${sampling.rnx_rows} seeded query rows)`);
  process.stdout.write(lines.join('\n') + '\n');
}

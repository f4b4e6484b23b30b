/**
 * Writing an audit's outputs and reading them back. Everything is computed
 * before the first write, and every file is written atomically with the
 * report written last, so a failed command never leaves a half-written
 * results folder and never damages a previous audit's report.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { InputError } from '../core/errors.js';
import { RESULTS_FORMAT, type ResultsJson } from '../core/results.js';
import type { Embedding } from '../core/types.js';
import type { ReportFiles } from '../report/index.js';
import { writeFileAtomic } from './atomic.js';
import { formatEmbeddingCsv, readEmbeddingCsv } from './embedding-csv.js';

export async function writeAuditOutputs(
  dir: string,
  results: ResultsJson,
  embeddings: ReadonlyMap<string, Embedding>,
  report: ReportFiles,
): Promise<void> {
  for (const run of results.runs) {
    if (run.embedding === null) continue;
    const e = embeddings.get(run.id);
    if (!e) continue;
    await writeFileAtomic(path.join(dir, run.embedding), formatEmbeddingCsv(e));
  }
  await writeFileAtomic(path.join(dir, 'results.json'), JSON.stringify(results, null, 2) + '\n');
  await writeReportFiles(dir, report);
}

export async function writeReportFiles(dir: string, report: ReportFiles): Promise<void> {
  for (const f of report.figures) await writeFileAtomic(path.join(dir, 'figures', `${f.name}.svg`), f.svg);
  await writeFileAtomic(path.join(dir, 'report.md'), report.markdown);
  await writeFileAtomic(path.join(dir, 'report.html'), report.html);
}

/** Read results.json and every embedding it names. */
export async function readResultsDir(dir: string): Promise<{ results: ResultsJson; embeddings: Map<string, Embedding> }> {
  const file = path.join(dir, 'results.json');
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    throw new InputError('report.missing-results', `${file}: cannot read results.json; give a folder written by 'steadyfold audit'`);
  }
  let results: ResultsJson;
  try {
    results = JSON.parse(text) as ResultsJson;
  } catch (e) {
    throw new InputError('report.bad-results', `${file}: not valid JSON (${(e as Error).message}); rerun 'steadyfold audit' to rewrite it`);
  }
  if (results.format !== RESULTS_FORMAT) {
    throw new InputError('report.format', `${file}: format '${String(results.format)}' is not '${RESULTS_FORMAT}'; rerun 'steadyfold audit' with this version`);
  }
  const embeddings = new Map<string, Embedding>();
  for (const run of results.runs) {
    if (run.status !== 'ok' || run.embedding === null) continue;
    embeddings.set(run.id, await readEmbeddingCsv(path.join(dir, run.embedding)));
  }
  return { results, embeddings };
}

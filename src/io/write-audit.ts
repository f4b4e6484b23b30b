/**
 * Writing an audit's outputs and reading them back. Everything is computed
 * before the first write, and every file is written atomically with the
 * report written last, so a failed command never leaves a half-written
 * results folder and never damages a previous audit's report.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { InputError, InternalError } from '../core/errors.js';
import { RESULTS_FORMAT, type ResultsJson } from '../core/results.js';
import type { Embedding } from '../core/types.js';
import type { ReportFiles } from '../report/index.js';
import { writeFileAtomic } from './atomic.js';
import { RecordReader, decodeUtf8, quoteText, readBytes } from './delimited.js';
import { formatEmbeddingCsv, readEmbeddingCsv } from './embedding-csv.js';

/**
 * Write everything an audit produced: the embeddings, the per-point
 * stability files named by the settings (`points_file`, see
 * `formatPointsCsv`), results.json, then the report.
 *
 * @param points setting id → stability of every data row (NaN = unknown); settings without an entry get no file
 */
export async function writeAuditOutputs(
  dir: string,
  results: ResultsJson,
  embeddings: ReadonlyMap<string, Embedding>,
  report: ReportFiles,
  points?: ReadonlyMap<string, Float64Array>,
): Promise<void> {
  for (const run of results.runs) {
    if (run.embedding === null) continue;
    const e = embeddings.get(run.id);
    if (!e) continue;
    await writeFileAtomic(path.join(dir, run.embedding), formatEmbeddingCsv(e));
  }
  if (points) {
    const ids = results.dataset.ids ?? Array.from({ length: results.dataset.n }, (_, i) => String(i + 1));
    for (const s of results.settings) {
      const file = s.stability.points?.points_file;
      const values = points.get(s.id);
      if (!file || !values) continue;
      await writeFileAtomic(path.join(dir, file), formatPointsCsv(values, ids));
    }
  }
  await writeFileAtomic(path.join(dir, 'results.json'), JSON.stringify(results, null, 2) + '\n');
  await writeReportFiles(dir, report);
}

/**
 * Write the report: figures/<name>.svg and figures/<name>.png, settings.csv,
 * report.md, and report.html last (so a report.html on disk always comes
 * with its figures).
 */
export async function writeReportFiles(dir: string, report: ReportFiles): Promise<void> {
  for (const f of report.figures) await writeFileAtomic(path.join(dir, 'figures', `${f.name}.svg`), f.svg);
  for (const f of report.pngs) await writeFileAtomic(path.join(dir, 'figures', `${f.name}.png`), f.png);
  await writeFileAtomic(path.join(dir, 'settings.csv'), report.settingsCsv);
  await writeFileAtomic(path.join(dir, 'report.md'), report.markdown);
  await writeFileAtomic(path.join(dir, 'report.html'), report.html);
}

/** What `readResultsDir` returns: the results, the embeddings of the successful runs and the per-point stability values. */
export interface ResultsDir {
  results: ResultsJson;
  embeddings: Map<string, Embedding>;
  /** setting id → stability of every data row (NaN where the file has no value); settings whose points file is not named or not there are absent. */
  points: Map<string, Float64Array>;
}

/** Read results.json, every embedding it names and every per-point stability file. */
export async function readResultsDir(dir: string): Promise<ResultsDir> {
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
  const points = new Map<string, Float64Array>();
  const ids = results.dataset.ids ?? Array.from({ length: results.dataset.n }, (_, i) => String(i + 1));
  for (const s of results.settings) {
    const file = s.stability.points?.points_file;
    if (!file) continue;
    try {
      points.set(s.id, await readPointsCsv(path.join(dir, file), ids));
    } catch (err) {
      // A points file that is not there only costs the report its point-stability map.
      if (err instanceof InputError && err.code === `${PP}.missing-file`) continue;
      throw err;
    }
  }
  return { results, embeddings, points };
}

const PP = 'points';

/**
 * The text of a per-point stability file: header `row,id,stability`, one
 * line per data row with its 1-based row number (as in embedding files and
 * in results.json's least_stable list), its id (quoted as RFC 4180 asks when
 * needed) and its value in shortest round-trip form, empty when unknown.
 *
 * @param values stability of every data row (NaN = unknown)
 * @param ids id of every data row
 */
export function formatPointsCsv(values: Float64Array, ids: readonly string[]): string {
  if (ids.length !== values.length) throw new InternalError(`${values.length} point values for ${ids.length} rows`);
  const parts: string[] = new Array(values.length + 1);
  parts[0] = 'row,id,stability\n';
  for (let i = 0; i < values.length; i++) {
    const id = ids[i];
    const text = /[",\r\n]/.test(id) || id !== id.trim() ? `"${id.replace(/"/g, '""')}"` : id;
    parts[i + 1] = `${i + 1},${text},${Number.isFinite(values[i]) ? String(values[i]) : ''}\n`;
  }
  return parts.join('');
}

/**
 * Read a per-point stability file: header `row,id,stability`, one line per
 * data row. The row column may count from 0 or from 1: the base used is the
 * one under which the id on every line is the data set's id of that row
 * (`ids`), which also checks that the file belongs to these results. An
 * empty or non-numeric stability cell reads as NaN (unknown).
 *
 * @param file path of the CSV
 * @param ids id of every data row (1-based row numbers as text when the data set has no id column)
 * @returns n stability values, NaN for rows the file does not list
 * @throws InputError points.missing-file, points.unreadable, points.not-text,
 *   points.header, points.bad-row, points.ids
 */
export async function readPointsCsv(file: string, ids: readonly string[]): Promise<Float64Array> {
  const text = decodeUtf8(await readBytes(file, PP), file, PP);
  const reader = new RecordReader(text, ',', file, PP);
  if (!reader.next()) throw new InputError(`${PP}.header`, `${file}: the file is empty; a points file starts with the header row,id,stability`);
  const names: string[] = [];
  for (let j = 0; j < reader.count; j++) names.push(reader.field(j).trim());
  const cRow = names.indexOf('row');
  const cId = names.indexOf('id');
  const cVal = names.indexOf('stability');
  if (cRow < 0 || cId < 0 || cVal < 0) {
    throw new InputError(
      `${PP}.header`,
      `${file}:1: the header is ${quoteText(names.join(','))}; a points file needs the columns row, id and stability; rerun 'steadyfold audit' to rewrite it`,
    );
  }
  const n = ids.length;
  const rows: number[] = [];
  const fileIds: string[] = [];
  const vals: number[] = [];
  const lines: number[] = [];
  while (reader.next()) {
    const r = Number(reader.field(cRow).trim());
    if (!Number.isInteger(r) || r < 0 || r > n) {
      throw new InputError(
        `${PP}.bad-row`,
        `${file}:${reader.line}: row ${quoteText(reader.field(cRow))} is not a data row of these results (0 to ${n}); rerun 'steadyfold audit' to rewrite the file`,
      );
    }
    rows.push(r);
    fileIds.push(cId < reader.count ? reader.field(cId) : '');
    const raw = cVal < reader.count ? reader.field(cVal).trim() : '';
    const v = raw === '' ? NaN : Number(raw);
    vals.push(Number.isFinite(v) ? v : NaN);
    lines.push(reader.line);
  }
  const fits = (base: number): number => {
    for (let t = 0; t < rows.length; t++) {
      const i = rows[t] - base;
      if (i < 0 || i >= n || ids[i] !== fileIds[t]) return t;
    }
    return -1;
  };
  const bad0 = fits(0);
  const base = bad0 < 0 ? 0 : fits(1) < 0 ? 1 : -1;
  if (base < 0) {
    throw new InputError(
      `${PP}.ids`,
      `${file}:${lines[bad0]}: id ${quoteText(fileIds[bad0])} at row ${rows[bad0]} is not the id of that data row; ` +
        `the file does not belong to these results; rerun 'steadyfold audit' to rewrite it`,
    );
  }
  const out = new Float64Array(n).fill(NaN);
  for (let t = 0; t < rows.length; t++) out[rows[t] - base] = vals[t];
  return out;
}

/**
 * Report stage: turns a results.json object and the embeddings of its
 * successful runs into a self-contained HTML page, a Markdown document and
 * SVG figures. Pure: no file I/O, no clock, no console; the same input gives
 * the same bytes. The caller writes `report.html`, `report.md` and
 * `figures/<name>.svg`.
 */
import type { ResultsJson } from '../core/results.js';
import type { Embedding } from '../core/types.js';
import { renderHtml } from './html.js';
import { renderMarkdown } from './markdown.js';
import { buildModel } from './model.js';

export { escapeHtml, escapeMarkdown } from './escape.js';
export { figurePath } from './markdown.js';
export { OKABE_ITO, OTHER_GREY, UNIFORM_COLOUR, assignColours } from './palette.js';
export type { ColourAssignment, LegendEntry } from './palette.js';
export { MAP_BOX, MAP_INSET, scatterPoints } from './scatter.js';
export type { PlotBox, ScatterPoints } from './scatter.js';
export { MAX_POINTS_PER_SEED, subsampleRows } from './subsample.js';

export interface ReportInput {
  results: ResultsJson;
  /** run id → embedding, for runs with status 'ok' (loaded by the caller). */
  embeddings: ReadonlyMap<string, Embedding>;
}

export interface ReportFiles {
  /** report.html content. */
  html: string;
  /** report.md content; links figures as relative paths 'figures/<name>.svg'. */
  markdown: string;
  /** Written by the caller to figures/<name>.svg; names are unique, lower-case, [a-z0-9-]. */
  figures: Array<{ name: string; svg: string }>;
}

/**
 * Build the report files.
 *
 * Figures: 'explained-variance' (only when PCA was applied), then one
 * 'map-<setting id slug>' per mapped setting: the top 3 ranked settings, the
 * best-ranked setting of each method and the PCA baseline, each with all its
 * successful seeds Procrustes-aligned onto the first seed and overlaid.
 * Maps of data sets with more than 3,000 rows draw a stratified,
 * seeded subsample of 3,000 rows (see `subsampleRows`).
 *
 * @throws InternalError when an embedding's point count differs from dataset.n
 */
export function buildReport(input: ReportInput): ReportFiles {
  const model = buildModel(input.results, input.embeddings);
  const figures: Array<{ name: string; svg: string }> = [];
  if (model.varianceFigure) figures.push({ name: model.varianceFigure.name, svg: model.varianceFigure.fileSvg });
  for (const f of model.maps) figures.push({ name: f.name, svg: f.fileSvg });
  return { html: renderHtml(model), markdown: renderMarkdown(model), figures };
}

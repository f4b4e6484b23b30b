/**
 * Report stage: turns a results.json object and the embeddings of its
 * successful runs into a self-contained HTML page, a Markdown document, SVG
 * figures with PNG copies, and a settings table as CSV. Pure: no file I/O
 * of its own, no clock, no console; the same input gives the same bytes.
 * The caller writes `report.html`, `report.md`, `settings.csv`,
 * `figures/<name>.svg` and `figures/<name>.png`.
 */
import type { ResultsJson } from '../core/results.js';
import type { Embedding } from '../core/types.js';
import { settingsCsv } from './csv.js';
import { renderHtml } from './html.js';
import { renderMarkdown } from './markdown.js';
import { buildModel } from './model.js';
import type { Figure, ReportModel } from './model.js';
import { svgToPng } from './png.js';

export { escapeHtml, escapeMarkdown } from './escape.js';
export { figurePath, pngPath } from './markdown.js';
export { OKABE_ITO, OTHER_GREY, UNIFORM_COLOUR, VIRIDIS, assignColours, viridis } from './palette.js';
export type { ColourAssignment, LegendEntry } from './palette.js';
export { MAP_BOX, MAP_INSET, scatterPoints } from './scatter.js';
export type { PlotBox, ScatterPoints } from './scatter.js';
export { MAX_POINTS_PER_SEED, subsampleRows } from './subsample.js';
export { GRID_POINTS_PER_PANEL, GRID_POINT_BUDGET, POINT_MAP_POINTS, SHEPARD_PAIRS } from './figures.js';
export { settingsCsv } from './csv.js';
export { svgToPng } from './png.js';
export { HENNIG_DISSOLVED, HENNIG_NOTE, HENNIG_STABLE } from './words.js';

export interface ReportInput {
  results: ResultsJson;
  /** run id → embedding, for runs with status 'ok' (loaded by the caller); a run of a row resample carries `rows`. */
  embeddings: ReadonlyMap<string, Embedding>;
  /**
   * setting id → stability of each data row's neighbourhood across seeds
   * (n values, NaN where unknown), read from the settings' `points_file`.
   * Without it the point-stability map is left out.
   */
  points?: ReadonlyMap<string, Float64Array>;
}

export interface ReportOptions {
  /** Render the PNG copies (default true). Without them `pngs` is empty and the Markdown shows the SVG files. */
  png?: boolean;
}

export interface ReportFiles {
  /** report.html content. */
  html: string;
  /** report.md content; shows figures/<name>.png linked to figures/<name>.svg (only the SVG without PNGs). */
  markdown: string;
  /** Written by the caller to figures/<name>.svg; names are unique, lower-case, [a-z0-9-]. */
  figures: Array<{ name: string; svg: string }>;
  /** PNG copy of every figure, same names, written to figures/<name>.png. */
  pngs: Array<{ name: string; png: Uint8Array }>;
  /** settings.csv content: one line per setting, ranked order, then unranked. */
  settingsCsv: string;
}

/** Every figure of the model in document order. */
export function modelFigures(model: ReportModel): Figure[] {
  const out: Figure[] = [];
  if (model.varianceFigure) out.push(model.varianceFigure);
  out.push(...model.gridFigures);
  if (model.rnxFigure) out.push(model.rnxFigure);
  out.push(...model.maps);
  if (model.seedGrid) out.push(model.seedGrid);
  if (model.pointMap) out.push(model.pointMap);
  if (model.shepard) out.push(model.shepard);
  return out;
}

/**
 * Build the report files.
 *
 * Figures, in order, each only when the results hold what it needs:
 * 'explained-variance' (with PCA; the kept components marked);
 * 'heatmap-<method>' and 'scores-<method>' (every score over the grid of a
 * method whose parameters vary: cells of mean ± sd over seeds, and lines
 * against the first parameter with a mean ± sd band); 'rnx-curves' (R_NX(K)
 * of the leading settings, needs runs[].rnx_curve); one 'map-<setting>' per
 * leading setting (top 3, best of each method, PCA baseline; all seeds
 * overlaid after Procrustes alignment); 'seed-grid' (every setting by every
 * seed, each aligned onto its first seed); 'point-stability' (needs
 * `points`); 'shepard' (needs dataset.distance_sample). Large data sets are
 * drawn from seeded stratified subsamples (see `subsampleRows`), with the
 * rule stated on each figure.
 *
 * @throws InternalError when an embedding does not fit the data set's rows
 */
export function buildReport(input: ReportInput, options: ReportOptions = {}): ReportFiles {
  const model = buildModel(input.results, input.embeddings, input.points);
  const withPng = options.png ?? true;
  const figures = modelFigures(model);
  return {
    html: renderHtml(model),
    markdown: renderMarkdown(model, withPng),
    figures: figures.map((f) => ({ name: f.name, svg: f.fileSvg })),
    pngs: withPng ? figures.map((f) => ({ name: f.name, png: svgToPng(f.fileSvg) })) : [],
    settingsCsv: settingsCsv(input.results.settings),
  };
}

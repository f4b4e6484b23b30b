/**
 * The report's content, independent of the output format: every text here is
 * plain and unescaped; the HTML and Markdown renderers escape it.
 */
import { AGREEMENT_BANDS } from '../rank/rank.js';
import { InternalError } from '../core/errors.js';
import { embeddingAsMatrix } from '../core/matrix.js';
import type { ResultsJson, RunRecord, SettingRecord } from '../core/results.js';
import { deriveSeed } from '../core/rng.js';
import type { Embedding } from '../core/types.js';
import { alignTo } from '../metrics/procrustes.js';
import { count, fixed, meanSd, methodName, metricName, paramsText, settingLabel, shortHash } from './format.js';
import { assignColours } from './palette.js';
import { mapSvg } from './scatter.js';
import { MAX_POINTS_PER_SEED, subsampleRows } from './subsample.js';
import { varianceSvg } from './variance.js';

/** One table cell: display text plus the value the sortable table orders by. */
export interface Cell {
  text: string;
  /** Number for numeric columns (null = missing, sorts last), text otherwise. */
  sort: number | string | null;
}

export interface Column {
  header: string;
  numeric: boolean;
}

export interface Figure {
  /** File name without extension, unique within the report. */
  name: string;
  /** SVG for a file of its own (with namespace, no per-point titles). */
  fileSvg: string;
  /** SVG for inlining in the HTML page. */
  inlineSvg: string;
  /** Alt text / title. */
  alt: string;
  /** Caption paragraphs. */
  caption: string[];
}

export interface ReportModel {
  title: string;
  summary: string[];
  notRanked: string[];
  cautions: string[];
  mapCaution: string;
  data: Array<{ term: string; text: string; full?: string }>;
  varianceFigure: Figure | null;
  varianceNote: string;
  columns: Column[];
  rows: Cell[][];
  verdicts: Array<{ setting: string; verdict: string }>;
  maps: Figure[];
  mapsSkipped: string[];
  provenance: Array<{ term: string; text: string }>;
  glossary: Array<{ term: string; text: string }>;
}

/** The metrics always given a column, in this order; others follow when present. */
const CORE_METRICS = ['trustworthiness', 'continuity', 'knn_overlap'];

/**
 * ARI bands used to word whether clusters held across seeds: ≥ 0.80 "held",
 * ≥ 0.65 "partly held", below "did not hold". They follow the recovery bands
 * suggested by Steinley (2004), "Properties of the Hubert–Arabie adjusted
 * Rand index", Psychological Methods 9(3) (values recalled from the paper).
 */
const ARI_HELD = AGREEMENT_BANDS.good;
const ARI_PARTLY = AGREEMENT_BANDS.moderate;

export function buildModel(results: ResultsJson, embeddings: ReadonlyMap<string, Embedding>): ReportModel {
  const ds = results.dataset;
  const sweep = results.sweep;
  const pre = ds.preprocess;
  const ordered = orderSettings(results.settings);
  const ranked = ordered.filter((s) => s.rank !== null);

  // ---- 1. summary
  const summary: string[] = [];
  const bestByMethod = new Map<string, SettingRecord>();
  for (const s of ranked) if (!bestByMethod.has(s.method)) bestByMethod.set(s.method, s);
  for (const [method, s] of bestByMethod) {
    const st = s.stability;
    summary.push(
      `${methodName(method)}: ${paramsText(s.params)} ranks first among ${methodName(method)} settings ` +
        `(overall rank ${s.rank} of ${ranked.length}, composite score ${fixed(s.score)}). ` +
        `${heldPhrase(st.ari_mean)}: ARI mean ${fixed(st.ari_mean)}, seed kNN overlap ${fixed(st.seed_knn_overlap)}, ` +
        `Procrustes mean ${fixed(st.procrustes_mean)}.`,
    );
  }
  if (ranked.length === 0) summary.push('No setting could be ranked.');
  const notRanked: string[] = [];
  for (const s of ordered) {
    if (s.rank !== null) continue;
    notRanked.push(`${settingLabel(s.method, s.params)}: not ranked: ${unrankedReason(s, results.runs)}.`);
  }

  // ---- 2. cautions
  const preText = preprocessText(pre.scale, pre.pca_dims);
  const cautions = [
    'In t-SNE and UMAP maps the distances between clusters are not meaningful: two groups drawn far apart are not ' +
      'shown to be more different than two groups drawn close together.',
    'In t-SNE and UMAP maps the size and spread of a cluster are not meaningful either: these methods even out ' +
      'densities, so a tight small cluster and a wide large one may be alike in the data.',
    'A map is a hypothesis to check, not evidence that clusters exist. Confirm a group you see in a map on the ' +
      'original data, or with an analysis that does not depend on the map.',
    `All results depend on the preprocessing (${preText}) and on the neighbourhood size used for scoring ` +
      `(k = ${sweep.k}). Other choices can give other scores and another order.`,
  ];
  const mapCaution =
    'Reading the maps: distances between clusters and the sizes of clusters in the t-SNE and UMAP maps are not ' +
    'meaningful, and a cluster seen here is a hypothesis to check, not evidence that it exists. The maps also depend ' +
    `on the preprocessing (${preText}) and the scores on k = ${sweep.k}.`;

  // ---- 3. data
  const labelCount = ds.labels === null ? 0 : new Set(ds.labels).size;
  const data: ReportModel['data'] = [
    { term: 'file', text: ds.path },
    { term: 'rows (n)', text: count(ds.n) },
    { term: 'input dimensions (d)', text: count(ds.d) },
    {
      term: 'label column',
      text: ds.label === null ? 'none' : `${ds.label} (${count(labelCount)} distinct labels)`,
    },
    { term: 'id column', text: ds.id === null ? 'none (rows are numbered from 1)' : ds.id },
    { term: 'sha256', text: shortHash(ds.sha256), full: ds.sha256 },
    { term: 'rows dropped', text: count(ds.dropped_rows) },
    {
      term: 'columns dropped (zero variance)',
      text: ds.dropped_columns.length === 0 ? 'none' : ds.dropped_columns.join(', '),
    },
    { term: 'scaling', text: pre.scale ? 'yes' : 'no' },
    {
      term: 'PCA',
      text:
        pre.pca_dims === null
          ? `none (methods see all ${count(pre.input_dims)} dimensions)`
          : `${count(pre.input_dims)} → ${count(pre.pca_dims)} dimensions`,
    },
    ...(pre.scored_against ? [{ term: 'scores measured against', text: pre.scored_against }] : []),
  ];
  const evr = pre.explained_variance_ratio;
  let varianceFigure: Figure | null = null;
  let varianceNote = 'No PCA step, so there is no explained-variance chart.';
  if (evr.length > 0) {
    const cumulative = evr.reduce((a, b) => a + b, 0);
    varianceNote = '';
    varianceFigure = {
      name: 'explained-variance',
      fileSvg: varianceSvg(evr, true),
      inlineSvg: varianceSvg(evr, false),
      alt: 'Explained-variance ratio per principal component, with the cumulative share',
      caption: [
        `Share of the variance${pre.scale ? ' of the scaled data' : ''} carried by each of the ${evr.length} kept ` +
          `principal components (bars) and the running total (line). Together they keep ${fixed(cumulative * 100, 1)} % ` +
          'of the variance.',
      ],
    };
  }

  // ---- 4. table
  const metricKeys = metricColumns(results.settings);
  const columns: Column[] = [
    { header: 'rank', numeric: true },
    { header: 'method', numeric: false },
    { header: 'parameters', numeric: false },
    { header: 'composite score', numeric: true },
    { header: 'faithfulness part', numeric: true },
    { header: 'stability part', numeric: true },
    ...metricKeys.map((k) => ({ header: `${metricName(k)} (mean ± sd)`, numeric: true })),
    { header: 'Procrustes mean', numeric: true },
    { header: 'Procrustes max', numeric: true },
    { header: 'seed kNN overlap', numeric: true },
    { header: 'ARI mean', numeric: true },
  ];
  const rows: Cell[][] = ordered.map((s) => [
    { text: s.rank === null ? 'not ranked' : String(s.rank), sort: s.rank },
    { text: methodName(s.method), sort: methodName(s.method) },
    { text: paramsText(s.params), sort: paramsText(s.params) },
    numCell(s.score),
    numCell(s.score_parts.faithfulness),
    numCell(s.score_parts.stability),
    ...metricKeys.map((k) => {
      const m = s.metrics[k];
      return { text: meanSd(m), sort: m && m.mean !== null && Number.isFinite(m.mean) ? m.mean : null };
    }),
    numCell(s.stability.procrustes_mean),
    numCell(s.stability.procrustes_max),
    numCell(s.stability.seed_knn_overlap),
    numCell(s.stability.ari_mean),
  ]);

  // ---- 6. verdicts
  const verdicts = ordered.map((s) => ({ setting: settingLabel(s.method, s.params), verdict: s.verdict }));

  // ---- 5. maps
  const chosen = chooseMaps(ordered);
  const ids = ds.ids ?? Array.from({ length: ds.n }, (_, i) => String(i + 1));
  const colours = assignColours(ds.n, ds.labels);
  const rowsDrawn = subsampleRows(ds.n, ds.labels, MAX_POINTS_PER_SEED, deriveSeed(0, 'report.map-rows', ds.sha256));
  const subsampled = rowsDrawn.length < ds.n;
  const maps: Figure[] = [];
  const mapsSkipped: string[] = [];
  const usedNames = new Set<string>(varianceFigure ? [varianceFigure.name] : []);
  for (const { setting: s, why } of chosen) {
    const runs = okRuns(s, results.runs, embeddings);
    const label = settingLabel(s.method, s.params);
    if (runs.length === 0) {
      mapsSkipped.push(`${label}: no map, because no run of this setting produced an embedding.`);
      continue;
    }
    const raw = runs.map((r) => {
      const e = embeddings.get(r.id)!;
      if (e.n !== ds.n) {
        throw new InternalError(`embedding of run ${r.id} has ${e.n} points, the data set has ${ds.n}`);
      }
      return e;
    });
    const { layers: aligned, seeds, skipped } = alignForMap(
      raw,
      runs.map((r) => r.seed),
    );
    const name = uniqueName(`map-${slug(s.id)}`, usedNames);
    const title = `Map of ${label}, ${seeds.length} seed${seeds.length === 1 ? '' : 's'} overlaid`;
    const common = { layers: aligned, seeds, rows: rowsDrawn, colours, ids, labels: ds.labels, title };
    const caption: string[] = [];
    const rankText = s.rank === null ? 'not ranked' : `rank ${s.rank}, composite score ${fixed(s.score)}`;
    caption.push(`${label} (${rankText}; shown as ${why}).`);
    if (seeds.length > 1) {
      caption.push(
        `${seeds.length} seeds overlaid. Seed ${seeds[0]} is drawn as filled dots; seeds ${seeds.slice(1).join(', ')} ` +
          `are drawn as open rings after a Procrustes alignment (rotation, reflection, uniform scaling and shift) ` +
          `onto seed ${seeds[0]}. Where the seeds agree, rings sit around dots.`,
      );
      if (s.stability.identical_maps) caption.push('Every seed gave the same map, so the rings sit exactly on the dots.');
    } else {
      caption.push(`One seed (${seeds[0]}); nothing to overlay.`);
    }
    const missing = s.seeds.filter((seed) => !seeds.includes(seed) && !skipped.includes(seed));
    if (missing.length > 0) caption.push(`Not drawn (run failed or missing): seed ${missing.join(', ')}.`);
    if (skipped.length > 0) {
      caption.push(
        `Not drawn: seed ${skipped.join(', ')}, whose map could not be aligned (for example all its points coincide).`,
      );
    }
    caption.push(
      ds.labels === null
        ? 'No label column, so all points have one colour.'
        : colours.hasOther
          ? 'Colour shows the label; the 8 most frequent labels have their own colour and all others are grey ("other").'
          : 'Colour shows the label.',
    );
    if (subsampled) {
      caption.push(
        `Drawn: ${count(rowsDrawn.length)} of ${count(ds.n)} points per seed, the same points for every seed and map. ` +
          'They are a random sample stratified by label (each label keeps at least one point and otherwise its share ' +
          'of the rows, rounded by largest remainder), drawn with a fixed seed derived from the data hash, so the ' +
          'sample is the same every time the report is built.',
      );
    }
    maps.push({
      name,
      fileSvg: mapSvg({ ...common, pointTitles: false, standalone: true }),
      inlineSvg: mapSvg({ ...common, pointTitles: ds.n <= MAX_POINTS_PER_SEED, standalone: false }),
      alt: title,
      caption,
    });
  }

  // ---- 7. provenance
  const provenance = [
    { term: 'steadyfold version', text: results.steadyfold.version },
    { term: 'command', text: results.provenance.command },
    { term: 'data sha256', text: ds.sha256 },
    { term: 'created', text: results.provenance.created },
    { term: 'cores', text: String(results.provenance.cores) },
    { term: 'Node.js', text: results.provenance.node },
    { term: 'ranked by', text: sweep.rank_by },
    { term: 'neighbourhood size k', text: String(sweep.k) },
    { term: 'clusters for ARI', text: `${sweep.clusters} (chosen by: ${sweep.clusters_source})` },
    { term: 'seeds', text: sweep.seeds.join(', ') },
    { term: 'workers', text: String(sweep.workers) },
  ];

  // ---- 8. glossary
  const k = sweep.k;
  const glossary = [
    {
      term: 'trustworthiness',
      text:
        `Whether the ${k} nearest neighbours of a point in the map were also near it in the data. Points that the map ` +
        'puts close together although they are far apart in the data lower it, more so the farther apart they were. ' +
        'From 0 to 1, higher is better (Venna & Kaski 2001).',
    },
    {
      term: 'continuity',
      text:
        `The converse: whether the ${k} nearest neighbours of a point in the data stay near it in the map. Neighbours ` +
        'that the map tears away lower it. From 0 to 1, higher is better (Venna & Kaski 2001).',
    },
    {
      term: 'kNN overlap',
      text: `The average share of each point's ${k} nearest neighbours in the data that are also among its ${k} nearest in the map. From 0 to 1, higher is better.`,
    },
    {
      term: 'KL divergence',
      text:
        'Shown for t-SNE only: the Kullback–Leibler divergence between the neighbour probabilities of the data and ' +
        'of the map, the quantity t-SNE minimises. Lower is better; it is comparable only between runs with the same perplexity.',
    },
    {
      term: 'Procrustes disparity',
      text:
        'How different two seeds\u2019 maps are in shape. Both maps are centred and scaled to unit size, the second is ' +
        'rotated, reflected and scaled to fit the first as well as possible, and the remaining sum of squared ' +
        'differences is the disparity (the standardisation of scipy.spatial.procrustes). 0 means the same shape up to ' +
        'those moves; 1 is the worst. Mean and max are over all pairs of seeds.',
    },
    {
      term: 'seed kNN overlap',
      text: `kNN overlap between two seeds\u2019 maps (k = ${k}) instead of between data and map, averaged over pairs of seeds.`,
    },
    {
      term: 'ARI mean',
      text:
        `Each seed\u2019s map is split into ${sweep.clusters} clusters by k-means; the adjusted Rand index (Hubert & Arabie 1985) ` +
        'measures how well two such splits agree, corrected for chance: 1 is the same split, about 0 is chance level. ' +
        `Averaged over pairs of seeds. In the summary, clusters "held" when it is at least ${fixed(ARI_HELD, 2)} and ` +
        `"partly held" when at least ${fixed(ARI_PARTLY, 2)}, following the recovery bands suggested by Steinley (2004).`,
    },
    {
      term: 'composite score (our definition)',
      text:
        'composite = mean of the faithfulness part and the stability part. faithfulness part = mean of trustworthiness, ' +
        'continuity and kNN overlap. stability part = mean of (1 − Procrustes mean), seed kNN overlap and ARI mean. ' +
        'All parts lie in [0, 1] and higher is better. A setting whose seeds all gave the same map is not ranked, because ' +
        'its stability was never tested.',
    },
  ];

  return {
    title: `Embedding audit of ${ds.path}`,
    summary,
    notRanked,
    cautions,
    mapCaution,
    data,
    varianceFigure,
    varianceNote,
    columns,
    rows,
    verdicts,
    maps,
    mapsSkipped,
    provenance,
    glossary,
  };
}

/** Ranked settings by rank (ties by id), then unranked ones in their given order. */
export function orderSettings(settings: readonly SettingRecord[]): SettingRecord[] {
  const ranked = settings
    .filter((s) => s.rank !== null)
    .sort((a, b) => a.rank! - b.rank! || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return [...ranked, ...settings.filter((s) => s.rank === null)];
}

/**
 * Settings that get a map, in drawing order: the top 3 ranked, then the best
 * ranked setting of each method, then the PCA baseline (best-ranked PCA
 * setting, else the first one listed), without repeats.
 */
export function chooseMaps(ordered: readonly SettingRecord[]): Array<{ setting: SettingRecord; why: string }> {
  const out: Array<{ setting: SettingRecord; why: string }> = [];
  const seen = new Set<string>();
  const add = (s: SettingRecord, why: string): void => {
    if (seen.has(s.id)) return;
    seen.add(s.id);
    out.push({ setting: s, why });
  };
  const ranked = ordered.filter((s) => s.rank !== null);
  for (const s of ranked.slice(0, 3)) add(s, `one of the 3 best-ranked settings`);
  const methodsDone = new Set<string>();
  for (const s of ranked) {
    if (methodsDone.has(s.method)) continue;
    methodsDone.add(s.method);
    add(s, `the best-ranked ${methodName(s.method)} setting`);
  }
  const pca = ordered.find((s) => s.method === 'pca');
  if (pca) add(pca, 'the PCA baseline');
  return out;
}

/**
 * Align every seed onto the first with `alignTo`, leaving out a seed whose
 * map cannot be aligned (RangeError: a degenerate map) instead of failing the
 * whole report.
 */
function alignForMap(
  raw: readonly Embedding[],
  allSeeds: readonly number[],
): { layers: Embedding[]; seeds: number[]; skipped: number[] } {
  const layers: Embedding[] = [raw[0]];
  const seeds = [allSeeds[0]];
  const skipped: number[] = [];
  const reference = embeddingAsMatrix(raw[0]);
  for (let s = 1; s < raw.length; s++) {
    try {
      const moved = alignTo(reference, embeddingAsMatrix(raw[s]));
      layers.push({ n: moved.n, data: moved.data });
      seeds.push(allSeeds[s]);
    } catch (err) {
      if (!(err instanceof RangeError)) throw err;
      skipped.push(allSeeds[s]);
    }
  }
  return { layers, seeds, skipped };
}

function okRuns(s: SettingRecord, runs: readonly RunRecord[], embeddings: ReadonlyMap<string, Embedding>): RunRecord[] {
  const order = (seed: number): number => {
    const i = s.seeds.indexOf(seed);
    return i < 0 ? s.seeds.length : i;
  };
  return runs
    .filter((r) => r.setting === s.id && r.status === 'ok' && embeddings.has(r.id))
    .sort((a, b) => order(a.seed) - order(b.seed) || a.seed - b.seed || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}

function unrankedReason(s: SettingRecord, runs: readonly RunRecord[]): string {
  if (s.stability.identical_maps) return 'every seed gave the same map, so seeds tested nothing';
  const mine = runs.filter((r) => r.setting === s.id);
  if (mine.length > 0 && mine.every((r) => r.status === 'failed')) return 'every run of this setting failed';
  if (s.method === 'pca') return 'the linear baseline: PCA is deterministic, so seeds do not apply';
  return 'too few successful runs to score it';
}

function heldPhrase(ari: number | null): string {
  if (ari === null || !Number.isFinite(ari)) return 'Whether its clusters held across seeds is unknown';
  if (ari >= ARI_HELD) return 'Its clusters held across seeds';
  if (ari >= ARI_PARTLY) return 'Its clusters partly held across seeds';
  return 'Its clusters did not hold across seeds';
}

function preprocessText(scale: boolean, pcaDims: number | null): string {
  return `scaling ${scale ? 'on' : 'off'}, ${pcaDims === null ? 'no PCA' : `PCA to ${pcaDims} dimensions`}`;
}

function metricColumns(settings: readonly SettingRecord[]): string[] {
  const present = new Set<string>();
  for (const s of settings) for (const key of Object.keys(s.metrics)) present.add(key);
  const keys = [...CORE_METRICS];
  if (present.has('kl_divergence')) keys.push('kl_divergence');
  const extra = [...present].filter((k) => !keys.includes(k)).sort();
  return [...keys, ...extra];
}

function numCell(v: number | null): Cell {
  return { text: fixed(v), sort: v !== null && Number.isFinite(v) ? v : null };
}

function slug(id: string): string {
  const s = id
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s.length > 0 ? s.slice(0, 60) : 'setting';
}

function uniqueName(base: string, used: Set<string>): string {
  let name = base;
  for (let i = 2; used.has(name); i++) name = `${base}-${i}`;
  used.add(name);
  return name;
}

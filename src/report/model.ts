/**
 * The report's content, independent of the output format: every text here is
 * plain and unescaped; the HTML and Markdown renderers escape it.
 */
import { AGREEMENT_BANDS } from '../rank/rank.js';
import type { ResultsJson, RunRecord, SettingRecord } from '../core/results.js';
import { deriveSeed } from '../core/rng.js';
import type { Embedding } from '../core/types.js';
import { alignLayout } from './align.js';
import {
  gridFigures,
  okRunsOf,
  pointMapFigure,
  rnxFigure,
  rowLayouts,
  seedGridFigure,
  shepardFigure,
  slugOf,
  uniqueName,
} from './figures.js';
import type { FigureContext } from './figures.js';
import { count, fixed, meanSd, methodName, metricName, paramsText, settingLabel, shortHash } from './format.js';
import { assignColours } from './palette.js';
import { mapSvg } from './scatter.js';
import { MAX_POINTS_PER_SEED, subsampleRows } from './subsample.js';
import { varianceSvg } from './variance.js';
import { HENNIG_DISSOLVED, HENNIG_NOTE, HENNIG_STABLE, clusterCounts, headline, perturbationPhrase, readClusters, settingSentence } from './words.js';

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
  /** Which setting to use and whether its clusters survive seed changes; null when nothing was ranked. */
  headline: { pick: string; clusters: string } | null;
  /** The best setting of each method, one line each. */
  summary: string[];
  /** One sentence per setting (ranked order, then unranked) with its numbers and thresholds. */
  settingSentences: string[];
  /** Attribution of the cluster-stability thresholds, when cluster stability is reported. */
  hennigNote: string | null;
  notRanked: string[];
  cautions: string[];
  mapCaution: string;
  data: Array<{ term: string; text: string; full?: string }>;
  varianceFigure: Figure | null;
  varianceNote: string;
  columns: Column[];
  rows: Cell[][];
  verdicts: Array<{ setting: string; verdict: string }>;
  /** Heatmaps and line charts of the scores over the grid. */
  gridFigures: Figure[];
  rnxFigure: Figure | null;
  maps: Figure[];
  mapsSkipped: string[];
  seedGrid: Figure | null;
  pointMap: Figure | null;
  shepard: Figure | null;
  /** Id and label of every row drawn with a hover tooltip, by row (ascending). */
  hoverPoints: Array<{ row: number; id: string; label: string | null }>;
  provenance: Array<{ term: string; text: string }>;
  glossary: Array<{ term: string; text: string }>;
}

/** The metrics always given a column, in this order; others follow when present. */
const CORE_METRICS = ['trustworthiness', 'continuity', 'knn_overlap'];
/** Optional metrics in the order they get a column when present; unknown ones follow in code-unit order. */
const KNOWN_METRICS = [
  'kl_divergence',
  'auc_rnx',
  'distance_spearman',
  'centroid_spearman',
  'density_correlation',
  'label_silhouette',
  'label_knn_accuracy',
];

/**
 * ARI bands used to word whether clusters held across seeds: ≥ 0.80 "held",
 * ≥ 0.65 "partly held", below "did not hold". They follow the recovery bands
 * suggested by Steinley (2004), "Properties of the Hubert–Arabie adjusted
 * Rand index", Psychological Methods 9(3) (values recalled from the paper).
 */
const ARI_HELD = AGREEMENT_BANDS.good;
const ARI_PARTLY = AGREEMENT_BANDS.moderate;

/**
 * Everything the report shows, computed once for both renderers.
 *
 * @param results the results.json object
 * @param embeddings run id → embedding (all rows, or the rows named in `rows`)
 * @param points setting id → per-point stability (n values, NaN = unknown)
 * @throws InternalError when an embedding does not fit the data set's rows
 */
export function buildModel(
  results: ResultsJson,
  embeddings: ReadonlyMap<string, Embedding>,
  points?: ReadonlyMap<string, Float64Array>,
): ReportModel {
  const ds = results.dataset;
  const sweep = results.sweep;
  const pre = ds.preprocess;
  const ordered = orderSettings(results.settings);
  const ranked = ordered.filter((s) => s.rank !== null);
  const layouts = rowLayouts(results, embeddings);

  // ---- 1. summary
  const summary: string[] = [];
  const bestByMethod = new Map<string, SettingRecord>();
  for (const s of ranked) if (!bestByMethod.has(s.method)) bestByMethod.set(s.method, s);
  for (const [method, s] of bestByMethod) {
    const st = s.stability;
    const hasC = st.clusters !== undefined && st.clusters.length > 0;
    summary.push(
      `${methodName(method)}: ${paramsText(s.params)} ranks first among ${methodName(method)} settings ` +
        `(overall rank ${s.rank} of ${ranked.length}, composite score ${fixed(s.score)}). ` +
        `${hasC ? 'Across seeds' : heldPhrase(st.ari_mean)}: ARI mean ${fixed(st.ari_mean)}, seed kNN overlap ${fixed(st.seed_knn_overlap)}, ` +
        `Procrustes mean ${fixed(st.procrustes_mean)}${hasC ? `; ${clusterCounts(st.clusters!)}` : ''}. ` +
        `${capitalise(perturbationPhrase(s, results))}.`,
    );
  }
  if (ranked.length === 0) summary.push('No setting could be ranked.');
  const settingSentences = ordered.map((s) => settingSentence(s, ranked.length, results));
  const hasClusters = ordered.some((s) => s.stability.clusters && s.stability.clusters.length > 0);
  const hennigNote = hasClusters
    ? `Cluster stability: each k-means cluster of a setting's first-seed map is matched, in every other seed's map, to ` +
      `the cluster it overlaps best (Jaccard similarity of the point sets), and the mean over the other seeds is read ` +
      `against the thresholds ${HENNIG_STABLE} (stable) and ${HENNIG_DISSOLVED} (dissolved): ${HENNIG_NOTE}`
    : null;
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
    ...(ds.scoring
      ? [
          { term: 'R_NX query rows', text: count(ds.scoring.rnx_rows) },
          ...(ds.scoring.rank_rows !== undefined
            ? [
                {
                  term: 'rows trustworthiness and continuity average over',
                  text:
                    ds.scoring.rank_rows >= ds.n
                      ? `all ${count(ds.n)}`
                      : `${count(ds.scoring.rank_rows)} of ${count(ds.n)}, a seeded sample (ranks among all rows)`,
                },
              ]
            : []),
          {
            term: 'pairs for the distance Spearman',
            text: ds.scoring.distance_all_pairs
              ? `all ${count(ds.scoring.distance_pairs)} pairs`
              : `${count(ds.scoring.distance_pairs)} pairs, a seeded sample`,
          },
        ]
      : []),
    ...(sweep.resample !== undefined && sweep.resample < 1
      ? [{ term: 'row resample', text: `each seed embeds a seeded ${fixed(sweep.resample * 100, 0)} % of the rows` }]
      : []),
  ];
  const evr = pre.explained_variance_ratio;
  let varianceFigure: Figure | null = null;
  let varianceNote = 'No PCA step, so there is no explained-variance chart.';
  if (evr.length > 0) {
    const cumulative = evr.reduce((a, b) => a + b, 0);
    varianceNote = '';
    varianceFigure = {
      name: 'explained-variance',
      fileSvg: varianceSvg(evr, true, pre.pca_dims ?? evr.length),
      inlineSvg: varianceSvg(evr, false, pre.pca_dims ?? evr.length),
      alt: 'Explained-variance ratio per principal component, with the cumulative share',
      caption: [
        `Share of the variance${pre.scale ? ' of the scaled data' : ''} carried by each of the ${evr.length} kept ` +
          `principal components (bars) and the running total (line). Together they keep ${fixed(cumulative * 100, 1)} % ` +
          'of the variance; the dashed line marks the last component kept, and the methods see only the components ' +
          'left of it.',
      ],
    };
  }

  // ---- 4. table
  const metricKeys = metricColumns(results.settings);
  const hasPoints = ordered.some((s) => s.stability.points);
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
    ...(hasClusters ? [{ header: `stable clusters (≥ ${HENNIG_STABLE})`, numeric: true }] : []),
    ...(hasPoints ? [{ header: 'point stability (mean)', numeric: true }] : []),
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
    ...(hasClusters ? [clusterCell(s)] : []),
    ...(hasPoints ? [numCell(s.stability.identical_maps ? null : (s.stability.points?.mean ?? null))] : []),
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
    const runs = okRunsOf(s, results.runs, layouts);
    const label = settingLabel(s.method, s.params);
    if (runs.length === 0) {
      mapsSkipped.push(`${label}: no map, because no run of this setting produced an embedding.`);
      continue;
    }
    const raw = runs.map((r) => layouts.get(r.id)!);
    const { layers: aligned, seeds, skipped } = alignForMap(
      raw,
      runs.map((r) => r.seed),
    );
    const name = uniqueName(`map-${slugOf(s.id)}`, usedNames);
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

  // ---- figures over the grid and per seed
  const ctx: FigureContext = {
    results,
    ordered,
    layouts,
    colours,
    ids,
    usedNames,
    hoverRows: new Set<number>(),
  };
  const grid = gridFigures(ctx, metricKeys);
  const rnx = rnxFigure(
    ctx,
    chosen.map((c) => c.setting),
  );
  const seedGrid = seedGridFigure(ctx);
  const pointMap = pointMapFigure(ctx, points);
  const shepard = shepardFigure(ctx);
  const hoverPoints = [...ctx.hoverRows]
    .sort((a, b) => a - b)
    .map((row) => ({ row, id: ids[row], label: ds.labels === null ? null : ds.labels[row] }));

  // ---- 7. provenance
  const runsOk = results.runs.filter((r) => r.status === 'ok').length;
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
    {
      term: 'sweep',
      text:
        `${count(results.settings.length)} settings (${[...new Set(results.settings.map((s) => methodName(s.method)))].join(', ')}), ` +
        `${count(results.runs.length)} runs, ${count(runsOk)} succeeded`,
    },
    ...(sweep.resample !== undefined ? [{ term: 'row resample fraction', text: String(sweep.resample) }] : []),
    { term: 'workers', text: String(sweep.workers) },
    ...(sweep.seconds !== undefined ? [{ term: 'wall-clock seconds of the audit', text: fixed(sweep.seconds, 1) }] : []),
    ...(sweep.estimated_seconds !== undefined
      ? [{ term: 'estimated seconds (plan)', text: fixed(sweep.estimated_seconds, 1) }]
      : []),
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

  glossary.push(...extraGlossary(results, k));

  return {
    title: `Embedding audit of ${ds.path}`,
    headline: headline(ranked),
    summary,
    settingSentences,
    hennigNote,
    notRanked,
    cautions,
    mapCaution,
    data,
    varianceFigure,
    varianceNote,
    columns,
    rows,
    verdicts,
    gridFigures: grid,
    rnxFigure: rnx,
    maps,
    mapsSkipped,
    seedGrid,
    pointMap,
    shepard,
    hoverPoints,
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
 * Align every seed onto the first (`alignLayout`: Procrustes over the rows
 * both maps hold), leaving out a seed whose map cannot be aligned
 * (RangeError: a degenerate map) instead of failing the whole report.
 */
function alignForMap(
  raw: readonly Embedding[],
  allSeeds: readonly number[],
): { layers: Embedding[]; seeds: number[]; skipped: number[] } {
  const layers: Embedding[] = [raw[0]];
  const seeds = [allSeeds[0]];
  const skipped: number[] = [];
  for (let s = 1; s < raw.length; s++) {
    try {
      layers.push(alignLayout(raw[0], raw[s]).layout);
      seeds.push(allSeeds[s]);
    } catch (err) {
      if (!(err instanceof RangeError)) throw err;
      skipped.push(allSeeds[s]);
    }
  }
  return { layers, seeds, skipped };
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
  for (const k of KNOWN_METRICS) if (present.has(k)) keys.push(k);
  const extra = [...present].filter((k) => !keys.includes(k)).sort();
  return [...keys, ...extra];
}

function numCell(v: number | null): Cell {
  return { text: fixed(v), sort: v !== null && Number.isFinite(v) ? v : null };
}

/** "5 of 7", sorted by the stable share; blank when not tested or not recorded. */
function clusterCell(s: SettingRecord): Cell {
  const c = s.stability.clusters;
  if (s.stability.identical_maps || !c || c.length === 0) return { text: '—', sort: null };
  const r = readClusters(c);
  return { text: `${r.stable.length} of ${r.total}`, sort: r.stable.length / r.total };
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Glossary entries for the scores that only newer results carry, each only when present. */
function extraGlossary(results: ResultsJson, k: number): Array<{ term: string; text: string }> {
  const keys = new Set(results.settings.flatMap((s) => Object.keys(s.metrics)));
  const out: Array<{ term: string; text: string }> = [];
  const add = (key: string, term: string, text: string): void => {
    if (keys.has(key)) out.push({ term, text });
  };
  add(
    'auc_rnx',
    'AUC of R_NX',
    'R_NX(K) measures how many of each point\u2019s K nearest neighbours in the data are also among its K nearest in the ' +
      'map, rescaled so that 0 is a random map and 1 is perfect; the AUC averages it over all K with weights 1/K, so small ' +
      'and large neighbourhoods both count (Lee, Peluffo-Ordóñez & Verleysen 2015). Higher is better.',
  );
  add(
    'distance_spearman',
    'distance Spearman',
    'Spearman rank correlation between the distances of row pairs in the data and in the map (the Shepard diagram). 1 = ' +
      'the map keeps the order of all distances; t-SNE and UMAP are not built for that, so expect lower values for them.',
  );
  add(
    'centroid_spearman',
    'centroid Spearman',
    'Spearman rank correlation between the distances of the label (or cluster) centres in the data and in the map: ' +
      'whether groups that are far apart in the data are also far apart in the map. Higher is better.',
  );
  add(
    'density_correlation',
    'density correlation',
    'Pearson correlation of the log local radius of each point in the data and in the map: whether dense regions stay ' +
      'dense (Narayan, Berger & Cho 2021). t-SNE and UMAP even out densities, so low values are common.',
  );
  add('label_silhouette', 'label silhouette', 'Silhouette of the labels in the map: from −1 to 1, higher = labels form tighter, better separated groups.');
  add(
    'label_knn_accuracy',
    'label kNN accuracy',
    `Share of points whose label is the majority label of their ${k} nearest neighbours in the map (leave-one-out).`,
  );
  if (results.settings.some((s) => s.stability.clusters && s.stability.clusters.length > 0)) {
    out.push({
      term: 'cluster stability (Hennig)',
      text:
        'The first seed\u2019s map is split into k-means clusters; for each cluster, the best-matching cluster in every other ' +
        `seed\u2019s map is found by Jaccard similarity (shared points / points in either), and the mean over seeds is read: ` +
        `≥ ${HENNIG_STABLE} stable, ≤ ${HENNIG_DISSOLVED} dissolved. ${HENNIG_NOTE}`,
    });
  }
  if (results.settings.some((s) => s.stability.points)) {
    out.push({
      term: 'point stability',
      text:
        `For each point, the Jaccard overlap of its ${k} nearest neighbours in two seeds\u2019 maps, averaged over pairs ` +
        'of seeds: 1 = the same neighbours whatever the seed. The mean and the 10th percentile over points summarise it.',
    });
  }
  return out;
}

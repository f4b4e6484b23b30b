/**
 * The figures over the grid and the per-seed figures, built from the
 * results and the embeddings: heatmaps and line charts of every score per
 * method, R_NX curves, the small multiples of every seed, the point
 * stability map and the Shepard scatter plots. Each builder returns null
 * when the results lack what it needs (older results files).
 */
import type { ResultsJson, RunRecord, SettingRecord } from '../core/results.js';
import { Rng, deriveSeed } from '../core/rng.js';
import type { Embedding } from '../core/types.js';
import { alignLayout, asRowLayout } from './align.js';
import { codeUnitCompare, count, fixed, labelCompare, methodName, metricName, paramsText, settingLabel } from './format.js';
import { seedGridSvg } from './grid.js';
import type { SeedGridRow } from './grid.js';
import { heatmapSvg } from './heatmap.js';
import type { HeatPanel } from './heatmap.js';
import { linesSvg, useLogAxis } from './lines.js';
import type { LinePanel } from './lines.js';
import type { Figure } from './model.js';
import { LINE_COLOURS } from './palette.js';
import type { ColourAssignment } from './palette.js';
import { pointMapSvg } from './pointmap.js';
import { rnxSvg } from './rnx.js';
import type { RnxCurve } from './rnx.js';
import { shepardSvg, spearman } from './shepard.js';
import type { ShepardPanel } from './shepard.js';
import { subsampleRows } from './subsample.js';

/** Points drawn in all panels of the seed grid together, at most (each panel gets an equal share). */
export const GRID_POINT_BUDGET = 60000;
/** Most points drawn per panel of the seed grid. */
export const GRID_POINTS_PER_PANEL = 1500;
/** Fewest points per panel, whatever the number of panels. */
export const GRID_POINTS_MIN = 100;
/** Most points in the point-stability map (plus the ringed ones). */
export const POINT_MAP_POINTS = 3000;
/** Least stable points ringed in the point-stability map when the results do not list them. */
export const RINGED_POINTS = 20;
/** Most pairs drawn per Shepard panel. */
export const SHEPARD_PAIRS = 2000;

/** Parameter keys in the order they are put on the axes (first = x axis). */
const AXIS_ORDER = ['perplexity', 'n_neighbors', 'nNeighbors', 'min_dist', 'minDist', 'init', 'iterations'];

/** One score shown over the grid. */
export interface GridScore {
  key: string;
  name: string;
  lowerIsBetter: boolean;
  /** Mean and sd over seeds, or null when the setting has no value. */
  get(s: SettingRecord): { mean: number | null; sd: number | null } | null;
}

/** Shared context of the figure builders. */
export interface FigureContext {
  results: ResultsJson;
  ordered: SettingRecord[];
  /** Embeddings in row layout, by run id (only runs with status ok). */
  layouts: ReadonlyMap<string, Embedding>;
  colours: ColourAssignment;
  ids: readonly string[];
  usedNames: Set<string>;
  /** Rows drawn with hover tooltips (filled by the builders). */
  hoverRows: Set<number>;
}

/** Every run's embedding in row layout (see `asRowLayout`). */
export function rowLayouts(results: ResultsJson, embeddings: ReadonlyMap<string, Embedding>): Map<string, Embedding> {
  const out = new Map<string, Embedding>();
  for (const r of results.runs) {
    if (r.status !== 'ok') continue;
    const e = embeddings.get(r.id);
    if (e) out.set(r.id, asRowLayout(e, results.dataset.n, r.id));
  }
  return out;
}

/**
 * The scores drawn over the grid: the composite, every per-run metric the
 * settings have except the KL divergence (comparable only at equal
 * perplexity), then the seed-stability scores. Stability scores are left
 * blank for a setting whose seeds gave identical maps (nothing was tested).
 */
export function gridScores(settings: readonly SettingRecord[], metricKeys: readonly string[]): GridScore[] {
  const tested = (s: SettingRecord): boolean => !s.stability.identical_maps;
  const scores: GridScore[] = [
    { key: 'score', name: 'composite score', lowerIsBetter: false, get: (s) => ({ mean: s.score, sd: null }) },
  ];
  for (const k of metricKeys) {
    if (k === 'kl_divergence') continue;
    scores.push({ key: k, name: metricName(k), lowerIsBetter: false, get: (s) => s.metrics[k] ?? null });
  }
  scores.push(
    {
      key: 'procrustes_mean',
      name: 'Procrustes disparity (mean)',
      lowerIsBetter: true,
      get: (s) => (tested(s) ? { mean: s.stability.procrustes_mean, sd: null } : null),
    },
    {
      key: 'seed_knn_overlap',
      name: 'seed kNN overlap',
      lowerIsBetter: false,
      get: (s) => (tested(s) ? { mean: s.stability.seed_knn_overlap, sd: null } : null),
    },
    { key: 'ari_mean', name: 'ARI mean', lowerIsBetter: false, get: (s) => (tested(s) ? { mean: s.stability.ari_mean, sd: null } : null) },
  );
  if (settings.some((s) => s.stability.points)) {
    scores.push({
      key: 'point_stability',
      name: 'point stability (mean)',
      lowerIsBetter: false,
      get: (s) => (tested(s) && s.stability.points ? { mean: s.stability.points.mean, sd: null } : null),
    });
  }
  if (settings.some((s) => s.stability.clusters && s.stability.clusters.length > 0)) {
    scores.push({
      key: 'cluster_jaccard',
      name: 'cluster Jaccard (mean)',
      lowerIsBetter: false,
      get: (s) => {
        const c = s.stability.clusters;
        if (!tested(s) || !c || c.length === 0) return null;
        return { mean: c.reduce((a, x) => a + x.mean_jaccard, 0) / c.length, sd: null };
      },
    });
  }
  return scores;
}

interface GridAxes {
  primary: string;
  others: string[];
  xValues: Array<number | string>;
  /** Text of each row (combination of the other parameters). */
  yValues: string[];
  xOf(s: SettingRecord): number;
  yOf(s: SettingRecord): number;
}

/**
 * Axes of a method's grid: x = the first parameter that varies (perplexity
 * for t-SNE, n_neighbors for UMAP), rows = combinations of the other
 * varying parameters. Null when no parameter varies.
 */
export function gridAxes(settings: readonly SettingRecord[]): GridAxes | null {
  const keys = [...new Set(settings.flatMap((s) => Object.keys(s.params)))];
  const varying = keys.filter((k) => new Set(settings.map((s) => valueKey(s.params[k]))).size > 1);
  if (varying.length === 0) return null;
  const rank = (k: string): number => {
    const i = AXIS_ORDER.indexOf(k);
    return i < 0 ? AXIS_ORDER.length : i;
  };
  varying.sort((a, b) => rank(a) - rank(b) || codeUnitCompare(a, b));
  const [primary, ...others] = varying;
  const xs = distinctValues(settings.map((s) => s.params[primary]));
  const xValues = xs.every((v) => typeof v === 'number') ? xs : xs.map((v) => (v === undefined ? '—' : String(v)));
  const yText = (s: SettingRecord): string => {
    if (others.length === 0) return 'all';
    const sub: Record<string, number | string> = {};
    for (const k of others) sub[k] = s.params[k] ?? '—';
    return paramsText(sub);
  };
  const yValues = [...new Set(settings.map(yText))].sort(labelCompare);
  const xKey = xs.map((v) => valueKey(v));
  return {
    primary,
    others,
    xValues: xValues as Array<number | string>,
    yValues,
    xOf: (s) => xKey.indexOf(valueKey(s.params[primary])),
    yOf: (s) => yValues.indexOf(yText(s)),
  };
}

/** Heatmap and line-chart figures for every method with a varying parameter. */
export function gridFigures(ctx: FigureContext, metricKeys: readonly string[]): Figure[] {
  const out: Figure[] = [];
  const methods = [...new Set(ctx.ordered.map((s) => s.method))];
  const scores = gridScores(ctx.ordered, metricKeys);
  const heat: Figure[] = [];
  const lines: Figure[] = [];
  for (const method of methods) {
    const settings = ctx.ordered.filter((s) => s.method === method);
    const axes = gridAxes(settings);
    if (!axes) continue;
    const shown = scores.filter((sc) => settings.some((s) => finite(sc.get(s)?.mean)));
    const mName = methodName(method);
    const xName = paramWord(axes.primary);
    const yName = axes.others.length === 0 ? '' : axes.others.map(paramWord).join(', ');
    const panels: HeatPanel[] = shown.map((sc) => {
      const cells: HeatPanel['cells'] = axes.yValues.map(() => axes.xValues.map(() => null));
      for (const s of settings) {
        const v = sc.get(s);
        const x = axes.xOf(s);
        const y = axes.yOf(s);
        if (x < 0 || y < 0) continue;
        const mean = v && finite(v.mean) ? v.mean : null;
        const sd = v && finite(v.sd) ? v.sd : null;
        const text = mean === null ? 'no value' : sd === null ? fixed(mean) : `${fixed(mean)} ± ${fixed(sd)}`;
        cells[y][x] = { mean, sd, title: `${settingLabel(s.method, s.params)}: ${sc.name} ${text}` };
      }
      return { name: sc.name, lowerIsBetter: sc.lowerIsBetter, cells };
    });
    const heatName = uniqueName(`heatmap-${slugOf(method)}`, ctx.usedNames);
    const heatTitle = `${mName}: every score over ${xName}${yName ? ` × ${yName}` : ''}, mean over seeds`;
    const heatInput = {
      title: heatTitle,
      xName,
      xValues: axes.xValues.map(String),
      yName: yName || '(one row)',
      yValues: axes.yValues,
      panels,
    };
    heat.push({
      name: heatName,
      fileSvg: heatmapSvg({ ...heatInput, standalone: true }),
      inlineSvg: heatmapSvg({ ...heatInput, standalone: false }),
      alt: heatTitle,
      caption: [
        `${heatTitle}. Each panel is one score; the colour runs from the worst value of that panel (dark) to the best ` +
          '(bright) on the viridis scale, so compare colours within a panel and read the numbers across panels. ' +
          'The small number under each mean is the standard deviation over seeds; seed-stability scores compare pairs ' +
          'of seeds and have none. Grey cells: no such setting, or no value (stability is blank where every seed gave ' +
          'the same map). The KL divergence is left out: it compares only runs with the same perplexity.',
      ],
    });
    const colours = axes.yValues.map((_, i) => LINE_COLOURS[i % LINE_COLOURS.length]);
    const linePanels: LinePanel[] = shown.map((sc) => ({
      name: sc.name,
      lowerIsBetter: sc.lowerIsBetter,
      series: axes.yValues.map((yv, yi) => ({
        name: axes.others.length === 0 ? mName : `${mName}, ${yv}`,
        colour: colours[yi],
        points: settings
          .filter((s) => axes.yOf(s) === yi && axes.xOf(s) >= 0)
          .map((s) => {
            const v = sc.get(s);
            return { x: axes.xOf(s), mean: v && finite(v.mean) ? v.mean : null, sd: v && finite(v.sd) ? v.sd : null };
          }),
      })),
    }));
    const lineName = uniqueName(`scores-${slugOf(method)}`, ctx.usedNames);
    const lineTitle = `${mName}: every score against ${xName}`;
    const lineInput = { title: lineTitle, xName, xValues: axes.xValues, panels: linePanels };
    lines.push({
      name: lineName,
      fileSvg: linesSvg({ ...lineInput, standalone: true }),
      inlineSvg: linesSvg({ ...lineInput, standalone: false }),
      alt: lineTitle,
      caption: [
        `${lineTitle}${axes.others.length > 0 ? `, one line per ${yName}` : ''}. Dots are means over seeds; the band ` +
          'is the mean ± one standard deviation over seeds (no band for seed-stability scores, which compare pairs of ' +
          `seeds).${useLogAxis(axes.xValues) ? ` ${capitalise(xName)} is on a log scale.` : ''}`,
      ],
    });
  }
  out.push(...heat, ...lines);
  return out;
}

/**
 * R_NX(K) averaged over the seeds of each setting, for the given settings
 * (in order) that have curves. Null when none has.
 */
export function rnxFigure(ctx: FigureContext, chosen: readonly SettingRecord[]): Figure | null {
  const curves: RnxCurve[] = [];
  for (const s of chosen) {
    const runs = ctx.results.runs.filter((r) => r.setting === s.id && r.status === 'ok' && r.rnx_curve && r.rnx_curve.K.length > 0);
    if (runs.length === 0) continue;
    const K = runs[0].rnx_curve!.K;
    const same = runs.filter((r) => sameArray(r.rnx_curve!.K, K) && r.rnx_curve!.values.length === K.length);
    const values = K.map((_, t) => same.reduce((a, r) => a + r.rnx_curve!.values[t], 0) / same.length);
    const auc = s.metrics.auc_rnx?.mean;
    const aucText = finite(auc) ? `AUC ${fixed(auc)}` : 'AUC not recorded';
    curves.push({
      name: `${settingLabel(s.method, s.params)} (${s.rank === null ? 'not ranked' : `rank ${s.rank}`}) — ${aucText}`,
      colour: LINE_COLOURS[curves.length % LINE_COLOURS.length],
      dashed: s.method === 'pca',
      K,
      values,
    });
    if (curves.length >= LINE_COLOURS.length) break;
  }
  if (curves.length === 0) return null;
  const name = uniqueName('rnx-curves', ctx.usedNames);
  const title = 'R_NX(K): neighbourhood preservation at every scale K, mean over seeds';
  return {
    name,
    fileSvg: rnxSvg(curves, title, true),
    inlineSvg: rnxSvg(curves, title, false),
    alt: title,
    caption: [
      `${title}, for the leading settings. R_NX(K) is the share of each point's K nearest neighbours in the data that ` +
        'are also among its K nearest in the map, rescaled so that 0 is what a random map gives and 1 is perfect ' +
        '(Lee, Peluffo-Ordóñez & Verleysen 2015). Small K is local structure, large K global structure. AUC is the area ' +
        'under the curve against log K (weights 1/K), the mean over seeds as recorded in the results.',
    ],
  };
}

/** The seed-grid figure: every setting (rows) by every seed (columns). Null when no setting has a map. */
export function seedGridFigure(ctx: FigureContext): Figure | null {
  const ds = ctx.results.dataset;
  const ranked = ctx.ordered.filter((s) => s.rank !== null).length;
  const columns = Math.max(1, ...ctx.ordered.map((s) => s.seeds.length));
  const panels = ctx.ordered.length * columns;
  const cap = Math.max(GRID_POINTS_MIN, Math.min(GRID_POINTS_PER_PANEL, Math.floor(GRID_POINT_BUDGET / Math.max(panels, 1))));
  const draw = subsampleRows(ds.n, ds.labels, cap, deriveSeed(0, 'report.grid-rows', ds.sha256));
  const rows: SeedGridRow[] = [];
  let any = false;
  for (const s of ctx.ordered) {
    const runs = okRunsOf(s, ctx.results.runs, ctx.layouts);
    const ref = runs.length > 0 ? ctx.layouts.get(runs[0].id)! : null;
    const header = [
      s.rank === null ? 'not ranked' : `rank ${s.rank} of ${ranked}`,
      methodName(s.method),
      ...(paramsText(s.params) === 'no parameters' ? [] : paramsText(s.params).split(', ')),
    ];
    if (s.stability.identical_maps) header.push('same map for every seed:', 'seeds tested nothing');
    const row: SeedGridRow = { id: s.id, header, panels: [] };
    for (const seed of s.seeds) {
      const run = runs.find((r) => r.seed === seed);
      if (!run || !ref) {
        row.panels.push({ seed, layout: null, note: 'no map (run failed)' });
        continue;
      }
      if (run === runs[0]) {
        row.panels.push({ seed, layout: ref, note: 'reference' });
        any = true;
        continue;
      }
      try {
        const a = alignLayout(ref, ctx.layouts.get(run.id)!);
        row.panels.push({ seed, layout: a.layout, note: `disparity ${fixed(a.disparity)}` });
      } catch (err) {
        if (!(err instanceof RangeError)) throw err;
        row.panels.push({ seed, layout: null, note: 'could not be aligned' });
      }
    }
    rows.push(row);
  }
  if (!any) return null;
  for (const r of draw) ctx.hoverRows.add(r);
  const sampled = draw.length < ds.n;
  const footnote = [
    sampled
      ? `Each panel: ${count(draw.length)} of ${count(ds.n)} points, the same in every panel, a seeded random sample stratified by label.`
      : `Each panel: all ${count(ds.n)} points.`,
    'Every seed is Procrustes-aligned (shift, rotation or reflection, uniform scale) onto the first seed of its row;',
    'the disparity under a panel is the scipy-style standardised Procrustes disparity to that first seed (0 = same shape).',
  ];
  const colourNote =
    ds.labels === null
      ? 'No label column, and the k-means clusters are not stored in results.json, so all points have one colour.'
      : ctx.colours.hasOther
        ? 'Colour shows the label; the 8 most frequent labels have their own colour and all others are grey.'
        : 'Colour shows the label.';
  const name = uniqueName('seed-grid', ctx.usedNames);
  const title = `Every setting (rows, ranked order) by every seed (columns), aligned onto the first seed`;
  const seeds0 = ctx.ordered.reduce<number[]>((a, s) => (s.seeds.length > a.length ? s.seeds : a), []);
  const sameSeeds = ctx.ordered.every((s) => s.seeds.every((x, i) => x === seeds0[i]));
  const colHeaders = Array.from({ length: columns }, (_, c) => {
    const which = sameSeeds ? `seed ${seeds0[c]}` : c === 0 ? 'first seed' : `seed no. ${c + 1}`;
    return c === 0 ? `${which} (reference)` : which;
  });
  const common = {
    rows,
    draw,
    colours: ctx.colours,
    labels: ds.labels,
    title,
    columnHeaders: colHeaders,
    footnote: [colourNote, ...footnote],
  };
  return {
    name,
    fileSvg: seedGridSvg({ ...common, interactive: false, standalone: true }),
    inlineSvg: seedGridSvg({ ...common, interactive: true, standalone: false }),
    alt: title,
    caption: [
      `${title}. A setting whose clusters survive seed changes looks the same across its row. ${colourNote}`,
      sampled
        ? `Drawn: ${count(draw.length)} of ${count(ds.n)} points per panel (at most ${count(GRID_POINTS_PER_PANEL)} per panel ` +
          `and ${count(GRID_POINT_BUDGET)} in all), a random sample stratified by label (each label keeps at least one point ` +
          'and otherwise its share, rounded by largest remainder), drawn with a fixed seed derived from the data hash.'
        : `All ${count(ds.n)} points are drawn in every panel.`,
    ],
  };
}

/**
 * The first-seed map of the best-ranked setting with per-point stability
 * values, coloured by them, the least stable points ringed. Null without
 * per-point values.
 */
export function pointMapFigure(ctx: FigureContext, points: ReadonlyMap<string, Float64Array> | undefined): Figure | null {
  if (!points) return null;
  const ds = ctx.results.dataset;
  for (const s of ctx.ordered) {
    if (s.rank === null) continue;
    const values = points.get(s.id);
    if (!values || values.length !== ds.n) continue;
    const runs = okRunsOf(s, ctx.results.runs, ctx.layouts);
    if (runs.length === 0) continue;
    const layout = ctx.layouts.get(runs[0].id)!;
    const listed = s.stability.points?.least_stable?.map((p) => rowOfPoint(p.row, p.id, ctx.ids)).filter((r) => r >= 0);
    const ringed = listed && listed.length > 0 ? listed : lowestRows(values, RINGED_POINTS);
    const base = subsampleRows(ds.n, ds.labels, POINT_MAP_POINTS, deriveSeed(0, 'report.point-map-rows', ds.sha256));
    const drawSet = new Set<number>(base);
    for (const r of ringed) drawSet.add(r);
    const draw = Int32Array.from([...drawSet].sort((a, b) => a - b));
    for (const r of draw) ctx.hoverRows.add(r);
    const label = settingLabel(s.method, s.params);
    const title = `Point stability in the map of ${label}, seed ${runs[0].seed}`;
    const common = {
      layout,
      draw,
      values,
      ringed,
      ids: ctx.ids,
      labels: ds.labels,
      title,
      valueName: 'neighbourhood stability',
    };
    const best = s.rank === 1 ? 'the best-ranked setting' : `the best-ranked setting with per-point values (rank ${s.rank})`;
    const caption = [
      `${title} (${best}). Each point is coloured by the mean Jaccard overlap of its ${ctx.results.sweep.k} nearest ` +
        'neighbours between pairs of seeds: bright points keep their neighbours whatever the seed, dark ones do not. ' +
        `The ${ringed.length} least stable points are ringed; hover over one to see its id.`,
    ];
    if (s.stability.points) {
      caption.push(`Mean over points ${fixed(s.stability.points.mean)}; 10 % of the points are below ${fixed(s.stability.points.p10)}.`);
    }
    if (draw.length < ds.n) {
      caption.push(
        `Drawn: ${count(draw.length)} of ${count(ds.n)} points: a seeded random sample of ${count(base.length)} stratified ` +
          'by label, plus every ringed point.',
      );
    }
    return {
      name: uniqueName('point-stability', ctx.usedNames),
      fileSvg: pointMapSvg({ ...common, interactive: false, standalone: true }),
      inlineSvg: pointMapSvg({ ...common, interactive: true, standalone: false }),
      alt: title,
      caption,
    };
  }
  return null;
}

/**
 * Shepard-style scatter plots for the best setting of each method (the
 * best ranked, else the first listed): data distance of each sampled pair
 * against its distance in the setting's first-seed map. Null without a
 * distance sample.
 */
export function shepardFigure(ctx: FigureContext): Figure | null {
  const ds = ctx.results.dataset;
  const sample = ds.distance_sample;
  if (!sample || sample.i.length === 0) return null;
  const m = Math.min(sample.i.length, sample.j.length, sample.distance.length);
  const pick = pairSample(m, SHEPARD_PAIRS, deriveSeed(0, 'report.shepard-pairs', ds.sha256));
  const methods = [...new Set(ctx.ordered.map((s) => s.method))];
  const panels: ShepardPanel[] = [];
  for (const method of methods) {
    const list = ctx.ordered.filter((s) => s.method === method);
    const s = list.find((x) => x.rank !== null) ?? list[0];
    const runs = okRunsOf(s, ctx.results.runs, ctx.layouts);
    if (runs.length === 0) continue;
    const run = runs[0];
    const e = ctx.layouts.get(run.id)!.data;
    const mapDist = (t: number): number => {
      const a = sample.i[t];
      const b = sample.j[t];
      return Math.hypot(e[2 * a] - e[2 * b], e[2 * a + 1] - e[2 * b + 1]);
    };
    const x = new Float64Array(pick.length);
    const y = new Float64Array(pick.length);
    pick.forEach((t, q) => {
      x[q] = sample.distance[t];
      y[q] = mapDist(t);
    });
    const recorded = run.metrics.distance_spearman;
    let rho: string;
    if (finite(recorded)) {
      const sc = ds.scoring;
      const over = sc ? (sc.distance_all_pairs ? 'all pairs' : `${count(sc.distance_pairs)} sampled pairs`) : 'as recorded';
      rho = `Spearman ρ ${fixed(recorded)} (seed ${run.seed}, ${over})`;
    } else {
      const dx: number[] = [];
      const dy: number[] = [];
      for (let t = 0; t < m; t++) {
        const d = mapDist(t);
        if (!Number.isFinite(d) || !Number.isFinite(sample.distance[t])) continue;
        dx.push(sample.distance[t]);
        dy.push(d);
      }
      rho = `Spearman ρ ${fixed(spearman(dx, dy))} (seed ${run.seed}, the ${count(dx.length)} sampled pairs)`;
    }
    const rankText = s.rank === null ? 'not ranked' : `rank ${s.rank}`;
    const params = paramsText(s.params);
    panels.push({
      title: [`${methodName(s.method)} (${rankText})`, ...(params === 'no parameters' ? [] : [params]), rho],
      x,
      y,
      colour: LINE_COLOURS[panels.length % LINE_COLOURS.length],
    });
  }
  if (panels.length === 0) return null;
  const name = uniqueName('shepard', ctx.usedNames);
  const title = 'Distances in the data against distances in the map, for the best setting of each method';
  const drawn = pick.length < m ? `${count(pick.length)} of the ${count(m)} sampled pairs drawn (seeded)` : `all ${count(m)} sampled pairs drawn`;
  const footnote = `Pairs: a seeded sample of row pairs from results.json; ${drawn}. Map distances from each setting's first seed.`;
  return {
    name,
    fileSvg: shepardSvg(panels, title, footnote, true),
    inlineSvg: shepardSvg(panels, title, footnote, false),
    alt: title,
    caption: [
      `${title} (Shepard diagram). Each dot is a pair of rows: its distance in the space the scores are measured in (x) ` +
        'and in the map (y, arbitrary units). A rising, narrow cloud means the map keeps the order of distances; the ' +
        'Spearman rank correlation in each title measures it (1 = same order). t-SNE and UMAP are built to keep ' +
        'neighbours, not large distances, so a wide cloud at large distances is expected and is the reason the distances ' +
        'between their clusters must not be read.',
      footnote,
    ],
  };
}

/** Runs of a setting that have a layout, in the order of the setting's seeds. */
export function okRunsOf(s: SettingRecord, runs: readonly RunRecord[], layouts: ReadonlyMap<string, Embedding>): RunRecord[] {
  const order = (seed: number): number => {
    const i = s.seeds.indexOf(seed);
    return i < 0 ? s.seeds.length : i;
  };
  return runs
    .filter((r) => r.setting === s.id && r.status === 'ok' && layouts.has(r.id))
    .sort((a, b) => order(a.seed) - order(b.seed) || a.seed - b.seed || codeUnitCompare(a.id, b.id));
}

/** File-name slug of an id: lower case, [a-z0-9-], at most 60 characters. */
export function slugOf(id: string): string {
  const s = id
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s.length > 0 ? s.slice(0, 60) : 'setting';
}

/** `base`, or `base-2`, `base-3`, … when taken; the name is recorded as used. */
export function uniqueName(base: string, used: Set<string>): string {
  let name = base;
  for (let i = 2; used.has(name); i++) name = `${base}-${i}`;
  used.add(name);
  return name;
}

/** Up to `cap` of `m` indices, ascending, by a seeded partial Fisher–Yates shuffle. */
function pairSample(m: number, cap: number, seed: number): number[] {
  if (m <= cap) return Array.from({ length: m }, (_, t) => t);
  const idx = Int32Array.from({ length: m }, (_, t) => t);
  const rng = new Rng(seed);
  for (let t = 0; t < cap; t++) {
    const j = t + rng.int(m - t);
    const tmp = idx[t];
    idx[t] = idx[j];
    idx[j] = tmp;
  }
  return Array.from(idx.subarray(0, cap)).sort((a, b) => a - b);
}

/**
 * The data row of a listed point: `row` when the id there matches, else
 * `row − 1` when that matches (a 1-based row number), else `row` if it is a
 * valid row, else −1.
 */
function rowOfPoint(row: number, id: string, ids: readonly string[]): number {
  if (ids[row] === id) return row;
  if (row >= 1 && ids[row - 1] === id) return row - 1;
  return Number.isInteger(row) && row >= 0 && row < ids.length ? row : -1;
}

/** Rows of the `k` lowest finite values, lowest first (ties by row). */
function lowestRows(values: Float64Array, k: number): number[] {
  const rows: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) rows.push(i);
  rows.sort((a, b) => values[a] - values[b] || a - b);
  return rows.slice(0, k);
}

function distinctValues(values: ReadonlyArray<number | string | undefined>): Array<number | string | undefined> {
  const seen = new Map<string, number | string | undefined>();
  for (const v of values) seen.set(valueKey(v), v);
  return [...seen.values()].sort((a, b) => {
    if (typeof a === 'number' && typeof b === 'number') return a - b;
    return labelCompare(String(a ?? '—'), String(b ?? '—'));
  });
}

function valueKey(v: number | string | undefined): string {
  return v === undefined ? 'u:' : typeof v === 'number' ? `n:${v}` : `s:${v}`;
}

function paramWord(key: string): string {
  return paramsText({ [key]: 0 }).replace(/ 0$/, '');
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

function sameArray(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((v, i) => v === b[i]);
}

function finite(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

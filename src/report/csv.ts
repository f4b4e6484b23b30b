/**
 * settings.csv: one line per setting with every number of the ranking, for
 * spreadsheets and scripts. Numbers are written with `String(v)` (the
 * shortest text that reads back to the same double); missing values are
 * empty cells. Fields are quoted as RFC 4180 asks.
 */
import type { SettingRecord } from '../core/results.js';
import { codeUnitCompare } from './format.js';
import { orderSettings } from './model.js';
import { HENNIG_DISSOLVED, HENNIG_STABLE } from './words.js';

/** The CSV text (header line first, LF line ends, trailing newline). */
export function settingsCsv(settings: readonly SettingRecord[]): string {
  const ordered = orderSettings(settings);
  const paramKeys = [...new Set(ordered.flatMap((s) => Object.keys(s.params)))].sort(codeUnitCompare);
  const metricKeys = [...new Set(ordered.flatMap((s) => Object.keys(s.metrics)))].sort(codeUnitCompare);
  const header = [
    'rank',
    'setting',
    'method',
    ...paramKeys.map((k) => `param_${k}`),
    'score',
    'faithfulness',
    'stability',
    ...metricKeys.flatMap((k) => [`${k}_mean`, `${k}_sd`]),
    'procrustes_mean',
    'procrustes_max',
    'seed_knn_overlap',
    'ari_mean',
    'seed_pairs',
    'identical_maps',
    'clusters',
    'clusters_stable',
    'clusters_dissolved',
    'point_stability_mean',
    'point_stability_p10',
    'perturbations',
    'verdict',
  ];
  const lines = [header.map(field).join(',')];
  for (const s of ordered) {
    const st = s.stability;
    const clusters = st.clusters ?? null;
    const row: Array<string | number | boolean | null | undefined> = [
      s.rank,
      s.id,
      s.method,
      ...paramKeys.map((k) => s.params[k]),
      s.score,
      s.score_parts.faithfulness,
      s.score_parts.stability,
      ...metricKeys.flatMap((k) => [s.metrics[k]?.mean, s.metrics[k]?.sd]),
      st.procrustes_mean,
      st.procrustes_max,
      st.seed_knn_overlap,
      st.ari_mean,
      st.pairs,
      st.identical_maps,
      clusters ? clusters.length : null,
      clusters ? clusters.filter((c) => c.mean_jaccard >= HENNIG_STABLE).length : null,
      clusters ? clusters.filter((c) => c.mean_jaccard <= HENNIG_DISSOLVED).length : null,
      st.points?.mean,
      st.points?.p10,
      st.perturbations ? st.perturbations.join('; ') : null,
      s.verdict,
    ];
    lines.push(row.map(field).join(','));
  }
  return lines.join('\n') + '\n';
}

function field(v: string | number | boolean | null | undefined): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  const text = String(v);
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

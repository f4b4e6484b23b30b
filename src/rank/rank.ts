/**
 * Aggregation over seeds and ranking of settings.
 *
 * Composite score (our definition, documented in the README):
 *   faithfulness F = mean of trustworthiness, continuity and kNN overlap (each a mean over seeds);
 *   stability    S = mean of (1 − Procrustes disparity), seed-to-seed kNN overlap and ARI (means over seed pairs);
 *   composite      = (F + S) / 2, all parts in [0, 1].
 * A setting whose seeds all gave the same map has S = null: its seeds tested
 * nothing, so it earns no stability credit and is not ranked on the
 * composite (it is still listed with its faithfulness).
 */
import type { MeanSd, RunRecord, SettingRecord, StabilityRecord } from '../core/results.js';
import type { SettingSpec } from '../core/types.js';
import { paramsForFile } from '../embed/methods.js';
import { meanSd } from '../metrics/summary.js';

export interface SettingInput {
  spec: SettingSpec;
  runs: RunRecord[];
  stability: StabilityRecord;
}

/** Metrics whose lower values are better. */
const LOWER_IS_BETTER = new Set(['procrustes_mean', 'kl_divergence']);

export function aggregateMetrics(runs: RunRecord[]): Record<string, MeanSd> {
  const names = new Set<string>();
  for (const r of runs) if (r.status === 'ok') for (const k of Object.keys(r.metrics)) names.add(k);
  const out: Record<string, MeanSd> = {};
  for (const name of [...names].sort()) {
    const vals = runs
      .filter((r) => r.status === 'ok')
      .map((r) => (r.metrics as unknown as Record<string, number | null | undefined>)[name])
      .filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
    out[name] = meanSd(vals);
  }
  return out;
}

function mean(xs: Array<number | null>): number | null {
  if (xs.some((x) => x === null || !Number.isFinite(x))) return null;
  return (xs as number[]).reduce((a, b) => a + b, 0) / xs.length;
}

export function scoreParts(metrics: Record<string, MeanSd>, st: StabilityRecord): { faithfulness: number | null; stability: number | null } {
  const faithfulness = mean([metrics.trustworthiness?.mean ?? null, metrics.continuity?.mean ?? null, metrics.knn_overlap?.mean ?? null]);
  const stability =
    st.identical_maps || st.pairs === 0
      ? null
      : mean([st.procrustes_mean === null ? null : 1 - st.procrustes_mean, st.seed_knn_overlap, st.ari_mean]);
  return { faithfulness, stability };
}

/** The value a setting is ranked by, or null when it cannot be ranked on that key. */
export function rankKey(rankBy: string, rec: Omit<SettingRecord, 'rank' | 'verdict'>): number | null {
  const { faithfulness, stability } = rec.score_parts;
  switch (rankBy) {
    case 'composite':
      return faithfulness === null || stability === null ? null : (faithfulness + stability) / 2;
    case 'faithfulness':
      return faithfulness;
    case 'stability':
      return stability;
    case 'procrustes_mean':
    case 'seed_knn_overlap':
    case 'ari_mean':
      return rec.stability.identical_maps ? null : rec.stability[rankBy];
    default:
      return rec.metrics[rankBy]?.mean ?? null;
  }
}

/**
 * Build the setting records, ranked. Ties (equal key to 12 decimals) are
 * broken by the composite, then by setting id, so the order never depends
 * on run order.
 */
export function rankSettings(inputs: SettingInput[], rankBy: string): SettingRecord[] {
  const recs = inputs.map((inp) => {
    const metrics = aggregateMetrics(inp.runs);
    const parts = scoreParts(metrics, inp.stability);
    const base = {
      id: inp.spec.id,
      method: inp.spec.method,
      params: paramsForFile(inp.spec.method, inp.spec.params),
      seeds: inp.spec.seeds,
      score: parts.faithfulness !== null && parts.stability !== null ? (parts.faithfulness + parts.stability) / 2 : null,
      score_parts: parts,
      metrics,
      stability: inp.stability,
    };
    return { base, key: rankKey(rankBy, base) };
  });
  const sign = LOWER_IS_BETTER.has(rankBy) ? 1 : -1;
  const round = (x: number): number => Math.round(x * 1e12) / 1e12;
  const ranked = recs
    .filter((r) => r.key !== null)
    .sort((a, b) => {
      const d = sign * (round(a.key!) - round(b.key!));
      if (d !== 0) return d;
      const ca = a.base.score ?? -Infinity;
      const cb = b.base.score ?? -Infinity;
      if (ca !== cb) return cb - ca;
      return a.base.id < b.base.id ? -1 : a.base.id > b.base.id ? 1 : 0;
    });
  const unranked = recs.filter((r) => r.key === null).sort((a, b) => (a.base.id < b.base.id ? -1 : 1));
  const total = ranked.length;
  const out: SettingRecord[] = [];
  ranked.forEach((r, i) => out.push({ ...r.base, rank: i + 1, verdict: verdict({ ...r.base, rank: i + 1 }, total, rankBy) }));
  for (const r of unranked) out.push({ ...r.base, rank: null, verdict: verdict({ ...r.base, rank: null }, total, rankBy) });
  return out;
}

const f3 = (x: number | null | undefined): string => (x === null || x === undefined || !Number.isFinite(x) ? 'n/a' : x.toFixed(3));
const pm = (m: MeanSd | undefined): string => (m && m.mean !== null ? `${f3(m.mean)}${m.sd !== null ? ` ± ${f3(m.sd)}` : ''}` : 'n/a');

/**
 * Reading bands for agreement indices (ARI, seed kNN overlap), used by the
 * verdicts and the report summary. The ARI cut-offs follow the recovery bands
 * suggested by Steinley (2004), "Properties of the Hubert–Arabie adjusted
 * Rand index", Psychological Methods 9:386–396 (values quoted from memory):
 * ≥ 0.90 excellent, ≥ 0.80 good, ≥ 0.65 moderate, below that poor. Applying the
 * same cut-offs to the seed kNN overlap is this tool's rule of thumb.
 */
export const AGREEMENT_BANDS = { excellent: 0.9, good: 0.8, moderate: 0.65 } as const;

export function agreementBand(x: number | null): string {
  if (x === null || !Number.isFinite(x)) return 'untested';
  if (x >= AGREEMENT_BANDS.excellent) return 'reproduce closely';
  if (x >= AGREEMENT_BANDS.good) return 'reproduce';
  if (x >= AGREEMENT_BANDS.moderate) return 'partly reproduce';
  return 'change with the seed';
}

/**
 * Below this density correlation the verdict warns that the map evens out
 * density differences. A rule of thumb of this tool, not a published cut-off.
 */
export const DENSITY_WARNING = 0.3;

export function verdict(rec: Omit<SettingRecord, 'verdict'>, total: number, rankBy: string): string {
  const base = judge(rec, total, rankBy);
  const dens = rec.metrics.density_correlation?.mean;
  if (dens === null || dens === undefined || dens >= DENSITY_WARNING) return base;
  return (
    `${base} Its density correlation is ${f3(dens)} (below ${DENSITY_WARNING}): the map evens out how densely points lie in the data, ` +
    'so a dense group inside a sparse one can be drawn with the same spread; do not read cluster spread from it.'
  );
}

function judge(rec: Omit<SettingRecord, 'verdict'>, total: number, rankBy: string): string {
  const m = rec.metrics;
  const st = rec.stability;
  const okSeeds = m.trustworthiness ? rec.seeds.length : 0;
  if (!m.trustworthiness || m.trustworthiness.mean === null) {
    return `${rec.id}: every run failed, nothing to judge.`;
  }
  const local = `trustworthiness ${pm(m.trustworthiness)}, continuity ${pm(m.continuity)}, kNN overlap ${pm(m.knn_overlap)}`;
  const head = rec.rank !== null ? `${rec.id} ranks ${rec.rank} of ${total} by ${rankBy}${rec.score !== null ? ` (composite ${f3(rec.score)})` : ''}` : `${rec.id} is not ranked by ${rankBy}`;
  if (rec.method === 'pca') {
    return `${rec.id} is the linear baseline and is not ranked: ${local}. PCA is deterministic, so seeds do not apply.`;
  }
  if (st.identical_maps) {
    return `${head}: every one of its ${okSeeds} seeds gave the same map, so its seeds tested nothing about stability; ${local}.`;
  }
  if (st.pairs === 0) {
    return `${head}: only one successful seed, so stability is untested; ${local}.`;
  }
  return (
    `${head}: ${local}; across ${st.pairs} seed pairs its k-means clusters ${agreementBand(st.ari_mean)} (ARI ${f3(st.ari_mean)}), ` +
    `neighbourhoods ${agreementBand(st.seed_knn_overlap)} (seed kNN overlap ${f3(st.seed_knn_overlap)}), ` +
    `Procrustes disparity ${f3(st.procrustes_mean)} (max ${f3(st.procrustes_max)}; 0 = same shape).`
  );
}

import { describe, expect, it } from 'vitest';
import type { RunRecord, StabilityRecord } from '../../src/core/results.js';
import type { SettingSpec } from '../../src/core/types.js';
import { rankSettings, scoreParts, aggregateMetrics } from '../../src/rank/rank.js';

function run(setting: string, seed: number, t: number, c: number, o: number): RunRecord {
  return {
    id: `${setting}-s${seed}`, setting, method: setting.split('-')[0], params: {}, seed, seconds: 1, cache: 'computed', status: 'ok',
    embedding: `embeddings/${setting}-s${seed}.csv`, metrics: { trustworthiness: t, continuity: c, knn_overlap: o },
  };
}
const stab = (p: number, o: number, a: number, identical = false): StabilityRecord => ({
  procrustes_mean: p, procrustes_max: p, seed_knn_overlap: o, ari_mean: a, pairs: 3, identical_maps: identical,
});
const spec = (id: string, method: 'tsne' | 'umap' | 'pca' = 'umap'): SettingSpec => ({ id, method, params: {}, seeds: [1, 2, 3] });

describe('aggregateMetrics', () => {
  it('gives mean and sample sd over successful seeds only', () => {
    const runs = [run('a', 1, 0.9, 0.8, 0.5), run('a', 2, 0.8, 0.8, 0.5), { ...run('a', 3, 0, 0, 0), status: 'failed' as const }];
    const m = aggregateMetrics(runs);
    expect(m.trustworthiness.mean).toBeCloseTo(0.85, 15);
    expect(m.trustworthiness.sd).toBeCloseTo(Math.sqrt(0.005), 15);
    expect(m.continuity.sd).toBe(0);
  });
});

describe('scoreParts', () => {
  it('is the mean of the three faithfulness scores and of the three stability scores', () => {
    const m = aggregateMetrics([run('a', 1, 0.9, 0.6, 0.3)]);
    const p = scoreParts(m, stab(0.1, 0.7, 0.8));
    expect(p.faithfulness).toBeCloseTo(0.6, 15);
    expect(p.stability).toBeCloseTo((0.9 + 0.7 + 0.8) / 3, 15);
  });

  it('gives no stability credit when every seed produced the same map', () => {
    const m = aggregateMetrics([run('a', 1, 0.9, 0.6, 0.3)]);
    expect(scoreParts(m, stab(0, 1, 1, true)).stability).toBeNull();
  });
});

describe('rankSettings', () => {
  const inputs = [
    { spec: spec('umap-b'), runs: [run('umap-b', 1, 0.9, 0.9, 0.5)], stability: stab(0.05, 0.8, 0.9) },
    { spec: spec('umap-a'), runs: [run('umap-a', 1, 0.9, 0.9, 0.5)], stability: stab(0.05, 0.8, 0.9) },
    { spec: spec('tsne-c', 'tsne'), runs: [run('tsne-c', 1, 0.99, 0.99, 0.9)], stability: stab(0, 1, 1, true) },
    { spec: spec('umap-d'), runs: [run('umap-d', 1, 0.7, 0.7, 0.2)], stability: stab(0.3, 0.4, 0.5) },
  ];

  it('ranks by the composite, breaks exact ties by id, and lists identical-map settings unranked', () => {
    const out = rankSettings(inputs, 'composite');
    expect(out.map((s) => [s.id, s.rank])).toEqual([['umap-a', 1], ['umap-b', 2], ['umap-d', 3], ['tsne-c', null]]);
    expect(out[0].score).toBeCloseTo(((0.9 + 0.9 + 0.5) / 3 + (0.95 + 0.8 + 0.9) / 3) / 2, 12);
    expect(out[3].verdict).toMatch(/seeds tested nothing/);
  });

  it('ranks by a single faithfulness score when asked, including identical-map settings', () => {
    const out = rankSettings(inputs, 'trustworthiness');
    expect(out[0].id).toBe('tsne-c');
    expect(out[0].rank).toBe(1);
  });

  it('treats a lower Procrustes disparity as better', () => {
    const out = rankSettings(inputs, 'procrustes_mean');
    expect(out.filter((s) => s.rank !== null).map((s) => s.id)).toEqual(['umap-a', 'umap-b', 'umap-d']);
  });

  it('writes verdicts that quote the numbers', () => {
    const out = rankSettings(inputs, 'composite');
    expect(out[0].verdict).toContain('trustworthiness 0.900');
    expect(out[0].verdict).toContain('ARI 0.900');
    expect(out[0].verdict).toContain('ranks 1 of 3');
  });
});

describe('density warning in verdicts', () => {
  it('warns when the density correlation is below the threshold and stays quiet above it', () => {
    const low = { ...run('umap-x', 1, 0.9, 0.9, 0.5), metrics: { trustworthiness: 0.9, continuity: 0.9, knn_overlap: 0.5, density_correlation: -0.1 } };
    const high = { ...run('umap-y', 1, 0.9, 0.9, 0.5), metrics: { trustworthiness: 0.9, continuity: 0.9, knn_overlap: 0.5, density_correlation: 0.8 } };
    const out = rankSettings(
      [
        { spec: spec('umap-x'), runs: [low], stability: stab(0.1, 0.8, 0.9) },
        { spec: spec('umap-y'), runs: [high], stability: stab(0.1, 0.8, 0.9) },
      ],
      'composite',
    );
    expect(out.find((s) => s.id === 'umap-x')!.verdict).toMatch(/density correlation is -0\.100 \(below 0\.3\)/);
    expect(out.find((s) => s.id === 'umap-y')!.verdict).not.toMatch(/density correlation/);
  });
});

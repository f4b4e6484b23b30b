import { describe, expect, it } from 'vitest';
import { resolveSweep } from '../../src/config/sweep.js';
import { estimateSweepSeconds, expandGrid, neighboursNeeded, rowLimitProblems } from '../../src/config/plan.js';
import { toOverrides } from '../../src/cli/options.js';

const cfg = (flags: Record<string, unknown>) => resolveSweep(null, toOverrides(flags));

describe('expandGrid', () => {
  it('makes one setting per parameter combination and one run per seed, plus the PCA baseline once', () => {
    const { settings, runs } = expandGrid(cfg({ methods: 'tsne,umap', perplexity: '10,30', neighbors: '10,30', 'min-dist': '0.1,0.5', seeds: '3' }));
    expect(settings.map((s) => s.id)).toEqual([
      'tsne-p10-pca', 'tsne-p30-pca',
      'umap-n10-d0.1-spectral', 'umap-n10-d0.5-spectral', 'umap-n30-d0.1-spectral', 'umap-n30-d0.5-spectral',
      'pca',
    ]);
    expect(runs).toHaveLength(6 * 3 + 1);
    expect(runs[0].id).toBe('tsne-p10-pca-s1');
    expect(new Set(runs.map((r) => r.id)).size).toBe(runs.length);
  });

  it('gives run ids that depend only on the setting and the seed', () => {
    const a = expandGrid(cfg({ perplexity: '30', seeds: '2' })).runs.map((r) => r.id);
    const b = expandGrid(cfg({ perplexity: '10,30', seeds: '2' })).runs.map((r) => r.id);
    for (const id of a) expect(b).toContain(id);
  });
});

describe('row limits', () => {
  it('names the setting and the limit when t-SNE perplexity is too large for n', () => {
    const { settings } = expandGrid(cfg({ methods: 'tsne', perplexity: '10,30' }));
    const problems = rowLimitProblems(settings, 60, 15);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toBe('setting tsne-p30-pca: perplexity 30 needs more rows: t-SNE requires perplexity < (n − 1)/3 = 19.67 for n = 60');
  });

  it('requires n_neighbors < n for UMAP and k < n − 1 for scoring', () => {
    const { settings } = expandGrid(cfg({ methods: 'umap', neighbors: '30' }));
    expect(rowLimitProblems(settings, 30, 15)[0]).toMatch(/UMAP requires n_neighbors < n = 30/);
    expect(rowLimitProblems(settings, 40, 39)[0]).toMatch(/scoring requires k < n − 1 = 39/);
  });
});

describe('neighboursNeeded', () => {
  it('covers 3·perplexity + 1 for t-SNE, n_neighbors − 1 for UMAP and k, capped at n − 1', () => {
    const { settings } = expandGrid(cfg({ perplexity: '30', neighbors: '50' }));
    expect(neighboursNeeded(settings, 15, 1000)).toBe(91);
    expect(neighboursNeeded(settings, 15, 50)).toBe(49);
  });
});

describe('estimateSweepSeconds', () => {
  it('grows with n and shrinks with more workers', () => {
    const { runs } = expandGrid(cfg({ perplexity: '30', seeds: '4' }));
    const small = estimateSweepSeconds(runs, 1000, 50, 1, 91).total;
    const big = estimateSweepSeconds(runs, 4000, 50, 1, 91).total;
    const two = estimateSweepSeconds(runs, 4000, 50, 2, 91).total;
    expect(big).toBeGreaterThan(small * 3);
    expect(two).toBeLessThan(big);
  });
});

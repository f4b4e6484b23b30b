import { describe, expect, it } from 'vitest';
import type { ClusterStability } from '../../src/core/results.js';
import { buildReport } from '../../src/report/index.js';
import {
  HENNIG_DISSOLVED,
  HENNIG_NOTE,
  HENNIG_STABLE,
  clusterPhrase,
  headline,
  readClusters,
  settingSentence,
} from '../../src/report/words.js';
import { makeFixture } from './fixture.js';

function cluster(c: number, j: number, label: string | null = null): ClusterStability {
  return { cluster: c, size: 10, mean_jaccard: j, reading: '', majority_label: label };
}

describe('the cluster-stability wording', () => {
  it('reads clusters against Hennig\u2019s thresholds: stable at 0.75 and above, dissolved at 0.5 and below', () => {
    // Hennig (2007), Computational Statistics & Data Analysis 52; thresholds as in the fpc clusterboot documentation (from memory).
    expect(HENNIG_STABLE).toBe(0.75);
    expect(HENNIG_DISSOLVED).toBe(0.5);
    const r = readClusters([cluster(2, 0.75), cluster(0, 0.5), cluster(1, 0.74), cluster(3, 0.51), cluster(4, 0.99)]);
    expect(r.stable.map((c) => c.cluster)).toEqual([2, 4]);
    expect(r.dissolved.map((c) => c.cluster)).toEqual([0]);
    expect(r.between.map((c) => c.cluster)).toEqual([1, 3]);
  });

  it('names the stable and the dissolved clusters with their majority label and value', () => {
    const text = clusterPhrase([cluster(0, 0.97, 'calm'), cluster(1, 0.41), cluster(2, 0.62, 'fog')]);
    expect(text).toBe(
      "k-means clusters of the first seed's map: 1 of 3 stable across seeds (mean Jaccard ≥ 0.75 — cluster 0, mostly calm, 0.97), " +
        '1 dissolved (≤ 0.5 — cluster 1, 0.41), 1 in between (cluster 2, mostly fog, 0.62)',
    );
    expect(clusterPhrase([cluster(0, 0.2)])).toContain('0 of 1 stable across seeds (none reaches a mean Jaccard of 0.75)');
  });

  it('flags a setting whose seeds produced identical maps instead of judging its clusters', () => {
    const f = makeFixture();
    const pca = f.results.settings.find((s) => s.id === 'pca')!;
    const text = settingSentence(pca, 2, f.results);
    expect(text).toMatch(/^PCA \(not ranked\): warning, every seed produced the identical map, so the seeds tested nothing/);
    expect(text).toContain('perturbed by seed: none');
  });

  it('quotes the numbers, the thresholds and the perturbations of each setting', () => {
    const f = makeFixture();
    const s = f.results.settings[0];
    s.stability.perturbations = ['seed: random initialisation', 'row resample 0.9'];
    const text = settingSentence(s, 2, f.results);
    expect(text).toContain('t-SNE, perplexity 30, init random (rank 1 of 2, composite 0.812)');
    expect(text).toContain('mean Jaccard ≥ 0.75');
    expect(text).toContain('≤ 0.5');
    expect(text).toContain(`point stability mean ${s.stability.points!.mean.toFixed(2)}`);
    expect(text).toContain('perturbed by seed: random initialisation; row resample 0.9');
    // Older results name no perturbation: the seeds (and a row resample, when the sweep had one) are what varied.
    delete s.stability.perturbations;
    f.results.sweep.resample = 0.8;
    expect(settingSentence(s, 2, f.results)).toContain('perturbed by seed (3 seeds); row resample 0.8');
  });

  it('puts the recommended setting and whether its clusters survive seed changes first', () => {
    const f = makeFixture();
    const h = headline(f.results.settings.filter((s) => s.rank !== null))!;
    expect(h.pick).toBe('Use t-SNE, perplexity 30, init random: rank 1 of 2, composite score 0.812 (best t-SNE setting).');
    expect(h.clusters).toMatch(/^2 of its 3 k-means clusters survive seed changes \(Hennig 2007 thresholds/);
    expect(h.clusters).toContain('Dissolved (≤ 0.5): cluster 2');
    expect(headline([])).toBeNull();
  });
});

describe('the summary of the page', () => {
  const report = buildReport(makeFixture({ grid: true }), { png: false });

  it('opens with the recommendation box, before the cautions and the table', () => {
    const html = report.html;
    const box = html.indexOf('id="recommendation"');
    expect(box).toBeGreaterThan(0);
    expect(box).toBeLessThan(html.indexOf('id="cautions"'));
    expect(html.slice(box, html.indexOf('</div>', box))).toContain('Use t-SNE, perplexity 30, init random');
    expect(html.slice(box, html.indexOf('</div>', box))).toContain('survive seed changes');
  });

  it('has one judged sentence per setting and quotes Hennig with the resampling caveat', () => {
    const html = report.html;
    const list = html.slice(html.indexOf('<ul class="sentences">'), html.indexOf('</ul>', html.indexOf('<ul class="sentences">')));
    expect((list.match(/<li>/g) ?? []).length).toBe(9);
    expect(HENNIG_NOTE).toBe(
      'Hennig (2007), thresholds stated for bootstrap resampling; here the seeds (and row resamples, if any) are the resampling.',
    );
    expect(html).toContain(HENNIG_NOTE);
    expect(report.markdown).toContain('Hennig (2007), thresholds stated for bootstrap resampling');
    // Both identical-map settings are flagged.
    expect((list.match(/every seed produced the identical map/g) ?? []).length).toBe(2);
  });

  it('states the cautions beside the per-seed maps as well', () => {
    const html = report.html;
    const seeds = html.slice(html.indexOf('<section id="seeds">'), html.indexOf('</section>', html.indexOf('<section id="seeds">')));
    expect(seeds).toMatch(/distances between clusters/);
    expect(seeds).toMatch(/hypothesis to check, not evidence/);
    expect(seeds).toMatch(/depend\s+on the preprocessing/);
  });

  it('lists the audit time and the planned estimate in the provenance', () => {
    const html = report.html;
    const prov = html.slice(html.indexOf('<section id="provenance">'));
    expect(prov).toContain('<dt>wall-clock seconds of the audit</dt><dd>12.3</dd>');
    expect(prov).toContain('<dt>estimated seconds (plan)</dt><dd>15.0</dd>');
    expect(prov).toContain('9 settings (t-SNE, UMAP, PCA), 27 runs, 27 succeeded');
    expect(prov).toContain('<dt>data sha256</dt>');
    expect(prov).toContain('<dt>command</dt>');
    expect(prov).toContain('<dt>cores</dt><dd>2</dd>');
  });
});

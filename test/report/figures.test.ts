import { describe, expect, it } from 'vitest';
import { InternalError } from '../../src/core/errors.js';
import { Rng } from '../../src/core/rng.js';
import { procrustes } from '../../src/metrics/procrustes.js';
import { buildReport } from '../../src/report/index.js';
import { fixed } from '../../src/report/format.js';
import { viridis } from '../../src/report/palette.js';
import { spearman } from '../../src/report/shepard.js';
import { makeFixture, transformed } from './fixture.js';

/** The inline SVG of a figure in the HTML page. */
function inlineFigure(html: string, name: string): string {
  const start = html.indexOf(`<figure id="fig-${name}">`);
  expect(start, `figure ${name}`).toBeGreaterThanOrEqual(0);
  return html.slice(start, html.indexOf('</figure>', start));
}

function unescapeHtml(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&');
}

interface Panel {
  seed: number;
  scale: number;
  ox: number;
  oy: number;
  /** data row → plotted (cx, cy) in panel coordinates */
  points: Map<number, [number, number]>;
  text: string;
}

/** The panels of one setting's row in the seed grid. */
function gridPanels(svg: string, setting: string): Panel[] {
  const out: Panel[] = [];
  const re = /<g class="panel" data-setting="([^"]*)" data-seed="(\d+)" data-scale="([^"]+)" data-ox="([^"]+)" data-oy="([^"]+)"[^>]*>/g;
  for (const m of svg.matchAll(re)) {
    if (unescapeHtml(m[1]) !== setting) continue;
    const start = m.index! + m[0].length;
    const body = svg.slice(start, svg.indexOf('<g class="panel"', start) > 0 ? svg.indexOf('<g class="panel"', start) : undefined);
    const points = new Map<number, [number, number]>();
    for (const c of body.matchAll(/<circle cx="([^"]+)" cy="([^"]+)" r="[^"]+" data-r="(\d+)"\/>/g)) {
      points.set(Number(c[3]), [Number(c[1]), Number(c[2])]);
    }
    out.push({ seed: Number(m[2]), scale: Number(m[3]), ox: Number(m[4]), oy: Number(m[5]), points, text: body });
  }
  return out;
}

/** Undo the panel's linear scaling: cx = ox + scale·u, cy = oy − scale·v. */
function unplot(p: Panel, row: number): [number, number] {
  const [cx, cy] = p.points.get(row)!;
  return [(cx - p.ox) / p.scale, (p.oy - cy) / p.scale];
}

describe('the seed grid (every setting by every seed)', () => {
  // Seed 2 of one setting is a rotated, rescaled copy of seed 1 with heavy noise, so its disparity is far from 0.
  const f = makeFixture({ grid: true, n: 80 });
  const base = f.embeddings.get('umap-n5-d0.5-s1')!.data;
  f.embeddings.set('umap-n5-d0.5-s2', { n: 80, data: transformed(base, 2.0, true, 7, [3, -4], 3, new Rng(99)) });
  const report = buildReport(f, { png: false });
  const svg = inlineFigure(report.html, 'seed-grid');

  it('has one row per setting in ranked order, then the unranked ones, and one panel per seed', () => {
    const order = [...svg.matchAll(/<g class="panel" data-setting="([^"]*)" data-seed="1"/g)].map((m) => m[1]);
    expect(order).toEqual([
      'tsne-p30-random',
      'umap-n15-d0.1',
      'tsne-p10-random',
      'tsne-p50-random',
      'umap-n5-d0.1',
      'umap-n15-d0.5',
      'umap-n5-d0.5',
      'tsne-p30-pca',
      'pca',
    ]);
    for (const id of order) expect(gridPanels(svg, id).map((p) => p.seed)).toEqual([1, 2, 3]);
    expect(gridPanels(svg, 'pca')[0].points.size).toBe(80);
  });

  it('draws each seed aligned onto the first: the disparity recomputed from the plotted points equals procrustes(first, seed)', () => {
    for (const setting of ['umap-n5-d0.5', 'tsne-p30-random']) {
      const [ref, ...others] = gridPanels(svg, setting);
      const rows = [...ref.points.keys()];
      // Centre and norm of the reference, in its own (unplotted) coordinates.
      const r = rows.map((i) => unplot(ref, i));
      const mx = r.reduce((a, p) => a + p[0], 0) / r.length;
      const my = r.reduce((a, p) => a + p[1], 0) / r.length;
      const ss = r.reduce((a, p) => a + (p[0] - mx) ** 2 + (p[1] - my) ** 2, 0);
      for (const p of others) {
        // The aligned map is already in the reference's frame: its disparity is the plain squared distance
        // to the reference, both standardised by the reference's centre and size (scipy.spatial.procrustes convention).
        let d = 0;
        rows.forEach((i, t) => {
          const [u, v] = unplot(p, i);
          d += (u - r[t][0]) ** 2 + (v - r[t][1]) ** 2;
        });
        const fromPlot = d / ss;
        const A = f.embeddings.get(`${setting}-s1`)!;
        const B = f.embeddings.get(`${setting}-s${p.seed}`)!;
        const expected = procrustes({ n: A.n, d: 2, data: A.data }, { n: B.n, d: 2, data: B.data }).disparity;
        // Coordinates are rounded to 0.01 SVG units in a 150-unit panel.
        expect(Math.abs(fromPlot - expected)).toBeLessThan(1e-4 + 1e-3 * expected);
        expect(p.text.length).toBeGreaterThan(0);
        expect(svg).toContain(`seed ${p.seed} · disparity ${fixed(expected)}`);
      }
    }
    // The noisy seed really is different, so the check above was not trivially about identical maps.
    const A = f.embeddings.get('umap-n5-d0.5-s1')!;
    const B = f.embeddings.get('umap-n5-d0.5-s2')!;
    expect(procrustes({ n: 80, d: 2, data: A.data }, { n: 80, d: 2, data: B.data }).disparity).toBeGreaterThan(0.05);
  });

  it('shares one scaling across a row and keeps every point inside its panel', () => {
    for (const setting of ['tsne-p30-random', 'umap-n15-d0.5']) {
      const panels = gridPanels(svg, setting);
      expect(new Set(panels.map((p) => p.scale)).size).toBe(1);
      for (const p of panels) {
        for (const [x, y] of p.points.values()) {
          expect(x).toBeGreaterThanOrEqual(0);
          expect(x).toBeLessThanOrEqual(150);
          expect(y).toBeGreaterThanOrEqual(0);
          expect(y).toBeLessThanOrEqual(150);
        }
      }
    }
  });

  it('flags the settings whose seeds gave identical maps', () => {
    const pcaRow = svg.slice(svg.indexOf('>not ranked<'));
    expect(pcaRow).toContain('same map for every seed:');
  });

  it('colours by label and says on the figure which points are drawn', () => {
    expect(svg).toContain('label: ');
    expect(svg).toContain('Each panel: all 80 points.');
    const big = buildReport(makeFixture({ n: 2000 }), { png: false });
    const g = inlineFigure(big.html, 'seed-grid');
    expect(g).toContain('Each panel: 1,500 of 2,000 points, the same in every panel, a seeded random sample stratified by label.');
    expect(gridPanels(g, 'tsne-p30-random')[0].points.size).toBe(1500);
  });

  it('uses one colour and says so when there are no labels', () => {
    const r = buildReport(makeFixture({ labels: false }), { png: false });
    const g = inlineFigure(r.html, 'seed-grid');
    expect(g).toContain('all points (no label column)');
    expect(r.html).toContain('the k-means clusters are not stored in results.json, so all points have one colour');
  });
});

describe('runs that embedded a resample of the rows', () => {
  it('draws only the rows a seed embedded, aligned over the rows it shares with the first seed', () => {
    const f = makeFixture({ n: 60 });
    const full = f.embeddings.get('umap-n15-d0.1-s2')!;
    const rows = Int32Array.from({ length: 45 }, (_, t) => t + 10); // rows 10..54
    const data = new Float64Array(90);
    rows.forEach((r, t) => {
      data[2 * t] = full.data[2 * r];
      data[2 * t + 1] = full.data[2 * r + 1];
    });
    f.embeddings.set('umap-n15-d0.1-s2', { n: 45, data, rows });
    const r = buildReport(f, { png: false });
    const svg = inlineFigure(r.html, 'seed-grid');
    const [ref, p2] = gridPanels(svg, 'umap-n15-d0.1');
    expect(ref.points.size).toBe(60);
    expect(p2.points.size).toBe(45);
    expect([...p2.points.keys()].sort((a, b) => a - b)).toEqual(Array.from(rows));
    // Over the shared rows the plotted disparity is the Procrustes disparity of those rows.
    const A = f.embeddings.get('umap-n15-d0.1-s1')!;
    const a = new Float64Array(90);
    rows.forEach((row, t) => {
      a[2 * t] = A.data[2 * row];
      a[2 * t + 1] = A.data[2 * row + 1];
    });
    const expected = procrustes({ n: 45, d: 2, data: a }, { n: 45, d: 2, data }).disparity;
    expect(svg).toContain(`seed 2 · disparity ${fixed(expected)}`);
    // The overlay map draws the 45 rows of that seed too.
    const overlay = inlineFigure(r.html, 'map-umap-n15-d0-1');
    const layer = overlay.slice(overlay.indexOf('<g class="seed-2">'), overlay.indexOf('<g class="seed-1">'));
    expect((layer.match(/<circle /g) ?? []).length).toBe(45);
  });

  it('rejects an embedding whose point count fits neither the data set nor its row list', () => {
    const f = makeFixture();
    f.embeddings.set('umap-n15-d0.1-s2', { n: 59, data: new Float64Array(118) });
    expect(() => buildReport(f, { png: false })).toThrow(InternalError);
    f.embeddings.set('umap-n15-d0.1-s2', { n: 2, data: new Float64Array(4), rows: Int32Array.of(0, 60) });
    expect(() => buildReport(f, { png: false })).toThrow(/names row 60/);
  });
});

describe('the heatmaps over the grid', () => {
  const f = makeFixture({ grid: true });
  const report = buildReport(f, { png: false });

  it('draw one heatmap per method with a varying parameter: t-SNE perplexity × init, UMAP neighbours × min-dist', () => {
    const names = report.figures.map((x) => x.name);
    expect(names.filter((n) => n.startsWith('heatmap-'))).toEqual(['heatmap-tsne', 'heatmap-umap']);
    const tsne = inlineFigure(report.html, 'heatmap-tsne');
    expect(tsne).toContain('columns: perplexity; rows: init');
    const umap = inlineFigure(report.html, 'heatmap-umap');
    expect(umap).toContain('columns: neighbours; rows: min-dist');
  });

  it('give every cell the mean over seeds with the sd under it, taken from the settings', () => {
    const tsne = inlineFigure(report.html, 'heatmap-tsne');
    for (const s of f.results.settings.filter((x) => x.method === 'tsne')) {
      const m = s.metrics.trustworthiness;
      const title = `t-SNE, perplexity ${s.params.perplexity}, init ${s.params.init}: trustworthiness ${fixed(m.mean)} ± ${fixed(m.sd)}`;
      expect(tsne).toContain(`<title>${title}</title>`);
    }
    // 3 perplexities × 2 inits = 6 cells per panel; the (perplexity 10, init pca) cell has no setting.
    const panels = (tsne.match(/<rect class="cell"/g) ?? []).length;
    expect(panels % 6).toBe(0);
    expect(panels / 6).toBeGreaterThanOrEqual(10);
  });

  it('colour each panel from its worst value (dark) to its best (bright), reversed for lower-is-better scores', () => {
    const umap = inlineFigure(report.html, 'heatmap-umap');
    const cell = (title: string): string => {
      const m = new RegExp(`<rect class="cell"[^>]*fill="(#[0-9a-f]{6})"><title>${title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}`).exec(umap);
      expect(m, title).not.toBeNull();
      return m![1];
    };
    // Composite: best 0.770 (neighbours 15, min-dist 0.1), worst 0.600 (neighbours 5, min-dist 0.5).
    expect(cell('UMAP, neighbours 15, min-dist 0.1: composite score 0.770')).toBe(viridis(1));
    expect(cell('UMAP, neighbours 5, min-dist 0.5: composite score 0.600')).toBe(viridis(0));
    // Procrustes disparity, lower is better: the smallest value is bright.
    const procrustesBest = f.results.settings.find((s) => s.id === 'umap-n15-d0.1')!.stability.procrustes_mean!;
    expect(cell(`UMAP, neighbours 15, min-dist 0.1: Procrustes disparity \\(mean\\) ${fixed(procrustesBest)}`.replace(/\\/g, ''))).toBe(viridis(1));
    expect(umap).toContain('lower is better; brighter = better');
    expect(umap).toContain('higher is better; brighter = better');
  });

  it('leave the stability cells blank for a setting whose seeds gave identical maps, and leave out the KL divergence', () => {
    const tsne = inlineFigure(report.html, 'heatmap-tsne');
    expect(tsne).toContain('<title>t-SNE, perplexity 30, init pca: seed kNN overlap no value</title>');
    expect(tsne.slice(0, tsne.indexOf('</svg>'))).not.toContain('KL divergence');
  });
});

describe('the score-against-parameter charts', () => {
  const f = makeFixture({ grid: true });
  const report = buildReport(f, { png: false });

  it('draw one line per other-parameter combination in every panel, with a mean ± sd band where seeds vary', () => {
    const svg = inlineFigure(report.html, 'scores-umap');
    expect(svg).toContain('UMAP, min-dist 0.1');
    expect(svg).toContain('UMAP, min-dist 0.5');
    const marks = svg.slice(svg.indexOf('<g class="marks">'));
    const lines = marks.match(/<polyline /g) ?? [];
    const bands = marks.match(/<polygon /g) ?? [];
    const panels = (svg.match(/font-weight="bold" font-size="11"/g) ?? []).length;
    expect(lines.length).toBe(2 * panels);
    // Bands only for scores with a standard deviation over seeds (not the composite and the pairwise stability scores).
    expect(bands.length).toBeGreaterThan(0);
    expect(bands.length).toBeLessThan(lines.length);
    expect(svg).toContain('higher is better');
    expect(svg).toContain('lower is better');
  });

  it('put perplexity on a log axis when its values span a factor of 4 or more', () => {
    expect(inlineFigure(report.html, 'scores-tsne')).toContain('perplexity (log scale)');
    expect(inlineFigure(report.html, 'scores-umap')).not.toContain('(log scale)');
  });
});

describe('the R_NX curves', () => {
  const f = makeFixture({ grid: true });
  const report = buildReport(f, { png: false });
  const svg = inlineFigure(report.html, 'rnx-curves');

  it('draw the leading settings with their AUC in the legend, the PCA baseline dashed', () => {
    const s = f.results.settings.find((x) => x.id === 'tsne-p30-random')!;
    expect(svg).toContain(`t-SNE, perplexity 30, init random (rank 1) — AUC ${fixed(s.metrics.auc_rnx!.mean)}`);
    expect(svg).toContain('PCA (not ranked) — AUC');
    expect(svg).toContain('stroke-dasharray');
    expect(svg).toContain('neighbourhood size K (log scale)');
  });

  it('average the seeds and place K on a log axis: doublings of K are equally spaced', () => {
    const marks = svg.slice(svg.indexOf('<g class="marks">'));
    const first = /<polyline points="([^"]+)"/.exec(marks)![1].split(' ').map((p) => p.split(',').map(Number));
    const K = f.results.runs.find((r) => r.setting === 'tsne-p30-random')!.rnx_curve!.K;
    expect(first).toHaveLength(K.length);
    const dx = first.slice(1).map((p, i) => p[0] - first[i][0]);
    for (const d of dx) expect(d).toBeCloseTo(dx[0], 1);
    // The mean of the seeds' values is what is drawn: its ordering along y follows the mean curve.
    const runs = f.results.runs.filter((r) => r.setting === 'tsne-p30-random');
    const meanCurve = K.map((_, t) => runs.reduce((a, r) => a + r.rnx_curve!.values[t], 0) / runs.length);
    const ys = first.map((p) => p[1]);
    for (let t = 1; t < K.length; t++) expect(Math.sign(ys[t] - ys[t - 1])).toBe(-Math.sign(meanCurve[t] - meanCurve[t - 1]));
  });
});

describe('the point-stability map', () => {
  const f = makeFixture({ grid: true });
  const report = buildReport(f, { png: false });
  const svg = inlineFigure(report.html, 'point-stability');
  const values = f.points!.get('tsne-p30-random')!;

  it('colours the best-ranked setting\u2019s first-seed map by each point\u2019s stability on the viridis scale', () => {
    expect(svg).toContain('Point stability in the map of t-SNE, perplexity 30, init random, seed 1');
    for (const row of [1, 7, 30]) {
      const m = new RegExp(`fill="(#[0-9a-f]{6})" data-r="${row}" data-v="([^"]+)"`).exec(svg);
      expect(m, `row ${row}`).not.toBeNull();
      expect(m![1]).toBe(viridis(values[row]));
      expect(m![2]).toBe(fixed(values[row]));
    }
    // A point without a value is grey.
    expect(svg).toMatch(new RegExp(`fill="#e6e6e6" data-r="${values.length - 1}"`));
  });

  it('rings the least stable points listed in the results, each with its id in a tooltip', () => {
    const least = f.results.settings.find((s) => s.id === 'tsne-p30-random')!.stability.points!.least_stable;
    const rings = [...svg.matchAll(/<circle class="ring"[^>]*data-r="(\d+)"[^>]*><title>([^<]*)<\/title>/g)];
    // results.json numbers the rows from 1; the drawing uses 0-based data rows.
    expect(rings.map((m) => Number(m[1]))).toEqual(least.map((p) => p.row - 1));
    rings.forEach((m, i) => expect(unescapeHtml(m[2])).toContain(`id ${least[i].id}`));
    expect(svg).toContain(`the ${least.length} least stable`);
  });

  it('finds the listed points by their id whether their rows count from 0 or from 1', () => {
    const g = makeFixture({ grid: true });
    const list = g.results.settings[0].stability.points!.least_stable;
    for (const p of list) p.row -= 1;
    const s = inlineFigure(buildReport(g, { png: false }).html, 'point-stability');
    const rings = [...s.matchAll(/<circle class="ring"[^>]*data-r="(\d+)"/g)].map((m) => Number(m[1]));
    expect(rings).toEqual(list.map((p) => p.row));
  });

  it('is left out when the per-point values are not given', () => {
    const r = buildReport({ results: f.results, embeddings: f.embeddings }, { png: false });
    expect(r.figures.map((x) => x.name)).not.toContain('point-stability');
  });
});

describe('the Shepard scatter plots', () => {
  it('show the best setting of each method with the recorded Spearman value in its title', () => {
    const f = makeFixture({ grid: true });
    const svg = inlineFigure(buildReport(f, { png: false }).html, 'shepard');
    const run = f.results.runs.find((r) => r.id === 'tsne-p30-random-s1')!;
    expect(svg).toContain(`Spearman ρ ${fixed(run.metrics.distance_spearman)} (seed 1, all pairs)`);
    expect(svg).toContain('>t-SNE (rank 1)</text><text x="58" y="27">perplexity 30, init random</text>');
    expect(svg).toContain('UMAP (rank 2)</text>');
    expect(svg).toContain('neighbours 15, min-dist 0.1</text>');
    expect(svg).toContain('PCA (not ranked)');
    const marks = svg.slice(svg.indexOf('<g class="marks">'));
    expect((marks.match(/<circle /g) ?? []).length).toBe(3 * f.results.dataset.distance_sample!.i.length);
  });

  it('compute the Spearman value of the sampled pairs when the run did not record one', () => {
    const f = makeFixture();
    for (const r of f.results.runs) delete r.metrics.distance_spearman;
    const svg = inlineFigure(buildReport(f, { png: false }).html, 'shepard');
    const { i, j, distance } = f.results.dataset.distance_sample!;
    const e = f.embeddings.get('tsne-p30-random-s1')!.data;
    const mapD = i.map((a, t) => Math.hypot(e[2 * a] - e[2 * j[t]], e[2 * a + 1] - e[2 * j[t] + 1]));
    expect(svg).toContain(`Spearman ρ ${fixed(spearman(distance, mapD))} (seed 1, the ${i.length} sampled pairs)`);
  });

  it('draw map distances that grow linearly with the true map distance (one scaling per panel)', () => {
    const f = makeFixture();
    const svg = inlineFigure(buildReport(f, { png: false }).html, 'shepard');
    const { i, j } = f.results.dataset.distance_sample!;
    const e = f.embeddings.get('tsne-p30-random-s1')!.data;
    const first = svg.slice(svg.indexOf('<g class="marks">'));
    const ys = [...first.slice(0, first.indexOf('</g>')).matchAll(/cy="([^"]+)"/g)].map((m) => Number(m[1]));
    const d = i.map((a, t) => Math.hypot(e[2 * a] - e[2 * j[t]], e[2 * a + 1] - e[2 * j[t] + 1]));
    // cy = c − s·d for one s > 0: check with the two extreme pairs.
    const lo = d.indexOf(Math.min(...d));
    const hi = d.indexOf(Math.max(...d));
    const s = (ys[lo] - ys[hi]) / (d[hi] - d[lo]);
    expect(s).toBeGreaterThan(0);
    d.forEach((v, t) => expect(Math.abs(ys[t] - (ys[lo] - s * (v - d[lo])))).toBeLessThan(0.02));
  });
});

describe('results without the newer optional fields', () => {
  it('build a report that leaves out what needs them', () => {
    const legacy = buildReport(makeFixture({ legacy: true, grid: true }), { png: false });
    const names = legacy.figures.map((x) => x.name);
    expect(names).not.toContain('rnx-curves');
    expect(names).not.toContain('point-stability');
    expect(names).not.toContain('shepard');
    expect(names).toContain('seed-grid');
    expect(names).toContain('heatmap-tsne');
    const heat = inlineFigure(legacy.html, 'heatmap-tsne');
    expect(heat).not.toContain('AUC of R_NX');
    expect(heat).not.toContain('point stability');
    expect(legacy.html).not.toContain('stable clusters (≥');
    expect(legacy.html).not.toContain('Hennig (2007), thresholds');
    expect(legacy.html).not.toContain('wall-clock seconds');
    // Without cluster-wise stability the headline falls back on the ARI bands.
    expect(legacy.html).toContain('by the adjusted Rand index (ARI mean 0.900; bands of Steinley 2004)');
  });
});

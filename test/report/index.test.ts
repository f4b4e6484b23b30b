import { describe, expect, it } from 'vitest';
import { embeddingAsMatrix } from '../../src/core/matrix.js';
import type { Embedding } from '../../src/core/types.js';
import { alignTo } from '../../src/metrics/procrustes.js';
import { MAP_BOX, buildReport, scatterPoints } from '../../src/report/index.js';
import { NASTY_LABEL, NASTY_PATH, makeFixture } from './fixture.js';

const fixture = makeFixture();
const report = buildReport(fixture, { png: false });

function unescapeHtml(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&');
}

function section(html: string, id: string): string {
  const start = html.indexOf(`<section id="${id}">`);
  expect(start, `section ${id}`).toBeGreaterThanOrEqual(0);
  return html.slice(start, html.indexOf('</section>', start));
}

/** The inline SVG of a figure in the HTML page. */
function inlineFigure(html: string, name: string): string {
  const start = html.indexOf(`<figure id="fig-${name}">`);
  expect(start, `figure ${name}`).toBeGreaterThanOrEqual(0);
  return html.slice(start, html.indexOf('</figure>', start));
}

/** Circles of one seed layer: id (from the point's title) → plotted (cx, cy). */
function layerCircles(svg: string, seed: number): Map<string, [number, number]> {
  const start = svg.indexOf(`<g class="seed-${seed}">`);
  expect(start, `layer of seed ${seed}`).toBeGreaterThanOrEqual(0);
  const rest = svg.slice(start + 1);
  const ends = [rest.indexOf('<g class="seed-'), rest.indexOf('<g font-family')].filter((i) => i >= 0);
  const body = rest.slice(0, Math.min(...ends));
  const out = new Map<string, [number, number]>();
  const re = /<circle cx="([^"]+)" cy="([^"]+)" r="[^"]+"><title>id (.*?), label .*?, seed (\d+)<\/title><\/circle>/g;
  for (const m of body.matchAll(re)) {
    expect(Number(m[4])).toBe(seed);
    out.set(unescapeHtml(m[3]), [Number(m[1]), Number(m[2])]);
  }
  return out;
}

function countLayerCircles(svg: string, seed: number): number {
  const start = svg.indexOf(`<g class="seed-${seed}">`);
  const rest = svg.slice(start + 1);
  const ends = [rest.indexOf('<g class="seed-'), rest.indexOf('<g font-family')].filter((i) => i >= 0);
  return (rest.slice(0, Math.min(...ends)).match(/<circle /g) ?? []).length;
}

describe('buildReport', () => {
  it('makes an HTML page that fetches nothing: no URL, no src/href, no <link>, no external script or CSS import', () => {
    const { html } = report;
    expect(html).not.toMatch(/https?:\/\//i);
    expect(html).not.toMatch(/\b(src|href|xlink:href)\s*=/i);
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/@import|url\(/i);
    expect(html).not.toMatch(/<(img|iframe|object|embed)\b/i);
    // One executed inline script, and one inert JSON block with the ids and labels for the point tooltips.
    const scripts = html.match(/<script\b[^>]*>/gi) ?? [];
    expect(scripts).toEqual(['<script type="application/json" id="point-data">', '<script>']);
  });

  it('escapes user text (path, label column, labels, ids, command) in the HTML, the Markdown and the figures', () => {
    const { html, markdown, figures } = report;
    for (const raw of [NASTY_LABEL, NASTY_PATH, 'kind<&>', `id<0>&"'`]) {
      expect(html).not.toContain(raw);
      expect(markdown).not.toContain(raw);
    }
    expect(html).toContain('&lt;b&gt;&amp;&quot;&#39;x');
    expect(html).toContain('data/&lt;odd&gt;&amp;&quot;&#39;|*name*.csv');
    expect(html).toContain('kind&lt;&amp;&gt;');
    expect(html).toContain('id&lt;0&gt;&amp;&quot;&#39;');
    // Markdown: HTML-significant characters become entities, Markdown punctuation is backslash-escaped.
    expect(markdown).toContain(`data/&lt;odd&gt;&amp;"'\\|\\*name\\*.csv`);
    expect(markdown).toContain('flat\\|col\\*');
    for (const f of figures) {
      expect(f.svg).not.toContain(NASTY_LABEL);
      expect(f.svg).not.toMatch(/<script/i);
    }
    // The verdict written upstream is user-facing text too.
    expect(html).toContain('kept &lt;neighbours&gt; &amp; held.');
  });

  it('lists every ranked setting in the table in rank order, then the unranked one', () => {
    const body = report.html.slice(report.html.indexOf('<tbody>'), report.html.indexOf('</tbody>'));
    const rows = body.split('<tr ').slice(1);
    expect(rows).toHaveLength(fixture.results.settings.length);
    const firstCells = rows.map((r) => /<td[^>]*>([^<]*)<\/td>/.exec(r)![1]);
    expect(firstCells).toEqual(['1', '2', 'not ranked']);
    expect(rows[0]).toContain('perplexity 30, init random');
    expect(rows[1]).toContain('neighbours 15, min-dist 0.1');
    expect(rows[0]).toContain('0.923 ± 0.004'); // trustworthiness mean ± sd, 3 decimals
    expect(rows[0]).toContain('1.234 ± 0.012'); // KL divergence present for t-SNE
    // Markdown table in the same order.
    const mdRows = report.markdown.split('\n').filter((l) => /^\| (\d+|not ranked) \|/.test(l));
    expect(mdRows.map((l) => l.split(' | ')[0])).toEqual(['| 1', '| 2', '| not ranked']);
  });

  it('names the top setting per method in the summary and lists the identical-map setting as not ranked', () => {
    const summary = section(report.html, 'summary');
    expect(summary).toContain('t-SNE: perplexity 30, init random ranks first');
    expect(summary).toContain('composite score 0.812');
    expect(summary).toContain('ARI mean 0.900');
    expect(summary).toContain('seed kNN overlap 0.701');
    expect(summary).toContain('Procrustes mean 0.031');
    expect(summary).toContain('UMAP: neighbours 15, min-dist 0.1 ranks first');
    expect(summary).toContain('not ranked: every seed gave the same map, so seeds tested nothing');
    // The summary comes first on the page.
    expect(report.html.indexOf('id="summary"')).toBeLessThan(report.html.indexOf('id="ranking"'));
  });

  it('states the cautions near the top and again beside the maps, in both formats', () => {
    const top = section(report.html, 'cautions');
    const maps = section(report.html, 'maps');
    for (const text of [top, maps, report.markdown]) {
      expect(text).toMatch(/distances between clusters/i);
      expect(text).toMatch(/sizes? (and spread )?of (a )?clusters?/i);
      expect(text).toMatch(/hypothesis to check, not evidence/i);
    }
    expect(top).toContain('scaling on, PCA to 5 dimensions');
    expect(top).toContain('k = 10');
    expect(report.html.indexOf('id="cautions"')).toBeLessThan(report.html.indexOf('id="data"'));
  });

  it('overlays the seeds at their Procrustes-aligned positions, scaled linearly into the plot box', () => {
    const svg = inlineFigure(report.html, 'map-tsne-p30-random');
    const e = [1, 2, 3].map((s) => fixture.embeddings.get(`tsne-p30-random-s${s}`)!);
    const ref = embeddingAsMatrix(e[0]);
    const aligned: Embedding[] = [e[0]];
    for (const moving of e.slice(1)) {
      const m = alignTo(ref, embeddingAsMatrix(moving));
      aligned.push({ n: m.n, data: m.data });
    }
    const n = fixture.results.dataset.n;
    const all = Int32Array.from({ length: n }, (_, i) => i);
    const expected = scatterPoints(aligned, all);
    const ids = fixture.results.dataset.ids!;
    [1, 2, 3].forEach((seed, layer) => {
      const circles = layerCircles(svg, seed);
      expect(circles.size).toBe(n);
      for (let i = 0; i < n; i++) {
        const [cx, cy] = circles.get(ids[i])!;
        expect(Math.abs(cx - expected.layers[layer][2 * i])).toBeLessThan(1e-9);
        expect(Math.abs(cy - expected.layers[layer][2 * i + 1])).toBeLessThan(1e-9);
        // The same point through the plot's linear map, before its 2-decimal rounding.
        const u = aligned[layer].data[2 * i];
        const v = aligned[layer].data[2 * i + 1];
        expect(Math.abs(cx - (expected.offsetX + expected.scale * u))).toBeLessThanOrEqual(0.005 + 1e-9);
        expect(Math.abs(cy - (expected.offsetY - expected.scale * v))).toBeLessThanOrEqual(0.005 + 1e-9);
      }
    });
    // Seeds 2 and 3 were rotated, rescaled, shifted (and 3 mirrored) copies of seed 1 plus small noise:
    // after alignment they land near seed 1; drawn raw with the same scaling they would not.
    const c1 = layerCircles(svg, 1);
    for (const seed of [2, 3]) {
      const c = layerCircles(svg, seed);
      let alignedGap = 0;
      let rawGap = 0;
      const raw = e[seed - 1].data;
      for (let i = 0; i < n; i++) {
        const [x1, y1] = c1.get(ids[i])!;
        const [x, y] = c.get(ids[i])!;
        alignedGap += Math.hypot(x - x1, y - y1) / n;
        const rx = expected.offsetX + expected.scale * raw[2 * i];
        const ry = expected.offsetY - expected.scale * raw[2 * i + 1];
        rawGap += Math.hypot(rx - x1, ry - y1) / n;
      }
      expect(alignedGap).toBeLessThan(8);
      expect(rawGap).toBeGreaterThan(100);
    }
  });

  it('draws maps for the ranked settings and the PCA baseline, each figure a standalone SVG with every seed', () => {
    const names = report.figures.map((f) => f.name);
    expect(names).toEqual([
      'explained-variance',
      'rnx-curves',
      'map-tsne-p30-random',
      'map-umap-n15-d0-1',
      'map-pca',
      'seed-grid',
      'point-stability',
      'shepard',
    ]);
    for (const f of report.figures) {
      expect(f.svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
      expect(f.svg.endsWith('</svg>')).toBe(true);
    }
    const map = report.figures.find((f) => f.name === 'map-tsne-p30-random')!.svg;
    for (const seed of [1, 2, 3]) expect(countLayerCircles(map, seed)).toBe(60);
    expect(map).toContain('dimension 1 (arbitrary units)');
    expect(map).toContain('dimension 2 (arbitrary units)');
    // Colour by label with the Okabe–Ito orange / sky blue / bluish green for three labels.
    expect(map).toContain('<g fill="#E69F00"');
    expect(map).toContain('<g fill="#56B4E9"');
    expect(map).toContain('<g fill="#009E73"');
    // No more than 2 decimals in any coordinate.
    for (const m of map.matchAll(/c[xy]="([^"]+)"/g)) expect(m[1]).toMatch(/^-?\d+(\.\d{1,2})?$/);
  });

  it('shows in the Markdown exactly the figures it returns, as figures/<name>.png linked to figures/<name>.svg', () => {
    const withPng = buildReport(fixture);
    const images = [...withPng.markdown.matchAll(/\[!\[[^\]]*\]\(([^)]+)\)\]\(([^)]+)\)/g)];
    expect(images.map((m) => m[1])).toEqual(withPng.figures.map((f) => `figures/${f.name}.png`));
    expect(images.map((m) => m[2])).toEqual(withPng.figures.map((f) => `figures/${f.name}.svg`));
    expect(withPng.pngs.map((p) => p.name)).toEqual(withPng.figures.map((f) => f.name));
    // Without PNG copies the SVG files are shown instead.
    const links = [...report.markdown.matchAll(/!\[[^\]]*\]\(([^)]+)\)/g)].map((m) => m[1]);
    expect(links).toEqual(report.figures.map((f) => `figures/${f.name}.svg`));
    expect(report.pngs).toEqual([]);
  });

  it('gives byte-identical output for the same input', () => {
    const again = buildReport(makeFixture(), { png: false });
    expect(again.html).toBe(report.html);
    expect(again.markdown).toBe(report.markdown);
    expect(again.figures).toEqual(report.figures);
    expect(again.settingsCsv).toBe(report.settingsCsv);
    // The PNG copies too, byte for byte.
    const a = buildReport(makeFixture());
    const b = buildReport(makeFixture());
    expect(a.pngs.length).toBe(a.figures.length);
    for (let i = 0; i < a.pngs.length; i++) {
      expect(a.pngs[i].name).toBe(b.pngs[i].name);
      expect(Buffer.from(a.pngs[i].png).equals(Buffer.from(b.pngs[i].png))).toBe(true);
    }
  });

  it('shows the data facts: short hash with the full one in a tooltip, preprocessing, explained-variance chart', () => {
    const data = section(report.html, 'data');
    const sha = fixture.results.dataset.sha256;
    expect(data).toContain(`title="${sha}">${sha.slice(0, 12)}…</span>`);
    expect(data).toContain('12 → 5 dimensions');
    expect(data).toContain('<svg viewBox');
    const chart = report.figures[0].svg;
    expect((chart.match(/<rect x=/g) ?? []).length).toBeGreaterThanOrEqual(5);
    expect(chart).toContain('principal component');
    expect(chart).toContain('share of variance');
    expect(chart).toContain('95.0 % of the variance kept'); // 0.4+0.25+0.15+0.1+0.05
  });

  it('puts the verdicts under the table and the provenance and glossary at the end', () => {
    const html = report.html;
    const table = html.indexOf('id="ranking-table"');
    const verdicts = html.indexOf('One sentence per setting');
    expect(table).toBeLessThan(verdicts);
    expect(verdicts).toBeLessThan(html.indexOf('id="maps"'));
    expect(html.indexOf('id="maps"')).toBeLessThan(html.indexOf('id="provenance"'));
    expect(html.indexOf('id="provenance"')).toBeLessThan(html.indexOf('id="glossary"'));
    const prov = section(html, 'provenance');
    expect(prov).toContain('2025-01-02T03:04:05.000Z');
    expect(prov).toContain('3 (chosen by: number of distinct labels)');
    const glossary = section(html, 'glossary');
    expect(glossary).toContain('Venna &amp; Kaski 2001');
    expect(glossary).toContain('Hubert &amp; Arabie 1985');
    expect(glossary).toContain('scipy.spatial.procrustes');
  });

  it('draws one colour and says so when there is no label column', () => {
    const f = makeFixture({ labels: false });
    const r = buildReport(f, { png: false });
    const map = r.figures.find((x) => x.name === 'map-tsne-p30-random')!.svg;
    expect(map).toContain('no label column');
    const fills = new Set([...map.matchAll(/<g fill="(#[0-9A-F]{6})"/g)].map((m) => m[1]));
    expect([...fills]).toEqual(['#0072B2']);
  });

  it('merges labels beyond the eighth into a grey "other" entry named in the legend', () => {
    const r = buildReport(makeFixture({ labelCount: 11, n: 66 }), { png: false });
    const map = r.figures.find((x) => x.name === 'map-tsne-p30-random')!.svg;
    expect(map).toContain('other (3 labels)');
    expect(map).toContain('<g fill="#999999"');
    expect(r.html).toContain('all others are grey');
  });

  it('draws a seeded stratified subsample of 3,000 points per seed above 3,000 rows and says so in the caption', () => {
    const big = buildReport(makeFixture({ n: 3500 }), { png: false });
    const map = big.figures.find((x) => x.name === 'map-tsne-p30-random')!.svg;
    for (const seed of [1, 2, 3]) expect(countLayerCircles(map, seed)).toBe(3000);
    expect(big.html).toContain('3,000 of 3,500 points per seed');
    expect(big.markdown).toContain('stratified by label');
    // No per-point tooltips for a subsampled map.
    expect(inlineFigure(big.html, 'map-tsne-p30-random')).not.toContain('<title>id ');
    // Deterministic: the same points again.
    const again = buildReport(makeFixture({ n: 3500 }), { png: false });
    expect(again.figures).toEqual(big.figures);

    const exact = buildReport(makeFixture({ n: 3000 }), { png: false });
    const all = exact.figures.find((x) => x.name === 'map-tsne-p30-random')!.svg;
    expect(countLayerCircles(all, 1)).toBe(3000);
    expect(exact.html).not.toContain('points per seed, the same points');
  });

  it('keeps every plotted point inside the map box', () => {
    const map = report.figures.find((f) => f.name === 'map-umap-n15-d0-1')!.svg;
    const body = map.slice(0, map.indexOf('<g font-family'));
    for (const m of body.matchAll(/<circle cx="([^"]+)" cy="([^"]+)"/g)) {
      const x = Number(m[1]);
      const y = Number(m[2]);
      expect(x).toBeGreaterThanOrEqual(MAP_BOX.left);
      expect(x).toBeLessThanOrEqual(MAP_BOX.left + MAP_BOX.width);
      expect(y).toBeGreaterThanOrEqual(MAP_BOX.top);
      expect(y).toBeLessThanOrEqual(MAP_BOX.top + MAP_BOX.height);
    }
  });

  it('leaves out a failed seed and names it in the caption', () => {
    const f = makeFixture();
    const run = f.results.runs.find((r) => r.id === 'umap-n15-d0.1-s3')!;
    run.status = 'failed';
    run.error = 'diverged';
    run.embedding = null;
    f.embeddings.delete(run.id);
    const r = buildReport(f, { png: false });
    const map = r.figures.find((x) => x.name === 'map-umap-n15-d0-1')!.svg;
    expect(map).toContain('<g class="seed-2">');
    expect(map).not.toContain('<g class="seed-3">');
    expect(r.html).toContain('Not drawn (run failed or missing): seed 3.');
  });
});

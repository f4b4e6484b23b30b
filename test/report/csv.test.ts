import { describe, expect, it } from 'vitest';
import { RecordReader } from '../../src/io/delimited.js';
import { settingsCsv } from '../../src/report/csv.js';
import { makeFixture } from './fixture.js';

/** Parse CSV text with the project's RFC 4180 reader into header + rows of strings. */
function parse(text: string): { header: string[]; rows: string[][] } {
  const r = new RecordReader(text, ',', 'settings.csv', 'test');
  const all: string[][] = [];
  while (r.next()) all.push(Array.from({ length: r.count }, (_, j) => r.field(j)));
  return { header: all[0], rows: all.slice(1) };
}

describe('settingsCsv', () => {
  const f = makeFixture({ grid: true });
  f.results.settings[0].verdict = 'a verdict, with "quotes",\nand a line break';
  const { header, rows } = parse(settingsCsv(f.results.settings));
  const col = (name: string): number => {
    const i = header.indexOf(name);
    expect(i, name).toBeGreaterThanOrEqual(0);
    return i;
  };

  it('writes one line per setting, ranked order then unranked, every line as long as the header', () => {
    expect(rows).toHaveLength(f.results.settings.length);
    expect(rows.map((r) => r[col('rank')])).toEqual(['1', '2', '3', '4', '5', '6', '7', '', '']);
    expect(rows.map((r) => r[col('setting')]).slice(-2)).toEqual(['tsne-p30-pca', 'pca']);
    for (const r of rows) expect(r).toHaveLength(header.length);
  });

  it('keeps every number exactly (shortest round-trip text) and leaves missing values empty', () => {
    for (const s of f.results.settings) {
      const r = rows.find((x) => x[col('setting')] === s.id)!;
      expect(r[col('score')]).toBe(s.score === null ? '' : String(s.score));
      for (const [k, m] of Object.entries(s.metrics)) {
        expect(Number(r[col(`${k}_mean`)])).toBe(m.mean);
        expect(Number(r[col(`${k}_sd`)])).toBe(m.sd);
      }
      expect(r[col('procrustes_mean')]).toBe(String(s.stability.procrustes_mean));
      expect(r[col('identical_maps')]).toBe(String(s.stability.identical_maps));
      if (s.params.perplexity !== undefined) expect(r[col('param_perplexity')]).toBe(String(s.params.perplexity));
      else expect(r[col('param_perplexity')]).toBe('');
    }
  });

  it('counts stable and dissolved clusters by Hennig\u2019s thresholds and joins the perturbations', () => {
    const s = f.results.settings[0];
    const r = rows[0];
    const c = s.stability.clusters!;
    expect(Number(r[col('clusters')])).toBe(c.length);
    expect(Number(r[col('clusters_stable')])).toBe(c.filter((x) => x.mean_jaccard >= 0.75).length);
    expect(Number(r[col('clusters_dissolved')])).toBe(c.filter((x) => x.mean_jaccard <= 0.5).length);
    expect(r[col('perturbations')]).toBe('seed: random initialisation');
    expect(Number(r[col('point_stability_mean')])).toBe(s.stability.points!.mean);
  });

  it('quotes text with commas, quotes or line breaks so that it reads back unchanged', () => {
    expect(rows[0][col('verdict')]).toBe('a verdict, with "quotes",\nand a line break');
  });
});

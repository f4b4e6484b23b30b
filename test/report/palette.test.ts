import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  LINE_COLOURS,
  MISSING_GREY,
  OKABE_ITO,
  OTHER_GREY,
  UNIFORM_COLOUR,
  VIRIDIS,
  assignColours,
  textColourOn,
  viridis,
} from '../../src/report/palette.js';

describe('assignColours', () => {
  it('uses the eight Okabe & Ito (2008) colours', () => {
    // Okabe & Ito 2008, "Color Universal Design": orange (230,159,0), sky blue (86,180,233),
    // bluish green (0,158,115), yellow (240,228,66), blue (0,114,178), vermillion (213,94,0),
    // reddish purple (204,121,167), black (values from memory of the published chart).
    const rgb = OKABE_ITO.map((h) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16)));
    expect(rgb).toEqual([
      [230, 159, 0],
      [86, 180, 233],
      [0, 158, 115],
      [240, 228, 66],
      [0, 114, 178],
      [213, 94, 0],
      [204, 121, 167],
      [0, 0, 0],
    ]);
  });

  it('gives each of up to eight labels its own colour, labels sorted (numbers numerically)', () => {
    const labels = ['10', '2', 'b', '2', 'a', '10'];
    const c = assignColours(labels.length, labels);
    expect(c.legend.map((e) => e.label)).toEqual(['2', '10', 'a', 'b']);
    expect(c.legend.map((e) => e.rows)).toEqual([2, 2, 1, 1]);
    expect(c.hasOther).toBe(false);
    expect(Array.from(c.rowEntry)).toEqual([1, 0, 3, 0, 2, 1]);
  });

  it('colours the eight most frequent labels and puts the rest in a grey "other" entry', () => {
    const labels: string[] = [];
    for (let g = 0; g < 10; g++) for (let r = 0; r < 20 - g; r++) labels.push(`L${g}`);
    const c = assignColours(labels.length, labels);
    expect(c.hasOther).toBe(true);
    expect(c.legend).toHaveLength(9);
    const other = c.legend[8];
    expect(other).toEqual({ label: null, colour: OTHER_GREY, rows: 11 + 12, labels: 2 });
    expect(c.legend.slice(0, 8).map((e) => e.label)).not.toContain('L8');
  });

  it('uses one colour without labels', () => {
    const c = assignColours(4, null);
    expect(c.legend).toEqual([{ label: null, colour: UNIFORM_COLOUR, rows: 4, labels: 0 }]);
    expect(Array.from(c.rowEntry)).toEqual([0, 0, 0, 0]);
  });
});

describe('the viridis scale', () => {
  const ref = JSON.parse(readFileSync(new URL('../fixtures/report-references.json', import.meta.url), 'utf8')) as {
    viridis: string[];
  };

  it('has the eleven stops of matplotlib 3.6.3 viridis at 0, 0.1, …, 1', () => {
    // Reference: matplotlib 3.6.3, colormaps['viridis'](i / 10) (test/fixtures/scripts/report_references.py).
    expect(VIRIDIS.map((c) => c.toLowerCase())).toEqual(ref.viridis);
    for (let i = 0; i <= 10; i++) expect(viridis(i / 10)).toBe(ref.viridis[i]);
  });

  it('interpolates between stops, clamps outside [0, 1] and greys out NaN', () => {
    // Halfway between #440154 and #482475: (0x44+0x48)/2 = 0x46, (0x01+0x24)/2 = 18.5 → 0x13 (rounded), (0x54+0x75)/2 = 100.5 → 0x65.
    expect(viridis(0.05)).toBe('#461365');
    expect(viridis(-1)).toBe(viridis(0));
    expect(viridis(2)).toBe(viridis(1));
    expect(viridis(NaN)).toBe(MISSING_GREY);
  });

  it('is lighter at the top: the WCAG relative luminance rises from stop to stop', () => {
    const lum = (hex: string): number =>
      [1, 3, 5]
        .map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
        .map((s) => (s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4))
        .reduce((a, s, i) => a + [0.2126, 0.7152, 0.0722][i] * s, 0);
    for (let i = 1; i < VIRIDIS.length; i++) expect(lum(VIRIDIS[i])).toBeGreaterThan(lum(VIRIDIS[i - 1]));
  });

  it('picks white text on the dark end and dark text on the light end', () => {
    expect(textColourOn(viridis(0))).toBe('#ffffff');
    expect(textColourOn(viridis(1))).toBe('#111111');
    expect(textColourOn('#ffffff')).toBe('#111111');
  });

  it('leaves Okabe–Ito yellow out of the line colours only', () => {
    expect(LINE_COLOURS).toEqual(OKABE_ITO.filter((c) => c !== '#F0E442'));
    expect(LINE_COLOURS).toHaveLength(7);
  });
});

import { describe, expect, it } from 'vitest';
import { OKABE_ITO, OTHER_GREY, UNIFORM_COLOUR, assignColours } from '../../src/report/palette.js';

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

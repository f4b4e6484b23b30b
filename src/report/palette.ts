/**
 * Colours for labels. The eight-colour qualitative set of Okabe & Ito (2008),
 * "Color Universal Design (CUD): how to make figures and presentations that
 * are friendly to colorblind people", chosen to stay distinguishable under
 * the common forms of colour-vision deficiency. Hex values as published
 * there (orange 230,159,0; sky blue 86,180,233; bluish green 0,158,115;
 * yellow 240,228,66; blue 0,114,178; vermillion 213,94,0; reddish purple
 * 204,121,167; black).
 */
import { codeUnitCompare, labelCompare } from './format.js';

/** The Okabe–Ito colours in the order they are handed out to labels. */
export const OKABE_ITO: readonly string[] = [
  '#E69F00', // orange
  '#56B4E9', // sky blue
  '#009E73', // bluish green
  '#F0E442', // yellow
  '#0072B2', // blue
  '#D55E00', // vermillion
  '#CC79A7', // reddish purple
  '#000000', // black
];

/** Grey used for every label beyond the eight most frequent ones. */
export const OTHER_GREY = '#999999';

/** Single colour used when the data set has no label column (Okabe–Ito blue). */
export const UNIFORM_COLOUR = '#0072B2';

export interface LegendEntry {
  /** Label text as in the data, or null for the grey "other" entry and for unlabelled data. */
  label: string | null;
  colour: string;
  /** Number of rows with this colour. */
  rows: number;
  /** For the "other" entry: how many distinct labels it stands for; otherwise 1. */
  labels: number;
}

export interface ColourAssignment {
  /** Index into `legend` for every row (length n). */
  rowEntry: Uint16Array;
  legend: LegendEntry[];
  /** True when labels beyond the eighth were merged into a grey "other" entry. */
  hasOther: boolean;
}

/**
 * Give each row a colour. With up to 8 distinct labels each gets its own
 * Okabe–Ito colour, labels sorted for display (numbers numerically, text by
 * code units). With more, the 8 most frequent labels (ties broken by the
 * same order) get colours and all others share grey as "other". Without
 * labels every row gets the uniform colour.
 */
export function assignColours(n: number, labels: readonly string[] | null): ColourAssignment {
  const rowEntry = new Uint16Array(n);
  if (labels === null) {
    return { rowEntry, legend: [{ label: null, colour: UNIFORM_COLOUR, rows: n, labels: 0 }], hasOther: false };
  }
  const counts = new Map<string, number>();
  for (let i = 0; i < n; i++) counts.set(labels[i], (counts.get(labels[i]) ?? 0) + 1);
  const distinct = Array.from(counts.keys());
  let coloured: string[];
  if (distinct.length <= OKABE_ITO.length) {
    coloured = distinct.sort(labelCompare);
  } else {
    coloured = distinct
      .sort((a, b) => counts.get(b)! - counts.get(a)! || labelCompare(a, b) || codeUnitCompare(a, b))
      .slice(0, OKABE_ITO.length)
      .sort(labelCompare);
  }
  const index = new Map<string, number>();
  const legend: LegendEntry[] = coloured.map((label, i) => {
    index.set(label, i);
    return { label, colour: OKABE_ITO[i], rows: counts.get(label)!, labels: 1 };
  });
  const hasOther = distinct.length > coloured.length;
  if (hasOther) {
    legend.push({ label: null, colour: OTHER_GREY, rows: 0, labels: distinct.length - coloured.length });
  }
  const otherIndex = legend.length - 1;
  for (let i = 0; i < n; i++) {
    const e = index.get(labels[i]);
    if (e === undefined) {
      rowEntry[i] = otherIndex;
      legend[otherIndex].rows++;
    } else {
      rowEntry[i] = e;
    }
  }
  return { rowEntry, legend, hasOther };
}

/**
 * The viridis colour map (van der Walt & Smith, designed for matplotlib 1.5,
 * 2015): perceptually uniform, readable in grey and under the common forms
 * of colour-vision deficiency. Eleven stops at 0, 0.1, …, 1, written from
 * memory of matplotlib's table and checked against matplotlib 3.6.3 in the
 * tests; values in between are interpolated linearly in sRGB.
 */
export const VIRIDIS: readonly string[] = [
  '#440154',
  '#482475',
  '#414487',
  '#355f8d',
  '#2a788e',
  '#21918c',
  '#22a884',
  '#44bf70',
  '#7ad151',
  '#bddf26',
  '#fde725',
];

/** Colour for missing values on a sequential scale (light grey). */
export const MISSING_GREY = '#e6e6e6';

/**
 * Viridis colour of t in [0, 1] (clamped; dark purple at 0, yellow at 1),
 * as '#rrggbb'. NaN gives `MISSING_GREY`.
 */
export function viridis(t: number): string {
  if (Number.isNaN(t)) return MISSING_GREY;
  const x = Math.min(Math.max(t, 0), 1) * (VIRIDIS.length - 1);
  const i = Math.min(Math.floor(x), VIRIDIS.length - 2);
  const f = x - i;
  const a = hexRgb(VIRIDIS[i]);
  const b = hexRgb(VIRIDIS[i + 1]);
  return rgbHex(a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2]));
}

/**
 * Black or white, whichever reads better on `background` ('#rrggbb'):
 * white when the WCAG 2 relative luminance is below 0.3.
 */
export function textColourOn(background: string): string {
  const [r, g, b] = hexRgb(background).map((c) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b < 0.3 ? '#ffffff' : '#111111';
}

/** The Okabe–Ito colours for lines and outlines: yellow left out, too light on white. */
export const LINE_COLOURS: readonly string[] = OKABE_ITO.filter((c) => c !== '#F0E442');

function hexRgb(hex: string): [number, number, number] {
  return [parseInt(hex.slice(1, 3), 16), parseInt(hex.slice(3, 5), 16), parseInt(hex.slice(5, 7), 16)];
}

function rgbHex(r: number, g: number, b: number): string {
  const h = (v: number): string => Math.round(Math.min(Math.max(v, 0), 255)).toString(16).padStart(2, '0');
  return `#${h(r)}${h(g)}${h(b)}`;
}

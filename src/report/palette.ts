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

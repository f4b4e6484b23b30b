/**
 * Line charts of a score against a parameter: one small panel per score,
 * one line per combination of the other parameters, the seed spread drawn
 * as a band of mean ± one standard deviation.
 */
import { frameSvg, linearScale, logScale, niceDomain, bandScale } from './axes.js';
import type { Scale } from './axes.js';
import { escapeHtml } from './escape.js';
import { truncate } from './format.js';
import { num, svgOpen } from './svg.js';

export interface LinePoint {
  /** Index into `xValues`. */
  x: number;
  mean: number | null;
  sd: number | null;
}

export interface LineSeries {
  name: string;
  colour: string;
  points: LinePoint[];
}

export interface LinePanel {
  name: string;
  lowerIsBetter: boolean;
  series: LineSeries[];
}

export interface LinesInput {
  title: string;
  xName: string;
  /** The parameter's values, in axis order. */
  xValues: Array<number | string>;
  /** Numeric positions: log axis when all values are positive and span at least a factor 4, else linear; text values are evenly spaced. */
  panels: LinePanel[];
  standalone: boolean;
}

const PW = 230;
const PH = 140;
const ML = 52;
const MT = 24;
const MB = 44;
const MR = 16;

/** Whether a numeric parameter axis is drawn on a log scale. */
export function useLogAxis(values: ReadonlyArray<number | string>): boolean {
  if (!values.every((v) => typeof v === 'number' && v > 0)) return false;
  const nums = values as number[];
  return Math.max(...nums) / Math.min(...nums) >= 4;
}

export function linesSvg(input: LinesInput): string {
  const cellW = ML + PW + MR;
  const cellH = MT + PH + MB;
  const perRow = 3;
  const series0 = input.panels[0]?.series ?? [];
  const legendH = 16 * Math.ceil(series0.length / 2) + 8;
  const top = 8 + legendH;
  const rows = Math.ceil(input.panels.length / perRow);
  const width = perRow * cellW;
  const height = top + rows * cellH + 4;
  const numeric = input.xValues.every((v) => typeof v === 'number');
  const log = numeric && useLogAxis(input.xValues);
  const out: string[] = [svgOpen(width, height, input.standalone)];
  out.push(`<title>${escapeHtml(input.title)}</title>`);
  out.push('<g font-family="sans-serif" font-size="10" fill="#333333">');
  series0.forEach((s, i) => {
    const lx = 10 + (i % 2) * (width / 2);
    const ly = 16 + 16 * Math.floor(i / 2);
    out.push(
      `<rect x="${lx}" y="${ly - 8}" width="18" height="8" fill="${s.colour}" fill-opacity="0.2"/>` +
        `<line x1="${lx}" x2="${lx + 18}" y1="${ly - 4}" y2="${ly - 4}" stroke="${s.colour}" stroke-width="2"/>` +
        `<text x="${lx + 24}" y="${ly}">${escapeHtml(truncate(s.name, 60))}</text>`,
    );
  });
  const marks: string[] = [];
  input.panels.forEach((p, i) => {
    const ox = (i % perRow) * cellW;
    const oy = top + Math.floor(i / perRow) * cellH;
    const box = { left: ox + ML, top: oy + MT, width: PW, height: PH };
    let lo = Infinity;
    let hi = -Infinity;
    for (const s of p.series) {
      for (const pt of s.points) {
        if (pt.mean === null || !Number.isFinite(pt.mean)) continue;
        const sd = pt.sd !== null && Number.isFinite(pt.sd) ? pt.sd : 0;
        lo = Math.min(lo, pt.mean - sd);
        hi = Math.max(hi, pt.mean + sd);
      }
    }
    if (!(lo <= hi)) {
      lo = 0;
      hi = 1;
    }
    const [d0, d1] = niceDomain(lo, hi, 4);
    const y = linearScale(d0, d1, box.top + box.height, box.top, 4);
    let x: Scale | null = null;
    let xAt: (i: number) => number;
    const pad = 10;
    if (numeric) {
      const nums = input.xValues as number[];
      const a = Math.min(...nums);
      const b = Math.max(...nums);
      x = log
        ? logScale(a, b, box.left + pad, box.left + box.width - pad)
        : linearScale(a === b ? a - 1 : a, a === b ? b + 1 : b, box.left + pad, box.left + box.width - pad, 5);
      const sx = x;
      xAt = (k) => sx.at(nums[k]);
      // Ticks at the parameter values themselves: those are the settings run.
      x = { ...x, ticks: [...nums], tickText: (v) => String(v) };
    } else {
      const band = bandScale(input.xValues.length, box.left, box.left + box.width);
      xAt = (k) => band.at(k);
    }
    const xTitle = `${input.xName}${log ? ' (log scale)' : ''}`;
    out.push(
      frameSvg({
        box,
        x,
        y,
        xTitle,
        yTitle: p.lowerIsBetter ? 'lower is better' : 'higher is better',
        xCategories: numeric ? undefined : input.xValues.map((v) => truncate(String(v), 12)),
        fontSize: 10,
      }),
    );
    out.push(`<text x="${box.left}" y="${oy + 15}" font-weight="bold" font-size="11">${escapeHtml(truncate(p.name, 40))}</text>`);
    for (const s of p.series) {
      const pts = s.points
        .filter((pt) => pt.mean !== null && Number.isFinite(pt.mean))
        .sort((a, b) => a.x - b.x);
      if (pts.length === 0) continue;
      const upper: string[] = [];
      const lower: string[] = [];
      let hasBand = false;
      for (const pt of pts) {
        const sd = pt.sd !== null && Number.isFinite(pt.sd) ? pt.sd : 0;
        if (sd > 0) hasBand = true;
        upper.push(`${num(xAt(pt.x))},${num(y.at(pt.mean! + sd))}`);
        lower.push(`${num(xAt(pt.x))},${num(y.at(pt.mean! - sd))}`);
      }
      if (hasBand) {
        const ring = pts.length === 1 ? [...upper, ...lower] : [...upper, ...lower.reverse()];
        marks.push(`<polygon points="${ring.join(' ')}" fill="${s.colour}" fill-opacity="0.2" stroke="${pts.length === 1 ? s.colour : 'none'}"/>`);
      }
      const line = pts.map((pt) => `${num(xAt(pt.x))},${num(y.at(pt.mean!))}`);
      if (pts.length > 1) marks.push(`<polyline points="${line.join(' ')}" fill="none" stroke="${s.colour}" stroke-width="1.8"/>`);
      for (const c of line) {
        const [cx, cy] = c.split(',');
        marks.push(`<circle cx="${cx}" cy="${cy}" r="2.6" fill="${s.colour}"/>`);
      }
    }
  });
  out.push(`</g><g class="marks">${marks.join('')}</g></svg>`);
  return out.join('');
}

/**
 * Shepard-style scatter plots: for a sample of row pairs, the distance in
 * the data (x) against the distance in the map (y), one panel per setting.
 * A map that keeps the order of distances gives a rising, narrow cloud.
 */
import { frameSvg, linearScale, niceDomain } from './axes.js';
import { escapeHtml } from './escape.js';
import { truncate } from './format.js';
import { num, svgOpen } from './svg.js';

export interface ShepardPanel {
  /** Panel title lines (the first bold). */
  title: string[];
  /** Data distance of each drawn pair. */
  x: Float64Array;
  /** Map distance of each drawn pair. */
  y: Float64Array;
  colour: string;
}

const PW = 250;
const PH = 210;
const ML = 58;
const MB = 46;
const MR = 14;

export function shepardSvg(panels: readonly ShepardPanel[], title: string, footnote: string, standalone: boolean): string {
  const MT = 12 + 13 * Math.max(1, ...panels.map((p) => p.title.length));
  const cellW = ML + PW + MR;
  const cellH = MT + PH + MB;
  const perRow = Math.min(3, Math.max(panels.length, 1));
  const rows = Math.ceil(panels.length / perRow);
  const width = perRow * cellW;
  const height = rows * cellH + 22;
  const out: string[] = [svgOpen(width, height, standalone)];
  out.push(`<title>${escapeHtml(title)}</title>`);
  out.push('<g font-family="sans-serif" font-size="10" fill="#333333">');
  const marks: string[] = [];
  panels.forEach((p, i) => {
    const ox = (i % perRow) * cellW;
    const oy = Math.floor(i / perRow) * cellH;
    const box = { left: ox + ML, top: oy + MT, width: PW, height: PH };
    const [x0, x1] = niceDomain(0, maxFinite(p.x), 5);
    const [y0, y1] = niceDomain(0, maxFinite(p.y), 5);
    const x = linearScale(x0, x1, box.left, box.left + box.width, 5);
    const y = linearScale(y0, y1, box.top + box.height, box.top, 5);
    out.push(frameSvg({ box, x, y, xTitle: 'distance in the data', yTitle: 'distance in the map', fontSize: 9 }));
    p.title.forEach((line, t) => {
      const bold = t === 0 ? ' font-weight="bold" font-size="11"' : '';
      out.push(`<text x="${box.left}" y="${oy + 14 + 13 * t}"${bold}>${escapeHtml(truncate(line, 56))}</text>`);
    });
    const dots: string[] = [];
    for (let t = 0; t < p.x.length; t++) {
      if (!Number.isFinite(p.x[t]) || !Number.isFinite(p.y[t])) continue;
      dots.push(`<circle cx="${num(x.at(p.x[t]))}" cy="${num(y.at(p.y[t]))}" r="1.4"/>`);
    }
    marks.push(`<g fill="${p.colour}" fill-opacity="0.35">${dots.join('')}</g>`);
  });
  out.push(`<text x="6" y="${rows * cellH + 14}">${escapeHtml(footnote)}</text>`);
  out.push(`</g><g class="marks">${marks.join('')}</g></svg>`);
  return out.join('');
}

/**
 * Spearman rank correlation of two equally long samples: the Pearson
 * correlation of their ranks, tied values sharing their average rank (the
 * convention of scipy.stats.spearmanr). NaN when fewer than 2 values or
 * when either sample is constant.
 */
export function spearman(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const n = a.length;
  if (b.length !== n) throw new RangeError(`the samples have different lengths (${n} and ${b.length})`);
  if (n < 2) return NaN;
  const ra = averageRanks(a);
  const rb = averageRanks(b);
  const mean = (n + 1) / 2;
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let i = 0; i < n; i++) {
    const x = ra[i] - mean;
    const y = rb[i] - mean;
    sab += x * y;
    saa += x * x;
    sbb += y * y;
  }
  return saa === 0 || sbb === 0 ? NaN : sab / Math.sqrt(saa * sbb);
}

/** 1-based ranks, ties getting the mean of the ranks they span. */
export function averageRanks(v: ArrayLike<number>): Float64Array {
  const n = v.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => v[i] - v[j] || i - j);
  const ranks = new Float64Array(n);
  let s = 0;
  while (s < n) {
    let e = s + 1;
    while (e < n && v[order[e]] === v[order[s]]) e++;
    const r = (s + 1 + e) / 2;
    for (let t = s; t < e; t++) ranks[order[t]] = r;
    s = e;
  }
  return ranks;
}

function maxFinite(v: Float64Array): number {
  let m = 0;
  for (const x of v) if (Number.isFinite(x) && x > m) m = x;
  return m > 0 ? m : 1;
}

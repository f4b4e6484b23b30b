/**
 * R_NX(K) curves (Lee, Peluffo-Ordóñez & Verleysen 2015): the quality of
 * neighbourhood preservation at every scale K, on a log K axis, one line
 * per setting, the area under the curve in the legend.
 */
import { frameSvg, linearScale, logScale, niceDomain } from './axes.js';
import { escapeHtml } from './escape.js';
import { truncate } from './format.js';
import { num, svgOpen } from './svg.js';

export interface RnxCurve {
  /** Legend text, e.g. "t-SNE, perplexity 30 — AUC 0.512". */
  name: string;
  colour: string;
  /** Dashed line (e.g. for the linear baseline). */
  dashed: boolean;
  K: readonly number[];
  values: readonly number[];
}

const BOX = { left: 60, top: 14, width: 520, height: 260 };

/** SVG of the curves; K must be positive. */
export function rnxSvg(curves: readonly RnxCurve[], title: string, standalone: boolean): string {
  let kMin = Infinity;
  let kMax = -Infinity;
  let vMin = 0;
  let vMax = 0.5;
  for (const c of curves) {
    for (let i = 0; i < c.K.length; i++) {
      if (!(c.K[i] > 0) || !Number.isFinite(c.values[i])) continue;
      kMin = Math.min(kMin, c.K[i]);
      kMax = Math.max(kMax, c.K[i]);
      vMin = Math.min(vMin, c.values[i]);
      vMax = Math.max(vMax, c.values[i]);
    }
  }
  if (!(kMin < kMax)) {
    kMin = 1;
    kMax = 10;
  }
  const [y0, y1] = niceDomain(vMin, Math.min(Math.max(vMax, 0.5), 1), 5);
  const x = logScale(kMin, kMax, BOX.left, BOX.left + BOX.width);
  const y = linearScale(y0, y1, BOX.top + BOX.height, BOX.top, 5);
  const legendTop = BOX.top + BOX.height + 52;
  const height = legendTop + 16 * curves.length + 6;
  const out: string[] = [svgOpen(BOX.left + BOX.width + 30, height, standalone)];
  out.push(`<title>${escapeHtml(title)}</title>`);
  out.push('<g font-family="sans-serif" font-size="10" fill="#333333">');
  out.push(frameSvg({ box: BOX, x, y, xTitle: 'neighbourhood size K (log scale)', yTitle: 'R_NX(K)' }));
  const marks: string[] = [];
  curves.forEach((c, i) => {
    const pts: string[] = [];
    for (let t = 0; t < c.K.length; t++) {
      if (!(c.K[t] > 0) || !Number.isFinite(c.values[t])) continue;
      pts.push(`${num(x.at(c.K[t]))},${num(y.at(c.values[t]))}`);
    }
    const dash = c.dashed ? ' stroke-dasharray="6 3"' : '';
    if (pts.length > 0) marks.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${c.colour}" stroke-width="1.8"${dash}/>`);
    const ly = legendTop + 16 * i;
    out.push(
      `<line x1="${BOX.left}" x2="${BOX.left + 22}" y1="${ly - 4}" y2="${ly - 4}" stroke="${c.colour}" stroke-width="2"${dash}/>` +
        `<text x="${BOX.left + 28}" y="${ly}">${escapeHtml(truncate(c.name, 90))}</text>`,
    );
  });
  out.push(`</g><g class="marks">${marks.join('')}</g></svg>`);
  return out.join('');
}

/**
 * A map coloured by how stable each point's neighbourhood is across seeds,
 * on the viridis scale from 0 (dark) to 1 (bright), with the least stable
 * points ringed.
 */
import type { Embedding } from '../core/types.js';
import { escapeHtml } from './escape.js';
import { fixed, truncate } from './format.js';
import { MISSING_GREY, OKABE_ITO, viridis } from './palette.js';
import { MAP_BOX, MAP_INSET, scatterPoints } from './scatter.js';
import { num, svgOpen } from './svg.js';

export interface PointMapInput {
  /** The map in row layout (NaN = row not embedded). */
  layout: Embedding;
  /** Rows to draw. */
  draw: Int32Array;
  /** Stability per data row (n values, NaN = unknown). */
  values: Float64Array;
  /** Rows to ring, worst first. */
  ringed: readonly number[];
  ids: readonly string[];
  labels: readonly string[] | null;
  title: string;
  /** Name of the value in the legend and tooltips, e.g. "neighbourhood stability". */
  valueName: string;
  interactive: boolean;
  standalone: boolean;
}

const WIDTH = 640;
const HEIGHT = 450;
/** Outline of the rings around the least stable points (Okabe–Ito vermillion). */
export const RING_COLOUR = OKABE_ITO[5];

export function pointMapSvg(input: PointMapInput): string {
  const { layout, draw, values } = input;
  const plotted = scatterPoints([layout], draw, MAP_BOX, MAP_INSET);
  const xy = plotted.layers[0];
  const r = draw.length > 1000 ? 1.8 : 2.6;
  // Most stable first, so that the least stable points are drawn on top.
  const order = Array.from(draw.keys()).sort((a, b) => {
    const va = values[draw[a]];
    const vb = values[draw[b]];
    const ka = Number.isNaN(va) ? Infinity : va;
    const kb = Number.isNaN(vb) ? Infinity : vb;
    return kb - ka || draw[a] - draw[b];
  });
  const out: string[] = [svgOpen(WIDTH, HEIGHT, input.standalone)];
  out.push(`<title>${escapeHtml(input.title)}</title>`);
  const b = MAP_BOX;
  out.push(`<rect x="${b.left}" y="${b.top}" width="${b.width}" height="${b.height}" fill="#ffffff" stroke="#b8b8b8" stroke-width="1"/>`);
  const dots: string[] = [];
  for (const k of order) {
    const x = xy[2 * k];
    if (Number.isNaN(x)) continue;
    const row = draw[k];
    const v = values[row];
    const data = input.interactive ? ` data-r="${row}" data-v="${fixed(v)}"` : '';
    dots.push(`<circle cx="${num(x)}" cy="${num(xy[2 * k + 1])}" r="${r}" fill="${Number.isNaN(v) ? MISSING_GREY : viridis(v)}"${data}/>`);
  }
  const rings: string[] = [];
  const where = new Map<number, number>();
  draw.forEach((row, k) => where.set(row, k));
  for (const row of input.ringed) {
    const k = where.get(row);
    if (k === undefined || Number.isNaN(xy[2 * k])) continue;
    const label = input.labels === null ? '' : `, label ${input.labels[row]}`;
    const text = `id ${input.ids[row]}${label}, ${input.valueName} ${fixed(values[row])}`;
    const data = input.interactive ? ` data-r="${row}" data-v="${fixed(values[row])}"` : '';
    rings.push(`<circle class="ring" cx="${num(xy[2 * k])}" cy="${num(xy[2 * k + 1])}" r="6"${data}><title>${escapeHtml(text)}</title></circle>`);
  }
  out.push(`<g class="marks"><g stroke="none">${dots.join('')}</g>`);
  out.push(`<g fill="#ffffff" fill-opacity="0" stroke="${RING_COLOUR}" stroke-width="1.6" pointer-events="all">${rings.join('')}</g></g>`);
  // Legend: colour bar and the ring.
  const lx = b.left + b.width + 20;
  const barTop = b.top + 40;
  const barH = 200;
  const steps = 40;
  const legend: string[] = [];
  legend.push(`<text x="${lx}" y="${b.top + 12}" font-weight="bold">${escapeHtml(truncate(input.valueName, 28))}</text>`);
  legend.push(`<text x="${lx}" y="${b.top + 26}" font-size="9">across seeds (1 = same neighbours)</text>`);
  for (let s = 0; s < steps; s++) {
    const t = 1 - (s + 0.5) / steps;
    legend.push(`<rect x="${lx}" y="${num(barTop + (s * barH) / steps)}" width="14" height="${num(barH / steps + 0.3)}" fill="${viridis(t)}"/>`);
  }
  for (const t of [0, 0.25, 0.5, 0.75, 1]) {
    const ty = barTop + (1 - t) * barH;
    legend.push(`<line x1="${lx + 14}" x2="${lx + 18}" y1="${num(ty)}" y2="${num(ty)}" stroke="#555555"/>`);
    legend.push(`<text x="${lx + 21}" y="${num(ty + 3.5)}">${t.toFixed(2)}</text>`);
  }
  const ry = barTop + barH + 30;
  legend.push(`<circle cx="${lx + 7}" cy="${ry - 4}" r="6" fill="none" stroke="${RING_COLOUR}" stroke-width="1.6"/>`);
  legend.push(`<text x="${lx + 20}" y="${ry}">the ${input.ringed.length} least stable</text>`);
  legend.push(`<text x="${lx + 20}" y="${ry + 13}">points (hover for id)</text>`);
  legend.push(`<circle cx="${lx + 7}" cy="${ry + 30}" r="4" fill="${MISSING_GREY}"/>`);
  legend.push(`<text x="${lx + 20}" y="${ry + 34}">no value</text>`);
  const cx = b.left + b.width / 2;
  const cy = b.top + b.height / 2;
  out.push(
    `<g font-family="sans-serif" font-size="11" fill="#333333">` +
      `<text x="${cx}" y="${b.top + b.height + 18}" text-anchor="middle">dimension 1 (arbitrary units)</text>` +
      `<text x="14" y="${cy}" text-anchor="middle" transform="rotate(-90 14 ${cy})">dimension 2 (arbitrary units)</text>` +
      legend.join('') +
      `</g></svg>`,
  );
  return out.join('');
}

/**
 * Heatmaps of scores over a two-parameter grid: one small panel per score,
 * cells coloured on the viridis scale (brighter = better for that score),
 * each cell printing the mean over seeds and, below it, the standard
 * deviation over seeds.
 */
import { escapeHtml } from './escape.js';
import { MISSING, fixed, truncate } from './format.js';
import { MISSING_GREY, textColourOn, viridis } from './palette.js';
import { num, svgOpen } from './svg.js';

export interface HeatCell {
  mean: number | null;
  sd: number | null;
  /** Tooltip text (setting and value). */
  title: string;
}

export interface HeatPanel {
  /** Score name, e.g. "trustworthiness". */
  name: string;
  lowerIsBetter: boolean;
  /** cells[y][x]; null where the grid has no such setting. */
  cells: Array<Array<HeatCell | null>>;
}

export interface HeatmapInput {
  title: string;
  xName: string;
  xValues: string[];
  yName: string;
  yValues: string[];
  panels: HeatPanel[];
  standalone: boolean;
}

const CW = 58;
const CH = 30;
const YL = 104;
const MAX_WIDTH = 1000;
/** Steps of the colour bar under each panel. */
const BAR_STEPS = 24;

/** Colour of a cell: t = (value − worst)/(best − worst) on viridis; NaN (missing) → grey. */
export function heatColour(value: number | null, min: number, max: number, lowerIsBetter: boolean): string {
  if (value === null || !Number.isFinite(value)) return MISSING_GREY;
  if (!(max > min)) return viridis(0.5);
  const t = (value - min) / (max - min);
  return viridis(lowerIsBetter ? 1 - t : t);
}

export function heatmapSvg(input: HeatmapInput): string {
  const nx = Math.max(input.xValues.length, 1);
  const ny = Math.max(input.yValues.length, 1);
  const panelW = Math.max(YL + nx * CW + 18, YL + 170);
  const panelH = 20 + ny * CH + 30 + 46;
  const perRow = Math.max(1, Math.min(3, Math.floor(MAX_WIDTH / panelW)));
  const rows = Math.ceil(input.panels.length / perRow);
  const width = Math.max(perRow * panelW, 420);
  const top = 24;
  const height = top + rows * panelH + 8;
  const out: string[] = [svgOpen(width, height, input.standalone)];
  out.push(`<title>${escapeHtml(input.title)}</title>`);
  out.push('<g font-family="sans-serif" font-size="10" fill="#333333">');
  out.push(`<text x="4" y="14" font-size="11">${escapeHtml(`columns: ${input.xName}; rows: ${input.yName}; cell: mean over seeds, ± standard deviation over seeds below it`)}</text>`);
  const marks: string[] = [];
  input.panels.forEach((p, i) => {
    const ox = (i % perRow) * panelW;
    const oy = top + Math.floor(i / perRow) * panelH;
    const values = p.cells.flat().map((c) => (c && c.mean !== null && Number.isFinite(c.mean) ? c.mean : NaN));
    const finite = values.filter((v) => !Number.isNaN(v));
    const min = finite.length ? Math.min(...finite) : NaN;
    const max = finite.length ? Math.max(...finite) : NaN;
    const gx = ox + YL;
    const gy = oy + 20;
    out.push(`<text x="${gx}" y="${oy + 13}" font-weight="bold" font-size="11">${escapeHtml(truncate(p.name, 40))}</text>`);
    input.yValues.forEach((v, y) => {
      out.push(`<text x="${gx - 5}" y="${num(gy + y * CH + CH / 2 + 3.5)}" text-anchor="end">${escapeHtml(truncate(v, 18))}</text>`);
    });
    input.xValues.forEach((v, x) => {
      out.push(`<text x="${num(gx + x * CW + CW / 2)}" y="${gy + ny * CH + 12}" text-anchor="middle">${escapeHtml(truncate(v, 10))}</text>`);
    });
    for (let y = 0; y < ny; y++) {
      for (let x = 0; x < nx; x++) {
        const c = p.cells[y]?.[x] ?? null;
        const fill = heatColour(c ? c.mean : null, min, max, p.lowerIsBetter);
        const ink = textColourOn(fill);
        const cx = gx + x * CW;
        const cy = gy + y * CH;
        const title = c ? `<title>${escapeHtml(c.title)}</title>` : '';
        marks.push(`<rect class="cell" x="${cx}" y="${cy}" width="${CW - 1}" height="${CH - 1}" fill="${fill}">${title}</rect>`);
        const main = c ? fixed(c.mean) : MISSING;
        const sd = c && c.sd !== null && Number.isFinite(c.sd) ? `± ${fixed(c.sd)}` : '';
        const tx = num(cx + (CW - 1) / 2);
        marks.push(`<text x="${tx}" y="${num(cy + (sd ? 12 : 18))}" text-anchor="middle" fill="${ink}">${main}</text>`);
        if (sd) marks.push(`<text x="${tx}" y="${num(cy + 24)}" text-anchor="middle" font-size="8.5" fill="${ink}">${sd}</text>`);
      }
    }
    // Colour bar: worst value on the left, best on the right.
    const by = gy + ny * CH + 20;
    const bw = nx * CW - 1;
    const step = bw / BAR_STEPS;
    const bar: string[] = [];
    for (let s = 0; s < BAR_STEPS; s++) {
      bar.push(`<rect x="${num(gx + s * step)}" y="${by}" width="${num(step + 0.4)}" height="8" fill="${viridis((s + 0.5) / BAR_STEPS)}"/>`);
    }
    out.push(bar.join(''));
    const worst = p.lowerIsBetter ? max : min;
    const best = p.lowerIsBetter ? min : max;
    out.push(
      `<text x="${gx}" y="${by + 19}" font-size="9">${escapeHtml(fixed(worst))}</text>` +
        `<text x="${gx + bw}" y="${by + 19}" font-size="9" text-anchor="end">${escapeHtml(fixed(best))}</text>` +
        `<text x="${gx}" y="${by + 31}" font-size="9">${p.lowerIsBetter ? 'lower is better' : 'higher is better'}; brighter = better</text>`,
    );
  });
  out.push(`</g><g class="marks" font-family="sans-serif" font-size="10">${marks.join('')}</g></svg>`);
  return out.join('');
}

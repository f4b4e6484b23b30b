/**
 * Small multiples of the maps: one row per setting, one column per seed,
 * every panel Procrustes-aligned (by the caller) onto the row's first seed
 * and drawn with one linear scaling per row, so that panels of a row can be
 * compared point by point.
 */
import type { Embedding } from '../core/types.js';
import { escapeHtml } from './escape.js';
import { truncate } from './format.js';
import type { ColourAssignment } from './palette.js';
import { scatterPoints } from './scatter.js';
import { num, svgOpen } from './svg.js';

export interface SeedPanel {
  seed: number;
  /** Aligned map in row layout (NaN = row not embedded by this seed), or null when there is nothing to draw. */
  layout: Embedding | null;
  /** Short text under the panel, e.g. "disparity 0.031" or "run failed". */
  note: string;
}

export interface SeedGridRow {
  /** Setting id, written as data-setting on the row's panels. */
  id: string;
  /** Header lines left of the row (first line bold). */
  header: string[];
  panels: SeedPanel[];
}

export interface SeedGridInput {
  rows: SeedGridRow[];
  /** Rows of the data set to draw in every panel. */
  draw: Int32Array;
  colours: ColourAssignment;
  labels: readonly string[] | null;
  title: string;
  /** Text above each column, e.g. "seed 1 (reference)". */
  columnHeaders: string[];
  /** Lines of text under the grid (colour key, sampling rule). */
  footnote: string[];
  /** Add `data-r` (data row) to every point, for the page's hover tooltips. */
  interactive: boolean;
  standalone: boolean;
}

/** Side of the square plot box of one panel, in SVG units. */
export const PANEL_SIZE = 150;
const GAP = 14;
const HEADER_W = 190;
const NOTE_H = 16;
const INSET = 4;
/** Rough width of one character at font size 10, for laying out the legend. */
const CHAR_W = 6;

/** Top-left corner of panel (row, column) in a figure whose first row starts at `top`. */
function panelOrigin(row: number, column: number, top: number): { x: number; y: number } {
  return { x: HEADER_W + column * (PANEL_SIZE + GAP), y: top + row * (PANEL_SIZE + NOTE_H + GAP) };
}

/**
 * SVG of the grid. Each panel is a `<g class="panel">` translated to its
 * place, carrying `data-setting`, `data-seed`, `data-scale`, `data-ox`, `data-oy`: a point
 * (u, v) of the aligned map is drawn at cx = ox + scale·u, cy = oy − scale·v
 * (panel coordinates, rounded to 0.01).
 */
export function seedGridSvg(input: SeedGridInput): string {
  const columns = Math.max(1, ...input.rows.map((r) => r.panels.length));
  const width = Math.max(HEADER_W + columns * (PANEL_SIZE + GAP) + 10, 480);
  // Legend across the top, wrapped to the figure's width.
  const legend: string[] = [];
  let lx = 6;
  let ly = 14;
  for (const item of legendItems(input)) {
    const w = 16 + CHAR_W * Array.from(item.text).length + 14;
    if (lx > 6 && lx + w > width) {
      lx = 6;
      ly += 16;
    }
    legend.push(`<circle cx="${lx + 4}" cy="${ly - 4}" r="4" fill="${item.colour}"/><text x="${lx + 12}" y="${ly}">${escapeHtml(item.text)}</text>`);
    lx += w;
  }
  const top = ly + 30;
  const footY = top + input.rows.length * (PANEL_SIZE + NOTE_H + GAP) + 6;
  const height = footY + 14 * input.footnote.length + 10;
  const radius = input.draw.length > 1000 ? 1.2 : input.draw.length > 300 ? 1.6 : 2.2;
  const box = { left: 0, top: 0, width: PANEL_SIZE, height: PANEL_SIZE };
  const out: string[] = [svgOpen(width, height, input.standalone)];
  out.push(`<title>${escapeHtml(input.title)}</title>`);
 out.push(`<g font-family="sans-serif" font-size="10" fill="#333333">${legend.join('')}</g>`);
  out.push('<g font-family="sans-serif" font-size="11" fill="#333333">');
  for (let c = 0; c < columns; c++) {
    const o = panelOrigin(0, c, top);
    out.push(`<text x="${o.x + PANEL_SIZE / 2}" y="${top - 8}" text-anchor="middle" font-weight="bold">${escapeHtml(input.columnHeaders[c] ?? '')}</text>`);
  }
  out.push('</g><g class="marks">');
  input.rows.forEach((row, ri) => {
    const layouts = row.panels.map((p) => p.layout).filter((l): l is Embedding => l !== null);
    const plotted = layouts.length > 0 ? scatterPoints(layouts, input.draw, box, INSET) : null;
    let li = 0;
    row.panels.forEach((panel, ci) => {
      const o = panelOrigin(ri, ci, top);
      const frame = `<rect x="0" y="0" width="${PANEL_SIZE}" height="${PANEL_SIZE}" fill="${panel.layout ? '#ffffff' : '#f2f2f2'}" stroke="#b8b8b8" stroke-width="1"/>`;
      if (!panel.layout || !plotted) {
        out.push(`<g transform="translate(${o.x} ${o.y})">${frame}</g>`);
      } else {
        const xy = plotted.layers[li++];
        out.push(
          `<g class="panel" data-setting="${escapeHtml(row.id)}" data-seed="${panel.seed}" data-scale="${plotted.scale}" data-ox="${plotted.offsetX}" data-oy="${plotted.offsetY}" transform="translate(${o.x} ${o.y})">${frame}`,
        );
        for (let e = 0; e < input.colours.legend.length; e++) {
          const dots: string[] = [];
          for (let k = 0; k < input.draw.length; k++) {
            const r = input.draw[k];
            if (input.colours.rowEntry[r] !== e) continue;
            const x = xy[2 * k];
            if (Number.isNaN(x)) continue;
            const data = input.interactive ? ` data-r="${r}"` : '';
            dots.push(`<circle cx="${num(x)}" cy="${num(xy[2 * k + 1])}" r="${radius}"${data}/>`);
          }
          if (dots.length > 0) out.push(`<g fill="${input.colours.legend[e].colour}" fill-opacity="0.8">${dots.join('')}</g>`);
        }
        out.push('</g>');
      }
    });
  });
  out.push('</g><g font-family="sans-serif" font-size="10" fill="#333333">');
  input.rows.forEach((row, ri) => {
    const o = panelOrigin(ri, 0, top);
    row.header.forEach((line, i) => {
      const bold = i === 0 ? ' font-weight="bold" font-size="11"' : '';
      out.push(`<text x="6" y="${o.y + 14 + 14 * i}"${bold}>${escapeHtml(truncate(line, 30))}</text>`);
    });
    row.panels.forEach((panel, ci) => {
      const p = panelOrigin(ri, ci, top);
      const text = `seed ${panel.seed}${panel.note ? ` · ${panel.note}` : ''}`;
      out.push(`<text x="${p.x + 2}" y="${p.y + PANEL_SIZE + 12}">${escapeHtml(truncate(text, 32))}</text>`);
    });
  });
  let y = footY + 10;
  for (const line of input.footnote) {
    out.push(`<text x="6" y="${y}">${escapeHtml(line)}</text>`);
    y += 14;
  }
  out.push('</g></svg>');
  return out.join('');
}

function legendItems(input: SeedGridInput): Array<{ colour: string; text: string }> {
  if (input.labels === null) return [{ colour: input.colours.legend[0].colour, text: 'all points (no label column)' }];
  return input.colours.legend.map((e, i) => ({
    colour: e.colour,
    text: `${i === 0 ? 'label: ' : ''}${e.label === null ? `other (${e.labels} labels)` : truncate(e.label === '' ? '(empty)' : e.label, 30)}`,
  }));
}

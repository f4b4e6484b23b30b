/**
 * Scatter maps: several seeds of one setting overlaid in a common frame.
 * The caller aligns the seeds (Procrustes, onto the first seed); here all
 * layers share one linear scaling into the plot box (equal units on both
 * axes, y pointing up).
 */
import type { Embedding } from '../core/types.js';
import { escapeHtml } from './escape.js';
import { truncate } from './format.js';
import type { ColourAssignment } from './palette.js';
import { num, svgOpen } from './svg.js';

/** A rectangle in SVG user units (pixels). */
export interface PlotBox {
  readonly left: number;
  readonly top: number;
  readonly width: number;
  readonly height: number;
}

/** Where the points of a map are drawn inside its 640 × 450 figure. */
export const MAP_BOX: PlotBox = { left: 34, top: 10, width: 400, height: 400 };

/** Gap kept between the outermost points and the plot box edge, in pixels. */
export const MAP_INSET = 6;

export interface ScatterPoints {
  /**
   * One entry per layer: plot coordinates of the requested rows, interleaved
   * (x0, y0, x1, y1, …) in the order of `rows`, rounded to 0.01. A row whose
   * coordinates are not finite gives NaN.
   */
  readonly layers: Float64Array[];
  /** The linear map used before rounding: x = offsetX + scale·u, y = offsetY − scale·v. */
  readonly scale: number;
  readonly offsetX: number;
  readonly offsetY: number;
}

/**
 * Plot coordinates for the given rows of every layer, with one scaling shared
 * by all layers. The bounding box of the finite drawn points is centred in
 * `box` shrunk by `inset` on each side, with the same scale on both axes
 * (the largest that fits), and the second coordinate flipped so that it
 * grows upward. Coordinates are rounded to 2 decimals.
 *
 * @param layers embeddings of the same n points (already aligned)
 * @param rows indices of the points to draw (e.g. from `subsampleRows`)
 * @param box plot rectangle in SVG units (default `MAP_BOX`)
 * @param inset margin inside the box in SVG units (default `MAP_INSET`)
 */
export function scatterPoints(
  layers: readonly Embedding[],
  rows: ArrayLike<number>,
  box: PlotBox = MAP_BOX,
  inset: number = MAP_INSET,
): ScatterPoints {
  let minU = Infinity;
  let maxU = -Infinity;
  let minV = Infinity;
  let maxV = -Infinity;
  for (const e of layers) {
    const d = e.data;
    for (let r = 0; r < rows.length; r++) {
      const u = d[2 * rows[r]];
      const v = d[2 * rows[r] + 1];
      if (!Number.isFinite(u) || !Number.isFinite(v)) continue;
      if (u < minU) minU = u;
      if (u > maxU) maxU = u;
      if (v < minV) minV = v;
      if (v > maxV) maxV = v;
    }
  }
  const innerW = Math.max(box.width - 2 * inset, 0);
  const innerH = Math.max(box.height - 2 * inset, 0);
  let scale = 1;
  if (minU <= maxU) {
    const spanU = maxU - minU;
    const spanV = maxV - minV;
    const su = spanU > 0 ? innerW / spanU : Infinity;
    const sv = spanV > 0 ? innerH / spanV : Infinity;
    scale = Math.min(su, sv);
    if (!Number.isFinite(scale)) scale = 1;
  } else {
    minU = maxU = minV = maxV = 0;
  }
  const offsetX = box.left + box.width / 2 - (scale * (minU + maxU)) / 2;
  const offsetY = box.top + box.height / 2 + (scale * (minV + maxV)) / 2;
  const out = layers.map((e) => {
    const d = e.data;
    const xy = new Float64Array(2 * rows.length);
    for (let r = 0; r < rows.length; r++) {
      const u = d[2 * rows[r]];
      const v = d[2 * rows[r] + 1];
      if (!Number.isFinite(u) || !Number.isFinite(v)) {
        xy[2 * r] = NaN;
        xy[2 * r + 1] = NaN;
        continue;
      }
      xy[2 * r] = round2(offsetX + scale * u);
      xy[2 * r + 1] = round2(offsetY - scale * v);
    }
    return xy;
  });
  return { layers: out, scale, offsetX, offsetY };
}

export interface MapFigureInput {
  /** Aligned embeddings, reference seed first. */
  layers: readonly Embedding[];
  /** Seed of each layer (same order). */
  seeds: readonly number[];
  /** Rows to draw. */
  rows: Int32Array;
  colours: ColourAssignment;
  /** Id shown in point tooltips for every row (length n). */
  ids: readonly string[];
  /** Label per row, or null. */
  labels: readonly string[] | null;
  /** Accessible title of the figure (plain text). */
  title: string;
  /** Add one <title> per point (id, label, seed). */
  pointTitles: boolean;
  /** Add the xmlns attribute needed when the SVG is a file of its own. */
  standalone: boolean;
}

const WIDTH = 640;
const HEIGHT = 450;

/**
 * An SVG scatter map. The reference seed is drawn as filled dots, every
 * other seed as open rings slightly larger than the dots, drawn underneath,
 * so that a seed agreeing with the reference shows as a ring around a dot.
 * Colours follow `colours`; a legend lists labels and seed markers.
 */
export function mapSvg(input: MapFigureInput): string {
  const { layers, seeds, rows, colours } = input;
  const plotted = scatterPoints(layers, rows, MAP_BOX, MAP_INSET);
  const r = rows.length > 1000 ? 1.6 : 2.2;
  const ringR = round2(r + 0.9);
  const box = MAP_BOX;
  const parts: string[] = [];
  parts.push(svgOpen(WIDTH, HEIGHT, input.standalone));
  parts.push(`<title>${escapeHtml(input.title)}</title>`);
  parts.push(
    `<rect x="${box.left}" y="${box.top}" width="${box.width}" height="${box.height}" fill="#ffffff" stroke="#b8b8b8" stroke-width="1"/>`,
  );
  // Later seeds first (rings), reference last (dots on top).
  parts.push('<g class="marks">');
  for (let s = layers.length - 1; s >= 0; s--) {
    const xy = plotted.layers[s];
    const reference = s === 0;
    parts.push(`<g class="seed-${seeds[s]}">`);
    for (let c = 0; c < colours.legend.length; c++) {
      const colour = colours.legend[c].colour;
      const circles: string[] = [];
      for (let k = 0; k < rows.length; k++) {
        const row = rows[k];
        if (colours.rowEntry[row] !== c) continue;
        const x = xy[2 * k];
        const y = xy[2 * k + 1];
        if (Number.isNaN(x)) continue;
        const rad = reference ? r : ringR;
        if (input.pointTitles) {
          const label = input.labels === null ? '' : `, label ${input.labels[row]}`;
          const text = `id ${input.ids[row]}${label}, seed ${seeds[s]}`;
          circles.push(`<circle cx="${num(x)}" cy="${num(y)}" r="${rad}"><title>${escapeHtml(text)}</title></circle>`);
        } else {
          circles.push(`<circle cx="${num(x)}" cy="${num(y)}" r="${rad}"/>`);
        }
      }
      if (circles.length === 0) continue;
      const style = reference
        ? `fill="${colour}" fill-opacity="0.85"`
        : `fill="none" stroke="${colour}" stroke-opacity="0.75" stroke-width="0.8"`;
      parts.push(`<g ${style}>${circles.join('')}</g>`);
    }
    parts.push('</g>');
  }
  parts.push('</g>');
  // Axis titles, no numeric ticks: the units of these maps carry no meaning.
  const cx = box.left + box.width / 2;
  const cy = box.top + box.height / 2;
  parts.push(
    `<g font-family="sans-serif" font-size="11" fill="#333333">` +
      `<text x="${cx}" y="${box.top + box.height + 18}" text-anchor="middle">dimension 1 (arbitrary units)</text>` +
      `<text x="14" y="${cy}" text-anchor="middle" transform="rotate(-90 14 ${cy})">dimension 2 (arbitrary units)</text>` +
      legendSvg(input) +
      `</g>`,
  );
  parts.push('</svg>');
  return parts.join('');
}

function legendSvg(input: MapFigureInput): string {
  const x0 = MAP_BOX.left + MAP_BOX.width + 16;
  let y = MAP_BOX.top + 12;
  const out: string[] = [];
  const line = (marker: string, text: string): void => {
    out.push(marker.replace(/\{y\}/g, String(y - 4)));
    out.push(`<text x="${x0 + 14}" y="${y}">${escapeHtml(text)}</text>`);
    y += 16;
  };
  const { colours } = input;
  if (input.labels === null) {
    out.push(`<text x="${x0}" y="${y}" font-weight="bold">no label column</text>`);
    y += 16;
    line(`<circle cx="${x0 + 4}" cy="{y}" r="4" fill="${colours.legend[0].colour}"/>`, 'all points');
  } else {
    out.push(`<text x="${x0}" y="${y}" font-weight="bold">label</text>`);
    y += 16;
    for (const entry of colours.legend) {
      const text =
        entry.label === null ? `other (${entry.labels} labels)` : truncate(entry.label === '' ? '(empty)' : entry.label, 22);
      line(`<circle cx="${x0 + 4}" cy="{y}" r="4" fill="${entry.colour}"/>`, text);
    }
    if (colours.hasOther) {
      out.push(`<text x="${x0}" y="${y}" font-size="9">grey: labels beyond the 8</text>`);
      y += 12;
      out.push(`<text x="${x0}" y="${y}" font-size="9">most frequent</text>`);
      y += 12;
    }
  }
  y += 8;
  out.push(`<text x="${x0}" y="${y}" font-weight="bold">seed</text>`);
  y += 16;
  line(`<circle cx="${x0 + 4}" cy="{y}" r="3" fill="#555555"/>`, `${input.seeds[0]} (reference, dots)`);
  if (input.seeds.length > 1) {
    const others = input.seeds.slice(1);
    const shown = others.length > 4 ? `${others.slice(0, 4).join(', ')}, …` : others.join(', ');
    line(`<circle cx="${x0 + 4}" cy="{y}" r="3.9" fill="none" stroke="#555555" stroke-width="0.8"/>`, `${shown} (rings,`);
    out.push(`<text x="${x0 + 14}" y="${y}">aligned to ${input.seeds[0]})</text>`);
  }
  return out.join('');
}

function round2(v: number): number {
  return Math.round(v * 100) / 100;
}

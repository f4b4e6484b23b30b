/**
 * Axes for the charts: scales from data to SVG units, tick positions and
 * tick text, and the SVG of a plot frame with gridlines and axis titles.
 */
import { escapeHtml } from './escape.js';
import type { PlotBox } from './scatter.js';
import { num } from './svg.js';

/** A one-dimensional map from data values to SVG units. */
export interface Scale {
  /** SVG coordinate of a data value. */
  at(v: number): number;
  /** Tick values inside the domain. */
  ticks: number[];
  /** Text of a tick value. */
  tickText(v: number): string;
  readonly log: boolean;
}

/**
 * Tick values at a "nice" step (1, 2 or 5 × 10^k) covering [min, max], about
 * `count` of them. Degenerate ranges give the single value.
 */
export function niceTicks(min: number, max: number, count = 5): number[] {
  if (!(Number.isFinite(min) && Number.isFinite(max))) return [];
  if (max < min) [min, max] = [max, min];
  if (max === min) return [min];
  const step = niceStep((max - min) / Math.max(count, 1));
  const first = Math.ceil(min / step - 1e-9);
  const last = Math.floor(max / step + 1e-9);
  const out: number[] = [];
  for (let i = first; i <= last; i++) out.push(cleanFloat(i * step));
  return out;
}

/** The nice step (1, 2 or 5 × 10^k) nearest above `raw`. */
export function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * p;
}

/** [min, max] widened outward to the nice step used for its ticks. */
export function niceDomain(min: number, max: number, count = 5): [number, number] {
  if (max === min) {
    const pad = min === 0 ? 1 : Math.abs(min) * 0.1;
    return [min - pad, max + pad];
  }
  const step = niceStep((max - min) / Math.max(count, 1));
  return [cleanFloat(Math.floor(min / step + 1e-9) * step), cleanFloat(Math.ceil(max / step - 1e-9) * step)];
}

/**
 * Linear scale from [d0, d1] onto [r0, r1] (r0 > r1 for a y axis pointing up),
 * with nice ticks inside the domain.
 */
export function linearScale(d0: number, d1: number, r0: number, r1: number, count = 5): Scale {
  const span = d1 - d0 || 1;
  const ticks = niceTicks(d0, d1, count).filter((t) => t >= d0 - 1e-12 && t <= d1 + 1e-12);
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : Math.abs(span);
  const digits = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  return {
    at: (v) => r0 + ((v - d0) / span) * (r1 - r0),
    ticks,
    tickText: (v) => formatTick(v, digits),
    log: false,
  };
}

/**
 * Base-10 logarithmic scale from [d0, d1] (both > 0) onto [r0, r1]. Ticks at
 * 1, 2, 5 × 10^k, thinned to powers of ten when the domain spans more than
 * two decades.
 */
export function logScale(d0: number, d1: number, r0: number, r1: number): Scale {
  const l0 = Math.log10(d0);
  const l1 = Math.log10(d1);
  const span = l1 - l0 || 1;
  const ticks: number[] = [];
  const mults = l1 - l0 > 2 ? [1] : [1, 2, 5];
  for (let e = Math.floor(l0); e <= Math.ceil(l1); e++) {
    for (const m of mults) {
      const v = cleanFloat(m * 10 ** e);
      if (v >= d0 * (1 - 1e-9) && v <= d1 * (1 + 1e-9)) ticks.push(v);
    }
  }
  return {
    at: (v) => r0 + ((Math.log10(v) - l0) / span) * (r1 - r0),
    ticks,
    tickText: (v) => formatTick(v, Math.max(0, -Math.floor(Math.log10(v) + 1e-9))),
    log: true,
  };
}

/**
 * Scale for positions of categories (equal bands): `at(i)` is the centre of
 * band i of `count`.
 */
export function bandScale(count: number, r0: number, r1: number): { at(i: number): number; width: number } {
  const width = (r1 - r0) / Math.max(count, 1);
  return { at: (i) => r0 + (i + 0.5) * width, width };
}

export interface FrameOptions {
  box: PlotBox;
  x: Scale | null;
  y: Scale | null;
  xTitle: string;
  yTitle: string;
  /** Category names along x (with `x` null), at band centres. */
  xCategories?: readonly string[];
  /** Font size of tick text (default 10). */
  fontSize?: number;
}

/**
 * SVG of a plot frame: light gridlines at the ticks, the box outline, tick
 * text and the two axis titles (the y title rotated, left of the ticks).
 */
export function frameSvg(o: FrameOptions): string {
  const { box: b, x, y } = o;
  const fs = o.fontSize ?? 10;
  const right = b.left + b.width;
  const bottom = b.top + b.height;
  const grid: string[] = [];
  const text: string[] = [];
  if (y) {
    for (const t of y.ticks) {
      const py = num(y.at(t));
      grid.push(`<line x1="${b.left}" x2="${right}" y1="${py}" y2="${py}"/>`);
      text.push(`<text x="${b.left - 4}" y="${num(y.at(t) + fs * 0.35)}" text-anchor="end">${escapeHtml(y.tickText(t))}</text>`);
    }
  }
  if (x) {
    for (const t of x.ticks) {
      const px = num(x.at(t));
      grid.push(`<line x1="${px}" x2="${px}" y1="${b.top}" y2="${bottom}"/>`);
      text.push(`<text x="${px}" y="${bottom + fs + 3}" text-anchor="middle">${escapeHtml(x.tickText(t))}</text>`);
    }
  } else if (o.xCategories) {
    const band = bandScale(o.xCategories.length, b.left, right);
    o.xCategories.forEach((c, i) => {
      text.push(`<text x="${num(band.at(i))}" y="${bottom + fs + 3}" text-anchor="middle">${escapeHtml(c)}</text>`);
    });
  }
  const cy = b.top + b.height / 2;
  const yTitleX = b.left - 36;
  return (
    `<g stroke="#e4e4e4" stroke-width="1">${grid.join('')}</g>` +
    `<rect x="${b.left}" y="${b.top}" width="${b.width}" height="${b.height}" fill="none" stroke="#8c8c8c" stroke-width="1"/>` +
    `<g font-size="${fs}" fill="#333333">${text.join('')}` +
    `<text x="${num(b.left + b.width / 2)}" y="${bottom + 2 * fs + 10}" text-anchor="middle">${escapeHtml(o.xTitle)}</text>` +
    `<text x="${yTitleX}" y="${num(cy)}" text-anchor="middle" transform="rotate(-90 ${yTitleX} ${num(cy)})">${escapeHtml(o.yTitle)}</text>` +
    `</g>`
  );
}

function formatTick(v: number, digits: number): string {
  const text = v.toFixed(digits);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** Remove binary noise from a product such as 3 × 0.1. */
function cleanFloat(v: number): number {
  return Number(v.toPrecision(12));
}

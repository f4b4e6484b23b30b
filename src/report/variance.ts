/**
 * Bar chart of the explained-variance ratio of each kept principal component,
 * with the running total drawn as a line.
 */
import { escapeHtml } from './escape.js';
import { num, svgOpen } from './svg.js';

const WIDTH = 520;
const HEIGHT = 290;
/** Plot rectangle of the chart in SVG units. */
export const VARIANCE_BOX = { left: 56, top: 14, width: 440, height: 190 } as const;

const BAR_COLOUR = '#56B4E9'; // Okabe–Ito sky blue
const LINE_COLOUR = '#D55E00'; // Okabe–Ito vermillion

const DROPPED_COLOUR = '#c8c8c8';
const KEPT_COLOUR = '#333333';

/**
 * SVG of explained-variance ratios (each in [0, 1]) per component, y axis
 * from 0 to 1 with ticks every 0.25, x axis numbered by component (every
 * m-th label when there are many), cumulative share as a line with dots.
 * The components kept are marked: a dashed line after the last kept one,
 * labelled with their number and share; bars of components not kept (when
 * given) are grey.
 *
 * @param ratios explained-variance ratio per component, in order
 * @param standalone add the SVG namespace (for a file of its own)
 * @param kept number of leading components kept (default: all given)
 */
export function varianceSvg(ratios: readonly number[], standalone: boolean, kept: number = ratios.length): string {
  const b = VARIANCE_BOX;
  const m = ratios.length;
  const keep = Math.min(Math.max(Math.round(kept), 0), m);
  const band = b.width / Math.max(m, 1);
  const barW = band * 0.7;
  const yOf = (v: number): number => b.top + b.height * (1 - Math.min(Math.max(v, 0), 1));
  const parts: string[] = [svgOpen(WIDTH, HEIGHT, standalone)];
  parts.push(
    `<title>${escapeHtml(`Share of variance per principal component (${m} kept) and cumulative share`)}</title>`,
  );
  parts.push('<g font-family="sans-serif" font-size="11" fill="#333333">');
  // Grid and y ticks.
  for (const t of [0, 0.25, 0.5, 0.75, 1]) {
    const y = num(yOf(t));
    parts.push(
      `<line x1="${b.left}" x2="${b.left + b.width}" y1="${y}" y2="${y}" stroke="#e2e2e2" stroke-width="1"/>`,
      `<text x="${b.left - 6}" y="${num(yOf(t) + 4)}" text-anchor="end">${t.toFixed(2)}</text>`,
    );
  }
  // Bars.
  const bars: string[] = [];
  let keptShare = 0;
  for (let i = 0; i < m; i++) {
    const v = Number.isFinite(ratios[i]) ? ratios[i] : 0;
    if (i < keep) keptShare += v;
    const x = b.left + i * band + (band - barW) / 2;
    const y = yOf(v);
    const fill = i < keep ? '' : ` fill="${DROPPED_COLOUR}"`;
    bars.push(`<rect x="${num(x)}" y="${num(y)}" width="${num(barW)}" height="${num(b.top + b.height - y)}"${fill}/>`);
  }
  parts.push(`<g class="marks" fill="${BAR_COLOUR}">${bars.join('')}</g>`);
  if (keep > 0) {
    const kx = num(b.left + keep * band);
    const label = `${keep} component${keep === 1 ? '' : 's'} kept (${(keptShare * 100).toFixed(1)} %)`;
    const anchor = keep * band > b.width / 2 ? 'end' : 'start';
    const tx = num(b.left + keep * band + (anchor === 'end' ? -4 : 4));
    parts.push(
      `<line x1="${kx}" x2="${kx}" y1="${b.top}" y2="${b.top + b.height}" stroke="${KEPT_COLOUR}" stroke-width="1.2" stroke-dasharray="4 3"/>`,
      `<text x="${tx}" y="${num(b.top + b.height * 0.45)}" text-anchor="${anchor}" font-weight="bold">${label}</text>`,
    );
  }
  // Cumulative line.
  let total = 0;
  const pts: string[] = [];
  const dots: string[] = [];
  for (let i = 0; i < m; i++) {
    total += Number.isFinite(ratios[i]) ? ratios[i] : 0;
    const x = num(b.left + (i + 0.5) * band);
    const y = num(yOf(total));
    pts.push(`${x},${y}`);
    if (m <= 60) dots.push(`<circle cx="${x}" cy="${y}" r="2.2"/>`);
  }
  if (m > 0) {
    parts.push(
      `<polyline points="${pts.join(' ')}" fill="none" stroke="${LINE_COLOUR}" stroke-width="1.6"/>`,
      `<g fill="${LINE_COLOUR}">${dots.join('')}</g>`,
    );
  }
  // Axes.
  const bottom = b.top + b.height;
  parts.push(
    `<line x1="${b.left}" x2="${b.left + b.width}" y1="${bottom}" y2="${bottom}" stroke="#555555" stroke-width="1"/>`,
    `<line x1="${b.left}" x2="${b.left}" y1="${b.top}" y2="${bottom}" stroke="#555555" stroke-width="1"/>`,
  );
  const every = Math.max(1, Math.ceil(m / 12));
  for (let i = 0; i < m; i++) {
    if (i % every !== 0 && i !== m - 1) continue;
    if (i === m - 1 && i % every !== 0 && (m - 1) % every < every / 2) continue;
    parts.push(`<text x="${num(b.left + (i + 0.5) * band)}" y="${bottom + 15}" text-anchor="middle">${i + 1}</text>`);
  }
  parts.push(
    `<text x="${b.left + b.width / 2}" y="${bottom + 34}" text-anchor="middle">principal component</text>`,
    `<text x="14" y="${b.top + b.height / 2}" text-anchor="middle" transform="rotate(-90 14 ${b.top + b.height / 2})">share of variance</text>`,
  );
  // Legend below the axis title.
  const ly = bottom + 62;
  parts.push(
    `<rect x="${b.left}" y="${ly - 9}" width="12" height="10" fill="${BAR_COLOUR}"/>`,
    `<text x="${b.left + 18}" y="${ly}">each component</text>`,
    `<line x1="${b.left + 140}" x2="${b.left + 160}" y1="${ly - 4}" y2="${ly - 4}" stroke="${LINE_COLOUR}" stroke-width="1.6"/>`,
    `<circle cx="${b.left + 150}" cy="${ly - 4}" r="2.2" fill="${LINE_COLOUR}"/>`,
    `<text x="${b.left + 166}" y="${ly}">cumulative (${(total * 100).toFixed(1)} % of the variance kept)</text>`,
  );
  parts.push('</g></svg>');
  return parts.join('');
}

/**
 * The report as Markdown (CommonMark with pipe tables). Figures are shown
 * from their PNG copies, `figures/<name>.png`, each linked to its SVG,
 * `figures/<name>.svg`; the caller writes both next to it. Without PNG
 * copies the SVG itself is shown.
 */
import { escapeMarkdown as esc } from './escape.js';
import type { Figure, ReportModel } from './model.js';

/** Relative path of a figure's SVG file as linked from the Markdown report. */
export function figurePath(name: string): string {
  return `figures/${name}.svg`;
}

/** Relative path of a figure's PNG copy as shown in the Markdown report. */
export function pngPath(name: string): string {
  return `figures/${name}.png`;
}

/**
 * Render the model as a Markdown document.
 *
 * @param withPng show each figure from its PNG copy (linked to the SVG); false shows the SVG
 */
export function renderMarkdown(m: ReportModel, withPng = true): string {
  const figureMd = (f: Figure): string[] => figureBlock(f, withPng);
  const out: string[] = [];
  out.push(`# ${esc(m.title)}`, '');
  const created = m.provenance.find((p) => p.term === 'created');
  if (created) out.push(`Results created ${esc(created.text)}.`, '');

  out.push('## Summary', '');
  if (m.headline) {
    out.push(`> **${esc(m.headline.pick)}**`, '>', `> ${esc(m.headline.clusters)}`, '');
  }
  out.push('Best setting of each method:', '');
  for (const line of m.summary) out.push(`- ${esc(line)}`);
  out.push('');
  if (m.notRanked.length > 0) {
    out.push('Settings left out of the ranking:', '');
    for (const line of m.notRanked) out.push(`- ${esc(line)}`);
    out.push('');
  }
  out.push('### Every setting, judged', '');
  for (const line of m.settingSentences) out.push(`- ${esc(line)}`);
  out.push('');
  if (m.hennigNote) out.push(`<sub>${esc(m.hennigNote)}</sub>`, '');

  out.push('## Read this before the maps', '');
  for (const c of m.cautions) out.push(`> - ${esc(c)}`);
  out.push('');

  out.push('## Data and preprocessing', '');
  for (const d of m.data) out.push(`- **${esc(d.term)}**: ${esc(d.text)}${d.full !== undefined ? '…' : ''}`);
  out.push('');
  const sha = m.data.find((d) => d.full !== undefined);
  if (sha?.full) out.push(`<sub>Full sha256: ${esc(sha.full)}</sub>`, '');
  if (m.varianceFigure) out.push(...figureMd(m.varianceFigure));
  else out.push(esc(m.varianceNote), '');

  out.push('## Settings ranked', '');
  out.push(
    'One row per setting, best first; settings that could not be ranked come last. ' +
      'Metrics are mean ± standard deviation over seeds.',
    '',
  );
  out.push(`| ${m.columns.map((c) => esc(c.header)).join(' | ')} |`);
  out.push(`|${m.columns.map((c) => (c.numeric ? ' ---: ' : ' --- ')).join('|')}|`);
  for (const row of m.rows) out.push(`| ${row.map((cell) => esc(cell.text)).join(' | ')} |`);
  out.push('');
  out.push('### One sentence per setting', '');
  for (const v of m.verdicts) out.push(`- **${esc(v.setting)}**: ${esc(v.verdict)}`);
  out.push('');

  if (m.gridFigures.length > 0 || m.rnxFigure) {
    out.push('## Scores over the grid', '');
    out.push(
      'How each score changes with the parameters. None of these scores makes the distances between clusters or the ' +
        'sizes of clusters in a t-SNE or UMAP map meaningful.',
      '',
    );
    for (const f of m.gridFigures) out.push(...figureMd(f));
    if (m.rnxFigure) out.push(...figureMd(m.rnxFigure));
  }

  out.push('## Maps of the leading settings', '');
  out.push(`> ${esc(m.mapCaution)}`, '');
  out.push(
    'The axes have no numeric ticks: t-SNE and UMAP coordinates have no unit, and every map is shown at the scale ' +
      'that fills its box.',
    '',
  );
  for (const f of m.maps) out.push(...figureMd(f));
  if (m.maps.length === 0) out.push('No map could be drawn.', '');
  for (const s of m.mapsSkipped) out.push(esc(s), '');
  if (m.seedGrid) {
    out.push('## Every seed of every setting', '', `> ${esc(m.mapCaution)}`, '', ...figureMd(m.seedGrid));
  }
  if (m.pointMap) out.push('## Which points move between seeds', '', ...figureMd(m.pointMap));
  if (m.shepard) out.push('## Distances: data against map', '', ...figureMd(m.shepard));

  out.push('## How these results were made', '');
  for (const p of m.provenance) out.push(`- **${esc(p.term)}**: ${esc(p.text)}`);
  out.push('');

  out.push('## How to read the scores', '');
  for (const g of m.glossary) out.push(`- **${esc(g.term)}**: ${esc(g.text)}`);
  out.push('');
  return out.join('\n');
}

function figureBlock(f: Figure, withPng: boolean): string[] {
  const image = withPng
    ? `[![${esc(f.alt)}](${pngPath(f.name)})](${figurePath(f.name)})`
    : `![${esc(f.alt)}](${figurePath(f.name)})`;
  return [image, '', ...f.caption.map((p) => `*${esc(p)}*`), ''];
}

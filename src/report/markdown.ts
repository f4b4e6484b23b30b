/**
 * The report as Markdown (CommonMark with pipe tables). Figures are linked as
 * files, `figures/<name>.svg`, which the caller writes next to it.
 */
import { escapeMarkdown as esc } from './escape.js';
import type { Figure, ReportModel } from './model.js';

/** Relative path of a figure file as linked from the Markdown report. */
export function figurePath(name: string): string {
  return `figures/${name}.svg`;
}

/** Render the model as a Markdown document. */
export function renderMarkdown(m: ReportModel): string {
  const out: string[] = [];
  out.push(`# ${esc(m.title)}`, '');
  const created = m.provenance.find((p) => p.term === 'created');
  if (created) out.push(`Results created ${esc(created.text)}.`, '');

  out.push('## Summary', '');
  for (const line of m.summary) out.push(`- ${esc(line)}`);
  out.push('');
  if (m.notRanked.length > 0) {
    out.push('Settings left out of the ranking:', '');
    for (const line of m.notRanked) out.push(`- ${esc(line)}`);
    out.push('');
  }

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

  out.push('## How these results were made', '');
  for (const p of m.provenance) out.push(`- **${esc(p.term)}**: ${esc(p.text)}`);
  out.push('');

  out.push('## How to read the scores', '');
  for (const g of m.glossary) out.push(`- **${esc(g.term)}**: ${esc(g.text)}`);
  out.push('');
  return out.join('\n');
}

function figureMd(f: Figure): string[] {
  return [`![${esc(f.alt)}](${figurePath(f.name)})`, '', ...f.caption.map((p) => `*${esc(p)}*`), ''];
}

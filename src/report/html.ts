/**
 * The report as one self-contained HTML page: inline CSS, inline SVG, and an
 * inline script that makes the ranking table sortable and shows a tooltip
 * (id and label) over the points of the maps, reading them from an inline
 * JSON block. Nothing is fetched from anywhere; the page reads the same
 * without the script.
 */
import { escapeHtml as esc } from './escape.js';
import type { Cell, Figure, ReportModel } from './model.js';

const CSS = `
body{margin:0;background:#fafafa;color:#222;font:15px/1.5 system-ui,sans-serif}
main{max-width:1100px;margin:0 auto;padding:20px 24px 48px;background:#fff}
h1{font-size:1.5em;margin:0 0 4px}
h2{font-size:1.2em;margin:32px 0 8px;padding-bottom:3px;border-bottom:1px solid #ddd}
h3{font-size:1.05em;margin:20px 0 6px}
.small{font-size:.85em;color:#555}
.caution{border:1px solid #c9c9c9;border-left:5px solid #8a8a8a;background:#f6f6f6;padding:8px 14px;margin:10px 0}
.caution ul{margin:4px 0;padding-left:20px}
dl.facts{display:grid;grid-template-columns:max-content 1fr;gap:2px 16px;margin:8px 0}
dl.facts dt{font-weight:600}
dl.facts dd{margin:0;overflow-wrap:anywhere}
dl.glossary dt{font-weight:600;margin-top:8px}
dl.glossary dd{margin:2px 0 0 18px}
.scroll{overflow-x:auto}
table{border-collapse:collapse;font-size:.86em;margin:8px 0}
th,td{border:1px solid #d4d4d4;padding:3px 7px;vertical-align:top}
th{background:#f0f0f0;text-align:left}
td.n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
th.sortable{cursor:pointer}
#ranking-table td:nth-child(3){min-width:12em}
th[aria-sort=ascending]::after{content:" \\25B2";font-size:.8em}
th[aria-sort=descending]::after{content:" \\25BC";font-size:.8em}
figure{margin:18px 0}
figure svg{max-width:100%;height:auto;display:block}
figcaption{font-size:.88em;color:#333;max-width:760px}
figcaption p{margin:3px 0}
code,.mono{font-family:ui-monospace,monospace;font-size:.92em}
.headline{border:2px solid #0072B2;background:#f1f7fb;padding:10px 16px;margin:10px 0 14px}
.headline p{margin:4px 0}
.headline .pick{font-size:1.12em}
ul.sentences li{margin:3px 0}
#tip{position:fixed;display:none;pointer-events:none;z-index:10;background:#222;color:#fff;font-size:12px;padding:3px 7px;border-radius:3px;max-width:360px}
figure svg [data-r]:hover,figure svg .hl{stroke:#000;stroke-width:1.5}
`;

/*
 * Table sorting: a click (or Enter/Space) on a header orders the rows by that
 * column (text ignoring case, then by case); a second click reverses. Missing
 * values always go last; equal values keep their rank order (data-i).
 */
const SCRIPT = `
(function(){
var t=document.getElementById('ranking-table');if(!t)return;
var hs=t.tHead.rows[0].cells,b=t.tBodies[0];
function key(r,c){var v=r.cells[c].getAttribute('data-v');return v===null||v===''?null:v;}
function sortBy(c){
var h=hs[c],num=h.getAttribute('data-type')==='num';
var dir=h.getAttribute('aria-sort')==='ascending'?-1:1;
for(var j=0;j<hs.length;j++)hs[j].removeAttribute('aria-sort');
h.setAttribute('aria-sort',dir===1?'ascending':'descending');
var rows=Array.prototype.slice.call(b.rows);
rows.sort(function(x,y){
var a=key(x,c),z=key(y,c),o=0;
if(a===null&&z===null)o=0;else if(a===null)return 1;else if(z===null)return -1;
else if(num)o=dir*(Number(a)-Number(z));else{var p=a.toLowerCase(),q=z.toLowerCase();o=dir*(p<q?-1:p>q?1:a<z?-1:a>z?1:0);}
return o||(Number(x.getAttribute('data-i'))-Number(y.getAttribute('data-i')));});
for(var i=0;i<rows.length;i++)b.appendChild(rows[i]);}
for(var c=0;c<hs.length;c++){(function(c){var h=hs[c];h.className+=' sortable';h.tabIndex=0;
h.title='Sort by this column';
h.addEventListener('click',function(){sortBy(c);});
h.addEventListener('keydown',function(e){if(e.key==='Enter'||e.key===' '){e.preventDefault();sortBy(c);}});})(c);}
})();
`;

/*
 * Point tooltips: hovering an element with data-r (a data row) shows the
 * row's id and label from the JSON block, plus data-v (a value) when
 * present, and outlines the same row in the other panels of that figure.
 * Points that carry an SVG <title> instead show its text.
 */
const TIP_SCRIPT = `
(function(){
var el=document.getElementById('point-data');if(!el||!document.body)return;
var d=JSON.parse(el.textContent),ids={},labs={};
for(var i=0;i<d.r.length;i++){ids[d.r[i]]=d.id[i];labs[d.r[i]]=d.l?d.l[i]:null;}
var tip=document.createElement('div');tip.id='tip';tip.setAttribute('role','tooltip');document.body.appendChild(tip);
var lit=[];
function clear(){for(var j=0;j<lit.length;j++)lit[j].classList.remove('hl');lit=[];}
function show(t,e){tip.textContent=t;tip.style.display='block';
var x=e.clientX+14,y=e.clientY+14;if(x+tip.offsetWidth>innerWidth)x=e.clientX-tip.offsetWidth-8;
if(y+tip.offsetHeight>innerHeight)y=e.clientY-tip.offsetHeight-8;tip.style.left=x+'px';tip.style.top=y+'px';}
document.addEventListener('mouseover',function(e){var t=e.target;if(!t||!t.getAttribute)return;
var r=t.getAttribute('data-r');
if(r!==null&&ids.hasOwnProperty(r)){var s='id '+ids[r];if(labs[r]!==null)s+=', label '+labs[r];
var v=t.getAttribute('data-v');if(v!==null)s+=', stability '+v;
var p=t.closest('.panel');if(p){var n=p.getAttribute('data-seed');if(n!==null)s+=', seed '+n;}
show(s,e);clear();var f=t.closest('svg');
if(f&&p){var all=f.querySelectorAll('[data-r="'+r+'"]');for(var k=0;k<all.length;k++){all[k].classList.add('hl');lit.push(all[k]);}}
return;}
var ti=t.tagName==='circle'&&t.firstElementChild&&t.firstElementChild.tagName==='title'?t.firstElementChild.textContent:null;
if(ti){show(ti,e);return;}
tip.style.display='none';clear();});
})();
`;

/** Render the model as a complete HTML document. */
export function renderHtml(m: ReportModel): string {
  const out: string[] = [];
  out.push('<!doctype html>');
  out.push('<html lang="en"><head><meta charset="utf-8">');
  out.push('<meta name="viewport" content="width=device-width, initial-scale=1">');
  out.push(`<title>${esc(m.title)}</title>`);
  out.push(`<style>${CSS}</style></head><body><main>`);
  out.push(`<h1>${esc(m.title)}</h1>`);
  const created = m.provenance.find((p) => p.term === 'created');
  if (created) out.push(`<p class="small">Results created ${esc(created.text)}.</p>`);

  // 1. summary
  out.push('<section id="summary"><h2>Summary</h2>');
  if (m.headline) {
    out.push(
      `<div class="headline" id="recommendation"><p class="pick"><strong>${esc(m.headline.pick)}</strong></p>` +
        `<p>${esc(m.headline.clusters)}</p></div>`,
    );
  }
  out.push('<p>Best setting of each method:</p><ul>');
  for (const line of m.summary) out.push(`<li>${esc(line)}</li>`);
  out.push('</ul>');
  if (m.notRanked.length > 0) {
    out.push('<p>Settings left out of the ranking:</p><ul>');
    for (const line of m.notRanked) out.push(`<li>${esc(line)}</li>`);
    out.push('</ul>');
  }
  out.push('<h3>Every setting, judged</h3><ul class="sentences">');
  for (const line of m.settingSentences) out.push(`<li>${esc(line)}</li>`);
  out.push('</ul>');
  if (m.hennigNote) out.push(`<p class="small">${esc(m.hennigNote)}</p>`);
  out.push('</section>');

  // 2. cautions
  out.push('<section id="cautions"><h2>Read this before the maps</h2><div class="caution"><ul>');
  for (const c of m.cautions) out.push(`<li>${esc(c)}</li>`);
  out.push('</ul></div></section>');

  // 3. data
  out.push('<section id="data"><h2>Data and preprocessing</h2><dl class="facts">');
  for (const d of m.data) {
    const value =
      d.full !== undefined
        ? `<span class="mono" title="${esc(d.full)}">${esc(d.text)}…</span>`
        : esc(d.text);
    out.push(`<dt>${esc(d.term)}</dt><dd>${value}</dd>`);
  }
  out.push('</dl>');
  const sha = m.data.find((d) => d.full !== undefined);
  if (sha?.full) out.push(`<p class="small">Full sha256: <span class="mono">${esc(sha.full)}</span></p>`);
  if (m.varianceFigure) out.push(figureHtml(m.varianceFigure));
  else out.push(`<p>${esc(m.varianceNote)}</p>`);
  out.push('</section>');

  // 4. table
  out.push('<section id="ranking"><h2>Settings ranked</h2>');
  out.push(
    '<p class="small">One row per setting, best first; settings that could not be ranked come last. ' +
      'Metrics are mean ± standard deviation over seeds. Click a column header to sort by it.</p>',
  );
  out.push('<div class="scroll"><table id="ranking-table"><thead><tr>');
  m.columns.forEach((c, i) => {
    const sortAttr = i === 0 ? ' aria-sort="ascending"' : '';
    out.push(`<th scope="col" data-type="${c.numeric ? 'num' : 'text'}"${sortAttr}>${esc(c.header)}</th>`);
  });
  out.push('</tr></thead><tbody>');
  m.rows.forEach((row, i) => {
    out.push(`<tr data-i="${i}">`);
    row.forEach((cell, c) => out.push(cellHtml(cell, m.columns[c].numeric)));
    out.push('</tr>');
  });
  out.push('</tbody></table></div>');

  // 6. verdicts, under the table
  out.push('<h3>One sentence per setting</h3><ul>');
  for (const v of m.verdicts) out.push(`<li><strong>${esc(v.setting)}</strong>: ${esc(v.verdict)}</li>`);
  out.push('</ul></section>');

  // scores over the grid
  if (m.gridFigures.length > 0 || m.rnxFigure) {
    out.push('<section id="grid"><h2>Scores over the grid</h2>');
    out.push(
      '<p class="small">How each score changes with the parameters. Every score here is about how faithful or how ' +
        'stable the maps are; none of them makes the distances between clusters or the sizes of clusters in a t-SNE or ' +
        'UMAP map meaningful.</p>',
    );
    for (const f of m.gridFigures) out.push(figureHtml(f));
    if (m.rnxFigure) out.push(figureHtml(m.rnxFigure));
    out.push('</section>');
  }

  // 5. maps
  out.push('<section id="maps"><h2>Maps of the leading settings</h2>');
  out.push(`<div class="caution"><p>${esc(m.mapCaution)}</p></div>`);
  out.push(
    '<p class="small">The axes have no numeric ticks: t-SNE and UMAP coordinates have no unit, and every map is ' +
      'shown at the scale that fills its box. Hover over a point to see its id and label.</p>',
  );
  for (const f of m.maps) out.push(figureHtml(f));
  if (m.maps.length === 0) out.push('<p>No map could be drawn.</p>');
  for (const s of m.mapsSkipped) out.push(`<p>${esc(s)}</p>`);
  out.push('</section>');

  if (m.seedGrid) {
    out.push('<section id="seeds"><h2>Every seed of every setting</h2>');
    out.push(`<div class="caution"><p>${esc(m.mapCaution)}</p></div>`);
    out.push('<p class="small">Hover over a point to see its id and label, and where the same point lies in the other panels.</p>');
    out.push(figureHtml(m.seedGrid));
    out.push('</section>');
  }
  if (m.pointMap) {
    out.push('<section id="points"><h2>Which points move between seeds</h2>');
    out.push(figureHtml(m.pointMap));
    out.push('</section>');
  }
  if (m.shepard) {
    out.push('<section id="distances"><h2>Distances: data against map</h2>');
    out.push(figureHtml(m.shepard));
    out.push('</section>');
  }

  // 7. provenance
  out.push('<section id="provenance"><h2>How these results were made</h2><dl class="facts">');
  for (const p of m.provenance) {
    const mono = p.term === 'command' || p.term === 'data sha256';
    out.push(`<dt>${esc(p.term)}</dt><dd${mono ? ' class="mono"' : ''}>${esc(p.text)}</dd>`);
  }
  out.push('</dl></section>');

  // 8. glossary
  out.push('<section id="glossary"><h2>How to read the scores</h2><dl class="glossary">');
  for (const g of m.glossary) out.push(`<dt>${esc(g.term)}</dt><dd>${esc(g.text)}</dd>`);
  out.push('</dl></section>');

  out.push(`</main>${pointDataHtml(m)}<script>${SCRIPT}${TIP_SCRIPT}</script></body></html>`);
  return out.join('\n') + '\n';
}

/**
 * The ids and labels of the rows drawn with tooltips, as JSON inside a
 * non-executed script element. Every '<' is written as \u003c so that no
 * value can close the element.
 */
function pointDataHtml(m: ReportModel): string {
  const labelled = m.hoverPoints.some((p) => p.label !== null);
  const data = {
    r: m.hoverPoints.map((p) => p.row),
    id: m.hoverPoints.map((p) => p.id),
    l: labelled ? m.hoverPoints.map((p) => p.label) : null,
  };
  const json = JSON.stringify(data).replace(/</g, '\\u003c').replace(/\u2028/g, '\\u2028').replace(/\u2029/g, '\\u2029');
  return `<script type="application/json" id="point-data">${json}</script>`;
}

function cellHtml(cell: Cell, numeric: boolean): string {
  const v = cell.sort === null ? '' : typeof cell.sort === 'number' ? String(cell.sort) : cell.sort;
  return `<td${numeric ? ' class="n"' : ''} data-v="${esc(v)}">${esc(cell.text)}</td>`;
}

function figureHtml(f: Figure): string {
  const caption = f.caption.map((p) => `<p>${esc(p)}</p>`).join('');
  return `<figure id="fig-${esc(f.name)}">${f.inlineSvg}<figcaption>${caption}</figcaption></figure>`;
}

import { describe, expect, it } from 'vitest';
import { buildReport } from '../../src/report/index.js';
import { makeFixture } from './fixture.js';

/**
 * A minimal stand-in for the few DOM features the table script uses
 * (getElementById, tHead/tBodies, rows/cells, attributes, event listeners,
 * appendChild), built from the page's own table markup.
 */
function fakeTable(html: string) {
  const table = html.slice(html.indexOf('<table id="ranking-table">'), html.indexOf('</table>'));
  const attrs = (tag: string): Map<string, string> =>
    new Map([...tag.matchAll(/([a-z-]+)="([^"]*)"/g)].map((m) => [m[1], m[2]]));
  const element = (a: Map<string, string>, text: string) => {
    const listeners = new Map<string, (e: unknown) => void>();
    return {
      text,
      className: a.get('class') ?? '',
      tabIndex: -1,
      title: '',
      getAttribute: (k: string) => (a.has(k) ? a.get(k)! : null),
      setAttribute: (k: string, v: string) => void a.set(k, v),
      removeAttribute: (k: string) => void a.delete(k),
      addEventListener: (type: string, f: (e: unknown) => void) => void listeners.set(type, f),
      fire: (type: string, e: unknown = {}) => listeners.get(type)!(e),
    };
  };
  const headers = [...table.matchAll(/<th([^>]*)>([^<]*)<\/th>/g)].map((m) => element(attrs(m[1]), m[2]));
  const body = table.slice(table.indexOf('<tbody>'));
  const rows = [...body.matchAll(/<tr([^>]*)>([\s\S]*?)<\/tr>/g)].map((m) => {
    const cells = [...m[2].matchAll(/<td([^>]*)>([^<]*)<\/td>/g)].map((c) => element(attrs(c[1]), c[2]));
    return Object.assign(element(attrs(m[1]), ''), { cells });
  });
  type Row = (typeof rows)[number];
  const tbody = {
    rows: [...rows],
    appendChild(r: Row) {
      this.rows.splice(this.rows.indexOf(r), 1);
      this.rows.push(r);
    },
  };
  const tableEl = { tHead: { rows: [{ cells: headers }] }, tBodies: [tbody] };
  const document = { getElementById: (id: string) => (id === 'ranking-table' ? tableEl : null) };
  return { document, headers, tbody };
}

function scriptOf(html: string): string {
  const start = html.indexOf('<script>') + '<script>'.length;
  return html.slice(start, html.indexOf('</script>', start));
}

describe('the ranking table script', () => {
  const { results, embeddings } = makeFixture();
  // Give the settings distinct stability values so the columns order differently from rank.
  results.settings[0].stability.seed_knn_overlap = 0.2;
  results.settings[1].stability.seed_knn_overlap = 0.9;
  results.settings[2].stability.seed_knn_overlap = 0.5;
  const html = buildReport({ results, embeddings }, { png: false }).html;

  it('starts in rank order with the rank column marked as sorted', () => {
    const { headers, tbody } = fakeTable(html);
    expect(headers[0].getAttribute('aria-sort')).toBe('ascending');
    expect(tbody.rows.map((r) => r.cells[0].text)).toEqual(['1', '2', 'not ranked']);
  });

  it('sorts by a numeric column on click and reverses on a second click, keeping missing values last', () => {
    const { document, headers, tbody } = fakeTable(html);
    new Function('document', scriptOf(html))(document);
    const col = headers.findIndex((h) => h.text === 'seed kNN overlap');
    headers[col].fire('click');
    expect(tbody.rows.map((r) => r.cells[col].text)).toEqual(['0.200', '0.500', '0.900']);
    expect(headers[col].getAttribute('aria-sort')).toBe('ascending');
    expect(headers[0].getAttribute('aria-sort')).toBeNull();
    headers[col].fire('click');
    expect(tbody.rows.map((r) => r.cells[col].text)).toEqual(['0.900', '0.500', '0.200']);
    const score = headers.findIndex((h) => h.text === 'composite score');
    headers[score].fire('click');
    headers[score].fire('click'); // descending: the unranked row, with no score, stays last
    expect(tbody.rows.map((r) => r.cells[score].text)).toEqual(['0.812', '0.701', '—']);
  });

  it('sorts text columns and responds to the Enter key', () => {
    const { document, headers, tbody } = fakeTable(html);
    new Function('document', scriptOf(html))(document);
    let prevented = false;
    headers[1].fire('keydown', { key: 'Enter', preventDefault: () => (prevented = true) });
    expect(prevented).toBe(true);
    // Case is ignored: t-SNE sorts between PCA and UMAP, not after them.
    expect(tbody.rows.map((r) => r.cells[1].text)).toEqual(['PCA', 't-SNE', 'UMAP']);
  });
});

describe('the point tooltip data', () => {
  const f = makeFixture();
  const html = buildReport(f, { png: false }).html;
  const start = html.indexOf('<script type="application/json" id="point-data">');
  const block = html.slice(html.indexOf('>', start) + 1, html.indexOf('</script>', start));

  it('holds the id and label of every row drawn with a tooltip, readable as JSON', () => {
    const data = JSON.parse(block) as { r: number[]; id: string[]; l: string[] | null };
    expect(data.r).toEqual(Array.from({ length: 60 }, (_, i) => i));
    expect(data.id).toEqual(f.results.dataset.ids);
    expect(data.l).toEqual(f.results.dataset.labels);
  });

  it('writes no "<" inside the block, so no id or label can close the script element', () => {
    expect(block).not.toContain('<');
    expect(block).toContain('\\u003cb>');
  });
});

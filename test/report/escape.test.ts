import { describe, expect, it } from 'vitest';
import { escapeHtml, escapeMarkdown } from '../../src/report/escape.js';

describe('escapeHtml', () => {
  it('turns the five HTML-significant characters into entities', () => {
    expect(escapeHtml(`<a href="x">&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&amp;&#39;&lt;/a&gt;');
  });

  it('drops control characters that XML forbids and keeps tabs and newlines', () => {
    expect(escapeHtml('a\u0001b\tc\nd\u007f')).toBe('ab\tc\nd');
  });
});

describe('escapeMarkdown', () => {
  it('backslash-escapes emphasis, code, link and table characters', () => {
    expect(escapeMarkdown('a*b_c`d[e]f|g~h\\i')).toBe('a\\*b\\_c\\`d\\[e\\]f\\|g\\~h\\\\i');
  });

  it('writes HTML-significant characters as entities and flattens line breaks', () => {
    expect(escapeMarkdown('<x> & y\r\nz\nw')).toBe('&lt;x&gt; &amp; y z w');
  });
});

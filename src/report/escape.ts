/**
 * Escaping of user-provided text (paths, column names, labels, ids, commands)
 * for the two output formats. Every string that did not come from this
 * module's own templates goes through one of these before it is written.
 */

const HTML_ENTITIES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/**
 * Escape text for HTML/SVG element content and for double- or single-quoted
 * attribute values. Control characters other than tab and newline are dropped
 * (they are not allowed in XML 1.0, so an SVG holding them would not parse).
 */
export function escapeHtml(text: string): string {
  return stripControl(text).replace(/[&<>"']/g, (c) => HTML_ENTITIES[c]);
}

/**
 * Escape text for inline Markdown (CommonMark), including table cells:
 * Markdown punctuation that could start emphasis, code, links or a cell
 * boundary is backslash-escaped, characters that could open raw HTML or an
 * entity become HTML entities, and line breaks become spaces so a value
 * can never end a table row or a list item early.
 */
export function escapeMarkdown(text: string): string {
  return stripControl(text)
    .replace(/\r\n?|\n/g, ' ')
    .replace(/[\\`*_[\]|~]/g, (c) => '\\' + c)
    .replace(/[&<>]/g, (c) => HTML_ENTITIES[c]);
}

function stripControl(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, '');
}

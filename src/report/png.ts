/**
 * PNG copies of the figures, for Markdown viewers that do not show SVG
 * files. Rendered with resvg (@resvg/resvg-js 2.6.2), which draws text with
 * the fonts installed on the system; the default family is DejaVu Sans, so
 * the same SVG gives the same bytes on every machine with that font.
 */
import { Resvg } from '@resvg/resvg-js';

/** Font family used for text whose family is not installed, and for "sans-serif". */
export const PNG_FONT_FAMILY = 'DejaVu Sans';

/** Pixels per SVG unit: 2 for sharp text on high-density screens. */
export const PNG_ZOOM = 2;

/** Longest side of a PNG in pixels; larger figures are drawn at a smaller zoom. */
export const PNG_MAX_SIDE = 4000;

/**
 * Render a standalone SVG (with its xmlns) to PNG on a white background.
 * The zoom is `PNG_ZOOM`, reduced when the image would exceed
 * `PNG_MAX_SIDE` pixels on a side.
 *
 * @param svg standalone SVG text with width and height attributes
 * @returns the PNG file's bytes
 */
export function svgToPng(svg: string): Uint8Array {
  const size = /<svg[^>]*\bwidth="([\d.]+)"[^>]*\bheight="([\d.]+)"/.exec(svg);
  const longest = size ? Math.max(Number(size[1]), Number(size[2])) : 0;
  const zoom = longest > 0 ? Math.min(PNG_ZOOM, PNG_MAX_SIDE / longest) : PNG_ZOOM;
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: zoom },
    background: '#ffffff',
    font: {
      loadSystemFonts: true,
      defaultFontFamily: PNG_FONT_FAMILY,
      sansSerifFamily: PNG_FONT_FAMILY,
    },
    logLevel: 'off',
  });
  return new Uint8Array(resvg.render().asPng());
}

import { describe, expect, it } from 'vitest';
import { PNG_MAX_SIDE, svgToPng } from '../../src/report/png.js';

/** Width and height from the IHDR chunk (PNG spec: signature, then IHDR with big-endian width and height). */
function pngSize(png: Uint8Array): [number, number] {
  const v = new DataView(png.buffer, png.byteOffset, png.byteLength);
  return [v.getUint32(16), v.getUint32(20)];
}

describe('svgToPng', () => {
  const svg = (fill: string, w = 120, h = 80): string =>
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${w} ${h}" width="${w}" height="${h}"><rect x="10" y="10" width="40" height="20" fill="${fill}"/><text x="60" y="30" font-family="sans-serif" font-size="12">ρ ≥ 0.75</text></svg>`;

  it('writes a PNG (8-byte signature, IHDR first) at twice the SVG size', () => {
    const png = svgToPng(svg('#0072B2'));
    expect(Array.from(png.subarray(0, 8))).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(String.fromCharCode(...png.subarray(12, 16))).toBe('IHDR');
    expect(pngSize(png)).toEqual([240, 160]);
  });

  it('gives the same bytes for the same SVG and other bytes for another drawing', () => {
    expect(Buffer.from(svgToPng(svg('#0072B2'))).equals(Buffer.from(svgToPng(svg('#0072B2'))))).toBe(true);
    expect(Buffer.from(svgToPng(svg('#0072B2'))).equals(Buffer.from(svgToPng(svg('#D55E00'))))).toBe(false);
  });

  it('draws text with an installed font: the same SVG without its text gives other bytes', () => {
    const noText = svg('#0072B2').replace(/<text[^]*<\/text>/, '');
    expect(Buffer.from(svgToPng(noText)).equals(Buffer.from(svgToPng(svg('#0072B2'))))).toBe(false);
  });

  it('lowers the zoom of a very large figure so that no side exceeds the limit', () => {
    const [w, h] = pngSize(svgToPng(svg('#0072B2', 300, 3000)));
    expect(h).toBe(PNG_MAX_SIDE);
    expect(w).toBe(400);
  });
});

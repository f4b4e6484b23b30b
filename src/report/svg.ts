/**
 * Small SVG building blocks shared by the figures.
 */

/** A coordinate with at most 2 decimals, shortest form ("12.5", "3", never "-0"). */
export function num(v: number): string {
  const r = Math.round(v * 100) / 100;
  return r === 0 ? '0' : String(r);
}

/**
 * Opening <svg> tag with a viewBox. `standalone` adds the SVG namespace,
 * which a file of its own needs and an SVG inlined in HTML does not.
 */
export function svgOpen(width: number, height: number, standalone: boolean): string {
  const ns = standalone ? ' xmlns="http://www.w3.org/2000/svg"' : '';
  return `<svg${ns} viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img">`;
}

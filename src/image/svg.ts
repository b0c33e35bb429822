/** Small SVG string helpers shared by the page, checkbox and signature drawers. */

export function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Gray level 0..255 as an SVG colour. */
export function gray(level: number): string {
  const v = Math.max(0, Math.min(255, Math.round(level)));
  return `rgb(${v},${v},${v})`;
}

/** Number with at most 2 decimals, for compact path data. */
export function n(v: number): string {
  return String(Math.round(v * 100) / 100);
}

export function svgDocument(width: number, height: number, body: string, paper = 255): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">` +
    `<rect width="${width}" height="${height}" fill="${gray(paper)}"/>${body}</svg>`;
}

/** Smooth path through points (Catmull-Rom converted to cubic Béziers), for pen strokes. */
export function smoothPath(points: readonly (readonly [number, number])[]): string {
  if (points.length < 2) return '';
  let d = `M${n(points[0][0])},${n(points[0][1])}`;
  for (let i = 0; i < points.length - 1; i++) {
    const p0 = points[Math.max(0, i - 1)];
    const p1 = points[i];
    const p2 = points[i + 1];
    const p3 = points[Math.min(points.length - 1, i + 2)];
    const c1 = [p1[0] + (p2[0] - p0[0]) / 6, p1[1] + (p2[1] - p0[1]) / 6];
    const c2 = [p2[0] - (p3[0] - p1[0]) / 6, p2[1] - (p3[1] - p1[1]) / 6];
    d += ` C${n(c1[0])},${n(c1[1])} ${n(c2[0])},${n(c2[1])} ${n(p2[0])},${n(p2[1])}`;
  }
  return d;
}

import sharp from 'sharp';
import { useBundledFonts } from '../image/fonts.js';
import { escapeXml } from '../image/svg.js';

/** One class's curve: interpolated precision at recall 0, 0.01, ..., 1 (101 values). */
export interface PrCurve {
  name: string;
  precision: readonly number[];
  ap50: number | null;
}

const W = 760;
const H = 600;
const LEFT = 80;
const TOP = 70;
const PLOT = 460;
const LEGEND_X = LEFT + PLOT + 24;

// Okabe–Ito colours, chosen to stay distinguishable under common colour-vision deficiencies (Okabe & Ito, "Color
// Universal Design", 2008; from memory).
const COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#F0E442', '#000000'];


/** Precision–recall plot as SVG: one curve per class, grid, axis labels, legend with AP@0.5. */
export function prPlotSvg(curves: readonly PrCurve[], title: string): string {
  const x = (r: number): number => LEFT + r * PLOT;
  const y = (p: number): number => TOP + (1 - p) * PLOT;
  const parts: string[] = [`<rect x="0" y="0" width="${W}" height="${H}" fill="#ffffff"/>`];
  for (let t = 0; t <= 10; t++) {
    const v = t / 10;
    parts.push(
      `<line x1="${x(0)}" y1="${y(v)}" x2="${x(1)}" y2="${y(v)}" stroke="#e6e6e6"/>`,
      `<line x1="${x(v)}" y1="${y(0)}" x2="${x(v)}" y2="${y(1)}" stroke="#e6e6e6"/>`,
      `<text x="${x(0) - 8}" y="${y(v) + 5}" font-size="13" text-anchor="end">${v.toFixed(1)}</text>`,
      `<text x="${x(v)}" y="${y(0) + 20}" font-size="13" text-anchor="middle">${v.toFixed(1)}</text>`,
    );
  }
  parts.push(`<rect x="${x(0)}" y="${y(1)}" width="${PLOT}" height="${PLOT}" fill="none" stroke="#333"/>`);
  curves.forEach((c, i) => {
    const colour = COLOURS[i % COLOURS.length];
    const n = c.precision.length;
    // Past the final recall the interpolated precision is 0 by definition; the curve stops where recall does.
    let last = n - 1;
    while (last >= 0 && c.precision[last] === 0) last--;
    if (n > 1 && last >= 0) {
      const points = c.precision
        .slice(0, last + 1)
        .map((p, k) => `${x(k / (n - 1)).toFixed(1)},${y(p).toFixed(1)}`)
        .join(' ');
      parts.push(`<polyline points="${points}" fill="none" stroke="${colour}" stroke-width="2.5" stroke-linejoin="round"/>`);
    }
    const ly = TOP + 10 + i * 42;
    const ap = c.ap50 === null ? 'no labels' : `AP@0.5 ${c.ap50.toFixed(3)}`;
    parts.push(
      `<line x1="${LEGEND_X}" y1="${ly}" x2="${LEGEND_X + 26}" y2="${ly}" stroke="${colour}" stroke-width="4"/>`,
      `<text x="${LEGEND_X + 34}" y="${ly + 5}" font-size="14">${escapeXml(c.name)}</text>`,
      `<text x="${LEGEND_X + 34}" y="${ly + 20}" font-size="11" fill="#555">${ap}</text>`,
    );
  });
  parts.push(
    `<text x="${x(0.5)}" y="${y(0) + 46}" font-size="15" text-anchor="middle">recall</text>`,
    `<text transform="translate(26 ${y(0.5)}) rotate(-90)" font-size="15" text-anchor="middle">precision</text>`,
    `<text x="${LEFT}" y="30" font-size="18" font-weight="bold">${escapeXml(title)}</text>`,
    `<text x="${LEFT}" y="52" font-size="13" fill="#444">IoU 0.5; precision interpolated at 101 recall points (COCO)</text>`,
  );
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" ` +
    `font-family="DejaVu Sans">\n${parts.join('\n')}\n</svg>\n`
  );
}

/** The SVG rendered to PNG with the bundled fonts. */
export async function prPlotPng(curves: readonly PrCurve[], title: string): Promise<Buffer> {
  useBundledFonts();
  return sharp(Buffer.from(prPlotSvg(curves, title))).png().toBuffer();
}

import sharp from 'sharp';
import { useBundledFonts } from '../image/fonts.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { escapeXml } from '../image/svg.js';

/**
 * Boxes and captions drawn over a page image, to check by eye what was found where (results, drafted schemas).
 * Rendered as one SVG layer composited by sharp onto the page turned to colour.
 */

export interface OverlayItem {
  box: Box;
  /** CSS colour of the frame and caption. */
  colour: string;
  caption: string;
  /** Dashed frame: a box that came from a fallback (schema region) rather than a detection. */
  dashed?: boolean;
}

export interface LegendEntry {
  colour: string;
  text: string;
}


function intersectionArea(a: Box, b: Box): number {
  const w = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

/**
 * Where each caption's backing plate goes: the first of above, below, right of, left of the box that covers no
 * field box and no caption already placed and stays on the page; failing that, the one that covers least. A
 * caption must never hide the entry it describes or its neighbour's, which a reviewer reads through the overlay.
 * Null for an item without caption.
 */
export function captionPlates(width: number, height: number, items: readonly OverlayItem[], font: number, pad: number): (Box | null)[] {
  const placed: Box[] = [];
  const boxes = items.map((it) => it.box);
  return items.map((it) => {
    if (it.caption === '') return null;
    const { x, y, w, h } = it.box;
    // Width estimate for the backing plate: DejaVu Sans averages about 0.6 em per character (from memory).
    const pw = 0.6 * font * it.caption.length + 2 * pad;
    const ph = font * 1.3;
    const gap = pad;
    const candidates: Box[] = [
      { x, y: y - ph - gap, w: pw, h: ph },
      { x, y: y + h + gap, w: pw, h: ph },
      { x: x + w + gap, y, w: pw, h: ph },
      { x: x - pw - gap, y, w: pw, h: ph },
      // Shifted sideways along the lines above and below: checkbox rows leave room between their boxes.
      ...[-1, 1, -2, 2].flatMap((k) => [
        { x: x + (k * pw) / 2, y: y - ph - gap, w: pw, h: ph },
        { x: x + (k * pw) / 2, y: y + h + gap, w: pw, h: ph },
      ]),
    ].map((c) => ({ ...c, x: Math.max(0, Math.min(c.x, width - c.w)) }));
    const onPage = candidates.filter((c) => c.y >= 0 && c.y + c.h <= height);
    const cost = (c: Box) => [...boxes, ...placed].reduce((a, b) => a + intersectionArea(c, b), 0);
    let best = onPage[0] ?? { x, y, w: pw, h: ph };
    let bestCost = onPage.length ? cost(best) : Infinity;
    for (const c of onPage) {
      const k = cost(c);
      if (k === 0) {
        best = c;
        break;
      }
      if (k < bestCost) {
        best = c;
        bestCost = k;
      }
    }
    placed.push(best);
    return best;
  });
}

/** The overlay layer as SVG text (exported for tests and for callers that composite it themselves). */
export function overlaySvg(width: number, height: number, items: readonly OverlayItem[], legend: readonly LegendEntry[] = []): string {
  // Sizes follow the page: a 1700-px-wide page (letter at 200 dpi) gets 3-px frames and 22-px captions.
  const k = Math.max(0.5, width / 1700);
  const stroke = Math.max(1.5, 3 * k);
  const font = Math.round(22 * k);
  const pad = Math.round(4 * k);
  const parts: string[] = [];
  const plates = captionPlates(width, height, items, font, pad);
  items.forEach((it, i) => {
    const { x, y, w, h } = it.box;
    const dash = it.dashed ? ` stroke-dasharray="${(4 * stroke).toFixed(1)} ${(2 * stroke).toFixed(1)}"` : '';
    parts.push(
      `<rect x="${x.toFixed(1)}" y="${y.toFixed(1)}" width="${w.toFixed(1)}" height="${h.toFixed(1)}" fill="none" stroke="${it.colour}" stroke-width="${stroke.toFixed(1)}"${dash}/>`,
    );
    const plate = plates[i];
    if (plate === null) return;
    parts.push(
      `<rect x="${plate.x.toFixed(1)}" y="${plate.y.toFixed(1)}" width="${plate.w.toFixed(1)}" height="${plate.h.toFixed(1)}" fill="#ffffff" fill-opacity="0.8"/>`,
      `<text x="${(plate.x + pad).toFixed(1)}" y="${(plate.y + font).toFixed(1)}" font-family="DejaVu Sans" font-size="${font}" fill="${it.colour}">${escapeXml(it.caption)}</text>`,
    );
  });
  if (legend.length > 0) {
    const lw = Math.max(...legend.map((l) => l.text.length)) * 0.6 * font + 4 * font;
    const lx = width - lw - 2 * font;
    parts.push(
      `<rect x="${lx.toFixed(1)}" y="${font}" width="${lw.toFixed(1)}" height="${(legend.length * 1.4 * font + font).toFixed(1)}" fill="#ffffff" fill-opacity="0.9" stroke="#404040"/>`,
    );
    legend.forEach((l, i) => {
      const ly = font * 2.2 + i * 1.4 * font;
      parts.push(
        `<rect x="${(lx + font * 0.6).toFixed(1)}" y="${(ly - font * 0.8).toFixed(1)}" width="${font}" height="${font}" fill="none" stroke="${l.colour}" stroke-width="${stroke.toFixed(1)}"/>`,
        `<text x="${(lx + font * 2.2).toFixed(1)}" y="${ly.toFixed(1)}" font-family="DejaVu Sans" font-size="${font}" fill="#202020">${escapeXml(l.text)}</text>`,
      );
    });
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">${parts.join('')}</svg>`;
}

/** The page in colour with the overlay drawn on it, as PNG bytes. */
export async function renderOverlay(page: GrayImage, items: readonly OverlayItem[], legend: readonly LegendEntry[] = []): Promise<Buffer> {
  useBundledFonts();
  const svg = Buffer.from(overlaySvg(page.width, page.height, items, legend));
  return sharp(Buffer.from(page.data.buffer, page.data.byteOffset, page.data.byteLength), {
    raw: { width: page.width, height: page.height, channels: 1 },
  })
    .toColourspace('srgb')
    .composite([{ input: svg, top: 0, left: 0 }])
    .png()
    .toBuffer();
}

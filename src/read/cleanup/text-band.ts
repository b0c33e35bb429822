import type { Box } from '../../page/geometry.js';
import type { GrayImage } from '../../page/raster.js';
import { createGray } from '../../page/raster.js';
import { INK, rowProfile } from './binary.js';

/** A run of rows that hold ink: one text line, found from the horizontal projection profile. */
export interface TextBand {
  top: number;
  /** Exclusive. */
  bottom: number;
  /** Ink pixels in the band. */
  ink: number;
}

/**
 * Split the rows into bands of ink separated by empty rows (projection-profile line segmentation; common practice).
 * Bands closer than `mergeGap` rows are merged so an i-dot, an accent or a descender stays with its line.
 */
export function textBands(img: GrayImage, mergeGap = 2): TextBand[] {
  const p = rowProfile(img);
  const bands: TextBand[] = [];
  let y = 0;
  while (y < img.height) {
    if (p[y] === 0) { y++; continue; }
    const top = y;
    let ink = 0;
    while (y < img.height && p[y] > 0) ink += p[y++];
    const last = bands[bands.length - 1];
    if (last && top - last.bottom <= mergeGap) {
      last.bottom = y;
      last.ink += ink;
    } else bands.push({ top, bottom: y, ink });
  }
  return bands;
}

export interface BandOptions {
  /** 'line' keeps the single band holding the field's value; 'block' keeps every band that overlaps the field box. */
  mode: 'line' | 'block';
  /** The field box in crop pixels: bands mostly outside it (a neighbouring line caught by padding) lose. */
  inside?: Box;
  /** Rows merged across, as a share of the tallest band. Default 0.25 (keeps dots and accents with their line). */
  mergeShare?: number;
}

function overlap(b: TextBand, inside: Box | undefined): number {
  if (!inside) return 1;
  const top = Math.max(b.top, inside.y);
  const bottom = Math.min(b.bottom, inside.y + inside.h);
  return Math.max(0, bottom - top) / (b.bottom - b.top);
}

/**
 * Keep only the text line(s) holding the field's content; everything else becomes paper. In line mode the band
 * with the most ink inside the field box wins: printed labels in a cell corner are smaller and lighter than the
 * value, and a neighbouring line caught by the padding lies mostly outside the box.
 */
export function isolateTextBand(img: GrayImage, options: BandOptions): { image: GrayImage; bands: TextBand[] } {
  const first = textBands(img, 0);
  if (first.length === 0) return { image: img, bands: [] };
  const tallest = Math.max(...first.map((b) => b.bottom - b.top));
  const bands = textBands(img, Math.max(1, Math.round(tallest * (options.mergeShare ?? 0.25))));
  let chosen: TextBand[];
  if (options.mode === 'block') {
    chosen = bands.filter((b) => overlap(b, options.inside) >= 0.5);
    if (chosen.length === 0) chosen = bands;
  } else {
    let best = bands[0];
    let bestScore = -1;
    for (const b of bands) {
      const score = b.ink * overlap(b, options.inside);
      if (score > bestScore) { bestScore = score; best = b; }
    }
    chosen = [best];
  }
  const out = createGray(img.width, img.height);
  for (const b of chosen) {
    out.data.set(img.data.subarray(b.top * img.width, b.bottom * img.width), b.top * img.width);
  }
  return { image: out, bands: chosen };
}

/** Bounding box of the ink, or null when there is none. */
export function inkBounds(img: GrayImage): Box | null {
  let x0 = img.width, y0 = img.height, x1 = -1, y1 = -1;
  for (let y = 0; y < img.height; y++) {
    for (let x = 0; x < img.width; x++) {
      if (img.data[y * img.width + x] !== INK) continue;
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
    }
  }
  return x1 < 0 ? null : { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 };
}

import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';
import type { Phrase } from '../page/text-phrases.js';

/** Reads one printed phrase (a crop of the page) and returns its text. */
export type LabelReader = (crop: GrayImage) => Promise<string>;

/**
 * Read a phrase with a margin of a third of its character height around it (common practice for OCR crops), and a
 * full character height on the right, where a trailing colon or period (too small to count as a character
 * component) may sit.
 */
export async function readPhrase(page: GrayImage, p: Phrase, reader: LabelReader, masks: readonly Box[]): Promise<string> {
  const pad = Math.max(3, Math.round(p.charHeight / 3));
  const right = Math.max(pad, Math.round(p.charHeight));
  const box = { x: p.box.x - pad, y: p.box.y - pad, w: p.box.w + pad + right, h: p.box.h + 2 * pad };
  const crop = cropGray(page, box);
  // A checkbox frame or comb printed right against the label would be read as a letter ("|" or "I" glued to the
  // first word: "icharacter_of_service" on the DD 293): paper over them, a pixel beyond their outline.
  // The crop's origin on the page, as cropGray places it (rounded down, clamped at the page edge).
  const ox = Math.max(0, Math.floor(box.x));
  const oy = Math.max(0, Math.floor(box.y));
  for (const m of masks) {
    const x0 = Math.max(0, Math.floor(m.x - 1 - ox));
    const y0 = Math.max(0, Math.floor(m.y - 1 - oy));
    const x1 = Math.min(crop.width, Math.ceil(m.x + m.w + 1 - ox));
    const y1 = Math.min(crop.height, Math.ceil(m.y + m.h + 1 - oy));
    for (let y = y0; y < y1; y++) crop.data.fill(255, y * crop.width + x0, y * crop.width + Math.max(x0, x1));
  }
  return (await reader(crop)).replace(/\s+/g, ' ').trim();
}


import { binarizeOtsu } from '../image/otsu.js';
import { labelComponents } from '../image/components.js';
import type { Box } from '../image/geometry.js';
import { unionBox } from '../image/geometry.js';
import { cropGray, type GrayImage } from '../image/raster.js';
import type { DigitReader } from './digit-reader.js';
import { glyphs } from './script-measures.js';

/**
 * The digits of a handwritten entry read glyph by glyph with the digit reader (src/read/digit-reader.ts), as a second
 * reader independent of Tesseract for fields without comb cells: the entry's glyph components (script-measures.ts
 * `glyphs`: specks, dots and rules dropped), those that overlap in x merged into one (a 5 or a 4 written in two
 * strokes), each cut with a margin and classified. Separators (slashes, parentheses, dashes) come back as not a
 * digit and are skipped. Null when nothing glyph-like is found.
 */
export interface DigitGlyphReading {
  /** The digits read, in writing order. */
  digits: string;
  /** Glyphs the reader did not take for a digit (separators, letters, merged digits). */
  notDigits: number;
  /** The weakest digit's probability. */
  weakest: number;
}

/** Share of the narrower box two glyphs must overlap in x to be one character (common practice for split strokes). */
const MERGE_OVERLAP = 0.5;
/** Margin around a glyph, as a share of its height, so the cell looks like a comb cell with the digit inside. */
const CELL_MARGIN = 0.25;

function mergeColumns(boxes: Box[]): Box[] {
  const sorted = [...boxes].sort((a, b) => a.x - b.x);
  const out: Box[] = [];
  for (const b of sorted) {
    const last = out[out.length - 1];
    const overlap = last ? Math.min(last.x + last.w, b.x + b.w) - Math.max(last.x, b.x) : 0;
    if (last && overlap > MERGE_OVERLAP * Math.min(last.w, b.w)) out[out.length - 1] = unionBox([last, b]);
    else out.push(b);
  }
  return out;
}

export async function readDigitGlyphs(crop: GrayImage, reader: DigitReader): Promise<DigitGlyphReading | null> {
  const { components } = labelComponents(binarizeOtsu(crop));
  const boxes = mergeColumns(glyphs(components).map((c) => c.box));
  if (boxes.length === 0) return null;
  const cells = boxes.map((b) => {
    const m = Math.round(CELL_MARGIN * b.h);
    const x = Math.max(0, b.x - m);
    const y = Math.max(0, b.y - m);
    return cropGray(crop, { x, y, w: Math.min(crop.width, b.x + b.w + m) - x, h: Math.min(crop.height, b.y + b.h + m) - y });
  });
  const reads = await reader.readCells(cells);
  let digits = '';
  let notDigits = 0;
  let weakest = 1;
  for (const r of reads) {
    if (r.digit !== null) {
      digits += r.digit;
      weakest = Math.min(weakest, r.confidence);
    } else if (r.label !== 'empty') notDigits++;
  }
  return { digits, notDigits, weakest };
}

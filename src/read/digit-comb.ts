import type { OcrWord, TextReading } from '../fields/types.js';
import { clampBox, roundBox, type Box } from '../image/geometry.js';
import { PAPER } from '../image/binary.js';
import { cropGray, type GrayImage } from '../image/raster.js';
import { removeDashedRules } from './cleanup/line-removal.js';
import { joinCells } from './comb-cells.js';
import type { FieldCrop } from './crop.js';
import type { CellRead, DigitReader } from './digit-reader.js';
import { locateCombCells } from './read-text.js';

/** What the digit reader made of a comb field, cell by cell. */
export interface DigitCombReading {
  /** The reading in OCR form: one word per digit, its confidence the model's probability. Cells holding something
   *  other than a digit read as '?'. */
  reading: TextReading;
  cells: CellRead[];
  /** Cells that hold writing the reader does not take for a digit. */
  notDigits: number;
  /** Cells read as empty although the reader gives a digit at least DOUBTFUL_EMPTY probability. */
  doubtfulEmpty: number;
}

/**
 * Probability of "some digit" above which an empty-read cell is doubtful: a faint or cut-off digit. Common
 * practice for a two-way doubt band (the empty/digit decision is a plain argmax; a fifth of the mass on the other
 * side is worth saying).
 */
export const DOUBTFUL_EMPTY = 0.2;

export interface DigitCombOptions {
  /** The comb's cell count when the schema knows it (a comb widget's maximum length: ISO 32000-1 §12.7.4.3, the
   *  comb flag divides the field evenly into that many cells). */
  cells?: number;
}

/**
 * The gray crop with its dashed and dotted rules painted out (paper white), as the OCR's cell-by-cell read removes
 * them from its binary image (cleanup/line-removal.ts removeDashedRules). A comb's dotted separators need not sit on
 * the cells' edges: on IRS Form 1040 the SSN comb's ticks group its nine cells 3-2-4 while the widget divides them
 * evenly, so a tick runs down the middle of the third and fifth cells, where the digit reader saw it as a "1" in an
 * empty cell. The rule pixels are grown by one pixel to take the scan's gray fringe with them.
 */
function withoutDashedRules(image: GrayImage, ruled: GrayImage): GrayImage {
  if (ruled.width !== image.width || ruled.height !== image.height) return image;
  const clean = removeDashedRules(ruled);
  const { width, height } = image;
  const out = { width, height, data: image.data.slice() };
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (ruled.data[i] === PAPER || clean.data[i] !== PAPER) continue;
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
        const yy = y + dy, xx = x + dx;
        if (yy >= 0 && yy < height && xx >= 0 && xx < width) out.data[yy * width + xx] = PAPER;
      }
    }
  }
  return out;
}

/** `n` equal cells across the located box: how a comb widget lays its characters out (ISO 32000-1 §12.7.4.3). */
export function evenCells(inner: Box, n: number): Box[] {
  const w = inner.w / n;
  return Array.from({ length: n }, (_, i) => ({ x: inner.x + i * w, y: inner.y, w, h: inner.h }));
}

/**
 * Read a comb field with the digit reader: the cells are cut at the printed separators (the same cut the OCR's
 * cell-by-cell variant uses), each cell's gray pixels go to the model in one batch. Many printed combs have few or
 * no separators to find: a row of short underlines (US court forms' SSN boxes), a single baseline (VA forms), dotted
 * ticks only between the groups of an SSN (IRS Form 1040: 3-2-4). When the schema gives the cell count and fewer
 * cells than that are found, the box is cut into that many equal cells instead (more cells than the count are kept:
 * a schema's maximum length may be under the printed cells). Null when neither gives two cells (not a comb).
 */
export async function readDigitComb(crop: FieldCrop, reader: DigitReader, options: DigitCombOptions = {}): Promise<DigitCombReading | null> {
  // The page was deskewed as a whole and the crop is not rotated, so the cell boxes index the gray crop directly.
  const located = locateCombCells(crop, { name: 'digit_cells', steps: ['otsu'] }, 0);
  let boxes = located.cells;
  if (options.cells !== undefined && options.cells >= 2 && boxes.length < options.cells) boxes = evenCells(crop.inner, options.cells).map((b) => clampBox(roundBox(b), crop.image.width, crop.image.height));
  if (boxes.length < 2) return null;
  const gray = withoutDashedRules(crop.image, located.ruled);
  const cells = await reader.readCells(boxes.map((b) => cropGray(gray, b)));
  const chars: (string | null)[] = [];
  const words: OcrWord[] = [];
  let notDigits = 0;
  let doubtfulEmpty = 0;
  for (const c of cells) {
    if (c.label === 'empty') {
      chars.push(null);
      if (c.digitProbability >= DOUBTFUL_EMPTY) doubtfulEmpty++;
    } else if (c.digit !== null) {
      chars.push(c.digit);
      words.push({ text: c.digit, confidence: c.confidence });
    } else {
      chars.push('?');
      words.push({ text: '?', confidence: 0 });
      notDigits++;
    }
  }
  const confidence = words.length ? words.reduce((s, w) => s + w.confidence, 0) / words.length : 1;
  return { reading: { kind: 'text', text: joinCells(chars), words, confidence, variant: 'digit_cells' }, cells, notDigits, doubtfulEmpty };
}

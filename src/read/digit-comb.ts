import type { OcrWord, TextReading } from '../fields/types.js';
import { clampBox, roundBox, type Box } from '../image/geometry.js';
import { cropGray } from '../image/raster.js';
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

/** `n` equal cells across the located box: how a comb widget lays its characters out (ISO 32000-1 §12.7.4.3). */
export function evenCells(inner: Box, n: number): Box[] {
  const w = inner.w / n;
  return Array.from({ length: n }, (_, i) => ({ x: inner.x + i * w, y: inner.y, w, h: inner.h }));
}

/**
 * Read a comb field with the digit reader: the cells are cut at the printed separators (the same cut the OCR's
 * cell-by-cell variant uses), each cell's gray pixels go to the model in one batch. Many printed combs have no
 * separators to find: a row of short underlines (US court forms' SSN boxes), a single baseline (VA forms), dotted
 * ticks lost in the scan. When fewer than two cells are found and the schema gives the cell count, the box is cut
 * into that many equal cells instead. Null when neither gives two cells (not a comb after all).
 */
export async function readDigitComb(crop: FieldCrop, reader: DigitReader, options: DigitCombOptions = {}): Promise<DigitCombReading | null> {
  // The page was deskewed as a whole and the crop is not rotated, so the cell boxes index the gray crop directly.
  let { cells: boxes } = locateCombCells(crop, { name: 'digit_cells', steps: ['otsu'] }, 0);
  if (boxes.length < 2 && options.cells !== undefined && options.cells >= 2) boxes = evenCells(crop.inner, options.cells).map((b) => clampBox(roundBox(b), crop.image.width, crop.image.height));
  if (boxes.length < 2) return null;
  const cells = await reader.readCells(boxes.map((b) => cropGray(crop.image, b)));
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

import { handwrittenDigitSvg } from '../handwritten-digits.js';
import type { CombCellDrawer } from './handwriting.js';

/**
 * The cell drawer of `samples fill --real-digits`: a digit written by a handwriting pen is a real handwritten digit
 * from the MNIST test split (src/synth/mnist-digits.ts fixes the split, so pages drawn with it measure the digit
 * reader on handwriting it never trained on); any other character, and every character of a typing pen, is left
 * to the pen's font.
 */
export const realDigitCell: CombCellDrawer = (cell, ch, rng, pen) =>
  pen.handwriting && /^[0-9]$/.test(ch) ? handwrittenDigitSvg(ch, cell, rng, { ink: pen.ink }) : null;

import type { Box } from '../image/geometry.js';
import { grayAlphaPng } from './ink-png.js';
import { MNIST_SIZE, mnistDigit, testIndices } from './mnist-digits.js';
import type { Rng } from './prng.js';
import { n } from '../image/svg.js';

/** One handwritten digit from the MNIST test split, ready to place: its PNG (ink gray, alpha = stroke) and where. */
export interface HandwrittenDigit {
  /** 28 x 28 gray + alpha PNG: every pixel the pen's gray, the stroke in the alpha channel. */
  png: Buffer;
  /** The square the 28 x 28 image is drawn into (page units), centred on the cell with a writer's offset. */
  box: Box;
  /** Which test-split digit: its class and index within the class in the `mnist` package. */
  source: { digit: number; index: number };
}

export interface HandwrittenDigitOptions {
  /** The pen's gray level, 0 = black; default 30. */
  ink?: number;
  /** A particular test-split digit (its index within its class); default one drawn by the Rng. */
  index?: number;
}

/**
 * Place a real handwritten digit in one cell (a comb box or one digit's room in a field). Only test-split digits
 * are used (src/synth/mnist-digits.ts), so pages drawn with them measure the digit reader on handwriting it never
 * saw. The digit's 28 x 28 frame is scaled to 0.75..1.05 of the cell height (MNIST digits fill a 20 x 20 box of
 * that frame, so the strokes take about 55..75 % of the height, as people write in boxes: common practice), kept
 * inside 1.1 cell widths, and offset by up to 8 % of the cell each way.
 *
 * Small signature for other fillers (SVG pages, PDF form filling): pass the digit character, the cell, a seeded
 * Rng and optionally the pen's gray level; place `png` at `box` (rotate a few degrees if you like).
 */
export function handwrittenDigit(ch: string, cell: Box, rng: Rng, options: HandwrittenDigitOptions = {}): HandwrittenDigit {
  if (!/^[0-9]$/.test(ch)) throw new Error(`handwrittenDigit draws 0-9, not "${ch}"`);
  const digit = Number(ch);
  const ink = options.ink ?? 30;
  const index = options.index ?? rng.pick(testIndices(digit));
  if (!testIndices(digit).includes(index)) throw new Error(`digit ${digit} index ${index} is not in the MNIST test split`);
  const size = Math.min(cell.h * rng.range(0.75, 1.05), cell.w * 1.1);
  const cx = cell.x + cell.w / 2 + rng.range(-0.08, 0.08) * cell.w;
  const cy = cell.y + cell.h / 2 + rng.range(-0.08, 0.08) * cell.h;
  const png = grayAlphaPng(MNIST_SIZE, MNIST_SIZE, ink, mnistDigit(digit, index));
  return { png, box: { x: cx - size / 2, y: cy - size / 2, w: size, h: size }, source: { digit, index } };
}

/** The digit as an SVG <image> (a data URI; librsvg inside sharp renders it), slightly rotated as hands write. */
export function handwrittenDigitSvg(ch: string, cell: Box, rng: Rng, options: HandwrittenDigitOptions = {}): string {
  const d = handwrittenDigit(ch, cell, rng, options);
  const b = d.box;
  const angle = rng.range(-4, 4);
  return (
    `<image x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" preserveAspectRatio="none" ` +
    `transform="rotate(${n(angle)} ${n(b.x + b.w / 2)} ${n(b.y + b.h / 2)})" href="data:image/png;base64,${d.png.toString('base64')}"/>`
  );
}

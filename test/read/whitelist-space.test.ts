import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { grayFromImage } from '../../src/image/raster.js';
import { OcrEngine, whitelist } from '../../src/read/ocr-engine.js';
import { useBundledFonts } from '../../src/image/fonts.js';

const ocr = new OcrEngine();
afterAll(() => ocr.close());

describe('OCR whitelist', () => {
  it('always lets spaces through, so a spaced line keeps its words and their confidences', async () => {
    expect(whitelist('0123456789-')).toBe('0123456789- ');
    expect(whitelist(undefined)).toBe('');
    useBundledFonts();
    // A date typed into three cells comes out spaced: "2026 - 09 - 24".
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="420" height="70"><rect width="100%" height="100%" fill="white"/>
      <text x="12" y="48" font-family="DejaVu Sans Mono" font-size="32">2026 - 09 - 24</text></svg>`;
    const crop = await grayFromImage(await sharp(Buffer.from(svg)).png().toBuffer());
    const reading = await ocr.read(crop, { mode: 'line', allowed: '0123456789-' });
    expect(reading.text.replace(/\s+/g, '')).toBe('2026-09-24');
    // Tesseract reports 0 for a line it had to glue into one word; real confidences are well above that.
    expect(Math.min(...reading.words.map((w) => w.confidence))).toBeGreaterThan(0.5);
  });
});

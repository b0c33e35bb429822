import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { FONT_FAMILIES, useBundledFonts, type FontKey } from '../../src/image/fonts.js';
import { escapeXml, svgDocument } from '../../src/image/svg.js';
import { estimateTextWidth } from '../../src/synth/text-metrics.js';

/** Width of the ink of a text rendered by librsvg (inside sharp) with the bundled fonts. */
async function renderedWidth(text: string, font: FontKey, size: number): Promise<number> {
  useBundledFonts();
  const svg = svgDocument(2000, 200, `<text x="20" y="120" font-family="${FONT_FAMILIES[font]}" font-size="${size}">${escapeXml(text)}</text>`);
  const { data, info } = await sharp(Buffer.from(svg)).grayscale().raw().toBuffer({ resolveWithObject: true });
  let left = info.width;
  let right = -1;
  for (let y = 0; y < info.height; y++)
    for (let x = 0; x < info.width; x++)
      if (data[y * info.width + x] < 160) {
        left = Math.min(left, x);
        right = Math.max(right, x);
      }
  return right - left + 1;
}

const SAMPLES = ['Bram Elderholm', '(207) 555-0142', 'ada.quillon@example.org', '1011 Beacon Hill Rd', 'K1A 0B1'];

describe('text width estimates', () => {
  it('every bundled font is found by name (a missing font falls back to another family with other widths)', async () => {
    const widths = await Promise.all((Object.keys(FONT_FAMILIES) as FontKey[]).map((f) => renderedWidth('Hamburgefonstiv', f, 40)));
    expect(new Set(widths).size).toBe(widths.length);
  });

  it('estimates stay within 25 % of the rendered width for every font', async () => {
    for (const font of Object.keys(FONT_FAMILIES) as FontKey[])
      for (const text of SAMPLES) {
        const real = await renderedWidth(text, font, 40);
        const est = estimateTextWidth(text, font, 40);
        expect(Math.abs(est - real) / real, `${font} "${text}": estimated ${est.toFixed(0)} px, rendered ${real} px`).toBeLessThan(0.25);
      }
  });
});

import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import type { TextReading } from '../../src/fields/types.js';
import { grayFromImage } from '../../src/image/raster.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { withoutPrintedLabel } from '../../src/read/printed-label.js';
import { readTextField } from '../../src/read/read-text.js';
import { useBundledFonts } from '../../src/image/fonts.js';

const ocr = new OcrEngine();
afterAll(() => ocr.close());

const words = (text: string, confidence = 0.9): TextReading => ({
  kind: 'text',
  text,
  words: text.split(/\s+/).filter(Boolean).map((t) => ({ text: t, confidence })),
  confidence,
});

/** A ruled cell with its label printed in the top-left corner, the value (if any) below it: invented content. */
async function labelledCell(label: string, value: string) {
  useBundledFonts();
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="700" height="160"><rect width="100%" height="100%" fill="white"/>
    <rect x="20" y="20" width="640" height="110" fill="none" stroke="black" stroke-width="2"/>
    <text x="28" y="44" font-family="DejaVu Sans" font-size="18">${label}</text>
    <text x="40" y="105" font-family="DejaVu Sans" font-size="34">${value}</text></svg>`;
  const page = await grayFromImage(await sharp(Buffer.from(svg)).png().toBuffer());
  // The whole cell, as a detector finds it: the label is inside the entry area.
  return readTextField(page, { x: 20, y: 20, w: 640, h: 110 }, { engine: ocr, mode: 'block', skew: 0 });
}

describe('printed label caught in a crop', () => {
  it('reads a blank ruled cell as blank and a filled one as its value (real OCR on rendered pixels)', async () => {
    const blank = await labelledCell('Street address', '');
    expect(blank.reading.text.toLowerCase()).toContain('street'); // the label is really in the crop
    expect(withoutPrintedLabel(blank.reading, 'Street address').text).toBe('');
    const filled = await labelledCell('Street address', '42 Heron Quay');
    expect(withoutPrintedLabel(filled.reading, 'Street address').text).toBe('42 Heron Quay');
  });

  it('matches words after case folding, punctuation and one OCR slip; at the start or the end', () => {
    expect(withoutPrintedLabel(words('Preferred plot (eg B-12)'), 'Preferred plot (eg B-12)').text).toBe('');
    expect(withoutPrintedLabel(words('Vesse1 name Sea Wren'), 'Vessel name').text).toBe('Sea Wren');
    expect(withoutPrintedLabel(words('Sea Wren Vessel name'), 'Vessel name').text).toBe('Sea Wren');
    const rest = withoutPrintedLabel(words('City Port Aldery', 0.8), 'City');
    expect(rest.words.map((w) => w.text)).toEqual(['Port', 'Aldery']);
  });

  it('leaves a read alone when the label is not all there, or too short to tell from a value', () => {
    const r = words('Street 42 Heron Quay');
    expect(withoutPrintedLabel(r, 'Street address')).toBe(r);
    const no = words('No');
    expect(withoutPrintedLabel(no, 'No.')).toBe(no); // "No." could be the answer
    expect(withoutPrintedLabel(no, undefined)).toBe(no);
  });
});

import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { PSM } from 'tesseract.js';
import { englishLangPath, OcrEngine, PSM_FOR_MODE } from '../../src/read/ocr-engine.js';
import { renderCell } from './render-cell.js';
import { cropField } from '../../src/read/crop.js';
import { cleanCrop } from '../../src/read/cleanup/pipeline.js';
import { STANDARD } from '../../src/read/variants.js';

const engine = new OcrEngine();
afterAll(() => engine.close());

describe('OCR engine (real tesseract.js, offline)', () => {
  it('reads its traineddata from the installed package folder, never from a URL', () => {
    // tesseract.js fetches only when langPath is a URL or unset (its worker-script loadLanguage); a local folder is read from disk.
    const dir = englishLangPath();
    expect(path.isAbsolute(dir)).toBe(true);
    expect(dir).not.toMatch(/^[a-z]+:\/\//i);
    expect(statSync(path.join(dir, 'eng.traineddata.gz')).size).toBeGreaterThan(1_000_000);
    expect(existsSync(dir)).toBe(true);
  });

  it('maps field modes to tesseract page segmentation modes', () => {
    // Tesseract manual, --psm: 6 single uniform block, 7 single text line, 8 single word, 10 single character.
    expect(PSM_FOR_MODE).toEqual({ block: PSM.SINGLE_BLOCK, line: PSM.SINGLE_LINE, word: PSM.SINGLE_WORD, char: PSM.SINGLE_CHAR });
    expect([PSM.SINGLE_BLOCK, PSM.SINGLE_LINE, PSM.SINGLE_WORD, PSM.SINGLE_CHAR]).toEqual(['6', '7', '8', '10']);
  });

  it('returns words with 0..1 confidences and honours the allowed characters per call', async () => {
    const { page, box } = await renderCell({ value: 'Dock 14 Slip 27' });
    const crop = cropField(page, box, 6);
    const img = cleanCrop(crop.image, STANDARD, { inner: crop.inner, mode: 'line' });
    const free = await engine.read(img, { mode: 'line' });
    expect(free.text).toBe('Dock 14 Slip 27');
    expect(free.words.map((w) => w.text)).toEqual(['Dock', '14', 'Slip', '27']);
    for (const w of free.words) expect(w.confidence).toBeGreaterThan(0.5);
    expect(free.confidence).toBeLessThanOrEqual(1);
    // tessedit_char_whitelist: only digits and space may come back; the next call without it reads letters again.
    const digits = await engine.read(img, { mode: 'line', allowed: '0123456789 ' });
    expect(digits.text).toMatch(/^[0-9 ]+$/);
    expect((await engine.read(img, { mode: 'line' })).text).toBe('Dock 14 Slip 27');
  });
});

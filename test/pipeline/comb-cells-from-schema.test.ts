import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';
import type { LocatedField } from '../../src/locate/locate-fields.js';
import { readLocatedField } from '../../src/pipeline/read-field.js';
import { DigitReader } from '../../src/read/digit-reader.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { FieldSpec } from '../../src/schema/definition.js';
import { resolveField } from '../../src/schema/resolved-field.js';

// VA Form 21-0966 (2018), item 4: month, day and year combs on one bare baseline, written with MNIST test-split
// handwriting (source note: test/fixtures/real-forms/README.md; the digits' labels are the truth). `schema from-pdf`
// drafts them as number fields of class comb_field with `cells` 2, 2 and 4 (the widgets' maximum lengths).
const FIXTURE = path.resolve('test/fixtures/real-forms/va-21-0966-dob-handwritten.png');
const COMBS = [
  { name: 'dob_month', box: { x: 21, y: 17, w: 85, h: 43 }, cells: 2, value: 11 },
  { name: 'dob_day', box: { x: 154, y: 17, w: 85, h: 44 }, cells: 2, value: 23 },
  { name: 'dob_year', box: { x: 286, y: 18, w: 185, h: 43 }, cells: 4, value: 1956 },
];

let page: GrayImage;
let digitReader: DigitReader;
const ocr = new OcrEngine();
beforeAll(async () => {
  page = await grayFromImage(FIXTURE);
  digitReader = await DigitReader.open();
});
afterAll(async () => {
  await digitReader.close();
  await ocr.close();
});

async function read(c: (typeof COMBS)[number], cells: number | undefined) {
  const field = FieldSpec.parse({ name: c.name, type: 'number', class: 'comb_field', page: 0, region: [c.box.x, c.box.y, c.box.w, c.box.h], options: { integer: true }, ...(cells ? { cells } : {}) });
  const located: LocatedField = { field, parts: [{ key: c.name, box: c.box, source: 'region', detectionScore: null, expected: c.box, region: c.box, reasons: [] }] };
  const { type, options } = resolveField(field);
  return readLocatedField(located, type, options, { ocr, page, padding: 4, digitReader, typeContext: { today: new Date('2026-12-02') } });
}

describe("a schema field's cell count reaches the digit reader (a real form's number combs)", () => {
  it('reads each comb cell by cell with its `cells`, and judges print or handwriting on Tesseract\'s own read', async () => {
    for (const c of COMBS) {
      const out = await read(c, c.cells);
      expect(out.details.digitCells, c.name).toBeDefined();
      expect(out.interpretation?.value, c.name).toBe(c.value);
      // The word confidence that marks handwriting is Tesseract's, not the digit reader's probabilities (which are
      // high on handwriting and made a handwritten comb look printed).
      const digitWords = out.reading?.kind === 'text' ? out.reading.words.map((w) => w.confidence) : [];
      const digitMean = digitWords.reduce((a, b) => a + b, 0) / Math.max(1, digitWords.length);
      expect(out.scriptEntry, c.name).toBeDefined();
      expect(out.scriptEntry!.wordConfidence ?? -1).not.toBeCloseTo(digitMean, 6);
    }
  }, 120_000);

  it('without `cells` the digit reader finds no cells on the bare baseline and Tesseract reads alone', async () => {
    for (const c of COMBS) {
      const out = await read(c, undefined);
      expect(out.details.digitCells, c.name).toBeUndefined();
    }
  }, 120_000);
});

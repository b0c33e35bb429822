import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { getFieldType } from '../../src/fields/registry.js';
import { grayFromImage } from '../../src/image/raster.js';
import { readLocatedField, UNREAD_INK } from '../../src/pipeline/read-field.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { FieldSpec } from '../../src/schema/definition.js';

const ocr = new OcrEngine();
afterAll(() => ocr.close());

const BOX = { x: 20, y: 20, w: 600, h: 70 };

/** A boxed entry area holding `ink`: nothing, or pen strokes that are no letters OCR knows. */
async function area(ink: string) {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="640" height="110"><rect width="100%" height="100%" fill="white"/>
    <rect x="${BOX.x}" y="${BOX.y}" width="${BOX.w}" height="${BOX.h}" fill="none" stroke="black" stroke-width="2"/>${ink}</svg>`;
  return grayFromImage(await sharp(Buffer.from(svg)).png().toBuffer());
}

async function read(page: Awaited<ReturnType<typeof area>>) {
  const options = { formats: ['MM/DD/YYYY'] };
  const field = FieldSpec.parse({ name: 'arrival_date', type: 'date', class: 'text_entry', region: [20, 20, 600, 70], options });
  const type = getFieldType('date');
  const located = { field, parts: [{ key: field.name, box: BOX, source: 'region' as const, detectionScore: null, expected: BOX, region: BOX, reasons: [] }] };
  return readLocatedField(located, type, type.options.parse(options), { ocr, page, padding: 4, typeContext: { today: new Date(2025, 5, 15) } });
}

describe('blank or unread', () => {
  it('accepts an empty area as blank, but sends pen strokes OCR cannot read to review (real OCR and pixels)', async () => {
    const empty = await read(await area(''));
    expect(empty.interpretation?.outcome).toBe('empty');
    expect(empty.details.ink).toBeLessThanOrEqual(UNREAD_INK);
    // A zigzag across a date area: pen strokes a person would look at, no digit shapes for OCR (which reads
    // nothing here with the date's digit whitelist). It must not pass as a blank date.
    const strokes = await read(
      await area('<path d="M60 80 L 70 30 L 80 80 L 90 30 L 100 80 L 110 30 L 120 80 L 130 30 L 140 80" fill="none" stroke="black" stroke-width="3"/>'),
    );
    expect(strokes.reading?.kind === 'text' && strokes.reading.text).toBe('');
    expect(strokes.details.ink).toBeGreaterThan(UNREAD_INK);
    expect(strokes.interpretation).toMatchObject({ value: null, outcome: 'ambiguous', reasons: ['ambiguous_unread_writing'] });
  });
});

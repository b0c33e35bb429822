import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { iou } from '../../src/image/geometry.js';
import { filledRealForm } from '../page/fill-real-form.js';
import { extractWithShippedModel, schemaOnBlank } from './blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('a field whose detector class appears once in the schema, on the real W-4', () => {
  it('is read where its aligned region is, not at the best detection of its class elsewhere on the page', async () => {
    // One text field and the signature: each the only user of its class. On this page the shipped detector's best
    // text_entry box is the signature date (score 0.88) and its best signature_area box the employer's name cell.
    const loaded = await schemaOnBlank(`
  - { name: city_state_zip, type: text, class: text_entry, region: [261, 367, 1057, 65] }
  - { name: employee_signature, type: signature, class: signature_area, region: [279, 1810, 962, 72] }
`);
    const [result] = await extractWithShippedModel(loaded, [await filledRealForm()], 'w4-unique', ocr);
    const city = result.fields.find((f) => f.name === 'city_state_zip')!;
    // The page is the blank itself (no scan), so source pixels are reference pixels.
    expect(iou(city.box!, { x: 261, y: 367, w: 1057, h: 65 })).toBeGreaterThan(0.5);
    // Read from the right cell (OCR may take the small comma for a period: measured "Fernhollow. ME 04101").
    expect(city.value).toMatch(/^Fernhollow[.,] ME 04101$/);
    const signature = result.fields.find((f) => f.name === 'employee_signature')!;
    expect(iou(signature.box!, { x: 279, y: 1810, w: 962, h: 72 })).toBeGreaterThan(0.5);
  }, 120_000);
});

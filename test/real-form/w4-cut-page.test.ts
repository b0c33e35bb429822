import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { extractWithShippedModel, filledBlank, schemaOnBlank } from './blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('a page cut short on the real W-4 layout', () => {
  it('sends the fields past its edge to review and reads the rest: the document is not failed', async () => {
    // Regions from w4-page1.yaml: the address line near the top, the employer's cells at y 1934-2064. The scan stops
    // at y 1900 (the bottom of the sheet did not go through), so the employer's cells lie outside it. Invented values.
    const loaded = await schemaOnBlank(`
  - { name: address, type: text, class: text_entry, region: [261, 301, 1057, 64] }
  - { name: employer_name, type: text, class: text_entry, region: [261, 1934, 818, 130] }
  - { name: employer_ein, type: text, class: text_entry, region: [1301, 1934, 300, 130] }
`);
    const page = await filledBlank([
      { x: 285, y: 352, text: '418 Alder Bend Road', size: 36 },
      { x: 1320, y: 2040, text: '12-3456789', size: 28 },
    ]);
    const cut = await sharp(page).extract({ left: 0, top: 0, width: 1700, height: 1900 }).png().toBuffer();
    // Before, the crop of the first cell past the edge threw ("field box ... lies outside the 1700x1900 page") and
    // the document failed with no record.
    const [result] = await extractWithShippedModel(loaded, [cut], 'w4-cut', ocr);
    const byName = Object.fromEntries(result.fields.map((f) => [f.name, f]));
    expect(byName.address.value).toBe('418 Alder Bend Road');
    for (const name of ['employer_name', 'employer_ein']) {
      expect(byName[name].status, name).toBe('review');
      expect(byName[name].reasons, name).toContain('off_page');
      expect(byName[name].value, name).toBeNull();
    }
  }, 120_000);
});

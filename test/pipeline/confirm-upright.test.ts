import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { DD293_BLANK, extractWithShippedModel, filledBlank, schemaOnBlank } from '../real-form/blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('an upright page of a form printed in capitals', () => {
  it('stays upright when the schema has the blank: the half-turn is settled against it', async () => {
    // DD Form 293 page 1, upright, with an invented name and street typed in its cells. The text cue alone turns this
    // page over (measured: rotation 180, confidence 0.17 on the blank page).
    const loaded = await schemaOnBlank(
      `
  - { name: last_name, label: LAST, type: text, class: text_entry, region: [253, 538, 1397, 43] }
  - { name: street, label: STREET, type: text, class: text_entry, region: [52, 801, 1598, 39] }
`,
      DD293_BLANK,
    );
    const png = await filledBlank(
      [
        { x: 360, y: 572, text: 'Quillfeather', size: 28 },
        { x: 200, y: 832, text: '418 Alder Bend Road', size: 26 },
      ],
      '',
      DD293_BLANK,
    );
    const [result] = await extractWithShippedModel(loaded, [png], 'dd293-upright', ocr);
    expect(result.pages[0].rotation).toBe(0);
    expect(result.pages[0].alignment!.score).toBeGreaterThan(0.8);
    expect(result.fields.find((f) => f.name === 'last_name')!.value).toBe('Quillfeather');
    expect(result.fields.find((f) => f.name === 'street')!.value).toBe('418 Alder Bend Road');
  }, 180_000);
});

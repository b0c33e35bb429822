import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { DD293_BLANK, extractWithShippedModel, penOnBlank, schemaOnBlank } from './blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('handwriting in the tight ruled cells of DD Form 293', () => {
  it('keeps pen strokes as tall as the cell: only rules printed on the blank are removed', async () => {
    // Item 3's name rows (43 px between printed rules, the regions start right of the printed labels; hand-measured on the blank). Invented
    // names written large, so that the stems of l and t are as tall as the cell: in the handwriting-style Nanum Pen
    // and in upright DejaVu Sans. Before, the stems went as vertical rules: read "St, watevy" and "Sti water".
    const loaded = await schemaOnBlank(
      `
  - { name: last_name, label: LAST, type: text, class: text_entry, region: [330, 538, 1320, 43] }
  - { name: first_name, label: FIRST, type: text, class: text_entry, region: [330, 582, 1320, 44] }
`,
      DD293_BLANK,
    );
    const png = await penOnBlank(
      '<text x="380" y="578" font-family="Nanum Pen" font-size="66" fill="#15153a">Stillwater</text>' +
        '<text x="380" y="620" font-family="DejaVu Sans" font-size="46" fill="#15153a">Stillwater</text>',
      DD293_BLANK,
    );
    const [result] = await extractWithShippedModel(loaded, [png], 'dd293-pen', ocr);
    expect(result.fields.find((f) => f.name === 'last_name')!.value).toBe('Stillwater');
    expect(result.fields.find((f) => f.name === 'first_name')!.value).toBe('Stillwater');
  }, 180_000);
});

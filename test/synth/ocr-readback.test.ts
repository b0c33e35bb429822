import { createRequire } from 'node:module';
import path from 'node:path';
import { distance } from 'fastest-levenshtein';
import { createWorker, OEM, PSM } from 'tesseract.js';
import { afterAll, describe, expect, it } from 'vitest';
import { cropGray, grayToPng } from '../../src/image/raster.js';
import { demoLayout } from '../../src/synth/layouts.js';
import { renderPage } from '../../src/synth/render-page.js';

const require = createRequire(import.meta.url);
const langPath = path.join(path.dirname(require.resolve('@tesseract.js-data/eng/package.json')), '4.0.0_best_int');
const worker = await createWorker('eng', OEM.LSTM_ONLY, { langPath, cacheMethod: 'none', gzip: true });
// Crops carry no resolution; a fixed one stops tesseract guessing (and warning) per crop.
await worker.setParameters({ tessedit_pageseg_mode: PSM.SINGLE_LINE, user_defined_dpi: '300' });

afterAll(async () => {
  await worker.terminate();
});

describe('rendered typed text reads back with OCR', () => {
  it('tesseract.js reads typed fills of a clean clinic-intake page with a character error rate under 5 %', async () => {
    const layout = demoLayout('clinic-intake');
    const page = await renderPage({ layout, pageSeed: 31337, runSeed: 31337, index: 0, file: 'x.png', fill: 'typed', scan: { level: 'none', upsideDownRate: 0 } });
    const wanted = ['owner_last_name', 'owner_first_name', 'street', 'city', 'phone', 'email', 'pet_name', 'breed'];
    let edits = 0;
    let chars = 0;
    for (const f of page.truth.fields.filter((x) => wanted.includes(x.name) && x.text)) {
      const slot = layout.fields.find((l) => l.name === f.name)!.slots[0];
      const png = await grayToPng(cropGray(page.image, slot.writeBox));
      const { data } = await worker.recognize(png);
      const read = data.text.trim();
      // Character error rate = Levenshtein edits / reference length (common practice in OCR evaluation).
      edits += distance(read, f.text!);
      chars += f.text!.length;
    }
    expect(chars).toBeGreaterThan(40);
    expect(edits / chars).toBeLessThan(0.05);
  });
});

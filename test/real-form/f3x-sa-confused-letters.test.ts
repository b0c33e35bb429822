import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { textField } from '../../src/fields/text.js';
import { grayFromImage } from '../../src/image/raster.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { readTextField } from '../../src/read/read-text.js';
import { REPO_ROOT } from './w4-layout.js';

const engine = new OcrEngine();
afterAll(() => engine.close());

/** Where the strip was cut on its 1700 x 2200 page (fixture README). */
const ORIGIN = { x: 110, y: 320 };

describe('typed words with letters OCR confuses (FEC Form 3X Schedule A, typed fill)', () => {
  it('reads the word meant where a clipped descender or a merged "rn" made a non-word', async () => {
    // A strip of a real filled page (test/fixtures/real-forms/README.md): the viewer drew the large committee name
    // with the tails of its g cut off at the field's lower edge, and the small name line with "rn" touching. Read
    // as they stand, tesseract gave "side aate" and "moming" (bench/real-forms.ts --half dev, before word repair).
    const page = await grayFromImage(path.join(REPO_ROOT, 'test/fixtures/real-forms/fec-f3x-sa-names-typed.png'));
    const fields = [
      { name: 'committee_name', box: [130.9, 336, 975, 76.3], truth: 'Please use the side gate.' },
      { name: 'contributor_name_1', box: [138.8, 437.9, 962.2, 41.7], truth: 'Prefers morning appointments.' },
    ];
    for (const f of fields) {
      const [x, y, w, h] = f.box;
      const read = await readTextField(page, { x: x - ORIGIN.x, y: y - ORIGIN.y, w, h }, { engine, padding: 4, mode: 'line' });
      const got = textField.interpret(read.reading, textField.options.parse({}), { today: new Date('2026-12-02') });
      // The truth is what the filler typed (the values are invented); a person reading the crop reads it too.
      expect(got.value, f.name).toBe(f.truth);
      expect(got.reasons, f.name).toContain('repaired_words');
    }
  }, 60_000);
});

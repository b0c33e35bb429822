import { afterAll, describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { draftedAreas } from '../../src/draft/drafted-field.js';
import { draftSchema } from '../../src/draft/from-image.js';
import { unsureFields } from '../../src/draft/unsure.js';
import { iou } from '../../src/image/geometry.js';
import { grayFromImage } from '../../src/image/raster.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { fieldRegions } from '../../src/schema/resolved-field.js';
import { loadSchema } from '../../src/schema/load.js';
import { W4_BLANK, W4_SCHEMA } from '../real-form/w4-layout.js';

const ocr = new OcrEngine();
afterAll(() => ocr.close());

// Words printed in the labels of IRS Form W-4 (2025) page 1 (read on the form itself, the outside source): a drafted
// name word that is one of these with its first one or two letters cut off ("laim" for "claim") was cut by a
// checkbox detection on a capital letter.
const PRINTED = [
  'first', 'name', 'middle', 'initial', 'last', 'social', 'security', 'number', 'address', 'city', 'town', 'state', 'code',
  'single', 'married', 'filing', 'separately', 'jointly', 'qualifying', 'surviving', 'spouse', 'head', 'household',
  'claim', 'claims', 'dependent', 'dependents', 'credits', 'credit', 'other', 'income', 'deductions', 'extra', 'withholding',
  'works', 'jobs', 'multiple', 'employee', 'employer', 'employers', 'signature', 'date', 'employment', 'identification',
  'step', 'only', 'total', 'amount', 'children', 'adjustments', 'sign', 'here', 'under', 'check', 'box', 'this',
];

function cutWord(word: string): string | null {
  return PRINTED.find((p) => p !== word && p.endsWith(word) && p.length - word.length <= 2 && !PRINTED.includes(word)) ?? null;
}

describe('schema draft on a real blank with the shipped detector and OCR (IRS W-4 2025 page 1)', () => {
  it('drafts names that keep every letter of the printed label, and lists what it is unsure of', async () => {
    const page = await grayFromImage(W4_BLANK);
    const detector = await loadDetector(DEFAULT_MODEL_PATH);
    const dets = await detector.detect(page);
    await detector.close();
    const draft = await draftSchema([page], [dets], async (c) => (await ocr.read(c, { mode: 'line' })).text, { formName: 'w4', referenceImages: [undefined] });
    const cut = draft.fields.flatMap((f) => f.name.split('_').filter((w) => /^[a-z]{3,}$/.test(w) && cutWord(w)).map((w) => `${f.name}: ${w} (${cutWord(w)})`));
    expect(cut).toEqual([]);

    // The cells of Step 1 carry their label in the top-left corner; the drafted field over each is named from it.
    const truth = await loadSchema(W4_SCHEMA);
    const expected: Record<string, string> = {
      first_name: 'first_name_and_middle_initial',
      last_name: 'last_name',
      address: 'address',
      city_state_zip: 'city_or_town_state_and_zip_code',
    };
    const areas = draftedAreas(draft.fields);
    for (const [truthName, slug] of Object.entries(expected)) {
      const [x, y, w, h] = fieldRegions(truth.fields.find((f) => f.spec.name === truthName)!)[0].region;
      const hit = areas.find((a) => iou(a.box, { x, y, w, h }) >= 0.5);
      expect(hit, truthName).toBeDefined();
      expect(hit!.field.name).toBe(slug);
    }

    // Every drafted checkbox stands on a printed square: none was drafted on a letter.
    expect(draft.dropped.checkboxWithoutMark).toBeGreaterThan(0);
    // Fields without a label are listed for the user, with the reason.
    const unsure = unsureFields(draft.fields);
    for (const f of draft.fields.filter((x) => x.label === null)) {
      expect(unsure.find((u) => u.field === f)?.reasons).toContain('no_label');
    }
  });
});

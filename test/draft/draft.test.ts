import { afterAll, describe, expect, it } from 'vitest';
import type { Detection } from '../../src/detect/types.js';
import { expectedParts } from '../../src/locate/expected-boxes.js';
import type { Box } from '../../src/image/geometry.js';
import { iou } from '../../src/image/geometry.js';
import { grayFromImage } from '../../src/image/raster.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { suppressAcrossClasses } from '../../src/draft/entry-areas.js';
import { cleanLabel, slugName } from '../../src/draft/field-name.js';
import { draftSchema } from '../../src/draft/from-image.js';
import { guessType } from '../../src/draft/type-guess.js';
import { FormSchema } from '../../src/schema/definition.js';
import { loadSchema } from '../../src/schema/load.js';
import { W4_BLANK } from '../real-form/w4-layout.js';

const CLASSES = ['text_entry', 'checkbox', 'signature_area', 'comb_field'];
const ocr = new OcrEngine();
afterAll(() => ocr.close());
const readLabel = async (crop: Parameters<OcrEngine['read']>[0]) => (await ocr.read(crop, { mode: 'line' })).text;

function det(box: Box, className: string): Detection {
  return { box, className, classId: CLASSES.indexOf(className), score: 0.9 };
}

const norm = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, ' ').trim();

describe('draftSchema on the real blank form (areas measured on the form image)', () => {
  // Cells of IRS Form W-4 (2025) page 1 at 200 dpi, measured by eye on the blank; expected labels are the words
  // printed on that form (the outside source for this check).
  const areas: Array<[Box, string, string, string]> = [
    [{ x: 262, y: 233, w: 497, h: 66 }, 'text_entry', 'First name and middle initial', 'text'],
    [{ x: 762, y: 233, w: 557, h: 66 }, 'text_entry', 'Last name', 'text'],
    [{ x: 1322, y: 233, w: 277, h: 66 }, 'text_entry', 'Social security number', 'number'],
    [{ x: 262, y: 301, w: 1057, h: 65 }, 'text_entry', 'Address', 'text'],
    [{ x: 262, y: 368, w: 1057, h: 64 }, 'text_entry', 'City or town, state, and ZIP code', 'postal_code'],
    [{ x: 319, y: 438, w: 24, h: 24 }, 'checkbox', 'Single or Married filing separately', 'checkbox'],
    [{ x: 319, y: 471, w: 24, h: 24 }, 'checkbox', 'Married filing jointly or Qualifying surviving spouse', 'checkbox'],
    [{ x: 279, y: 1815, w: 962, h: 67 }, 'signature_area', "Employee's signature", 'signature'],
    [{ x: 1279, y: 1830, w: 322, h: 52 }, 'text_entry', 'Date', 'date'],
    [{ x: 262, y: 1935, w: 817, h: 128 }, 'text_entry', "Employer's name and address", 'text'],
    [{ x: 1082, y: 1935, w: 217, h: 128 }, 'text_entry', 'First date of', 'date'],
  ];

  it('reads the printed label of each cell and drafts a valid schema', async () => {
    const page = await grayFromImage(W4_BLANK);
    const draft = await draftSchema([page], [areas.map(([b, c]) => det(b, c))], readLabel, { formName: 'w4-draft', referenceImages: ['w4.png'] });
    expect(() => FormSchema.parse(draft.source)).not.toThrow();
    // Drafted regions are the given areas snapped onto the printed rules: find each by overlap.
    const fieldAt = (b: Box) => draft.fields.find((f) => iou({ x: f.region[0], y: f.region[1], w: f.region[2], h: f.region[3] }, b) >= 0.8)!;
    let labelsRight = 0;
    for (const [b, , label] of areas) {
      const f = fieldAt(b);
      if (f.label && norm(f.label).startsWith(norm(label))) labelsRight++;
    }
    // Every label printed on the form is read; OCR may drop an apostrophe, which norm() ignores.
    expect(labelsRight).toBe(areas.length);
    const names = draft.fields.map((f) => f.name);
    expect(new Set(names).size).toBe(names.length);
    expect(names).toContain('first_name_and_middle_initial');
    // Types that the label's words decide (date, signature, checkbox); the others stay text for a person to choose.
    for (const [b, , , type] of areas.filter(([, , , t]) => ['date', 'signature', 'checkbox'].includes(t))) {
      expect(fieldAt(b).type).toBe(type);
    }
  }, 60_000);
});

describe('draftSchema on a demo blank with its areas given', () => {
  it('recovers the printed labels and the field types of the demo schema', async () => {
    // The demo schema (written with the form's layout) is the answer key: its labels are what the form prints.
    const loaded = await loadSchema('schemas/clinic-intake.yaml');
    const page = await grayFromImage('schemas/clinic-intake.blank.png');
    const dets = expectedParts(loaded.fields).flatMap((p) => (p.region ? [det(p.region, p.className)] : []));
    const draft = await draftSchema([page], [dets], readLabel, { formName: 'clinic-draft', referenceImages: ['clinic-intake.blank.png'] });
    let labels = 0;
    let types = 0;
    for (const f of loaded.schema.fields) {
      const [x, y, w, h] = f.region!;
      const d = draft.fields.find((g) => iou({ x: g.region[0], y: g.region[1], w: g.region[2], h: g.region[3] }, { x, y, w, h }) >= 0.8);
      if (d && d.label && norm(d.label) === norm(f.label ?? '')) labels++;
      if (d && d.type === f.type) types++;
    }
    // Measured: every label, and every type but those a label cannot tell (a number of weeks written as text, a
    // state list, a date without the word "date").
    expect(labels / loaded.schema.fields.length).toBeGreaterThanOrEqual(0.9);
    expect(types / loaded.schema.fields.length).toBeGreaterThanOrEqual(0.8);
  }, 60_000);
});

describe('naming and typing helpers', () => {
  it('slugs labels into schema names', () => {
    expect(slugName("Pet's name *")).toBe('pet_name');
    expect(slugName('Café owner (état)')).toBe('cafe_owner_etat');
    expect(slugName('2nd phone')).toBe('field_2nd_phone');
    expect(slugName('Allergies, medication, behaviour notes and anything else')).toBe('allergies_medication_behaviour_notes_and');
    expect(slugName('***')).toBe('');
    for (const l of ['Last name', 'E-mail', 'ZIP code']) expect(slugName(l)).toMatch(/^[a-z][a-z0-9_]*$/);
  });

  it('cleans required marks and colons', () => {
    expect(cleanLabel('Phone * ')).toBe('Phone');
    expect(cleanLabel('Species:')).toBe('Species');
    expect(cleanLabel('| Last  name _')).toBe('Last name');
  });

  it('guesses types from words and shapes (common practice of form wording)', () => {
    const line = { x: 0, y: 0, w: 400, h: 50 };
    expect(guessType('E-mail', 'text_entry', line, 16).type).toBe('email');
    expect(guessType('Date of birth', 'text_entry', line, 16).type).toBe('date');
    expect(guessType('Mobile phone', 'text_entry', line, 16).type).toBe('phone');
    expect(guessType('Postal code (Canada)', 'text_entry', line, 16).options).toEqual({ country: 'CA' });
    expect(guessType('Weight (kg)', 'text_entry', line, 16).options).toEqual({ decimalSeparator: '.', unit: 'kg' });
    expect(guessType('Notes', 'text_entry', { x: 0, y: 0, w: 900, h: 200 }, 16).ocr).toEqual({ mode: 'block' });
    expect(guessType('anything', 'checkbox', line, 16).type).toBe('checkbox');
  });
});

describe('suppressAcrossClasses', () => {
  it('keeps the higher-scored of two classes on one spot and leaves separate areas alone', () => {
    const entry = { ...det({ x: 100, y: 100, w: 400, h: 60 }, 'text_entry'), score: 0.8 };
    const boxInside = { ...det({ x: 120, y: 110, w: 40, h: 40 }, 'checkbox'), score: 0.4 };
    const comb = { ...det({ x: 105, y: 102, w: 390, h: 56 }, 'comb_field'), score: 0.5 };
    const apart = { ...det({ x: 600, y: 100, w: 40, h: 40 }, 'checkbox'), score: 0.35 };
    const kept = suppressAcrossClasses([boxInside, comb, entry, apart]);
    expect(kept.map((d) => d.className)).toEqual(['text_entry', 'checkbox']);
    expect(kept[1].box.x).toBe(600);
  });
});

import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { readStripFields, type Strip, type StripField } from './strip-fields.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

// Real-form pixels (source notes: test/fixtures/real-forms/README.md): invented values typed through the forms' own
// fields onto the rule each form prints under its field. Regions are the ones `schema from-pdf` drafted from the
// widgets; boxes where extract read them on these pages.
const CASES: { title: string; strip: Strip; field: StripField; value: unknown }[] = [
  {
    // The rule is a row of underscores in the form's own text: the scan shows it broken at every character, too short
    // for the run test on the page's ink; the y hanging on it joined "ry" to the rule, and all three were dropped as
    // one fragment touching the crop's edge ("Port Alde").
    title: 'keeps the letters joined to a rule of typed underscores (DOL Form WH-384)',
    strip: { page: 'dol-wh384-relation-typed.png', blank: 'dol-wh384-relation-blank.png', origin: { x: 740, y: 1300 } },
    field: { name: 'txt_relation', type: 'text', class: 'text_entry', region: [766, 1331, 760, 47], box: [758.2, 1322.7, 755.2, 49.6] },
    value: 'Port Aldery',
  },
  {
    // The field's rule carries short upright ticks, shorter than any rule the page's ink is searched for: the g's tail
    // touching one was cut away with it ("Fox love").
    title: 'keeps a descender that touches a printed tick of the rule (FEC Form 3X)',
    strip: { page: 'fec-f3x-street-typed.png', blank: 'fec-f3x-street-blank.png', origin: { x: 450, y: 530 } },
    field: { name: 'street_1', type: 'text', class: 'text_entry', region: [472, 558, 1114, 33], box: [465.1, 549.2, 1115.6, 39] },
    value: '396 Foxglove Court',
  },
  {
    // The point lies on the rule's print, as the remnants of a rule do, and stands above the rule's own rows. Taking
    // every run along the rule's band for the rule (a version of this change) cut it loose with the digits' feet and
    // dropped it: "97043.57" read "0704".
    title: 'keeps the decimal point of an amount sitting on its rule (Official Form B 122A-1)',
    strip: { page: 'uscourts-b122a1-wages-typed.png', blank: 'uscourts-b122a1-wages-blank.png', origin: { x: 1250, y: 1410 } },
    field: { name: 'wages_2', type: 'number', class: 'text_entry', region: [1287, 1419, 139, 39], box: [1285, 1430, 140.3, 40.9] },
    value: 97043.57,
  },
];

describe('typed values on a printed rule (real forms, typed fill)', () => {
  for (const c of CASES) {
    it(c.title, async () => {
      const got = await readStripFields(c.strip, [c.field], ocr);
      expect(got[c.field.name].value).toBe(c.value);
    }, 60_000);
  }
});

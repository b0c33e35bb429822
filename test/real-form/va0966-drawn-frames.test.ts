import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { readStripFields } from './strip-fields.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('fields boxed by a frame the blank lacks (VA Form 21-0966, typed fill)', () => {
  it('reads the values inside the frame, leaves empty framed combs empty, and finds no writing past the edge', async () => {
    // Rows of VA Form 21-0966 (2018) filled through its own PDF fields and scanned lightly (fixture README): the PDF
    // viewer drew a border, and comb dividers, around every filled field; the blank has none of them. Regions are the
    // ones `schema from-pdf` drafted from the widgets; boxes where extract read them.
    const got = await readStripFields(
      {
        page: 'va-21-0966-rows-typed.png',
        blank: 'va-21-0966-rows-blank.png',
        origin: { x: 70, y: 612 },
      },
      [
        { name: 'veterans_first_name', type: 'text', region: [100, 633, 567, 42], box: [88.8, 631.6, 570.4, 42.4], options: { maxLength: 12 } },
        { name: 'veterans_middle_initial', type: 'text', region: [683, 632, 51, 43], box: [675.3, 630.6, 51.3, 43.3], options: { maxLength: 1 } },
        { name: 'veterans_last_name', type: 'text', region: [750, 632, 853, 43], box: [742.7, 630.3, 858.2, 43.5], options: { maxLength: 18 } },
        { name: 'veterans_ssn_last_four', type: 'text', region: [433, 716, 184, 43], box: [423.8, 715.1, 185.1, 43.3], options: { maxLength: 4 } },
        { name: 'street', type: 'text', region: [166, 800, 1434, 42], box: [155.2, 799.3, 1442.7, 42.6], options: { maxLength: 30 } },
        { name: 'state', type: 'choice_text', region: [266, 900, 84, 42], box: [255.9, 900.3, 84.5, 42.3], options: { choices: ['MO', 'MT', 'NE', 'OH'] } },
        { name: 'country', type: 'text', region: [500, 900, 84, 42], box: [491.3, 900.2, 84.5, 42.3], options: { maxLength: 2 } },
      ],
      ocr,
    );
    // The values the filler typed (invented; the bench's truth file for this page).
    expect(got.veterans_first_name.value).toBe('Dario');
    expect(got.veterans_middle_initial.value).toBe('D'); // read "0" with the frame kept
    expect(got.veterans_last_name.value).toBe('Coldwater');
    expect(got.veterans_ssn_last_four.value).toBeNull(); // the empty framed comb read "CITT"
    expect(got.street.value).toBe('864 Saltmarsh Road');
    expect(got.state.value).toBe('MO'); // unread with the frame kept
    expect(String(got.country.value).toUpperCase()).toBe('US');
    // Every value ends well inside its frame: none runs on past the edge.
    for (const [name, r] of Object.entries(got)) expect(r.reasons, name).not.toContain('writing_past_edge');
  }, 120_000);
});

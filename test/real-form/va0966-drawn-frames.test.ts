import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { closeSharedOcrEngine } from '../../src/api.js';
import { getFieldType } from '../../src/fields/registry.js';
import { invertAffine, transformBox, type Box } from '../../src/image/geometry.js';
import { grayFromImage } from '../../src/image/raster.js';
import type { LocatedField } from '../../src/locate/locate-fields.js';
import { readLocatedField } from '../../src/pipeline/read-field.js';
import { FieldSpec } from '../../src/schema/definition.js';
import { REPO_ROOT } from './w4-layout.js';

afterAll(async () => {
  await closeSharedOcrEngine();
});

/**
 * Rows of VA Form 21-0966 (2018) filled through its own PDF fields and scanned lightly (see the fixture README): the
 * PDF viewer drew a border, and comb dividers, around every filled field; the blank has none of them. Regions are the
 * ones `schema from-pdf` drafted from the widgets (reference pixels of the 200 dpi blank); both strips are cut at
 * (70, 612) of their pages.
 */
const FIXTURES = path.join(REPO_ROOT, 'test/fixtures/real-forms');
const ORIGIN = { x: 70, y: 612 };
/** The page-to-blank map the image registration found for this page (its record's alignment.transform). */
const PAGE_TO_BLANK = { a: 0.994003, b: -0.000358, c: 11.988, d: 0.000261, e: 0.994063, f: 4.989 };

const FIELDS = [
  { name: 'veterans_first_name', type: 'text', region: [100, 633, 567, 42], options: { maxLength: 12 } },
  { name: 'veterans_middle_initial', type: 'text', region: [683, 632, 51, 43], options: { maxLength: 1 } },
  { name: 'veterans_last_name', type: 'text', region: [750, 632, 853, 43], options: { maxLength: 18 } },
  { name: 'veterans_ssn_last_four', type: 'text', region: [433, 716, 184, 43], options: { maxLength: 4 } },
  { name: 'street', type: 'text', region: [166, 800, 1434, 42], options: { maxLength: 30 } },
  { name: 'state', type: 'choice_text', region: [266, 900, 84, 42], options: { choices: ['MO', 'MT', 'NE', 'OH'] } },
  { name: 'country', type: 'text', region: [500, 900, 84, 42], options: { maxLength: 2 } },
] as const;

const shift = (b: Box): Box => ({ x: b.x - ORIGIN.x, y: b.y - ORIGIN.y, w: b.w, h: b.h });

describe('fields boxed by a frame the blank lacks (VA Form 21-0966, typed fill)', () => {
  it('reads the values inside the frame, leaves empty framed combs empty, and finds no writing past the edge', async () => {
    const page = await grayFromImage(path.join(FIXTURES, 'va-21-0966-typed-rows.png'));
    const reference = await grayFromImage(path.join(FIXTURES, 'va-21-0966-blank-rows.png'));
    const refToPage = invertAffine(PAGE_TO_BLANK);
    const got: Record<string, { value: unknown; reasons: string[] }> = {};
    for (const f of FIELDS) {
      const field = FieldSpec.parse({ name: f.name, type: f.type, class: 'comb_field', page: 0, region: f.region, options: f.options });
      const [x, y, w, h] = f.region;
      const region = { x, y, w, h };
      const onPage = shift(transformBox(refToPage, region));
      const located: LocatedField = {
        field,
        parts: [{ key: f.name, box: onPage, source: 'region', detectionScore: null, expected: onPage, region: shift(region), reasons: [] }],
      };
      const type = getFieldType(f.type);
      const out = await readLocatedField(located, type, type.options.parse(f.options), {
        page,
        reference,
        padding: 4,
        typeContext: { today: new Date('2026-12-02') },
      });
      got[f.name] = { value: out.interpretation?.value ?? null, reasons: out.interpretation?.reasons ?? [] };
    }
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

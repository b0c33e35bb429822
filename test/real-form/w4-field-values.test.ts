import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { extractWithShippedModel, filledBlank, schemaOnBlank } from './blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

async function extractW4(fieldsYaml: string, entries: Parameters<typeof filledBlank>[0], id: string) {
  const [result] = await extractWithShippedModel(await schemaOnBlank(fieldsYaml), [await filledBlank(entries)], id, ocr);
  return result;
}

describe('identifier shape on the real W-4 layout', () => {
  it('writes an SSN and an EIN in one shape whether the writer put separators in or not', async () => {
    // The W-4's own SSN and EIN cells (regions from w4-page1.yaml); two shapes of the same kind of number, invented.
    // Shapes: SSN AAA-GG-SSSS and EIN XX-XXXXXXX (US Social Security Administration and IRS publications, from memory).
    const result = await extractW4(
      `
  - { name: ssn, type: text, class: text_entry, region: [1321, 235, 280, 63], options: { shape: "###-##-####" } }
  - { name: employer_ein, type: text, class: text_entry, region: [1301, 1934, 300, 130], options: { shape: "##-#######" } }
`,
      [
        { x: 1335, y: 290, text: '793004113', family: 'DejaVu Sans Mono', size: 28 },
        { x: 1320, y: 2040, text: '12 - 3456789', family: 'DejaVu Sans Mono', size: 28 },
      ],
      'w4-ids',
    );
    const ssn = result.fields.find((f) => f.name === 'ssn')!;
    expect(ssn.value).toBe('793-00-4113');
    expect(ssn.status).toBe('accepted');
    const ein = result.fields.find((f) => f.name === 'employer_ein')!;
    expect(ein.value).toBe('12-3456789');
    // The shape is met (not invalid); whether it is accepted is the shipped confidence map's call: this EIN's
    // detection is weak (0.53), and the printed-text map (src/fields/default-confidence.json) sends it to review.
    expect(ein.status).not.toBe('invalid');
    expect(ein.reasons.filter((r) => r !== 'below_review_threshold')).toEqual([]);
  }, 120_000);
});

describe('values that fail their checks on the real W-4 layout', () => {
  it('keeps what was read: an unassigned phone number goes to review with its number, a short one stays as read', async () => {
    // Two phone fields over the W-4's address and city cells (regions hand-measured in w4-page1.yaml); invented values.
    const result = await extractW4(
      `
  - { name: daytime_phone, type: phone, class: text_entry, region: [261, 301, 1057, 64] }
  - { name: evening_phone, type: phone, class: text_entry, region: [261, 367, 1057, 65] }
`,
      [
        // Ten digits, but 555 is no area code (NANP plan, from memory; libphonenumber: possible, not valid).
        { x: 285, y: 352, text: '(555) 555-0142' },
        // Six digits: not a phone number anywhere.
        { x: 285, y: 420, text: '555-01' },
      ],
      'w4-phones',
    );
    const day = result.fields.find((f) => f.name === 'daytime_phone')!;
    expect(day.status).toBe('review');
    expect(day.value).toBe('+15555550142');
    expect(day.raw).toMatch(/555.*555-0142/);
    expect(day.reasons).toContain('phone_not_assigned');
    const evening = result.fields.find((f) => f.name === 'evening_phone')!;
    expect(evening.status).toBe('invalid');
    expect(evening.reasons).toContain('invalid_phone');
    expect(evening.value).toBe('555-01');
    expect(evening.raw).toMatch(/555-01/);
  }, 120_000);
});

describe('writing that runs past the region edge on the real W-4', () => {
  it('sends a value cut off at the edge to review, and leaves a value that ends inside alone', async () => {
    // The city cell (region from w4-page1.yaml) ends at x = 1318; the line typed into it runs on into the printed
    // note beside it. The address line ends well inside its cell. Invented values.
    const result = await extractW4(
      `
  - { name: address, type: text, class: text_entry, region: [261, 301, 1057, 64] }
  - { name: city_state_zip, type: text, class: text_entry, region: [261, 367, 1057, 65] }
`,
      [
        { x: 285, y: 352, text: '418 Alder Bend Road', size: 36 },
        { x: 285, y: 422, text: 'Cedar Bend Junction Heights Township, ME 04101-2270', size: 42 },
      ],
      'w4-edge',
    );
    const city = result.fields.find((f) => f.name === 'city_state_zip')!;
    expect(city.status).toBe('review');
    expect(city.reasons).toContain('writing_past_edge');
    expect(city.value).not.toBeNull();
    const address = result.fields.find((f) => f.name === 'address')!;
    expect(address.reasons).not.toContain('writing_past_edge');
    expect(address.value).toBe('418 Alder Bend Road');
  }, 120_000);
});

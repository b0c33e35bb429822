import { afterAll, describe, expect, it } from 'vitest';
import { closeSharedOcrEngine, extractDocument, loadDetector } from '../../src/api.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { w4FilledWith, w4SchemaWith } from './w4-variant.js';

afterAll(async () => {
  await closeSharedOcrEngine();
});

describe('values that fail their checks on the real W-4 layout', () => {
  it('keeps what was read: an unassigned phone number goes to review with its number, a short one stays as read', async () => {
    // Two phone fields over the W-4's address and city cells (regions hand-measured in w4-page1.yaml); invented values.
    const loaded = await w4SchemaWith(`
  - { name: daytime_phone, type: phone, class: text_entry, region: [261, 301, 1057, 64] }
  - { name: evening_phone, type: phone, class: text_entry, region: [261, 367, 1057, 65] }
`);
    const png = await w4FilledWith([
      // Ten digits, but 555 is no area code (NANP plan, from memory; libphonenumber: possible, not valid).
      { x: 285, y: 352, text: '(555) 555-0142' },
      // Six digits: not a phone number anywhere.
      { x: 285, y: 420, text: '555-01' },
    ]);
    const detector = await loadDetector(DEFAULT_MODEL_PATH, { intraOpThreads: 1 });
    try {
      const { result } = await extractDocument(png, { schema: loaded, detector, documentId: 'w4-phones' });
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
    } finally {
      await detector.close();
    }
  }, 120_000);
});

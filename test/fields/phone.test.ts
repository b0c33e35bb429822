import { describe, expect, it } from 'vitest';
import { getExampleNumber, type CountryCode } from 'libphonenumber-js/max';
import examples from 'libphonenumber-js/examples.mobile.json' with { type: 'json' };
import { correctAs, readAs } from './context.js';

describe('phone: E.164 and national format', () => {
  it('normalizes NANP fictional numbers 555-0100..0199 to E.164', () => {
    // NANPA reserves 555-0100 through 555-0199 for fictional use (NANPA, "555 NXX" assignment notes, from memory).
    // E.164 (ITU-T E.164 §6): "+" country code 1, then the ten-digit national number.
    for (const line of [100, 142, 199]) {
      const written = `(207) 555-0${line}`;
      const r = readAs('phone', written);
      expect(r.outcome, written).toBe('valid');
      expect(r.value).toBe(`+1207555${String(line).padStart(4, '0')}`);
      expect(r.extra?.national).toBe(written);
    }
  });

  it('accepts the usual ways of writing one number', () => {
    for (const written of ['207-555-0142', '207.555.0142', '2075550142', '+1 207 555 0142', '1 (207) 555-0142']) {
      expect(readAs('phone', written).value, written).toBe('+12075550142');
    }
  });

  it("reads libphonenumber-js's own example numbers for several regions", () => {
    // Reference: libphonenumber-js examples (examples.mobile.json), formatted nationally by the library itself.
    for (const region of ['US', 'CA', 'GB', 'DE', 'FR', 'AU'] as CountryCode[]) {
      const ex = getExampleNumber(region, examples)!;
      const r = readAs('phone', ex.formatNational(), { defaultRegion: region });
      expect(r.outcome, region).toBe('valid');
      expect(r.value).toBe(ex.number);
      // Written internationally, the default region does not matter.
      expect(readAs('phone', ex.formatInternational(), { defaultRegion: 'US' }).value).toBe(ex.number);
    }
  });

  it('marks too-short and impossible numbers invalid_phone', () => {
    // A NANP number has ten digits (3-digit area code, 7-digit number); area codes never start with 0 or 1
    // (NANP numbering plan, from memory).
    for (const written of ['555-0142', '207-555-014', '12345']) {
      const r = readAs('phone', written);
      expect(r.outcome, written).toBe('invalid');
      expect(r.reasons).toEqual(['invalid_phone']);
    }
  });

  it('sends a possible but unassigned number to review with the number kept', () => {
    // Ten digits (possible), but area codes 107 and 555 are not assigned: NANP area codes never start with 0 or 1,
    // and 555 is not an area code (NANP numbering plan, from memory); libphonenumber's isPossible/isValid split is
    // the reference (libphonenumber-js README).
    for (const [written, e164] of [['(107) 555-0142', '+11075550142'], ['(555) 555-0142', '+15555550142']]) {
      const r = readAs('phone', written);
      expect(r.outcome, written).toBe('ambiguous');
      expect(r.value).toBe(e164);
      expect(r.reasons).toEqual(['phone_not_assigned']);
      // Typed by a reviewer, it is taken as typed, the reason kept.
      expect(correctAs('phone', written)).toMatchObject({ outcome: 'valid', value: e164, reasons: ['phone_not_assigned'] });
    }
  });

  it('repairs look-alike letters in an otherwise numeric text, and only there', () => {
    const r = readAs('phone', '2O7-555-0l42');
    expect(r.value).toBe('+12075550142');
    expect(r.reasons).toContain('repaired_digits');
    expect(r.confidence).toBeLessThan(1);
    // A reviewer's typed letters are not OCR confusions.
    expect(correctAs('phone', '2O7-555-0l42').outcome).toBe('invalid');
    expect(correctAs('phone', '207 555 0142').value).toBe('+12075550142');
  });

  it('rejects an unknown default region at schema load', async () => {
    const { getFieldType } = await import('../../src/fields/registry.js');
    expect(getFieldType('phone').options.safeParse({ defaultRegion: 'XX' }).success).toBe(false);
  });
});

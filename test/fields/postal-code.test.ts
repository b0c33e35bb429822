import { describe, expect, it } from 'vitest';
import { correctAs, readAs } from './context.js';

describe('postal_code: United States', () => {
  it('accepts ZIP and ZIP+4 and normalizes the hyphen', () => {
    // USPS Publication 28: a ZIP Code is 5 digits; ZIP+4 appends a hyphen and 4 digits (from memory). 04101 is
    // Portland, Maine; 20500 and 90210 are widely published ZIP Codes (from memory).
    expect(readAs('postal_code', '04101').value).toBe('04101');
    expect(readAs('postal_code', '20500-0003').value).toBe('20500-0003');
    expect(readAs('postal_code', '041011234').value).toBe('04101-1234');
    expect(readAs('postal_code', '90210 1234').value).toBe('90210-1234');
  });

  it('rejects other lengths', () => {
    for (const t of ['0410', '041012', '04101-123', 'ABCDE']) {
      expect(readAs('postal_code', t).reasons, t).toEqual(['invalid_postal_code']);
    }
  });

  it('repairs O→0 in a ZIP read by OCR', () => {
    const r = readAs('postal_code', 'O41O1');
    expect(r.value).toBe('04101');
    expect(r.reasons).toContain('repaired_digits');
  });
});

describe('postal_code: Canada', () => {
  it('normalizes to "A1A 1A1"', () => {
    // Canada Post: "K1A 0B1" is the published postal code of Canada Post's Ottawa head office, used in its
    // addressing guidelines (from memory); H0H 0H0 is its well-known Santa Claus code.
    expect(readAs('postal_code', 'k1a0b1', { country: 'CA' }).value).toBe('K1A 0B1');
    expect(readAs('postal_code', 'H0H 0H0', { country: 'CA' }).value).toBe('H0H 0H0');
  });

  it('rejects letters Canada Post never uses (D F I O Q U; W and Z not first)', () => {
    // Canada Post Addressing Guidelines (from memory).
    for (const t of ['D1A 0B1', 'K1A 0U1', 'W1A 0B1', 'Z1A 0B1', 'K1A0B', '11A 0B1'.replace('11', '1')]) {
      expect(readAs('postal_code', t, { country: 'CA' }).outcome, t).toBe('invalid');
    }
  });

  it('repairs letter and digit slots separately', () => {
    // "K1A OB1": the O sits in a digit slot (→ 0); "8" in a letter slot would be B.
    expect(readAs('postal_code', 'KlA OB1', { country: 'CA' }).value).toBe('K1A 0B1');
    expect(readAs('postal_code', 'K1A 081', { country: 'CA' }).value).toBe('K1A 0B1');
    expect(correctAs('postal_code', 'K1A OB1', { country: 'CA' }).outcome).toBe('invalid');
  });
});

describe('postal_code: United Kingdom', () => {
  it('accepts the six outward-code shapes and normalizes the space', () => {
    // Royal Mail formats A9 9AA, A99 9AA, AA9 9AA, AA99 9AA, A9A 9AA, AA9A 9AA, with Royal Mail's own examples
    // M1 1AA, M60 1NW, CR2 6XH, DN55 1PT, W1A 1HQ, EC1A 1BB (Royal Mail / Wikipedia "Postcodes in the United Kingdom",
    // from memory); SW1A 1AA is a widely published London postcode.
    for (const [t, want] of [
      ['M1 1AA', 'M1 1AA'],
      ['m601nw', 'M60 1NW'],
      ['CR2 6XH', 'CR2 6XH'],
      ['DN55 1PT', 'DN55 1PT'],
      ['W1A1HQ', 'W1A 1HQ'],
      ['EC1A 1BB', 'EC1A 1BB'],
      ['sw1a 1aa', 'SW1A 1AA'],
      ['GIR 0AA', 'GIR 0AA'],
    ]) {
      expect(readAs('postal_code', t, { country: 'GB' }).value, t).toBe(want);
    }
  });

  it('rejects inward letters C I K M O V, Q V X first, I J Z second, and malformed outward codes', () => {
    // Royal Mail position rules (from memory, as above).
    for (const t of ['SW1A 1AC', 'SW1A 1KA', 'SW1A1', 'QW1A 1AA', 'XA1 1AA', 'SI1 1AA', 'SWW1A 1AA']) {
      expect(readAs('postal_code', t, { country: 'GB' }).outcome, t).toBe('invalid');
    }
  });
});

import { describe, expect, it } from 'vitest';
import { correctAs, readAs } from './context.js';

describe('email', () => {
  it('accepts addr-spec forms of RFC 5322 §3.4.1 (dot-atom local part, domain with labels)', () => {
    // RFC 5322 §3.2.3 atext allows ! # $ % & ' * + - / = ? ^ _ ` { | } ~ in a dot-atom.
    for (const a of ['pat@example.org', 'pat.doe@example.com', 'pat+clinic@example.org', "o'brien@example.com", 'a_b-c@mail.example.org']) {
      expect(readAs('email', a).outcome, a).toBe('valid');
    }
  });

  it('rejects what RFC 5321/5322 do not allow', () => {
    // No "@" (RFC 5322 §3.4.1); two "@"; consecutive dots in a dot-atom (RFC 5322 §3.2.3); a leading dot;
    // a local part over 64 octets (RFC 5321 §4.5.3.1.1).
    // Checked as typed corrections: OCR cleanup would trim the leading dot as border noise.
    for (const a of ['pat.example.org', 'pat@@example.org', 'pat..doe@example.org', '.pat@example.org', `${'a'.repeat(65)}@example.org`]) {
      const r = correctAs('email', a);
      expect(r.outcome, a).toBe('invalid');
      expect(r.reasons).toEqual(['invalid_email']);
    }
  });

  it('lower-cases the domain only (RFC 5321 §2.4: the local part may be case-sensitive)', () => {
    expect(readAs('email', 'Pat.Doe@Example.ORG').value).toBe('Pat.Doe@example.org');
  });

  it('joins an address OCR split into words', () => {
    expect(readAs('email', 'pat.doe @ example.org').value).toBe('pat.doe@example.org');
    expect(readAs('email', '').outcome).toBe('empty');
  });
});

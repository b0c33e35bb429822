import { isValid, parse } from 'date-fns';
import { isValidPhoneNumber, parsePhoneNumberFromString } from 'libphonenumber-js/max';
import validator from 'validator';
import { describe, expect, it } from 'vitest';
import { fillLayout, type FieldFill } from '../../src/synth/fill.js';
import { layoutFor, LAYOUT_NAMES } from '../../src/synth/layouts.js';
import { Rng } from '../../src/synth/prng.js';
import { toDateFnsPattern } from '../../src/synth/values/dates.js';

/** Fills of many pages of every layout (values only: no pixels needed to check them). */
function manyFills(): FieldFill[] {
  const out: FieldFill[] = [];
  for (const name of LAYOUT_NAMES)
    for (let seed = 1; seed <= 40; seed++) {
      const rng = new Rng(seed * 7919);
      out.push(...fillLayout(layoutFor(name, rng.fork('layout'), 'all'), 'typed', rng.fork('fill')));
    }
  return out.filter((f) => f.value !== null && f.text !== null);
}

const fills = manyFills();
const ofType = (t: string) => fills.filter((f) => f.field.type === t);

describe('invented values are valid by outside libraries', () => {
  it('phones: libphonenumber-js says valid US numbers, in the fictional 555-0100..0199 range', () => {
    const phones = ofType('phone');
    expect(phones.length).toBeGreaterThan(50);
    for (const f of phones) {
      // libphonenumber-js (metadata "max") validates the number for its region; E.164 per ITU-T E.164.
      expect(isValidPhoneNumber(f.text!, 'US')).toBe(true);
      const p = parsePhoneNumberFromString(f.text!, 'US')!;
      expect(p.number).toBe(f.value);
      // NANPA reserves 555-0100 through 555-0199 for fictional use.
      expect(p.nationalNumber.slice(3, 6)).toBe('555');
      expect(Number(p.nationalNumber.slice(6))).toBeGreaterThanOrEqual(100);
      expect(Number(p.nationalNumber.slice(6))).toBeLessThanOrEqual(199);
    }
  });

  it('dates: date-fns parses the written text in the declared format to the ISO value', () => {
    const dates = ofType('date');
    expect(dates.length).toBeGreaterThan(50);
    for (const f of dates) {
      const format = (f.field.options.formats as string[])[0];
      const d = parse(f.text!, toDateFnsPattern(format), new Date(2000, 0, 1));
      expect(isValid(d)).toBe(true);
      // ISO 8601 calendar date YYYY-MM-DD.
      const iso = `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
      expect(iso).toBe(f.value);
    }
  });

  it('e-mail: validator.js accepts it and the domain is example.org or example.com (RFC 2606)', () => {
    const emails = ofType('email');
    expect(emails.length).toBeGreaterThan(20);
    for (const f of emails) {
      expect(validator.isEmail(f.text!)).toBe(true);
      expect(String(f.value)).toMatch(/@example\.(org|com)$/);
    }
  });

  it('postal codes: validator.js accepts each in its country (US ZIP/ZIP+4, Canada, UK)', () => {
    const codes = ofType('postal_code');
    const countries = new Set<string>();
    for (const f of codes) {
      const country = f.field.options.country as 'US' | 'CA' | 'GB';
      countries.add(country);
      expect(validator.isPostalCode(String(f.value), country)).toBe(true);
    }
    expect([...countries].sort()).toEqual(['CA', 'GB', 'US']);
  });

  it('numbers: the written text reads back as the value, within the field options', () => {
    for (const f of ofType('number')) {
      const o = f.field.options;
      const read = Number(f.text!.replace(String(o.decimalSeparator ?? '.'), '.'));
      expect(read).toBe(f.value);
      if (o.integer) expect(Number.isInteger(read)).toBe(true);
      if (typeof o.min === 'number') expect(read).toBeGreaterThanOrEqual(o.min);
      if (typeof o.max === 'number') expect(read).toBeLessThanOrEqual(o.max);
    }
  });

  it('choice_text: the value is a listed choice (USPS state codes for State)', () => {
    for (const f of ofType('choice_text')) {
      expect(f.field.options.choices as string[]).toContain(f.value);
      expect(String(f.text).toLowerCase()).toBe(String(f.value).toLowerCase());
    }
  });

  it('text with a pattern matches it', () => {
    for (const f of ofType('text').filter((x) => typeof x.field.options.pattern === 'string')) {
      expect(String(f.value)).toMatch(new RegExp(f.field.options.pattern as string));
    }
  });
});

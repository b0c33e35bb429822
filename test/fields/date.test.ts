import { describe, expect, it } from 'vitest';
import { expandTwoDigitYear } from '../../src/fields/date.js';
import { getFieldType } from '../../src/fields/registry.js';
import { correctAs, readAs } from './context.js';

const US = { formats: ['MM/DD/YYYY'] };

describe('date: ISO 8601 output', () => {
  it('writes calendar dates in the extended complete form YYYY-MM-DD', () => {
    // ISO 8601-1:2019 §5.2.2.1 (complete representation, extended format): "1985-04-12" is its example (from memory).
    expect(readAs('date', '04/12/1985', US).value).toBe('1985-04-12');
    expect(readAs('date', '12.04.1985', { formats: ['DD.MM.YYYY'] }).value).toBe('1985-04-12');
    expect(readAs('date', '1985-04-12', { formats: ['YYYY-MM-DD'] }).value).toBe('1985-04-12');
    expect(readAs('date', '12 Apr 1985', { formats: ['D MMM YYYY'] }).value).toBe('1985-04-12');
    expect(readAs('date', '12 April 1985', { formats: ['D MMM YYYY'] }).value).toBe('1985-04-12');
  });

  it('pads one-digit months and days (ISO 8601 uses two digits for both)', () => {
    // ISO 8601-1:2019 §5.2.2: MM and DD are always two digits (from memory).
    expect(readAs('date', '3/7/2024', US).value).toBe('2024-03-07');
  });

  it('agrees with the JavaScript Date calendar on every day of a leap and a common year', () => {
    // Reference: the proleptic Gregorian calendar of ECMA-262 §21.4.1 (Date objects), a library outside this project.
    for (const year of [2023, 2024]) {
      for (let d = new Date(Date.UTC(year, 0, 1)); d.getUTCFullYear() === year; d = new Date(d.getTime() + 86_400_000)) {
        const m = d.getUTCMonth() + 1;
        const day = d.getUTCDate();
        const r = readAs('date', `${m}/${day}/${year}`, US);
        expect(r.value).toBe(d.toISOString().slice(0, 10));
      }
    }
  });
});

describe('date: Gregorian leap years', () => {
  // Gregorian rule (Inter gravissimas, 1582): every 4th year is leap, except centuries not divisible by 400.
  // Cross-checked with the JavaScript calendar: new Date(Date.UTC(y, 1, 29)).getUTCMonth() === 1 only in leap years.
  const jsLeap = (y: number) => new Date(Date.UTC(y, 1, 29)).getUTCMonth() === 1;
  it.each([
    [1900, false],
    [2000, true],
    [2023, false],
    [2024, true],
    [2100, false],
  ])('29 February %i is valid: %s', (year, leap) => {
    expect(jsLeap(year)).toBe(leap);
    const r = readAs('date', `02/29/${year}`, US);
    expect(r.outcome).toBe(leap ? 'valid' : 'invalid');
    if (!leap) expect(r.reasons).toContain('invalid_date');
  });

  it('rejects impossible days with invalid_date', () => {
    // Month lengths of the Gregorian calendar: April, June, September, November have 30 days.
    for (const text of ['04/31/2024', '06/31/2024', '13/01/2024', '00/10/2024', '01/32/2024', '01/00/2024']) {
      const r = readAs('date', text, US);
      expect(r.outcome, text).toBe('invalid');
      expect(r.reasons, text).toContain('invalid_date');
      expect(r.value).toBeNull();
    }
  });
});

describe('date: OCR digit repair', () => {
  it('repairs look-alike letters where the format expects digits, lowering confidence once per repair', () => {
    // Common OCR confusions O→0, I/l→1, S→5, B→8, Z→2 (common practice in OCR post-correction).
    const clean = readAs('date', '03/15/2024', US);
    const one = readAs('date', 'O3/15/2024', US);
    const three = readAs('date', 'O3/l5/2O24', US);
    expect(one.value).toBe('2024-03-15');
    expect(three.value).toBe('2024-03-15');
    expect(one.reasons).toContain('repaired_digits');
    expect(clean.confidence).toBe(1);
    expect(one.confidence).toBeLessThan(clean.confidence);
    expect(three.confidence).toBeLessThan(one.confidence);
    expect(readAs('date', '12/3I/2O2Z', US).value).toBe('2022-12-31');
    expect(readAs('date', '0B/1S/2024', US).value).toBe('2024-08-15');
  });

  it('never touches month names', () => {
    // "Oct" must stay a month name; only the digit slots are repaired.
    expect(readAs('date', '1O Oct 2024', { formats: ['D MMM YYYY'] }).value).toBe('2024-10-10');
  });

  it('does not repair what a reviewer typed', () => {
    expect(correctAs('date', 'O3/15/2024', US).outcome).toBe('invalid');
    expect(correctAs('date', '03/15/2024', US).value).toBe('2024-03-15');
    // The stored ISO form is always accepted as a correction.
    expect(correctAs('date', '2024-03-15', US).value).toBe('2024-03-15');
  });
});

describe('date: ranges, two-digit years, several formats', () => {
  it('flags dates after today when notFuture is set, keeping the value for review', () => {
    const r = readAs('date', '07/01/2025', { ...US, notFuture: true });
    expect(r.outcome).toBe('invalid');
    expect(r.reasons).toContain('future_date');
    expect(r.value).toBe('2025-07-01');
    expect(readAs('date', '06/15/2025', { ...US, notFuture: true }).outcome).toBe('valid');
  });

  it('flags dates before minYear', () => {
    const r = readAs('date', '12/31/1899', { ...US, minYear: 1900 });
    expect(r.reasons).toContain('before_min_year');
  });

  it('expands two-digit years by the pivot (default: RFC 5322 §4.3 — 00-49 → 20xx, 50-99 → 19xx)', () => {
    // RFC 5322 §4.3: a two-digit year 00-49 is read as 2000-2049, 50-99 as 1950-1999.
    expect(expandTwoDigitYear(49)).toBe(2049);
    expect(expandTwoDigitYear(50)).toBe(1950);
    expect(expandTwoDigitYear(0)).toBe(2000);
    expect(readAs('date', '03/15/87', { formats: ['MM/DD/YY'] }).value).toBe('1987-03-15');
    // An explicit pivot: window 1930-2029.
    expect(readAs('date', '03/15/29', { formats: ['MM/DD/YY'], pivotYear: 1930 }).value).toBe('2029-03-15');
    expect(readAs('date', '03/15/30', { formats: ['MM/DD/YY'], pivotYear: 1930 }).value).toBe('1930-03-15');
  });

  it('calls a text that two declared formats read differently ambiguous', () => {
    const both = { formats: ['MM/DD/YYYY', 'DD/MM/YYYY'] };
    const r = readAs('date', '03/04/2024', both);
    expect(r.outcome).toBe('ambiguous');
    expect(r.reasons).toContain('ambiguous_date_format');
    // Only one reading is a real date: no ambiguity.
    expect(readAs('date', '25/04/2024', both).value).toBe('2024-04-25');
  });

  it('reports a text in no declared format', () => {
    const r = readAs('date', 'next Tuesday', US);
    expect(r.reasons).toEqual(['format_mismatch']);
    expect(readAs('date', '', US).outcome).toBe('empty');
  });

  it('rejects a declared format without a year, month or day at schema load', () => {
    const opts = getFieldType('date').options;
    expect(opts.safeParse({ formats: ['MM/DD'] }).success).toBe(false);
    expect(opts.safeParse({ formats: ['MM/DD/YYYY', 'D MMM YYYY'] }).success).toBe(true);
  });
});

import { describe, expect, it } from 'vitest';
import { correctAs, readAs } from './context.js';

describe('number', () => {
  it('reads decimals with the declared decimal mark and digit grouping', () => {
    // CLDR number symbols: en uses "." decimal and "," grouping; de uses "," decimal and "." grouping (from memory).
    expect(readAs('number', '1,250.5').value).toBe(1250.5);
    expect(readAs('number', '1.250,5', { decimalSeparator: ',' }).value).toBe(1250.5);
    expect(readAs('number', '12,5', { decimalSeparator: ',' }).value).toBe(12.5);
    expect(readAs('number', '-3.75').value).toBe(-3.75);
    expect(readAs('number', '1 250 000').value).toBe(1250000);
  });

  it('refuses digit groups that are not groups of three (common practice)', () => {
    for (const t of ['1,25.5', '12,5', '1.2.3']) expect(readAs('number', t).reasons, t).toContain('invalid_number');
  });

  it('strips the unit before or after the number, in any case', () => {
    expect(readAs('number', '12.5 kg', { unit: 'kg' }).value).toBe(12.5);
    expect(readAs('number', '12.5KG', { unit: 'kg' }).value).toBe(12.5);
    expect(readAs('number', '$40', { unit: '$' }).value).toBe(40);
    expect(readAs('number', '12.5 lb', { unit: 'kg' }).outcome).toBe('invalid');
  });

  it('checks integer, min and max', () => {
    expect(readAs('number', '3.5', { integer: true }).reasons).toContain('not_integer');
    expect(readAs('number', '3', { integer: true }).value).toBe(3);
    const low = readAs('number', '2', { min: 5 });
    expect(low.outcome).toBe('invalid');
    expect(low.reasons).toContain('below_min');
    expect(low.value).toBe(2);
    expect(readAs('number', '99', { max: 50 }).reasons).toContain('above_max');
  });

  it('repairs look-alike letters from OCR but not in typed corrections', () => {
    const r = readAs('number', '4O.5');
    expect(r.value).toBe(40.5);
    expect(r.reasons).toContain('repaired_digits');
    expect(correctAs('number', '4O.5').outcome).toBe('invalid');
    expect(readAs('number', '').outcome).toBe('empty');
  });
});

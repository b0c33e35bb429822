import { describe, expect, it } from 'vitest';
import { cleanOcrText } from '../../src/fields/ocr-text.js';
import { correctAs, readAs } from './context.js';

describe('text', () => {
  it('collapses whitespace and strips border fragments OCR reads at the crop edges (common practice)', () => {
    expect(cleanOcrText('| Juniper   Ashgrove ]')).toBe('Juniper Ashgrove');
    expect(cleanOcrText('~ 1868 Kestrel Avenue _')).toBe('1868 Kestrel Avenue');
    expect(readAs('text', '  \n ').outcome).toBe('empty');
  });

  it('applies the case option', () => {
    expect(readAs('text', 'JUNIPER ASHGROVE', { case: 'title' }).value).toBe('Juniper Ashgrove');
    expect(readAs('text', "o'brien-hale", { case: 'title' }).value).toBe("O'Brien-Hale");
    expect(readAs('text', 'k1a', { case: 'upper' }).value).toBe('K1A');
    expect(readAs('text', 'Juniper', {}).value).toBe('Juniper');
  });

  it('checks length and pattern, keeping the text for the reviewer', () => {
    const short = readAs('text', 'Jo', { minLength: 3 });
    expect(short).toMatchObject({ outcome: 'invalid', value: 'Jo', reasons: ['too_short'] });
    expect(readAs('text', 'Juniper', { maxLength: 4 }).reasons).toEqual(['too_long']);
    expect(readAs('text', 'AB-12', { pattern: '[A-Z]{2}-\\d{2}' }).outcome).toBe('valid');
    expect(readAs('text', 'AB-1X', { pattern: '[A-Z]{2}-\\d{2}' }).reasons).toEqual(['pattern_mismatch']);
  });

  it('lays the digits read into the shape option, whatever separators were written', () => {
    // US social security number shape AAA-GG-SSSS (Social Security Administration, from memory).
    const shape = '###-##-####';
    for (const read of ['793004113', '793-00-4113', '793 00 4113', '7 9 3 0 0 4 1 1 3', '793.00.4113']) {
      expect(readAs('text', read, { shape }), read).toMatchObject({ outcome: 'valid', value: '793-00-4113', reasons: [] });
    }
    const repaired = readAs('text', '793-O0-4113', { shape });
    expect(repaired).toMatchObject({ value: '793-00-4113', reasons: ['repaired_digits'] });
    expect(repaired.confidence).toBeLessThan(1);
    expect(readAs('text', '79300411', { shape })).toMatchObject({ outcome: 'invalid', value: '79300411', reasons: ['shape_mismatch'] });
    expect(correctAs('text', '793004113', { shape }).value).toBe('793-00-4113');
  });

  it('drops the spaces OCR puts between comb cells when the pattern wants none', () => {
    expect(readAs('text', '70 4 4 1 2', { pattern: '\\d{6}' }).value).toBe('704412');
    // Without a pattern, spaces are part of the text.
    expect(readAs('text', '70 4 4 1 2').value).toBe('70 4 4 1 2');
    expect(correctAs('text', '  Juniper  Ashgrove ').value).toBe('Juniper Ashgrove');
  });

  it('repairs a stray 0, 1 or 5 inside a word of free text, not codes, numbers or ordinals (common practice)', () => {
    const old = readAs('text', '1781 0ld Mill Road');
    expect([old.value, old.reasons]).toEqual(['1781 Old Mill Road', ['repaired_letters']]);
    expect(old.confidence).toBeCloseTo(0.85, 9);
    expect(readAs('text', '14 Wi1low Lane').value).toBe('14 Willow Lane');
    for (const kept of ['Plot B12', 'A1K 0V6', 'k1a', '21st Street', 'Sea Biscuit 11', '12 Elm Road']) {
      expect(readAs('text', kept)).toMatchObject({ value: kept, reasons: [] });
    }
    // With a pattern the field holds a code: digits among letters are meant.
    expect(readAs('text', 'ab0cd', { pattern: '[a-z0-9]+' }).value).toBe('ab0cd');
  });
});

import { afterAll, describe, expect, it } from 'vitest';
import { entryBox } from '../fields/entry-box.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { getFieldType } from '../../src/fields/registry.js';
import type { TextReading } from '../../src/fields/types.js';
import { carriesDigits } from '../../src/fields/digit-scrutiny.js';
import { REASONS } from '../../src/fields/reasons.js';
import { secondRead, secondVariant, withSecondRead, SECOND_READ_DISAGREES } from '../../src/pipeline/second-read.js';
import { TODAY } from '../fields/context.js';

/**
 * The second read of a value with digits, on real pixels through the real tesseract.js: it confirms a value the
 * crop holds and refuses one with two digits swapped (the costly error a type check cannot see). Dates are ISO 8601
 * calendar dates (ISO 8601-1:2019 §5.2.2.1); the written values are invented.
 */
const date = getFieldType('date');
const options = date.options.parse({ formats: ['MM/DD/YYYY'] });
const interpret = (r: TextReading) => date.interpret(r, options, { today: TODAY });
const kept = (text: string) => {
  const reading: TextReading = { kind: 'text', text, words: [{ text, confidence: 0.95 }], confidence: 0.95, variant: 'standard' };
  return { reading, interpretation: interpret(reading) };
};

const ocr = new OcrEngine();
afterAll(() => ocr.close());

describe('second read of a value with digits', () => {
  it('reads with the other binarization than the kept one', () => {
    expect(secondVariant('standard').name).toBe('adaptive');
    expect(secondVariant('adaptive').name).toBe('standard');
    expect(secondVariant(undefined).name).toBe('adaptive');
  });

  it('scrutinizes dates, amounts, postal codes, phones and digit codes, not names', () => {
    for (const t of ['date', 'number', 'postal_code', 'phone']) expect(carriesDigits(t, undefined, undefined)).toBe(true);
    expect(carriesDigits('text', undefined, '^[0-9]{9}$')).toBe(true);
    expect(carriesDigits('text', '0123456789-', undefined)).toBe(true);
    expect(carriesDigits('text', undefined, undefined)).toBe(false);
    expect(carriesDigits('email', undefined, undefined)).toBe(false);
  });

  it('confirms the value the crop holds and refuses one with two digits swapped', async () => {
    const { page, box } = await entryBox('03/14/2024', 'mono', 26, 360);
    const read = { engine: ocr, padding: 4, mode: 'line' as const, allowed: '0123456789/', comb: false };
    const right = kept('03/14/2024');
    expect(right.interpretation.value).toBe('2024-03-14');
    const same = await secondRead(page, box, right, read, interpret);
    expect(same).toEqual({ agree: true, variant: 'adaptive' });
    expect(withSecondRead(right.interpretation, same)).toBe(right.interpretation);

    // The 3 and the 4 swapped between month and day: still a valid date.
    const swapped = kept('04/13/2024');
    expect(swapped.interpretation.outcome).toBe('valid');
    const check = await secondRead(page, box, swapped, read, interpret);
    expect(check.agree).toBe(false);
    const judged = withSecondRead(swapped.interpretation, check);
    expect(judged.outcome).toBe('ambiguous');
    expect(judged.reasons).toContain(SECOND_READ_DISAGREES);
    expect(REASONS[SECOND_READ_DISAGREES].effect).toBe('review');
  });
});

import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import type { ReasonCode } from './reasons.js';
import { DIGITISH, repairDigits, repairPenalty } from './digit-repair.js';
import { emptyInterpretation, invalidInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';
import { escapeRegex } from './escape-regex.js';

const options = z
  .object({
    integer: z.boolean().default(false).describe('Whole numbers only (default false)'),
    decimalSeparator: z.enum(['.', ',']).default('.').describe('Decimal mark as written on the form (default ".")'),
    min: z.number().optional().describe('Smallest accepted value'),
    max: z.number().optional().describe('Largest accepted value'),
    unit: z.string().min(1).optional().describe('Unit written beside the number and stripped, e.g. "kg", "ft", "$"'),
  })
  .strict();

export type NumberOptions = z.infer<typeof options>;

/**
 * Digit-group separators that may appear with each decimal mark: with "." the groups are split by "," (en-US), with
 * "," by "." (de-DE); a space or thin space or an apostrophe (de-CH) may split groups under either (CLDR number
 * symbols, from memory).
 */
function groupSeparators(decimal: '.' | ','): string {
  return (decimal === '.' ? ',' : '.') + " '\u00a0\u202f";
}

/** Strip the unit once, before or after the number, in any case ("12.5 kg", "KG 12.5", "$40"). */
function stripUnit(text: string, unit: string | undefined): string {
  if (!unit) return text;
  const u = escapeRegex(unit);
  return text.replace(new RegExp(`^${u}\\s*|\\s*${u}$`, 'i'), '').trim();
}

function interpretText(text: string, o: NumberOptions, repair: boolean): Interpretation {
  const bare = stripUnit(text.trim(), o.unit);
  if (bare === '') return emptyInterpretation();
  const g = `[${escapeRegex(groupSeparators(o.decimalSeparator))}]`;
  const d = escapeRegex(o.decimalSeparator);
  const digit = repair ? DIGITISH : '[0-9]';
  // Either plain digits, or groups of three after a one-to-three digit head ("1,250" yes, "1,25" no).
  const shape = new RegExp(`^([+-]?)\\s*(${digit}{1,3}(?:${g}${digit}{3})+|${digit}*)(?:${d}(${digit}+))?$`);
  const m = shape.exec(bare);
  if (!m || (m[2] === '' && m[3] === undefined)) return invalidInterpretation(['invalid_number']);
  const whole = repairDigits(m[2].replace(new RegExp(g, 'g'), ''));
  const fraction = repairDigits(m[3] ?? '');
  const repairs = whole.repairs + fraction.repairs;
  const value = Number(`${m[1]}${whole.text || '0'}${fraction.text ? '.' + fraction.text : ''}`);
  const reasons: ReasonCode[] = repairs ? ['repaired_digits'] : [];
  const confidence = repairPenalty(repairs);
  if (o.integer && !Number.isInteger(value)) return invalidInterpretation([...reasons, 'not_integer'], confidence);
  const range: ReasonCode[] = [];
  if (o.min !== undefined && value < o.min) range.push('below_min');
  if (o.max !== undefined && value > o.max) range.push('above_max');
  // A number out of range keeps its value so the reviewer sees what was read.
  if (range.length) return { value, outcome: 'invalid', confidence, reasons: [...reasons, ...range] };
  return { value, outcome: 'valid', confidence, reasons };
}

export const numberField: FieldType<NumberOptions> = {
  name: 'number',
  description: 'An integer or decimal number, optionally with a unit that is stripped.',
  options,
  reader: 'ocr',
  ocrDefaults: (o) =>
    o.unit ? { mode: 'line' } : { mode: 'line', allowed: `0123456789+-${o.decimalSeparator}${groupSeparators(o.decimalSeparator)}` },
  interpret(reading, o) {
    const text = ocrText(reading, 'number');
    // The OCR cleanup strips a leading "-" as a border fragment; a minus right before a digit is a sign.
    const signed = reading.kind === 'text' && /^\s*[-\u2212]\s*\d/.test(reading.text) && !text.startsWith('-');
    return interpretText(signed ? `-${text}` : text, o, true);
  },
  acceptedInput(o) {
    const mark = o.decimalSeparator === '.' ? 'a decimal point (12.5)' : 'a decimal comma (12,5)';
    const limits = [
      o.integer ? 'a whole number' : `a number with ${mark}`,
      o.min !== undefined ? `at least ${o.min}` : '',
      o.max !== undefined ? `at most ${o.max}` : '',
      o.unit !== undefined ? `the unit ${o.unit} may be typed or left out` : '',
    ].filter(Boolean);
    return limits.join(', ');
  },
  parseCorrection(text, o) {
    return interpretText(text, o, false);
  },
};

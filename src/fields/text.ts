import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import type { ReasonCode } from './reasons.js';
import { emptyInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';
import { repairPenalty, repairWordLetters } from './digit-repair.js';
import { repairConfusedWords } from './word-repair.js';
import { applyShape, SHAPE_DIGIT, shapeCharacters } from './id-shape.js';

const options = z
  .object({
    pattern: z.string().optional().describe('Regular expression the whole cleaned value must match.'),
    minLength: z.number().int().min(0).optional(),
    maxLength: z.number().int().min(1).optional(),
    case: z.enum(['as_read', 'upper', 'lower', 'title']).default('as_read').describe('Case of the stored value (default as_read)'),
    shape: z
      .string()
      .refine((s) => s.includes(SHAPE_DIGIT), { message: 'a shape with at least one "#" (a digit), such as "###-##-####"' })
      .optional()
      .describe(
        'Output shape of an identifier: "#" is one digit, other characters are written as they stand (e.g. "###-##-####"). ' +
          'The digits read are laid into it whatever separators were written; a read with another number of digits is shape_mismatch.',
      ),
  })
  .strict();

export type TextOptions = z.infer<typeof options>;

/** A text in the case the schema asks for (title case starts each word, also after a hyphen or an apostrophe). */
export function applyCase(s: string, c: TextOptions['case']): string {
  if (c === 'upper') return s.toUpperCase();
  if (c === 'lower') return s.toLowerCase();
  if (c === 'title') return s.toLowerCase().replace(/(^|[\s'-])(\p{L})/gu, (_m, p: string, l: string) => p + l.toUpperCase());
  return s;
}

/**
 * OCR puts spaces between characters written in separate cells or spaced apart ("70 4 4 1 2" for a comb of six
 * digits). When the schema's pattern rejects the text but accepts it without spaces, the spaces were not part of
 * the value (common practice for comb and code fields).
 */
function matches(pattern: string, value: string): boolean {
  return new RegExp(`^(?:${pattern})$`, 'u').test(value);
}

function check(read: string, o: TextOptions): Interpretation {
  if (read === '') return emptyInterpretation();
  if (o.shape !== undefined) {
    const shaped = applyShape(read, o.shape);
    if (shaped.value === null) return { value: read, outcome: 'invalid', confidence: 1, reasons: ['shape_mismatch'] };
    const r = check(shaped.value, { ...o, shape: undefined });
    if (shaped.repairs === 0) return r;
    return { ...r, confidence: r.confidence * repairPenalty(shaped.repairs), reasons: [...r.reasons, 'repaired_digits'] };
  }
  const compact = read.replace(/\s+/g, '');
  const value = o.pattern !== undefined && !matches(o.pattern, read) && matches(o.pattern, compact) ? compact : read;
  const reasons: ReasonCode[] = [];
  if (o.minLength !== undefined && value.length < o.minLength) reasons.push('too_short');
  if (o.maxLength !== undefined && value.length > o.maxLength) reasons.push('too_long');
  if (o.pattern !== undefined && !matches(o.pattern, value)) reasons.push('pattern_mismatch');
  // Free text keeps what was read even when a check fails, so a reviewer sees it next to the reason.
  return { value, outcome: reasons.length ? 'invalid' : 'valid', confidence: 1, reasons };
}

export const textField: FieldType<TextOptions> = {
  name: 'text',
  description: 'Free text such as a name or an address line.',
  options,
  reader: 'ocr',
  ocrDefaults: (o) => (o.shape === undefined ? { mode: 'line' } : { mode: 'line', allowed: shapeCharacters(o.shape) }),
  interpret(reading, o) {
    const read = ocrText(reading, 'text');
    // A pattern or shape describes a code, where digits among letters are meant; free text gets its stray digits
    // repaired, then its words whose letters OCR confused (word-repair.ts).
    const code = o.pattern !== undefined || o.shape !== undefined;
    const letters = code ? { text: read, repairs: 0 } : repairWordLetters(read);
    const words = code ? { text: letters.text, repairs: 0 } : repairConfusedWords(letters.text);
    const r = check(applyCase(words.text, o.case), o);
    if (letters.repairs + words.repairs === 0 || r.outcome === 'empty') return r;
    const reasons: ReasonCode[] = [...r.reasons];
    if (letters.repairs > 0) reasons.push('repaired_letters');
    if (words.repairs > 0) reasons.push('repaired_words');
    return { ...r, confidence: r.confidence * repairPenalty(letters.repairs + words.repairs), reasons };
  },
  acceptedInput(o) {
    const limits = [
      o.minLength !== undefined ? `at least ${o.minLength} characters` : '',
      o.maxLength !== undefined ? `at most ${o.maxLength} characters` : '',
      o.pattern !== undefined ? `matching ${o.pattern}` : '',
    ].filter(Boolean);
    return `text as written${limits.length ? `, ${limits.join(', ')}` : ''}`;
  },
  parseCorrection(text, o) {
    return check(applyCase(text.replace(/\s+/g, ' ').trim(), o.case), o);
  },
};

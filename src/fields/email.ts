import validator from 'validator';
import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import { emptyInterpretation, invalidInterpretation, validInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';

const options = z.object({}).strict();

export type EmailOptions = z.infer<typeof options>;

/**
 * Domain names compare without regard to case (RFC 5321 §2.4), so the domain is stored lower-cased; the local part
 * "MAY be case-sensitive" (same section) and is kept as written.
 */
export function normalizeEmail(address: string): string {
  const at = address.lastIndexOf('@');
  return address.slice(0, at) + '@' + address.slice(at + 1).toLowerCase();
}

function interpretText(text: string, fromOcr: boolean): Interpretation {
  // OCR splits an address at "@" or "." into words; an address never holds a space outside a quoted local part,
  // which paper forms do not carry (common practice), so spaces are dropped.
  const compact = fromOcr ? text.replace(/\s+/g, '').replace(/[.,;:]+$/, '') : text.trim();
  if (compact === '') return emptyInterpretation();
  // validator.js isEmail follows the RFC 5321/5322 addr-spec shape (dot-atom local part, domain with a TLD).
  if (!validator.isEmail(compact)) return invalidInterpretation(['invalid_email']);
  return validInterpretation(normalizeEmail(compact));
}

export const emailField: FieldType<EmailOptions> = {
  name: 'email',
  description: 'An e-mail address; the domain is stored lower-cased.',
  options,
  reader: 'ocr',
  ocrDefaults: () => ({ mode: 'line' }),
  interpret(reading) {
    return interpretText(ocrText(reading, 'email'), true);
  },
  acceptedInput() {
    return 'an e-mail address, e.g. name@example.org';
  },
  parseCorrection(text) {
    return interpretText(text, false);
  },
};

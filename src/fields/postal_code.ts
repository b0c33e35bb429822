import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import { repairDigits, repairLetters, repairPenalty } from './digit-repair.js';
import { emptyInterpretation, invalidInterpretation, validInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';

const options = z
  .object({
    country: z.enum(['US', 'CA', 'GB']).default('US').describe('Postal system: US ZIP, Canada, United Kingdom (default "US")'),
  })
  .strict();

export type PostalCodeOptions = z.infer<typeof options>;

type Slot = 'digit' | 'letter' | 'any';

/** Fix one character for the slot it sits in; count a change as a repair. */
function fitSlots(chars: string, slots: Slot[]): { text: string; repairs: number } {
  let text = '';
  let repairs = 0;
  [...chars].forEach((c, i) => {
    const r = slots[i] === 'digit' ? repairDigits(c) : slots[i] === 'letter' ? repairLetters(c) : { text: c.toUpperCase(), repairs: 0 };
    text += r.text;
    repairs += r.repairs;
  });
  return { text, repairs };
}

/**
 * US: a ZIP Code is five digits, ZIP+4 adds a hyphen and four digits ("04101-1234") — USPS Publication 28,
 * "Postal Addressing Standards" (from memory). Nine digits written without the hyphen are normalized to it.
 */
function usZip(compact: string): { text: string; repairs: number } | null {
  const plain = compact.replace(/-/g, '');
  if (plain.length !== 5 && plain.length !== 9) return null;
  const r = fitSlots(plain, Array(plain.length).fill('digit'));
  if (!/^\d+$/.test(r.text)) return null;
  return { text: plain.length === 9 ? `${r.text.slice(0, 5)}-${r.text.slice(5)}` : r.text, repairs: r.repairs };
}

/**
 * Canada: "A1A 1A1", letter-digit alternating, a space between the forward sortation area and the local delivery
 * unit; D, F, I, O, Q and U never appear, and W and Z never as the first letter — Canada Post Addressing
 * Guidelines (from memory).
 */
function caPostalCode(compact: string): { text: string; repairs: number } | null {
  if (compact.length !== 6) return null;
  const r = fitSlots(compact, ['letter', 'digit', 'letter', 'digit', 'letter', 'digit']);
  if (!/^[ABCEGHJ-NPRSTVXY]\d[ABCEGHJ-NPRSTV-Z]\d[ABCEGHJ-NPRSTV-Z]\d$/.test(r.text)) return null;
  return { text: `${r.text.slice(0, 3)} ${r.text.slice(3)}`, repairs: r.repairs };
}

/**
 * United Kingdom: an outward code (A9, A99, AA9, AA99, A9A or AA9A), a space, and an inward code of one digit and two
 * letters; Q, V and X never first, I, J and Z never second, the inward letters never C, I, K, M, O or V; plus the
 * special "GIR 0AA" — Royal Mail Programmers' Guide
 * to the Postcode Address File (from memory). Only the unambiguous slots are repaired: the first character (always
 * a letter) and the inward code (digit, letter, letter).
 */
function gbPostcode(compact: string): { text: string; repairs: number } | null {
  if (compact.length < 5 || compact.length > 7) return null;
  const slots: Slot[] = Array(compact.length).fill('any');
  slots[0] = 'letter';
  slots[compact.length - 3] = 'digit';
  slots[compact.length - 2] = 'letter';
  slots[compact.length - 1] = 'letter';
  const r = fitSlots(compact, slots);
  const outward = r.text.slice(0, -3);
  const inward = r.text.slice(-3);
  const ok =
    r.text === 'GIR0AA' ||
    (/^([A-PR-UWYZ]\d{1,2}|[A-PR-UWYZ][A-HK-Y]\d{1,2}|[A-PR-UWYZ]\d[A-Z]|[A-PR-UWYZ][A-HK-Y]\d[A-Z])$/.test(outward) &&
      /^\d[ABD-HJLNP-UW-Z]{2}$/.test(inward));
  return ok ? { text: `${outward} ${inward}`, repairs: r.repairs } : null;
}

const BY_COUNTRY = { US: usZip, CA: caPostalCode, GB: gbPostcode } as const;

function interpretText(text: string, o: PostalCodeOptions, repair: boolean): Interpretation {
  // Case is left for the slots to settle: a lower-case "l" in a digit slot is a 1, in a letter slot an L.
  const compact = text.replace(/\s+/g, '');
  if (compact === '') return emptyInterpretation();
  const r = BY_COUNTRY[o.country](o.country === 'US' ? compact : compact.replace(/-/g, ''));
  if (!r || (!repair && r.repairs > 0)) return invalidInterpretation(['invalid_postal_code']);
  return validInterpretation(r.text, repairPenalty(r.repairs), r.repairs ? ['repaired_digits'] : []);
}

export const postalCodeField: FieldType<PostalCodeOptions> = {
  name: 'postal_code',
  description: 'A postal code (US ZIP / ZIP+4, Canadian, UK) with normalized spacing.',
  options,
  reader: 'ocr',
  ocrDefaults: (o) =>
    o.country === 'US'
      ? { mode: 'line', allowed: '0123456789-' }
      : { mode: 'line', allowed: 'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789 ' },
  interpret(reading, o) {
    return interpretText(ocrText(reading, 'postal_code'), o, true);
  },
  acceptedInput(o) {
    const shapes = { US: 'a US ZIP Code, 12345 or 12345-6789', CA: 'a Canadian postal code, A1A 1A1', GB: 'a UK postcode, e.g. SW1A 1AA' };
    return shapes[o.country];
  },
  parseCorrection(text, o) {
    return interpretText(text, o, false);
  },
};

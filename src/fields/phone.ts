import { type CountryCode, isSupportedCountry, parsePhoneNumberFromString } from 'libphonenumber-js/max';
import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import { repairDigits, repairPenalty } from './digit-repair.js';
import { emptyInterpretation, invalidInterpretation, validInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';

const options = z
  .object({
    defaultRegion: z
      .string()
      .refine((r) => isSupportedCountry(r), { message: 'a region code libphonenumber knows, such as "US", "CA" or "GB"' })
      .default('US')
      .describe('ISO 3166-1 alpha-2 region for numbers written without a country code (default "US")'),
  })
  .strict();

export type PhoneOptions = z.infer<typeof options>;

/** Characters people write in phone numbers besides digits: +, (, ), -, ., /, spaces (common practice). */
const PUNCTUATION = /[\s()+\-./]/;

/**
 * Repair look-alike letters only when everything else in the text is digits or phone punctuation: "2O7-555-0l42"
 * is a misread number, but "ext" or a vanity word is left for libphonenumber to judge.
 */
function repairPhoneText(text: string): { text: string; repairs: number } {
  const r = repairDigits(text);
  return [...r.text].every((c) => /[0-9]/.test(c) || PUNCTUATION.test(c)) ? r : { text, repairs: 0 };
}

function interpretText(text: string, o: PhoneOptions, repair: boolean): Interpretation {
  if (text.trim() === '') return emptyInterpretation();
  const r = repair ? repairPhoneText(text) : { text, repairs: 0 };
  // The "max" metadata checks each region's number patterns, not only lengths (libphonenumber-js README).
  const parsed = parsePhoneNumberFromString(r.text, { defaultCountry: o.defaultRegion as CountryCode });
  if (!parsed || !parsed.isPossible()) return invalidInterpretation(['invalid_phone']);
  const extra = { national: parsed.formatNational(), country: parsed.country ?? '' };
  // Possible (right length) but in no range the numbering plan assigns (an area code not in service, say): a misread
  // digit, a number assigned since the metadata was published, or a made-up one. libphonenumber cannot tell these
  // apart (its README: isPossible checks length, isValid the assigned ranges), so a person decides; the number read
  // stays in the record.
  if (!parsed.isValid()) {
    // A reviewer who types such a number has looked at it: kept as typed, the reason stays on record.
    if (!repair) return validInterpretation(parsed.number, 1, ['phone_not_assigned'], extra);
    return { value: parsed.number, outcome: 'ambiguous', confidence: repairPenalty(r.repairs), reasons: ['phone_not_assigned'], extra };
  }
  return validInterpretation(parsed.number, repairPenalty(r.repairs), r.repairs ? ['repaired_digits'] : [], extra);
}

export const phoneField: FieldType<PhoneOptions> = {
  name: 'phone',
  description: 'A telephone number, stored as E.164 (+12075550142) with the national format in extra.national.',
  options,
  reader: 'ocr',
  ocrDefaults: () => ({ mode: 'line', allowed: '0123456789+()-. ' }),
  interpret(reading, o) {
    return interpretText(ocrText(reading, 'phone'), o, true);
  },
  acceptedInput(o) {
    return `a phone number as written, e.g. (207) 555-0142; without a country code it is read as ${o.defaultRegion}; with one, as +1 207 555 0142`;
  },
  parseCorrection(text, o) {
    return interpretText(text, o, false);
  },
};

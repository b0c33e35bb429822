/**
 * Which fields carry digits whose misread is the costly error (a swapped digit in a postal code, an amount or a
 * date reads as a plausible, valid value, so no type check catches it): dates, numbers (amounts), postal codes,
 * phone numbers, and text fields that are codes of digits (IDs: allowed characters or a pattern that names digits
 * and no letters). Handwritten, such a value is accepted only when a second, independent read agrees
 * (src/pipeline/second-read.ts; reason ambiguous_second_read otherwise).
 */
const DIGIT_TYPES = new Set(['date', 'number', 'postal_code', 'phone']);

/**
 * A code of digits: by the allowed characters (digits and separators, no letters) or, without them, by a schema
 * pattern that names digits and no letters (`^[0-9]{6}$`, `\d{5}`).
 */
export function digitsOnly(allowed: string | undefined, pattern: unknown): boolean {
  if (allowed !== undefined) return /[0-9]/.test(allowed) && !/[A-Za-z]/.test(allowed);
  return typeof pattern === 'string' && /\[0-9\]|\\d/.test(pattern) && !/[A-Za-z]/.test(pattern.replace(/\\d/g, ''));
}

export function carriesDigits(type: string, allowed: string | undefined, pattern: unknown): boolean {
  return DIGIT_TYPES.has(type) || digitsOnly(allowed, pattern);
}

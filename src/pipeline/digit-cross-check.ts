import { digitsOnly } from '../fields/digit-scrutiny.js';
import { ocrFactor } from '../fields/scoring.js';
import type { Interpretation, TextReading } from '../fields/types.js';
import type { ReasonCode } from '../fields/reasons.js';
import type { DigitCombReading } from '../read/digit-comb.js';
import { round3 } from '../result/rounding.js';

/** Reason code: Tesseract and the digit reader read a digit comb differently (stable; listed in the README). The
 *  ambiguous_ prefix marks it, like the other ambiguity reasons, as review the evidence asks for, not a threshold. */
export const DIGIT_READERS_DISAGREE: ReasonCode = 'ambiguous_digit_readers';

/**
 * Tesseract's read of a digit comb counts as doubtful under this OCR factor (scoring.ts ocrFactor), and then the
 * digit reader's value is kept when the two disagree. On bench/digit-combs.ts (development half, seed 810001, 120
 * six-digit fields of MNIST test handwriting) no Tesseract read reached 0.8 (37 passed the pattern; of the 21 of
 * those above 0.5, 4 were right), so handwriting falls under it; 0.9 leaves room above for clean printed digits,
 * which were not measured here (common practice for "a confident OCR read").
 */
export const DOUBTFUL_OCR = 0.9;

/**
 * Whether a field is read digit by digit: a comb whose characters can only be digits (and separators), by the
 * type's allowed characters or, for free text, a schema pattern that names no letters (`^[0-9]{6}$`, `\d{5}`).
 */
export function isDigitComb(comb: boolean, allowed: string | undefined, pattern: unknown): boolean {
  return comb && digitsOnly(allowed, pattern);
}

export interface CrossChecked {
  reading: TextReading;
  interpretation: Interpretation;
  /** For the result's details: no field values. */
  details: { agree: boolean; kept: 'ocr' | 'digits'; digitConfidence: number; notDigits: number; doubtfulEmpty: number };
}

/** The digits of a text, in order, with '?' (a cell holding a non-digit) kept in its place. */
const digitsAndUnknowns = (text: string) => text.replace(/[^0-9?]/g, '');

/** Digit sequences that match, '?' (a cell holding a non-digit) matching any one character. */
function sameDigits(ocr: string, digits: string): boolean {
  const a = digitsAndUnknowns(ocr);
  const b = digitsAndUnknowns(digits);
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] && b[i] !== '?' && a[i] !== '?') return false;
  return true;
}

/**
 * Combine Tesseract's reading of a digit comb with the digit reader's (pure).
 * - Both give the same valid value: agreed; the reading with the stronger OCR factor is kept (two independent
 *   readers agreeing is worth at least the better one's confidence).
 * - Only one gives a valid value: when the other read nothing or a matching digit sequence, that one is kept; a
 *   different digit sequence is a disagreement.
 * - Different values, Tesseract's read doubtful (its OCR factor under DOUBTFUL_OCR, or its first read failed the
 *   type's checks, as on most handwriting): the digit reader's value is kept and its per-digit confidences decide.
 * - Different values, Tesseract confident: a real disagreement. Tesseract's value is kept for the reviewer and the
 *   field goes to review (outcome ambiguous) with reason ambiguous_digit_readers.
 * A digit reading with doubtful empty cells never counts as agreeing on its own.
 */
export function crossCheckDigits(
  ocr: { reading: TextReading; interpretation: Interpretation; firstAccepted: boolean | null },
  digits: DigitCombReading,
  interpret: (r: TextReading) => Interpretation,
): CrossChecked {
  const d = interpret(digits.reading);
  const t = ocr.interpretation;
  const base = { digitConfidence: round3(ocrFactor(digits.reading)), notDigits: digits.notDigits, doubtfulEmpty: digits.doubtfulEmpty };
  const keep = (which: 'ocr' | 'digits', agree: boolean): CrossChecked => {
    const reading = which === 'ocr' ? ocr.reading : digits.reading;
    const interp = which === 'ocr' ? t : d;
    const interpretation = agree
      ? interp
      : { ...interp, outcome: 'ambiguous' as const, reasons: [...interp.reasons, DIGIT_READERS_DISAGREE] };
    return { reading, interpretation, details: { ...base, agree, kept: which } };
  };
  const tValid = t.outcome === 'valid';
  const dValid = d.outcome === 'valid' && digits.doubtfulEmpty === 0;
  if (tValid && dValid) {
    if (JSON.stringify(t.value) === JSON.stringify(d.value)) {
      return keep(ocrFactor(digits.reading) > ocrFactor(ocr.reading) ? 'digits' : 'ocr', true);
    }
    // A doubtful Tesseract read is no second opinion (it read 31 % of handwritten test digits right, bench/digit-combs.ts):
    // the digit reader's value stands on its own per-digit confidence. A confident one disagreeing is a real doubt.
    if (ocrDoubtful(ocr)) return { ...keep('digits', true), details: { ...base, agree: false, kept: 'digits' } };
    return keep('ocr', false);
  }
  if (dValid) {
    // Tesseract read nothing usable: the digit reader's value stands unless Tesseract confidently saw other digits.
    const ocrDigits = digitsAndUnknowns(ocr.reading.text);
    const agree = ocrDigits.length === 0 || sameDigits(ocr.reading.text, digits.reading.text);
    return keep('digits', agree || ocrFactor(ocr.reading) < DOUBTFUL_OCR);
  }
  if (tValid) {
    const agree = d.outcome !== 'empty' && digits.doubtfulEmpty === 0 && sameDigits(ocr.reading.text, digits.reading.text);
    return keep('ocr', agree);
  }
  return { reading: ocr.reading, interpretation: t, details: { ...base, agree: false, kept: 'ocr' } };
}

/**
 * Whether a field's value is the digit reader's: kept from its cells, or the value both readers gave. Such a value's
 * reading factor is the digit reader's probabilities, which have a shipped confidence map of their own. `details` is
 * a read's (or a result field's) details, whose `digitCells` crossCheckDigits wrote.
 */
export function valueFromDigitCells(details: Record<string, unknown> | undefined): boolean {
  const cells = details?.digitCells as CrossChecked['details'] | undefined;
  return cells !== undefined && (cells.kept === 'digits' || cells.agree);
}

function ocrDoubtful(ocr: { reading: TextReading; firstAccepted: boolean | null }): boolean {
  return ocr.firstAccepted === false || ocrFactor(ocr.reading) < DOUBTFUL_OCR;
}


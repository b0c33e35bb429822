/**
 * Every reason code formglean writes into a field's `reasons`, with what it means and what a reviewer should check.
 * The single source: the README's table (tools/readme-reasons.ts), `formglean review reasons`, `review --help` and
 * the review page are all generated from it, and `ReasonCode` makes TypeScript refuse a code that is not listed.
 *
 * Adding a code: add one entry below (keep the group order), use it, then run `npm run docs:reasons` to rewrite
 * the README's table (test/fields/reasons.test.ts fails until the README is current).
 *
 * `effect` says what the code does to the status, because a reason alone does not send a field to review:
 *  - review: the field goes to review whatever its confidence;
 *  - invalid: the value fails its type's checks (status invalid);
 *  - missing: a required field has no value (status missing);
 *  - confidence: lowers the confidence; the field goes to review only if the confidence falls below its threshold,
 *    so accepted fields may carry it too;
 *  - correction: only in the message that refuses a reviewer's correction.
 */
export type ReasonEffect = 'review' | 'invalid' | 'missing' | 'confidence' | 'correction';

export interface ReasonInfo {
  effect: ReasonEffect;
  /** What happened, in plain words. */
  meaning: string;
  /** What the reviewer should look at on the crop. */
  check: string;
}

export const REASONS = {
  // Finding the field on the page.
  unknown_layout: {
    effect: 'review',
    meaning: 'The page fits none of the given schemas well; fields were read where the best one puts them.',
    check: 'Which form the page is: the queue asks this once per document (row "(layout)"); confirm the form named, type another form\'s name (extract --resume then reads it with that schema), or (none).',
  },
  page_not_aligned: {
    effect: 'review',
    meaning: 'The page could not be aligned to its layout (no fit, or a poor one), so its fields were not read: their places would be guesses.',
    check: 'The scan: a page of another form, a badly skewed or cut-off scan; type the values from the page.',
  },
  page_missing: {
    effect: 'review',
    meaning: 'The document has fewer pages than the schema; the field\'s page is not there.',
    check: 'Whether a page was left out of the scan.',
  },
  not_located: {
    effect: 'review',
    meaning: 'The entry area was found neither by the detector nor at its place in the schema.',
    check: 'The context crop or the scan: type the value, or "really blank".',
  },
  off_page: {
    effect: 'review',
    meaning: 'The entry area lies partly or wholly outside the scanned page (a page cut short, or a poor fit), so it was not read.',
    check: 'The scan: whether the entry is on the page at all; type the value, or scan the page again whole.',
  },
  not_read: {
    effect: 'review',
    meaning: 'The entry area was found but could not be read.',
    check: 'Type the value from the crop.',
  },
  region_fallback: {
    effect: 'confidence',
    meaning: 'The detector did not find this entry area; it was read where the schema puts it after aligning the page.',
    check: 'That the crop shows the right entry, not its neighbour or the printed label.',
  },
  low_detection_score: {
    effect: 'confidence',
    meaning: 'The detector was unsure this is an entry area.',
    check: 'That the crop shows the field.',
  },
  box_not_found: {
    effect: 'confidence',
    meaning: 'The printed outline of a checkbox was not found; the mark was measured in the expected place.',
    check: 'Whether the box is ticked.',
  },
  // Reading the text.
  low_ocr_confidence: {
    effect: 'confidence',
    meaning: 'The text recogniser was unsure of at least one word it read.',
    check: 'Every character of the value against the crop.',
  },
  repaired_digits: {
    effect: 'confidence',
    meaning: 'Letters read where the format wants digits were taken as the digits they resemble (O as 0, l as 1).',
    check: 'The digits against the crop.',
  },
  repaired_letters: {
    effect: 'confidence',
    meaning: 'Digits read inside a word were taken as the letters they resemble (0 as O, 1 as l, 5 as S).',
    check: 'The spelling against the crop.',
  },
  repaired_words: {
    effect: 'confidence',
    meaning: 'A word that is not English became one by letters OCR confuses (rn read as m, a g whose tail the field\'s edge cut read as a or q).',
    check: 'The spelling against the crop.',
  },
  ambiguous_digit_readers: {
    effect: 'review',
    meaning: 'Tesseract read a digit comb confidently, and the handwritten-digit reader read it as other digits.',
    check: 'Each digit against the crop.',
  },
  ambiguous_second_read: {
    effect: 'review',
    meaning: 'A handwritten value with digits (date, amount, postal code, phone, ID) that a second reader (the handwritten-digit reader, or OCR of a differently cleaned crop) read differently.',
    check: 'Each digit against the crop; a swapped or misread digit still makes a valid value.',
  },
  ambiguous_unread_writing: {
    effect: 'review',
    meaning: 'The recogniser read nothing, but there are pen strokes in the area.',
    check: 'Type what is written, or "really blank" if the strokes are not an entry.',
  },
  writing_past_edge: {
    effect: 'review',
    meaning: 'Pen or type runs on past the right edge of the text area (ink added over the blank form on both sides of the edge): the value read may be cut off.',
    check: 'The whole entry on the context crop; type it in full.',
  },
  below_review_threshold: {
    effect: 'review',
    meaning: 'No single problem, but the combined confidence is under the field\'s review threshold.',
    check: 'The value against the crop.',
  },
  required_empty: {
    effect: 'missing',
    meaning: 'The field is required and nothing was read in it.',
    check: 'Whether the form really leaves it blank.',
  },
  // The type's checks.
  format_mismatch: {
    effect: 'invalid',
    meaning: 'The date read matches none of the formats the field accepts.',
    check: 'The date on the crop; type it in an accepted format.',
  },
  invalid_date: {
    effect: 'invalid',
    meaning: 'The date read has the right shape but no such day exists (say 02/30).',
    check: 'Day and month on the crop.',
  },
  ambiguous_date_format: {
    effect: 'review',
    meaning: 'The date reads as two different days under two of the accepted formats (03/04 as March 4 or 3 April).',
    check: 'Which day is meant; type it as YYYY-MM-DD to be unambiguous.',
  },
  future_date: {
    effect: 'invalid',
    meaning: 'The date is after today and the field does not allow future dates.',
    check: 'The year and month.',
  },
  before_min_year: {
    effect: 'invalid',
    meaning: 'The date is earlier than the first year the field allows.',
    check: 'The year.',
  },
  invalid_phone: {
    effect: 'invalid',
    meaning: 'The text is not a valid phone number for the field\'s region.',
    check: 'The digits and the area code.',
  },
  phone_not_assigned: {
    effect: 'review',
    meaning: 'The phone number has a possible length for its region but lies in no assigned number range; it is kept as read.',
    check: 'The digits against the crop; confirm the number if it is written so.',
  },
  invalid_email: {
    effect: 'invalid',
    meaning: 'The text is not a valid e-mail address.',
    check: 'The @, the dots and the domain.',
  },
  invalid_number: {
    effect: 'invalid',
    meaning: 'The text is not a number in the field\'s notation.',
    check: 'The digits and the decimal mark.',
  },
  not_integer: {
    effect: 'invalid',
    meaning: 'The field takes whole numbers only, and the number read has a fraction.',
    check: 'Whether a stray mark was read as a decimal point.',
  },
  below_min: {
    effect: 'invalid',
    meaning: 'The number is below the smallest value the field allows.',
    check: 'The digits; a dropped digit is the usual cause.',
  },
  above_max: {
    effect: 'invalid',
    meaning: 'The number is above the largest value the field allows.',
    check: 'The digits; an extra digit is the usual cause.',
  },
  invalid_postal_code: {
    effect: 'invalid',
    meaning: 'The text is not a postal code of the field\'s country.',
    check: 'Each character against the crop.',
  },
  too_short: {
    effect: 'invalid',
    meaning: 'The text is shorter than the field allows.',
    check: 'Whether part of the entry was missed.',
  },
  too_long: {
    effect: 'invalid',
    meaning: 'The text is longer than the field allows.',
    check: 'Whether printed text or a neighbour was read with the entry.',
  },
  pattern_mismatch: {
    effect: 'invalid',
    meaning: 'The text does not have the shape the schema asks for.',
    check: 'Each character against the crop.',
  },
  shape_mismatch: {
    effect: 'invalid',
    meaning: 'The identifier read does not have as many digits as the field\'s shape (# for each digit) asks for.',
    check: 'Each digit against the crop; a dropped or doubled digit is the usual cause.',
  },
  not_a_choice: {
    effect: 'invalid',
    meaning: 'The text matches none of the field\'s choices.',
    check: 'Which choice is written; type it as listed.',
  },
  fuzzy_choice_match: {
    effect: 'confidence',
    meaning: 'The text was close to one choice but not equal to it; that choice was taken.',
    check: 'That the choice taken is the one written.',
  },
  ambiguous_choice: {
    effect: 'review',
    meaning: 'The text is as close, or nearly as close, to two or more choices.',
    check: 'Which choice is written.',
  },
  // Marks and signatures.
  ambiguous_mark: {
    effect: 'review',
    meaning: 'A box is partly filled: too much ink for empty, too little for a tick.',
    check: 'Whether the box is ticked, or a tick was crossed out.',
  },
  no_choice_marked: {
    effect: 'review',
    meaning: 'None of the boxes of a one-answer question is ticked.',
    check: 'Whether the question was really left unanswered.',
  },
  several_choices_marked: {
    effect: 'review',
    meaning: 'Several boxes are ticked where one answer is expected.',
    check: 'Which box is meant (a crossed-out tick counts as not ticked).',
  },
  faint_signature: {
    effect: 'confidence',
    meaning: 'There is little ink in the signature area.',
    check: 'Whether the form is signed.',
  },
  not_yes_or_no: {
    effect: 'correction',
    meaning: 'A correction for a checkbox or signature must be yes or no.',
    check: 'Type yes or no.',
  },
} as const satisfies Record<string, ReasonInfo>;

export type ReasonCode = keyof typeof REASONS;

/** Codes written by earlier versions, and the code that replaced each; records on disk keep the old spelling. */
export const RENAMED_REASONS: Readonly<Record<string, ReasonCode>> = {
  low_confidence: 'below_review_threshold',
};

/** What a code means, for codes of this version and renamed ones; undefined for a code nobody defined. */
export function reasonInfo(code: string): (ReasonInfo & { code: ReasonCode }) | undefined {
  const current = (code in REASONS ? code : RENAMED_REASONS[code]) as ReasonCode | undefined;
  return current === undefined ? undefined : { code: current, ...REASONS[current] };
}

export const EFFECT_WORDS: Record<ReasonEffect, string> = {
  review: 'always',
  invalid: 'yes (invalid)',
  missing: 'yes (missing)',
  confidence: 'if confidence < threshold',
  correction: 'correction refused',
};

/** One row per code, in table order. */
export function reasonRows(): ({ code: ReasonCode } & ReasonInfo)[] {
  return (Object.keys(REASONS) as ReasonCode[]).map((code) => ({ code, ...REASONS[code] }));
}

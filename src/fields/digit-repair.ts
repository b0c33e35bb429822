/**
 * Letters that OCR engines commonly return in place of digits (common practice in OCR post-correction, from
 * memory): O/o/Q/D for 0, I/l/i/|/! for 1, Z/z for 2, S/s for 5, G/b for 6, B for 8, g/q for 9. Applied only where a
 * field's format expects a digit, so a month name or a postcode letter is never touched.
 */
const DIGIT_FOR_LETTER: Readonly<Record<string, string>> = {
  O: '0', o: '0', Q: '0', D: '0',
  I: '1', l: '1', i: '1', '|': '1', '!': '1',
  Z: '2', z: '2',
  S: '5', s: '5',
  G: '6', b: '6',
  B: '8',
  g: '9', q: '9',
};

/** The reverse confusions, for positions that expect a letter (postcodes): 0→O, 1→I, 2→Z, 5→S, 6→G, 8→B. */
const LETTER_FOR_DIGIT: Readonly<Record<string, string>> = { '0': 'O', '1': 'I', '2': 'Z', '5': 'S', '6': 'G', '8': 'B' };

/** Characters (besides 0-9) that may stand for a digit; for building lenient patterns. */
export const DIGIT_LOOKALIKES = Object.keys(DIGIT_FOR_LETTER).join('');

/** A regex character class matching a digit or a letter OCR confuses with one. */
export const DIGITISH = `[0-9${DIGIT_LOOKALIKES.replace(/[|!]/g, '\\$&')}]`;

export interface Repaired {
  text: string;
  /** How many characters were changed. */
  repairs: number;
}

/** Map each character through a confusion table; `other` settles characters the table does not list. */
function substitute(s: string, table: Readonly<Record<string, string>>, other: (c: string) => string): Repaired {
  let repairs = 0;
  let text = '';
  for (const ch of s) {
    const r = table[ch];
    if (r !== undefined) repairs++;
    text += r ?? other(ch);
  }
  return { text, repairs };
}

/** Replace look-alike letters by digits; characters that are neither digits nor look-alikes are left as they are. */
export function repairDigits(s: string): Repaired {
  return substitute(s, DIGIT_FOR_LETTER, (c) => c);
}

/** Replace look-alike digits by upper-case letters (for positions that must hold a letter). */
export function repairLetters(s: string): Repaired {
  return substitute(s, LETTER_FOR_DIGIT, (c) => c.toUpperCase());
}

/**
 * Confidence left after n character repairs: each repair keeps 85 % (common practice; chosen so that one repair
 * alone keeps a field above the default review threshold 0.75 and two repairs send it to review).
 */
export function repairPenalty(repairs: number): number {
  return Math.pow(0.85, repairs);
}

/** Digits OCR puts in place of letters inside words, with the letter at a word's start and inside it. */
const LETTER_IN_WORD: Readonly<Record<string, [string, string]>> = { '0': ['O', 'o'], '1': ['I', 'l'], '5': ['S', 's'] };

/**
 * Free text: a word of letters holding one stray 0, 1 or 5 ("0ld", "Sm1th") had that digit read for a letter
 * (common practice in OCR post-correction, from memory). Only words of three or more letters (or a leading digit
 * before two or more lower-case ones) with at least two lower-case letters and a single digit are touched, so codes
 * ("B12", "A1K", "k1a"), numbers and ordinals ("1st", "5th") stay as read.
 */
export function repairWordLetters(s: string): Repaired {
  let repairs = 0;
  const text = s.replace(/[\p{L}0-9]+/gu, (word) => {
    const digits = word.replace(/\D/g, '');
    const lower = (word.match(/\p{Ll}/gu) ?? []).length;
    if (digits.length !== 1 || lower < 2 || !(digits in LETTER_IN_WORD) || /^\d+(st|nd|rd|th)$/i.test(word)) return word;
    const i = word.search(/\d/);
    // Three letters at least, or a capital's place before two lower-case ones ("0ld"): "k1a" may be a code.
    if (word.length - 1 < 3 && !(i === 0 && /^\d\p{Ll}+$/u.test(word))) return word;
    repairs++;
    const [start, inside] = LETTER_IN_WORD[digits];
    return word.slice(0, i) + (i === 0 ? start : inside) + word.slice(i + 1);
  });
  return { text, repairs };
}

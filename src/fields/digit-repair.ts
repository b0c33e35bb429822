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

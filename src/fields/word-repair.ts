import { createRequire } from 'node:module';
import type { Repaired } from './digit-repair.js';

/**
 * Letter shapes OCR confuses, as [what was read, what may have been written]. A word that is not English but becomes
 * an English word by one or two of these is taken as that word.
 *  - "rn" and "m": two narrow letters that touch at print size read as one ("moming"), and back (common practice in
 *    OCR post-correction, from memory; seen on the real-form bench's development half, fec-f3x-sa-2016, typed fill).
 *  - "a" or "q" for "g", "v" for "y": a descender cut off where a fillable PDF's field ends (the viewer clips the
 *    text at the widget's edge, so the page itself lacks the tail): "side gate" read "side aate", "Allergic" read
 *    "Alleraic" and "Allerqic" (bench/real-forms.ts --half dev, fec-f3x-sa-2016); "v" for a clipped "y" by the same
 *    shape (common practice).
 *  - "cl" and "d": the same merge as rn/m for a round letter (common practice, from memory).
 */
const CONFUSIONS: readonly (readonly [string, string])[] = [
  ['rn', 'm'],
  ['m', 'rn'],
  ['a', 'g'],
  ['q', 'g'],
  ['v', 'y'],
  ['cl', 'd'],
  ['d', 'cl'],
];

/** At most this many confusions in one word: more and almost any string reaches some English word. */
const MAX_EDITS = 2;
/** Words shorter than this are left as read: short words are codes, initials and abbreviations as often as words. */
const MIN_LENGTH = 4;

let lexicon: Set<string> | null = null;

/**
 * English words, lower case: the Letterpress list (~275 000 words, plural and inflected forms included) of the npm
 * package an-array-of-english-words (MIT). Loaded on first use (about 3 MB), never for forms without free text.
 */
export function englishWords(): Set<string> {
  if (!lexicon) {
    const require = createRequire(import.meta.url);
    lexicon = new Set(require('an-array-of-english-words') as string[]);
  }
  return lexicon;
}

/** Every spelling reachable from `word` (lower case) by 1..MAX_EDITS confusions at different places, with the fewest
 *  confusions that reach it. */
function variants(word: string): Map<string, number> {
  const out = new Map<string, number>();
  const walk = (w: string, from: number, edits: number): void => {
    if (edits > 0 && !(out.get(w)! <= edits)) out.set(w, edits);
    if (edits === MAX_EDITS) return;
    for (const [read, meant] of CONFUSIONS) {
      for (let i = w.indexOf(read, from); i >= 0; i = w.indexOf(read, i + 1)) {
        walk(w.slice(0, i) + meant + w.slice(i + read.length), i + meant.length, edits + 1);
      }
    }
  };
  walk(word, 0, 0);
  return out;
}

/**
 * Free text: each word of lower-case letters (or one capital then lower case) of MIN_LENGTH letters or more that is
 * not an English word, and that exactly one English word reaches by CONFUSIONS, is replaced by that word (its
 * capital kept). Names and made-up words stay as read unless a confusion turns them into a word; a word two
 * candidates reach stays as read. Capitals-only words (codes, abbreviations) are not touched.
 */
export function repairConfusedWords(s: string): Repaired {
  let repairs = 0;
  const words = /[A-Za-z]+/g;
  const text = s.replace(words, (word) => {
    if (word.length < MIN_LENGTH || !/^[A-Za-z][a-z]+$/.test(word)) return word;
    const lower = word.toLowerCase();
    const known = englishWords();
    if (known.has(lower)) return word;
    const found = [...variants(lower)].filter(([v]) => known.has(v));
    if (found.length !== 1) return word;
    const [spelling, edits] = found[0];
    repairs += edits;
    return word[0] === lower[0] ? spelling : spelling[0].toUpperCase() + spelling.slice(1);
  });
  return { text, repairs };
}

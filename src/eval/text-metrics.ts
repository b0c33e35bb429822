import { distance } from 'fastest-levenshtein';

/** A normalized field value as results and truth files carry it. */
export type ComparableValue = string | number | boolean | string[] | null | undefined;

/**
 * Empty in the sense of "nothing entered on the form": null, an empty or blank string, or an empty list
 * (a multiple-choice group with no box ticked). Results and truth may spell emptiness differently.
 */
export function isEmptyValue(v: ComparableValue): boolean {
  if (v === null || v === undefined) return true;
  if (typeof v === 'string') return v.trim() === '';
  if (Array.isArray(v)) return v.length === 0;
  return false;
}

/**
 * Exact match of two normalized values. Strings compare as written (normalization is the tool's job, so a case
 * or spacing difference is an error); numbers compare with a relative tolerance of 1e-9 so that 12.3 parsed
 * two ways still matches; a multiple-choice list compares as a set (the order boxes are read in carries no
 * meaning).
 */
export function valuesEqual(result: ComparableValue, truth: ComparableValue): boolean {
  if (isEmptyValue(result) || isEmptyValue(truth)) return isEmptyValue(result) && isEmptyValue(truth);
  if (Array.isArray(result) || Array.isArray(truth)) {
    if (!Array.isArray(result) || !Array.isArray(truth)) return false;
    const a = new Set(result);
    const b = new Set(truth);
    return a.size === b.size && [...a].every((x) => b.has(x));
  }
  if (typeof result === 'number' && typeof truth === 'number') {
    return Math.abs(result - truth) <= 1e-9 * Math.max(1, Math.abs(result), Math.abs(truth));
  }
  return result === truth;
}

/** Edits (insertions, deletions, substitutions; Levenshtein 1966) and reference length of one string pair. */
export interface EditCount {
  edits: number;
  referenceLength: number;
}

/** Levenshtein distance from hypothesis to reference, counted in Unicode code points. */
export function editCount(hypothesis: string, reference: string): EditCount {
  // fastest-levenshtein works on UTF-16 units; mapping each code point to one BMP character keeps an accented
  // or astral character from counting as two edits.
  const codes = new Map<string, string>();
  const toUnits = (s: string): string =>
    Array.from(s, (ch) => {
      let u = codes.get(ch);
      if (u === undefined) {
        u = String.fromCharCode(0xe000 + codes.size); // Private Use Area: never in the input after mapping
        codes.set(ch, u);
      }
      return u;
    }).join('');
  const h = toUnits(hypothesis);
  const r = toUnits(reference);
  return { edits: distance(h, r), referenceLength: r.length };
}

/** Character error rate of one pair: edits / reference length; null when the reference is empty. */
export function characterErrorRate(hypothesis: string, reference: string): number | null {
  const { edits, referenceLength } = editCount(hypothesis, reference);
  return referenceLength > 0 ? edits / referenceLength : null;
}

/**
 * Corpus character error rate: total edits over total reference characters (the usual way OCR and speech
 * evaluations pool many lines, so long fields weigh more than short ones); null when there is no reference text.
 */
export function pooledErrorRate(counts: readonly EditCount[]): number | null {
  let edits = 0;
  let length = 0;
  for (const c of counts) {
    edits += c.edits;
    length += c.referenceLength;
  }
  return length > 0 ? edits / length : null;
}

/** The text a value reads as, for character error rates; null for values that are not text. */
export function valueText(v: ComparableValue): string | null {
  if (v === null || v === undefined) return '';
  if (typeof v === 'string') return v;
  return null;
}

import { describe, expect, it } from 'vitest';
import {
  characterErrorRate,
  editCount,
  isEmptyValue,
  pooledErrorRate,
  valuesEqual,
} from '../../src/eval/text-metrics.js';

describe('character error rate', () => {
  it('counts the classic kitten/sitting example as 3 edits', () => {
    // Source: the standard example of Levenshtein distance (Wikipedia, "Levenshtein distance", from memory):
    // kitten -> sitten (k->s), sitten -> sittin (e->i), sittin -> sitting (insert g) = 3 edits.
    expect(editCount('sitting', 'kitten')).toEqual({ edits: 3, referenceLength: 6 });
    expect(characterErrorRate('sitting', 'kitten')).toBe(3 / 6);
  });

  it('matches a hand-computed form-field example', () => {
    // Worked by hand: reference "Maple Street" (12 characters incl. the space), OCR read "Mapie Stret":
    // l->i is one substitution, the second "e" of "Street" is one deletion; nothing else differs. CER = 2/12.
    expect(editCount('Mapie Stret', 'Maple Street')).toEqual({ edits: 2, referenceLength: 12 });
    expect(characterErrorRate('Mapie Stret', 'Maple Street')).toBeCloseTo(2 / 12, 12);
  });

  it('pools edits over reference characters across fields', () => {
    // Hand computation: (3 + 2 + 0) edits over (6 + 12 + 10) reference characters = 5/28; corpus-level CER is the
    // usual pooling in OCR evaluation (common practice).
    const pooled = pooledErrorRate([
      editCount('sitting', 'kitten'),
      editCount('Mapie Stret', 'Maple Street'),
      editCount('2024-03-07', '2024-03-07'),
    ]);
    expect(pooled).toBeCloseTo(5 / 28, 12);
    expect(pooledErrorRate([])).toBeNull();
  });

  it('counts an accented letter as one character, and an empty reference has no rate', () => {
    // Hand computation: "Muller" vs "Müller" differs in one letter (u vs ü, U+00FC): 1 edit over 6 characters.
    expect(editCount('Muller', 'Müller')).toEqual({ edits: 1, referenceLength: 6 });
    // Astral characters (here U+1D400, 2 UTF-16 units) still count once: hand computation, 1 edit over 3.
    expect(editCount('a\u{1D400}c', 'abc')).toEqual({ edits: 1, referenceLength: 3 });
    expect(characterErrorRate('x', '')).toBeNull();
  });
});

describe('exact match of normalized values', () => {
  it('follows a hand-made table of value pairs', () => {
    // Each row decided by hand from the normalized forms the results contract gives (ISO 8601 dates, E.164 phones).
    expect(valuesEqual('2024-03-07', '2024-03-07')).toBe(true);
    expect(valuesEqual('2024-03-07', '2024-07-03')).toBe(false); // day and month swapped
    expect(valuesEqual('+12075550142', '+12075550124')).toBe(false); // two digits transposed
    expect(valuesEqual(12.5, 12.5)).toBe(true);
    expect(valuesEqual(0.1 + 0.2, 0.3)).toBe(true); // same number reached two ways
    expect(valuesEqual(12, 13)).toBe(false);
    expect(valuesEqual('12', 12)).toBe(false); // a number field must give a number
    expect(valuesEqual(true, true)).toBe(true);
    expect(valuesEqual(false, null)).toBe(false); // an unread checkbox is not an unticked one
    expect(valuesEqual(['dock', 'power'], ['power', 'dock'])).toBe(true); // multiple choice is a set
    expect(valuesEqual(['dock'], ['power', 'dock'])).toBe(false);
    expect(valuesEqual('Ada', 'ada')).toBe(false); // case is the tool's normalization job
    expect(valuesEqual(null, '')).toBe(true);
    expect(valuesEqual([], null)).toBe(true);
    expect(isEmptyValue('  ')).toBe(true);
  });
});

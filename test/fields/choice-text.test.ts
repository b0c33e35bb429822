import { describe, expect, it } from 'vitest';
import { distance } from 'fastest-levenshtein';
import { defaultMaxDistance } from '../../src/fields/choice_text.js';
import { readAs } from './context.js';

// USPS two-letter abbreviations of the New England states (USPS Publication 28, Appendix B, from memory).
const NEW_ENGLAND = { choices: ['CT', 'ME', 'MA', 'NH', 'RI', 'VT'] };

describe('choice_text', () => {
  it('keeps an exact match, ignoring case, spaces and punctuation', () => {
    expect(readAs('choice_text', 'me', NEW_ENGLAND).value).toBe('ME');
    expect(readAs('choice_text', 'N.H.', NEW_ENGLAND).value).toBe('NH');
  });

  it('accepts one OCR slip on a two-letter code when only one code is that close', () => {
    // Levenshtein distance (V. Levenshtein 1966) as computed by fastest-levenshtein: "V7" → "VT" is one substitution
    // (T read as 7, a common OCR confusion), every other code is two edits away.
    expect(distance('V7', 'VT')).toBe(1);
    expect(distance('V7', 'CT')).toBe(2);
    const r = readAs('choice_text', 'V7', NEW_ENGLAND);
    expect(r.value).toBe('VT');
    expect(r.reasons).toEqual(['fuzzy_choice_match']);
    expect(r.confidence).toBeLessThan(1);
  });

  it('calls a fuzzy match ambiguous when the next choice is not twice as far (a clipped district name)', () => {
    // Levenshtein distances as fastest-levenshtein computes them, on the compared forms (no case, spaces or
    // punctuation): the clipped read is 3 edits from Maine and 4 from Montana, the district actually typed.
    const districts = { choices: ['District of Maine', 'District of Montana', 'District of Nevada'] };
    expect(distance('DISTRICTOFMON', 'DISTRICTOFMAINE')).toBe(3);
    expect(distance('DISTRICTOFMON', 'DISTRICTOFMONTANA')).toBe(4);
    const r = readAs('choice_text', 'District of Mon', districts);
    expect(r.outcome).toBe('ambiguous');
    expect(r.reasons).toEqual(['ambiguous_choice']);
    // One slip with every other district far off still matches.
    expect(readAs('choice_text', 'District of Nevda', districts).value).toBe('District of Nevada');
  });

  it('calls a text equally close to two choices ambiguous', () => {
    // "MH" is one edit from ME, MA and NH.
    const r = readAs('choice_text', 'MH', NEW_ENGLAND);
    expect(r.outcome).toBe('ambiguous');
    expect(r.reasons).toEqual(['ambiguous_choice']);
  });

  it('rejects texts beyond the edit threshold', () => {
    expect(readAs('choice_text', 'TX', NEW_ENGLAND).reasons).toEqual(['not_a_choice']);
    expect(readAs('choice_text', 'Boarding', { choices: ['Grooming', 'Surgery'], maxDistance: 2 }).outcome).toBe('invalid');
  });

  it('scales the default threshold with the choice length', () => {
    expect(defaultMaxDistance('ME')).toBe(1);
    expect(defaultMaxDistance('Annual checkup')).toBe(3);
    expect(readAs('choice_text', 'Anual chekup', { choices: ['Annual checkup', 'Vaccination'] }).value).toBe('Annual checkup');
  });
});

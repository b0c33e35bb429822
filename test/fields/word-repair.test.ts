import { describe, expect, it } from 'vitest';
import { englishWords, repairConfusedWords } from '../../src/fields/word-repair.js';
import { textField } from '../../src/fields/text.js';

const ctx = { today: new Date('2026-12-02') };
const text = (s: string) => textField.interpret({ kind: 'text', text: s, words: [], confidence: 0.9 }, textField.options.parse({}), ctx);

describe('repairConfusedWords', () => {
  it('knows English words, inflected forms included', () => {
    // The Letterpress list (an-array-of-english-words) holds inflected forms: "appointments", "prefers".
    for (const w of ['gate', 'morning', 'allergic', 'appointments', 'prefers', 'yard']) expect(englishWords().has(w), w).toBe(true);
  });

  it('takes the English word one confusion away from a non-word', () => {
    expect(repairConfusedWords('Prefers moming appointments.')).toEqual({ text: 'Prefers morning appointments.', repairs: 1 });
    expect(repairConfusedWords('Please use the side aate.').text).toBe('Please use the side gate.');
    expect(repairConfusedWords('Alleraic to chicken').text).toBe('Allergic to chicken');
    expect(repairConfusedWords('Allerqic').text).toBe('Allergic');
    expect(repairConfusedWords('Harbor Vard').text).toBe('Harbor Yard');
  });

  it('leaves English words, names no confusion turns into a word, short words and capitals as read', () => {
    for (const s of ['Jasper Gillamor', 'Glenmarow', 'Stillwater', 'Cedar Bend', 'Apt 4B', 'MDMA', 'Mom', 'modern barn']) {
      expect(repairConfusedWords(s), s).toEqual({ text: s, repairs: 0 });
    }
  });

  it('counts the repair against the text field\'s confidence with its own reason', () => {
    const got = text('Prefers moming appointments.');
    expect(got.value).toBe('Prefers morning appointments.');
    expect(got.reasons).toContain('repaired_words');
    expect(got.confidence).toBeCloseTo(0.85);
    // A pattern says the value is a code: no word is repaired.
    const code = textField.interpret({ kind: 'text', text: 'moming', words: [], confidence: 0.9 }, textField.options.parse({ pattern: '[a-z]+' }), ctx);
    expect(code.value).toBe('moming');
  });
});

import { afterAll, describe, expect, it } from 'vitest';
import { distance } from 'fastest-levenshtein';
import { renderCell } from './render-cell.js';
import { readTextField } from '../../src/read/read-text.js';
import { closeSharedOcrEngine } from '../../src/read/ocr-engine.js';
import { ADAPTIVE, STANDARD } from '../../src/read/variants.js';

afterAll(closeSharedOcrEngine);

// Invented values: fictional names, NANP fictional range 555-0100..0199, example.org mail.
const VALUES = [
  'Rosalind Featherstone',
  '04/17/2019',
  '(207) 555-0142',
  'pip.marlow@example.org',
  '1187 Larkspur Lane',
  'Biscuit the Beagle',
];

describe('readTextField on rendered typed cells (real tesseract.js)', () => {
  it('reaches character error rate <= 2 % on clean typed crops with a label and a cell border', async () => {
    let errors = 0;
    let chars = 0;
    for (const value of VALUES) {
      const { page, box } = await renderCell({ value, label: 'Owner details' });
      const { reading } = await readTextField(page, box, { padding: 6, mode: 'line' });
      errors += distance(reading.text, value);
      chars += value.length;
    }
    // CER = Levenshtein edit distance (insertions + deletions + substitutions; V. I. Levenshtein, 1966) divided by
    // the reference length, the character error rate of OCR evaluation (S. V. Rice et al., "The Fifth Annual Test
    // of OCR Accuracy", UNLV ISRI TR-96-01, 1996, states accuracy as (n - errors) / n; from memory).
    expect(errors / chars).toBeLessThanOrEqual(0.02);
  });

  it('reads comb fields with their separators removed', async () => {
    const value = '04101';
    const { page, box } = await renderCell({ value, comb: 5, fontSize: 30 });
    const { reading } = await readTextField(page, box, { padding: 6, comb: true, allowed: '0123456789' });
    // Exact match: five printed digits on clean paper (CER definition as above: zero edits).
    expect(reading.text.replace(/\s/g, '')).toBe(value);
  });

  it('tries the second variant when the first reading is rejected and records both attempts', async () => {
    const value = '555-0177';
    const { page, box } = await renderCell({ value });
    const seen: string[] = [];
    const { reading, attempts } = await readTextField(page, box, {
      variants: [STANDARD, ADAPTIVE],
      // Rejects the first reading whatever it says, accepts the second if it is the printed value.
      accept: (r) => {
        seen.push(r.variant ?? '');
        return seen.length > 1 && r.text === value;
      },
    });
    expect(attempts.map((a) => [a.variant, a.accepted])).toEqual([
      ['standard', false],
      ['adaptive', true],
    ]);
    expect(reading.variant).toBe('adaptive');
    expect(reading.text).toBe(value);
  });
});

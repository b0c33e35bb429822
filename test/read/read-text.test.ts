import { afterAll, describe, expect, it } from 'vitest';
import { distance } from 'fastest-levenshtein';
import { renderCell } from './render-cell.js';
import { readTextField, readVariant } from '../../src/read/read-text.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { ADAPTIVE, COMB_CELLS, STANDARD } from '../../src/read/variants.js';
import { cropField } from '../../src/read/crop.js';
import { binarizeOtsu } from '../../src/image/otsu.js';
import { removeRuledLines } from '../../src/read/cleanup/line-removal.js';
import { ruleLengths } from '../../src/read/cleanup/pipeline.js';
import { combCells, joinCells } from '../../src/read/comb-cells.js';

const ocr = new OcrEngine();
afterAll(() => ocr.close());

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
      const { reading } = await readTextField(page, box, { engine: ocr, padding: 6, mode: 'line' });
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
    const { reading } = await readTextField(page, box, { engine: ocr, padding: 6, comb: true, allowed: '0123456789' });
    // Exact match: five printed digits on clean paper (CER definition as above: zero edits).
    expect(reading.text.replace(/\s/g, '')).toBe(value);
  });

  it('tries the second variant when the first reading is rejected and records both attempts', async () => {
    const value = '555-0177';
    const { page, box } = await renderCell({ value });
    const seen: string[] = [];
    const { reading, attempts } = await readTextField(page, box, { engine: ocr,
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

describe('comb fields cell by cell', () => {
  it('finds the printed cells and reads one character per cell, an empty cell as a space', async () => {
    // Canadian postal code layout "K1A 0B1" (Canada Post: letter digit letter, space, digit letter digit; from memory)
    // written in a 7-cell comb with the middle cell left empty.
    const { page, box } = await renderCell({ value: 'K1A 0B1', comb: 7, fontSize: 30 });
    const crop = cropField(page, box, 6);
    const bin = binarizeOtsu(crop.image);
    const { vertical } = removeRuledLines(bin, ruleLengths({ comb: true }, crop.inner));
    const cells = combCells(vertical, bin.width, crop.inner);
    expect(cells.length).toBe(7);
    const r = await readVariant(crop, COMB_CELLS, { engine: ocr, comb: true, allowed: 'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789' });
    expect(r.text).toBe('K1A 0B1');
  });

  it('joins cells with one space for empty cells between characters', () => {
    // Definition of the comb join used by readCells (common practice for character boxes).
    expect(joinCells([null, 'A', 'B', null, null, 'C', null])).toBe('AB C');
  });
});

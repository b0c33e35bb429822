import { describe, expect, it } from 'vitest';
import { chooseCalibration, DEFAULT_REVIEW_THRESHOLD, DefaultConfidence, SHIPPED_CONFIDENCE } from '../../src/fields/default-confidence.js';
import { applyConfidenceMap } from '../../src/fields/confidence-map.js';
import { FieldResult } from '../../src/result/document.js';
import { FormSchema } from '../../src/schema/definition.js';
import { scoreField } from '../../src/fields/scoring.js';
import type { Interpretation, TextReading } from '../../src/fields/types.js';

const table: DefaultConfidence = {
  note: 'test table',
  targetError: { printed: 0.005, handwritten: 0.01 },
  factorWeights: { printed: { location: 0, ocr: 2, value: 1, legibility: 1, checks: 1 } },
  maps: {
    'printed/date': { points: [[0, 0.2], [0.8, 0.999]], threshold: 0.99, samples: 100, errors: 3 },
    'handwritten/*': { points: [[0, 0.1], [0.9, 0.995]], threshold: 0.99, samples: 100, errors: 30 },
  },
};

describe('shipped confidence maps per type and script', () => {
  it('the shipped table parses and every map is nondecreasing', () => {
    expect(DefaultConfidence.safeParse(SHIPPED_CONFIDENCE).success).toBe(true);
  });

  it('no shipped level claims accuracy 1: each was fitted on a few hundred fields at most', () => {
    // Levels are shrunk by a Beta prior (src/eval/calibration.ts smoothIsotonic): k of n right with no error seen
    // still states less than 1 (Laplace's rule of succession is the case prior 1/2, strength 2).
    for (const [key, m] of Object.entries(SHIPPED_CONFIDENCE.maps)) {
      for (const [, level] of m.points) expect(level, key).toBeLessThan(1);
    }
  });

  it('takes the type and script map, else the script pool, else none', () => {
    const printedDate = chooseCalibration({ type: 'date' }, 'printed', undefined, table);
    expect(printedDate.from).toBe('shipped');
    expect(printedDate.threshold).toBe(0.99);
    expect(applyConfidenceMap(printedDate.map!, 0.85)).toBe(0.999);
    const handDate = chooseCalibration({ type: 'date' }, 'handwritten', undefined, table);
    expect(handDate.map).toEqual(table.maps['handwritten/*'].points);
    const printedText = chooseCalibration({ type: 'text' }, 'printed', undefined, table);
    expect(printedText).toEqual({ threshold: DEFAULT_REVIEW_THRESHOLD, from: 'none' });
  });

  it("a comb value the digit reader gave is scored with the digit reader's map, before its type's or the pool", () => {
    const withDigits: DefaultConfidence = { ...table, maps: { ...table.maps, 'handwritten/digit_cells': { points: [[0, 0.3], [0.93, 0.991]], threshold: 0.991, samples: 300, errors: 24 } } };
    const digits = chooseCalibration({ type: 'number', reader: 'digit_cells' }, 'handwritten', undefined, withDigits);
    expect(digits.map).toEqual(withDigits.maps['handwritten/digit_cells'].points);
    expect(digits.threshold).toBe(0.991);
    // Tesseract's value, or a printed entry (no printed digit map): the type's or the pool's map as before.
    expect(chooseCalibration({ type: 'number' }, 'handwritten', undefined, withDigits).map).toEqual(table.maps['handwritten/*'].points);
    expect(chooseCalibration({ type: 'date', reader: 'digit_cells' }, 'printed', undefined, withDigits).map).toEqual(table.maps['printed/date'].points);
    // The shipped table has one (bench/fit-digit-confidence.ts), for the handwritten target of 1 % wrong among accepted.
    expect(SHIPPED_CONFIDENCE.maps['handwritten/digit_cells']).toBeDefined();
  });

  it('a shipped map reads the weighted product; scores.raw stays the plain product calibrate fits on', () => {
    const choice = chooseCalibration({ type: 'date' }, 'printed', undefined, table);
    expect(choice.factorWeights).toEqual(table.factorWeights!.printed);
    const reading: TextReading = { kind: 'text', text: '03/14/2024', words: [{ text: '03/14/2024', confidence: 0.9 }], confidence: 0.9 };
    const interpretation: Interpretation = { value: '2024-03-14', outcome: 'valid', confidence: 1, reasons: [] };
    const s = scoreField({
      detectionScore: 0.5,
      source: 'detection',
      reading,
      interpretation,
      reviewThreshold: choice.threshold,
      required: false,
      confidenceMap: choice.map,
      factorWeights: choice.factorWeights,
    });
    // location 0.8 + 0.2 x 0.5 = 0.9 (scoring.ts), OCR 0.9: plain product 0.81; weighted: 0.9^0 x 0.9^2 = 0.81 too,
    // but a weaker detection no longer lowers it.
    expect(s.scores.raw).toBe(0.81);
    expect(s.scores.weighted).toBe(0.81);
    const weak = scoreField({ detectionScore: 0, source: 'detection', reading, interpretation, reviewThreshold: choice.threshold, required: false, confidenceMap: choice.map, factorWeights: choice.factorWeights });
    expect(weak.scores.raw).toBe(0.72);
    expect(weak.scores.weighted).toBe(0.81);
    expect(weak.confidence).toBe(0.999);
    expect(weak.status).toBe('accepted');
  });

  it("a field's own map wins; a threshold the schema sets applies to the mapped confidence", () => {
    const own = chooseCalibration({ type: 'date', confidenceMap: [[0, 0.5]], reviewThreshold: 0.9 }, 'printed', 0.8, table);
    expect(own).toEqual({ map: [[0, 0.5]], threshold: 0.9, from: 'field' });
    const schemaWide = chooseCalibration({ type: 'date' }, 'printed', 0.95, table);
    expect(schemaWide.from).toBe('shipped');
    expect(schemaWide.threshold).toBe(0.95);
  });

  it('a schema without defaults.reviewThreshold leaves it to the shipped table', () => {
    const schema = FormSchema.parse({
      form: { name: 'marina slip', version: '1' },
      pages: [{ width: 100, height: 100 }],
      fields: [{ name: 'arrival', type: 'date', class: 'text_field', region: [1, 1, 10, 10] }],
    });
    expect(schema.defaults.reviewThreshold).toBeUndefined();
    expect(schema.defaults.padding).toBe(4);
  });

  it('a record written before the script decision still parses (result JSON stays backwards compatible)', () => {
    const old = { name: 'arrival', type: 'date', page: 0, value: '2024-03-14', raw: '03/14/2024', status: 'accepted', confidence: 0.97, reasons: [], box: null, source: 'region', scores: { location: 1 } };
    expect(FieldResult.safeParse(old).success).toBe(true);
    expect(FieldResult.safeParse({ ...old, script: 'handwritten', scriptEvidence: 0.93, calibration: 'shipped' }).success).toBe(true);
    expect(FieldResult.safeParse({ ...old, script: 'cursive' }).success).toBe(false);
  });
});

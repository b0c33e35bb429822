import { describe, expect, it } from 'vitest';
import { applyConfidenceMap } from '../../src/fields/confidence-map.js';
import { legibilityFactors, LEGIBILITY_KNEE } from '../../src/fields/legibility.js';
import { scoreField, ocrFactor, locationFactor } from '../../src/fields/scoring.js';
import type { Reading } from '../../src/fields/types.js';
import { readAs } from './context.js';

const text = (words: [string, number][]): Reading => ({
  kind: 'text',
  text: words.map((w) => w[0]).join(' '),
  words: words.map(([t, c]) => ({ text: t, confidence: c })),
  confidence: words.reduce((a, w) => a + w[1], 0) / Math.max(1, words.length),
});
const base = { reviewThreshold: 0.75, required: false };

describe('scoreField', () => {
  it('accepts a clean read from a confident detection', () => {
    const reading = text([['03/15/2024', 0.94]]);
    const s = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading, interpretation: readAs('date', '03/15/2024', { formats: ['MM/DD/YYYY'] }) });
    expect(s.status).toBe('accepted');
    expect(s.confidence).toBeGreaterThan(0.85);
    expect(s.reasons).toEqual([]);
    expect(s.scores).toMatchObject({ detection: 0.9, ocr: 0.94, value: 1 });
  });

  it('lets the weakest OCR word count most', () => {
    // Mean confidence 0.83 but one word at 0.5: the field goes to review.
    const reading = text([['Juniper', 0.99], ['Ashgrove', 0.5], ['Lane', 0.99]]);
    expect(ocrFactor(reading)).toBeCloseTo(0.6 * 0.5 + 0.4 * (2.48 / 3), 6);
    const s = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading, interpretation: readAs('text', reading.kind === 'text' ? reading.text : '') });
    expect(s.status).toBe('review');
    expect(s.reasons).toContain('low_ocr_confidence');
  });

  it('lowers confidence for each digit repair and names the reason', () => {
    const reading = text([['O3/l5/2O24', 0.92]]);
    const interp = readAs('date', 'O3/l5/2O24', { formats: ['MM/DD/YYYY'] });
    const s = scoreField({ ...base, detectionScore: 0.8, source: 'detection', reading, interpretation: interp });
    expect(s.status).toBe('review');
    expect(s.reasons).toContain('repaired_digits');
  });

  it('marks region fallback and low detection scores', () => {
    const reading = text([['Ashgrove', 0.95]]);
    const interp = readAs('text', 'Ashgrove');
    const region = scoreField({ ...base, detectionScore: null, source: 'region', reading, interpretation: interp });
    expect(region.reasons).toContain('region_fallback');
    expect(region.scores.location).toBe(0.85);
    const weak = scoreField({ ...base, detectionScore: 0.2, source: 'detection', reading, interpretation: interp });
    expect(weak.reasons).toContain('low_detection_score');
    expect(locationFactor('detection', 0.2)).toBeLessThan(locationFactor('detection', 0.9));
  });

  it('gives invalid for failed checks, review for ambiguity, missing for a required blank', () => {
    const inv = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading: text([['02/30/2024', 0.95]]), interpretation: readAs('date', '02/30/2024', { formats: ['MM/DD/YYYY'] }) });
    expect(inv.status).toBe('invalid');
    expect(inv.reasons).toContain('invalid_date');
    const amb = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading: { kind: 'marks', marks: [{ key: 'x', fillRatio: 0.07, boxFound: true }] }, interpretation: { value: null, outcome: 'ambiguous', confidence: 0.5, reasons: ['ambiguous_mark'] } });
    expect(amb.status).toBe('review');
    expect(amb.reasons).toContain('ambiguous_mark');
    const blank = text([]);
    const miss = scoreField({ ...base, required: true, detectionScore: 0.9, source: 'detection', reading: blank, interpretation: readAs('text', '') });
    expect(miss.status).toBe('missing');
    const optional = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading: blank, interpretation: readAs('text', '') });
    expect(optional.status).toBe('accepted');
    const notFound = scoreField({ ...base, required: true, detectionScore: null, source: 'none', reading: null, interpretation: null });
    expect(notFound).toMatchObject({ status: 'missing', confidence: 0 });
    expect(notFound.reasons).toContain('not_located');
  });

  it('keeps confidence within 0..1 whatever the inputs', () => {
    const s = scoreField({ ...base, detectionScore: 7, source: 'detection', reading: text([['x', 3]]), interpretation: readAs('text', 'x') });
    expect(s.confidence).toBeLessThanOrEqual(1);
    expect(s.confidence).toBeGreaterThanOrEqual(0);
  });

  it('states the mapped confidence when the schema gives a map, keeping the raw one in scores', () => {
    const map: [number, number][] = [[0.2, 0.1], [0.6, 0.7], [0.9, 0.995]];
    // Step semantics, by hand: below the first point its level; from each point up to the next, that point's level.
    expect([0, 0.2, 0.59, 0.6, 0.89, 0.9, 1].map((x) => applyConfidenceMap(map, x))).toEqual([0.1, 0.1, 0.1, 0.7, 0.7, 0.995, 0.995]);
    const reading = text([['Ashgrove', 0.95]]);
    const interp = readAs('text', 'Ashgrove');
    const plain = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading, interpretation: interp });
    const mapped = scoreField({ ...base, reviewThreshold: 0.99, confidenceMap: map, detectionScore: 0.9, source: 'detection', reading, interpretation: interp });
    expect(mapped.scores.raw).toBe(plain.confidence);
    expect(mapped.confidence).toBe(0.995);
    expect(mapped.status).toBe('accepted'); // the threshold is on the mapped scale
    expect(mapped.reasons).not.toContain('low_ocr_confidence');
    const weak = scoreField({ ...base, reviewThreshold: 0.99, confidenceMap: map, detectionScore: 0.9, source: 'detection', reading: text([['Ashgrove', 0.7]]), interpretation: interp });
    expect([weak.confidence, weak.status]).toEqual([0.7, 'review']);
  });

  it('scales OCR fields, and only them, by how well the rest of the form read', () => {
    const ocr = (c: number) => ({ reading: text([['Word', c]]), interpretation: readAs('text', 'Word') });
    const tick = { reading: { kind: 'marks' as const, marks: [{ key: 'x', fillRatio: 0.3, boxFound: true }] }, interpretation: readAs('text', 'x') };
    const blank = { reading: text([]), interpretation: readAs('text', '') };
    // Leave-one-out means by hand: others of the first are 0.5, 0.6, 0.7 -> 0.6 / 0.85.
    const f = legibilityFactors([ocr(0.9), ocr(0.5), ocr(0.6), ocr(0.7), tick, blank]);
    expect(f[0]).toBeCloseTo(0.6 / LEGIBILITY_KNEE, 9);
    expect(f[1]).toBeCloseTo(Math.min(1, (0.9 + 0.6 + 0.7) / 3 / LEGIBILITY_KNEE), 9);
    expect(f.slice(4)).toEqual([1, 1]);
    // A form that reads well costs nothing; with fewer than three other OCR fields there is nothing to judge by.
    expect(legibilityFactors([ocr(0.95), ocr(0.9), ocr(0.92), ocr(0.88)])).toEqual([1, 1, 1, 1]);
    expect(legibilityFactors([ocr(0.95), ocr(0.2), ocr(0.2)])).toEqual([1, 1, 1]);
    const reading = text([['Ashgrove', 0.95]]);
    const interp = readAs('text', 'Ashgrove');
    const full = scoreField({ ...base, detectionScore: 0.9, source: 'detection', reading, interpretation: interp });
    const dim = scoreField({ ...base, legibility: 0.5, detectionScore: 0.9, source: 'detection', reading, interpretation: interp });
    expect(dim.confidence).toBeCloseTo(full.confidence * 0.5, 2);
    expect(dim.scores.legibility).toBe(0.5);
  });
});

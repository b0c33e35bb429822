import sharp from 'sharp';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { getFieldType } from '../../src/fields/registry.js';
import { REGION_FALLBACK_FACTOR, regionFactor, scoreField, type AlignmentEvidence } from '../../src/fields/scoring.js';
import { alignByImage } from '../../src/page/align-image.js';
import { transformBox } from '../../src/image/geometry.js';
import { refineRegion } from '../../src/page/local-refine.js';
import { fromRawBuffer } from '../../src/image/raster.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { readTextField } from '../../src/read/read-text.js';
import { TODAY } from './context.js';
import { filledRealForm, scanLike } from '../page/fill-real-form.js';
import { realBlank } from '../page/real-form.js';

/**
 * Location confidence of a field read at its aligned schema region, from the page's own evidence, on real pixels:
 * the public-domain W-4 blank (test/fixtures/real-forms/README.md) with invented typed entries, scanned through
 * libvips (sharp) at a scale, shift and tilt, registered by our image alignment, touched up by refineRegion, and
 * the entry read by the real tesseract.js.
 */
const ocr = new OcrEngine();
afterAll(() => ocr.close());

// "Maren T." typed into the first-name cell of the W-4 (test/page/fill-real-form.ts): the cell below its printed
// label, as a schema drawn for reading without dropout would give it.
const FIRST_NAME = { x: 265, y: 254, w: 490, h: 44 };

async function evidenceOn(page: Awaited<ReturnType<typeof scanLike>>['page']): Promise<{ evidence: AlignmentEvidence; box: ReturnType<typeof transformBox> }> {
  const ref = await realBlank();
  const a = alignByImage(page, ref);
  const touched = refineRegion(page, ref, a.refToPage, FIRST_NAME);
  return { evidence: { method: a.method, score: a.score, residual: a.residual, refine: touched.score }, box: touched.box };
}

describe('location factor from alignment evidence', () => {
  it('accepts a clean read at the region of a well-aligned page that the fixed floor sends to review', async () => {
    const scan = await scanLike(await filledRealForm(), 0.97, 12, -9);
    const { evidence, box } = await evidenceOn(scan.page);
    // Our registration on this page correlates above the ramp's top (measured range on real pages 0.94-0.98).
    expect(evidence.score).toBeGreaterThan(0.9);
    expect(regionFactor(evidence)).toBeGreaterThan(0.97);

    const type = getFieldType('text');
    const options = type.options.parse({});
    const read = await readTextField(scan.page, box, { engine: ocr, accept: (r) => type.interpret(r, options, { today: TODAY }).outcome === 'valid' });
    const interpretation = type.interpret(read.reading, options, { today: TODAY });
    // What was typed, by the real OCR (the test's own invented entry).
    expect(String(interpretation.value)).toContain('Maren');
    const common = { detectionScore: null, source: 'region' as const, reading: read.reading, interpretation, reviewThreshold: 0.75, required: false };
    const withEvidence = scoreField({ ...common, alignment: evidence });
    const without = scoreField(common);
    expect(withEvidence.scores.location).toBeGreaterThan(without.scores.location);
    expect(without.scores.location).toBe(REGION_FALLBACK_FACTOR);
    expect(withEvidence.confidence).toBeGreaterThan(without.confidence);
    expect(withEvidence.status).toBe('accepted');
    // Under a stricter threshold a schema may set (0.8), the fixed floor alone decides: this read (OCR about 0.9)
    // goes to review at 0.85 x 0.9 and is accepted on the page's evidence.
    expect(scoreField({ ...common, reviewThreshold: 0.8 }).status).toBe('review');
    expect(scoreField({ ...common, reviewThreshold: 0.8, alignment: evidence }).status).toBe('accepted');
    expect(withEvidence.scores.registration).toBeGreaterThan(0.9);
    expect(withEvidence.reasons).toContain('region_fallback');
  }, 60_000);

  it('earns nothing above the floor when the page is another form (registration correlates poorly)', async () => {
    // A different real blank (DD 293, public domain; same fixtures README) registered onto the W-4's blank.
    const other = path.resolve(import.meta.dirname, '../fixtures/real-forms/dod-dd293-2023-page1-blank.png');
    const { data, info } = await sharp(other).grayscale().resize(1700, 2200, { fit: 'fill' }).raw().toBuffer({ resolveWithObject: true });
    const { evidence } = await evidenceOn(fromRawBuffer(data, info.width, info.height, info.channels));
    expect(evidence.score).toBeLessThan(0.7);
    expect(regionFactor(evidence)).toBeCloseTo(REGION_FALLBACK_FACTOR, 6);
  }, 60_000);

  it('keeps the floor without evidence, and weighs residual and matched share for a fit from detections alone', () => {
    expect(regionFactor(undefined)).toBe(REGION_FALLBACK_FACTOR);
    expect(regionFactor({ method: 'identity', score: 0, residual: null, refine: null })).toBe(REGION_FALLBACK_FACTOR);
    expect(regionFactor({ method: 'detections', score: 0.8, residual: 1.5, refine: null })).toBe(1);
    expect(regionFactor({ method: 'detections', score: 0.8, residual: 8, refine: null })).toBe(REGION_FALLBACK_FACTOR);
    // A touch-up that found no trusted shift (correlation under refineRegion's 0.5) sinks the factor to the floor.
    expect(regionFactor({ method: 'image', score: 0.95, residual: 40, refine: 0.3 })).toBe(REGION_FALLBACK_FACTOR);
  });
});

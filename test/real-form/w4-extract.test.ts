import { existsSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { closeSharedOcrEngine, extractDocument, loadDetector } from '../../src/api.js';
import { TruthDocument } from '../../src/eval/score-input.js';
import { scoreDocument } from '../../src/eval/score.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { encodePage } from '../../src/synth/encode-page.js';
import { alignmentError, referenceToSource } from './alignment-error.js';
import { renderW4Page } from './fill.js';
import { loadW4Schema, REPO_ROOT, w4Layout } from './w4-layout.js';

afterAll(async () => {
  await closeSharedOcrEngine();
});

/**
 * The shipped detector when there is one; before it lands, a fixture model that finds nothing useful, so every field
 * comes from its schema region after alignment (region fallback) and alignment and reading are still what is tested.
 */
const MODEL = existsSync(DEFAULT_MODEL_PATH) ? DEFAULT_MODEL_PATH : path.join(REPO_ROOT, 'test/fixtures/models/square-scores.onnx');

/** Types read by OCR. */
const OCR_TYPES = new Set(['text', 'number', 'date']);

describe('extract on the real blank layout, filled with invented typed values and scanned', () => {
  it('aligns the hand-labelled regions within a few pixels, finds every field and reads most values exactly', async () => {
    const loaded = await loadW4Schema();
    // Seed 900000 page 1: a light office scan turned 0.89°, typed in one of the DejaVu fonts (held-out seed range).
    const page = await renderW4Page(w4Layout(loaded), { seed: 900000, index: 1, fill: 'typed', degrade: 'light' });
    const detector = await loadDetector(MODEL, { intraOpThreads: 1 });
    const { result, pages } = await extractDocument(await encodePage(page.image, 'png', page.scan.dpi), {
      schema: loaded,
      detector,
      today: new Date(Date.UTC(2025, 11, 31)),
    });
    await detector.close();

    // Alignment against the scan's own reference->page transform (the truth, independent of the tool).
    // Floors measured on seed 900000 pages 0-3 (typed, light), fixture detector: worst corner 0.94-5.21 px, this
    // page 3.97 px, mean 1.43 px; the floors leave about twice that.
    const refToSource = referenceToSource(result, pages[0]);
    expect(refToSource).not.toBeNull();
    const err = alignmentError(loaded, refToSource!, page.scan.transform);
    expect(err.corners).toBe(4 * 20);
    expect(err.max).toBeLessThan(8);
    expect(err.mean).toBeLessThan(3);

    const scored = scoreDocument(page.stem, TruthDocument.parse(page.truth), result).fields;
    expect(scored).toHaveLength(18);
    // Location: result box IoU >= 0.5 with the truth box (PASCAL VOC's criterion, Everingham et al. 2010).
    // Measured 18/18 on each of seed 900000 pages 0-3; two may be lost to a detector box that the locate step
    // accepts (match >= 0.3) but that misses IoU 0.5.
    expect(scored.filter((f) => f.located).length).toBeGreaterThanOrEqual(16);

    // Exact match of normalized values (ISO 8601 dates, numbers, text as written), blank fields included.
    // Measured 15/15 on this page and 59/60 on seed 900000 pages 0-3 (one city line misread).
    const ocr = scored.filter((f) => OCR_TYPES.has(f.type));
    expect(ocr).toHaveLength(15);
    expect(ocr.filter((f) => f.correct).length).toBeGreaterThanOrEqual(13);

    // Marks: the three filing-status boxes, the two-jobs box, the signature. Measured all right on pages 0-3.
    const marks = scored.filter((f) => f.marks);
    expect(marks.reduce((n, f) => n + f.marks!.correct, 0)).toBe(4);
    expect(scored.find((f) => f.type === 'signature')!.correct).toBe(true);
  }, 120_000);
});

import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { extractDocument } from '../../src/pipeline/extract-document.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { loadSchemas } from '../../src/schema/load-many.js';

const REPO = path.resolve(import.meta.dirname, '../..');
const schema = (name: string) => path.join(REPO, 'schemas', `${name}.yaml`);

const ocr = new OcrEngine();
afterAll(() => ocr.close());

describe('several layouts in one batch', () => {
  it('assigns a scan to the schema whose layout it aligns with, and flags a scan that fits none', async () => {
    const detector = await loadDetector(DEFAULT_MODEL_PATH);
    const scan = path.join(REPO, 'samples/marina-slip-typed.jpg');

    const all = await loadSchemas([schema('clinic-intake'), schema('marina-slip'), schema('garden-plot')]);
    const assigned = await extractDocument(scan, { ocr, schema: all, detector });
    expect(assigned.result.schema.name).toBe('marina-slip');
    expect(assigned.result.layout?.status).toBe('assigned');
    expect(assigned.result.layout?.candidates).toHaveLength(3);

    // Without its own schema the marina form fits neither of the others: every field goes to a person.
    const others = await loadSchemas([schema('clinic-intake'), schema('garden-plot')]);
    const unknown = await extractDocument(scan, { ocr, schema: others, detector });
    expect(unknown.result.layout?.status).toBe('unknown_layout');
    expect(unknown.result.fields.every((f) => f.status !== 'accepted' && f.reasons.includes('unknown_layout'))).toBe(true);
  });
});

describe('a page of another form read with a single schema', () => {
  it('is unknown_layout: no field of it is accepted', async () => {
    const detector = await loadDetector(DEFAULT_MODEL_PATH);
    // The clinic's intake scan with only the garden-plot schema: the registration still finds a fit (score 0.33, over
    // the page gate's 0.3), and before, six of its "fields" were accepted from the clinic form's entries.
    const wrong = await extractDocument(path.join(REPO, 'samples/clinic-intake-typed.png'), { ocr, schema: await loadSchemas([schema('garden-plot')]), detector });
    expect(wrong.result.layout?.status).toBe('unknown_layout');
    expect(wrong.result.counts.accepted).toBe(0);
    expect(wrong.result.fields.every((f) => f.status !== 'accepted' && f.reasons.includes('unknown_layout'))).toBe(true);
    // Its own schema alone still assigns it.
    const own = await extractDocument(path.join(REPO, 'samples/clinic-intake-typed.png'), { ocr, schema: await loadSchemas([schema('clinic-intake')]), detector });
    expect(own.result.layout).toBeUndefined();
    expect(own.result.counts.accepted).toBeGreaterThan(10);
  });
});

import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { extractDocument } from '../../src/pipeline/extract-document.js';
import { closeSharedOcrEngine } from '../../src/read/ocr-engine.js';
import { loadSchemas } from '../../src/schema/load-many.js';

const REPO = path.resolve(import.meta.dirname, '../..');
const schema = (name: string) => path.join(REPO, 'schemas', `${name}.yaml`);

afterAll(closeSharedOcrEngine);

describe('several layouts in one batch', () => {
  it('assigns a scan to the schema whose layout it aligns with, and flags a scan that fits none', async () => {
    const detector = await loadDetector(DEFAULT_MODEL_PATH);
    const scan = path.join(REPO, 'samples/marina-slip-typed.jpg');

    const all = await loadSchemas([schema('clinic-intake'), schema('marina-slip'), schema('garden-plot')]);
    const assigned = await extractDocument(scan, { schema: all, detector });
    expect(assigned.result.schema.name).toBe('marina-slip');
    expect(assigned.result.layout?.status).toBe('assigned');
    expect(assigned.result.layout?.candidates).toHaveLength(3);

    // Without its own schema the marina form fits neither of the others: every field goes to a person.
    const others = await loadSchemas([schema('clinic-intake'), schema('garden-plot')]);
    const unknown = await extractDocument(scan, { schema: others, detector });
    expect(unknown.result.layout?.status).toBe('unknown_layout');
    expect(unknown.result.fields.every((f) => f.status !== 'accepted' && f.reasons.includes('unknown_layout'))).toBe(true);
  });
});

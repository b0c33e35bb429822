import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { extractDocument } from '../../src/pipeline/extract-document.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { loadSchema } from '../../src/schema/load.js';

const REPO = path.resolve(import.meta.dirname, '../..');

const ocr = new OcrEngine();
afterAll(() => ocr.close());

describe('extract with form dropout', () => {
  it('reads text from the page with the printed form subtracted, and marks from the page as scanned', async () => {
    const schema = await loadSchema(path.join(REPO, 'schemas/garden-plot.yaml'));
    const detector = await loadDetector(DEFAULT_MODEL_PATH);
    const scan = path.join(REPO, 'samples/garden-plot-typed.png');
    const truth = JSON.parse(await readFile(path.join(REPO, 'samples/truth/garden-plot-typed.json'), 'utf8'));
    const { result } = await extractDocument(scan, { ocr, schema, detector, dropout: true });
    const right = (name: string, value: unknown) => JSON.stringify(value) === JSON.stringify(truth.fields.find((t: { name: string }) => t.name === name).value);
    const exact = result.fields.filter((f) => right(f.name, f.value));
    // Measured: 24 of 24 with dropout (21 of 24 without) on this sample.
    expect(exact.length / result.fields.length).toBeGreaterThanOrEqual(0.9);
    // Checkboxes are found by their printed square, which dropout removes: they must still read right.
    for (const f of result.fields.filter((x) => x.type === 'checkbox' || x.type === 'choice')) expect(right(f.name, f.value)).toBe(true);
  });
});

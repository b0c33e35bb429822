import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runBatch } from '../../src/batch/run-batch.js';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import type { Detector } from '../../src/detect/types.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { loadSchema } from '../../src/schema/load.js';
import { generateSamples } from '../../src/synth/generate.js';
import { records } from './records.js';
import { REPO } from '../cli/run-cli.js';

let work: string;
let detector: Detector;
const ocr = new OcrEngine();

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-per-thread-'));
  // Held-out seeds (>= 900000): never used for training the detector.
  await generateSamples({ layout: 'clinic-intake', count: 3, seed: 900_733, out: path.join(work, 'in'), fill: 'typed', degrade: 'light', styles: 'train', format: 'png', upsideDownRate: 0 });
  detector = await loadDetector(DEFAULT_MODEL_PATH);
}, 120_000);

afterAll(async () => {
  await detector?.close();
  await ocr.close();
  if (work) await rm(work, { recursive: true, force: true });
});

describe('inputs read at once in one thread (real detector, real OCR, real pages)', () => {
  it('writes the same records two at a time as one at a time, and counts tesseract time once', async () => {
    const schemas = [await loadSchema(path.join(REPO, 'schemas/clinic-intake.yaml'))];
    const inputs = [path.join(work, 'in')];
    const one = path.join(work, 'out-1');
    const two = path.join(work, 'out-2');
    const a = await runBatch({ ocr, inputs, schemas, detector, outDir: one, inputsPerThread: 1, warn: () => undefined });
    const b = await runBatch({ ocr, inputs, schemas, detector, outDir: two, inputsPerThread: 2, warn: () => undefined });
    expect(a.summary.documents.failed).toBe(0);
    expect(b.summary.documents.failed).toBe(0);

    // Every stage but OCR is pure, and OCR calls are serialized with their own parameters: interleaving two
    // documents' geometry and reading changes nothing in what is read.
    const r1 = await records(one);
    const r2 = await records(two);
    expect(r1.size).toBe(3);
    expect([...r2.keys()]).toEqual([...r1.keys()]);
    for (const [name, r] of r1) expect(r2.get(name), name).toEqual(r);

    // One tesseract worker cannot be busy longer than the run: with two documents in flight, each form's own
    // before/after difference also holds its neighbour's OCR, and summing those would count it twice.
    for (const run of [a.run, b.run]) {
      expect(run.stages.ocr.ms).toBeGreaterThan(0);
      expect(run.stages.ocr.ms).toBeLessThanOrEqual(run.wallSeconds * 1000);
      expect(run.stages.ocr.ms).toBeLessThan(run.stages.read.ms);
    }
  }, 600_000);
});

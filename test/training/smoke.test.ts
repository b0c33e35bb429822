import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { InferenceSession, Tensor } from '../../src/detect/onnx-runtime.js';
import { afterAll, describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { readOnnxMetadata } from '../../src/detect/onnx-metadata.js';
import { grayFromImage } from '../../src/image/raster.js';
import { generateSamples } from '../../src/synth/generate.js';
import { PYTHON, missingPythonModules, skipUnlessPresent } from '../support/requirements.js';

// Keeps the Python training code from rotting: a few generated pages, a few training steps, export, and the
// exported file loaded by the same onnxruntime the tool ships with. Training quality is measured elsewhere
// (training/evaluate.py, `formglean detector eval`); here only the contract between the two halves is checked.
// Where torch is missing the test is skipped with the reason; CI installs Debian's python3-torch and requires it.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const missing = missingPythonModules(['torch', 'onnx', 'numpy', 'PIL']);
const CLASSES = ['text_entry', 'checkbox', 'signature_area', 'comb_field'];
const work = mkdtempSync(path.join(tmpdir(), 'formglean-train-smoke-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function python(args: string[], timeoutMs: number): string {
  const run = spawnSync(PYTHON, args, { cwd: root, encoding: 'utf8', timeout: timeoutMs });
  if (run.error) throw new Error(`${PYTHON} ${args[0]}: ${run.error.message}`);
  if (run.status !== 0) throw new Error(`${PYTHON} ${args.join(' ')} exited ${run.status}: ${run.stderr.trim().split('\n').slice(-3).join(' | ')}`);
  return run.stdout;
}

describe('training smoke run (train.py → export.py → onnxruntime-node)', () => {
  it('trains a few steps on generated pages and exports a model the runtime loads', async (ctx) => {
    skipUnlessPresent(ctx, missing);

    const data = path.join(work, 'pages');
    // Small pages (100 DPI) keep generation to a second or two; the fitted input is 512 x 640 either way.
    await generateSamples({ layout: 'random', count: 3, seed: 4242, out: data, fill: 'mixed', degrade: 'light', dpi: 100, styles: 'train', format: 'png', upsideDownRate: 0 });

    const run = path.join(work, 'run');
    const log = python(['training/train.py', '--data', data, '--epochs', '3', '--max-steps', '3', '--batch', '2', '--workers', '0', '--log-every', '1', '--seed', '3', '--box-balance', '--out', run], 150_000);
    expect(log).toMatch(/step 3\/3 /);
    const info = JSON.parse(readFileSync(path.join(run, 'train-info.json'), 'utf8'));
    expect(info.steps).toBe(3);
    expect(info.seed).toBe(3);

    const model = path.join(work, 'smoke.onnx');
    python(['training/export.py', '--checkpoint', path.join(run, 'final.pt'), '--out', model], 120_000);

    // Metadata contract (COMMON brief: class_names JSON array in model index order, input_size "WxH").
    const meta = readOnnxMetadata(readFileSync(model));
    expect(JSON.parse(meta.get('class_names') ?? 'null')).toEqual(CLASSES);
    expect(meta.get('input_size')).toBe('512x640');
    expect(meta.get('letterbox_align')).toBe('top-left');

    // Output layout [1, 4 + C, N] with N = one candidate per stride-4 cell of the 512 x 640 input.
    const session = await InferenceSession.create(model, { intraOpNumThreads: 1 });
    const input = new Tensor('float32', new Float32Array(640 * 512).fill(1), [1, 1, 640, 512]);
    const out = (await session.run({ [session.inputNames[0]]: input }))[session.outputNames[0]];
    expect(out.dims).toEqual([1, 4 + CLASSES.length, (640 / 4) * (512 / 4)]);
    const values = out.data as Float32Array;
    const n = out.dims[2];
    // Sigmoid scores lie in [0, 1]; widths and heights are non-negative (decoded in the graph).
    for (let c = 4; c < 8; c++) for (let i = 0; i < n; i += 97) expect(values[c * n + i]).toBeGreaterThanOrEqual(0);
    for (let c = 4; c < 8; c++) for (let i = 0; i < n; i += 97) expect(values[c * n + i]).toBeLessThanOrEqual(1);
    for (let i = 0; i < n; i += 97) expect(values[2 * n + i]).toBeGreaterThanOrEqual(0);
    await session.release();

    // The runtime loader accepts it and runs a real generated page end to end.
    const detector = await loadDetector(model, { intraOpThreads: 1 });
    expect([detector.inputWidth, detector.inputHeight]).toEqual([512, 640]);
    expect(detector.classNames).toEqual(CLASSES);
    const page = await grayFromImage(path.join(data, 'random-4242-00000.png'));
    const found = await detector.detect(page, { scoreThreshold: 0 });
    expect(Array.isArray(found)).toBe(true);
    await detector.close();
  }, 175_000);
  it('fine-tunes from the shipped ONNX detector: at learning rate 0 the exported weights reproduce its detections', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    const data = path.join(work, 'pages-ft');
    await generateSamples({ layout: 'random', count: 2, seed: 4343, out: data, fill: 'mixed', degrade: 'light', dpi: 100, styles: 'train', format: 'png', upsideDownRate: 0 });
    const run = path.join(work, 'run-ft');
    const shipped = path.join(root, 'models', 'form-elements.onnx');
    // One step with the class-balanced sampler and frozen BatchNorm, learning rate 0: the weights read back from the
    // ONNX file (its BatchNorm folded into the convolutions, training/init_onnx.py) must come out unchanged.
    const log = python(['training/train.py', '--data', data, '--epochs', '1', '--max-steps', '1', '--batch', '2', '--workers', '0', '--seed', '3', '--class-balance', '--init-onnx', shipped, '--lr', '0', '--out', run], 150_000);
    expect(log).toMatch(/initial weights from .*form-elements\.onnx \(BatchNorm frozen\)/);
    const model = path.join(work, 'refit.onnx');
    python(['training/export.py', '--checkpoint', path.join(run, 'final.pt'), '--out', model, '--threshold', '0.35'], 120_000);
    // Same detections on a real blank (IRS W-4 2025 page 1, test/fixtures/real-forms) from both files.
    const page = await grayFromImage(path.join(root, 'test', 'fixtures', 'real-forms', 'irs-w4-2025-page1-blank.png'));
    const [a, b] = await Promise.all([loadDetector(shipped, { intraOpThreads: 1 }), loadDetector(model, { intraOpThreads: 1 })]);
    const [da, db] = [await a.detect(page), await b.detect(page)];
    await a.close();
    await b.close();
    expect(db.length).toBe(da.length);
    expect(da.length).toBeGreaterThan(10);
    da.forEach((d, i) => {
      expect(db[i].className).toBe(d.className);
      expect(Math.abs(db[i].score - d.score)).toBeLessThan(1e-4);
      expect(Math.abs(db[i].box.x - d.box.x)).toBeLessThan(0.05);
    });
  }, 175_000);
});

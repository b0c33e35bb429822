import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { FormgleanError } from '../../src/errors.js';
import { type GrayImage, createGray } from '../../src/image/raster.js';

// Real onnxruntime on tiny models built by test/fixtures/models/make_fixture_models.py: each reports the bounding
// box of the dark pixels of its 96 x 64 input, so a square drawn on a page must come back at its page position.
const fixtures = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../fixtures/models');
const model = (name: string) => path.join(fixtures, name);

function pageWithSquare(width: number, height: number, x: number, y: number, side: number): GrayImage {
  const page = createGray(width, height);
  for (let r = y; r < y + side; r++) page.data.fill(0, r * width + x, r * width + x + side);
  return page;
}

function expectBox(actual: { x: number; y: number; w: number; h: number }, expected: { x: number; y: number; w: number; h: number }) {
  for (const k of ['x', 'y', 'w', 'h'] as const) expect(actual[k]).toBeCloseTo(expected[k], 6);
}

// 300 x 300 page into 96 x 64: scale 64/300, page at the input's top-left (x 0..64, white beyond).
// Square at page (75, 150) side 75 → input (16, 32) side 16: pixel-aligned, so the model's ink box is exact.
const square = pageWithSquare(300, 300, 75, 150, 75);
const expected = { x: 75, y: 150, w: 75, h: 75 };

describe('loadDetector with real onnxruntime', () => {
  it('[1, 4+C, N] model: exact box after letterbox mapping, class-wise NMS, score threshold', async () => {
    const det = await loadDetector(model('square-scores.onnx'), { intraOpThreads: 1 });
    expect([det.inputWidth, det.inputHeight]).toEqual([96, 64]);
    expect(det.classNames).toEqual(['text_entry', 'checkbox', 'signature_area', 'comb_field']);
    const sha = createHash('sha256').update(readFileSync(model('square-scores.onnx'))).digest('hex');
    expect(det.sha256).toBe(sha);
    expect(det.id).toBe(`square-scores.onnx@${sha.slice(0, 12)}`);

    const found = await det.detect(square);
    // checkbox 0.9 kept; its copy shifted 2 input px (checkbox 0.6, IoU 0.78) suppressed; the shifted text_entry
    // 0.5 kept (other class); signature_area 0.1 under the 0.25 default threshold
    expect(found.map((d) => [d.className, d.score])).toEqual([
      ['checkbox', expect.closeTo(0.9, 6)],
      ['text_entry', expect.closeTo(0.5, 6)],
    ]);
    expectBox(found[0].box, expected);
    // 2 input px = 2 × 300/64 = 9.375 page px
    expectBox(found[1].box, { ...expected, x: 75 + 9.375 });
  });

  it('detect options change threshold, NMS overlap and cap', async () => {
    const det = await loadDetector(model('square-scores.onnx'));
    expect((await det.detect(square, { scoreThreshold: 0.55 })).map((d) => d.className)).toEqual(['checkbox']);
    expect((await det.detect(square, { iouThreshold: 0.9 })).map((d) => d.score)).toEqual([
      expect.closeTo(0.9, 6),
      expect.closeTo(0.6, 6),
      expect.closeTo(0.5, 6),
    ]);
    expect(await det.detect(square, { maxDetections: 1 })).toHaveLength(1);
    expect(await det.detect(createGray(300, 300))).toEqual([]); // blank page: the models give score 0
  });

  it('one session per model file: a second load returns the same detector', async () => {
    const a = await loadDetector(model('square-scores.onnx'));
    const b = await loadDetector(path.relative(process.cwd(), model('square-scores.onnx')));
    expect(b).toBe(a);
  });

  it('[1, N, 5+C] model with symbolic height/width takes its input size from metadata; centred letterbox', async () => {
    const det = await loadDetector(model('square-objectness.onnx'));
    expect([det.inputWidth, det.inputHeight]).toEqual([96, 64]);
    // metadata letterbox_align "center". 600 x 200 page: scale 0.16, page spans input y 16..48.
    // Square at (150, 50) side 100 → input (24, 24) side 16.
    const found = await det.detect(pageWithSquare(600, 200, 150, 50, 100));
    expect(found).toHaveLength(1);
    expect(found[0].className).toBe('comb_field');
    expect(found[0].score).toBeCloseTo(0.8 * 0.9, 6);
    expectBox(found[0].box, { x: 150, y: 50, w: 100, h: 100 });
  });

  it('[1, N, 6] model with class names from the side file <model>.classes.json and its own operating threshold', async () => {
    const det = await loadDetector(model('square-suppressed.onnx'));
    expect(det.defaults?.scoreThreshold).toBe(0.97); // metadata operating_threshold, above the box's 0.95
    expect(await det.detect(square)).toEqual([]);
    const found = await det.detect(square, { scoreThreshold: 0.5 });
    expect(found.map((d) => [d.className, d.classId])).toEqual([['signature_area', 2]]);
    expectBox(found[0].box, expected);
  });

  it('classNamesFile supplies names a model lacks', async () => {
    const det = await loadDetector(model('no-class-names.onnx'), { classNamesFile: model('square-suppressed.onnx.classes.json') });
    expect(det.classNames).toHaveLength(4);
    await det.close();
  });
});

describe('loadDetector errors: one line, naming the file, exit code 2', () => {
  const cases: [string, RegExp][] = [
    ['not-a-model.onnx', /not an ONNX model/],
    ['wrong-output.onnx', /unexpected output shape \[1, 3, 7\]/],
    ['missing.onnx', /model file not found/],
  ];
  for (const [name, problem] of cases) {
    it(name, async () => {
      const err = await loadDetector(model(name)).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(FormgleanError);
      const e = err as FormgleanError;
      expect(e.exitCode).toBe(2);
      expect(e.message).not.toContain('\n');
      expect(e.message.startsWith(model(name))).toBe(true);
      expect(e.message).toMatch(problem);
    });
  }
  it('no-class-names.onnx', async () => {
    const err = (await loadDetector(model('no-class-names.onnx')).catch((e: unknown) => e)) as FormgleanError;
    expect(err.exitCode).toBe(2);
    expect(err.message).toMatch(/no-class-names\.onnx: model has no class names/);
    expect(err.message).not.toContain('\n');
  });
});

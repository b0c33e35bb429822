import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Command } from 'commander';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { registerDetectorCommand } from '../../src/cli/detector.js';
import { FormgleanError } from '../../src/errors.js';
import { loadCocoDataset } from '../../src/eval/detection-dataset.js';
import type { DetectorEvalReport } from '../../src/eval/detection-run.js';
import { createGray, grayToPng } from '../../src/image/raster.js';

// End to end on real pixels with real onnxruntime: the fixture model square-scores.onnx (see
// test/fixtures/models/make_fixture_models.py) reports the dark square of a page as a checkbox (0.9), the same
// square shifted 2 input px as a text entry (0.5) and a fixed signature box (0.1).
const here = path.dirname(fileURLToPath(import.meta.url));
const model = path.resolve(here, '../fixtures/models/square-scores.onnx');
const squares = [
  [150, 75],
  [75, 150],
  [75, 75],
];
let dir: string;

async function run(args: string[]): Promise<string> {
  const program = new Command().exitOverride();
  registerDetectorCommand(program);
  let printed = '';
  const write = process.stdout.write.bind(process.stdout);
  process.stdout.write = ((chunk: string) => ((printed += chunk), true)) as typeof process.stdout.write;
  try {
    await program.parseAsync(['node', 'formglean', 'detector', 'eval', ...args]);
  } finally {
    process.stdout.write = write;
  }
  return printed;
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'formglean-deteval-'));
  const images = [];
  const annotations = [];
  for (const [i, [x, y]] of squares.entries()) {
    // 300 x 300 pages: scale 64/300 puts squares of side 75 at whole input pixels, so the model's boxes are exact
    const page = createGray(300, 300);
    for (let r = y; r < y + 75; r++) page.data.fill(0, r * 300 + x, r * 300 + x + 75);
    await writeFile(path.join(dir, `page-${i}.png`), await grayToPng(page));
    images.push({ id: i + 1, file_name: `page-${i}.png`, width: 300, height: 300 });
    annotations.push({ id: annotations.length + 1, image_id: i + 1, category_id: 2, bbox: [x, y, 75, 75], iscrowd: 0 });
    annotations.push({ id: annotations.length + 1, image_id: i + 1, category_id: 1, bbox: [x, y, 75, 75], iscrowd: 0 });
  }
  annotations.push({ id: annotations.length + 1, image_id: 1, category_id: 4, bbox: [10, 250, 120, 30], iscrowd: 0 });
  const categories = ['text_entry', 'checkbox', 'signature_area', 'comb_field'].map((name, i) => ({ id: i + 1, name }));
  await writeFile(path.join(dir, 'coco.json'), JSON.stringify({ images, annotations, categories }));
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('formglean detector eval', () => {
  it('prints the per-class table and writes detector-eval.json and a precision–recall PNG', async () => {
    const out = path.join(dir, 'eval');
    const printed = await run(['--model', model, '--data', path.join(dir, 'coco.json'), '--out', out]);
    const report = JSON.parse(await readFile(path.join(out, 'detector-eval.json'), 'utf8')) as DetectorEvalReport;
    const byName = Object.fromEntries(report.classes.map((c) => [c.name, c]));

    // checkbox boxes are exact: AP 1 at every IoU (COCO definitions)
    expect([byName.checkbox.ap50, byName.checkbox.ap50to95]).toEqual([1, 1]);
    expect(byName.checkbox.operating).toMatchObject({ precision: 1, recall: 1 });
    // text entry boxes are shifted 2 input px = 9.375 page px along a 75 px side:
    // IoU = (65.625 × 75) / (2 × 75² − 65.625 × 75) = 4921.875 / 6328.125 = 0.7778, a hit at IoU 0.50 … 0.75
    // (6 of the 10 COCO thresholds) → AP@0.5 = 1, AP@0.5:0.95 = 0.6
    expect(byName.text_entry.ap50).toBe(1);
    expect(byName.text_entry.ap50to95).toBeCloseTo(0.6, 12);
    // no signature labels: AP undefined (COCO reports -1); one comb label never found: AP 0, recall 0
    expect(byName.signature_area.ap50).toBeNull();
    expect(byName.comb_field.ap50).toBe(0);
    expect(byName.comb_field.operating.recall).toBe(0);
    expect(report.mean.ap50).toBeCloseTo((1 + 1 + 0) / 3, 12);
    expect(report.scoreThreshold).toBe(0.25);
    expect(report.data).toMatchObject({ images: 3, boxes: 7 });

    expect(printed).toMatch(/checkbox\s+3\s+1\.000\s+1\.000\s+1\.000\s+1\.000/);
    expect(printed).toMatch(/text_entry\s+3\s+1\.000\s+0\.600/);
    const png = await sharp(path.join(out, 'detector-pr.png')).metadata();
    expect([png.format, png.width, png.height]).toEqual(['png', 760, 600]);
  });

  it('--score-threshold sets the operating point', async () => {
    const out = path.join(dir, 'eval-strict');
    await run(['--model', model, '--data', path.join(dir, 'coco.json'), '--out', out, '--score-threshold', '0.6']);
    const report = JSON.parse(await readFile(path.join(out, 'detector-eval.json'), 'utf8')) as DetectorEvalReport;
    const text = report.classes.find((c) => c.name === 'text_entry')!;
    expect(text.operating).toMatchObject({ truePositives: 0, recall: 0, precision: null });
    expect(text.ap50).toBe(1); // AP does not depend on the operating threshold
  });

  it('bad data and bad models stop with one line naming the file, exit code 2', async () => {
    const bad = path.join(dir, 'bad.json');
    await writeFile(bad, JSON.stringify({ images: [{ id: 1, file_name: 'x.png', width: 10 }], annotations: [], categories: [] }));
    const cases: [string[], RegExp][] = [
      [['--model', model, '--data', bad], /bad\.json: not a COCO detection file: images\[0\]\.height/],
      [['--model', path.resolve(here, '../fixtures/models/not-a-model.onnx'), '--data', path.join(dir, 'coco.json')], /not-a-model\.onnx: not an ONNX model/],
      [['--model', model, '--data', path.join(dir, 'nope.json')], /nope\.json: data file not found/],
      [['--model', model, '--data', path.join(dir, 'coco.json'), '--score-threshold', '2'], /--score-threshold expects a number between 0 and 1/],
    ];
    for (const [args, message] of cases) {
      const err = (await run(args).catch((e: unknown) => e)) as FormgleanError;
      expect(err).toBeInstanceOf(FormgleanError);
      expect(err.exitCode).toBe(2);
      expect(err.message).toMatch(message);
      expect(err.message).not.toContain('\n');
    }
  });

  it('a category the model does not know, or a missing image, is a data error', async () => {
    const unknown = path.join(dir, 'unknown.json');
    await writeFile(unknown, JSON.stringify({ images: [], annotations: [], categories: [{ id: 1, name: 'stamp' }] }));
    await expect(run(['--model', model, '--data', unknown])).rejects.toThrow(/unknown\.json: categories "stamp" are not classes of square-scores\.onnx@/);
    const gone = path.join(dir, 'gone.json');
    await writeFile(gone, JSON.stringify({ images: [{ id: 1, file_name: 'gone.png', width: 300, height: 300 }], annotations: [], categories: [{ id: 1, name: 'checkbox' }] }));
    const err = (await run(['--model', model, '--data', gone]).catch((e: unknown) => e)) as FormgleanError;
    expect(err.exitCode).toBe(2);
    expect(err.message).toMatch(/gone\.png: file not found/);
  });

  it('the COCO loader resolves image paths beside the JSON and keeps crowd flags', async () => {
    const data = await loadCocoDataset(path.join(dir, 'coco.json'));
    expect(data.images[0].path).toBe(path.join(dir, 'page-0.png'));
    expect(data.categoryNames).toEqual(['text_entry', 'checkbox', 'signature_area', 'comb_field']);
    expect(data.boxes.filter((b) => b.crowd)).toEqual([]);
  });
});

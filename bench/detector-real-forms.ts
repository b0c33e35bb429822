/**
 * Detector AP on real layouts, by form: `npx tsx bench/detector-real-forms.ts [--data DIR/coco.json] [--model FILE]`.
 *
 * DATA is a set written by training/real-layouts.ts, by default the held-out half's evaluation pages
 * (training/data/eval-real-heldout: page 1 of each held-out form, blank, typed and handwriting, light scans; make it
 * with `npx tsx training/real-layouts.ts --half held-out --seed 900101 --per-page 3 --max-pages 1 --degrade light
 * --upside-down 0 --out training/data/eval-real-heldout`). Prints per-class AP@0.5 (COCO 101-point at IoU 0.5, as `formglean detector eval` prints it; src/eval/detection-ap.ts) with recall
 * and precision at the model's operating threshold, pooled over all pages and per form (pages are grouped by the
 * form name their file names start with), and the per-form mean of each class's AP, so a form with many boxes does
 * not outweigh the others. --json FILE writes the figures.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { loadCocoDataset, type DetectionDataset } from '../src/eval/detection-dataset.js';
import { evaluateDetector, type DetectorEvalReport } from '../src/eval/detection-run.js';
import { formatTable } from '../src/io/text-table.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const { values: a } = parseArgs({
  options: {
    data: { type: 'string', default: path.join(ROOT, 'training', 'data', 'eval-real-heldout', 'coco.json') },
    model: { type: 'string', default: DEFAULT_MODEL_PATH },
    json: { type: 'string' },
  },
});
const data = await loadCocoDataset(a.data!);
const detector = await loadDetector(a.model!);
/** "irs-f8949-2025-p1-900101-0002.png" -> "irs-f8949-2025". */
const formOf = (file: string) => path.basename(file).replace(/-p\d+-\d+-\d+\.\w+$/, '');
const forms = [...new Set(data.images.map((i) => formOf(i.path)))].sort();
const subset = (form: string): DetectionDataset => {
  const images = data.images.filter((i) => formOf(i.path) === form);
  const ids = new Set(images.map((i) => i.id));
  return { ...data, images, boxes: data.boxes.filter((b) => ids.has(b.imageId)) };
};
const classes = data.categoryNames;
const cell = (r: DetectorEvalReport, name: string) => {
  const c = r.classes.find((x) => x.name === name);
  return c && c.groundTruth > 0 ? `${c.ap50!.toFixed(3)} (${c.groundTruth})` : '-';
};
const rows: string[][] = [];
const perForm: Record<string, DetectorEvalReport> = {};
try {
  for (const form of forms) {
    const r = await evaluateDetector(detector, subset(form));
    perForm[form] = r;
    rows.push([form, String(r.data.images), ...classes.map((c) => cell(r, c))]);
  }
  const pooled = await evaluateDetector(detector, data);
  const meanOverForms = classes.map((c) => {
    const aps = Object.values(perForm).map((r) => r.classes.find((x) => x.name === c)).filter((x) => x && x.groundTruth > 0).map((x) => x!.ap50!);
    return aps.length ? `${(aps.reduce((s, v) => s + v, 0) / aps.length).toFixed(3)} (${aps.length} forms)` : '-';
  });
  rows.push(['mean over forms', '', ...meanOverForms]);
  rows.push(['pooled', String(pooled.data.images), ...classes.map((c) => cell(pooled, c))]);
  process.stdout.write(`${path.basename(a.model!)} on ${path.relative(ROOT, a.data!)}: AP@0.5 per class (boxes)\n${formatTable(['form', 'pages', ...classes], rows, { rule: true })}\n`);
  process.stdout.write(
    `pooled at the operating threshold ${pooled.scoreThreshold}: ` +
      pooled.classes.map((c) => `${c.name} recall ${c.operating.recall?.toFixed(3) ?? '-'} precision ${c.operating.precision?.toFixed(3) ?? '-'}`).join('; ') +
      `; ${pooled.timing.msPerImageMedian.toFixed(1)} ms/page median\n`,
  );
  if (a.json) await writeJsonAtomic(a.json, { model: a.model, data: a.data, pooled, perForm });
} finally {
  await detector.close();
}

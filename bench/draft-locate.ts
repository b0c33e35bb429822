/**
 * A layout defined only by a drafted-then-edited schema: draft from the blank with the shipped detector and OCR,
 * edit as a user would (keep the drafted areas that stand for a real field part and give them its name; delete
 * the rest), then locate those parts on held-out filled pages by alignment alone and compare with the truth boxes.
 * The demo layouts were never used to train the detector (models/README.md).
 * Usage: npx tsx bench/draft-locate.ts LAYOUT DIR [--limit N] [--model M] [--refine]
 *   --refine: touch up each region's place with refineRegion (src/page/local-refine.ts) after the global alignment.
 *   DIR: pages of LAYOUT from `formglean samples generate` with a held-out seed (>= 900000).
 * Prints: draft coverage (truth parts with a drafted area of IoU >= 0.5 on the blank), drafted areas deleted,
 * and the share of kept parts located with IoU >= 0.5 on the pages, with the median IoU.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { expectedParts } from '../src/locate/expected-boxes.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { alignPage } from '../src/page/align.js';
import type { Box } from '../src/image/geometry.js';
import { invertAffine, iou, transformBox } from '../src/image/geometry.js';
import { refineRegion } from '../src/page/local-refine.js';
import { normalizePage } from '../src/page/normalize.js';
import { grayFromImage } from '../src/image/raster.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { draftSchema } from '../src/draft/from-image.js';
import { loadSchema, referenceImagePath } from '../src/schema/load.js';

const args = process.argv.slice(2);
const take = (flag: string): string | undefined => {
  const i = args.indexOf(flag);
  if (i < 0) return undefined;
  const v = args[i + 1];
  args.splice(i, 2);
  return v;
};
const limit = Number(take('--limit') ?? Infinity);
const refine = args.includes('--refine');
if (refine) args.splice(args.indexOf('--refine'), 1);
const model = take('--model') ?? DEFAULT_MODEL_PATH;
const [layout, dir] = args;
if (!layout || !dir) {
  process.stderr.write('usage: npx tsx bench/draft-locate.ts LAYOUT DIR [--limit N] [--model M]\n');
  process.exit(2);
}
const truthSchema = await loadSchema(`schemas/${layout}.yaml`);
const blank = normalizePage(await grayFromImage(referenceImagePath(truthSchema, 0)!)).image;
const detector = await loadDetector(model);
const ocr = new OcrEngine();
const draft = await draftSchema([blank], [await detector.detect(blank)], async (c) => (await ocr.read(c, { mode: 'line' })).text, {
  formName: `${layout}-draft`,
  referenceImages: ['blank.png'],
});
await ocr.close();

// The user's edit: each truth part takes the drafted area (or choice option) of its class that overlaps it most.
const drafted: Array<{ box: Box; className: string }> = [];
for (const f of draft.fields) {
  const opts = f.options as { choices?: Array<{ region: number[] }> } | undefined;
  const regions = f.type === 'choice' && opts?.choices ? opts.choices.map((c) => c.region) : [f.region];
  for (const r of regions) drafted.push({ box: { x: r[0], y: r[1], w: r[2], h: r[3] }, className: f.className });
}
const parts = expectedParts(truthSchema.fields).filter((p) => p.region);
const kept = new Map<string, Box>();
const used = new Set<number>();
for (const p of parts) {
  let best = -1;
  let bestIou = 0.5;
  drafted.forEach((d, i) => {
    if (used.has(i) || d.className !== p.className) return;
    const o = iou(d.box, p.region!);
    if (o >= bestIou) {
      bestIou = o;
      best = i;
    }
  });
  if (best >= 0) {
    if (process.env.DRAFT_DEBUG) console.log(`${p.field.name}/${p.key}: drafted ${JSON.stringify(drafted[best].box)} truth ${JSON.stringify(p.region)} iou ${bestIou.toFixed(2)}`);
    used.add(best);
    kept.set(`${p.field.name}/${p.key}`, drafted[best].box);
  }
}
console.log(`draft: ${draft.fields.length} fields, ${drafted.length} areas; truth parts covered ${kept.size}/${parts.length}; areas deleted by the edit ${drafted.length - kept.size}`);

const ious: number[] = [];
const worst = new Map<string, number>();
const files = readdirSync(path.join(dir, 'truth')).filter((f) => f.endsWith('.json')).sort().slice(0, limit);
for (const f of files) {
  const truth = JSON.parse(readFileSync(path.join(dir, 'truth', f), 'utf8'));
  const n = normalizePage(await grayFromImage(path.join(dir, truth.file)));
  const a = alignPage({ page: n.image, referenceSize: blank, reference: blank });
  const toSource = invertAffine(n.transform);
  for (const tf of truth.fields) {
    const entries: Array<[string, number[]]> = tf.parts ? tf.parts.map((p: { key: string; box: number[] }) => [`${tf.name}/${p.key}`, p.box]) : [[`${tf.name}/${tf.name}`, tf.box]];
    for (const [key, tb] of entries) {
      const region = kept.get(key);
      if (!region) continue;
      const onPage = refine ? refineRegion(n.image, blank, a.refToPage, region).box : transformBox(a.refToPage, region);
      const onSource = transformBox(toSource, onPage);
      const o = iou(onSource, { x: tb[0], y: tb[1], w: tb[2], h: tb[3] });
      ious.push(o);
      worst.set(key, Math.min(worst.get(key) ?? 1, o));
    }
  }
}
const sorted = [...ious].sort((x, y) => x - y);
const ok = ious.filter((v) => v >= 0.5).length;
console.log(`pages ${files.length}: kept parts located with IoU >= 0.5: ${ok}/${ious.length} = ${((100 * ok) / Math.max(1, ious.length)).toFixed(2)} %; median IoU ${sorted[sorted.length >> 1]?.toFixed(3)}`);
const weak = [...worst.entries()].filter(([, v]) => v < 0.5).map(([k, v]) => `${k} ${v.toFixed(2)}`);
if (weak.length) console.log(`parts under 0.5 on some page (lowest IoU): ${weak.join('; ')}`);

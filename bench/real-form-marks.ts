/**
 * Marks on real layouts: page 1 of the fillable real forms (reference/real-forms/pdfs, rendered blank at 200 dpi),
 * their printed boxes found by the shipped detector on the blank (where a printed outline is found in the box), ticked with the synthetic renderer's hand marks
 * (ticks, crosses, fills, scribbles, light pencil, a third of ticks and crosses overflowing the box; stray dots on
 * empty boxes), boxes on one row taken as a one-of group (one ticked, or none), scanned with the synthetic scan
 * simulation (light or heavy) and shifted up to 1.5 px against the blank (what alignment leaves).
 * Each box is measured two ways: the printed-outline fill ratio (measureMark) and the ink added over the blank
 * (measureAddedInk). Prints per-state fill distributions and, at the schema defaults, box and group decisions.
 * Usage: npx tsx bench/real-form-marks.ts [--set dev|held] [--pages 2] [--degrade light|heavy] [--pdfs DIR]
 * (MARKS_TOLERANCE and MARKS_CONTRAST override the added-ink constants for a grid search.)
 *
 * Measured (2 pages per form, shipped defaults; outline measure with thresholds -> added ink with the margin rule):
 *   development, light: boxes right 75.5 % -> 96.7 %; one-of rows (58) right 38 / review 19 -> right 57 / wrong 1 / review 0
 *   development, heavy: boxes right 72.9 % -> 96.1 %; rows right 37 / review 20 -> right 57 / wrong 1 / review 0
 *   held-out, light:    boxes right 77.4 % -> 93.6 %; rows (72) right 44 / review 28 -> right 70 / wrong 0 / review 2
 *   held-out, heavy:    boxes right 70.7 % -> 92.6 %; rows right 39 / review 33 -> right 71 / wrong 0 / review 1
 * Box figures count a box where added ink cannot be judged (too little paper inside) by the outline measure.
 *
 * With the page rendered by PDFium's form filler (as this bench did at be957a6, when renderPdfPage drew form fields;
 * it draws a light-gray hairline around boxes that have no appearance of their own), the boxes found differ (262 on
 * the development forms, 58 rows -> 44): light scans, added ink with the margin rule,
 *   development: print up to 200 gray: boxes right 94.7 %, rows right 42 / wrong 0 / review 2; print up to 230:
 *                95.8 %, 40 / 4 / 0; print up to 200 and light hairlines (shipped): 97.3 %, 43 / 1 / 0
 *   held-out (shipped): boxes right 95.5 %, rows (72) right 70 / wrong 2 / review 0
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { renderPdfPage } from '../src/input/pdf.js';
import { decideMark, decideOneOf, DEFAULT_CHECKED_ABOVE, DEFAULT_CHOICE_MARGIN, DEFAULT_UNCHECKED_BELOW } from '../src/fields/mark-decision.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { iou, type Box } from '../src/image/geometry.js';
import type { GrayImage } from '../src/image/raster.js';
import { blankUnderCrop } from '../src/read/blank-crop.js';
import { cropField } from '../src/read/crop.js';
import { ADDED_INK_CONTRAST, ADDED_INK_TOLERANCE, measureAddedInk, measureMark } from '../src/read/marks.js';
import { checkboxMarkSvg, isChecked, type MarkKind } from '../src/synth/checkbox-mark.js';
import { translateH } from '../src/synth/homography.js';
import { Rng } from '../src/synth/prng.js';
import { rasterizeSvg } from '../src/synth/rasterize.js';
import { drawScanParams, type DegradeLevel } from '../src/synth/scan-params.js';
import { simulateScan } from '../src/synth/scan-simulate.js';
import { DEVELOPMENT_FORMS, HELD_OUT_FORMS } from './real-forms-split.js';

const { values: args } = parseArgs({
  options: {
    set: { type: 'string', default: 'dev' },
    pages: { type: 'string', default: '2' },
    degrade: { type: 'string', default: 'light' },
    pdfs: { type: 'string', default: path.resolve(import.meta.dirname, '../../shared/reference/real-forms/pdfs') },
    forms: { type: 'string' },
  },
});
const forms = args.forms ? args.forms.split(',') : args.set === 'held' ? HELD_OUT_FORMS : DEVELOPMENT_FORMS;
const degrade = args.degrade as DegradeLevel;
const TOLERANCE = Number(process.env.MARKS_TOLERANCE ?? ADDED_INK_TOLERANCE);
const CONTRAST = Number(process.env.MARKS_CONTRAST ?? ADDED_INK_CONTRAST);

interface Sample {
  form: string;
  checked: boolean;
  kind: MarkKind;
  old: number;
  added: number | null;
  group: number;
  box: Box;
}

const CHECKED_KINDS: MarkKind[] = ['tick', 'tick', 'tick', 'cross', 'cross', 'fill', 'scribble', 'light'];

function darken(a: GrayImage, b: GrayImage): GrayImage {
  const data = new Uint8Array(a.data.length);
  for (let i = 0; i < data.length; i++) data[i] = Math.min(a.data[i], b.data[i]);
  return { width: a.width, height: a.height, data };
}

/** Boxes on one row (centres within half a box height) form a group. */
function rows(boxes: Box[]): number[] {
  const group = new Array<number>(boxes.length).fill(-1);
  let next = 0;
  const order = boxes.map((_, i) => i).sort((a, b) => boxes[a].y - boxes[b].y);
  for (const i of order) {
    if (group[i] >= 0) continue;
    group[i] = next;
    const cy = boxes[i].y + boxes[i].h / 2;
    for (const j of order) if (group[j] < 0 && Math.abs(boxes[j].y + boxes[j].h / 2 - cy) < boxes[i].h / 2) group[j] = next;
    next++;
  }
  return group;
}

const detector = await loadDetector(DEFAULT_MODEL_PATH, { intraOpThreads: 1 });
const samples: Sample[] = [];
let groupBase = 0;
for (const [f, form] of forms.entries()) {
  const blank = await renderPdfPage(await readFile(path.join(args.pdfs, form)), form, 0);
  // Printed boxes: the detector's checkboxes on the blank, one per place (overlapping finds of one box dropped).
  const boxes: Box[] = [];
  for (const d of (await detector.detect(blank)).sort((a, b) => b.score - a.score)) {
    if (d.className !== 'checkbox' || d.score < 0.5 || d.box.w < 12 || d.box.h < 12 || d.box.w > 60 || d.box.h > 60) continue;
    if (boxes.some((b) => iou(b, d.box) > 0)) continue;
    // A printed square or circle must be there (the detector also fires on words and black header bars).
    const outline = measureMark(cropField(blank, d.box, 4).image);
    if (!outline.boxFound || outline.shape === 'solid') continue;
    boxes.push(d.box);
  }
  const group = rows(boxes);
  for (let page = 0; page < Number(args.pages); page++) {
    const rng = new Rng(700000 + f * 100 + page);
    const kinds: MarkKind[] = boxes.map(() => 'empty');
    const groups = new Map<number, number[]>();
    group.forEach((g, i) => groups.set(g, [...(groups.get(g) ?? []), i]));
    for (const members of groups.values()) {
      if (members.length === 1) {
        kinds[members[0]] = rng.chance(0.4) ? rng.pick(CHECKED_KINDS) : rng.chance(0.15) ? 'dot' : 'empty';
      } else if (rng.chance(0.9)) {
        kinds[rng.pick(members)] = rng.pick(CHECKED_KINDS);
      }
    }
    const svg = boxes
      .map((b, i) => {
        const overflow = (kinds[i] === 'tick' || kinds[i] === 'cross') && rng.chance(0.33);
        const s = overflow ? rng.range(1.3, 1.7) : 1;
        const mb = { x: b.x + (b.w * (1 - s)) / 2, y: b.y + (b.h * (1 - s)) / 2 - (overflow ? b.h * 0.2 : 0), w: b.w * s, h: b.h * s };
        return checkboxMarkSvg(mb, 'square', kinds[i], rng.fork(`m${i}`));
      })
      .join('');
    const ink = await rasterizeSvg(`<svg xmlns="http://www.w3.org/2000/svg" width="${blank.width}" height="${blank.height}"><rect width="100%" height="100%" fill="#fff"/>${svg}</svg>`);
    const filled = darken(blank, ink);
    const scan = drawScanParams(rng.fork('scan'), blank.width, blank.height, { level: degrade, upsideDownRate: 0, dpi: 200 });
    const dx = rng.range(-1.5, 1.5);
    const dy = rng.range(-1.5, 1.5);
    const scanned = await simulateScan(filled, { ...scan, width: blank.width, height: blank.height, rotation: 0, transform: translateH(dx, dy) }, rng.fork('noise'));
    boxes.forEach((b, i) => {
      const crop = cropField(scanned, b, 4);
      const old = measureMark(crop.image).fillRatio;
      const under = blankUnderCrop(blank, b, b, crop.pageBox);
      const added = measureAddedInk(crop.image, under, crop.inner, TOLERANCE, CONTRAST)?.fillRatio ?? null;
      samples.push({ form, checked: isChecked(kinds[i]), kind: kinds[i], old, added, group: groupBase + group[i], box: b });
    });
    groupBase += groups.size + 1;
  }
  process.stderr.write(`${form}: ${boxes.length} boxes\n`);
}
await detector.close();

const q = (v: number[], p: number) => {
  const s = [...v].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(p * (s.length - 1)))] : NaN;
};
const f3 = (v: number) => v.toFixed(3);
console.log(`forms: ${forms.length} (${args.set}), pages/form: ${args.pages}, degrade: ${degrade}, boxes: ${samples.length}, tolerance ${TOLERANCE} px, contrast ${CONTRAST}`);
for (const m of ['old', 'added'] as const) {
  const v = (pred: (s: Sample) => boolean) => samples.filter(pred).map((s) => (m === 'old' ? s.old : (s.added ?? s.old)));
  const empty = v((s) => s.kind === 'empty');
  const dot = v((s) => s.kind === 'dot');
  const checked = v((s) => s.checked);
  const light = v((s) => s.kind === 'light');
  console.log(
    `${m.padEnd(6)} empty p50/p99/max ${f3(q(empty, 0.5))}/${f3(q(empty, 0.99))}/${f3(q(empty, 1))}  dot p95 ${f3(q(dot, 0.95))}` +
      `  checked min/p1/p5 ${f3(q(checked, 0))}/${f3(q(checked, 0.01))}/${f3(q(checked, 0.05))}  light p5 ${f3(q(light, 0.05))}`,
  );
  const o = { checkedAbove: DEFAULT_CHECKED_ABOVE, uncheckedBelow: DEFAULT_UNCHECKED_BELOW, margin: DEFAULT_CHOICE_MARGIN };
  let right = 0;
  let wrong = 0;
  let ambiguous = 0;
  samples.forEach((s, i) => {
    const d = decideMark(checked.length >= 0 ? (m === 'old' ? s.old : (s.added ?? s.old)) : 0, o);
    if (d.state === 'ambiguous') ambiguous++;
    else if ((d.state === 'checked') === s.checked) right++;
    else wrong++;
    void i;
  });
  // Groups of two or more: old rule (each box by threshold, exactly one checked) and margin rule.
  const byGroup = new Map<number, Sample[]>();
  for (const s of samples) byGroup.set(s.group, [...(byGroup.get(s.group) ?? []), s]);
  let gRight = 0;
  let gWrong = 0;
  let gReview = 0;
  let gMargin = [0, 0, 0];
  let groups = 0;
  for (const g of byGroup.values()) {
    if (g.length < 2) continue;
    groups++;
    const fills = g.map((s) => (m === 'old' ? s.old : (s.added ?? s.old)));
    const truth = g.findIndex((s) => s.checked);
    const states = fills.map((x) => decideMark(x, o).state);
    if (states.includes('ambiguous') || states.filter((x) => x === 'checked').length !== 1) {
      if (states.every((x) => x === 'unchecked') && truth < 0) gRight++;
      else gReview++;
    } else if (states.indexOf('checked') === truth) gRight++;
    else gWrong++;
    const d = decideOneOf(fills, o);
    const got = d.state === 'chosen' ? d.chosen : d.state === 'none' ? -1 : null;
    if (got === null) gMargin[2]++;
    else if (got === truth) gMargin[0]++;
    else gMargin[1]++;
  }
  const n = samples.length;
  console.log(
    `       boxes at ${o.uncheckedBelow}/${o.checkedAbove}: right ${f3(right / n)} wrong ${wrong} review ${f3(ambiguous / n)};` +
      ` groups (${groups}) threshold rule: right ${gRight} wrong ${gWrong} review ${gReview}; margin ${o.margin} rule: right ${gMargin[0]} wrong ${gMargin[1]} review ${gMargin[2]}`,
  );
}
const zeroTicks = samples.filter((s) => s.checked && s.old < 0.01);
if (zeroTicks.length) console.log(`ticked boxes measuring < 0.01 by outline: ${zeroTicks.length} (${[...new Set(zeroTicks.map((s) => s.kind))].join(', ')})`);
if (process.env.MARKS_DEBUG) {
  for (const s of samples.filter((x) => !x.checked).sort((a, b) => (b.added ?? 0) - (a.added ?? 0)).slice(0, 8)) console.log('empty', s.form, s.kind, s.added, s.old, JSON.stringify(s.box));
  for (const s of samples.filter((x) => x.checked).sort((a, b) => (a.added ?? 0) - (b.added ?? 0)).slice(0, 8)) console.log('checked', s.form, s.kind, s.added, s.old, JSON.stringify(s.box));
}

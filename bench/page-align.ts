/**
 * Layout assignment and field location by alignment on labeled synthetic pages of the demo layouts.
 * Generate held-out pages first (seeds >= 900000), one folder per layout, e.g.
 *   formglean samples generate --layout clinic-intake --count 70 --seed 900300 --degrade heavy --fill mixed --out DIR
 * Usage: npx tsx bench/page-align.ts [--refine] DIR [DIR ...]
 *   --refine: touch up each region with refineRegion (src/page/local-refine.ts) after the global alignment.
 * Each page is normalized, assigned to one of the demo schemas (schemas/*.yaml with blank references), aligned to it,
 * and every schema region carried back onto the source page is compared with the truth box (IoU).
 * Prints: layout assignment accuracy, score ranges (right vs wrong layouts), share of parts with IoU >= 0.5,
 * median IoU, ms per page for each step.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { expectedParts } from '../src/locate/expected-boxes.js';
import { alignPage } from '../src/page/align.js';
import { invertAffine, iou, transformBox } from '../src/image/geometry.js';
import type { Box } from '../src/image/geometry.js';
import { matchLayout } from '../src/page/layout-match.js';
import { refineRegion } from '../src/page/local-refine.js';
import type { LayoutCandidate } from '../src/page/layout-match.js';
import { normalizePage } from '../src/page/normalize.js';
import { grayFromImage } from '../src/image/raster.js';
import { loadSchema, referenceImagePath } from '../src/schema/load.js';

const refine = process.argv.includes('--refine');
const dirs = process.argv.slice(2).filter((a) => a !== '--refine');
if (dirs.length === 0) {
  process.stderr.write('usage: npx tsx bench/page-align.ts DIR [DIR ...]\n');
  process.exit(2);
}
const LAYOUTS = ['clinic-intake', 'marina-slip', 'garden-plot'];
const schemas = new Map(await Promise.all(LAYOUTS.map(async (l) => [l, await loadSchema(`schemas/${l}.yaml`)] as const)));
const candidates: LayoutCandidate[] = [];
for (const [name, s] of schemas) {
  const reference = await grayFromImage(referenceImagePath(s, 0)!);
  candidates.push({ name, reference, referenceSize: s.schema.pages[0] });
}

let pages = 0;
let assigned = 0;
let unknown = 0;
const right: number[] = [];
const wrong: number[] = [];
const ious: number[] = [];
const misses: string[] = [];
const ms = { normalize: 0, match: 0, align: 0 };
for (const dir of dirs) {
  for (const f of readdirSync(path.join(dir, 'truth')).filter((f) => f.endsWith('.json')).sort()) {
    const truth = JSON.parse(readFileSync(path.join(dir, 'truth', f), 'utf8'));
    const page = await grayFromImage(path.join(dir, truth.file));
    pages++;
    let t = performance.now();
    const n = normalizePage(page);
    ms.normalize += performance.now() - t;
    t = performance.now();
    const m = matchLayout(n.image, candidates);
    ms.match += performance.now() - t;
    for (const s of m.scores) (s.name === truth.layout ? right : wrong).push(s.score);
    if (m.best === null) unknown++;
    if (m.best !== truth.layout) {
      misses.push(`${f}: assigned ${m.best ?? 'unknown_layout'}`);
      continue;
    }
    assigned++;
    const schema = schemas.get(truth.layout)!;
    const cand = candidates.find((c) => c.name === truth.layout)!;
    t = performance.now();
    const a = alignPage({ page: n.image, referenceSize: cand.referenceSize, reference: cand.reference });
    ms.align += performance.now() - t;
    const toSource = invertAffine(n.transform);
    const truthBoxes = new Map<string, Box>();
    for (const tf of truth.fields) {
      if (tf.parts) for (const p of tf.parts) truthBoxes.set(`${tf.name}/${p.key}`, { x: p.box[0], y: p.box[1], w: p.box[2], h: p.box[3] });
      else truthBoxes.set(`${tf.name}/${tf.name}`, { x: tf.box[0], y: tf.box[1], w: tf.box[2], h: tf.box[3] });
    }
    for (const part of expectedParts(schema.fields)) {
      const tb = truthBoxes.get(`${part.field.name}/${part.key}`);
      if (!tb || !part.region) continue;
      const onPage = refine ? refineRegion(n.image, cand.reference!, a.refToPage, part.region).box : transformBox(a.refToPage, part.region);
      const onSource = transformBox(toSource, onPage);
      ious.push(iou(onSource, tb));
    }
  }
}
const sortedIou = [...ious].sort((a, b) => a - b);
const pct = (x: number, of: number) => `${((100 * x) / Math.max(1, of)).toFixed(2)} %`;
console.log(`pages ${pages}`);
console.log(`layout assignment right ${assigned}/${pages} = ${pct(assigned, pages)} (unknown_layout ${unknown})`);
console.log(`score of the right layout: min ${Math.min(...right).toFixed(3)} median ${right.sort((a, b) => a - b)[right.length >> 1].toFixed(3)}`);
console.log(`score of other layouts:    max ${Math.max(...wrong).toFixed(3)} median ${wrong.sort((a, b) => a - b)[wrong.length >> 1].toFixed(3)}`);
console.log(`field parts located (region after alignment) with IoU >= 0.5: ${ious.filter((v) => v >= 0.5).length}/${ious.length} = ${pct(ious.filter((v) => v >= 0.5).length, ious.length)}; median IoU ${sortedIou[sortedIou.length >> 1]?.toFixed(3)}; p1 ${sortedIou[Math.floor(0.01 * sortedIou.length)]?.toFixed(3)}`);
console.log(`ms/page: normalize ${(ms.normalize / pages).toFixed(0)}, match ${(ms.match / pages).toFixed(0)} (3 layouts), align ${(ms.align / Math.max(1, assigned)).toFixed(0)}`);
for (const m of misses) console.log(`  miss: ${m}`);

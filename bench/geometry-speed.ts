/**
 * Page-geometry speed: levelling (orientation and deskew), the image registration and the per-field touch-up that
 * extract runs on every page, timed apart from OCR and detection, on the bundled sample scans against their schemas' blank references. Prints ms per
 * page for each stage (CPU time of this process, so other load on the machine barely moves it), and with --save/--check writes or compares every transform and refined box, so a speed-up
 * can be shown to leave the geometry unchanged.
 *
 *   npx tsx bench/geometry-speed.ts [--repeat 3] [--save FILE | --check FILE]
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { decodeDocument } from '../src/input/decode.js';
import { expectedParts } from '../src/locate/expected-boxes.js';
import { alignByImage } from '../src/page/align-image.js';
import { refineRegion } from '../src/page/local-refine.js';
import { normalizePage } from '../src/page/normalize.js';
import { ReferencePages } from '../src/pipeline/reference-pages.js';
import { loadSchema } from '../src/schema/load.js';

const { values: args } = parseArgs({ options: { repeat: { type: 'string', default: '3' }, save: { type: 'string' }, check: { type: 'string' } } });
const root = path.resolve(import.meta.dirname, '..');
const cases: [string, string][] = [
  ['samples/clinic-intake-typed.png', 'clinic-intake'],
  ['samples/marina-slip-typed.jpg', 'marina-slip'],
  ['samples/marina-slip-handwriting.png', 'marina-slip'],
  ['samples/garden-plot-typed.png', 'garden-plot'],
];

/** User + system CPU time of this process, ms: the stages are synchronous, so this is their own work. */
function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

const outputs: unknown[] = [];
const times = { normalize: [] as number[], align: [] as number[], refine: [] as number[] };
for (let rep = 0; rep < Number(args.repeat); rep++) {
  for (const [file, layout] of cases) {
    const loaded = await loadSchema(path.join(root, 'schemas', `${layout}.yaml`));
    const reference = (await ReferencePages.decode([loaded])).page(loaded, 0)!;
    // A fresh raster each repeat: ink maps are cached per raster, and a batch sees each page once.
    const decoded = (await decodeDocument(path.join(root, file))).pages[0];
    let t = cpuMs();
    const normalized = normalizePage(decoded);
    times.normalize.push(cpuMs() - t);
    const page = normalized.image;
    t = cpuMs();
    const aligned = alignByImage(page, reference);
    times.align.push(cpuMs() - t);
    t = cpuMs();
    const boxes = expectedParts(loaded.fields.filter((f) => f.spec.page === 0)).flatMap((p) => (p.region ? [refineRegion(page, reference, aligned.refToPage, p.region)] : []));
    times.refine.push(cpuMs() - t);
    // The levelled page itself by its digest: every pixel must stay the same, not only the numbers that describe it.
    const levelled = { rotation: normalized.rotation, skew: normalized.skew, transform: normalized.transform, sha256: createHash('sha256').update(page.data).digest('hex') };
    if (rep === 0) outputs.push({ file, levelled, refToPage: aligned.refToPage, score: aligned.score, boxes });
  }
}
// Per page, the fastest of the repeats: the least disturbed by other load; summed over the pages.
const fastest = (v: number[]) => cases.map((_, i) => Math.min(...v.filter((_, k) => k % cases.length === i))).reduce((a, b) => a + b, 0) / cases.length;
console.log(`pages ${cases.length} x ${args.repeat}: levelling ${fastest(times.normalize).toFixed(0)} ms/page, image registration ${fastest(times.align).toFixed(0)} ms/page, region touch-up ${fastest(times.refine).toFixed(0)} ms/page (CPU time, fastest repeat of each page)`);
if (args.save) writeFileSync(args.save, JSON.stringify(outputs));
if (args.check) {
  const before = JSON.parse(readFileSync(args.check, 'utf8')) as typeof outputs;
  const near = (a: unknown, b: unknown): boolean =>
    typeof a === 'number' && typeof b === 'number' ? Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(a)) : a && typeof a === 'object' ? Object.keys(a).every((k) => near((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])) : a === b;
  console.log(near(JSON.parse(JSON.stringify(outputs)), before) ? 'geometry unchanged' : 'GEOMETRY CHANGED');
}

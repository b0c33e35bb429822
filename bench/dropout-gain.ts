/**
 * OCR gain from form dropout on labeled synthetic pages of the demo layouts (held-out seeds >= 900000), e.g.
 *   formglean samples generate --layout marina-slip --count 67 --seed 900300 --degrade heavy --fill mixed --out DIR
 * Usage: npx tsx bench/dropout-gain.ts [--limit N] [--dilate R] [--global] DIR [DIR ...]
 *   --global: mask by the global alignment only (no per-tile shifts).
 * Each page is normalized and aligned to its layout's blank; every text-read field with a written truth text is read
 * from the page as it is and from the page with the blank form dropped out, with the read stage's main cleanup
 * ("standard") and with no cleanup ("plain"). Prints exact-match rate and mean character error rate (Levenshtein
 * distance / truth length) for the four combinations, and ms per page for the dropout itself.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { distance } from 'fastest-levenshtein';
import { alignPage } from '../src/page/align.js';
import { dropoutForm } from '../src/page/dropout.js';
import { transformBox } from '../src/image/geometry.js';
import { normalizePage } from '../src/page/normalize.js';
import { grayFromImage } from '../src/image/raster.js';
import type { GrayImage } from '../src/image/raster.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { readTextField } from '../src/read/read-text.js';
import { PLAIN, STANDARD } from '../src/read/variants.js';
import { loadSchema, referenceImagePath } from '../src/schema/load.js';

// The run's OCR engine, closed at the end.
const ocr = new OcrEngine();

const args = process.argv.slice(2);
const opt = (name: string, fallback: number) => {
  const i = args.indexOf(name);
  if (i < 0) return fallback;
  const v = Number(args[i + 1]);
  args.splice(i, 2);
  return v;
};
const limit = opt('--limit', Infinity);
const dilate = opt('--dilate', 3);
const local = !args.includes('--global');
if (!local) args.splice(args.indexOf('--global'), 1);
if (args.length === 0) {
  process.stderr.write('usage: npx tsx bench/dropout-gain.ts [--limit N] [--dilate R] DIR [DIR ...]\n');
  process.exit(2);
}
const READ_TYPES = new Set(['text', 'date', 'phone', 'email', 'number', 'postal_code', 'choice_text']);
const norm = (s: string) => s.replace(/\s+/g, ' ').trim().toLowerCase();
const combos = ['page/standard', 'dropout/standard', 'page/plain', 'dropout/plain'] as const;
const stats = Object.fromEntries(combos.map((c) => [c, { exact: 0, cer: 0, n: 0 }])) as Record<(typeof combos)[number], { exact: number; cer: number; n: number }>;
let dropMs = 0;
let pages = 0;
for (const dir of args) {
  const files = readdirSync(path.join(dir, 'truth')).filter((f) => f.endsWith('.json')).sort().slice(0, limit);
  for (const f of files) {
    const truth = JSON.parse(readFileSync(path.join(dir, 'truth', f), 'utf8'));
    const loaded = await loadSchema(`schemas/${truth.layout}.yaml`);
    const reference = await grayFromImage(referenceImagePath(loaded, 0)!);
    const n = normalizePage(await grayFromImage(path.join(dir, truth.file)));
    const a = alignPage({ page: n.image, referenceSize: loaded.schema.pages[0], reference });
    const t0 = performance.now();
    const dropped = dropoutForm(n.image, reference, a.refToPage, { dilate, local }).image;
    dropMs += performance.now() - t0;
    pages++;
    for (const field of loaded.schema.fields) {
      const t = truth.fields.find((x: { name: string }) => x.name === field.name);
      if (!READ_TYPES.has(field.type) || !field.region || !t || typeof t.text !== 'string' || t.text === '') continue;
      const [x, y, w, h] = field.region;
      const box = transformBox(a.refToPage, { x, y, w, h });
      const images: Record<string, GrayImage> = { page: n.image, dropout: dropped };
      for (const c of combos) {
        const [img, variant] = c.split('/');
        const r = await readTextField(images[img], box, { engine: ocr,
          variants: [variant === 'plain' ? PLAIN : STANDARD],
          comb: field.class === 'comb_field',
          mode: field.ocr?.mode ?? 'line',
          skew: 0,
        });
        const got = norm(r.reading.text);
        const want = norm(t.text);
        stats[c].n++;
        if (got === want) stats[c].exact++;
        stats[c].cer += Math.min(1, distance(got, want) / Math.max(1, want.length));
      }
    }
  }
}
await ocr.close();
console.log(`pages ${pages}, fields read ${stats['page/standard'].n}, dilation ${dilate} px, ${local ? 'local shifts' : 'global alignment only'}`);
for (const c of combos) {
  const s = stats[c];
  console.log(`${c.padEnd(18)} exact ${((100 * s.exact) / Math.max(1, s.n)).toFixed(1)} %  mean CER ${(s.cer / Math.max(1, s.n)).toFixed(3)}`);
}
console.log(`dropoutForm ${(dropMs / Math.max(1, pages)).toFixed(0)} ms/page`);

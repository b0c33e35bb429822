/**
 * Orientation and skew on labeled synthetic pages (generate them with held-out seeds >= 900000, e.g.
 *   formglean samples generate --layout random --count 120 --seed 900100 --degrade heavy --upside-down 0.5 --out DIR).
 * Every odd page is additionally turned 90° clockwise here (an exact quarter turn), so all four rotations occur.
 * Usage: npx tsx bench/page-normalize.ts DIR [--limit N]
 * Prints: orientation accuracy, skew error median / p90 / max, ms per page.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { normalizePage } from '../src/page/normalize.js';
import { grayFromImage } from '../src/image/raster.js';
import { rotateQuarter } from '../src/image/warp.js';
import type { QuarterTurn } from '../src/image/warp.js';

const dir = process.argv[2];
if (!dir) {
  process.stderr.write('usage: npx tsx bench/page-normalize.ts DIR [--limit N]\n');
  process.exit(2);
}
const li = process.argv.indexOf('--limit');
const limit = li > 0 ? Number(process.argv[li + 1]) : Infinity;
const files = readdirSync(path.join(dir, 'truth')).filter((f) => f.endsWith('.json')).sort().slice(0, limit);

let right = 0;
const skewErr: number[] = [];
const wrong: string[] = [];
let ms = 0;
for (const [i, f] of files.entries()) {
  const truth = JSON.parse(readFileSync(path.join(dir, 'truth', f), 'utf8'));
  const page = await grayFromImage(path.join(dir, truth.file ?? f.replace(/\.json$/, '.png')));
  const extra: QuarterTurn = i % 2 ? 90 : 0;
  const input = rotateQuarter(page, extra).image;
  const expected = (360 - ((truth.rotation + extra) % 360)) % 360;
  const t0 = performance.now();
  const n = normalizePage(input);
  ms += performance.now() - t0;
  if (n.rotation === expected) right++;
  else wrong.push(`${f} expected ${expected} got ${n.rotation} (phrase vote ${n.orientation?.upScore.toFixed(2)} over ${n.orientation?.lines} phrases)`);
  skewErr.push(Math.abs(n.skew - truth.skew));
}
const sorted = [...skewErr].sort((a, b) => a - b);
const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
console.log(`pages ${files.length}`);
console.log(`orientation right ${right}/${files.length} = ${((100 * right) / files.length).toFixed(2)} %`);
console.log(`skew error deg: median ${q(0.5).toFixed(3)} p90 ${q(0.9).toFixed(3)} max ${sorted[sorted.length - 1].toFixed(3)}`);
console.log(`normalizePage ${(ms / files.length).toFixed(0)} ms/page`);
for (const w of wrong) console.log(`  wrong: ${w}`);

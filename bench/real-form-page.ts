/**
 * The page stage on the real blank form (IRS Form W-4 2025 page 1, public domain; a copy with its source note is in test/fixtures/real-forms)
 * filled with invented entries and "scanned" by libvips: scaled, shifted, turned (small angle plus 0 or 180°),
 * blurred and JPEG-compressed. Truth geometry comes from the libvips operations, not from our code.
 * Usage: npx tsx bench/real-form-page.ts
 * Prints per case and overall: orientation right (text cue, then checked against the blank with confirmHalfTurn), skew error, alignment error (max over 5 points, page px),
 * dropout: share of printed-form ink removed and of entry ink kept.
 */
import sharp from 'sharp';
import { alignPage } from '../src/page/align.js';
import { dropoutForm } from '../src/page/dropout.js';
import { confirmHalfTurn } from '../src/page/half-turn.js';
import type { Affine, Point } from '../src/image/geometry.js';
import { applyAffine, composeAffine, invertAffine } from '../src/image/geometry.js';
import { normalizePage } from '../src/page/normalize.js';
import { fromRawBuffer } from '../src/image/raster.js';
import { rotationAbout, warpGray } from '../src/image/warp.js';
import { entriesOnly, filledRealForm, inkRecovery, scanLike } from '../test/page/fill-real-form.js';
import { realBlank } from '../test/page/real-form.js';

const CASES: Array<{ s: number; dx: number; dy: number; angle: number; blur: number; jpeg: number }> = [
  { s: 1, dx: 0, dy: 0, angle: 0.4, blur: 0, jpeg: 0 },
  { s: 0.95, dx: 25, dy: -18, angle: -2.3, blur: 0.8, jpeg: 60 },
  { s: 1.05, dx: -30, dy: 22, angle: 3.1, blur: 1.2, jpeg: 40 },
  { s: 0.75, dx: 10, dy: 5, angle: -0.8, blur: 0.6, jpeg: 50 },
  { s: 1.5, dx: -40, dy: 30, angle: 1.7, blur: 1.0, jpeg: 70 },
  { s: 0.9, dx: 15, dy: 15, angle: 180 + 2.6, blur: 0.8, jpeg: 50 },
  { s: 1.0, dx: -20, dy: -25, angle: 180 - 1.4, blur: 1.4, jpeg: 35 },
  { s: 1.2, dx: 5, dy: -10, angle: -6.5, blur: 0.7, jpeg: 60 },
];
const SPREAD: Point[] = [[150, 150], [1550, 150], [150, 2050], [1550, 2050], [850, 1100]];

const ref = await realBlank();
const filled = await filledRealForm();
const entries = await entriesOnly();
const rows: string[] = [];
let right = 0;
let rightByText = 0;
const skewErr: number[] = [];
const alignErr: number[] = [];
const removed: number[] = [];
const kept: number[] = [];
for (const c of CASES) {
  const scan = await scanLike(filled, c.s, c.dx, c.dy);
  const png = await sharp(Buffer.from(scan.page.data), { raw: { width: scan.page.width, height: scan.page.height, channels: 1 } }).png().toBuffer();
  // libvips turns about the centre and grows the canvas to hold the turned page: p' = R (p - c_in) + c_out.
  let pipe = sharp(png).rotate(c.angle, { background: '#ffffff' });
  if (c.blur > 0) pipe = sharp(await pipe.png().toBuffer()).blur(c.blur);
  const encoded = c.jpeg > 0 ? await pipe.jpeg({ quality: c.jpeg }).toBuffer() : await pipe.png().toBuffer();
  const { data, info } = await sharp(encoded).grayscale().raw().toBuffer({ resolveWithObject: true });
  const page = fromRawBuffer(data, info.width, info.height, info.channels);
  const turn = rotationAbout(c.angle, 0, 0);
  const toTurned: Affine = composeAffine(
    { a: 1, b: 0, c: info.width / 2, d: 0, e: 1, f: info.height / 2 },
    composeAffine(turn, { a: 1, b: 0, c: -scan.page.width / 2, d: 0, e: 1, f: -scan.page.height / 2 }),
  );
  const truthRefToPage = composeAffine(toTurned, scan.refToPage);
  const byText = normalizePage(page);
  const upside = Math.abs(c.angle) > 90 ? 180 : 0;
  if (byText.rotation === upside) rightByText++;
  const n = confirmHalfTurn(byText, ref).page;
  const ok = n.rotation === upside;
  if (ok) right++;
  const small = c.angle - upside;
  skewErr.push(Math.abs(n.skew - small));
  const a = alignPage({ page: n.image, referenceSize: ref, reference: ref });
  const truthRefToNorm = composeAffine(n.transform, truthRefToPage);
  const err = Math.max(...SPREAD.map((p) => {
    const q = applyAffine(a.refToPage, p);
    const t = applyAffine(truthRefToNorm, p);
    return Math.hypot(q[0] - t[0], q[1] - t[1]);
  }));
  alignErr.push(err);
  const d = dropoutForm(n.image, ref, a.refToPage);
  const back = invertAffine(truthRefToNorm);
  const ent = warpGray(entries, back, n.image.width, n.image.height);
  const blank = warpGray(ref, back, n.image.width, n.image.height);
  const r = inkRecovery(d.image, blank, ent);
  removed.push(r.removed);
  kept.push(r.kept);
  rows.push(
    `scale ${c.s} shift (${c.dx},${c.dy}) angle ${c.angle} blur ${c.blur} jpeg ${c.jpeg || '-'}: rotation ${ok ? 'right' : `WRONG (${n.rotation})`} (text cue alone ${byText.rotation === upside ? 'right' : 'wrong'}), ` +
      `skew err ${skewErr.at(-1)!.toFixed(3)}°, align err ${err.toFixed(2)} px (score ${a.score.toFixed(3)}), ` +
      `form ink removed ${(100 * removed.at(-1)!).toFixed(2)} %, entry ink kept ${(100 * kept.at(-1)!).toFixed(1)} %`,
  );
}
const med = (v: number[]) => [...v].sort((x, y) => x - y)[v.length >> 1];
for (const r of rows) console.log(r);
console.log(`cases ${CASES.length}: orientation right ${right}/${CASES.length} (text cue alone ${rightByText}); skew error median ${med(skewErr).toFixed(3)}° max ${Math.max(...skewErr).toFixed(3)}°;`);
console.log(`alignment error median ${med(alignErr).toFixed(2)} px max ${Math.max(...alignErr).toFixed(2)} px; form ink removed median ${(100 * med(removed)).toFixed(2)} % min ${(100 * Math.min(...removed)).toFixed(2)} %; entry ink kept median ${(100 * med(kept)).toFixed(1)} %`);

import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { handwrittenDigitSvg } from './handwritten-digits.js';
import { IDENTITY_H } from './homography.js';
import type { Rng } from './prng.js';
import { rasterizeSvg } from './rasterize.js';
import { drawScanParams, type DegradeLevel } from './scan-params.js';
import { simulateScan } from './scan-simulate.js';
import { svgDocument } from '../image/svg.js';

/** A printed comb box holding real handwritten digits, scanned: for tests and benches of digit reading. */
export interface DigitCombStrip {
  image: GrayImage;
  /** The comb's outer box in image pixels. */
  box: Box;
  /** What each cell holds: a test-split digit (class and index within it), or null for an empty cell. */
  digits: ({ digit: number; index: number } | null)[];
}

/**
 * Draw a comb (cells 34..48 x 44..58 px: comb boxes at 200 DPI; outline 1..3 px, separators a pixel thinner, a
 * printed label above) with the given test-split digits written in by the pen (gray 10..90), then the scan
 * simulation of `degrade` without page geometry (noise, blur, paper tone, JPEG). Everything from `rng`.
 */
export async function digitCombStrip(digits: DigitCombStrip['digits'], rng: Rng, degrade: DegradeLevel = 'light'): Promise<DigitCombStrip> {
  const cw = rng.int(34, 48);
  const ch = rng.int(44, 58);
  const stroke = rng.int(1, 3);
  const m = 24;
  const box = { x: m, y: m, w: cw * digits.length, h: ch };
  let body = `<rect x="${m}" y="${m}" width="${box.w}" height="${ch}" fill="none" stroke="black" stroke-width="${stroke}"/>`;
  for (let i = 1; i < digits.length; i++) {
    body += `<line x1="${m + cw * i}" y1="${m}" x2="${m + cw * i}" y2="${m + ch}" stroke="black" stroke-width="${Math.max(1, stroke - 1)}"/>`;
  }
  body += `<text x="${m}" y="${m - 6}" font-family="DejaVu Sans" font-size="12">Number</text>`;
  const ink = rng.int(10, 90);
  digits.forEach((d, i) => {
    if (d) body += handwrittenDigitSvg(String(d.digit), { x: m + cw * i, y: m, w: cw, h: ch }, rng.fork(`cell${i}`), { ink, index: d.index });
  });
  const width = box.w + 2 * m;
  const height = ch + 2 * m;
  const clean = await rasterizeSvg(svgDocument(width, height, body));
  if (degrade === 'none') return { image: clean, box, digits };
  const p = drawScanParams(rng.fork('scan'), width, height, { level: degrade, upsideDownRate: 0 });
  const image = await simulateScan(clean, { ...p, transform: IDENTITY_H, width, height, rotation: 0, skew: 0 }, rng.fork('noise'));
  return { image, box, digits };
}

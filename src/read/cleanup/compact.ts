import type { GrayImage } from '../../image/raster.js';
import { createGray } from '../../image/raster.js';
import { columnProfile } from '../../image/binary.js';

/** Runs of columns holding ink (the glyph groups of a line), from the vertical projection profile. */
export function inkColumns(img: GrayImage): { left: number; right: number }[] {
  const p = columnProfile(img);
  const runs: { left: number; right: number }[] = [];
  let x = 0;
  while (x < img.width) {
    if (p[x] === 0) { x++; continue; }
    const left = x;
    while (x < img.width && p[x] > 0) x++;
    runs.push({ left, right: x });
  }
  return runs;
}

/**
 * Close up the wide gaps of comb writing, one character per printed cell: tesseract reads characters spaced a
 * cell apart as separate words and drops some of them (seen on rendered comb cells in test/read). Gaps up to 1.5
 * times the median gap are letter gaps and shrink to `letterGap`; wider ones mark an empty cell and become a word
 * space of `wordGap` (both shares of the line height `height`; 0.15 em and 0.5 em are common typesetting values).
 */
export function compactGaps(img: GrayImage, height: number): GrayImage {
  return compactGapsAlong(img, height, [])[0];
}

/** compactGaps, moving the same columns of further images of the same size (e.g. the grayscale behind a mask). */
export function compactGapsAlong(img: GrayImage, height: number, others: GrayImage[]): GrayImage[] {
  const runs = inkColumns(img);
  if (runs.length < 2) return [img, ...others];
  const gaps = runs.slice(1).map((r, i) => r.left - runs[i].right).sort((a, b) => a - b);
  const median = gaps[Math.floor(gaps.length / 2)];
  const letterGap = Math.max(2, Math.round(height * 0.15));
  const wordGap = Math.max(letterGap + 2, Math.round(height * 0.5));
  const newGaps = runs.slice(1).map((r, i) => {
    const g = r.left - runs[i].right;
    if (g <= letterGap) return g;
    return g > median * 1.5 ? wordGap : letterGap;
  });
  const width = runs.reduce((s, r) => s + r.right - r.left, 0) + newGaps.reduce((s, g) => s + g, 0) + 2 * runs[0].left;
  return [img, ...others].map((src) => {
    const out = createGray(width, src.height);
    let x = runs[0].left;
    runs.forEach((r, i) => {
      for (let y = 0; y < src.height; y++) {
        out.data.set(src.data.subarray(y * src.width + r.left, y * src.width + r.right), y * width + x);
      }
      x += r.right - r.left + (newGaps[i] ?? 0);
    });
    return out;
  });
}

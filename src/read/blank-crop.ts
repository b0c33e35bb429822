import { formMask } from '../page/dropout.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';

/** The blank under a part: the reference image, the part's schema region on it, and that region aligned on the page. */
export interface BlankPart {
  reference: GrayImage;
  region: Box;
  onPage: Box;
}

/**
 * The blank form under a page crop: the reference region that the located box stands for, resampled (bilinear) onto
 * the crop's pixel grid. The map is the one from the schema region to the located box (reference pixels to page
 * pixels, scale and shift), so a box touched up by local refinement brings its blank along. Pixels mapping outside
 * the reference are paper.
 */
export function blankUnderCrop(reference: GrayImage, region: Box, box: Box, crop: Box): GrayImage {
  const sx = region.w / Math.max(1e-6, box.w);
  const sy = region.h / Math.max(1e-6, box.h);
  const { width: rw, height: rh, data: rd } = reference;
  const out = new Uint8Array(crop.w * crop.h);
  // Per pixel: no closure and no bounds test where all four neighbours lie inside (the hot loop of reading marks
  // and edge overflow); the arithmetic is the same as at the edges, so the result does not depend on which path ran.
  const xs0 = new Int32Array(crop.w);
  const fxs = new Float64Array(crop.w);
  for (let x = 0; x < crop.w; x++) {
    const rx = region.x + (crop.x + x + 0.5 - box.x) * sx - 0.5;
    xs0[x] = Math.floor(rx);
    fxs[x] = rx - xs0[x];
  }
  for (let y = 0; y < crop.h; y++) {
    const ry = region.y + (crop.y + y + 0.5 - box.y) * sy - 0.5;
    const y0 = Math.floor(ry);
    const fy = ry - y0;
    const rowInside = y0 >= 0 && y0 + 1 < rh;
    const r0 = y0 * rw;
    const r1 = r0 + rw;
    const o = y * crop.w;
    for (let x = 0; x < crop.w; x++) {
      const x0 = xs0[x];
      const fx = fxs[x];
      let a: number, b: number, c: number, d: number;
      if (rowInside && x0 >= 0 && x0 + 1 < rw) {
        a = rd[r0 + x0];
        b = rd[r0 + x0 + 1];
        c = rd[r1 + x0];
        d = rd[r1 + x0 + 1];
      } else {
        a = paperOr(rd, rw, rh, x0, y0);
        b = paperOr(rd, rw, rh, x0 + 1, y0);
        c = paperOr(rd, rw, rh, x0, y0 + 1);
        d = paperOr(rd, rw, rh, x0 + 1, y0 + 1);
      }
      const top = a * (1 - fx) + b * fx;
      const bottom = c * (1 - fx) + d * fx;
      out[o + x] = Math.round(top * (1 - fy) + bottom * fy);
    }
  }
  return { width: crop.w, height: crop.h, data: out };
}

/** The reference pixel at (x, y), or paper (255) outside it. */
function paperOr(data: Uint8Array, w: number, h: number, x: number, y: number): number {
  return x < 0 || y < 0 || x >= w || y >= h ? 255 : data[y * w + x];
}

/**
 * Where the blank has print under a page crop (0) and where it is paper (255), the print grown by `tolerance` pixels
 * for misregistration; blank pixels at or below 200 count as print (as dropout).
 */
export function printedUnderCrop(blank: BlankPart, crop: Box, tolerance: number): GrayImage {
  const under = blankUnderCrop(blank.reference, blank.region, blank.onPage, crop);
  const mask = formMask(under, tolerance, 200);
  const data = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) data[i] = mask[i] ? 0 : 255;
  return { width: under.width, height: under.height, data };
}

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
  for (let y = 0; y < crop.h; y++) {
    const ry = region.y + (crop.y + y + 0.5 - box.y) * sy - 0.5;
    const y0 = Math.floor(ry);
    const fy = ry - y0;
    for (let x = 0; x < crop.w; x++) {
      const rx = region.x + (crop.x + x + 0.5 - box.x) * sx - 0.5;
      const x0 = Math.floor(rx);
      const fx = rx - x0;
      const at = (xx: number, yy: number) => (xx < 0 || yy < 0 || xx >= rw || yy >= rh ? 255 : rd[yy * rw + xx]);
      const top = at(x0, y0) * (1 - fx) + at(x0 + 1, y0) * fx;
      const bottom = at(x0, y0 + 1) * (1 - fx) + at(x0 + 1, y0 + 1) * fx;
      out[y * crop.w + x] = Math.round(top * (1 - fy) + bottom * fy);
    }
  }
  return { width: crop.w, height: crop.h, data: out };
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

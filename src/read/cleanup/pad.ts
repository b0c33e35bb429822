import type { Box } from '../../image/geometry.js';
import type { GrayImage } from '../../image/raster.js';
import { createGray, cropGray } from '../../image/raster.js';

/** Add a border of `px` pixels of `fill` on every side. */
export function padImage(img: GrayImage, px: number, fill = 255): GrayImage {
  const p = Math.max(0, Math.round(px));
  const out = createGray(img.width + 2 * p, img.height + 2 * p, fill);
  for (let y = 0; y < img.height; y++) out.data.set(img.data.subarray(y * img.width, (y + 1) * img.width), (y + p) * out.width + p);
  return out;
}

/**
 * Cut the crop down to its ink and surround it with a white border. Tesseract reads text flush against the image
 * edge poorly and recommends a white border (tessdoc "Improving the quality of the output", section Borders, from
 * memory); 10 px is common practice.
 */
export function trimAndPad(img: GrayImage, ink: Box | null, border = 10): GrayImage {
  if (!ink) return padImage(img, border);
  return padImage(cropGray(img, ink), border);
}

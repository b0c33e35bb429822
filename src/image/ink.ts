import { histogram, otsuThreshold } from './otsu.js';
import type { GrayImage } from './raster.js';

/**
 * Threshold under which a pixel counts as ink: Otsu's, but never above 200 nor below 60, so that a nearly
 * blank page (whose histogram is all paper and noise) does not turn its paper texture into ink (common practice).
 */
export function inkThreshold(img: GrayImage): number {
  // Otsu's threshold (image/otsu.ts); a page of one gray level has no split, and then mid-gray stands in.
  const t = otsuThreshold(histogram(img));
  return Math.max(60, Math.min(200, t < 0 ? 128 : t));
}

/** 1 where the pixel is ink (darker than the threshold), else 0. */
export function inkMask(img: GrayImage, threshold = inkThreshold(img)): Uint8Array {
  const m = new Uint8Array(img.data.length);
  for (let i = 0; i < m.length; i++) m[i] = img.data[i] <= threshold ? 1 : 0;
  return m;
}

/** Share of ink pixels, 0..1. */
export function inkShare(img: GrayImage, threshold = inkThreshold(img)): number {
  let n = 0;
  for (let i = 0; i < img.data.length; i++) if (img.data[i] <= threshold) n++;
  return img.data.length ? n / img.data.length : 0;
}

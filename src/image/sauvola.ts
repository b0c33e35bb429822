import type { GrayImage } from './raster.js';
import { createGray } from './raster.js';
import { INK, PAPER } from './binary.js';
import { summedArea, windowTotal } from './summed-area.js';

export interface SauvolaOptions {
  /** Side of the square window in pixels (odd). Default: about the text height, from the crop's height. */
  window?: number;
  /** Sensitivity k; 0.2 is a common choice for document images (scikit-image's default, from memory). */
  k?: number;
  /** Dynamic range of the standard deviation, R = 128 for 8-bit images (Sauvola and Pietikainen 2000). */
  r?: number;
}

/**
 * Sauvola adaptive binarization (J. Sauvola, M. Pietikainen, "Adaptive document image binarization",
 * Pattern Recognition 33(2), 2000): threshold T = m * (1 + k * (s / R - 1)) from the mean m and standard
 * deviation s of a window around each pixel, computed with integral images so the cost does not grow with the window.
 * It follows uneven lighting (a shadow across the crop) where one global threshold cannot.
 */
export function binarizeSauvola(img: GrayImage, options: SauvolaOptions = {}): GrayImage {
  const { width: w, height: h, data } = img;
  const k = options.k ?? 0.2;
  const r = options.r ?? 128;
  const win = options.window ?? Math.max(15, Math.round(h * 0.5) | 1);
  const half = Math.floor(win / 2);
  const { sum, sumSq } = summedArea(data, w, h);
  const out = createGray(w, h);
  for (let y = 0; y < h; y++) {
    const y0 = Math.max(0, y - half), y1 = Math.min(h, y + half + 1);
    for (let x = 0; x < w; x++) {
      const x0 = Math.max(0, x - half), x1 = Math.min(w, x + half + 1);
      const n = (x1 - x0) * (y1 - y0);
      const s = windowTotal(sum, w, x0, y0, x1, y1);
      const q = windowTotal(sumSq, w, x0, y0, x1, y1);
      const m = s / n;
      const sd = Math.sqrt(Math.max(0, q / n - m * m));
      const t = m * (1 + k * (sd / r - 1));
      out.data[y * w + x] = data[y * w + x] <= t ? INK : PAPER;
    }
  }
  return out;
}

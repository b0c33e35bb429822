import type { GrayImage } from '../../image/raster.js';
import { createGray } from '../../image/raster.js';
import { labelComponents, typicalHeight } from '../../image/components.js';
import { thresholdAt } from '../../image/binary.js';

/** Typical character height of a binary crop (see typicalHeight), or null when it holds no glyph-like ink. */
export function characterHeight(img: GrayImage): number | null {
  return typicalHeight(labelComponents(img).components);
}

/** Bilinear resampling by a factor (pixel centres aligned; common practice). */
export function resizeBilinear(img: GrayImage, factor: number): GrayImage {
  const w = Math.max(1, Math.round(img.width * factor));
  const h = Math.max(1, Math.round(img.height * factor));
  const out = createGray(w, h);
  const sx = img.width / w, sy = img.height / h;
  // Each column's source pair and weight once, not once per row: the same numbers, fewer divisions and floors.
  const xs0 = new Int32Array(w), xs1 = new Int32Array(w), txs = new Float64Array(w);
  for (let x = 0; x < w; x++) {
    const fx = Math.min(img.width - 1, Math.max(0, (x + 0.5) * sx - 0.5));
    xs0[x] = Math.floor(fx);
    xs1[x] = Math.min(img.width - 1, xs0[x] + 1);
    txs[x] = fx - xs0[x];
  }
  const src = img.data;
  for (let y = 0; y < h; y++) {
    const fy = Math.min(img.height - 1, Math.max(0, (y + 0.5) * sy - 0.5));
    const y0 = Math.floor(fy), y1 = Math.min(img.height - 1, y0 + 1), ty = fy - y0;
    const r0 = y0 * img.width, r1 = y1 * img.width, o = y * w;
    for (let x = 0; x < w; x++) {
      const x0 = xs0[x], x1 = xs1[x], tx = txs[x];
      const a = src[r0 + x0], b = src[r0 + x1];
      const c = src[r1 + x0], d = src[r1 + x1];
      out.data[o + x] = Math.round((a * (1 - tx) + b * tx) * (1 - ty) + (c * (1 - tx) + d * tx) * ty);
    }
  }
  return out;
}

export interface UpscaleOptions {
  /**
   * Character height to scale to, pixels. Tesseract's documentation says accuracy drops below an x-height of about
   * 10 px (tessdoc "Improving the quality of the output", from memory), and its LSTM recognizer scales every text
   * line to 36 px high (its own message "Image too small to scale!! (2x36 ...)" shows it). 32 px was best or
   * level with the best of 16..44 on bench/cleanup-gain.ts at 150 and 200-300 dpi (differences within 2 points).
   */
  target?: number;
  /** Never shrink below this factor nor grow beyond maxFactor. */
  minFactor?: number;
  maxFactor?: number;
}

export const DEFAULT_CHARACTER_HEIGHT = 32;

/** Scale a binary crop so its characters reach the target height; the resampled edges are re-thresholded at mid-gray. */
export function upscaleToCharacterHeight(img: GrayImage, options: UpscaleOptions = {}): { image: GrayImage; factor: number } {
  const current = characterHeight(img);
  if (current === null) return { image: img, factor: 1 };
  const factor = Math.min(options.maxFactor ?? 4, Math.max(options.minFactor ?? 0.5, (options.target ?? DEFAULT_CHARACTER_HEIGHT) / current));
  if (Math.abs(factor - 1) < 0.1) return { image: img, factor: 1 };
  return { image: thresholdAt(resizeBilinear(img, factor), 127), factor };
}

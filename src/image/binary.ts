import type { GrayImage } from './raster.js';
import { createGray } from './raster.js';

/**
 * Binary images are GrayImages holding only 0 (ink) and 255 (paper), so every step stays a plain GrayImage
 * function and any intermediate can be encoded as PNG or handed to tesseract.
 */
export const INK = 0;
export const PAPER = 255;

export function isInk(img: GrayImage, x: number, y: number): boolean {
  return img.data[y * img.width + x] === INK;
}

export function inkCount(img: GrayImage): number {
  let n = 0;
  for (let i = 0; i < img.data.length; i++) if (img.data[i] === INK) n++;
  return n;
}

/** Ink pixels per row (the horizontal projection profile). */
export function rowProfile(img: GrayImage): Int32Array {
  const p = new Int32Array(img.height);
  for (let y = 0; y < img.height; y++) {
    const row = y * img.width;
    let n = 0;
    for (let x = 0; x < img.width; x++) if (img.data[row + x] === INK) n++;
    p[y] = n;
  }
  return p;
}

/** Ink pixels per column (the vertical projection profile). */
export function columnProfile(img: GrayImage): Int32Array {
  const p = new Int32Array(img.width);
  for (let y = 0; y < img.height; y++) {
    const row = y * img.width;
    for (let x = 0; x < img.width; x++) if (img.data[row + x] === INK) p[x]++;
  }
  return p;
}

/** Threshold a grayscale image: values <= t become ink. */
export function thresholdAt(img: GrayImage, t: number): GrayImage {
  const out = createGray(img.width, img.height);
  for (let i = 0; i < img.data.length; i++) out.data[i] = img.data[i] <= t ? INK : PAPER;
  return out;
}

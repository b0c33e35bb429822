import sharp from 'sharp';
import type { GrayImage } from '../image/raster.js';
import { createGray, fromRawBuffer, sharpFromGray } from '../image/raster.js';
import { invertH, type Homography } from './homography.js';
import type { Rng } from './prng.js';
import type { ScanParams } from './scan-params.js';

/**
 * Resample the reference page into the scan's pixel grid through `h` (reference → output), bilinear, with pixel
 * centres at i + 0.5 so that box corners and pixels follow the same mapping. Outside the sheet is white.
 */
export function warpByHomography(src: GrayImage, h: Homography, width: number, height: number): GrayImage {
  const inv = invertH(h);
  const out = createGray(width, height);
  const { data: s, width: sw, height: sh } = src;
  const d = out.data;
  for (let y = 0; y < height; y++) {
    const cy = y + 0.5;
    let px = inv[1] * cy + inv[2] + inv[0] * 0.5;
    let py = inv[4] * cy + inv[5] + inv[3] * 0.5;
    let pw = inv[7] * cy + inv[8] + inv[6] * 0.5;
    let o = y * width;
    for (let x = 0; x < width; x++, o++) {
      const fx = px / pw - 0.5;
      const fy = py / pw - 0.5;
      px += inv[0];
      py += inv[3];
      pw += inv[6];
      const x0 = Math.floor(fx);
      const y0 = Math.floor(fy);
      if (x0 < -1 || y0 < -1 || x0 >= sw || y0 >= sh) continue;
      const ax = fx - x0;
      const ay = fy - y0;
      const xa = x0 < 0 ? 0 : x0;
      const xb = x0 + 1 >= sw ? sw - 1 : x0 + 1;
      const ya = y0 < 0 ? 0 : y0;
      const yb = y0 + 1 >= sh ? sh - 1 : y0 + 1;
      const top = s[ya * sw + xa] * (1 - ax) + s[ya * sw + xb] * ax;
      const bot = s[yb * sw + xa] * (1 - ax) + s[yb * sw + xb] * ax;
      d[o] = top * (1 - ay) + bot * ay + 0.5;
    }
  }
  return out;
}

/**
 * Paper tone and uneven lighting (bilinear gain between the four corners), sensor noise (Gaussian) and
 * salt-and-pepper specks, in place.
 */
export function addScanNoise(img: GrayImage, p: ScanParams, rng: Rng): void {
  const { width: w, height: h, data } = img;
  const [g00, g10, g01, g11] = p.shading;
  const paper = p.paper / 255;
  // A table of Gaussian deviates reused with random offsets: drawing 3-4 million normals per page would dominate
  // the render time, and the eye (and a detector) cannot tell the repetition at these levels.
  const table = new Float32Array(65536);
  for (let i = 0; i < table.length; i++) table[i] = rng.normal() * p.noiseSigma;
  for (let y = 0; y < h; y++) {
    const ty = y / (h - 1);
    const gl = g00 * (1 - ty) + g01 * ty;
    const gr = g10 * (1 - ty) + g11 * ty;
    let t = (rng.next() * 65536) | 0;
    const o = y * w;
    for (let x = 0; x < w; x++) {
      const gain = (gl + ((gr - gl) * x) / w) * paper;
      const v = data[o + x] * gain + table[t];
      t = (t + 1) & 65535;
      data[o + x] = v < 0 ? 0 : v > 255 ? 255 : v;
    }
  }
  const specks = Math.round(w * h * p.saltPepper);
  for (let i = 0; i < specks; i++) {
    const k = (rng.next() * w * h) | 0;
    data[k] = rng.chance(0.5) ? rng.int(0, 40) : 255;
  }
}

/** The whole simulated scan of a rendered reference page. */
export async function simulateScan(page: GrayImage, p: ScanParams, rng: Rng): Promise<GrayImage> {
  let img = warpByHomography(page, p.transform, p.width, p.height);
  if (p.blurSigma >= 0.3) {
    const { data, info } = await sharpFromGray(img).blur(p.blurSigma).toColourspace('b-w').raw().toBuffer({ resolveWithObject: true });
    img = fromRawBuffer(data, info.width, info.height, info.channels);
  }
  if (p.noiseSigma > 0 || p.saltPepper > 0 || p.paper < 255 || p.shading.some((g) => g !== 1)) addScanNoise(img, p, rng);
  if (p.jpegQuality !== null) {
    // One gray channel each way (sharp defaults to sRGB output); Huffman optimisation off: it changes only the
    // size, not the pixels, and costs more than the encoding itself.
    const jpeg = await sharpFromGray(img).toColourspace('b-w').jpeg({ quality: p.jpegQuality, optimiseCoding: false }).toBuffer();
    const { data, info } = await sharp(jpeg).toColourspace('b-w').raw().toBuffer({ resolveWithObject: true });
    img = fromRawBuffer(data, info.width, info.height, info.channels);
  }
  return img;
}

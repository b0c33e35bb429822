import sharp, { type Sharp } from 'sharp';
import type { Box } from './geometry.js';
import { clampBox, roundBox } from './geometry.js';

/** An 8-bit grayscale raster, row-major, 0 = black ink, 255 = white paper. */
export interface GrayImage {
  width: number;
  height: number;
  data: Uint8Array;
}

export function createGray(width: number, height: number, fill = 255): GrayImage {
  return { width, height, data: new Uint8Array(width * height).fill(fill) };
}

/** Copy a rectangle out of a raster; the box is rounded outward and clamped to the image. */
export function cropGray(img: GrayImage, box: Box): GrayImage {
  const b = clampBox(roundBox(box), img.width, img.height);
  const out = createGray(Math.max(1, b.w), Math.max(1, b.h));
  for (let y = 0; y < b.h; y++) {
    const src = (b.y + y) * img.width + b.x;
    out.data.set(img.data.subarray(src, src + b.w), y * out.width);
  }
  return out;
}

/** Decode any image sharp reads into a grayscale raster. */
export async function grayFromImage(input: Buffer | string): Promise<GrayImage> {
  const { data, info } = await sharp(input).grayscale().raw().toBuffer({ resolveWithObject: true });
  return fromRawBuffer(data, info.width, info.height, info.channels);
}

export function fromRawBuffer(data: Buffer, width: number, height: number, channels: number): GrayImage {
  if (channels === 1) return { width, height, data: new Uint8Array(data.buffer, data.byteOffset, width * height).slice() };
  const out = new Uint8Array(width * height);
  for (let i = 0; i < width * height; i++) out[i] = data[i * channels];
  return { width, height, data: out };
}

/** A sharp pipeline over a grayscale raster (for resizing, rotating, encoding). */
export function sharpFromGray(img: GrayImage): Sharp {
  return sharp(Buffer.from(img.data.buffer, img.data.byteOffset, img.data.byteLength), {
    raw: { width: img.width, height: img.height, channels: 1 },
  });
}

/**
 * PNG of a raster. The default zlib level is 1: most PNGs made here are handed straight to tesseract.js (every OCR
 * call encodes its crop first, in front of the recognizer), where size does not matter and deflate's time does;
 * level 1 took a sixth of level 6's time on a 700 x 120 crop of a generated scan (bench/crop-png.ts). PNG is lossless, so
 * the pixels read are the same at any level. Files kept on disk pass a higher level.
 */
export async function grayToPng(img: GrayImage, compressionLevel = 1): Promise<Buffer> {
  return sharpFromGray(img).png({ compressionLevel }).toBuffer();
}

import path from 'node:path';
import sharp from 'sharp';
import { fromRawBuffer, grayFromImage } from '../../src/image/raster.js';
import type { GrayImage } from '../../src/image/raster.js';

/** The real blank form used across page tests (public domain; see test/fixtures/real-forms/README.md). */
export const REAL_BLANK = path.resolve(import.meta.dirname, '../fixtures/real-forms/irs-w4-2025-page1-blank.png');

export async function realBlank(): Promise<GrayImage> {
  return grayFromImage(REAL_BLANK);
}

/** Rotate with libvips (sharp) — an implementation independent of ours — onto white, canvas expanded. */
export async function rotatedBySharp(input: string | Buffer, degrees: number): Promise<GrayImage> {
  const { data, info } = await sharp(input).grayscale().rotate(degrees, { background: '#ffffff' }).raw().toBuffer({ resolveWithObject: true });
  return fromRawBuffer(data, info.width, info.height, info.channels);
}

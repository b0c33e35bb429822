import sharp from 'sharp';
import type { GrayImage } from '../image/raster.js';
import { fromRawBuffer } from '../image/raster.js';
import { useBundledFonts } from '../image/fonts.js';

/**
 * Render an SVG page to a grayscale raster at 1 SVG unit = 1 pixel, with the bundled fonts. Pages are drawn in
 * grays only (R = G = B) on an opaque background, so the red channel is the gray image: taking it is identical
 * to a grayscale conversion pixel for pixel and a third of the time (measured by bench/synth-pages.ts: 64 ms vs
 * 190 ms per page).
 */
export async function rasterizeSvg(svg: string): Promise<GrayImage> {
  useBundledFonts();
  const { data, info } = await sharp(Buffer.from(svg), { density: 72 }).extractChannel(0).raw().toBuffer({ resolveWithObject: true });
  return fromRawBuffer(data, info.width, info.height, info.channels);
}

import sharp from 'sharp';
import type { GrayImage } from '../page/raster.js';
import { fromRawBuffer } from '../page/raster.js';
import { useBundledFonts } from './fonts.js';

/** Render an SVG page to a grayscale raster at 1 SVG unit = 1 pixel, with the bundled fonts. */
export async function rasterizeSvg(svg: string): Promise<GrayImage> {
  useBundledFonts();
  const { data, info } = await sharp(Buffer.from(svg), { density: 72 }).grayscale().raw().toBuffer({ resolveWithObject: true });
  return fromRawBuffer(data, info.width, info.height, info.channels);
}

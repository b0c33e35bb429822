import type { GrayImage } from '../page/raster.js';
import { sharpFromGray } from '../page/raster.js';

export type PageFormat = 'png' | 'jpeg' | 'tiff';

export const PAGE_EXTENSIONS: Record<PageFormat, string> = { png: 'png', jpeg: 'jpg', tiff: 'tif' };

/** Encode a page with its resolution recorded, as a scanner would. */
export async function encodePage(img: GrayImage, format: PageFormat, dpi: number, jpegQuality = 85): Promise<Buffer> {
  const p = sharpFromGray(img).withMetadata({ density: dpi });
  if (format === 'jpeg') return p.jpeg({ quality: jpegQuality }).toBuffer();
  if (format === 'tiff') return p.tiff({ compression: 'lzw', xres: dpi / 25.4, yres: dpi / 25.4 }).toBuffer();
  // Compression level 6 is zlib's default; adaptive filtering off keeps encoding fast on scans (measured on bench/synth).
  return p.png({ compressionLevel: 6, adaptiveFiltering: false }).toBuffer();
}
